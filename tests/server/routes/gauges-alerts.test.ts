/**
 * Gauges, readings and alerts over HTTP on the demo region: per-gauge tokens, JSON and CSV uploads,
 * lease rules (Alerts plan) and zone rules (regulators, free), one alert per crossing, the inbox and
 * the alert e-mail in the SMTP fake's outbox, forecasts, and the gauge feed poll.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { type GaugeFeed, startGaugeFeed } from '../../../server/fakes/gauge-feed';
import { createGaugesService } from '../../../server/services/gauges.service';
import { createInlineAlertJobs } from '../../../server/jobs/alert-jobs';
import { ALERT_CAUTIONS } from '../../../shared/schemas/alerts';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let grower: Agent;
let regulator: Agent;
let g01: string;
let token: string;
let amberlinId: string;
let fb001: string;

async function activatePlan(email: string) {
  // The plan is set up by the billing tests end to end; here the account row stands in for a paid subscription.
  const user = await t.db.pool.query('select id from users where email = $1', [email]);
  await t.db.pool.query(
    `insert into billing_accounts (user_id, customer_id, subscription_id, status) values ($1, $2, 'sub_test', 'active')
     on conflict (user_id) do update set status = 'active'`,
    [user.rows[0].id, `cus_${user.rows[0].id}`],
  );
}

const outboxFor = async (email: string) =>
  (
    await t.db.pool.query('select subject, text_body from outbox_messages where envelope_to @> $1::jsonb order by received_at', [
      JSON.stringify([email]),
    ])
  ).rows;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  await t.db.pool.query(
    `delete from alert_rules; delete from billing_accounts; delete from gauge_readings; delete from inbox_messages where kind = 'alert'; delete from outbox_messages`,
  );
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  const gauges = await grower.get('/api/v1/gauges').expect(200);
  g01 = gauges.body.items.find((g: { code: string }) => g.code === 'FCSA-G01').id;
  amberlinId = gauges.body.items.find((g: { code: string }) => g.code === 'FCSA-G01').riverId;
  fb001 = (await grower.get('/api/v1/leases?q=FB-001')).body.items[0].id;
  await activatePlan('grower@brackline.test');
}, 180_000);
afterAll(async () => {
  await t.close();
});

describe('gauges and readings', () => {
  it('lists the demo gauges with their rivers', async () => {
    const res = await grower.get('/api/v1/gauges').expect(200);
    expect(res.body.items.map((g: { code: string; riverName: string }) => `${g.code} ${g.riverName}`)).toEqual([
      'FCSA-G01 Amberlin River',
      'FCSA-G02 Tolley Brook',
    ]);
  });

  it('issues a per-gauge token (regulator) and refuses readings without it', async () => {
    await grower.post(`/api/v1/gauges/${g01}/token`).expect(403);
    token = (await regulator.post(`/api/v1/gauges/${g01}/token`).expect(201)).body.token;
    const body = { readings: [{ observedAt: '2030-01-01T00:00:00Z', discharge: 10 }] };
    const none = await grower.post(`/api/v1/gauges/${g01}/readings`).send(body).expect(401);
    expect(none.body.error.message).toMatch(/Authorization: Bearer/);
    await grower.post(`/api/v1/gauges/${g01}/readings`).set('Authorization', 'Bearer gauge_wrong').send(body).expect(401);
    const g02 = (await grower.get('/api/v1/gauges')).body.items.find((g: { code: string }) => g.code === 'FCSA-G02').id;
    await grower.post(`/api/v1/gauges/${g02}/readings`).set('Authorization', `Bearer ${token}`).send(body).expect(401);
  });

  it('stores JSON readings once, refuses bad ones with the field named', async () => {
    const body = { readings: [{ observedAt: '2030-01-01T00:00:00Z', discharge: 10 }] };
    const first = await grower.post(`/api/v1/gauges/${g01}/readings`).set('Authorization', `Bearer ${token}`).send(body).expect(201);
    expect(first.body).toEqual({ received: 1, stored: 1, duplicates: 0 });
    const again = await grower.post(`/api/v1/gauges/${g01}/readings`).set('Authorization', `Bearer ${token}`).send(body).expect(201);
    expect(again.body).toEqual({ received: 1, stored: 0, duplicates: 1 });
    const bad = await grower
      .post(`/api/v1/gauges/${g01}/readings`)
      .set('Authorization', `Bearer ${token}`)
      .send({ readings: [{ observedAt: 'yesterday', discharge: -1 }] })
      .expect(400);
    expect(bad.body.error.message).toMatch(/observedAt|discharge/);
  });

  it('takes a CSV upload in one transaction: one bad row stores nothing', async () => {
    const bad = 'observedAt,discharge\n2030-01-01T01:00:00Z,11\n2030-01-01T02:00:00Z,abc\n';
    const refused = await grower
      .post(`/api/v1/gauges/${g01}/readings`)
      .set('Authorization', `Bearer ${token}`)
      .set('Content-Type', 'text/csv')
      .send(bad)
      .expect(400);
    expect(refused.body.error.details.problems[0]).toMatch(/row 3/);
    const good = 'observedAt,discharge\n2030-01-01T01:00:00Z,11\n2030-01-01T02:00:00Z,12\n';
    const res = await grower
      .post(`/api/v1/gauges/${g01}/readings`)
      .set('Authorization', `Bearer ${token}`)
      .set('Content-Type', 'text/csv')
      .send(good)
      .expect(201);
    expect(res.body).toEqual({ received: 2, stored: 2, duplicates: 0 });
    const list = await grower.get(`/api/v1/gauges/${g01}/readings?limit=10`).expect(200);
    expect(list.body.items.map((r: { discharge: number; source: string }) => `${r.discharge} ${r.source}`)).toEqual([
      '12 csv',
      '11 csv',
      '10 token',
    ]);
  });
});

describe('alerts', () => {
  let rule: { id: string; thresholdFlow: number; bandName: string };

  it('a reading crossing the band-entry flow makes one alert: inbox and e-mail with flow, lease, band, meaning and cautions', async () => {
    rule = (
      await grower
        .post('/api/v1/alert-rules')
        .send({ kind: 'lease', leaseId: fb001, riverId: amberlinId, bandId: 'plume-edge' })
        .expect(201)
    ).body;
    const q = Math.round(rule.thresholdFlow * 1.2);
    const post = (time: string, discharge: number) =>
      grower
        .post(`/api/v1/gauges/${g01}/readings`)
        .set('Authorization', `Bearer ${token}`)
        .send({ readings: [{ observedAt: time, discharge }] })
        .expect(201);
    // The river first runs below the lease's flow (the readings above may already be over it), then crosses it.
    await post('2030-01-01T23:00:00Z', rule.thresholdFlow / 2);
    await post('2030-01-02T00:00:00Z', q);
    // Still above: the same event, no new alert. The same reading again: nothing.
    await post('2030-01-02T01:00:00Z', q + 5);
    await post('2030-01-02T00:00:00Z', q);
    const alerts = (await grower.get('/api/v1/alerts').expect(200)).body.items;
    expect(alerts).toHaveLength(1);
    expect(alerts[0]).toMatchObject({ level: 'enters', source: 'reading', discharge: q, emailStatus: 'sent', emailAttempts: 1 });
    const inbox = await t.db.pool.query(
      `select title, body, link from inbox_messages i join users u on u.id = i.user_id where u.email = 'grower@brackline.test' and kind = 'alert'`,
    );
    expect(inbox.rows).toHaveLength(1);
    expect(inbox.rows[0].link).toBe(`/leases/${fb001}`);
    const mail = await outboxFor('grower@brackline.test');
    expect(mail).toHaveLength(1);
    expect(mail[0].subject).toContain('FB-001');
    expect(mail[0].text_body).toContain(`read ${q} m³/s`);
    expect(mail[0].text_body).toContain('Lease: FB-001');
    expect(mail[0].text_body).toContain(`Band: ${rule.bandName}`);
    expect(mail[0].text_body).toMatch(/What it means: River water is predicted to reach the lease/);
    for (const c of ALERT_CAUTIONS) expect(mail[0].text_body).toContain(c);
    expect(mail[0].text_body).not.toMatch(/\bsafe\b/i);
  });

  it('falls below and rises again: a second event, a second alert', async () => {
    const post = (time: string, discharge: number) =>
      grower
        .post(`/api/v1/gauges/${g01}/readings`)
        .set('Authorization', `Bearer ${token}`)
        .send({ readings: [{ observedAt: time, discharge }] })
        .expect(201);
    await post('2030-01-03T00:00:00Z', rule.thresholdFlow / 2);
    await post('2030-01-03T01:00:00Z', rule.thresholdFlow * 1.5);
    expect((await grower.get('/api/v1/alerts')).body.items).toHaveLength(2);
  });

  it('a forecast flow the user types: below the flow nothing, at or above it one alert', async () => {
    const below = await grower
      .post(`/api/v1/alert-rules/${rule.id}/forecast`)
      .send({ discharge: rule.thresholdFlow * 0.5 })
      .expect(200);
    expect(below.body).toMatchObject({ reaches: false, alert: null });
    const above = await grower.post(`/api/v1/alert-rules/${rule.id}/forecast`).send({ discharge: 5000 }).expect(200);
    expect(above.body.reaches).toBe(true);
    expect(above.body.alert).toMatchObject({ source: 'forecast', emailStatus: 'sent' });
    expect(above.body.alert.body).toContain('A forecast flow of 5000 m³/s');
    await grower.post(`/api/v1/alert-rules/${rule.id}/forecast`).send({ discharge: 5000 }).expect(200);
    expect((await grower.get('/api/v1/alerts')).body.items).toHaveLength(3);
  });

  it('a rule for a band the lease never enters, or a lease the user cannot see, is refused', async () => {
    await grower
      .post('/api/v1/alert-rules')
      .send({ kind: 'lease', leaseId: fb001, riverId: amberlinId, bandId: 'no-such-band' })
      .expect(422);
    // grower2 cannot see FB-001 (another grower's lease).
    await activatePlan('grower2@brackline.test');
    const grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
    await grower2
      .post('/api/v1/alert-rules')
      .send({ kind: 'lease', leaseId: fb001, riverId: amberlinId, bandId: 'plume-edge' })
      .expect(404);
    await grower2.delete(`/api/v1/alert-rules/${rule.id}`).expect(404);
    await grower.delete(`/api/v1/alert-rules/${rule.id}`).expect(204);
    expect((await grower.get('/api/v1/alert-rules')).body.items).toHaveLength(0);
  });

  it('zone rules are free for regulators: approaching, then passing the trigger; growers cannot set them', async () => {
    const zone = await t.db.pool.query(
      `select id, name, trigger_flow from closure_zones z where z.gauge_id = $1 and trigger_flow is not null limit 1`,
      [g01],
    );
    const { id: zoneId, name, trigger_flow: trigger } = zone.rows[0];
    await grower.post('/api/v1/alert-rules').send({ kind: 'zone', zoneId }).expect(403);
    const listed = (await regulator.get('/api/v1/alert-rules/zones').expect(200)).body.items;
    expect(listed.find((z: { id: string }) => z.id === zoneId)).toMatchObject({ name, triggerFlow: trigger });
    await grower.get('/api/v1/alert-rules/zones').expect(403);
    const zr = await regulator.post('/api/v1/alert-rules').send({ kind: 'zone', zoneId, approachFraction: 0.8 }).expect(201);
    expect(zr.body).toMatchObject({ kind: 'zone', zoneName: name, thresholdFlow: trigger, approachFlow: trigger * 0.8 });
    const post = (time: string, discharge: number) =>
      grower
        .post(`/api/v1/gauges/${g01}/readings`)
        .set('Authorization', `Bearer ${token}`)
        .send({ readings: [{ observedAt: time, discharge }] })
        .expect(201);
    await post('2030-02-01T00:00:00Z', trigger * 0.1);
    await post('2030-02-01T01:00:00Z', trigger * 0.85);
    await post('2030-02-01T02:00:00Z', trigger * 1.1);
    const alerts = (await regulator.get('/api/v1/alerts').expect(200)).body.items;
    expect(alerts.map((a: { level: string }) => a.level)).toEqual(['passing', 'approaching']);
    const mail = await outboxFor('regulator@brackline.test');
    expect(mail.map((m) => m.subject)).toEqual([expect.stringMatching(/trigger approaching/), expect.stringMatching(/trigger passed/)]);
    expect(mail[1].text_body).toContain(`Closure zone: ${name}`);
  });

  it('rules and alerts are private to their owner', async () => {
    const mine = (await regulator.get('/api/v1/alert-rules').expect(200)).body.items;
    expect(mine.every((r: { kind: string }) => r.kind === 'zone')).toBe(true);
    await grower.delete(`/api/v1/alert-rules/${mine[0].id}`).expect(404);
    await grower.post(`/api/v1/alert-rules/${mine[0].id}/forecast`).send({ discharge: 10 }).expect(404);
  });
});

describe('the gauge feed', () => {
  let feed: GaugeFeed;
  beforeAll(async () => {
    // A day of record per day of wall clock, so two polls in a row see the same replayed day.
    feed = await startGaugeFeed({ port: 0, secondsPerDay: 86_400 });
  });
  afterAll(async () => {
    await feed.stop();
  });

  it('replays the demo flows; a poll stores one reading per gauge and a pushed reading', async () => {
    const gauges = createGaugesService({ db: t.db.db, jobs: createInlineAlertJobs(t.db.pool), feedUrl: feed.url });
    const latest = await (await fetch(`${feed.url}/readings/latest`)).json();
    expect(latest.readings.map((r: { code: string }) => r.code)).toEqual(['FCSA-G01', 'FCSA-G02']);
    const pushed = await fetch(`${feed.url}/_fake/readings`, {
      method: 'POST',
      headers: { 'Content-Type': 'application/json' },
      body: JSON.stringify({ code: 'FCSA-G02', discharge: 321 }),
    });
    expect(pushed.status).toBe(201);
    const stored = await gauges.pollFeed();
    expect(stored).toBeGreaterThanOrEqual(2);
    const feedRows = await t.db.pool.query(
      `select g.code, r.discharge from gauge_readings r join gauges g on g.id = r.gauge_id where r.source = 'feed'`,
    );
    expect(feedRows.rows.some((r) => r.code === 'FCSA-G02' && r.discharge === 321)).toBe(true);
    // A second poll in the same minute stores nothing new.
    expect(await gauges.pollFeed()).toBe(0);
  });
});
