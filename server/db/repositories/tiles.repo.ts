import { sql } from 'drizzle-orm';
import type { CurrentUser } from '../../http/route';
import { visibleLeases } from '../../services/leases.service';
import type { Database } from '../client';

/**
 * One Mapbox Vector Tile of the leases `user` may see (layer "leases": lease id, status,
 * species, rating), clipped to the tile by PostGIS; outlines from zoom 12, points below. The
 * rating is the lease's at `scenarioId` when given, else its worst across the river's (or every) scenario.
 */
export async function leaseTile(
  db: Database,
  user: CurrentUser,
  z: number,
  x: number,
  y: number,
  riverId?: string,
  scenarioId?: string,
): Promise<Buffer> {
  // Below zoom 12 a lease is a few pixels: send its point on surface instead of its outline.
  const shape = z < 12 ? sql`ST_PointOnSurface(l.geom)` : sql`l.geom`;
  const tile = await db.execute<{ mvt: Buffer }>(sql`
    WITH bounds AS (SELECT ST_TileEnvelope(${z}, ${x}, ${y}) AS env),
    rows AS (
      SELECT l.id, l.lease_code AS lease, l.status, l.species, COALESCE(w.worst_rating, 'none') AS rating,
             ST_AsMVTGeom(ST_Transform(${shape}, 3857), bounds.env, 4096, 64, true) AS geom
        FROM leases l CROSS JOIN bounds
        -- Per lease in the tile (primary-key lookups), not a pass over every lease's figures: the cost follows the tile.
        LEFT JOIN LATERAL (${
          scenarioId
            ? sql`SELECT s.rating AS worst_rating FROM screenings s WHERE s.lease_id = l.id AND s.scenario_id = ${scenarioId}::uuid`
            : sql`SELECT a.worst_rating FROM lease_annual_exposure a
                   WHERE a.lease_id = l.id ${riverId ? sql`AND a.river_id = ${riverId}::uuid` : sql``}
                   ORDER BY array_position(ARRAY['low','moderate','high','severe'], a.worst_rating) DESC LIMIT 1`
        }) w ON true
       WHERE l.geom && ST_Transform(bounds.env, 4326) AND ${visibleLeases(user)})
    SELECT ST_AsMVT(rows, 'leases', 4096, 'geom') AS mvt FROM rows WHERE geom IS NOT NULL`);
  return tile.rows[0]?.mvt ?? Buffer.alloc(0);
}
