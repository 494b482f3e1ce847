/**
 * Issue "Several processes, one PostgreSQL" benchmark: the full re-screen of one river over a
 * jurisdiction of 20 000 generated leases, run as chunk jobs by one worker process and then by two
 * (`tsx server/worker.ts`, real processes, as `npm run worker` starts them), beside the inline
 * runner's time for the same river in one process. The footprints are cached, so the time is the
 * planning plus the chunks. On the 2-core reference machine the second
 * worker shares the cores with PostgreSQL, so the gain is bounded well below 2×.
 */
import { type ChildProcess, spawn } from 'node:child_process';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { createDb } from '../server/db/client';
import { seedDemo } from '../server/db/seed';
import { seedDemoRegion } from '../server/db/seed-demo-region';
import { createPgBossScreeningJobs } from '../server/jobs/screening-jobs';
import { createScreeningService } from '../server/services/screening.service';
import { type BenchResult, baseline } from './harness';

const BENCH_LEASES = 20_000;
const CHUNK_LEASES = 1000;
const ROOT = path.resolve(import.meta.dirname, '..');

function startWorker(databaseUrl: string, id: string): Promise<ChildProcess> {
  // node with tsx's loader, so the pid is the worker's own (the tsx command runs it in a child).
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/worker.ts'], {
    cwd: ROOT,
    env: {
      ...process.env,
      DATABASE_URL: databaseUrl,
      AUTH_SECRET: process.env.AUTH_SECRET ?? 'bench-secret-bench-secret-bench-secret-01',
      WORKER_ID: id,
      SCREENING_CHUNK_LEASES: String(CHUNK_LEASES),
      LOG_LEVEL: 'warn',
      SERVE_CLIENT: 'false',
      GAUGE_FEED_POLL_SECONDS: '3600',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  return new Promise((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`worker ${id} did not start:\n${out}`)), 120_000);
    const onData = (b: Buffer) => {
      out += b.toString();
      if (out.includes(`Worker ${id} is running`)) {
        clearTimeout(timer);
        resolve(child);
      }
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', onData);
    child.on('exit', (code) => reject(new Error(`worker ${id} exited (${code}):\n${out}`)));
  });
}

async function stopWorker(child: ChildProcess) {
  if (child.exitCode !== null) return;
  const exited = new Promise((r) => child.once('exit', r));
  child.kill('SIGTERM');
  await exited;
}

export async function workersBenchmarks(databaseUrl: string): Promise<BenchResult[]> {
  const handle = createDb(databaseUrl, 4);
  const db = handle.db;
  await seedDemo(db);
  await seedDemoRegion(db);
  const owner = (await handle.pool.query("select id, jurisdiction_id from users where email = 'grower3@brackline.test'")).rows[0];
  await db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'BENCHW-%'`);
  await db.execute(sql`
    WITH sea AS (SELECT ST_Difference(ST_MakeEnvelope(-38.82, 41.02, -38.46, 41.38, 4326), (SELECT ST_Union(geom) FROM coasts WHERE form = 'land')) AS g),
         pts AS (SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM sea), ${BENCH_LEASES}, 13))).geom AS p)
    INSERT INTO leases (lease_code, status, species, owner_id, jurisdiction_id, geom, area_m2)
    SELECT 'BENCHW-' || row_number() OVER (), 'held', 'pacific-oyster', ${owner.id}, ${owner.jurisdiction_id}::uuid, g, ST_Area(g::geography)
      FROM (SELECT ST_Multi(ST_Expand(p, 0.0006)) AS g FROM pts) x`);
  await db.execute(sql`ANALYZE leases`);
  const river = (await handle.pool.query("select id from rivers where name = 'Amberlin River'")).rows[0].id as string;
  const scenarios = (await handle.pool.query('select count(*)::int as n from scenarios where river_id = $1', [river])).rows[0].n as number;
  await handle.pool.query(`delete from pgboss.job where name like 'screen-%'`).catch(() => undefined);
  const sender = await createPgBossScreeningJobs(databaseUrl, handle, createScreeningService({ db }), {
    work: false,
    chunkLeases: CHUNK_LEASES,
    chunkExpireSeconds: 600,
    maintenanceSeconds: 60,
  });
  const results: BenchResult[] = [];
  try {
    // The reference: the inline runner, the whole river at once in this process (no chunks, no queue).
    const screening = createScreeningService({ db });
    const t0 = performance.now();
    const inline = await screening.screenRiver(river);
    const inlineMs = performance.now() - t0;
    results.push({
      name: `full re-screen of one river, inline in one process (no chunks): ${inline.screenings / Math.max(1, inline.scenarios)} leases × ${inline.scenarios} scenarios`,
      medianMs: inlineMs,
      p90Ms: inlineMs,
      runs: 1,
      ratioToBaseline: inlineMs / (await baseline()),
      note: `${(inline.screenings / (inlineMs / 1000)).toFixed(0)} screenings/s`,
    });
    for (const n of [1, 2]) {
      const workers = await Promise.all(Array.from({ length: n }, (_, i) => startWorker(databaseUrl, `bench-${n}-${i + 1}`)));
      try {
        const t0 = performance.now();
        const runId = await sender.enqueueRiver(river);
        for (;;) {
          const run = (await handle.pool.query('select status, total, error from screening_runs where id = $1', [runId])).rows[0];
          if (run.status === 'failed') throw new Error(`bench run failed: ${run.error}`);
          if (run.status === 'done') break;
          await new Promise((r) => setTimeout(r, 100));
        }
        const ms = performance.now() - t0;
        const chunks = (
          await handle.pool.query(
            'select worker, count(*)::int as n from screening_run_chunks where run_id = $1 group by worker order by worker',
            [runId],
          )
        ).rows;
        const leases = (await handle.pool.query('select total from screening_runs where id = $1', [runId])).rows[0].total as number;
        results.push({
          name: `full re-screen of one river in ${CHUNK_LEASES}-lease chunk jobs, ${n} worker process${n > 1 ? 'es' : ''}: ${leases} leases × ${scenarios} scenarios`,
          medianMs: ms,
          p90Ms: ms,
          runs: 1,
          ratioToBaseline: ms / (await baseline()),
          note: `chunks per worker: ${chunks.map((c) => `${c.worker} ${c.n}`).join(', ')}; ${((leases * scenarios) / (ms / 1000)).toFixed(0)} screenings/s`,
        });
      } finally {
        await Promise.all(workers.map(stopWorker));
      }
    }
  } finally {
    await sender.stop();
    await db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'BENCHW-%'`);
    // Leave no dead rows or stale statistics behind for the next section (autovacuum would, later).
    await db.execute(sql`VACUUM ANALYZE leases, screenings, lease_annual_exposure`);
    await handle.pool.end();
  }
  if (results.length === 3) {
    const ratio = results[2].medianMs / results[1].medianMs;
    results[2].note += `; ${(results[1].medianMs / results[2].medianMs).toFixed(2)}× the one-worker speed; two workers take ${ratio.toFixed(2)}× the one-worker time (goal ≤ 0.6×, ${ratio <= 0.6 ? 'met' : 'missed'})`;
  }
  return results;
}
