/**
 * The built-in world coastline (issue #15): where no uploaded coast covers a new river's mouth,
 * the open OpenStreetMap-derived seas polygons of the npm package `@geo-maps/earth-seas-10m`
 * (data © OpenStreetMap contributors, ODbL 1.0) give the coast. Nothing is read at start-up: on
 * first use around a place, the package's GeoJSON is read once, clipped in memory to a window
 * around the mouth, and stored in PostGIS as a coast row (source 'builtin') with the window and the
 * sea inside it. Later rivers inside the same window reuse that row.
 */
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { sql } from 'drizzle-orm';
import type { Geometry } from 'geojson';
import { BUILTIN_COAST_ATTRIBUTION, BUILTIN_COAST_CAUTION } from '#shared/cautions';
import { clipRingToBox } from '#shared/geometry/clip-ring-to-box';
import type { PlanarPoint } from '#shared/geometry/overlay-rings';
import type { Database } from '../db/client';
import { UnprocessableError } from '../lib/errors';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

/** Half the window's height in degrees of latitude (about 67 km): the reach of all but the largest plumes (c). */
export const WINDOW_HALF_LAT_DEG = 0.6;
/** A stored window is reused while the mouth is at least this far (degrees) inside its edge. */
export const WINDOW_REUSE_MARGIN_DEG = 0.3;
/** How far (m) a mouth may lie from the built-in coastline: a click on the map at bay scale (c). */
export const MOUTH_MAX_DISTANCE_M = 2000;
/** An uploaded coast this close (m) to the mouth is used instead of the built-in one. */
export const UPLOADED_COAST_REACH_M = 50_000;

export const BUILTIN_COAST_NAME = 'Built-in world coastline (© OpenStreetMap contributors, ODbL)';
export { BUILTIN_COAST_ATTRIBUTION, BUILTIN_COAST_CAUTION };

function windowAround(lon: number, lat: number): [number, number, number, number] {
  const halfLon = Math.min(3, WINDOW_HALF_LAT_DEG / Math.max(0.2, Math.cos((lat * Math.PI) / 180)));
  return [Math.max(-180, lon - halfLon), Math.max(-90, lat - WINDOW_HALF_LAT_DEG), Math.min(180, lon + halfLon), Math.min(90, lat + WINDOW_HALF_LAT_DEG)];
}

/** The package's world seas, read when first needed (never at start-up) and not kept in memory. */
async function readWorldSeas(): Promise<number[][][][]> {
  const require = createRequire(import.meta.url);
  const file = require.resolve('@geo-maps/earth-seas-10m/map.geo.json');
  const data = JSON.parse(await readFile(file, 'utf8')) as { geometries: { type: string; coordinates: number[][][][] | number[][][] }[] };
  const polygons: number[][][][] = [];
  for (const g of data.geometries) {
    if (g.type === 'MultiPolygon') polygons.push(...(g.coordinates as number[][][][]));
    else if (g.type === 'Polygon') polygons.push(g.coordinates as number[][][]);
  }
  return polygons;
}

/**
 * The seas clipped to a box [w, s, e, n] in degrees: the outer rings (seas) and the holes (islands and
 * continents inside a sea polygon, as land polygons) apart, each clipped ring possibly needing repair.
 */
export function clipSeasToBox(
  polygons: number[][][][],
  box: [number, number, number, number],
): { seas: { type: 'MultiPolygon'; coordinates: number[][][][] }; lands: { type: 'MultiPolygon'; coordinates: number[][][][] } } {
  const [w, s, e, n] = box;
  const overlaps = (ring: number[][]) => {
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    for (const [x, y] of ring) {
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
    return !(maxX < w || minX > e || maxY < s || minY > n);
  };
  const clip = (ring: number[][]): number[][] | null => {
    const open = ring.slice(0, -1).map((p) => [p[0], p[1]] as PlanarPoint);
    const { points } = clipRingToBox(open, open.map(() => 1), box);
    if (points.length < 3) return null;
    return [...points.map((p) => [p[0], p[1]]), [points[0][0], points[0][1]]];
  };
  const seas: number[][][][] = [];
  const lands: number[][][][] = [];
  for (const polygon of polygons) {
    if (!polygon[0] || !overlaps(polygon[0])) continue;
    const outer = clip(polygon[0]);
    if (!outer) continue;
    seas.push([outer]);
    for (const hole of polygon.slice(1)) {
      if (!overlaps(hole)) continue;
      const clipped = clip(hole);
      if (clipped) lands.push([clipped]);
    }
  }
  return { seas: { type: 'MultiPolygon', coordinates: seas }, lands: { type: 'MultiPolygon', coordinates: lands } };
}

export interface BuiltinCoastCheck {
  coastId: string;
  /** Distance from the mouth to the nearest built-in coastline, m (null when the window holds none). */
  distanceM: number | null;
  onLand: boolean;
  /** Why the mouth cannot be used, or null. */
  problem: string | null;
}

/** Finds or loads the built-in coast around a place (a cached window in PostGIS). */
export async function ensureBuiltinCoast(db: Database | Tx, lon: number, lat: number): Promise<string> {
  const found = await db.execute<{ id: string }>(sql`
    SELECT id FROM coasts WHERE source = 'builtin'
       AND ST_Covers("window", ST_Expand(ST_SetSRID(ST_MakePoint(${lon}, ${lat}), 4326), ${WINDOW_REUSE_MARGIN_DEG}))
     ORDER BY created_at DESC LIMIT 1`);
  if (found.rows[0]) return found.rows[0].id;
  const box = windowAround(lon, lat);
  const sea = clipSeasToBox(await readWorldSeas(), box);
  const [w, s, e, n] = box;
  const env = sql`ST_MakeEnvelope(${w}, ${s}, ${e}, ${n}, 4326)`;
  const polygons = (g: unknown) => sql`ST_UnaryUnion(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(g)}), 4326)), 3))`;
  // Holes become land cut out of the seas (a clipped hole may run along the window's edge, which a ring of the same polygon cannot).
  const seaGeom = sea.lands.coordinates.length ? sql`ST_Difference(${polygons(sea.seas)}, ${polygons(sea.lands)})` : polygons(sea.seas);
  const inserted = await db.execute<{ id: string }>(sql`
    WITH s AS (SELECT ST_Multi(ST_Intersection(${seaGeom}, ${env})) AS sea),
         c AS (SELECT s.sea, ST_Multi(ST_LineMerge(ST_CollectionExtract(ST_Difference(ST_Boundary(s.sea), ST_Buffer(ST_Boundary(${env}), 1e-7)), 2))) AS line FROM s)
    INSERT INTO coasts (name, form, owner_id, jurisdiction_id, shared, source, "window", sea, geom)
    SELECT ${BUILTIN_COAST_NAME}, 'line', NULL, NULL, false, 'builtin', ${env}, c.sea, c.line FROM c
    RETURNING id`);
  return inserted.rows[0].id;
}

/** Checks a mouth against the built-in coast around it: on the coast (within MOUTH_MAX_DISTANCE_M), on land, or out at sea. */
export async function checkMouthOnBuiltinCoast(db: Database | Tx, lon: number, lat: number): Promise<BuiltinCoastCheck> {
  const coastId = await ensureBuiltinCoast(db, lon, lat);
  const res = await db.execute<{ distance: number | null; in_sea: boolean }>(sql`
    SELECT CASE WHEN ST_IsEmpty(geom) THEN NULL ELSE ST_Distance(geom::geography, ST_SetSRID(ST_MakePoint(${lon}, ${lat}), 4326)::geography) END AS distance,
           COALESCE(ST_Covers(sea, ST_SetSRID(ST_MakePoint(${lon}, ${lat}), 4326)), false) AS in_sea
      FROM coasts WHERE id = ${coastId}::uuid`);
  const { distance, in_sea: inSea } = res.rows[0];
  const km = (m: number) => `${(m / 1000).toFixed(1)} km`;
  let problem: string | null = null;
  if (distance === null) {
    problem = `The mouth is far from any coast: the built-in world coastline has no shore within about ${Math.round(WINDOW_HALF_LAT_DEG * 111)} km of it. Place the mouth where the river meets the sea, or upload the coast of your area.`;
  } else if (distance > MOUTH_MAX_DISTANCE_M) {
    problem = inSea
      ? `The mouth is out at sea, ${km(distance)} from the nearest coast. Place it on the coastline where the river meets the sea (within ${km(MOUTH_MAX_DISTANCE_M)}).`
      : `The mouth is on land, ${km(distance)} from the nearest coast. Place it on the coastline where the river meets the sea (within ${km(MOUTH_MAX_DISTANCE_M)}).`;
  }
  return { coastId, distanceM: distance, onLand: !inSea, problem };
}

/** Whether an uploaded (or traced) coast the river may use lies near its mouth. */
export async function uploadedCoastNear(db: Database | Tx, owner: { id: string; jurisdictionId: string | null }, lon: number, lat: number): Promise<boolean> {
  const res = await db.execute(sql`
    SELECT 1 FROM coasts
     WHERE source <> 'builtin' AND (owner_id = ${owner.id} OR (shared AND jurisdiction_id = ${owner.jurisdictionId}::uuid))
       AND ST_DWithin(geom::geography, ST_SetSRID(ST_MakePoint(${lon}, ${lat}), 4326)::geography, ${UPLOADED_COAST_REACH_M})
     LIMIT 1`);
  return res.rows.length > 0;
}

/** The built-in coastline inside a window, simplified for drawing, as GeoJSON. */
export async function builtinCoastGeometry(db: Database, coastId: string): Promise<{ line: Geometry; window: Geometry }> {
  const res = await db.execute<{ line: string; window: string }>(sql`
    SELECT ST_AsGeoJSON(ST_SimplifyPreserveTopology(geom, 0.00005), 6) AS line, ST_AsGeoJSON("window") AS window FROM coasts WHERE id = ${coastId}::uuid`);
  return { line: JSON.parse(res.rows[0].line), window: JSON.parse(res.rows[0].window) };
}

export function mouthError(check: BuiltinCoastCheck): UnprocessableError {
  return new UnprocessableError(check.problem ?? 'The mouth cannot be placed here.', { distanceM: check.distanceM, onLand: check.onLand });
}
