import { sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Database } from '../db/client';
import { geometrySchema } from '#shared/schemas/geojson';
import { coastCollectionSchema } from '#shared/schemas/upload';
import { defineRoute, type RouteContext } from '../http/route';
import { recordAudit } from '../services/audit.service';
import {
  BUILTIN_COAST_ATTRIBUTION,
  BUILTIN_COAST_CAUTION,
  builtinCoastGeometry,
  checkMouthOnBuiltinCoast,
  MOUTH_MAX_DISTANCE_M,
} from '../services/builtin-coast.service';

const builtinQuery = z.strictObject({
  lon: z.coerce
    .number({ error: 'lon must be a longitude in degrees' })
    .min(-180, { error: 'lon must be between -180 and 180' })
    .max(180, { error: 'lon must be between -180 and 180' }),
  lat: z.coerce
    .number({ error: 'lat must be a latitude in degrees' })
    .min(-85, { error: 'lat must be between -85 and 85' })
    .max(85, { error: 'lat must be between -85 and 85' }),
});

const builtinResponse = z.object({
  coastId: z.string(),
  attribution: z.string(),
  caution: z.string(),
  /** Distance from the point to the nearest built-in coastline (m), null when none is within the window. */
  distanceM: z.number().nullable(),
  onLand: z.boolean(),
  maxMouthDistanceM: z.number(),
  /** Why a river mouth cannot be placed at this point, or null. */
  problem: z.string().nullable(),
  line: geometrySchema,
  window: geometrySchema,
});

const lineString = z.object({
  type: z.literal('LineString'),
  coordinates: z.array(z.array(z.number()).min(2)).min(2, { error: 'geometry: a traced coast needs at least two points' }),
});
const multiLineString = z.object({
  type: z.literal('MultiLineString'),
  coordinates: z.array(z.array(z.array(z.number()).min(2)).min(2)).min(1),
});
const tracedCoastBody = z.strictObject({
  name: z
    .string({ error: 'name is required' })
    .trim()
    .min(1, { error: 'name is required' })
    .max(120, { error: 'name must be at most 120 characters' }),
  geometry: z.discriminatedUnion('type', [lineString, multiLineString], {
    error: 'geometry must be a GeoJSON LineString or MultiLineString in longitude/latitude',
  }),
});

/** Coastlines a user may use: their own and those shared in their jurisdiction; the built-in one; traced ones. */
export function registerCoastRoutes(ctx: RouteContext, db: Database): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/coasts',
    summary: 'Coastlines you may use (yours and those shared in your jurisdiction), simplified to about 10 m, as GeoJSON',
    tags: ['coasts'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    query: z.strictObject({ form: z.enum(['line', 'land'], { error: 'form must be line or land' }).optional() }),

    response: coastCollectionSchema,
    handler: async ({ user, query }) => {
      const rows = await db.execute<{ id: string; name: string; form: string; shared: boolean; source: string; geometry: string }>(sql`
        SELECT id, name, form, shared, source, ST_AsGeoJSON(ST_SimplifyPreserveTopology(geom, 0.0001), 6) AS geometry FROM coasts
         WHERE source <> 'builtin' AND (owner_id = ${user!.id} OR (shared AND jurisdiction_id = ${user!.jurisdictionId}::uuid))
           ${query.form ? sql`AND form = ${query.form}` : sql``}
         ORDER BY created_at DESC`);
      return {
        type: 'FeatureCollection' as const,
        features: rows.rows.map((c) => ({
          type: 'Feature' as const,
          id: c.id,
          properties: { id: c.id, name: c.name, form: c.form, shared: c.shared, source: c.source },
          geometry: JSON.parse(c.geometry),
        })),
      };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/coasts/builtin',
    summary:
      'The built-in world coastline (© OpenStreetMap contributors, ODbL) around a point, loaded on first use, and whether a river mouth may be placed there',
    tags: ['coasts'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    query: builtinQuery,
    response: builtinResponse,
    handler: async ({ query }) => {
      const check = await checkMouthOnBuiltinCoast(db, query.lon, query.lat);
      const geometry = await builtinCoastGeometry(db, check.coastId);
      return {
        coastId: check.coastId,
        attribution: BUILTIN_COAST_ATTRIBUTION,
        caution: BUILTIN_COAST_CAUTION,
        distanceM: check.distanceM,
        onLand: check.onLand,
        maxMouthDistanceM: MOUTH_MAX_DISTANCE_M,
        problem: check.problem,
        line: geometry.line as z.infer<typeof geometrySchema>,
        window: geometry.window as z.infer<typeof geometrySchema>,
      };
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/coasts',
    summary: 'Save a coast traced on the map (a shoreline as lines); choose it on a river to replace the built-in coast',
    tags: ['coasts'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    body: tracedCoastBody,
    response: z.object({ id: z.string(), name: z.string(), source: z.literal('traced') }),
    successStatus: 201,
    errors: [422],
    handler: async ({ user, body }) => {
      const id = await db.transaction(async (tx) => {
        const res = await tx.execute<{ id: string }>(sql`
          INSERT INTO coasts (name, form, owner_id, jurisdiction_id, shared, source, geom)
          VALUES (${body.name}, 'line', ${user!.id}, ${user!.jurisdictionId}::uuid, ${user!.role === 'regulator'}, 'traced',
                  ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(body.geometry)}), 4326)))
          RETURNING id`);
        await recordAudit(tx, {
          actorId: user!.id,
          action: 'coast.trace',
          subjectType: 'coast',
          subjectId: res.rows[0].id,
          jurisdictionId: user!.jurisdictionId,
          after: { name: body.name },
        });
        return res.rows[0].id;
      });
      return { id, name: body.name, source: 'traced' as const };
    },
  });
}
