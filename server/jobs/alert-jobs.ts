/**
 * Alert work in pg-boss queues on the app's PostgreSQL:
 *  - alerts-evaluate: new gauge readings → alerts (one per event per rule, by dedupe key) + inbox;
 *  - alerts-email:    one alert → its e-mail, retried with backoff while the mail server is down;
 *  - gauge-feed-poll: reads the gauge feed every GAUGE_FEED_POLL_SECONDS (one queued poll at a time).
 * Jobs are queued in the same transaction as the rows that cause them (pg-boss `db` option), so a
 * crash between the two loses nothing; handlers are idempotent, so a repeated job changes nothing.
 * Without pg-boss (API tests that do not need it) the inline runner does the same work right after commit.
 */
import type pg from 'pg';
import PgBoss from 'pg-boss';
import { logger } from '../lib/logger';
import { inTransaction } from './in-transaction';

export type AlertJob = { name: 'evaluate'; readingIds: string[] } | { name: 'email'; alertId: string };
export type Enqueue = (job: AlertJob) => Promise<void>;

export interface AlertHandlers {
  evaluate(readingIds: string[]): Promise<void>;
  /** `final` is true on the last try: the handler then records the e-mail as failed. */
  email(alertId: string, final: boolean): Promise<void>;
  pollFeed(): Promise<void>;
}

export interface AlertJobs {
  /** Runs fn in one transaction; what it enqueues commits with it (pg-boss) or runs right after commit (inline). */
  transaction<T>(fn: (client: pg.PoolClient, enqueue: Enqueue) => Promise<T>): Promise<T>;
  /** Registers the handlers (and, with pg-boss, starts the workers and the feed poll). */
  attach(handlers: AlertHandlers): Promise<void>;
  stop(): Promise<void>;
}

export interface AlertJobOptions {
  retryDelaySeconds: number;
  retryLimit: number;
  feedPollSeconds: number;
  /** Run workers in this process (WORKERS=false leaves them to other processes). */
  work: boolean;
  /** Poll the gauge feed (when a feed is configured). */
  pollFeed: boolean;
  /** How often pg-boss expires the jobs of dead workers (pg-boss's default when not given). */
  maintenanceSeconds?: number;
}

const Q_EVALUATE = 'alerts-evaluate';
const Q_EMAIL = 'alerts-email';
const Q_FEED = 'gauge-feed-poll';

/** Does the work at once after each commit; an e-mail that fails stays pending (tried once). */
export function createInlineAlertJobs(pool: pg.Pool): AlertJobs {
  let handlers: AlertHandlers | null = null;
  const jobs: AlertJobs = {
    async transaction(fn) {
      const queued: AlertJob[] = [];
      const result = await inTransaction(pool, (client) => fn(client, async (job) => void queued.push(job)));
      for (const job of queued) {
        if (!handlers) continue;
        if (job.name === 'evaluate') await handlers.evaluate(job.readingIds);
        else
          await handlers
            .email(job.alertId, false)
            .catch((err) => logger.warn({ err, alertId: job.alertId }, 'alert e-mail not sent (inline runner, left pending)'));
      }
      return result;
    },
    async attach(h) {
      handlers = h;
    },
    async stop() {},
  };
  return jobs;
}

/** pg-boss queues and workers (npm start, and the tests that need real retries). */
export async function createPgBossAlertJobs(
  databaseUrl: string,
  pool: pg.Pool,
  options: AlertJobOptions,
): Promise<AlertJobs & { boss: PgBoss }> {
  const boss = new PgBoss({
    connectionString: databaseUrl,
    max: 4,
    ...(options.maintenanceSeconds ? { maintenanceIntervalSeconds: options.maintenanceSeconds } : {}),
  });
  boss.on('error', (err) => logger.error({ err }, 'pg-boss error'));
  await boss.start();
  const retry = { retryLimit: options.retryLimit, retryDelay: options.retryDelaySeconds, retryBackoff: true };
  await boss.createQueue(Q_EVALUATE, { name: Q_EVALUATE, ...retry });
  await boss.createQueue(Q_EMAIL, { name: Q_EMAIL, ...retry });
  // 'stately': at most one poll queued and one running, however many app servers start it.
  await boss.createQueue(Q_FEED, { name: Q_FEED, policy: 'stately', retryLimit: 0 });

  const schedulePoll = () =>
    boss
      .send(Q_FEED, {}, { startAfter: options.feedPollSeconds, singletonKey: 'feed' })
      .catch((err) => logger.warn({ err }, 'could not schedule the next gauge feed poll'));

  return {
    boss,
    async transaction(fn) {
      return inTransaction(pool, (client) =>
        fn(client, async (job) => {
          const db = { executeSql: (text: string, values: unknown[]) => client.query(text, values) };
          if (job.name === 'evaluate') await boss.send(Q_EVALUATE, { readingIds: job.readingIds }, { ...retry, db });
          else await boss.send(Q_EMAIL, { alertId: job.alertId }, { ...retry, db });
        }),
      );
    },
    async attach(handlers) {
      if (!options.work) return;
      await boss.work<{ readingIds: string[] }>(Q_EVALUATE, { pollingIntervalSeconds: 1 }, async ([job]) =>
        handlers.evaluate(job.data.readingIds),
      );
      // Batches, so a backlog clears quickly once the mail server is back; each e-mail succeeds or fails
      // (and is retried with backoff) on its own: failed ones are marked failed, the rest complete.
      for (let i = 0; i < 2; i++) {
        await boss.work<{ alertId: string }>(
          Q_EMAIL,
          { pollingIntervalSeconds: 1, batchSize: 25, includeMetadata: true },
          async (batch) => {
            const results = await Promise.allSettled(
              batch.map((job) => handlers.email(job.data.alertId, job.retryCount >= job.retryLimit)),
            );
            await Promise.all(
              results.map((r, k) =>
                r.status === 'rejected'
                  ? boss.fail(Q_EMAIL, batch[k].id, { message: String((r.reason as Error)?.message ?? r.reason) })
                  : undefined,
              ),
            );
          },
        );
      }
      if (options.pollFeed) {
        await boss.work(Q_FEED, { pollingIntervalSeconds: 1 }, async () => {
          try {
            await handlers.pollFeed();
          } catch (err) {
            logger.warn({ err }, 'gauge feed poll failed; trying again at the next poll');
          } finally {
            await schedulePoll();
          }
        });
        await boss.send(Q_FEED, {}, { singletonKey: 'feed' });
      }
    },
    async stop() {
      await boss.stop({ graceful: true, timeout: 5000, wait: true });
    },
  };
}
