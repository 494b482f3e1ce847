import { sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Database } from '../db/client';
import { coastCollectionSchema } from '#shared/schemas/upload';
import { defineRoute, type RouteContext } from '../http/route';

/** Coastlines a user may use: their own and those shared in their jurisdiction. */
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
      const rows = await db.execute<{ id: string; name: string; form: string; shared: boolean; geometry: string }>(sql`
        SELECT id, name, form, shared, ST_AsGeoJSON(ST_SimplifyPreserveTopology(geom, 0.0001), 6) AS geometry FROM coasts
         WHERE (owner_id = ${user!.id} OR (shared AND jurisdiction_id = ${user!.jurisdictionId}::uuid))
           ${query.form ? sql`AND form = ${query.form}` : sql``}
         ORDER BY created_at DESC`);
      return {
        type: 'FeatureCollection',
        features: rows.rows.map((c) => ({ type: 'Feature', id: c.id, properties: { id: c.id, name: c.name, form: c.form, shared: c.shared }, geometry: JSON.parse(c.geometry) })),
      };
    },
  });
}
