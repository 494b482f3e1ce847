/**
 * Footprints and screenings. A footprint is the plume of one river at one flow, built on the
 * river's coastline by the shared engine and stored in PostGIS with its bands cut into small
 * pieces; a screening is one lease under one scenario: fraction of the lease in each band
 * (computed in PostGIS), the field values over it and the engine's rating.
 */
import { createHash } from 'node:crypto';
import { type SQL, sql } from 'drizzle-orm';
import type { Geometry, Position } from 'geojson';
import { getSpeciesTolerance, SPECIES_IDS, type SpeciesTolerance } from '#shared/biology/species-tolerance';
import { buildFootprint } from '#shared/geometry/build-footprint';
import type { PlumeResult } from '#shared/physics/compute-plume';
import { type ExposureParameters, type fieldAt, worstField } from '#shared/physics/exposure-field';
import { type CoastFrame, coastPosition, coastPositionWithin, distanceToPath, outlinePositions, outlinePositionsWithin } from '#shared/geometry/coast-position';
import { MODEL_VERSION } from '#shared/physics/model-version';
import { riverPlume } from '#shared/physics/river-plume';
import type { RiverSettings } from '#shared/schemas/river';
import { annualiseExposure } from '#shared/scoring/annualise';
import { isHarmfulSalinityEvent } from '#shared/scoring/harmful-salinity';
import { salinityBandId, screeningBandSpecs, strictestSpecies } from '#shared/scoring/lease-band-specs';
import { daysBelowTolerance, scoreLease } from '#shared/scoring/score-lease';
import type { Database } from '../db/client';
import { NotFoundError, UnprocessableError } from '../lib/errors';

import { BUILTIN_COAST_CAUTION } from './builtin-coast.service';
import { arcHintBounds, footprintCoastFrame, footprintDegreePath } from './coast-positions';

const RATING_ORDER = ['low', 'moderate', 'high', 'severe'] as const;
const INDICATOR_STANDARD = 14;

interface RiverInputs {
  id: string;
  name: string;
  version: number;
  jurisdictionId: string | null;
  ownerId: string | null;
  settings: RiverSettings;
  coastId: string;
  coastGeometry: Geometry;
  coastStamp: string;
  coastSource: string;
}

/** One scenario of a screening run and the footprint its leases are screened against. */
export interface ScreeningPlanItem {
  footprint: { id: string; plume: PlumeResult };
  scenario: { id: string; aep: number | null; discharge: number; durationHours: number; name: string };
}

export interface FlowSpec {
  scenarioId?: string | null;
  discharge: number;
  durationHours: number;
}

/** The water and plume inputs of the engine for a river at one flow (shared with the browser's previews). */
export function plumeFor(
  settings: RiverSettings,
  flow: { discharge: number; durationHours: number },
): { plume: PlumeResult; params: ExposureParameters } {
  return riverPlume(settings, flow);
}

/** Outer and inner rings of a Polygon or MultiPolygon. */
export function polygonRings(geometry: { type: string; coordinates: unknown }): Position[][] {
  if (geometry.type === 'Polygon') return geometry.coordinates as Position[][];
  if (geometry.type === 'MultiPolygon') return (geometry.coordinates as Position[][][]).flat();
  return [];
}

/** Spacing of the points a lease outline is judged at [m], (c): a tenth of a 300 m lease. */
const OUTLINE_SPACING = 30;

/**
 * A lease's worst point in a plume: the field over its outline (every 30 m) and centroid, in the
 * plume's signed coordinates. `hint` is the arc of the lease's nearest point to the walked coast.
 */
export function leaseWorstPoint(
  frame: CoastFrame,
  rings: Position[][],
  plume: PlumeResult,
  params: ExposureParameters,
  hint: number | null,
): { field: ReturnType<typeof fieldAt>; at: { s: number; x: number } } | null {
  const positions = outlinePositions(frame, rings, OUTLINE_SPACING, hint ?? undefined);
  return positions.length ? worstField(plume, params, positions) : null;
}

/** A lease as the screening of one footprint reads it: its arc hint [m], point on it and bounding box (degrees). */
type LeaseRow = {
  id: string;
  species: string | null;
  s: number | null;
  x: number | null;
  lon: number;
  lat: number;
  x0: number;
  y0: number;
  x1: number;
  y1: number;
};

/** What screenLeases reads or works out once for all the footprints of its plan. */
interface RunCache {
  leases: Promise<LeaseRow[]>;
  /** arcHintBounds by path key, then lease. */
  hints: Map<string, Map<string, [number, number] | null>>;
  /** A lease's point in the frame's metres and its distance to the path, by path key and mouth, then lease. */
  near: Map<string, Map<string, { p: [number, number]; d: number }>>;
}

function entryOf<K, V>(map: Map<K, V>, key: K, make: () => V): V {
  let v = map.get(key);
  if (v === undefined) {
    v = make();
    map.set(key, v);
  }
  return v;
}

/**
 * The place of a lease outside the plume (its point on the surface, searched within 2x + 2 km of its arc hint s,
 * known here within [sLow, sHigh], x its geodesic distance to the path) without x: x lies between the point's distance to the path in the frame's
 * metres less the lease's own size and that distance, within the azimuthal-equidistant frame's scale error
 * (under 2 × 10⁻⁴ within 150 km of the mouth (c), taken as 10⁻³, plus 1 m). When the nearest segment is the same
 * for every window those bounds allow, that is the place; otherwise null (the caller reads s, then x, from PostGIS).
 */
function placedOutside(
  frame: CoastFrame,
  l: LeaseRow,
  sLow: number,
  sHigh: number,
  near?: Map<string, { p: [number, number]; d: number }>,
): { s: number; x: number } | null {
  // The point in the frame's metres and its distance to the path depend on the path and the mouth alone: kept in
  // `near` for the other footprints of a run on the same walked coast.
  let known = near?.get(l.id);
  if (!known) {
    const p = frame.projection.forward([l.lon, l.lat]);
    known = { p, d: distanceToPath(frame, p) };
    near?.set(l.id, known);
  }
  const { p, d } = known;
  if (!(Math.hypot(p[0], p[1]) <= 150_000)) return null;
  // The lease's size: its bounding box's diagonal in metres, generous (degrees of 111.7 km and 111.32 km × cos φ, + 1 %).
  const cosLat = Math.cos((Math.min(Math.abs(l.y0), Math.abs(l.y1)) * Math.PI) / 180);
  const size = 1.01 * Math.hypot((l.y1 - l.y0) * 111_700, (l.x1 - l.x0) * 111_320 * cosLat);
  const xLow = Math.max(0, d * (1 - 1e-3) - 1 - size);
  const xHigh = d * (1 + 1e-3) + 1;
  return coastPositionWithin(frame, p, Math.max(0, sLow), Math.max(0, sHigh), 2 * xLow + 2000, 2 * xHigh + 2000);
}

const speciesMemo = new Map<string | null, { tolerance: SpeciesTolerance; known: boolean }>();
/** The tolerance row a lease is scored with (the table is fixed: one frozen row per species, looked up once). */
function speciesOf(species: string | null): { tolerance: SpeciesTolerance; known: boolean } {
  let found = speciesMemo.get(species);
  if (!found) {
    found = speciesRow(species);
    speciesMemo.set(species, found);
  }
  return found;
}

function speciesRow(species: string | null): { tolerance: SpeciesTolerance; known: boolean } {
  if (species && (SPECIES_IDS as readonly string[]).includes(species)) return { tolerance: getSpeciesTolerance(species), known: true };
  return { tolerance: strictestSpecies(), known: false };
}

/** The band a lease of each species is scored against, and the fallback for unknown species. */
function speciesBandMap(): { map: Record<string, string>; fallback: string } {
  const map: Record<string, string> = {};
  for (const id of SPECIES_IDS) map[id] = salinityBandId(getSpeciesTolerance(id).chronicLowerSalinity);
  return { map, fallback: salinityBandId(strictestSpecies().chronicLowerSalinity) };
}

/**
 * Fraction of each lease's area inside the bands a screening needs (plume edge, indicator over
 * the standard, and the "salinity under N" band of the lease's species), in PostGIS: a lease the whole
 * band covers counts 1; otherwise it is cut against the band's small GiST-indexed pieces, a piece that
 * covers it counting 1 without an intersection, else the area ratio of intersection to lease. The ratio is taken in lon/lat: for a lease
 * a few hundred metres across the scale factors of both areas cancel to better than 1e-4 (c),
 * which saves the ellipsoidal area of every partial piece. `where` filters the leases (alias l).
 */
export async function leaseBandFractions(db: Database, footprintId: string, where: SQL): Promise<Map<string, Record<string, number>>> {
  const { map, fallback } = speciesBandMap();
  // Two passes. First, the leases a whole band covers count 1 for it: each band is the repeated first argument of
  // ST_Covers, so PostGIS prepares it once and tests every lease the GiST index finds against it. Second, only the
  // remaining lease × band pairs are cut against the band's small pieces (the footprint's pieces drive the join, each
  // probing the leases' index, instead of every lease probing the pieces of every footprint).
  const wanted = sql`(b.band_id IN ('plume-edge', 'indicator-over-standard') OR b.band_id = COALESCE(${JSON.stringify(map)}::jsonb ->> l.species, ${fallback}))`;
  const fractions = await db.execute<{ lease_id: string; fractions: Record<string, number> }>(sql`
    WITH bands AS MATERIALIZED (
      SELECT band_id, geom FROM footprint_bands
       WHERE footprint_id = ${footprintId}::uuid AND band_id IN (SELECT band_id FROM footprint_band_pieces WHERE footprint_id = ${footprintId}::uuid)),
    whole AS MATERIALIZED (
      SELECT l.id AS lease_id, b.band_id FROM bands b JOIN leases l ON ST_Covers(b.geom, l.geom)
       WHERE ${where} AND ${wanted}),
    pieces AS MATERIALIZED (SELECT band_id, geom FROM footprint_band_pieces WHERE footprint_id = ${footprintId}::uuid),
    part AS (
      SELECT l.id AS lease_id, b.band_id,
             SUM(CASE WHEN ST_CoveredBy(l.geom, b.geom) THEN 1.0 ELSE ST_Area(ST_Intersection(l.geom, b.geom)) / NULLIF(ST_Area(l.geom), 0) END) AS fraction
        FROM pieces b JOIN leases l ON ST_Intersects(l.geom, b.geom)
       WHERE ${where} AND ${wanted}
         AND NOT EXISTS (SELECT 1 FROM whole w WHERE w.lease_id = l.id AND w.band_id = b.band_id)
       GROUP BY l.id, b.band_id),
    frac AS (SELECT lease_id, band_id, fraction FROM part UNION ALL SELECT lease_id, band_id, 1.0 FROM whole)
    SELECT lease_id, jsonb_object_agg(band_id, LEAST(1, fraction)) AS fractions FROM frac GROUP BY lease_id`);
  return new Map(fractions.rows.map((r) => [r.lease_id, r.fractions]));
}

/**
 * Which leases a river screens (issue #15), as SQL over a lease alias:
 * - leases of the river's jurisdiction and leases of the river's creator (as before), and
 * - any lease its plume can reach (it meets a stored footprint band of the river) whose holder may use
 *   the river: a river of any jurisdiction (shared by the authority), or a river created by an adviser the
 *   holder has an accepted client link with. Another grower's private river (no jurisdiction) never pairs.
 */
function riverReachesLeaseSql(riverId: SQL, jurisdictionId: SQL, ownerId: SQL, alias: string): SQL {
  const a = sql.raw(alias);
  return sql`((${jurisdictionId} IS NOT NULL AND ${a}.jurisdiction_id = ${jurisdictionId})
    OR ${a}.owner_id = ${ownerId}
    OR ((${jurisdictionId} IS NOT NULL
         OR EXISTS (SELECT 1 FROM client_invitations ci WHERE ci.status = 'accepted' AND ci.adviser_id = ${ownerId} AND ci.grower_id = ${a}.owner_id))
        AND EXISTS (SELECT 1 FROM footprints rf JOIN footprint_band_pieces rp ON rp.footprint_id = rf.id
                     WHERE rf.river_id = ${riverId} AND rp.band_id = 'plume-edge' AND ST_Intersects(rp.geom, ${a}.geom))))`;
}

function riverReachesLease(river: { id: string; jurisdictionId: string | null; ownerId: string | null }, alias: string): SQL {
  return riverReachesLeaseSql(sql`${river.id}::uuid`, sql`${river.jurisdictionId}::uuid`, sql`${river.ownerId}::text`, alias);
}

export function createScreeningService(deps: { db: Database }) {
  const { db } = deps;

  async function riverInputs(riverId: string): Promise<RiverInputs> {
    const res = await db.execute<{
      id: string;
      name: string;
      version: number;
      jurisdiction_id: string | null;
      owner_id: string | null;
      settings: RiverSettings;
      coast_id: string | null;
    }>(sql`
      SELECT id, name, version, jurisdiction_id, owner_id, settings, coast_id FROM rivers WHERE id = ${riverId}::uuid`);
    const river = res.rows[0];
    if (!river) throw new NotFoundError('No river with this id.');
    const coast = await db.execute<{ id: string; geometry: string; created_at: Date; source: string }>(sql`
      SELECT id, ST_AsGeoJSON(geom) AS geometry, created_at, source FROM coasts
       WHERE (${river.coast_id}::uuid IS NOT NULL AND id = ${river.coast_id}::uuid)
          OR (${river.coast_id}::uuid IS NULL AND ((shared AND jurisdiction_id = ${river.jurisdiction_id}::uuid) OR owner_id = ${river.owner_id}))
       ORDER BY (id = ${river.coast_id}::uuid) DESC NULLS LAST, (form = 'line') DESC, shared DESC, created_at DESC LIMIT 1`);
    if (!coast.rows[0]) {
      throw new UnprocessableError(
        `${river.name} has no coastline to build its plume on. Upload the coast (a shoreline or land polygons) of its region first.`,
      );
    }
    return {
      id: river.id,
      name: river.name,
      version: river.version,
      jurisdictionId: river.jurisdiction_id,
      ownerId: river.owner_id,
      settings: river.settings,
      coastId: coast.rows[0].id,
      coastGeometry: JSON.parse(coast.rows[0].geometry),
      coastStamp: `${coast.rows[0].id}@${new Date(coast.rows[0].created_at).toISOString()}`,
      coastSource: coast.rows[0].source,
    };
  }

  /** Builds (or finds, by input hash) the footprint of a river at one flow. */
  async function ensureFootprint(river: RiverInputs, flow: FlowSpec): Promise<{ id: string; plume: PlumeResult; created: boolean }> {
    const bands = screeningBandSpecs(river.settings.seaSalinity, INDICATOR_STANDARD);
    const inputHash = createHash('sha256')
      .update(
        JSON.stringify({
          MODEL_VERSION,
          settings: river.settings,
          coast: river.coastStamp,
          discharge: flow.discharge,
          durationHours: flow.durationHours,
          bands,
        }),
      )
      .digest('hex');
    const found = async (exec: Pick<Database, 'execute'>) => {
      const existing = await exec.execute<{ id: string; plume: PlumeResult }>(sql`
        SELECT id, plume FROM footprints WHERE river_id = ${river.id}::uuid AND input_hash = ${inputHash}`);
      if (!existing.rows[0]) return null;
      if (flow.scenarioId)
        await exec.execute(sql`UPDATE footprints SET scenario_id = ${flow.scenarioId}::uuid WHERE id = ${existing.rows[0].id}::uuid`);
      return { id: existing.rows[0].id, plume: existing.rows[0].plume, created: false };
    };
    const cached = await found(db);
    if (cached) return cached;
    // Several workers (or runs) may ask for the same footprint at once: one transaction-scoped
    // advisory lock per (river, inputs), taken before anything else, so exactly one builds it and
    // the others wait, then find it. One lock per transaction cannot deadlock with another.
    return db.transaction(async (tx) => {
      await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtextextended(${`footprint:${river.id}:${inputHash}`}, 0))`);
      return (await found(tx)) ?? buildAndStore(tx, river, flow, bands, inputHash);
    });
  }

  /** Computes a footprint and stores it with its bands and their pieces, in the caller's (locked) transaction. */
  async function buildAndStore(
    tx: Pick<Database, 'execute'>,
    river: RiverInputs,
    flow: FlowSpec,
    bands: ReturnType<typeof screeningBandSpecs>,
    inputHash: string,
  ): Promise<{ id: string; plume: PlumeResult; created: boolean }> {
    let plume: PlumeResult;
    let footprint: ReturnType<typeof buildFootprint>;
    try {
      const engine = plumeFor(river.settings, flow);
      plume = engine.plume;
      footprint = buildFootprint({
        coast: river.coastGeometry as never,
        mouth: [river.settings.mouthLongitude, river.settings.mouthLatitude],
        outflowAzimuth: river.settings.outflowAzimuthDeg,
        plume,
        params: engine.params,
        bands,
        options: { alongSteps: 200 },
      });
    } catch (err) {
      if (err instanceof RangeError || err instanceof TypeError) throw new UnprocessableError(`${river.name}: ${(err as Error).message}`);
      throw err;
    }

    const warnings = [...plume.warnings, ...footprint.warnings, ...(river.coastSource === 'builtin' ? [BUILTIN_COAST_CAUTION] : [])];
    const inserted = await tx.execute<{ id: string }>(sql`
      INSERT INTO footprints (river_id, scenario_id, discharge, duration_hours, model_version, input_hash, plume, warnings, path)
      VALUES (${river.id}::uuid, ${flow.scenarioId ?? null}::uuid, ${flow.discharge}, ${flow.durationHours}, ${MODEL_VERSION}, ${inputHash},
              ${JSON.stringify(plume)}::jsonb, ${JSON.stringify(warnings)}::jsonb, ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(footprint.path.geometry)}), 4326))
      ON CONFLICT (river_id, input_hash) DO UPDATE SET scenario_id = COALESCE(EXCLUDED.scenario_id, footprints.scenario_id)
      RETURNING id`);
    const id = inserted.rows[0].id;
    const rows = [
      ...(footprint.bulge
        ? [{ band: 'bulge', name: 'Bulge near the mouth', kind: 'bulge', threshold: null, order: 0, geometry: footprint.bulge.geometry }]
        : []),
      ...footprint.bands.map((b, i) => ({
        band: b.properties.id,
        name: b.properties.name,
        kind: b.properties.kind,
        threshold: Object.values(b.properties.threshold)[0] as number,
        order: i + 1,
        geometry: b.geometry,
      })),
    ].filter((r) => (r.geometry.type === 'MultiPolygon' ? r.geometry.coordinates.length > 0 : r.geometry.coordinates.length > 0));
    if (rows.length) {
      await tx.execute(sql`
        INSERT INTO footprint_bands (footprint_id, band_id, name, kind, threshold, sort_order, geom)
        SELECT ${id}::uuid, r.band, r.name, r.kind, r.threshold, r.ord,
               ST_Multi(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(r.geometry::text), 4326)), 3))
          FROM jsonb_to_recordset(${JSON.stringify(rows.map((r) => ({ ...r, ord: r.order })))}::jsonb)
               AS r(band text, name text, kind text, threshold double precision, ord int, geometry jsonb)
        ON CONFLICT DO NOTHING`);
      await tx.execute(sql`
        INSERT INTO footprint_band_pieces (footprint_id, band_id, geom)
        SELECT footprint_id, band_id, ST_Subdivide(geom, 64) FROM footprint_bands WHERE footprint_id = ${id}::uuid AND band_id <> 'bulge'`);
    }
    return { id, plume, created: true };
  }

  /** Leases a river screens (see riverReachesLease): those of its jurisdiction, its owner's, and any it may reach. */
  function scopedLeases(river: RiverInputs, alias = 'l') {
    return riverReachesLease({ id: river.id, jurisdictionId: river.jurisdictionId, ownerId: river.ownerId }, alias);
  }

  /** The same set as scopedLeases, found through the indexes (the footprint pieces first, then the leases they meet). */
  async function pairedLeaseIds(river: RiverInputs, leaseIds?: string[]): Promise<string[]> {
    const only = leaseIds ? sql`AND l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(leaseIds)}::jsonb)::uuid)` : sql``;
    const res = await db.execute<{ id: string }>(sql`
      SELECT l.id FROM leases l
       WHERE ((${river.jurisdictionId}::uuid IS NOT NULL AND l.jurisdiction_id = ${river.jurisdictionId}::uuid) OR l.owner_id = ${river.ownerId}) ${only}
      UNION
      SELECT DISTINCT l.id FROM footprints f JOIN footprint_band_pieces p ON p.footprint_id = f.id AND p.band_id = 'plume-edge'
        JOIN leases l ON ST_Intersects(p.geom, l.geom)
       WHERE f.river_id = ${river.id}::uuid ${only}
         AND (${river.jurisdictionId}::uuid IS NOT NULL
              OR EXISTS (SELECT 1 FROM client_invitations ci WHERE ci.status = 'accepted' AND ci.adviser_id = ${river.ownerId} AND ci.grower_id = l.owner_id))`);
    return res.rows.map((r) => r.id);
  }

  /** The leases as screenFootprint reads them: point on the surface and bounding box (`where` over alias l). */
  async function readLeases(where: SQL): Promise<LeaseRow[]> {
    const res = await db.execute<LeaseRow>(sql`
      SELECT l.id, l.species, NULL::float8 AS s, NULL::float8 AS x,
             ST_X(ST_PointOnSurface(l.geom)) AS lon, ST_Y(ST_PointOnSurface(l.geom)) AS lat,
             ST_XMin(l.geom) AS x0, ST_YMin(l.geom) AS y0, ST_XMax(l.geom) AS x1, ST_YMax(l.geom) AS y1
        FROM leases l
       WHERE ${where}`);
    return res.rows;
  }

  /** Screens every scoped lease under one scenario's footprint, replacing earlier rows. */
  async function screenFootprint(
    river: RiverInputs,
    footprint: { id: string; plume: PlumeResult },
    scenario: { id: string; aep: number | null; discharge: number; durationHours: number; name: string },
    leaseIds?: string[],
    cache?: RunCache,
  ) {
    const leaseFilter = leaseIds ? sql`AND l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(leaseIds)}::jsonb)::uuid)` : sql``;
    // leaseIds (the paired leases, from screenLeases) stand for the river's scope; without them the scope is computed here.
    const scope = leaseIds ? sql`true` : scopedLeases(river);
    // The reads are independent: on connections of the pool at once.
    const [byLease, leases, frame, degreePath] = await Promise.all([
      leaseBandFractions(db, footprint.id, sql`${scope} ${leaseFilter}`),
      // Read once per run when screenLeases gives them (copies: s and x are set per footprint below).
      (cache ? cache.leases : readLeases(sql`${scope} ${leaseFilter}`)).then((rows) => ({ rows: rows.map((r) => ({ ...r })) })),
      // The frame is needed for every lease: those outside the plume still report their own signed place.
      footprintCoastFrame(db, footprint.id, river.settings),
      footprintDegreePath(db, footprint.id),
    ]);
    const { params } = plumeFor(river.settings, scenario);
    const days = scenario.durationHours / 24;
    // Each lease in the plume is judged at its own worst point: its outline and centroid placed in
    // the plume's signed coordinates (up-coast of the mouth in the bulge's own frame).
    const inPlumeIds = leases.rows.filter((l) => (byLease.get(l.id)?.['plume-edge'] ?? 0) > 0).map((l) => l.id);
    const outlines = new Map<string, Position[][]>();
    if (inPlumeIds.length) {
      const geo = await db.execute<{ id: string; geometry: string }>(sql`
        SELECT l.id, ST_AsGeoJSON(l.geom, 7) AS geometry FROM leases l
         WHERE l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(inPlumeIds)}::jsonb)::uuid)`);
      for (const g of geo.rows) outlines.set(g.id, polygonRings(JSON.parse(g.geometry)));
    }
    // Every lease is searched for along the path around its arc hint s: the arc of its closest point on the path, as
    // PostGIS gives it (ST_LineLocatePoint of ST_ClosestPoint, per lease the dearest figure with its geodesic distance
    // below). Both are bounded here instead (arcHintBounds, placedOutside); a lease is placed from the bounds when
    // every value they allow gives the same nearest path segment, i.e. the same figures, and only the others are read
    // from PostGIS and placed as before.
    const inPlume = new Set(inPlumeIds);
    const worstById = new Map<string, ReturnType<typeof leaseWorstPoint>>();
    const placed = new Map<string, { s: number; x: number }>();
    const needS: LeaseRow[] = [];
    const hints = degreePath ? entryOf(cache?.hints ?? new Map(), degreePath.key, () => new Map<string, [number, number] | null>()) : null;
    const near = degreePath
      ? entryOf(cache?.near ?? new Map(), `${degreePath.key}|${river.settings.mouthLongitude},${river.settings.mouthLatitude}`, () => new Map())
      : undefined;
    for (const l of leases.rows) {
      let hint: [number, number] | null = null;
      if (frame && degreePath && hints) {
        const had = hints.get(l.id);
        hint = had === undefined ? arcHintBounds(degreePath, l) : had;
        if (had === undefined) hints.set(l.id, hint);
      }
      if (!frame || !hint) {
        needS.push(l);
        continue;
      }
      if (inPlume.has(l.id) && outlines.has(l.id)) {
        const positions = outlinePositionsWithin(frame, outlines.get(l.id) as Position[][], OUTLINE_SPACING, hint[0], hint[1]);
        if (!positions) {
          needS.push(l);
          continue;
        }
        const worst = positions.length ? worstField(footprint.plume, params, positions) : null;
        worstById.set(l.id, worst);
        if (worst) continue;
      }
      const at = placedOutside(frame, l, hint[0], hint[1], near);
      if (at) placed.set(l.id, at);
      else needS.push(l);
    }
    if (needS.length) {
      // The path's ellipsoidal length is worked out once (a MATERIALIZED CTE), not once per lease.
      const exact = await db.execute<{ id: string; s: number | null }>(sql`
        WITH f AS MATERIALIZED (SELECT path, ST_Length(path::geography) AS len FROM footprints WHERE id = ${footprint.id}::uuid)
        SELECT l.id, ST_LineLocatePoint(f.path, ST_ClosestPoint(f.path, l.geom)) * f.len AS s FROM leases l, f
         WHERE l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(needS.map((l) => l.id))}::jsonb)::uuid)`);
      const sById = new Map(exact.rows.map((r) => [r.id, r.s]));
      for (const l of needS) {
        l.s = sById.get(l.id) ?? null;
        if (inPlume.has(l.id) && frame && outlines.has(l.id)) {
          const worst = leaseWorstPoint(frame, outlines.get(l.id) as Position[][], footprint.plume, params, l.s);
          worstById.set(l.id, worst);
          if (worst) continue;
        }
        const at = frame && l.s !== null ? placedOutside(frame, l, l.s, l.s, near) : null;
        if (at) placed.set(l.id, at);
      }
    }
    // The distance to the path (geodesic) is read only where the bounds did not decide the place.
    const needX = leases.rows.filter((l) => !worstById.get(l.id) && !placed.has(l.id)).map((l) => l.id);
    const xById = new Map<string, number | null>();
    if (needX.length) {
      const dist = await db.execute<{ id: string; x: number | null }>(sql`
        WITH f AS MATERIALIZED (SELECT path::geography AS g FROM footprints WHERE id = ${footprint.id}::uuid)
        SELECT l.id, ST_Distance(l.geom::geography, f.g) AS x FROM leases l, f
         WHERE l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(needX)}::jsonb)::uuid)`);
      for (const r of dist.rows) xById.set(r.id, r.x);
    }
    for (const l of leases.rows) if (!placed.has(l.id)) l.x = xById.get(l.id) ?? null;
    const outsideScores = new Map<string, ReturnType<typeof scoreLease>>();
    const rows = leases.rows.map((l) => {
      const fractionsOfLease = byLease.get(l.id) ?? {};
      const { tolerance, known } = speciesOf(l.species);
      const inPlume = (fractionsOfLease['plume-edge'] ?? 0) > 0;
      const worst = worstById.get(l.id) ?? null;
      const field = worst ? worst.field : null;
      const outside = placed.get(l.id);
      if (worst) {
        l.s = worst.at.s;
        l.x = worst.at.x;
      } else if (outside) {
        l.s = outside.s;
        l.x = outside.x;
      } else if (frame && l.s !== null) {
        // Outside the plume: the lease's own place (a point on it), never "at the mouth".
        const at = coastPosition(frame, [l.lon, l.lat], { s: Math.max(0, l.s), window: 2 * (l.x ?? 0) + 2000 });
        l.s = at.s;
        l.x = at.x;
      }
      // The field at the lease's worst point, made consistent with the band polygons it touches.
      const inSpeciesBand = (fractionsOfLease[salinityBandId(tolerance.chronicLowerSalinity)] ?? 0) > 0;
      const inIndicatorBand = (fractionsOfLease['indicator-over-standard'] ?? 0) > 0;
      let lowestSalinity = field ? field.salinity : river.settings.seaSalinity;
      lowestSalinity = inSpeciesBand
        ? Math.min(lowestSalinity, tolerance.chronicLowerSalinity - 0.1)
        : Math.max(lowestSalinity, tolerance.chronicLowerSalinity);
      let highestIndicator = field ? field.indicator : 0;
      highestIndicator = inIndicatorBand
        ? Math.max(highestIndicator, INDICATOR_STANDARD * 1.01)
        : Math.min(highestIndicator, INDICATOR_STANDARD);
      const below = daysBelowTolerance(inPlume ? lowestSalinity : null, days, tolerance);
      const speciesBand = salinityBandId(tolerance.chronicLowerSalinity);
      // Outside the plume a score depends on the species and the fractions alone (no salinity, no indicator): one
      // scoreLease per distinct input, most of a run's leases sharing one.
      const memoKey = inPlume
        ? null
        : `${l.species}|${fractionsOfLease['plume-edge'] ?? 0}|${fractionsOfLease[speciesBand] ?? 0}|${fractionsOfLease['indicator-over-standard'] ?? 0}`;
      const memo = memoKey === null ? undefined : outsideScores.get(memoKey);
      const score = memo ?? scoreLease({
        tolerance,
        scenario: { aep: scenario.aep, discharge: scenario.discharge, floodDurationDays: days, name: scenario.name },
        bandFractions: {
          'plume-edge': fractionsOfLease['plume-edge'] ?? 0,
          [speciesBand]: fractionsOfLease[speciesBand] ?? 0,
          'indicator-over-standard': fractionsOfLease['indicator-over-standard'] ?? 0,
        },
        lowestSalinity: inPlume ? lowestSalinity : null,
        highestIndicator: inPlume ? highestIndicator : null,
        daysBelowTolerance: below,
        indicatorThreshold: INDICATOR_STANDARD,
      });
      if (memoKey !== null && !memo) outsideScores.set(memoKey, score);
      const reasons = [...score.reasons];
      if (!known)
        reasons.push(
          `The lease's species is not set, so the strictest salinity limit in the table (${tolerance.commonNamePlural}, ${tolerance.chronicLowerSalinity}) was used. Set the species for a rating of its own.`,
        );
      return {
        lease: l.id,
        fractions: fractionsOfLease,
        lowest: inPlume ? lowestSalinity : null,
        highest: inPlume ? highestIndicator : null,
        days: below,
        rating: score.rating,
        score: score.score,
        reasons,
        numbers: { ...score.numbers, species: tolerance.id, speciesKnown: known, alongM: l.s, offshoreM: l.x },
      };
    });
    const inputHash = createHash('sha256').update(`${footprint.id}:${MODEL_VERSION}`).digest('hex');
    const CHUNK = 1000;
    for (let i = 0; i < rows.length; i += CHUNK) {
      // Each row's JSON values are taken out of the chunk's one jsonb as they are (r->'numbers'), not through a
      // record type whose jsonb columns PostgreSQL would print and parse again.
      await db.execute(sql`
        INSERT INTO screenings (lease_id, scenario_id, footprint_id, river_id, band_fractions, lowest_salinity, highest_indicator, days_below_tolerance, rating, score, reasons, numbers, model_version, input_hash, computed_at)
        SELECT (r->>'lease')::uuid, ${scenario.id}::uuid, ${footprint.id}::uuid, ${river.id}::uuid, r->'fractions', (r->>'lowest')::float8, (r->>'highest')::float8,
               (r->>'days')::float8, r->>'rating', (r->>'score')::float8, r->'reasons', r->'numbers', ${MODEL_VERSION}, ${inputHash}, now()
          FROM jsonb_array_elements(${JSON.stringify(rows.slice(i, i + CHUNK))}::jsonb) AS r
        ON CONFLICT (lease_id, scenario_id) DO UPDATE SET footprint_id = EXCLUDED.footprint_id, band_fractions = EXCLUDED.band_fractions,
          lowest_salinity = EXCLUDED.lowest_salinity, highest_indicator = EXCLUDED.highest_indicator, days_below_tolerance = EXCLUDED.days_below_tolerance,
          rating = EXCLUDED.rating, score = EXCLUDED.score, reasons = EXCLUDED.reasons, numbers = EXCLUDED.numbers, model_version = EXCLUDED.model_version,
          input_hash = EXCLUDED.input_hash, computed_at = now()`);
    }
    return rows.length;
  }

  /**
   * Yearly figures per lease across the river's flood-frequency scenarios (shared/scoring/annualise.ts):
   * days below the salinity tolerance, closure days (days the indicator is above the standard) and the
   * chance a year of a salinity event harmful to the lease's species (shared/scoring/harmful-salinity.ts).
   */
  async function annualise(river: Pick<RiverInputs, 'id'>, leaseIds?: string[]) {
    const leaseFilter = leaseIds
      ? sql`AND s.lease_id IN (SELECT jsonb_array_elements_text(${JSON.stringify(leaseIds)}::jsonb)::uuid)`
      : sql``;
    const res = await db.execute<{
      lease_id: string;
      species: string | null;
      points: { aep: number; days: number; rating: string; lowest: number | null; indicator: number | null; durationHours: number }[];
    }>(sql`
      SELECT s.lease_id, l.species,
             jsonb_agg(jsonb_build_object('aep', sc.aep, 'days', s.days_below_tolerance, 'rating', s.rating, 'lowest', s.lowest_salinity,
                                          'indicator', s.highest_indicator, 'durationHours', sc.duration_hours)) AS points
        FROM screenings s JOIN scenarios sc ON sc.id = s.scenario_id JOIN leases l ON l.id = s.lease_id
       WHERE s.river_id = ${river.id}::uuid AND sc.kind = 'aep' ${leaseFilter}
       GROUP BY s.lease_id, l.species`);
    const annual: { lease: string; expected: number; probability: number; worst: string; closure: number; harmful: number; details: unknown }[] = [];
    for (const row of res.rows) {
      const points = row.points.filter((p) => p.aep > 0 && p.aep < 1);
      if (!points.length) continue;
      const { tolerance } = speciesOf(row.species);
      const salinity = annualiseExposure(points.map((p) => ({ aep: p.aep, days: p.days })));
      // Closure days (c): a flood whose highest indicator on the lease is above the standard counts its whole
      // duration as days above it; the sum over the AEP bands of the band's probability mass × those days.
      const indicator = annualiseExposure(
        points.map((p) => ({ aep: p.aep, days: p.indicator !== null && p.indicator > INDICATOR_STANDARD ? p.durationHours / 24 : 0 })),
      );
      // Harmful salinity (c): the most frequent flood whose low salinity harms the species gives the chance a year.
      const harmful = annualiseExposure(
        points.map((p) => ({
          aep: p.aep,
          days: isHarmfulSalinityEvent({ lowestSalinity: p.lowest, daysBelowTolerance: p.days }, tolerance) ? p.days : 0,
        })),
      );
      const result = {
        ...salinity,
        indicator: {
          standard: INDICATOR_STANDARD,
          expectedDaysPerYear: indicator.expectedDaysPerYear,
          probabilityOfAnyExposure: indicator.probabilityOfAnyExposure,
          segments: indicator.segments,
        },
        harmfulSalinity: {
          species: tolerance.id,
          probabilityPerYear: harmful.probabilityOfAnyExposure,
          expectedDaysPerYear: harmful.expectedDaysPerYear,
        },
      };
      const worst = points.reduce(
        (w, p) => (RATING_ORDER.indexOf(p.rating as never) > RATING_ORDER.indexOf(w as never) ? p.rating : w),
        'low',
      );
      annual.push({
        lease: row.lease_id,
        expected: result.expectedDaysPerYear,
        probability: result.probabilityOfAnyExposure,
        worst,
        closure: indicator.expectedDaysPerYear,
        harmful: harmful.probabilityOfAnyExposure,
        details: result,
      });
    }
    // 1 000 rows a statement instead of one statement per lease.
    const CHUNK = 1000;
    for (let i = 0; i < annual.length; i += CHUNK) {
      await db.execute(sql`
        INSERT INTO lease_annual_exposure (lease_id, river_id, expected_days_per_year, probability_any_exposure, worst_rating,
                                           closure_days_per_year, harmful_salinity_chance, details, computed_at)
        SELECT (r->>'lease')::uuid, ${river.id}::uuid, (r->>'expected')::float8, (r->>'probability')::float8, r->>'worst',
               (r->>'closure')::float8, (r->>'harmful')::float8, r->'details', now()
          FROM jsonb_array_elements(${JSON.stringify(annual.slice(i, i + CHUNK))}::jsonb) AS r
        ON CONFLICT (lease_id, river_id) DO UPDATE SET expected_days_per_year = EXCLUDED.expected_days_per_year,
          probability_any_exposure = EXCLUDED.probability_any_exposure, worst_rating = EXCLUDED.worst_rating,
          closure_days_per_year = EXCLUDED.closure_days_per_year, harmful_salinity_chance = EXCLUDED.harmful_salinity_chance,
          details = EXCLUDED.details, computed_at = now()`);
    }
  }

  /**
   * Yearly figures stored before the yearly rating existed (no harmful-salinity chance): re-annualise their rivers
   * from the stored screenings. Cheap (no footprint is built); run at start-up.
   */
  async function annualiseMissing(): Promise<number> {
    const stale = await db.execute<{ river_id: string }>(
      sql`SELECT DISTINCT river_id FROM lease_annual_exposure WHERE harmful_salinity_chance IS NULL OR closure_days_per_year IS NULL`,
    );
    for (const r of stale.rows) await annualise({ id: r.river_id });
    return stale.rows.length;
  }

  /**
   * The first half of a river's screening, done once per run: the footprint of every scenario
   * (built, or found by its inputs) and the drop of stale footprints. The plan it returns is what
   * screenLeases needs, so the leases can then be screened in any number of chunks, anywhere.
   */
  async function prepareRiver(riverId: string, onProgress?: (done: number, total: number, what: string) => Promise<void> | void) {
    const river = await riverInputs(riverId);
    const scenarios = await db.execute<{ id: string; aep: number | null; discharge: number; duration_hours: number; name: string }>(sql`
      SELECT id, aep, discharge, duration_hours, name FROM scenarios WHERE river_id = ${riverId}::uuid ORDER BY discharge`);

    const plan: ScreeningPlanItem[] = [];
    for (const [i, s] of scenarios.rows.entries()) {
      await onProgress?.(i, scenarios.rows.length, `Building the plume for ${s.name}`);
      const fp = await ensureFootprint(river, { scenarioId: s.id, discharge: s.discharge, durationHours: s.duration_hours });
      plan.push({
        footprint: { id: fp.id, plume: fp.plume },
        scenario: { id: s.id, aep: s.aep, discharge: s.discharge, durationHours: s.duration_hours, name: s.name },
      });
    }
    // A lease the changed river no longer reaches (its footprints moved) loses that river's results.
    const paired = await pairedLeaseIds(river);
    const keep = sql`(SELECT jsonb_array_elements_text(${JSON.stringify(paired)}::jsonb)::uuid)`;
    await db.execute(sql`DELETE FROM screenings WHERE river_id = ${riverId}::uuid AND lease_id NOT IN ${keep}`);
    await db.execute(sql`DELETE FROM lease_annual_exposure WHERE river_id = ${riverId}::uuid AND lease_id NOT IN ${keep}`);
    // Scenarios deleted since: their screenings went with them (cascade); stale footprints of older versions are dropped.
    await db.execute(
      sql`DELETE FROM footprints f WHERE f.river_id = ${riverId}::uuid AND f.scenario_id IS NULL AND f.created_at < now() - interval '1 day'`,
    );
    return { river, plan };
  }

  /** The plan again from its footprint ids (a chunk job carries ids, not plumes). */
  async function loadPlan(items: { footprintId: string; scenario: ScreeningPlanItem['scenario'] }[]): Promise<ScreeningPlanItem[]> {
    const res = await db.execute<{ id: string; plume: PlumeResult }>(sql`
      SELECT id, plume FROM footprints WHERE id IN (SELECT jsonb_array_elements_text(${JSON.stringify(items.map((i) => i.footprintId))}::jsonb)::uuid)`);
    const plumes = new Map(res.rows.map((r) => [r.id, r.plume]));
    return items.map((i) => {
      const plume = plumes.get(i.footprintId);
      if (!plume)
        throw new UnprocessableError(
          `The plume for ${i.scenario.name} was replaced while its leases were being screened; a newer run screens them.`,
        );
      return { footprint: { id: i.footprintId, plume }, scenario: i.scenario };
    });
  }

  /** Ids of the leases a river screens (all, or those of `leaseIds`), in a stable order for chunking. */
  async function scopedLeaseIds(river: RiverInputs, leaseIds?: string[]): Promise<string[]> {
    return (await pairedLeaseIds(river, leaseIds)).sort();
  }

  /**
   * The second half: screenings of these leases (all scoped ones when not given) under every
   * scenario of the plan, then their annualised exposure. Each lease's rows depend on that lease
   * alone, so screening the leases in chunks gives the same rows as screening them at once.
   */
  async function screenLeases(river: RiverInputs, plan: ScreeningPlanItem[], leaseIds?: string[]) {
    // Only the leases this river reaches (given ones may lie beyond it); screenFootprint takes them as the scope.
    const paired = await scopedLeaseIds(river, leaseIds);
    // Two footprints at a time: on a two-core machine one PostgreSQL backend works on one footprint's queries while
    // the other footprint's rows are computed in Node or written. Each footprint's rows are its own (lease, scenario).
    // The leases are read once for every footprint of the plan, and what depends on a footprint's path alone is kept
    // for the others on the same path.
    const cache: RunCache = {
      leases: readLeases(sql`l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(paired)}::jsonb)::uuid)`),
      hints: new Map(),
      near: new Map(),
    };
    cache.leases.catch(() => undefined);
    let screened = 0;
    const queue = [...plan];
    let failed: unknown = null;
    const worker = async () => {
      for (let item = queue.shift(); item && !failed; item = queue.shift()) {
        try {
          screened += await screenFootprint(river, item.footprint, item.scenario, paired, cache);
        } catch (err) {
          failed ??= err;
        }
      }
    };
    await Promise.all([worker(), worker()]);
    if (failed) throw failed;
    await annualise(river, paired);

    return screened;
  }

  /** Every scenario of a river: footprints (cached by inputs) and screenings of every scoped lease, at once. */
  async function screenRiver(
    riverId: string,
    onProgress?: (done: number, total: number, what: string) => Promise<void> | void,
    leaseIds?: string[],
  ) {
    const { river, plan } = await prepareRiver(riverId, onProgress);
    await onProgress?.(plan.length, plan.length, 'Screening the leases');
    const screened = await screenLeases(river, plan, leaseIds);
    await onProgress?.(plan.length, plan.length, 'Done');
    return { scenarios: plan.length, screenings: screened };
  }

  /** Rivers whose screenings a change to these leases affects: every river that pairs with one of them. */
  async function riversForLeases(leaseIds: string[]): Promise<string[]> {
    const res = await db.execute<{ id: string }>(sql`
      SELECT DISTINCT r.id FROM rivers r JOIN leases l ON ${riverReachesLeaseSql(sql`r.id`, sql`r.jurisdiction_id`, sql`r.owner_id`, 'l')}
       WHERE l.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(leaseIds)}::jsonb)::uuid)`);
    return res.rows.map((r) => r.id);
  }

  return {
    riverInputs,
    ensureFootprint,
    screenFootprint,
    screenRiver,
    prepareRiver,
    loadPlan,
    scopedLeaseIds,
    screenLeases,
    annualise,
    annualiseMissing,
    riversForLeases,
  };
}

export type ScreeningService = ReturnType<typeof createScreeningService>;
