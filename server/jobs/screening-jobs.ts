/**
 * Screening runs in the background: pg-boss queues on the same PostgreSQL, so any number of app
 * servers and workers share the work. A river's run is one `screen-river` job that builds the
 * footprints once, then splits the river's leases into `screen-chunk` jobs that any worker takes;
 * screening_runs holds the run's progress (leases done, summed over its chunks) and
 * screening_run_chunks each chunk's state and the worker that ran it.
 * Tests, the benchmark and the demo loader use the inline runner, which does the same work at once.
 */
import { hostname } from 'node:os';
import { sql } from 'drizzle-orm';
import type pg from 'pg';
import PgBoss from 'pg-boss';
import type { DbHandle, Database } from '../db/client';
import { NotFoundError, UnprocessableError } from '../lib/errors';
import { logger } from '../lib/logger';
import type { ScreeningPlanItem, ScreeningService } from '../services/screening.service';
import { inTransaction } from './in-transaction';

export interface ScreeningJobs {
  /** Re-screens every lease of a river (after its settings, record, scenarios or coast changed). */
  enqueueRiver(riverId: string): Promise<string>;
  /** Re-screens these leases against every river that covers them. */
  enqueueLeases(leaseIds: string[]): Promise<void>;
  stop(): Promise<void>;
}

export interface ScreeningJobOptions {
  /** Run the workers in this process (WORKERS=false leaves them to other processes). */
  work: boolean;
  /** Leases per chunk job. */
  chunkLeases: number;
  /** Recorded on each chunk the process runs. */
  workerId?: string;
  /** A chunk still active this long after a worker took it is failed and retried by another. */
  chunkExpireSeconds: number;
  /** How often pg-boss expires the jobs of dead workers. */
  maintenanceSeconds: number;
  /** Retries of a chunk after a failure or a dead worker, and the pause before each. */
  chunkRetryLimit?: number;
  chunkRetryDelaySeconds?: number;
}

const Q_RUN = 'screen-river';
const Q_CHUNK = 'screen-chunk';

interface RunJob {
  riverId: string;
  runId: string;
  /** Only these leases (a lease upload or edit); the whole river when absent. */
  leaseIds?: string[];
}

interface ChunkJob {
  riverId: string;
  runId: string;
  chunkNo: number;
  plan: { footprintId: string; scenario: ScreeningPlanItem['scenario'] }[];
}

/** This process's name in screening_run_chunks.worker. */
export function defaultWorkerId(): string {
  return `${hostname()}:${process.pid}`;
}

async function runTracked(db: Database, screening: ScreeningService, runId: string, riverId: string) {
  await db.execute(sql`UPDATE screening_runs SET status = 'running', started_at = now() WHERE id = ${runId}::uuid`);
  try {
    await screening.screenRiver(riverId, async (done, total, message) => {
      await db.execute(sql`UPDATE screening_runs SET done = ${done}, total = ${total}, message = ${message} WHERE id = ${runId}::uuid`);
    });
    await db.execute(sql`UPDATE screening_runs SET status = 'done', finished_at = now() WHERE id = ${runId}::uuid`);
  } catch (err) {
    logger.warn({ err, riverId }, 'screening run failed');
    await failRun(db, runId, (err as Error).message);
  }
}

async function failRun(db: Database, runId: string, message: string) {
  await db.execute(
    sql`UPDATE screening_runs SET status = 'failed', error = ${message}, finished_at = now() WHERE id = ${runId}::uuid AND status <> 'done'`,
  );
}

async function newRun(db: Database, riverId: string): Promise<string> {
  const res = await db.execute<{ id: string }>(
    sql`INSERT INTO screening_runs (river_id, status) VALUES (${riverId}::uuid, 'queued') RETURNING id`,
  );
  return res.rows[0].id;
}

/** Runs each screening at once, in the caller's request (tests, benchmark, demo loader). */
export function createInlineScreeningJobs(db: Database, screening: ScreeningService): ScreeningJobs {
  return {
    async enqueueRiver(riverId) {
      const runId = await newRun(db, riverId);
      await runTracked(db, screening, runId, riverId);
      return runId;
    },
    async enqueueLeases(leaseIds) {
      for (const riverId of await screening.riversForLeases(leaseIds)) {
        await screening.screenRiver(riverId, undefined, leaseIds).catch((err) => logger.warn({ err, riverId }, 'lease screening failed'));
      }
    },
    async stop() {},
  };
}

/**
 * The chunked runner's two steps, for any pg-boss (or a test's own loop): plan a run (footprints,
 * then chunk rows and chunk jobs, committed together), and screen one chunk.
 */
export function createChunkedScreening(handle: DbHandle, screening: ScreeningService, options: { chunkLeases: number; workerId: string }) {
  const { db, pool } = handle;

  /**
   * The parent step. Idempotent: a retried parent (its worker died) finds the chunks already
   * queued and stops; a run whose chunks were not committed is planned again from the start.
   */
  async function planRun(job: RunJob, sendChunk: (client: pg.PoolClient, chunk: ChunkJob) => Promise<void>, finalTry = true) {
    const { runId, riverId } = job;
    const started = await db.execute(sql`
      UPDATE screening_runs SET status = 'running', started_at = COALESCE(started_at, now())
       WHERE id = ${runId}::uuid AND status IN ('queued', 'running') RETURNING id`);
    if (!started.rows.length) return;
    const planned = await db.execute(sql`SELECT 1 FROM screening_run_chunks WHERE run_id = ${runId}::uuid LIMIT 1`);
    if (planned.rows.length) return;
    try {
      const { river, plan } = await screening.prepareRiver(riverId, async (_done, _total, message) => {
        await db.execute(sql`UPDATE screening_runs SET message = ${message} WHERE id = ${runId}::uuid`);
      });
      const ids = await screening.scopedLeaseIds(river, job.leaseIds);
      const chunks: string[][] = [];
      for (let i = 0; i < ids.length; i += options.chunkLeases) chunks.push(ids.slice(i, i + options.chunkLeases));
      const planIds = plan.map((p) => ({ footprintId: p.footprint.id, scenario: p.scenario }));
      await inTransaction(pool, async (client) => {
        // The run row, locked: a second planner of the same run waits here, then sees the chunks.
        const run = await client.query(`SELECT id FROM screening_runs WHERE id = $1 FOR UPDATE`, [runId]);
        if (!run.rows.length) return;
        const again = await client.query(`SELECT 1 FROM screening_run_chunks WHERE run_id = $1 LIMIT 1`, [runId]);
        if (again.rows.length) return;
        await client.query(
          `INSERT INTO screening_run_chunks (run_id, chunk_no, lease_ids)
           SELECT $1, c.ordinality - 1, ARRAY(SELECT jsonb_array_elements_text(c.ids)::uuid)
             FROM jsonb_array_elements($2::jsonb) WITH ORDINALITY AS c(ids, ordinality)`,
          [runId, JSON.stringify(chunks)],
        );
        await client.query(
          `UPDATE screening_runs SET total = $2, done = 0, message = $3,
                  status = CASE WHEN $2 = 0 THEN 'done' ELSE status END, finished_at = CASE WHEN $2 = 0 THEN now() END
            WHERE id = $1`,
          [runId, ids.length, `Screening ${ids.length} leases in ${chunks.length} chunks`],
        );
        for (const [chunkNo] of chunks.entries()) await sendChunk(client, { runId, riverId, chunkNo, plan: planIds });
      });
    } catch (err) {
      // No coastline, a bad setting, the river gone: retrying will not help; the run says why.
      // Anything else (the database away for a moment) is retried by pg-boss until the last try.
      const hopeless = err instanceof UnprocessableError || err instanceof NotFoundError;
      if (!hopeless && !finalTry) throw err;
      logger.warn({ err, riverId }, 'screening run failed');
      await failRun(db, runId, (err as Error).message);
    }
  }

  /**
   * One chunk: screenings and annualised exposure of its leases under every scenario of the plan.
   * Rows are upserts, so a chunk run twice (a worker died after writing) leaves the same rows;
   * the chunk counts towards the run once, when its row first turns 'done'. A passing error is
   * rethrown for pg-boss to retry; on the last try, or when retrying cannot help, the run fails.
   */
  async function runChunk(job: ChunkJob, finalTry: boolean) {
    const { runId, riverId, chunkNo } = job;
    const claimed = await db.execute<{ lease_ids: string[] }>(sql`
      UPDATE screening_run_chunks c SET status = 'running', worker = ${options.workerId}, attempts = attempts + 1, started_at = now()
        FROM screening_runs r
       WHERE c.run_id = ${runId}::uuid AND c.chunk_no = ${chunkNo} AND c.status IN ('queued', 'running')
         AND r.id = c.run_id AND r.status = 'running'
      RETURNING c.lease_ids`);
    const leaseIds = claimed.rows[0]?.lease_ids;
    if (!leaseIds) return;
    try {
      const river = await screening.riverInputs(riverId);
      const plan = await screening.loadPlan(job.plan);
      await screening.screenLeases(river, plan, leaseIds);
    } catch (err) {
      const hopeless = err instanceof UnprocessableError || err instanceof NotFoundError;
      if (!hopeless && !finalTry) throw err;
      logger.warn({ err, riverId, chunkNo }, 'screening chunk failed');
      await db.execute(
        sql`UPDATE screening_run_chunks SET status = 'failed', finished_at = now() WHERE run_id = ${runId}::uuid AND chunk_no = ${chunkNo}`,
      );
      await failRun(db, runId, (err as Error).message);
      return;
    }
    await inTransaction(pool, async (client) => {
      const finished = await client.query<{ n: number }>(
        `UPDATE screening_run_chunks SET status = 'done', worker = $3, finished_at = now()
          WHERE run_id = $1 AND chunk_no = $2 AND status <> 'done' RETURNING cardinality(lease_ids) AS n`,
        [runId, chunkNo, options.workerId],
      );
      if (!finished.rows.length) return;
      // Locks the run row: chunks finishing at once add up one after another, and the last one,
      // running its check below as a new statement, sees every other chunk's committed 'done'.
      await client.query(
        `UPDATE screening_runs r SET done = r.done + $2,
                message = (SELECT count(*) FILTER (WHERE status = 'done') || ' of ' || count(*) || ' chunks screened' FROM screening_run_chunks WHERE run_id = $1)
          WHERE r.id = $1`,
        [runId, finished.rows[0].n],
      );
      await client.query(
        `UPDATE screening_runs SET status = 'done', finished_at = now()
          WHERE id = $1 AND status = 'running' AND NOT EXISTS (SELECT 1 FROM screening_run_chunks WHERE run_id = $1 AND status <> 'done')`,
        [runId],
      );
    });
  }

  return { planRun, runChunk };
}

/** pg-boss queues and workers (npm start, npm run worker). */
export async function createPgBossScreeningJobs(
  databaseUrl: string,
  handle: DbHandle,
  screening: ScreeningService,
  options: ScreeningJobOptions,
): Promise<ScreeningJobs & { boss: PgBoss }> {
  const { db } = handle;
  const boss = new PgBoss({ connectionString: databaseUrl, max: 4, maintenanceIntervalSeconds: options.maintenanceSeconds });
  boss.on('error', (err) => logger.error({ err }, 'pg-boss error'));
  await boss.start();
  const runRetry = { retryLimit: 2, retryDelay: 10, expireInSeconds: 3600 };
  const chunkRetry = {
    retryLimit: options.chunkRetryLimit ?? 3,
    retryDelay: options.chunkRetryDelaySeconds ?? 2,
    expireInSeconds: options.chunkExpireSeconds,
  };
  await boss.createQueue(Q_RUN, { name: Q_RUN, ...runRetry });
  await boss.createQueue(Q_CHUNK, { name: Q_CHUNK, ...chunkRetry });
  const workerId = options.workerId ?? defaultWorkerId();
  const chunked = createChunkedScreening(handle, screening, { chunkLeases: options.chunkLeases, workerId });
  const sendChunk = async (client: pg.PoolClient, chunk: ChunkJob) => {
    // Sent inside the planner's transaction: the chunk jobs exist exactly when their rows do.
    await boss.send(Q_CHUNK, chunk, { ...chunkRetry, db: { executeSql: (text: string, values: unknown[]) => client.query(text, values) } });
  };
  if (options.work) {
    await boss.work<RunJob>(Q_RUN, { batchSize: 1, pollingIntervalSeconds: 1, includeMetadata: true }, async ([job]) => {
      await chunked.planRun(job.data, sendChunk, job.retryCount >= job.retryLimit);
    });
    await boss.work<ChunkJob>(Q_CHUNK, { batchSize: 1, pollingIntervalSeconds: 1, includeMetadata: true }, async ([job]) => {
      await chunked.runChunk(job.data, job.retryCount >= job.retryLimit);
    });
    logger.info({ workerId }, 'screening workers started');
  }
  const enqueue = async (riverId: string, leaseIds?: string[]) => {
    const runId = await newRun(db, riverId);
    await boss.send(Q_RUN, { riverId, runId, ...(leaseIds ? { leaseIds } : {}) } satisfies RunJob, runRetry);
    return runId;
  };
  return {
    boss,
    enqueueRiver: (riverId) => enqueue(riverId),
    async enqueueLeases(leaseIds) {
      for (const riverId of await screening.riversForLeases(leaseIds)) await enqueue(riverId, leaseIds);
    },
    async stop() {
      await boss.stop({ graceful: true, timeout: 5000, wait: true });
    },
  };
}
