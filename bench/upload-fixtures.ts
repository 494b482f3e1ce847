/** Generated upload files for the benchmarks (invented coordinates in the demo region's sea; not committed). */
import { zip as shpZip } from '@mapbox/shp-write';
import proj4 from 'proj4';

const UTM24N_WKT =
  'PROJCS["WGS_1984_UTM_Zone_24N",GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",-39.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]';

export async function generateLeaseShapefile(count: number): Promise<Buffer> {
  const toUtm = proj4('EPSG:4326', '+proj=utm +zone=24 +datum=WGS84 +units=m +no_defs');
  const [x0, y0] = toUtm.forward([-38.9, 41.0]);
  const features = Array.from({ length: count }, (_, i) => {
    const x = x0 + (i % 100) * 400;
    const y = y0 + Math.floor(i / 100) * 400;
    // A rotated quadrilateral with a few extra vertices along each side, 150–300 m across.
    const w = 150 + (i % 7) * 20;
    const h = 150 + (i % 5) * 30;
    const ring: [number, number][] = [];
    for (const [px, py] of [
      [0, 0],
      [w / 2, -5],
      [w, 0],
      [w + 5, h / 2],
      [w, h],
      [w / 2, h + 5],
      [0, h],
      [-5, h / 2],
      [0, 0],
    ])
      ring.push([x + px, y + py]);
    return {
      type: 'Feature' as const,
      properties: { LEASE_ID: `BEN-${i + 1}`, HOLDER: 'Bench Holder', STATUS: i % 3 ? 'held' : 'candidate' },
      geometry: { type: 'Polygon' as const, coordinates: [ring] },
    };
  });
  return (await shpZip({ type: 'FeatureCollection', features }, {
    outputType: 'nodebuffer',
    compression: 'DEFLATE',
    types: { polygon: 'bench' },
    prj: UTM24N_WKT,
  } as never)) as unknown as Buffer;
}

/** `count` squares of about 100 m on a grid 0.002° apart, in WGS 84 lon/lat, as GeoJSON text. */
export function generateLeaseGeoJson(count: number): Buffer {
  const parts: string[] = [];
  const d = 0.0009;
  for (let i = 0; i < count; i++) {
    const lon = -38.95 + (i % 250) * 0.002;
    const lat = 40.6 + Math.floor(i / 250) * 0.002;
    const ring = [
      [lon, lat],
      [lon + d, lat],
      [lon + d, lat + d],
      [lon, lat + d],
      [lon, lat],
    ].map(([x, y]) => [Number(x.toFixed(6)), Number(y.toFixed(6))]);
    parts.push(
      JSON.stringify({
        type: 'Feature',
        properties: { LEASE_ID: `BIG-${i + 1}`, HOLDER: 'Bench Holder', STATUS: i % 3 ? 'held' : 'candidate' },
        geometry: { type: 'Polygon', coordinates: [ring] },
      }),
    );
  }
  return Buffer.from(`{"type":"FeatureCollection","features":[${parts.join(',')}]}`);
}
