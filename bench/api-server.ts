/**
 * The app for bench/api-bench.ts, in its own process so the load generator does not share its event loop:
 * started on 127.0.0.1 with the production pool size; prints its port on stdout, then serves until killed.
 */
import type { AddressInfo } from 'node:net';
import { createApp } from '../server/app';
import { createDb } from '../server/db/client';
import { loadEnv } from '../server/env';
import { createMailer } from '../server/mail/mailer';

const env = loadEnv({
  NODE_ENV: 'test',
  DATABASE_URL: process.env.DATABASE_URL!,
  AUTH_SECRET: process.env.BENCH_AUTH_SECRET!,
  SMTP_URL: 'smtp://127.0.0.1:9',
  RESULT_CACHE: process.env.RESULT_CACHE ?? 'true',
});
const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
// As in production: answers are not checked against their schemas (that check is for the tests).
const app = createApp({ env, db: createDb(env.DATABASE_URL), mailer, checkResponses: false });
const server = app.listen(0, '127.0.0.1', () => {
  console.log(`port ${(server.address() as AddressInfo).port}`);
});
