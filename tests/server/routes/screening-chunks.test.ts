/**
 * A river's re-screening split into chunks of leases (several workers share one jurisdiction):
 *  - the chunked runner stores exactly the rows the inline runner stores (the reference here is
 *    the inline runner, itself checked against published values in rivers-screening.test.ts);
 *  - a footprint asked for by two workers at once is built once (its band pieces are those of one
 *    ST_Subdivide of its bands, not twice as many);
 *  - real pg-boss with two workers in this process: the run completes and both workers took chunks.
 * The same with separate processes, a killed worker and an alert burst: tests/faults/multi-process.fault.ts.
 */
import { sql } from 'drizzle-orm';
import type pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb, type DbHandle } from '../../../server/db/client';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { createChunkedScreening, createPgBossScreeningJobs } from '../../../server/jobs/screening-jobs';
import { createScreeningService } from '../../../server/services/screening.service';
import { createTestApp, type TestApp } from '../../helpers/test-app';

let t: TestApp;
let riverId: string;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  const river = await t.db.pool.query(`select id from rivers where name = 'Amberlin River'`);
  riverId = river.rows[0].id;
}, 180_000);
afterAll(async () => {
  await t.close();
});

/** Every stored result of the river, in a fixed order, for an exact comparison. */
async function snapshot(pool: pg.Pool) {
  const screenings = await pool.query(
    `select lease_id, scenario_id, footprint_id, band_fractions, lowest_salinity, highest_indicator, days_below_tolerance, rating, score, reasons, numbers, input_hash
       from screenings where river_id = $1 order by lease_id, scenario_id`,
    [riverId],
  );
  const annual = await pool.query(
    `select lease_id, expected_days_per_year, probability_any_exposure, worst_rating, details from lease_annual_exposure where river_id = $1 order by lease_id`,
    [riverId],
  );
  return { screenings: screenings.rows, annual: annual.rows };
}

async function forget(pool: pg.Pool) {
  await pool.query(`delete from screenings where river_id = $1`, [riverId]);
  await pool.query(`delete from lease_annual_exposure where river_id = $1`, [riverId]);
}

async function waitFor<T>(what: string, read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs: number): Promise<T> {
  const started = Date.now();
  for (;;) {
    const v = await read();
    if (ok(v)) return v;
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}: last value ${JSON.stringify(v)}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe('chunked screening', () => {
  it('stores the same screenings and annual exposure as the inline runner, chunk by chunk on two workers', async () => {
    const screening = createScreeningService({ db: t.db.db });
    await forget(t.db.pool);
    await screening.screenRiver(riverId);
    const inline = await snapshot(t.db.pool);
    expect(inline.screenings.length).toBeGreaterThan(20);

    await forget(t.db.pool);
    const run = await t.db.pool.query(`insert into screening_runs (river_id, status) values ($1, 'queued') returning id`, [riverId]);
    const runId = run.rows[0].id;
    const queued: Parameters<ReturnType<typeof createChunkedScreening>['runChunk']>[0][] = [];
    const w1 = createChunkedScreening(t.db, screening, { chunkLeases: 7, workerId: 'w1' });
    const w2 = createChunkedScreening(t.db, screening, { chunkLeases: 7, workerId: 'w2' });
    await w1.planRun({ runId, riverId }, async (_client, chunk) => void queued.push(chunk));
    // Planning again (a retried parent job) queues nothing more.
    await w2.planRun({ runId, riverId }, async (_client, chunk) => void queued.push(chunk));
    const leases = (await screening.scopedLeaseIds(await screening.riverInputs(riverId))).length;
    expect(queued).toHaveLength(Math.ceil(leases / 7));
    const planned = await t.db.pool.query(`select total, done, status from screening_runs where id = $1`, [runId]);
    expect(planned.rows[0]).toMatchObject({ total: leases, done: 0, status: 'running' });

    // Two workers take chunks from one queue at once; one chunk is run twice (a retry after a death).
    const todo = [...queued];
    const work = async (w: typeof w1) => {
      for (let c = todo.shift(); c; c = todo.shift()) await w.runChunk(c, false);
    };
    await Promise.all([work(w1), work(w2)]);
    await w2.runChunk(queued[0], false);

    const chunked = await snapshot(t.db.pool);
    expect(chunked.screenings).toEqual(inline.screenings);
    expect(chunked.annual).toEqual(inline.annual);
    const done = await t.db.pool.query(`select total, done, status, finished_at from screening_runs where id = $1`, [runId]);
    expect(done.rows[0]).toMatchObject({ total: leases, done: leases, status: 'done' });
    expect(done.rows[0].finished_at).not.toBeNull();
    const chunks = await t.db.pool.query(`select status, worker from screening_run_chunks where run_id = $1`, [runId]);
    expect(chunks.rows.every((c) => c.status === 'done')).toBe(true);
    expect(new Set(chunks.rows.map((c) => c.worker))).toEqual(new Set(['w1', 'w2']));
  }, 120_000);

  it('builds a footprint asked for by two workers at once only once', async () => {
    // Two pools: two workers' own connections.
    const other: DbHandle = createDb(t.env.DATABASE_URL, 2);
    try {
      const a = createScreeningService({ db: t.db.db });
      const b = createScreeningService({ db: other.db });
      const river = await a.riverInputs(riverId);
      // A flow no scenario has, so neither finds it cached.
      const flow = { discharge: 123.25 + Math.random(), durationHours: 31 };
      const [x, y] = await Promise.all([a.ensureFootprint(river, flow), b.ensureFootprint(river, flow)]);
      expect(x.id).toBe(y.id);
      expect([x.created, y.created].filter(Boolean)).toHaveLength(1);
      const counts = await t.db.pool.query(
        `select (select count(*)::int from footprints where river_id = $2 and discharge = $3) as footprints,
                (select count(*)::int from footprint_band_pieces where footprint_id = $1) as pieces,
                (select count(*)::int from (select ST_Subdivide(geom, 64) from footprint_bands where footprint_id = $1 and band_id <> 'bulge') s) as expected`,
        [x.id, riverId, flow.discharge],
      );
      expect(counts.rows[0].footprints).toBe(1);
      expect(counts.rows[0].pieces).toBeGreaterThan(0);
      expect(counts.rows[0].pieces).toBe(counts.rows[0].expected);
      await t.db.pool.query(`delete from footprints where id = $1`, [x.id]);
    } finally {
      await other.pool.end();
    }
  }, 60_000);

  it('pg-boss: a river change is screened in chunks by the workers, and the run reports leases done', async () => {
    const screening = createScreeningService({ db: t.db.db });
    await t.db.pool.query(`delete from pgboss.job where name like 'screen-%'`).catch(() => undefined);
    const options = { work: true, chunkLeases: 4, chunkExpireSeconds: 60, maintenanceSeconds: 30 };
    const a = await createPgBossScreeningJobs(t.env.DATABASE_URL, t.db, screening, { ...options, workerId: 'boss-a' });
    const b = await createPgBossScreeningJobs(t.env.DATABASE_URL, t.db, screening, { ...options, workerId: 'boss-b' });
    try {
      const runId = await a.enqueueRiver(riverId);
      const run = await waitFor(
        'the run to finish',
        async () => (await t.db.pool.query(`select status, total, done, error from screening_runs where id = $1`, [runId])).rows[0],
        (r) => r.status === 'done' || r.status === 'failed',
        90_000,
      );
      expect(run.status).toBe('done');
      expect(run.done).toBe(run.total);
      const chunks = await t.db.pool.query(`select worker, cardinality(lease_ids) as n from screening_run_chunks where run_id = $1`, [
        runId,
      ]);
      expect(chunks.rows.reduce((s, c) => s + c.n, 0)).toBe(run.total);
      // Every chunk ran on one of the two workers. Which one takes which is a race between two pollers in one
      // process (on a loaded machine one may take them all); the spread over two worker processes is asserted by
      // tests/faults/multi-process.fault.ts (npm run faults).
      for (const c of chunks.rows) expect(['boss-a', 'boss-b']).toContain(c.worker);
      const leases = await screening.scopedLeaseIds(await screening.riverInputs(riverId));
      expect(run.total).toBe(leases.length);
      const fresh = await t.db.db.execute<{ n: number }>(sql`
        select count(*)::int as n from screenings s join screening_runs r on r.id = ${runId}::uuid
         where s.river_id = ${riverId}::uuid and s.computed_at >= r.started_at`);
      const scenarios = await t.db.pool.query(`select count(*)::int as n from scenarios where river_id = $1`, [riverId]);
      expect(fresh.rows[0].n).toBe(leases.length * scenarios.rows[0].n);
    } finally {
      await a.stop();
      await b.stop();
    }
  }, 120_000);
});
