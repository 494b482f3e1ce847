/**
 * Issue "Plume bands and screening" benchmarks:
 *  - 20 000 generated leases × 12 footprints: band fractions in PostGIS (subdivided bands), then
 *    the full screening (fractions, fields, ratings, stored);
 *  - a naive per-pair loop in Node (@turf/intersect + @turf/area on whole bands) on a subset of
 *    2 000 leases, time-boxed, reported per lease × band pair against PostGIS's per-pair time;
 *  - footprint geometry for a 10 000-vertex coast;
 *  - median vector-tile time at three zooms.
 */
import { area as turfArea, intersect as turfIntersect, featureCollection } from '@turf/turf';
import { sql } from 'drizzle-orm';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { buildFootprint } from '../shared/geometry/build-footprint';
import { defaultBandSpecs } from '../shared/geometry/default-band-specs';
import { computePlume } from '../shared/physics/compute-plume';
import { exposureParameters } from '../shared/physics/exposure-field';
import { createDb } from '../server/db/client';
import { leaseTile } from '../server/db/repositories/tiles.repo';
import { seedDemo } from '../server/db/seed';
import { seedDemoRegion } from '../server/db/seed-demo-region';
import type { CurrentUser } from '../server/http/route';
import { createScreeningService, leaseBandFractions } from '../server/services/screening.service';
import initGeosJs from 'geos-wasm';
import { geosErrorSink, geosOverlay } from './geos-overlay-contract';
import { type BenchResult, baseline, bench, time } from './harness';

const BENCH_LEASES = 20_000;

async function coastBench(): Promise<BenchResult[]> {
  const VERTICES = 10_000;
  const coordinates: [number, number][] = [];
  for (let i = 0; i < VERTICES; i += 1) {
    const y = -50_000 + (100_000 * i) / (VERTICES - 1);
    const x = 300 * Math.sin(y / 950) + 120 * Math.sin(y / 260 + 1) + 40 * Math.sin(y / 47) + 20 * Math.sin(y / 23 + 2);
    coordinates.push([-38.6 + x / 84_000, 41 + y / 111_050]);
  }
  const plume = computePlume({ latitude: 41, discharge: 150, reducedGravity: 0.02, mouthWidth: 800, mouthDepth: 1.5, floodDurationHours: 48 });
  const params = exposureParameters({ entrainmentCoefficient: 3e-5, t90DayHours: 6, t90NightHours: 48, indicator: { kind: 'constant', concentration: 1e4 } }, { seaSalinity: 34, riverSalinity: 0 }, 150);
  const input = {
    coast: { type: 'LineString' as const, coordinates },
    mouth: [coordinates[VERTICES / 2][0] - 0.002, 41] as [number, number],
    outflowAzimuth: 270,
    plume,
    params,
    bands: defaultBandSpecs({ speciesSalinityThreshold: 12, indicatorStandard: 14 }),
  };
  // The same footprint with the GEOS-backed overlay (issue 17's adoption rule: ≤ 1.5× the hand-written one), back to
  // back in this process, the hand-written one timed again after it so a change in the machine's load shows.
  const geos = geosOverlay(await initGeosJs({ errorHandler: geosErrorSink.handler, noticeHandler: () => {} }));
  const own = await bench('footprint geometry on a 10 000-vertex coast (4 bands + bulge)', () => buildFootprint(input), { runs: 10, warmup: 1, targetMs: 200 });
  const withGeos = await bench('footprint geometry on the same coast with GEOS overlay (geos-wasm)', () => buildFootprint(input, geos), { runs: 10, warmup: 1 });
  const ownAgain = await bench('footprint geometry on the same coast, hand-written overlay again', () => buildFootprint(input), { runs: 10, warmup: 1 });
  const ratio = withGeos.medianMs / ((own.medianMs + ownAgain.medianMs) / 2);
  withGeos.note = `${ratio.toFixed(2)}× the hand-written overlay (mean of the runs before and after; adopt if ≤ 1.5×)`;
  return [own, withGeos, ownAgain];
}

/** The coast footprint lines alone (no database): `npx tsx bench/run-bench.ts footprint`. */
export const coastBenchmarks = coastBench;

export async function screeningBenchmarks(databaseUrl: string): Promise<BenchResult[]> {
  const results: BenchResult[] = await coastBench();
  const handle = createDb(databaseUrl, 4);
  const db = handle.db;
  await seedDemo(db);
  await seedDemoRegion(db);
  const reg = await handle.pool.query("select * from users where email = 'regulator@brackline.test'");
  const r = reg.rows[0];
  const regulator: CurrentUser = { id: r.id, email: r.email, name: r.name, role: r.role, organisationId: r.organisation_id, jurisdictionId: r.jurisdiction_id };

  const fps = await db.execute<{ id: string; river_id: string; scenario_id: string }>(sql`
    SELECT f.id, f.river_id, f.scenario_id FROM footprints f WHERE f.scenario_id IS NOT NULL ORDER BY f.river_id, f.discharge LIMIT 12`);
  const fpIds = JSON.stringify(fps.rows.map((f) => f.id));
  // 20 000 leases (about 1 ha squares) in the sea the screened plumes cover, three in four inside the
  // smallest of them (so most leases meet every one of the 12 footprints, as in a busy bay), the rest anywhere
  // in the plumes' bounding box. Placed from the footprints, not from a fixed box, so the workload follows
  // the demo region when it changes.
  const benchOwner = (await handle.pool.query("select id, jurisdiction_id from users where email = 'grower3@brackline.test'")).rows[0];
  await db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'BENCH-%'`);
  await db.execute(sql`
    WITH chosen AS (SELECT b.footprint_id, b.geom FROM footprint_bands b
                     WHERE b.band_id = 'plume-edge' AND b.footprint_id IN (SELECT jsonb_array_elements_text(${fpIds}::jsonb)::uuid)),
         land AS (SELECT ST_Union(geom) AS g FROM coasts WHERE form = 'land'),
         inner_plume AS (SELECT ST_Difference(geom, (SELECT g FROM land)) AS g FROM chosen ORDER BY ST_Area(geom) LIMIT 1),
         sea AS (SELECT ST_Difference(ST_Envelope(ST_Collect(geom)), (SELECT g FROM land)) AS g FROM chosen),
         pts AS (
           SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM inner_plume), ${Math.round(BENCH_LEASES * 0.75)}, 7))).geom AS p
           UNION ALL
           SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM sea), ${BENCH_LEASES - Math.round(BENCH_LEASES * 0.75)}, 11))).geom)
    INSERT INTO leases (lease_code, status, species, owner_id, jurisdiction_id, geom, area_m2)
    SELECT 'BENCH-' || row_number() OVER (), 'held', 'pacific-oyster', ${benchOwner.id}, ${benchOwner.jurisdiction_id}::uuid, g, ST_Area(g::geography)
      FROM (SELECT ST_Multi(ST_Expand(p, 0.0006)) AS g FROM pts) x`);
  await db.execute(sql`ANALYZE leases`);
  const screening = createScreeningService({ db });
  const benchOnly = sql`l.lease_code LIKE 'BENCH-%'`;
  let pairs = 0;
  const fractions = await bench(
    `band fractions in PostGIS: ${BENCH_LEASES} leases × ${fps.rows.length} footprints (2 connections)`,
    async () => {
      pairs = 0;
      // Two footprints at a time: one PostgreSQL backend per core of this 2-core machine.
      const queue = [...fps.rows];
      const worker = async () => {
        for (let fp = queue.shift(); fp; fp = queue.shift()) {
          const m = await leaseBandFractions(db, fp.id, benchOnly);
          for (const v of m.values()) pairs += Object.keys(v).length;
        }
      };
      await Promise.all([worker(), worker()]);
    },
    { runs: 3, warmup: 1, targetMs: 2_500 },
  );
  fractions.note = `${pairs} lease × band pairs intersecting; ${(fractions.medianMs / pairs * 1000).toFixed(1)} µs per pair`;
  results.push(fractions);
  const postgisPerPairMs = fractions.medianMs / pairs;

  // The full re-screen as a run does it: per river, screenLeases over the plan of its footprints (two footprints at a
  // time, then the yearly figures), for the same 12 footprints.
  const byRiver = new Map<string, typeof fps.rows>();
  for (const fp of fps.rows) byRiver.set(fp.river_id, [...(byRiver.get(fp.river_id) ?? []), fp]);
  const full = await bench(
    `full screening (fractions, fields, ratings, stored): ${BENCH_LEASES} leases × ${fps.rows.length} scenarios`,
    async () => {
      for (const [riverId, items] of byRiver) {
        const river = await screening.riverInputs(riverId);
        const plan = [];
        for (const fp of items) {
          const sc = (await handle.pool.query('select * from scenarios where id = $1', [fp.scenario_id])).rows[0];
          const plume = (await handle.pool.query('select plume from footprints where id = $1', [fp.id])).rows[0].plume;
          plan.push({ footprint: { id: fp.id, plume }, scenario: { id: sc.id, aep: sc.aep, discharge: sc.discharge, durationHours: sc.duration_hours, name: sc.name } });
        }
        await screening.screenLeases(river, plan);
      }
    },
    { runs: 1, warmup: 0, targetMs: 10_000 },
  );
  full.note = `${((BENCH_LEASES * fps.rows.length) / (full.medianMs / 1000)).toFixed(0)} screenings/s; goal ≤ 10 s (one machine)`;
  results.push(full);

  // The naive way: every lease of a 2 000 subset against every band of one footprint, whole
  // bands, @turf/intersect + @turf/area, time-boxed to 60 s.
  const bands = await db.execute<{ geometry: string }>(sql`SELECT ST_AsGeoJSON(geom) AS geometry FROM footprint_bands WHERE footprint_id = ${fps.rows[0].id}::uuid AND band_id <> 'bulge'`);
  const bandFeatures = bands.rows.map((b) => ({ type: 'Feature', properties: {}, geometry: JSON.parse(b.geometry) }) as Feature<Polygon | MultiPolygon>);
  const subset = await db.execute<{ geometry: string }>(sql`SELECT ST_AsGeoJSON(geom) AS geometry FROM leases WHERE lease_code LIKE 'BENCH-%' ORDER BY lease_code LIMIT 2000`);
  const leaseFeatures = subset.rows.map((l) => ({ type: 'Feature', properties: {}, geometry: JSON.parse(l.geometry) }) as Feature<MultiPolygon>);
  const started = performance.now();
  let naivePairs = 0;
  outer: for (const lease of leaseFeatures) {
    for (const band of bandFeatures) {
      const inter = turfIntersect(featureCollection([lease, band]));
      if (inter) turfArea(inter);
      naivePairs++;
      if (performance.now() - started > 60_000) break outer;
    }
  }
  const naiveMs = performance.now() - started;
  const naivePerPair = naiveMs / naivePairs;
  results.push({
    name: `naive Node loop (@turf/intersect + @turf/area, whole bands): ${naivePairs} lease × band pairs`,
    medianMs: naiveMs,
    p90Ms: naiveMs,
    runs: 1,
    ratioToBaseline: naiveMs / (await baseline()),
    note: `${naivePerPair.toFixed(2)} ms per pair = ${(naivePerPair / postgisPerPairMs).toFixed(0)}× PostGIS per pair (target ≥ 20×)`,
  });

  // Vector tiles at three zooms over the bay.
  for (const z of [10, 12, 14]) {
    const n = 2 ** z;
    const lon = -38.6;
    const lat = 41.2;
    const x = Math.floor(((lon + 180) / 360) * n);
    const y = Math.floor(((1 - Math.log(Math.tan((lat * Math.PI) / 180) + 1 / Math.cos((lat * Math.PI) / 180)) / Math.PI) / 2) * n);
    const samples = await time(() => leaseTile(db, regulator, z, x, y), 15, 2);
    samples.sort((a, b) => a - b);
    const tile = await leaseTile(db, regulator, z, x, y);
    results.push({
      name: `lease vector tile at zoom ${z} (regulator, ${BENCH_LEASES + 40} leases in the region)`,
      medianMs: samples[7],
      p90Ms: samples[13],
      runs: 15,
      ratioToBaseline: samples[7] / (await baseline()),
      targetMs: 50,
      note: `${(tile.length / 1024).toFixed(0)} kB`,
    });
  }
  await db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'BENCH-%'`);
  // Leave no dead rows or stale statistics behind for the next section (autovacuum would, later).
  await db.execute(sql`VACUUM ANALYZE leases, screenings, lease_annual_exposure`);
  await handle.pool.end();
  return results;
}
