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
