import { mapSettingsSchema, nearbyClosureListSchema, zoneMapSchema } from '#shared/schemas/closures';
import type { Database } from '../db/client';
import { defineRoute, type RouteContext } from '../http/route';
import { nearbyClosures, zonesForMap } from '../services/nearby-closures.service';

export function registerOverviewRoutes(
  ctx: RouteContext,
  db: Database,
  map: { basemapUrl: string | null; basemapAttribution: string } = { basemapUrl: null, basemapAttribution: '' },
): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/map-settings',
    operationId: 'getMapSettings',
    summary: 'Whether an optional raster basemap is configured (BASEMAP_URL); null means vector layers only',
    tags: ['overview'],
    access: { roles: 'any' },
    response: mapSettingsSchema,
    handler: () => ({ basemap: map.basemapUrl ? { url: map.basemapUrl, attribution: map.basemapAttribution } : null }),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/overview/closures',
    operationId: 'listNearbyClosures',
    summary: 'Zones closed or waiting to reopen that hold or lie near leases you can see',
    tags: ['overview', 'zones'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    response: nearbyClosureListSchema,
    handler: ({ user }) => nearbyClosures(db, user!),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/overview/zones',
    operationId: 'listMapZones',
    summary: 'Closure zones (outline, status, trigger flow) of the jurisdictions you work in, for the map',
    tags: ['overview', 'zones'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    response: zoneMapSchema,
    handler: ({ user }) => zonesForMap(db, user!),
  });
}
