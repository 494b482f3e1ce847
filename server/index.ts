/**
 * The only file that opens ports: the local fakes (when START_FAKES is not "false"),
 * then the app. Ctrl-C / SIGTERM closes everything cleanly.
 */
import type { Server } from 'node:http';
import { createApp } from './app';
import { createDb } from './db/client';
import { loadEnv, uploadLimitsFromEnv } from './env';
import { startSmtpFake, type SmtpFake } from './fakes/smtp-fake';
import { logger } from './lib/logger';
import { createMailer } from './mail/mailer';
import { createPgBossScreeningJobs } from './jobs/screening-jobs';
import { createScreeningService } from './services/screening.service';

async function main() {
  let env: ReturnType<typeof loadEnv>;
  try {
    env = loadEnv();
  } catch (err) {
    console.error(`[brackline] ${(err as Error).message}`);
    process.exit(2);
  }
  const dbHandle = createDb(env.DATABASE_URL);
  const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
  let smtp: SmtpFake | undefined;
  if (process.env.START_FAKES !== 'false') {
    try {
      smtp = await startSmtpFake(dbHandle.db, env.SMTP_FAKE_PORT);
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      console.error(
        code === 'EADDRINUSE'
          ? `[brackline] Port ${env.SMTP_FAKE_PORT} (the local e-mail fake) is in use. Is Brackline already running? Stop it, or set SMTP_FAKE_PORT and SMTP_URL to another port.`
          : `[brackline] The local e-mail fake could not start: ${(err as Error).message}`,
      );
      process.exit(1);
    }
  }
  // Screening runs in pg-boss workers on the same PostgreSQL (WORKERS=false leaves it to other processes).
  const jobs = await createPgBossScreeningJobs(env.DATABASE_URL, dbHandle.db, createScreeningService({ db: dbHandle.db }), {
    work: process.env.WORKERS !== 'false',
  });
  const app = createApp({ env, db: dbHandle, mailer, uploadLimits: uploadLimitsFromEnv(), jobs });
  const server: Server = app.listen(env.PORT, env.HOST);
  server.on('error', (err: NodeJS.ErrnoException) => {
    console.error(
      err.code === 'EADDRINUSE'
        ? `[brackline] Port ${env.PORT} on ${env.HOST} is in use. Is Brackline already running? Stop it, or choose another port with PORT, e.g. PORT=3100 npm start`
        : `[brackline] The server could not start: ${err.message}`,
    );
    process.exit(1);
  });
  server.on('listening', () => {
    logger.info({ url: `http://${env.HOST}:${env.PORT}` }, 'listening');
    console.log(`\n[brackline] Brackline is running at http://${env.HOST}:${env.PORT}`);
    if (smtp) console.log(`[brackline] Local e-mail fake on smtp://127.0.0.1:${smtp.port} (see Admin → Outbox)`);
  });

  let closing = false;
  const shutdown = (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`\n[brackline] ${signal}: shutting down…`);
    const force = setTimeout(() => process.exit(1), 10_000);
    force.unref();
    server.close(async () => {
      await jobs.stop().catch(() => undefined);
      await smtp?.stop();
      mailer.close();
      await dbHandle.pool.end();
      process.exit(0);
    });
    server.closeAllConnections();
  };
  process.on('SIGINT', () => shutdown('SIGINT'));
  process.on('SIGTERM', () => shutdown('SIGTERM'));
}

void main();
