/**
 * Zones currently closed or waiting to reopen, with the caller's visible leases inside them or
 * near them (geodesic distance), for the overview. A zone with no lease of the caller nearby is left out.
 */
import { sql } from 'drizzle-orm';
import { NEARBY_CLOSURE_DISTANCE_M, type NearbyClosureList, type ZoneMap, type ZoneStatus } from '#shared/schemas/closures';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { visibleLeases } from './leases.service';

type Row = {
  zone_id: string;
  zone_name: string;
  status: ZoneStatus;
  since: Date;
  river_name: string | null;
  lease_id: string;
  lease_code: string;
  distance_m: number;
};

export async function nearbyClosures(db: Database, user: CurrentUser): Promise<NearbyClosureList> {
  // The caller's leases first (index scans, a MATERIALIZED CTE), then the geodesic test against the few zones not
  // open: written as one join, PostgreSQL scanned the whole leases table in parallel for every request (EXPLAIN:
  // 113 ms against 0.3 ms on a table that had held 40 000 other leases).
  const rows = await db.execute<Row>(sql`
    WITH visible AS MATERIALIZED (SELECT l.id, l.lease_code, l.geom FROM leases l WHERE ${visibleLeases(user)})
    SELECT z.id AS zone_id, z.name AS zone_name, z.status, z.status_since AS since, r.name AS river_name,
           l.id AS lease_id, l.lease_code, ST_Distance(z.geom::geography, l.geom::geography) AS distance_m
      FROM closure_zones z
      LEFT JOIN rivers r ON r.id = z.river_id
      JOIN visible l ON ST_DWithin(z.geom::geography, l.geom::geography, ${NEARBY_CLOSURE_DISTANCE_M})
     WHERE z.status <> 'open'
     ORDER BY z.status_since DESC, z.name, distance_m, l.lease_code`);
  const byZone = new Map<string, NearbyClosureList['items'][number]>();
  for (const r of rows.rows) {
    const zone = byZone.get(r.zone_id) ?? {
      zoneId: r.zone_id,
      zoneName: r.zone_name,
      status: r.status,
      since: new Date(r.since).toISOString(),
      riverName: r.river_name,
      leases: [],
    };
    zone.leases.push({ leaseId: r.lease_id, leaseCode: r.lease_code, distanceM: Number(r.distance_m) });
    byZone.set(r.zone_id, zone);
  }
  return { items: [...byZone.values()], distanceM: NEARBY_CLOSURE_DISTANCE_M };
}

/**
 * The closure zones of the jurisdictions the caller works in (a regulator's own; a grower's or
 * adviser's through the leases they can see), for the exposure map. Zones and their statuses are
 * public (the status page lists them), so nothing private is added here.
 */
export async function zonesForMap(db: Database, user: CurrentUser): Promise<ZoneMap> {
  const rows = await db.execute<{
    id: string;
    name: string;
    status: ZoneStatus;
    since: Date;
    river_name: string | null;
    trigger_flow: number | null;
    geometry: string;
  }>(sql`
    SELECT z.id, z.name, z.status, z.status_since AS since, r.name AS river_name, z.trigger_flow, ST_AsGeoJSON(z.geom, 6) AS geometry
      FROM closure_zones z LEFT JOIN rivers r ON r.id = z.river_id
     WHERE z.jurisdiction_id = ${user.jurisdictionId ?? null}::uuid
        OR z.jurisdiction_id IN (SELECT l.jurisdiction_id FROM leases l WHERE l.jurisdiction_id IS NOT NULL AND ${visibleLeases(user)})
     ORDER BY z.name`);
  return {
    type: 'FeatureCollection',
    features: rows.rows.map((r) => ({
      type: 'Feature' as const,
      properties: {
        id: r.id,
        name: r.name,
        status: r.status,
        since: new Date(r.since).toISOString(),
        riverName: r.river_name,
        triggerFlow: r.trigger_flow === null ? null : Number(r.trigger_flow),
      },
      geometry: JSON.parse(r.geometry),
    })),
  };
}
