/**
 * The full re-screen profiled (issue "Jurisdiction-scale speed"): 20 000 generated leases in the demo region,
 * one river's every scenario screened inline once. Run with `node --cpu-prof --import tsx bench/profile-screening.ts`
 * and summarise the .cpuprofile with `npx tsx bench/summarise-profile.ts <file>`; DATABASE_URL as for npm run bench.
 */
import { sql } from 'drizzle-orm';
import { createDb } from '../server/db/client';
import { seedDemo } from '../server/db/seed';
import { seedDemoRegion } from '../server/db/seed-demo-region';
import { createScreeningService } from '../server/services/screening.service';

const BENCH_LEASES = Number(process.env.PROFILE_LEASES ?? 20_000);

async function main() {
  const handle = createDb(process.env.DATABASE_URL!, 4);
  const db = handle.db;
  await seedDemo(db);
  await seedDemoRegion(db);
  const owner = (await handle.pool.query("select id, jurisdiction_id from users where email = 'grower3@brackline.test'")).rows[0];
  await db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'BENCHP-%'`);
  await db.execute(sql`
    WITH sea AS (SELECT ST_Difference(ST_MakeEnvelope(-38.82, 41.02, -38.46, 41.38, 4326), (SELECT ST_Union(geom) FROM coasts WHERE form = 'land')) AS g),
         pts AS (SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM sea), ${BENCH_LEASES}, 13))).geom AS p)
    INSERT INTO leases (lease_code, status, species, owner_id, jurisdiction_id, geom, area_m2)
    SELECT 'BENCHP-' || row_number() OVER (), 'held', 'pacific-oyster', ${owner.id}, ${owner.jurisdiction_id}::uuid, g, ST_Area(g::geography)
      FROM (SELECT ST_Multi(ST_Expand(p, 0.0006)) AS g FROM pts) x`);
  await db.execute(sql`ANALYZE leases`);
  const river = (await handle.pool.query("select id from rivers where name = 'Amberlin River'")).rows[0].id as string;
  const screening = createScreeningService({ db });
  const t0 = performance.now();
  const res = await screening.screenRiver(river);
  console.log(JSON.stringify({ ms: performance.now() - t0, ...res }));
  await db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'BENCHP-%'`);
  await handle.pool.end();
}

void main();
