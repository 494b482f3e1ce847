/**
 * The Alerts plan through the real `stripe` SDK against the local payment fake over HTTP: checkout
 * with the test cards, signed webhooks (forged, tampered and stale refused), each event processed
 * once, out-of-order events, and the plan gate on alert rules.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { PLAN_REQUIRED_MESSAGE } from '../../../server/services/billing.service';
import { createTestApp, signIn, TEST_PAYMENT_KEY, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let grower: Agent;
let grower2: Agent;
let adviser: Agent;
let amberlinId: string;
let fb001: string;

async function waitFor<T>(what: string, read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs = 15_000): Promise<T> {
  const started = Date.now();
  for (;;) {
    const v = await read();
    if (ok(v)) return v;
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}: last value ${JSON.stringify(v)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

const plan = async (agent: Agent) => (await agent.get('/api/v1/billing/subscription').expect(200)).body;

/** Starts checkout in the app, then pays on the fake's own checkout page as a browser would. */
async function payWith(agent: Agent, card: string) {
  const { url } = (await agent.post('/api/v1/billing/checkout').expect(200)).body;
  expect(url).toMatch(new RegExp(`^${t.payment.url}/checkout/cs_test_`));
  const pageHtml = await (await fetch(url)).text();
  expect(pageHtml).toContain('Card number');
  return fetch(`${url}/pay`, { method: 'POST', body: new URLSearchParams({ card }), redirect: 'manual' });
}

async function fakeApi<T>(path: string): Promise<T> {
  const res = await fetch(`${t.payment.url}${path}`, { headers: { Authorization: `Bearer ${TEST_PAYMENT_KEY}` } });
  return (await res.json()) as T;
}

const leaseRule = () => ({ kind: 'lease', leaseId: fb001, riverId: amberlinId, bandId: 'plume-edge' });

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  await t.db.pool.query('delete from alert_rules; delete from billing_accounts; delete from billing_events');
  await t.listen();
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  const rivers = await grower.get('/api/v1/rivers').expect(200);
  amberlinId = rivers.body.items.find((r: { name: string }) => r.name === 'Amberlin River').id;
  fb001 = (await grower.get('/api/v1/leases?q=FB-001')).body.items[0].id;
}, 180_000);
afterAll(async () => {
  await t.close();
});

describe('Alerts plan', () => {
  it('a free grower is refused alert rules with a 403 naming the Alerts plan', async () => {
    expect(await plan(grower)).toMatchObject({ plan: 'free', status: 'none', alertsAllowed: false });
    const res = await grower.post('/api/v1/alert-rules').send(leaseRule()).expect(403);
    expect(res.body.error.code).toBe('plan_required');
    expect(res.body.error.message).toBe(PLAN_REQUIRED_MESSAGE);
    expect(res.body.error.message).toMatch(/Alerts plan/);
  });

  it('the declined card leaves the grower on the Free plan', async () => {
    const res = await payWith(grower, '4000 0000 0000 0002');
    expect(res.status).toBe(402);
    expect(await res.text()).toContain('Your card was declined');
    const subs = await fakeApi<{ data: unknown[] }>('/v1/subscriptions');
    expect(subs.data).toHaveLength(0);
    expect(await plan(grower)).toMatchObject({ plan: 'free', alertsAllowed: false });
  });

  it('the good card → webhook → plan active → alert rules allowed', async () => {
    const res = await payWith(grower, '4242 4242 4242 4242');
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toMatch(/\/plan\?checkout=done&session_id=cs_test_/);
    const state = await waitFor(
      'the plan to become active',
      () => plan(grower),
      (p) => p.alertsAllowed,
    );
    expect(state).toMatchObject({ plan: 'alerts', status: 'active', cancelAtPeriodEnd: false });
    expect(new Date(state.currentPeriodEnd).getTime()).toBeGreaterThan(Date.now());
    const rule = await grower.post('/api/v1/alert-rules').send(leaseRule()).expect(201);
    expect(rule.body).toMatchObject({ kind: 'lease', leaseCode: 'FB-001', bandId: 'plume-edge', riverName: 'Amberlin River' });
    expect(rule.body.thresholdFlow).toBeGreaterThan(0);
    // Paying again is refused while the plan is active.
    await grower.post('/api/v1/billing/checkout').expect(409);
  });

  it('the billing page (portal) is the fake’s, for the grower’s own customer', async () => {
    const { url } = (await grower.post('/api/v1/billing/portal').expect(200)).body;
    expect(url).toMatch(new RegExp(`^${t.payment.url}/portal/`));
    expect(await (await fetch(url)).text()).toContain('Cancel at the end of the period');
    await adviser.post('/api/v1/billing/portal').expect(422);
  });

  it('cancelling at the end of the period on the billing page keeps alerts until then; keeping the plan undoes it', async () => {
    const { url } = (await grower.post('/api/v1/billing/portal').expect(200)).body;
    const sub = (await fakeApi<{ data: { id: string }[] }>('/v1/subscriptions')).data[0];
    const act = (action: string) =>
      fetch(`${url}/subscriptions/${sub.id}`, { method: 'POST', body: new URLSearchParams({ action }), redirect: 'manual' });
    expect((await act('cancel-at-period-end')).status).toBe(303);
    const ending = await waitFor(
      'cancel at period end',
      () => plan(grower),
      (p) => p.cancelAtPeriodEnd,
    );
    expect(ending).toMatchObject({ plan: 'alerts', status: 'active', alertsAllowed: true });
    expect((await act('keep')).status).toBe(303);
    await waitFor(
      'the plan kept',
      () => plan(grower),
      (p) => !p.cancelAtPeriodEnd,
    );
  });

  it('refuses forged, tampered and stale webhooks', async () => {
    const base = await t.listen();
    const [event] = (await fakeApi<{ data: { id: string }[] }>('/v1/events?type=customer.subscription.created')).data;
    const payload = JSON.stringify(await fakeApi(`/v1/events/${event.id}`));
    const post = (body: string, signature?: string) =>
      fetch(`${base}/api/v1/billing/webhook`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', ...(signature ? { 'Stripe-Signature': signature } : {}) },
        body,
      });

    const unsigned = await post(payload);
    expect(unsigned.status).toBe(400);
    const forgedSig = `t=${Math.floor(Date.now() / 1000)},v1=${'0'.repeat(64)}`;
    const forged = await post(payload, forgedSig);
    expect(forged.status).toBe(400);
    expect((await forged.json()).error.code).toBe('invalid_signature');
    const tampered = await post(payload.replace('"active"', '"canceled"'), t.payment.sign(payload));
    expect(tampered.status).toBe(400);
    const stale = await post(payload, t.payment.sign(payload, Math.floor(Date.now() / 1000) - 3600));
    expect(stale.status).toBe(400);
    expect((await stale.json()).error.message).toMatch(/too old|tolerance/i);
    // The genuine one is accepted (and, already processed, changes nothing).
    const genuine = await post(payload, t.payment.sign(payload));
    expect(genuine.status).toBe(200);
    expect(await genuine.json()).toEqual({ received: true, duplicate: true });
  });

  it('the same event delivered five times makes one change', async () => {
    const sub = (await fakeApi<{ data: { id: string }[] }>('/v1/subscriptions')).data[0];
    // A failed renewal (the fake simulates it) → past_due; alerts stay on while the payment is retried.
    await fetch(`${t.payment.url}/_fake/subscriptions/${sub.id}/fail-renewal`, { method: 'POST' });
    await waitFor(
      'past_due',
      () => plan(grower),
      (p) => p.status === 'past_due',
    );
    const [event] = (await fakeApi<{ data: { id: string }[] }>('/v1/events?type=customer.subscription.updated')).data;
    for (let i = 0; i < 5; i++) {
      const res = await fetch(`${t.payment.url}/_fake/events/${event.id}/deliver`, { method: 'POST' });
      expect(res.status).toBe(200);
    }
    const processed = await t.db.pool.query('select count(*)::int as n from billing_events where id = $1', [event.id]);
    expect(processed.rows[0].n).toBe(1);
    const changes = await t.db.pool.query(
      `select count(*)::int as n from audit_entries where action = 'billing.subscription.synced' and subject_id = $1`,
      [event.id],
    );
    expect(changes.rows[0].n).toBe(1);
    expect(await plan(grower)).toMatchObject({ status: 'past_due', alertsAllowed: true });
  });

  it('events arriving out of order still end in the right state', async () => {
    await fetch(`${t.payment.url}/_fake/webhooks/hold`, { method: 'POST' });
    const paid = await payWith(grower2, '4242424242424242');
    expect(paid.status).toBe(303);
    const { url } = (await grower2.post('/api/v1/billing/portal').expect(200)).body;
    const sub = (await fakeApi<{ data: { id: string; customer: string }[] }>('/v1/subscriptions')).data[0];
    const portalId = url.split('/portal/')[1];
    const cancelled = await fetch(`${t.payment.url}/portal/${portalId}/subscriptions/${sub.id}`, {
      method: 'POST',
      body: new URLSearchParams({ action: 'cancel-now' }),
      redirect: 'manual',
    });
    expect(cancelled.status).toBe(303);
    // Nothing delivered yet: still free. Then the deletion arrives first and the creation last.
    expect(await plan(grower2)).toMatchObject({ plan: 'free' });
    const released = await (await fetch(`${t.payment.url}/_fake/webhooks/release?order=reverse`, { method: 'POST' })).json();
    expect(released.delivered.length).toBeGreaterThanOrEqual(3);
    const types = await t.db.pool.query('select type from billing_events where id = any($1::text[])', [released.delivered]);
    expect(types.rows.map((r) => r.type)).toEqual(
      expect.arrayContaining(['customer.subscription.created', 'customer.subscription.deleted', 'checkout.session.completed']),
    );
    expect(await plan(grower2)).toMatchObject({ plan: 'free', status: 'canceled', alertsAllowed: false });
    await grower2.post('/api/v1/alert-rules').send(leaseRule()).expect(403);
  });

  it('the webhook is public in the OpenAPI document and the billing routes are listed', async () => {
    const doc = (await request(t.app).get('/api/v1/openapi.json').expect(200)).body;
    expect(Object.keys(doc.paths)).toEqual(
      expect.arrayContaining([
        '/api/v1/billing/checkout',
        '/api/v1/billing/portal',
        '/api/v1/billing/subscription',
        '/api/v1/billing/webhook',
      ]),
    );
    // Open: no session; the payment service signs each event instead.
    expect(doc.paths['/api/v1/billing/webhook'].post.security).toEqual([]);
  });
});
