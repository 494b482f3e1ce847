import { mapSettingsSchema, nearbyClosureListSchema, zoneMapSchema } from '#shared/schemas/closures';
import { sql } from 'drizzle-orm';
import { firstRunSchema } from '#shared/schemas/regions';
import type { Database } from '../db/client';
import { visibleRivers } from '../services/rivers.service';
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

  defineRoute(ctx, {
    method: 'get',
    path: '/overview/first-run',
    summary: "A grower's steps to an answer: leases, a river (or the region's), a flow record (or the region's), ratings",
    tags: ['overview'],
    access: { roles: ['grower', 'adviser'] },
    response: firstRunSchema,
    handler: async ({ user }) => {
      const res = await db.execute<{ region_id: string | null; region_name: string | null; leases: number; rivers: number; with_record: number; rated: number }>(sql`
        SELECT j.id AS region_id, j.name AS region_name,
               (SELECT count(*)::int FROM leases l WHERE l.owner_id = ${user!.id}) AS leases,
               (SELECT count(*)::int FROM rivers r WHERE ${visibleRivers(user!)}) AS rivers,
               (SELECT count(*)::int FROM rivers r WHERE ${visibleRivers(user!)} AND EXISTS (SELECT 1 FROM flow_records f WHERE f.river_id = r.id AND f.active)) AS with_record,
               (SELECT count(DISTINCT s.lease_id)::int FROM screenings s JOIN leases l ON l.id = s.lease_id WHERE l.owner_id = ${user!.id}) AS rated
          FROM (SELECT 1) one LEFT JOIN jurisdictions j ON j.id = ${user!.jurisdictionId}::uuid`);
      const r = res.rows[0];
      return {
        region: r.region_id ? { id: r.region_id, name: r.region_name ?? '' } : null,
        leases: r.leases,
        rivers: r.rivers,
        riversWithRecord: r.with_record,
        leasesRated: r.rated,
      };
    },
  });
}
