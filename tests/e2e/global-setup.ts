/**
 * Starts the real app for the browser tests: the built client and the API on a free loopback
 * port, against the e2e database (E2E_DATABASE_URL, migrated by npm test), with the SMTP fake.
 */
import type { Server } from 'node:http';
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

declare module 'vitest' {
  export interface ProvidedContext {
    baseUrl: string;
    e2eDatabaseUrl: string;
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
  const env = loadEnv({
    NODE_ENV: 'test',
    DATABASE_URL: url,
    AUTH_SECRET: 'e2e-secret-e2e-secret-e2e-secret-e2e-0123',
    SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
    SERVE_CLIENT: 'true',
  });
  const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
  const app = createApp({ env, db, mailer, authRateLimit: { limit: 10_000, windowMs: 60_000 } });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const port = (server.address() as AddressInfo).port;
  project.provide('baseUrl', `http://127.0.0.1:${port}`);
  project.provide('e2eDatabaseUrl', url);
  return async () => {
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    mailer.close();
    await smtp.stop();
    await db.pool.end();
  };
}
