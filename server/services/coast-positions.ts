/**
 * Placing points in a plume's signed coordinates (shared/geometry/coast-position) on a stored
 * footprint: down-coast along its walked coast, up-coast in the mouth's (the bulge's) frame. Used
 * by the screening of leases, the lease and closure-zone flow sweeps and the placing of samples.
 */
import { sql } from 'drizzle-orm';
import type { Position } from 'geojson';
import { type CoastFrame, coastFrame, coastPosition, outlinePositions } from '#shared/geometry/coast-position';
import type { TurningSide } from '#shared/physics/coriolis';
import type { PlumeRegime } from '#shared/physics/plume-regime';
import type { Database } from '../db/client';

/** The settings the frame needs. */
export interface FrameSettings {
  readonly outflowAzimuthDeg: number;
  readonly mouthLongitude: number;
  readonly mouthLatitude: number;
}

/** The frame of a stored footprint (null when it has no walked coast). */
export async function footprintCoastFrame(db: Database, footprintId: string, settings: FrameSettings): Promise<CoastFrame | null> {
  const res = await db.execute<{ path: string | null; plume: { turnsTo: TurningSide; regime: PlumeRegime } }>(sql`
    SELECT ST_AsGeoJSON(path, 7) AS path, plume FROM footprints WHERE id = ${footprintId}::uuid`);
  const row = res.rows[0];
  const path = row?.path ? (JSON.parse(row.path) as { type: string; coordinates: Position[] }) : null;
  if (path?.type !== 'LineString' || !path.coordinates.length) return null;
  const radial = row.plume.turnsTo === 'none' || row.plume.regime === 'equatorial-jet';
  return coastFrame(path.coordinates, settings.outflowAzimuthDeg, radial ? 'none' : row.plume.turnsTo, [
    settings.mouthLongitude,
    settings.mouthLatitude,
  ]);
}

/** Signed positions of points given as [lon, lat], each with an optional arc hint [m] from the database. */
export function placePoints(frame: CoastFrame, points: { lon: number; lat: number; s?: number | null; x?: number | null }[]): { s: number; x: number }[] {
  return points.map((p) =>
    coastPosition(frame, [p.lon, p.lat], p.s == null ? undefined : { s: Math.max(0, p.s), window: 2 * (p.x ?? 0) + 2000 }),
  );
}

/** Signed positions of a polygon's outline (every `spacing` m) and centroid. */
export function placeOutline(frame: CoastFrame, rings: Position[][], spacing = 30): { s: number; x: number }[] {
  return outlinePositions(frame, rings, spacing);
}

/** A footprint's walked coast as PostGIS holds it: [lon, lat] vertices, their running planar length in degrees, and its ellipsoidal length [m]. */
export interface DegreePath {
  /** The path's text and length: equal keys, equal paths (the footprints of one river often share their walked coast). */
  readonly key: string;
  readonly coords: Position[];
  readonly cum: number[];
  readonly lengthM: number;
}

/** The walked coast of a stored footprint in degrees (null when it has none or it is not one line). */
export async function footprintDegreePath(db: Database, footprintId: string): Promise<DegreePath | null> {
  const res = await db.execute<{ path: string | null; len: number | null }>(sql`
    SELECT ST_AsGeoJSON(path) AS path, ST_Length(path::geography) AS len FROM footprints WHERE id = ${footprintId}::uuid`);
  const row = res.rows[0];
  const path = row?.path ? (JSON.parse(row.path) as { type: string; coordinates: Position[] }) : null;
  if (path?.type !== 'LineString' || path.coordinates.length < 2 || !(Number(row.len) > 0)) return null;
  const cum = [0];
  for (let i = 1; i < path.coordinates.length; i += 1) {
    const a = path.coordinates[i - 1];
    const b = path.coordinates[i];
    cum.push(cum[i - 1] + Math.hypot(b[0] - a[0], b[1] - a[1]));
  }
  return { key: `${row.path}|${row.len}`, coords: path.coordinates, cum, lengthM: Number(row.len) };
}

/**
 * Bounds [m] on a lease's arc hint as the screening computed it in PostGIS,
 * `ST_LineLocatePoint(path, ST_ClosestPoint(path, lease)) × ST_Length(path::geography)`, from its point on the surface
 * (lon, lat) and bounding box alone (c, derived, in PostGIS's planar degrees): the closest point of the path is no
 * farther from the point than the point's own distance to the path plus the farthest corner of the box, so its place
 * along the path lies where the path passes within that radius. Null when the path never comes that close (cannot
 * happen but for rounding). A slack of 1 m on each side covers the rounding of the path's text and of the sums.
 */
export function arcHintBounds(
  path: DegreePath,
  lease: { lon: number; lat: number; x0: number; y0: number; x1: number; y1: number },
): [number, number] | null {
  const { coords, cum } = path;
  const px = lease.lon;
  const py = lease.lat;
  let d2min = Number.POSITIVE_INFINITY;
  for (let i = 0; i + 1 < coords.length; i += 1) d2min = Math.min(d2min, segmentDistance2(coords[i], coords[i + 1], px, py));
  let r = 0;
  for (const cx of [lease.x0, lease.x1]) for (const cy of [lease.y0, lease.y1]) r = Math.max(r, Math.hypot(cx - px, cy - py));
  const radius = (Math.sqrt(d2min) + r) * (1 + 1e-9) + 1e-9;
  const r2 = radius * radius;
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (let i = 0; i + 1 < coords.length; i += 1) {
    const a = coords[i];
    const b = coords[i + 1];
    if (segmentDistance2(a, b, px, py) > r2) continue;
    const ux = b[0] - a[0];
    const uy = b[1] - a[1];
    const len2 = ux * ux + uy * uy;
    const seg = cum[i + 1] - cum[i];
    if (len2 === 0) {
      lo = Math.min(lo, cum[i]);
      hi = Math.max(hi, cum[i]);
      continue;
    }
    // The stretch of the segment within the radius: the foot of the perpendicular ± the half chord.
    const t = ((px - a[0]) * ux + (py - a[1]) * uy) / len2;
    const fx = a[0] + t * ux - px;
    const fy = a[1] + t * uy - py;
    const half = Math.sqrt(Math.max(0, r2 - (fx * fx + fy * fy)) / len2);
    const t0 = Math.max(0, t - half);
    const t1 = Math.min(1, t + half);
    lo = Math.min(lo, cum[i] + t0 * seg);
    hi = Math.max(hi, cum[i] + t1 * seg);
  }
  if (!(lo <= hi)) return null;
  const total = cum[cum.length - 1];
  return [(lo / total) * path.lengthM - 1, (hi / total) * path.lengthM + 1];
}

function segmentDistance2(a: Position, b: Position, px: number, py: number): number {
  const ux = b[0] - a[0];
  const uy = b[1] - a[1];
  const len2 = ux * ux + uy * uy;
  const t = len2 > 0 ? Math.min(1, Math.max(0, ((px - a[0]) * ux + (py - a[1]) * uy) / len2)) : 0;
  const dx = a[0] + t * ux - px;
  const dy = a[1] + t * uy - py;
  return dx * dx + dy * dy;
}
