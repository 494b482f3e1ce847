/** Small invented lease sets for API tests (Fennick Bay, an invented region in open ocean). */
import type { Feature, FeatureCollection, Polygon } from 'geojson';

/** A rectangle of about `sizeM` metres centred on lon/lat. */
export function rectangle(lon: number, lat: number, sizeM: number, properties: Record<string, unknown>): Feature<Polygon> {
  const dLat = sizeM / 2 / 111_320;
  const dLon = sizeM / 2 / (111_320 * Math.cos((lat * Math.PI) / 180));
  return {
    type: 'Feature',
    properties,
    geometry: {
      type: 'Polygon',
      coordinates: [
        [
          [lon - dLon, lat - dLat],
          [lon + dLon, lat - dLat],
          [lon + dLon, lat + dLat],
          [lon - dLon, lat + dLat],
          [lon - dLon, lat - dLat],
        ],
      ],
    },
  };
}

export function leaseCollection(prefix: string, count: number, extra: Record<string, unknown> = {}): FeatureCollection<Polygon> {
  return {
    type: 'FeatureCollection',
    features: Array.from({ length: count }, (_, i) =>
      rectangle(-38.75 + i * 0.01, 41.15, 200 + 50 * i, { LEASE_ID: `${prefix}-${String(i + 1).padStart(3, '0')}`, HOLDER: 'Saltreed Oysters', SPECIES: 'pacific-oyster', STATUS: i === 0 ? 'candidate' : 'held', ...extra }),
    ),
  };
}

export function geojsonBuffer(fc: unknown): Buffer {
  return Buffer.from(JSON.stringify(fc));
}
