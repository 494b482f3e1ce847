/**
 * Issue "Jurisdiction-scale speed": the screening no longer asks PostGIS for every lease's arc hint
 * (ST_LineLocatePoint(path, ST_ClosestPoint(path, lease)) × ST_Length(path::geography)); it bounds it in Node
 * (arcHintBounds). Checked against PostGIS itself: for every footprint of the demo region and 300 generated leases
 * across its sea (fixed seed), PostGIS's value lies inside the bounds.
 */
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { arcHintBounds, footprintDegreePath } from '../../../server/services/coast-positions';
import { createScreeningService } from '../../../server/services/screening.service';
import { createTestApp, type TestApp } from '../../helpers/test-app';

let t: TestApp;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  const owner = (await t.db.pool.query("SELECT id, jurisdiction_id FROM users WHERE email = 'grower3@brackline.test'")).rows[0];
  await t.db.db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'ARC-%'`);
  await t.db.db.execute(sql`
    WITH sea AS (SELECT ST_Difference(ST_MakeEnvelope(-38.9, 40.9, -38.4, 41.5, 4326), (SELECT ST_Union(geom) FROM coasts WHERE form = 'land')) AS g),
         pts AS (SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM sea), 300, 17))).geom AS p)
    INSERT INTO leases (lease_code, status, species, owner_id, jurisdiction_id, geom, area_m2)
    SELECT 'ARC-' || row_number() OVER (ORDER BY ST_X(p), ST_Y(p)), 'held', 'pacific-oyster', ${owner.id}, ${owner.jurisdiction_id}::uuid,
           ST_Multi(ST_Expand(p, 0.0006)), ST_Area(ST_Expand(p, 0.0006)::geography)
      FROM pts`);
  // The footprints of the Amberlin River's scenarios (built if missing).
  const river = (await t.db.pool.query("SELECT id FROM rivers WHERE name = 'Amberlin River'")).rows[0].id as string;
  await createScreeningService({ db: t.db.db }).prepareRiver(river);
}, 600_000);

afterAll(async () => {
  await t.db.db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'ARC-%'`);
  await t.close();
});

describe('arcHintBounds', () => {
  it("holds PostGIS's arc hint of every lease on every footprint", async () => {
    const fps = (await t.db.pool.query('SELECT id FROM footprints WHERE path IS NOT NULL')).rows as { id: string }[];
    expect(fps.length).toBeGreaterThan(0);
    let checked = 0;
    const outside: string[] = [];
    for (const fp of fps) {
      const path = await footprintDegreePath(t.db.db, fp.id);
      if (!path) continue;
      const rows = (
        await t.db.pool.query(
          `WITH f AS MATERIALIZED (SELECT path, ST_Length(path::geography) AS len FROM footprints WHERE id = $1)
           SELECT l.lease_code, ST_LineLocatePoint(f.path, ST_ClosestPoint(f.path, l.geom)) * f.len AS s,
                  ST_X(ST_PointOnSurface(l.geom)) AS lon, ST_Y(ST_PointOnSurface(l.geom)) AS lat,
                  ST_XMin(l.geom) AS x0, ST_YMin(l.geom) AS y0, ST_XMax(l.geom) AS x1, ST_YMax(l.geom) AS y1
             FROM leases l, f WHERE l.lease_code LIKE 'ARC-%'`,
          [fp.id],
        )
      ).rows;
      for (const r of rows) {
        const b = arcHintBounds(path, r);
        checked += 1;
        if (!b || !(r.s >= b[0] && r.s <= b[1])) outside.push(`${r.lease_code} on ${fp.id}: ${r.s} not in ${JSON.stringify(b)}`);
      }
    }
    expect(checked).toBeGreaterThanOrEqual(300);
    expect(outside.slice(0, 10)).toEqual([]);
  });
});
