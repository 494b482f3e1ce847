import { sql } from 'drizzle-orm';
import { z } from 'zod';
import { exportFormatSchema, layerExportCsvSchema, layerExportGeoJsonSchema } from '#shared/schemas/exports';
import { type AnnualItem, annualListSchema, annualQuerySchema } from '#shared/schemas/annual';
import { annualRating, compareAnnualWorstFirst } from '#shared/scoring/annual-rating';
import type { Database } from '../db/client';
import {
  footprintSchema,
  leaseSweepSchema,
  RATINGS,
  screeningListSchema,
  screeningRunListSchema,
} from '#shared/schemas/screening';
import { BINARY_BODY, type CurrentUser, defineRoute, type RouteContext } from '../http/route';
import { NotFoundError, ValidationError } from '../lib/errors';
import { bandsLayer, exportResponse, sendExport } from '../services/exports.service';
import { visibleLeases } from '../services/leases.service';
import type { RiversService } from '../services/rivers.service';
import type { ScreeningService } from '../services/screening.service';
import type { SweepService } from '../services/sweep.service';
import { leaseTile } from '../db/repositories/tiles.repo';

const READERS = ['grower', 'adviser', 'regulator'] as const;

const footprintFields = {
  riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }),
  scenarioId: z.uuid({ error: 'scenarioId must be a scenario id (UUID)' }).optional(),
  discharge: z.coerce.number().positive({ error: 'discharge must be greater than 0 m³/s' }).max(1e6).optional(),
  durationHours: z.coerce.number().positive({ error: 'durationHours must be greater than 0' }).max(24 * 365).optional(),
};
const needsFlow = (q: { scenarioId?: string; discharge?: number }) => Boolean(q.scenarioId || q.discharge);
const needsFlowError = { message: 'give scenarioId, or discharge (and optionally durationHours) for a flow of your own', path: ['scenarioId'] };
const footprintQuery = z.strictObject(footprintFields).refine(needsFlow, needsFlowError);
const footprintExportQuery = z.strictObject({ ...footprintFields, format: exportFormatSchema }).refine(needsFlow, needsFlowError);

const screeningQuery = z.strictObject({
  leaseId: z.uuid({ error: 'leaseId must be a lease id (UUID)' }).optional(),
  riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }).optional(),
  scenarioId: z.uuid({ error: 'scenarioId must be a scenario id (UUID)' }).optional(),
  rating: z.enum(RATINGS, { error: `rating must be one of ${RATINGS.join(', ')}` }).optional(),
  sort: z.enum(['rating', 'leaseId', 'discharge', 'lowestSalinity'], { error: 'sort must be rating, leaseId, discharge or lowestSalinity' }).default('rating'),
  order: z.enum(['asc', 'desc']).default('desc'),
  limit: z.coerce.number().int().min(1).max(5000, { error: 'limit must be at most 5000' }).default(500),
  offset: z.coerce.number().int().min(0).default(0),
});

const SORTS = {
  rating: "array_position(ARRAY['low','moderate','high','severe'], s.rating)",
  leaseId: 'l.lease_code',
  discharge: 'sc.discharge',
  lowestSalinity: 's.lowest_salinity',
} as const;

export function registerScreeningRoutes(ctx: RouteContext, db: Database, rivers: RiversService, screening: ScreeningService, sweeps: SweepService): void {
  /** A river's footprint (bands and the coast path) for a scenario or any flow, as a FeatureCollection. */
  async function footprintCollection(user: CurrentUser, query: z.infer<typeof footprintQuery>) {
    await rivers.get(user, query.riverId);
    const river = await screening.riverInputs(query.riverId);
    let flow: { scenarioId?: string; discharge: number; durationHours: number };
    let scenarioName: string | null = null;
    if (query.scenarioId) {
      const s = await db.execute<{ id: string; name: string; discharge: number; duration_hours: number }>(sql`
        SELECT id, name, discharge, duration_hours FROM scenarios WHERE id = ${query.scenarioId}::uuid AND river_id = ${query.riverId}::uuid`);
      if (!s.rows[0]) throw new NotFoundError('No scenario with this id for this river.');
      flow = { scenarioId: s.rows[0].id, discharge: s.rows[0].discharge, durationHours: s.rows[0].duration_hours };
      scenarioName = s.rows[0].name;
    } else {
      const typical = await db.execute<{ h: number | null }>(sql`SELECT (durations->>'medianHours')::float AS h FROM flow_records WHERE river_id = ${query.riverId}::uuid AND active`);
      flow = { discharge: query.discharge!, durationHours: query.durationHours ?? Math.max(24, Math.round(typical.rows[0]?.h ?? 72)) };
    }
    const fp = await screening.ensureFootprint(river, flow);
    const bands = await db.execute<{ band_id: string; name: string; kind: string; threshold: number | null; sort_order: number; geometry: string }>(sql`
      SELECT band_id, name, kind, threshold, sort_order, ST_AsGeoJSON(geom, 6) AS geometry FROM footprint_bands WHERE footprint_id = ${fp.id}::uuid ORDER BY sort_order`);
    const meta = await db.execute<{ warnings: string[]; path: string | null; created_at: Date; model_version: string }>(sql`
      SELECT warnings, ST_AsGeoJSON(path, 6) AS path, created_at, model_version FROM footprints WHERE id = ${fp.id}::uuid`);
    return {
      type: 'FeatureCollection',
      properties: {
        footprintId: fp.id,
        riverId: query.riverId,
        riverName: river.name,
        scenarioId: flow.scenarioId ?? null,
        scenarioName,
        discharge: flow.discharge,
        durationHours: flow.durationHours,
        modelVersion: meta.rows[0].model_version,
        plume: fp.plume,
        warnings: meta.rows[0].warnings,
        computedAt: new Date(meta.rows[0].created_at).toISOString(),
      },
      features: [
        ...bands.rows.map((b) => ({
          type: 'Feature',
          id: b.band_id,
          properties: { bandId: b.band_id, name: b.name, kind: b.kind, threshold: b.threshold, order: b.sort_order },
          geometry: JSON.parse(b.geometry),
        })),
        ...(meta.rows[0].path ? [{ type: 'Feature', id: 'path', properties: { bandId: 'path', name: 'Coast followed by the plume', kind: 'path' }, geometry: JSON.parse(meta.rows[0].path) }] : []),
      ],
    };
  }

  defineRoute(ctx, {
    method: 'get',
    path: '/footprints',
    operationId: 'getFootprint',
    summary: "A river's plume footprint as GeoJSON (bulge and bands), for a scenario or any flow (built once, then cached)",
    tags: ['footprints'],
    access: { roles: READERS },
    query: footprintQuery,
    response: footprintSchema,
    errors: [404, 422],
    handler: ({ user, query }) => footprintCollection(user!, query),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/footprints/export',
    operationId: 'exportFootprintBands',
    summary:
      "Download a river's exposure bands for a scenario or any flow as CSV, GeoJSON, GeoPackage (readme table) or KML (document description), with the model version and the cautions",
    tags: ['footprints'],
    access: { roles: READERS },
    query: footprintExportQuery,
    response: exportResponse("The footprint's bands (and the coast the plume follows)", layerExportCsvSchema, layerExportGeoJsonSchema),
    errors: [404, 422],
    handler: async ({ user, query, res }) => {
      const { format, ...flow } = query;
      const fc = await footprintCollection(user!, flow);
      const layer = bandsLayer(fc);
      const slug = `${fc.properties.riverName}-${fc.properties.scenarioName ?? `${fc.properties.discharge}-m3s`}`.replace(/\W+/g, '-').toLowerCase();
      await sendExport(res, layer, format, `brackline-bands-${slug}`, 'Name');
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/screenings',
    summary: 'Screenings of the leases you may see: per lease, per river, per scenario or for your whole jurisdiction',
    tags: ['screenings'],
    access: { roles: READERS },
    query: screeningQuery,
    response: screeningListSchema,
    handler: ({ user, query }) => ctx.resultCache.answer('screenings', user!, query, () => listScreenings(user!, query)),
  });

  async function listScreenings(user: CurrentUser, query: z.infer<typeof screeningQuery>) {
    const where = [visibleLeases(user)];
    if (query.leaseId) where.push(sql`s.lease_id = ${query.leaseId}::uuid`);
    if (query.riverId) where.push(sql`s.river_id = ${query.riverId}::uuid`);
    if (query.scenarioId) where.push(sql`s.scenario_id = ${query.scenarioId}::uuid`);
    if (query.rating) where.push(sql`s.rating = ${query.rating}`);
    const w = sql.join(where, sql` AND `);
    const order = sql.raw(`${SORTS[query.sort]} ${query.order === 'asc' ? 'ASC' : 'DESC'} NULLS LAST, l.lease_code, sc.discharge`);
    const rows = await db.execute(sql`
      SELECT s.lease_id AS "leaseId", l.lease_code AS "leaseCode", l.species, l.status, s.river_id AS "riverId", r.name AS "riverName",
             s.scenario_id AS "scenarioId", sc.name AS "scenarioName", sc.kind AS "scenarioKind", sc.aep, sc.discharge, sc.duration_hours AS "durationHours",
             s.footprint_id AS "footprintId", s.band_fractions AS "bandFractions", s.lowest_salinity AS "lowestSalinity", s.highest_indicator AS "highestIndicator",
             s.days_below_tolerance AS "daysBelowTolerance", s.rating, s.score, s.reasons, s.numbers, s.model_version AS "modelVersion", s.computed_at AS "computedAt"
        FROM screenings s JOIN leases l ON l.id = s.lease_id JOIN scenarios sc ON sc.id = s.scenario_id JOIN rivers r ON r.id = s.river_id
       WHERE ${w} ORDER BY ${order} LIMIT ${query.limit} OFFSET ${query.offset}`);
    const total = await db.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM screenings s JOIN leases l ON l.id = s.lease_id WHERE ${w}`);
    return { items: rows.rows, total: total.rows[0].n };
  }

  defineRoute(ctx, {
    method: 'get',
    path: '/screenings/annual',
    operationId: 'listAnnualExposures',
    summary:
      'Yearly figures per lease and river (expected closure days a year, chance a year of a harmful salinity event, days below the salinity tolerance) and the yearly rating set from them, worst first',
    tags: ['screenings'],
    access: { roles: READERS },
    query: annualQuerySchema,
    response: annualListSchema,
    handler: ({ user, query }) => ctx.resultCache.answer('screenings/annual', user!, query, () => listAnnual(user!, query)),
  });

  async function listAnnual(user: CurrentUser, query: z.infer<typeof annualQuerySchema>) {
    const rows = await db.execute<Omit<AnnualItem, 'annualRating'>>(sql`
      SELECT a.lease_id AS "leaseId", l.lease_code AS "leaseCode", a.river_id AS "riverId", r.name AS "riverName",
             a.expected_days_per_year AS "expectedDaysPerYear", a.probability_any_exposure AS "probabilityAnyExposure", a.worst_rating AS "worstRating",
             (a.details->'indicator'->>'expectedDaysPerYear')::float8 AS "indicatorDaysPerYear",
             (a.details->'indicator'->>'probabilityOfAnyExposure')::float8 AS "probabilityIndicatorAboveStandard",
             a.closure_days_per_year AS "closureDaysPerYear", a.harmful_salinity_chance AS "harmfulSalinityChancePerYear", a.details
        FROM lease_annual_exposure a JOIN leases l ON l.id = a.lease_id JOIN rivers r ON r.id = a.river_id
       WHERE ${visibleLeases(user)} ${query.leaseId ? sql`AND a.lease_id = ${query.leaseId}::uuid` : sql``} ${query.riverId ? sql`AND a.river_id = ${query.riverId}::uuid` : sql``}`);
    const items: AnnualItem[] = rows.rows.map((row) => ({
      ...row,
      annualRating:
        row.closureDaysPerYear === null || row.harmfulSalinityChancePerYear === null
          ? null
          : annualRating({ closureDaysPerYear: row.closureDaysPerYear, harmfulSalinityChancePerYear: row.harmfulSalinityChancePerYear }),
    }));
    items.sort((a, b) => compareAnnualWorstFirst(a, b) || a.leaseCode.localeCompare(b.leaseCode) || a.riverName.localeCompare(b.riverName));
    return { items };
  }

  defineRoute(ctx, {
    method: 'get',
    path: '/screenings/runs',
    summary: 'Progress of background screening runs of a river',
    tags: ['screenings'],
    access: { roles: READERS },
    query: z.strictObject({ riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }) }),
    response: screeningRunListSchema,
    errors: [404],
    handler: async ({ user, query }) => {
      await rivers.get(user!, query.riverId);
      const rows = await db.execute(sql`
        SELECT id, status, total, done, message, error, queued_at AS "queuedAt", started_at AS "startedAt", finished_at AS "finishedAt"
          FROM screening_runs WHERE river_id = ${query.riverId}::uuid ORDER BY queued_at DESC LIMIT 10`);
      return { items: rows.rows };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/leases/:id/sweep',
    operationId: 'getLeaseSweep',
    summary: 'Flow sweep for one lease: the river flow at which it enters each band, and the field over it against flow',
    tags: ['screenings'],
    access: { roles: READERS },
    params: z.object({ id: z.uuid({ error: 'id must be a lease id (UUID)' }) }),
    query: z.strictObject({ riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }), steps: z.coerce.number().int().min(10).max(400).default(60) }),
    response: leaseSweepSchema,
    errors: [404, 422],
    handler: async ({ user, params, query }) => {
      await rivers.get(user!, query.riverId);
      return sweeps.sweep(user!, params.id, query.riverId, query.steps);
    },
  });

  const tileParams = z.object({
    z: z.coerce.number().int().min(0).max(22, { error: 'z must be a zoom level from 0 to 22' }),
    x: z.coerce.number().int().min(0),
    y: z.string().regex(/^\d+\.mvt$/, { error: 'y must be a tile row followed by .mvt' }),
  });
  function tileXY(params: z.infer<typeof tileParams>) {
    const y = Number(params.y.replace('.mvt', ''));
    const n = 2 ** params.z;
    if (params.x >= n || y >= n) throw new ValidationError(`x and y must be below ${n} at zoom ${params.z}`);
    return { z: params.z, x: params.x, y };
  }

  defineRoute(ctx, {
    method: 'get',
    path: '/tiles/leases/:z/:x/:y',
    operationId: 'getLeaseTile',
    summary: 'Leases you may see as Mapbox Vector Tiles (layer "leases": id, lease, status, species, rating at a scenario or worst)',
    tags: ['tiles'],
    access: { roles: READERS },
    params: tileParams,
    query: z.strictObject({
      riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }).optional(),
      scenarioId: z.uuid({ error: 'scenarioId must be a scenario id (UUID)' }).optional().describe('Rate each lease at this flood scenario'),
    }),
    response: { description: 'A Mapbox Vector Tile (empty when nothing is in the tile)', content: { 'application/vnd.mapbox-vector-tile': BINARY_BODY } },
    handler: async ({ user, params, query, res }) => {
      const { z: tz, x, y } = tileXY(params);
      const mvt = await leaseTile(db, user!, tz, x, y, query.riverId, query.scenarioId);
      res.setHeader('Content-Type', 'application/vnd.mapbox-vector-tile');
      res.setHeader('Cache-Control', 'private, max-age=60');
      res.send(mvt);
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/tiles/bands/:z/:x/:y',
    operationId: 'getBandTile',
    summary: 'The bands of one footprint as Mapbox Vector Tiles (layer "bands")',
    tags: ['tiles'],
    access: { roles: READERS },
    params: tileParams,
    query: z.strictObject({ footprintId: z.uuid({ error: 'footprintId must be a footprint id (UUID)' }) }),
    response: { description: 'A Mapbox Vector Tile (empty when nothing is in the tile)', content: { 'application/vnd.mapbox-vector-tile': BINARY_BODY } },
    errors: [404],
    handler: async ({ user, params, query, res }) => {
      const { z: tz, x, y } = tileXY(params);
      const fp = await db.execute<{ river_id: string }>(sql`SELECT river_id FROM footprints WHERE id = ${query.footprintId}::uuid`);
      if (!fp.rows[0]) throw new NotFoundError('No footprint with this id.');
      await rivers.get(user!, fp.rows[0].river_id);
      const tile = await db.execute<{ mvt: Buffer }>(sql`
        WITH bounds AS (SELECT ST_TileEnvelope(${tz}, ${x}, ${y}) AS env),
        rows AS (
          SELECT b.band_id AS band, b.name, b.kind, b.threshold, b.sort_order AS "order",
                 ST_AsMVTGeom(ST_Transform(b.geom, 3857), bounds.env, 4096, 64, true) AS geom
            FROM footprint_bands b, bounds
           WHERE b.footprint_id = ${query.footprintId}::uuid AND b.geom && ST_Transform(bounds.env, 4326))
        SELECT ST_AsMVT(rows, 'bands', 4096, 'geom') AS mvt FROM rows WHERE geom IS NOT NULL`);
      res.setHeader('Content-Type', 'application/vnd.mapbox-vector-tile');
      res.send(tile.rows[0]?.mvt ?? Buffer.alloc(0));
      return undefined;
    },
  });
}
