/**
 * The pg-boss side of a process, as the environment asks: app processes (npm start) and worker
 * processes (npm run worker) build it the same way; WORKERS=false keeps an app process to sending jobs.
 */
import type { DbHandle } from '../db/client';
import type { Env } from '../env';
import { createScreeningService } from '../services/screening.service';
import { createPgBossAlertJobs } from './alert-jobs';
import { createPgBossScreeningJobs, defaultWorkerId } from './screening-jobs';

export async function startJobs(env: Env, dbHandle: DbHandle, options: { work: boolean }) {
  const workerId = env.WORKER_ID ?? defaultWorkerId();
  const jobs = await createPgBossScreeningJobs(env.DATABASE_URL, dbHandle, createScreeningService({ db: dbHandle.db }), {
    work: options.work,
    workerId,
    chunkLeases: env.SCREENING_CHUNK_LEASES,
    chunkExpireSeconds: env.SCREENING_CHUNK_EXPIRE_SECONDS,
    maintenanceSeconds: env.JOB_MAINTENANCE_SECONDS,
  });
  const alertJobs = await createPgBossAlertJobs(env.DATABASE_URL, dbHandle.pool, {
    retryDelaySeconds: env.ALERT_RETRY_DELAY_SECONDS,
    retryLimit: env.ALERT_RETRY_LIMIT,
    feedPollSeconds: env.GAUGE_FEED_POLL_SECONDS,
    work: options.work,
    pollFeed: true,
    maintenanceSeconds: env.JOB_MAINTENANCE_SECONDS,
  });
  return { jobs, alertJobs, workerId };
}
