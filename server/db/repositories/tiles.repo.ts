import { sql } from 'drizzle-orm';
import type { CurrentUser } from '../../http/route';
import { visibleLeases } from '../../services/leases.service';
import type { Database } from '../client';

/**
 * One Mapbox Vector Tile of the leases `user` may see (layer "leases": lease id, status,
 * species, worst rating across the river's scenarios), clipped to the tile by PostGIS.
 */
export async function leaseTile(db: Database, user: CurrentUser, z: number, x: number, y: number, riverId?: string): Promise<Buffer> {
  const tile = await db.execute<{ mvt: Buffer }>(sql`
    WITH bounds AS (SELECT ST_TileEnvelope(${z}, ${x}, ${y}) AS env),
    rows AS (
      SELECT l.id, l.lease_code AS lease, l.status, l.species,
             COALESCE((SELECT a.worst_rating FROM lease_annual_exposure a WHERE a.lease_id = l.id ${riverId ? sql`AND a.river_id = ${riverId}::uuid` : sql``}
                       ORDER BY array_position(ARRAY['low','moderate','high','severe'], a.worst_rating) DESC LIMIT 1), 'none') AS rating,
             ST_AsMVTGeom(ST_Transform(l.geom, 3857), bounds.env, 4096, 64, true) AS geom
        FROM leases l, bounds
       WHERE l.geom && ST_Transform(bounds.env, 4326) AND ${visibleLeases(user)})
    SELECT ST_AsMVT(rows, 'leases', 4096, 'geom') AS mvt FROM rows WHERE geom IS NOT NULL`);
  return tile.rows[0]?.mvt ?? Buffer.alloc(0);
}
