/**
 * The only file that opens ports: the local fakes (when START_FAKES is not "false"),
 * then the app. Ctrl-C / SIGTERM closes everything cleanly.
 */
import type { Server } from 'node:http';
import { createApp } from './app';
import { createDb } from './db/client';
import { loadEnvOrExit, uploadLimitsFromEnv } from './env';
import { startSmtpFake, type SmtpFake } from './fakes/smtp-fake';
import { logger } from './lib/logger';
import { createMailer } from './mail/mailer';
import { startJobs } from './jobs/start-jobs';
import { createScreeningService } from './services/screening.service';
import { type GaugeFeed, startGaugeFeed } from './fakes/gauge-feed';
import { type PaymentFake, startPaymentFake } from './fakes/payment-fake';
import { upgradeStoredModel } from './services/model-upgrade.service';

async function main() {
  const env = loadEnvOrExit();
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
  // The payment fake and the gauge feed (paid alerts plan), each on its own loopback port.
  let payment: PaymentFake | undefined;
  let feed: GaugeFeed | undefined;
  if (process.env.START_FAKES !== 'false') {
    const started = async <T>(what: string, variable: string, port: number, start: () => Promise<T>): Promise<T> => {
      try {
        return await start();
      } catch (err) {
        const code = (err as NodeJS.ErrnoException).code;
        console.error(
          code === 'EADDRINUSE'
            ? `[brackline] Port ${port} (${what}) is in use. Is Brackline already running? Stop it, or set ${variable} to another port.`
            : `[brackline] ${what} could not start: ${(err as Error).message}`,
        );
        process.exit(1);
      }
    };
    payment = await started('the local payment fake', 'PAYMENT_FAKE_PORT and PAYMENT_API_URL', env.PAYMENT_FAKE_PORT, () =>
      startPaymentFake({
        port: env.PAYMENT_FAKE_PORT,
        secretKey: env.PAYMENT_SECRET_KEY,
        webhookSecret: env.PAYMENT_WEBHOOK_SECRET,
        webhookUrl: `http://${env.HOST}:${env.PORT}/api/v1/billing/webhook`,
      }),
    );
    feed = await started('the local gauge feed', 'GAUGE_FEED_PORT and GAUGE_FEED_URL', env.GAUGE_FEED_PORT, () =>
      startGaugeFeed({ port: env.GAUGE_FEED_PORT }),
    );
  }

  // Screening and alerts run in pg-boss workers on the same PostgreSQL (WORKERS=false leaves them to `npm run worker`).
  // Yearly figures stored before the yearly rating existed are worked out again from the stored screenings.
  const reannualised = await createScreeningService({ db: dbHandle.db }).annualiseMissing();
  if (reannualised) logger.info({ rivers: reannualised }, 'yearly figures re-computed for the yearly rating');
  const { jobs, alertJobs } = await startJobs(env, dbHandle, { work: env.WORKERS });
  // Stored results of an older model version are re-screened (and legacy river settings carried over) at start-up.
  const upgraded = await upgradeStoredModel(dbHandle.db, jobs);
  if (upgraded.queued.length)
    logger.info({ rivers: upgraded.queued.length, carried: upgraded.carried.length }, 're-screening results of an older model');
  const app = createApp({ env, db: dbHandle, mailer, uploadLimits: uploadLimitsFromEnv(), jobs, alertJobs });
  await app.locals.alertsReady;
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
    const address = server.address();
    const port = typeof address === 'object' && address ? address.port : env.PORT;
    logger.info({ url: `http://${env.HOST}:${port}`, workers: env.WORKERS }, 'listening');
    console.log(
      `\n[brackline] Brackline is running at http://${env.HOST}:${port} (NODE_ENV=${env.NODE_ENV})${env.WORKERS ? '' : ' (WORKERS=false: screening and alerts are left to npm run worker)'}`,
    );
    if (smtp) console.log(`[brackline] Local e-mail fake on smtp://127.0.0.1:${smtp.port} (see Admin → Outbox)`);
    if (payment) console.log(`[brackline] Local payment fake on ${payment.url} (test card 4242 4242 4242 4242)`);
    if (feed) console.log(`[brackline] Local gauge feed on ${feed.url} (polled every ${env.GAUGE_FEED_POLL_SECONDS} s)`);
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
      await alertJobs.stop().catch(() => undefined);
      await payment?.stop();
      await feed?.stop();
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
