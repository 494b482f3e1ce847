/**
 * @module shared/geometry/polygon-area
 * Areas of polygons on the WGS 84 ellipsoid, and a per-feature summary (area, bbox, vertex count) for the
 * import preview. Areas use geodesic polygon areas (Karney, "Algorithms for geodesics", J. Geodesy 87,
 * 43–55, 2013, (a)) through geographiclib-geodesic, the method PostGIS's ST_Area(geography) also follows.
 */
import type { Feature, Geometry, MultiPolygon, Polygon, Position } from 'geojson';
import * as geodesicModule from 'geographiclib-geodesic';
import { type Bbox, bboxOf } from './check-coordinates';

/** The library is CommonJS: under Node its exports arrive as the default export; bundlers also expose them by name. @private */
const geodesic = ((geodesicModule as unknown as { default?: typeof geodesicModule }).default ?? geodesicModule) as typeof geodesicModule;

/** One feature of the import preview. */
export interface FeatureSummary {
  /** Position in the list passed in (0-based). */
  index: number;
  properties: Record<string, unknown>;
  /** Area on the WGS 84 ellipsoid [m²]; null for lines and points. */
  areaM2: number | null;
  /** [minLon, minLat, maxLon, maxLat] degrees. */
  bbox: Bbox;
  /** Positions (closing ones included). */
  vertexCount: number;
}

/**
 * Area of a Polygon or MultiPolygon on the WGS 84 ellipsoid, outer rings minus holes, whatever the ring
 * orientation.
 *
 * @param geometry - EPSG:4326 [lon, lat] degrees; rings closed or not.
 * @returns area [m²], ≥ 0.
 * @example
 * // a 0.01° × 0.01° cell at 47.6° N: about 1 112 m × 750 m
 * ellipsoidalArea({ type: 'Polygon', coordinates: [[[-2.9, 47.6], [-2.89, 47.6], [-2.89, 47.61], [-2.9, 47.61], [-2.9, 47.6]]] }) // ≈ 836 018
 */
export function ellipsoidalArea(geometry: Polygon | MultiPolygon): number {
  const polygons = geometry.type === 'Polygon' ? [geometry.coordinates] : geometry.coordinates;
  let total = 0;
  for (const rings of polygons) {
    rings.forEach((ring, k) => {
      const a = ringArea(ring);
      total += k === 0 ? a : -a;
    });
  }
  return Math.max(0, total);
}

/**
 * Summaries of features for the import preview.
 *
 * @param features - EPSG:4326 features (after reprojection).
 * @returns one summary per feature, in order.
 * @example
 * summariseFeatures(reprojected)[0] // { index: 0, properties: { LEASE_ID: 'FB-014' }, areaM2: 94092.4, bbox: [-2.951, 47.581, -2.9465, 47.5835], vertexCount: 5 }
 */
export function summariseFeatures(features: readonly Feature<Geometry | null>[]): FeatureSummary[] {
  return features.map((f, index) => {
    const g = f.geometry;
    const areaM2 = g && (g.type === 'Polygon' || g.type === 'MultiPolygon') ? ellipsoidalArea(g) : null;
    return {
      index,
      properties: (f.properties ?? {}) as Record<string, unknown>,
      areaM2,
      bbox: bboxOf(f) ?? [0, 0, 0, 0],
      vertexCount: countPositions(g),
    };
  });
}

/** @private |area| of one ring [m²]; the closing position is skipped if present. */
function ringArea(ring: Position[]): number {
  let n = ring.length;
  if (n > 1 && ring[0][0] === ring[n - 1][0] && ring[0][1] === ring[n - 1][1]) n -= 1;
  if (n < 3) return 0;
  const poly = geodesic.Geodesic.WGS84.Polygon(false);
  for (let i = 0; i < n; i++) poly.AddPoint(ring[i][1], ring[i][0]);
  const { area } = poly.Compute(false, true);
  return Math.abs(area ?? 0);
}

/** @private */
function countPositions(g: Geometry | null): number {
  if (!g) return 0;
  switch (g.type) {
    case 'Point':
      return 1;
    case 'MultiPoint':
    case 'LineString':
      return g.coordinates.length;
    case 'MultiLineString':
    case 'Polygon':
      return g.coordinates.reduce((s, r) => s + r.length, 0);
    case 'MultiPolygon':
      return g.coordinates.reduce((s, p) => s + p.reduce((t, r) => t + r.length, 0), 0);
    case 'GeometryCollection':
      return g.geometries.reduce((s, c) => s + countPositions(c), 0);
  }
}
