/**
 * Screening runs in the background: pg-boss queues on the same PostgreSQL, so any number of app
 * servers and workers can share the work. Each run records its progress in screening_runs.
 * Tests and the benchmark use the inline runner, which does the same work at once.
 */
import { sql } from 'drizzle-orm';
import PgBoss from 'pg-boss';
import type { Database } from '../db/client';
import { logger } from '../lib/logger';
import type { ScreeningService } from '../services/screening.service';

export interface ScreeningJobs {
  /** Re-screens every lease of a river (after its settings, record, scenarios or coast changed). */
  enqueueRiver(riverId: string): Promise<string>;
  /** Re-screens these leases against every river that covers them. */
  enqueueLeases(leaseIds: string[]): Promise<void>;
  stop(): Promise<void>;
}

const QUEUE = 'screen-river';

async function runTracked(db: Database, screening: ScreeningService, runId: string, riverId: string) {
  await db.execute(sql`UPDATE screening_runs SET status = 'running', started_at = now() WHERE id = ${runId}::uuid`);
  try {
    await screening.screenRiver(riverId, async (done, total, message) => {
      await db.execute(sql`UPDATE screening_runs SET done = ${done}, total = ${total}, message = ${message} WHERE id = ${runId}::uuid`);
    });
    await db.execute(sql`UPDATE screening_runs SET status = 'done', finished_at = now() WHERE id = ${runId}::uuid`);
  } catch (err) {
    logger.warn({ err, riverId }, 'screening run failed');
    await db.execute(sql`UPDATE screening_runs SET status = 'failed', error = ${(err as Error).message}, finished_at = now() WHERE id = ${runId}::uuid`);
  }
}

async function newRun(db: Database, riverId: string): Promise<string> {
  const res = await db.execute<{ id: string }>(sql`INSERT INTO screening_runs (river_id, status) VALUES (${riverId}::uuid, 'queued') RETURNING id`);
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

/** pg-boss queue and worker (npm start). */
export async function createPgBossScreeningJobs(databaseUrl: string, db: Database, screening: ScreeningService, options: { work: boolean }): Promise<ScreeningJobs> {
  const boss = new PgBoss({ connectionString: databaseUrl, max: 4 });
  boss.on('error', (err) => logger.error({ err }, 'pg-boss error'));
  await boss.start();
  await boss.createQueue(QUEUE);
  if (options.work) {
    await boss.work<{ riverId: string; runId: string }>(QUEUE, { batchSize: 1 }, async ([job]) => {
      await runTracked(db, screening, job.data.runId, job.data.riverId);
    });
  }
  return {
    async enqueueRiver(riverId) {
      const runId = await newRun(db, riverId);
      await boss.send(QUEUE, { riverId, runId }, { retryLimit: 2, retryDelay: 10 });
      return runId;
    },
    async enqueueLeases(leaseIds) {
      for (const riverId of await screening.riversForLeases(leaseIds)) {
        const runId = await newRun(db, riverId);
        await boss.send(QUEUE, { riverId, runId }, { retryLimit: 2, retryDelay: 10 });
      }
    },
    async stop() {
      await boss.stop({ graceful: true, timeout: 5000 });
    },
  };
}
