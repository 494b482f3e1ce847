/**
 * Starts the real app for the browser tests: the built client and the API on a free loopback
 * port, against the e2e database (E2E_DATABASE_URL, migrated by npm test), with the SMTP fake.
 */
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { TestProject } from 'vitest/node';
import { createApp } from '../../server/app';
import { createDb } from '../../server/db/client';
import { runMigrations } from '../../server/db/migrate';
import { seedDemo } from '../../server/db/seed';
import { seedDemoRegion } from '../../server/db/seed-demo-region';
import { loadEnv } from '../../server/env';
import { startSmtpFake } from '../../server/fakes/smtp-fake';
import { createMailer } from '../../server/mail/mailer';
import { startGaugeFeed } from '../../server/fakes/gauge-feed';
import { startPaymentFake } from '../../server/fakes/payment-fake';
import { createPgBossAlertJobs } from '../../server/jobs/alert-jobs';

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    e2eDatabaseUrl: string;
    /** The local payment fake and gauge feed (paid alerts plan). */
    paymentUrl: string;
    gaugeFeedUrl: string;
  }
}

export default async function setup(project: TestProject) {
  const url = process.env.E2E_DATABASE_URL;
  if (!url) throw new Error('E2E_DATABASE_URL is not set: run the browser tests through `npm test`.');
  await runMigrations(url);
  const db = createDb(url, 5);
  await seedDemo(db.db);
  // The Fennick Bay region (coast, rivers, flow records, scenarios, leases, screenings) for the report and map tests.
  await seedDemoRegion(db.db);
  const smtp = await startSmtpFake(db.db, 0);
  // The app listens first, so its own URL (APP_URL: checkout returns, e-mail links) is known.
  const server: Server = createServer();
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const port = (server.address() as AddressInfo).port;
  const payment = await startPaymentFake({
    port: 0,
    secretKey: 'sk_test_e2e_brackline',
    webhookSecret: 'whsec_e2e_brackline',
    webhookUrl: `http://127.0.0.1:${port}/api/v1/billing/webhook`,
  });
  const feed = await startGaugeFeed({ port: 0 });
  const env = loadEnv({
    NODE_ENV: 'test',
    DATABASE_URL: url,
    AUTH_SECRET: 'e2e-secret-e2e-secret-e2e-secret-e2e-0123',
    SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
    SERVE_CLIENT: 'true',
    APP_URL: `http://127.0.0.1:${port}`,
    PAYMENT_API_URL: payment.url,
    PAYMENT_SECRET_KEY: 'sk_test_e2e_brackline',
    PAYMENT_WEBHOOK_SECRET: 'whsec_e2e_brackline',
    GAUGE_FEED_URL: feed.url,
  });
  const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
  // Alerts run in real pg-boss workers; the gauge feed is polled every 2 s.
  const alertJobs = await createPgBossAlertJobs(url, db.pool, { retryDelaySeconds: 1, retryLimit: 10, feedPollSeconds: 2, work: true, pollFeed: true });
  const app = createApp({ env, db, mailer, authRateLimit: { limit: 10_000, windowMs: 60_000 }, accountRateLimit: { limit: 10_000, windowMs: 60_000 }, alertJobs });
  await app.locals.alertsReady;
  server.on('request', app);
  project.provide('baseUrl', `http://127.0.0.1:${port}`);
  project.provide('e2eDatabaseUrl', url);
  project.provide('paymentUrl', payment.url);
  project.provide('gaugeFeedUrl', feed.url);
  return async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    await alertJobs.stop();
    await payment.stop();
    await feed.stop();
    mailer.close();
    await smtp.stop();
    await db.pool.end();
  };
}
