import { z } from 'zod';
import { accountRegionSchema, regionAreaBodySchema, regionListSchema, regionSchema, toRegionArea } from '#shared/schemas/regions';
import { defineRoute, type RouteContext } from '../http/route';
import { ValidationError } from '../lib/errors';
import type { RegionsService } from '../services/regions.service';

const idParams = z.object({ id: z.uuid({ error: 'id must be a region id (UUID)' }) });

/** Regions: the list growers pick from (no sign-in, for the sign-up page), areas, and a grower's choice. */
export function registerRegionRoutes(ctx: RouteContext, regions: RegionsService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/regions',
    summary: 'Regions a grower may join (jurisdictions with their area as GeoJSON, null when not set); no sign-in needed',
    tags: ['regions'],
    access: { public: true },
    // No parameters: an unknown one is refused (400) rather than silently ignored.
    query: z.strictObject({}),
    response: regionListSchema,
    handler: async () => ({ items: await regions.list() }),
  });

  defineRoute(ctx, {
    method: 'put',
    path: '/regions/:id/area',
    summary: "Set a region's area (an administrator, or a regulator of that jurisdiction): closed polygons that overlap no other region",
    tags: ['regions'],
    access: { roles: ['admin', 'regulator'] },
    params: idParams,
    body: regionAreaBodySchema,
    response: regionSchema,
    errors: [404, 409, 422],
    handler: ({ user, params, body }) => {
      const read = toRegionArea(body.area);
      if ('problem' in read) throw new ValidationError(read.problem);
      return regions.setArea(user!, params.id, read.area);
    },
  });

  defineRoute(ctx, {
    method: 'put',
    path: '/account/region',
    summary: 'Choose your region (growers), or none with null',
    tags: ['account', 'regions'],
    access: { roles: ['grower'] },
    body: accountRegionSchema,
    response: accountRegionSchema,
    errors: [404],
    handler: ({ user, body }) => regions.setGrowerRegion(user!, body.regionId),
  });
}
