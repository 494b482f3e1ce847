/**
 * Regions (issue #15). A region is a jurisdiction with an area. Growers pick one at sign-up or in
 * their settings (or none); a lease saved inside a region's area puts the lease in that jurisdiction
 * and, for a grower of no region yet, the grower too, with a message in their inbox.
 */
import { sql } from 'drizzle-orm';
import type { Region } from '#shared/schemas/regions';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors';
import { recordAudit } from './audit.service';
import { deliverToInbox } from './inbox.service';
import { forgetUser } from '../auth/current-user';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

/**
 * Puts newly saved leases in the region whose area holds most of each, and a grower of no region
 * into the region of their first such lease (told in the inbox). Runs in the caller's transaction.
 */
export async function assignLeasesToRegions(tx: Tx | Database, user: CurrentUser, leaseIds: string[]): Promise<{ joined: string | null }> {
  if (leaseIds.length === 0) return { joined: null };
  const placed = await tx.execute<{ lease_id: string; jurisdiction_id: string; name: string }>(sql`
    UPDATE leases l SET jurisdiction_id = best.jurisdiction_id
      FROM (SELECT DISTINCT ON (l2.id) l2.id AS lease_id, j.id AS jurisdiction_id, j.name
              FROM leases l2 JOIN jurisdictions j ON j.area IS NOT NULL AND ST_Intersects(j.area, l2.geom)
             WHERE l2.id IN (SELECT jsonb_array_elements_text(${JSON.stringify(leaseIds)}::jsonb)::uuid)
             ORDER BY l2.id, ST_Area(ST_Intersection(j.area, l2.geom)) DESC) best
     WHERE l.id = best.lease_id
     RETURNING best.lease_id, best.jurisdiction_id, best.name`);
  if (user.role !== 'grower' || user.jurisdictionId || placed.rows.length === 0) return { joined: null };
  const region = placed.rows[0];
  await tx.execute(
    sql`UPDATE users SET jurisdiction_id = ${region.jurisdiction_id}::uuid WHERE id = ${user.id} AND jurisdiction_id IS NULL`,
  );
  // The cached users row (server/auth/current-user.ts) must not hide the new region from the next request.
  forgetUser(user.id);
  await recordAudit(tx, {
    actorId: user.id,
    action: 'user.region-join',
    subjectType: 'user',
    subjectId: user.id,
    jurisdictionId: region.jurisdiction_id,
    after: { jurisdictionId: region.jurisdiction_id, byLease: region.lease_id },
  });
  await deliverToInbox(tx, [
    {
      userId: user.id,
      kind: 'notice',
      title: `You joined the region ${region.name}`,
      body: `A lease you saved lies inside the area of ${region.name}, so your account now belongs to that region: its rivers, flow records and closure notices apply to your leases, and its regulator sees your held leases (never your candidate sites). Change or leave the region in your account settings.`,
      link: '/account',
      dedupeKey: `region-join:${region.jurisdiction_id}`,
    },
  ]);
  return { joined: region.jurisdiction_id };
}

export function createRegionsService(db: Database) {
  async function list(): Promise<Region[]> {
    const res = await db.execute<{ id: string; slug: string; name: string; area: string | null }>(sql`
      SELECT id, slug, name, ST_AsGeoJSON(ST_Multi(ST_SimplifyPreserveTopology(area, 0.0001)), 6) AS area FROM jurisdictions ORDER BY name`);
    return res.rows.map((r) => ({ id: r.id, slug: r.slug, name: r.name, area: r.area ? JSON.parse(r.area) : null }));
  }

  async function get(id: string): Promise<Region> {
    const found = (await list()).find((r) => r.id === id);
    if (!found) throw new NotFoundError('No region with this id. Pick one from GET /regions.');
    return found;
  }

  /** Sets a jurisdiction's area: an admin, or a regulator of that jurisdiction. Nothing changes on refusal. */
  async function setArea(user: CurrentUser, id: string, area: { type: 'MultiPolygon'; coordinates: number[][][][] }): Promise<Region> {
    if (!(user.role === 'admin' || (user.role === 'regulator' && user.jurisdictionId === id))) {
      throw new ForbiddenError('Only an administrator or a regulator of this jurisdiction can set its area.');
    }
    await db.transaction(async (tx) => {
      const exists = await tx.execute<{ id: string; area: string | null }>(
        sql`SELECT id, ST_AsGeoJSON(area) AS area FROM jurisdictions WHERE id = ${id}::uuid FOR UPDATE`,
      );
      if (!exists.rows[0]) throw new NotFoundError('No region with this id. Pick one from GET /regions.');
      const geom = sql`ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(area)}), 4326)`;
      const check = await tx.execute<{ valid: boolean; reason: string; area_km2: number | null }>(sql`
        SELECT ST_IsValid(${geom}) AS valid, ST_IsValidReason(${geom}) AS reason,
               CASE WHEN ST_IsValid(${geom}) THEN ST_Area(${geom}::geography) / 1e6 END AS area_km2`);
      if (!check.rows[0].valid) {
        throw new UnprocessableError(
          `area: the polygon is not valid (${check.rows[0].reason}). Its edges must not cross themselves; draw or export it again.`,
        );
      }
      if (!check.rows[0].area_km2 || check.rows[0].area_km2 <= 0)
        throw new UnprocessableError('area: the polygon encloses no area. Give at least three distinct corners.');
      const overlaps = await tx.execute<{ name: string; km2: number }>(sql`
        SELECT j.name, ST_Area(ST_Intersection(j.area, ${geom})::geography) / 1e6 AS km2 FROM jurisdictions j
         WHERE j.id <> ${id}::uuid AND j.area IS NOT NULL AND ST_Intersects(j.area, ${geom})
           AND ST_Area(ST_Intersection(j.area, ${geom})::geography) > 1`);
      if (overlaps.rows.length) {
        throw new ConflictError(
          `area: the polygon overlaps the region${overlaps.rows.length > 1 ? 's' : ''} ${overlaps.rows.map((o) => `${o.name} (${o.km2.toFixed(2)} km²)`).join(', ')}. Regions may touch but not overlap; move the shared edge.`,
          { overlaps: overlaps.rows.map((o) => o.name) },
        );
      }
      await tx.execute(sql`UPDATE jurisdictions SET area = ST_Multi(${geom}) WHERE id = ${id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'jurisdiction.area',
        subjectType: 'jurisdiction',
        subjectId: id,
        jurisdictionId: id,
        before: exists.rows[0].area ? { area: JSON.parse(exists.rows[0].area) } : null,
        after: { area },
      });
    });
    return get(id);
  }

  /** A grower picks a region (or none, with null). Their existing leases keep their jurisdiction. */
  async function setGrowerRegion(user: CurrentUser, regionId: string | null) {
    if (user.role !== 'grower')
      throw new ForbiddenError('Only growers choose their region; advisers and regulators are placed by an administrator.');
    await db.transaction(async (tx) => {
      if (regionId) {
        const found = await tx.execute(sql`SELECT 1 FROM jurisdictions WHERE id = ${regionId}::uuid`);
        if (!found.rows[0]) throw new NotFoundError('No region with this id. Pick one from GET /regions.');
      }
      await tx.execute(sql`UPDATE users SET jurisdiction_id = ${regionId}::uuid WHERE id = ${user.id}`);
      forgetUser(user.id);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'user.region',
        subjectType: 'user',
        subjectId: user.id,
        jurisdictionId: regionId,
        before: { jurisdictionId: user.jurisdictionId },
        after: { jurisdictionId: regionId },
      });
    });
    return { regionId };
  }

  return { list, get, setArea, setGrowerRegion };
}

export type RegionsService = ReturnType<typeof createRegionsService>;
