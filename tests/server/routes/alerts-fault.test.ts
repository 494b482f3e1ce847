/**
 * Fault test with real pg-boss on the test database: the SMTP fake is stopped, readings that make
 * 100 alerts arrive, the app (and its pg-boss) is closed and started again while mail is still down,
 * then the SMTP fake comes back → every alert is e-mailed exactly once (counted in the outbox).
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../../server/app';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { startSmtpFake } from '../../../server/fakes/smtp-fake';
import { type AlertJobs, createPgBossAlertJobs } from '../../../server/jobs/alert-jobs';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

const ALERTS = 100;
let t: TestApp;
let token: string;
let g01: string;
let threshold: number;

async function waitFor<T>(what: string, read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs: number): Promise<T> {
  const started = Date.now();
  for (;;) {
    const v = await read();
    if (ok(v)) return v;
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}: last value ${JSON.stringify(v)}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

/** A fresh app with its own pg-boss (workers on), as npm start builds it. */
async function startApp(): Promise<{ app: ReturnType<typeof createApp>; jobs: AlertJobs }> {
  const jobs = await createPgBossAlertJobs(t.env.DATABASE_URL, t.db.pool, {
    retryDelaySeconds: 1,
    retryLimit: 40,
    feedPollSeconds: 60,
    work: true,
    pollFeed: false,
  });
  const app = createApp({ env: t.env, db: t.db, mailer: t.mailer, authRateLimit: { limit: 10_000, windowMs: 60_000 }, accountRateLimit: { limit: 10_000, windowMs: 60_000 }, alertJobs: jobs });
  await app.locals.alertsReady;
  return { app, jobs };
}

const count = async (q: string, params: unknown[] = []) => (await t.db.pool.query(q, params)).rows[0].n as number;
const outboxCount = () => count(`select count(*)::int as n from outbox_messages where envelope_to @> '["grower@brackline.test"]'::jsonb`);

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  await t.db.pool.query(
    `delete from alert_rules; delete from gauge_readings; delete from inbox_messages where kind = 'alert'; delete from outbox_messages`,
  );
  await t.db.pool.query(`delete from pgboss.job where name like 'alerts-%'`).catch(() => undefined);
  const user = await t.db.pool.query(`select id from users where email = 'grower@brackline.test'`);
  await t.db.pool.query(
    `insert into billing_accounts (user_id, customer_id, subscription_id, status) values ($1, 'cus_fault_test', 'sub_fault_test', 'active')
     on conflict (user_id) do update set status = 'active'`,
    [user.rows[0].id],
  );
  const grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  const regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  const gauge = (await grower.get('/api/v1/gauges')).body.items.find((g: { code: string }) => g.code === 'FCSA-G01');
  g01 = gauge.id;
  token = (await regulator.post(`/api/v1/gauges/${g01}/token`).expect(201)).body.token;
  const fb001 = (await grower.get('/api/v1/leases?q=FB-001')).body.items[0].id;
  const rule = await grower
    .post('/api/v1/alert-rules')
    .send({ kind: 'lease', leaseId: fb001, riverId: gauge.riverId, bandId: 'plume-edge' })
    .expect(201);
  threshold = rule.body.thresholdFlow;
}, 180_000);
afterAll(async () => {
  await t.close();
});

describe('alert e-mails survive a mail outage and an app restart', () => {
  it(`delivers all ${ALERTS} alerts exactly once`, async () => {
    const smtpPort = t.smtp.port;
    await t.smtp.stop();

    // 1. Mail is down. Readings go up and down 100 times: 100 crossings, 100 alerts.
    let first = await startApp();
    const readings = Array.from({ length: ALERTS * 2 }, (_, i) => ({
      observedAt: new Date(Date.UTC(2031, 0, 1) + i * 3600_000).toISOString(),
      discharge: i % 2 === 0 ? threshold / 4 : threshold * 2,
    }));
    const posted = await request(first.app)
      .post(`/api/v1/gauges/${g01}/readings`)
      .set('Authorization', `Bearer ${token}`)
      .send({ readings })
      .expect(201);
    expect(posted.body.stored).toBe(ALERTS * 2);
    await waitFor(
      '100 alerts, each tried at least once',
      () => count(`select count(*)::int as n from alerts where email_attempts >= 1`),
      (n) => n === ALERTS,
      60_000,
    );
    expect(await count(`select count(*)::int as n from alerts`)).toBe(ALERTS);
    expect(await count(`select count(*)::int as n from inbox_messages where kind = 'alert'`)).toBe(ALERTS);
    expect(await outboxCount()).toBe(0);

    // The user sees the delivery state: pending, with the mail server's error.
    const grower = (await signIn(first.app, 'grower@brackline.test')).agent;
    const shown = (await grower.get('/api/v1/alerts').expect(200)).body.items;
    expect(shown).toHaveLength(ALERTS);
    expect(
      shown.every(
        (a: { emailStatus: string; emailLastError: string | null }) =>
          a.emailStatus === 'pending' && /mail server/.test(a.emailLastError ?? ''),
      ),
    ).toBe(true);

    // 2. The app restarts while mail is still down (close the app and its pg-boss, start new ones).
    await first.jobs.stop();
    first = await startApp();

    // 3. Mail comes back on the same port: the retries deliver every alert.
    const smtp = await startSmtpFake(t.db.db, smtpPort);
    try {
      await waitFor(
        'every alert e-mailed',
        () => count(`select count(*)::int as n from alerts where email_status = 'sent'`),
        (n) => n === ALERTS,
        180_000,
      );
      // Nothing left queued or running, so the outbox count is final.
      await waitFor(
        'the e-mail queue to drain',
        () => count(`select count(*)::int as n from pgboss.job where name = 'alerts-email' and state in ('created', 'retry', 'active')`),
        (n) => n === 0,
        30_000,
      );
      expect(await outboxCount()).toBe(ALERTS);
      const bodies = await t.db.pool.query(
        `select distinct text_body from outbox_messages where envelope_to @> '["grower@brackline.test"]'::jsonb`,
      );
      expect(bodies.rows).toHaveLength(ALERTS);
      expect(await count(`select count(*)::int as n from alerts where email_status = 'sent' and email_attempts >= 2`)).toBe(ALERTS);
    } finally {
      await first.jobs.stop();
      await smtp.stop();
    }
  }, 300_000);
});
