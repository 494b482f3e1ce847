/**
 * A real app on the real test database (TEST_DATABASE_URL, started by npm test), with the
 * SMTP fake on a free loopback port. supertest drives it over real HTTP.
 */
import { sql } from 'drizzle-orm';
import type { Express } from 'express';
import request from 'supertest';
import { createApp, type AppDeps } from '../../server/app';
import { createDb, type DbHandle } from '../../server/db/client';
import { runMigrations } from '../../server/db/migrate';
import { DEMO_PASSWORD, seedDemo } from '../../server/db/seed';
import { type Env, loadEnv } from '../../server/env';
import { type SmtpFake, startSmtpFake } from '../../server/fakes/smtp-fake';
import { type PaymentFake, startPaymentFake } from '../../server/fakes/payment-fake';
import { randomUUID } from 'node:crypto';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { createMailer, type Mailer } from '../../server/mail/mailer';

export { DEMO_PASSWORD };

export interface TestApp {
  app: Express;
  db: DbHandle;
  smtp: SmtpFake;
  mailer: Mailer;
  env: Env;
  /** The local payment fake on a free port (the app's PAYMENT_API_URL points at it). */
  payment: PaymentFake;
  /** Listens on a free loopback port (for the fake's webhooks) and returns the base URL. */
  listen(): Promise<string>;
  close(): Promise<void>;
}

export const TEST_WEBHOOK_SECRET = 'whsec_test_brackline_0123456789';
export const TEST_PAYMENT_KEY = 'sk_test_brackline_0123456789';

export function testDatabaseUrl(): string {
  const url = process.env.TEST_DATABASE_URL;
  if (!url) throw new Error('TEST_DATABASE_URL is not set: run the API tests through `npm test`, which starts the test database.');
  return url;
}

export async function createTestApp(overrides: Partial<Omit<AppDeps, 'env' | 'db' | 'mailer'>> & { envOverrides?: Record<string, string> } = {}): Promise<TestApp> {
  const url = testDatabaseUrl();
  await runMigrations(url);
  const db = createDb(url, 5);
  await seedDemo(db.db);
  const smtp = await startSmtpFake(db.db, 0);
  const payment = await startPaymentFake({ port: 0, secretKey: TEST_PAYMENT_KEY, webhookSecret: TEST_WEBHOOK_SECRET });
  const env = loadEnv({
    PAYMENT_API_URL: payment.url,
    PAYMENT_SECRET_KEY: TEST_PAYMENT_KEY,
    PAYMENT_WEBHOOK_SECRET: TEST_WEBHOOK_SECRET,
    NODE_ENV: 'test',
    DATABASE_URL: url,
    AUTH_SECRET: 'test-secret-test-secret-test-secret-0123',
    SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
    SERVE_CLIENT: 'false',
    ...overrides.envOverrides,
  });
  const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
  const { envOverrides: _ignored, ...deps } = overrides;
  const app = createApp({
    env,
    db,
    mailer,
    authRateLimit: { limit: 10_000, windowMs: 60_000 },
    accountRateLimit: { limit: 10_000, windowMs: 60_000 },
    // Each test app counts on its own (the counters are in the shared test database).
    rateLimitPrefix: `test-${randomUUID()}`,
    ...deps,
  });
  let server: Server | undefined;
  return {
    app,
    db,
    smtp,
    mailer,
    env,
    payment,
    async listen() {
      server ??= await new Promise<Server>((resolve) => {
        const s = app.listen(0, '127.0.0.1', () => resolve(s));
      });
      const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
      payment.setWebhookUrl(`${url}/api/v1/billing/webhook`);
      return url;
    },
    async close() {
      if (server) {
        server.closeAllConnections();
        await new Promise((r) => server!.close(r));
      }
      await payment.stop();
      mailer.close();
      await smtp.stop();
      await db.pool.end();
    },
  };
}

/** Signs in through Auth.js's own routes and returns an agent that carries the session cookie. */
export async function signIn(app: Express, email: string, password = DEMO_PASSWORD) {
  const agent = request.agent(app);
  const csrf = await agent.get('/auth/csrf').expect(200);
  const res = await agent
    .post('/auth/callback/credentials')
    .set('X-Auth-Return-Redirect', '1')
    .type('form')
    .send({ csrfToken: csrf.body.csrfToken, email, password });
  const url = new URL(res.body.url, 'http://x');
  return { agent, error: url.searchParams.get('error'), code: url.searchParams.get('code'), status: res.status };
}

/** Empties tables that tests fill, keeping the demo accounts. */
export async function clearMail(db: DbHandle): Promise<void> {
  await db.db.execute(sql`delete from outbox_messages`);
}

/** Waits for the SMTP fake to store a message for `to`. */
export async function waitForMail(db: DbHandle, to: string, timeoutMs = 5_000): Promise<{ subject: string | null; text: string | null }> {
  const started = Date.now();
  while (Date.now() - started < timeoutMs) {
    const rows = await db.pool.query(
      'select subject, text_body as text from outbox_messages where envelope_to @> $1::jsonb order by received_at desc limit 1',
      [JSON.stringify([to])],
    );
    if (rows.rows.length) return rows.rows[0];
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`No e-mail to ${to} arrived within ${timeoutMs} ms`);
}
