/**
 * `npm run worker`: the pg-boss workers (screening runs and chunks, alert evaluation, alert e-mails,
 * the gauge feed poll) without an HTTP server. Run as many as the work needs, beside app processes
 * started with WORKERS=false, all on one PostgreSQL. SIGTERM / Ctrl-C finishes the jobs in hand, then exits.
 */
import { createApp } from './app';
import { createDb } from './db/client';
import { loadEnvOrExit, uploadLimitsFromEnv } from './env';
import { startJobs } from './jobs/start-jobs';
import { logger } from './lib/logger';
import { createMailer } from './mail/mailer';

async function main() {
  const env = loadEnvOrExit();
  const dbHandle = createDb(env.DATABASE_URL);
  const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
  let started: Awaited<ReturnType<typeof startJobs>>;
  try {
    started = await startJobs(env, dbHandle, { work: true });
  } catch (err) {
    console.error(`[brackline] The worker could not start its job queues: ${(err as Error).message}`);
    process.exit(1);
  }
  const { jobs, alertJobs, workerId } = started;
  // The alert handlers are wired to the same services the app builds; the app is built for that
  // and never listens, so a worker runs exactly the code an app process with workers on would.
  const app = createApp({
    env: { ...env, SERVE_CLIENT: false },
    db: dbHandle,
    mailer,
    uploadLimits: uploadLimitsFromEnv(),
    jobs,
    alertJobs,
  });
  await app.locals.alertsReady;
  logger.info({ workerId }, 'worker started');
  console.log(`[brackline] Worker ${workerId} is running (screening, alerts, gauge feed); no HTTP server.`);

  let closing = false;
  const shutdown = async (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`\n[brackline] ${signal}: worker ${workerId} finishing its jobs…`);
    const force = setTimeout(() => process.exit(1), 15_000);
    force.unref();
    await jobs.stop().catch(() => undefined);
    await alertJobs.stop().catch(() => undefined);
    mailer.close();
    await dbHandle.pool.end().catch(() => undefined);
    process.exit(0);
  };
  process.on('SIGINT', () => void shutdown('SIGINT'));
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
}

void main();
