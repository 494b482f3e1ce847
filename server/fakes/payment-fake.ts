/**
 * The local payment fake: a small HTTP service on loopback that answers the part of the payment
 * API Brackline calls through the official `stripe` SDK (pointed here with the SDK's host, port and
 * protocol options), with its own checkout and billing pages and signed webhooks to the app.
 * Moving to the hosted service is a configuration change only (PAYMENT_API_URL and the keys).
 *
 * Test cards: 4242 4242 4242 4242 is accepted; 4000 0000 0000 0002 is declined.
 * Fake-only controls live under /_fake (fail a renewal, re-deliver an event, hold webhooks).
 * State is in memory: restarting the fake forgets customers and subscriptions (development and tests only).
 */
import { createHmac, randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type NextFunction, type Request, type Response } from 'express';
import { logger } from '../lib/logger';

export const GOOD_CARD = '4242424242424242';
export const DECLINED_CARD = '4000000000000002';

type Obj = Record<string, unknown> & { id: string; object: string };

interface FakeEvent extends Obj {
  type: string;
  created: number;
  data: { object: Obj };
}

export interface PaymentFakeOptions {
  port: number;
  host?: string;
  secretKey: string;
  webhookSecret: string;
  /** Where events are POSTed (the app's /api/v1/billing/webhook); may be set later with setWebhookUrl. */
  webhookUrl?: string;
}

export interface PaymentFake {
  port: number;
  url: string;
  setWebhookUrl(url: string): void;
  /** Signs a payload as the fake does (tests use it to forge, tamper and replay). */
  sign(payload: string, timestamp?: number): string;
  stop(): Promise<void>;
}

const now = () => Math.floor(Date.now() / 1000);
const newId = (prefix: string) => `${prefix}_${randomBytes(12).toString('hex')}`;
const MONTH = 30 * 24 * 3600;

function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(title)}</title>
<meta name="viewport" content="width=device-width,initial-scale=1">
<style>
body{font-family:system-ui,sans-serif;background:#f3f1ec;color:#1d2a30;margin:0}
main{max-width:30rem;margin:3rem auto;background:#fff;border:1px solid #d9d4c7;border-radius:10px;padding:2rem}
h1{font-size:1.35rem;margin:0 0 .25rem} .sub{color:#51606a;margin:0 0 1.5rem}
label{display:block;font-weight:600;margin:.75rem 0 .25rem} input{font-size:1.05rem;padding:.5rem;width:100%;box-sizing:border-box;border:1px solid #9aa5ab;border-radius:6px}
button{margin-top:1.25rem;font-size:1rem;font-weight:600;padding:.6rem 1.2rem;border-radius:6px;border:0;background:#1f4e5f;color:#fff;cursor:pointer}
button.secondary{background:#fff;color:#1f4e5f;border:1px solid #1f4e5f}
.err{background:#fbeee6;border-left:4px solid #c26a3d;padding:.6rem .8rem;margin:1rem 0} .hint{font-size:.85rem;color:#51606a}
.badge{display:inline-block;font-size:.75rem;background:#fff3c4;border:1px solid #d8b84a;border-radius:4px;padding:.1rem .4rem;margin-bottom:1rem}
</style></head><body><main><span class="badge">Test payment service (local fake)</span>${body}</main></body></html>`;
}

export async function startPaymentFake(options: PaymentFakeOptions): Promise<PaymentFake> {
  const host = options.host ?? '127.0.0.1';
  let webhookUrl = options.webhookUrl;
  let holding = false;
  const held: FakeEvent[] = [];

  const customers = new Map<string, Obj>();
  const products = new Map<string, Obj>();
  const prices = new Map<string, Obj>();
  const sessions = new Map<string, Obj>();
  const subscriptions = new Map<string, Obj>();
  const portalSessions = new Map<string, Obj>();
  const events = new Map<string, FakeEvent>();
  let baseUrl = '';

  const sign = (payload: string, timestamp = now()) => {
    const v1 = createHmac('sha256', options.webhookSecret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
    return `t=${timestamp},v1=${v1}`;
  };

  async function deliver(event: FakeEvent): Promise<void> {
    if (!webhookUrl) return;
    const payload = JSON.stringify(event, null, 2);
    // Like the hosted service: retried with backoff until the app answers 2xx (a few tries here).
    for (let attempt = 0; attempt < 5; attempt++) {
      try {
        const res = await fetch(webhookUrl, {
          method: 'POST',
          headers: { 'Content-Type': 'application/json', 'Stripe-Signature': sign(payload) },
          body: payload,
        });
        if (res.ok) return;
        logger.warn({ status: res.status, event: event.id }, 'payment fake: webhook refused');
      } catch (err) {
        logger.warn({ err, event: event.id }, 'payment fake: webhook not delivered');
      }
      await new Promise((r) => setTimeout(r, 200 * 2 ** attempt));
    }
  }

  function emit(type: string, object: Obj): FakeEvent {
    const event: FakeEvent = {
      id: newId('evt'),
      object: 'event',
      api_version: '2026-10-28.endive',
      created: now(),
      livemode: false,
      pending_webhooks: 1,
      type,
      data: { object: structuredClone(object) },
    };
    events.set(event.id, event);
    if (holding) held.push(event);
    else void deliver(event);
    return event;
  }

  function list(req: Request, items: Obj[], url: string) {
    const limit = Math.min(100, Number(req.query.limit ?? 10) || 10);
    return { object: 'list', data: items.slice(0, limit), has_more: items.length > limit, url };
  }

  function apiError(res: Response, status: number, message: string, type = 'invalid_request_error', extra: Record<string, unknown> = {}) {
    res.status(status).json({ error: { type, message, ...extra } });
  }

  function subscriptionFor(customer: string, price: Obj, metadata: Record<string, unknown>): Obj {
    const start = now();
    const sub: Obj = {
      id: newId('sub'),
      object: 'subscription',
      customer,
      status: 'active',
      cancel_at_period_end: false,
      cancel_at: null,
      canceled_at: null,
      created: start,
      start_date: start,
      livemode: false,
      metadata,
      items: {
        object: 'list',
        data: [
          {
            id: newId('si'),
            object: 'subscription_item',
            price,
            quantity: 1,
            current_period_start: start,
            current_period_end: start + MONTH,
          },
        ],
        has_more: false,
      },
    };
    subscriptions.set(sub.id, sub);
    return sub;
  }

  function periodEnd(sub: Obj): number {
    return ((sub.items as { data: { current_period_end: number }[] }).data[0]?.current_period_end as number) ?? now();
  }

  const app = express();
  app.set('query parser', 'extended');
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: true }));

  // ---- The API (/v1), as the SDK calls it: Bearer secret key, form-encoded bodies, JSON answers.
  const api = express.Router();
  api.use((req, res, next) => {
    const auth = req.header('authorization') ?? '';
    if (auth !== `Bearer ${options.secretKey}`) return apiError(res, 401, 'Invalid API Key provided.');
    next();
  });

  api.post('/customers', (req, res) => {
    const c: Obj = {
      id: newId('cus'),
      object: 'customer',
      created: now(),
      email: req.body.email ?? null,
      name: req.body.name ?? null,
      metadata: req.body.metadata ?? {},
      livemode: false,
    };
    customers.set(c.id, c);
    res.json(c);
  });
  api.get('/customers/:id', (req, res) => {
    const c = customers.get(req.params.id);
    if (!c) return apiError(res, 404, `No such customer: '${req.params.id}'`, 'invalid_request_error', { code: 'resource_missing' });
    res.json(c);
  });

  api.post('/products', (req, res) => {
    const p: Obj = {
      id: newId('prod'),
      object: 'product',
      name: req.body.name,
      active: true,
      created: now(),
      metadata: req.body.metadata ?? {},
    };
    products.set(p.id, p);
    res.json(p);
  });
  api.post('/prices', (req, res) => {
    const product = req.body.product ?? (req.body.product_data ? { id: newId('prod'), name: req.body.product_data.name } : null);
    const productId = typeof product === 'string' ? product : product?.id;
    if (!productId) return apiError(res, 400, 'Missing required param: product.');
    const recurring = req.body.recurring ? { interval: req.body.recurring.interval ?? 'month', interval_count: 1 } : null;
    const price: Obj = {
      id: newId('price'),
      object: 'price',
      active: true,
      currency: req.body.currency ?? 'aud',
      unit_amount: Number(req.body.unit_amount ?? 0),
      lookup_key: req.body.lookup_key ?? null,
      product: productId,
      recurring,
      type: recurring ? 'recurring' : 'one_time',
      created: now(),
    };
    prices.set(price.id, price);
    res.json(price);
  });
  api.get('/prices', (req, res) => {
    const keys = ([] as unknown[]).concat(req.query.lookup_keys ?? []).map(String);
    const items = [...prices.values()].filter((p) => keys.length === 0 || keys.includes(String(p.lookup_key)));
    res.json(list(req, items, '/v1/prices'));
  });

  api.post('/checkout/sessions', (req, res) => {
    const b = req.body;
    const priceId = b.line_items?.[0]?.price;
    const price = prices.get(priceId);
    if (!price) return apiError(res, 400, `No such price: '${priceId}'`, 'invalid_request_error', { param: 'line_items[0][price]' });
    if (b.customer && !customers.has(b.customer))
      return apiError(res, 400, `No such customer: '${b.customer}'`, 'invalid_request_error', { param: 'customer' });
    if (!b.success_url)
      return apiError(res, 400, 'Missing required param: success_url.', 'invalid_request_error', { param: 'success_url' });
    const id = newId('cs_test');
    const s: Obj = {
      id,
      object: 'checkout.session',
      mode: b.mode ?? 'subscription',
      status: 'open',
      payment_status: 'unpaid',
      customer: b.customer ?? null,
      client_reference_id: b.client_reference_id ?? null,
      metadata: b.metadata ?? {},
      success_url: b.success_url,
      cancel_url: b.cancel_url ?? null,
      subscription: null,
      price: priceId,
      amount_total: price.unit_amount,
      currency: price.currency,
      url: `${baseUrl}/checkout/${id}`,
      created: now(),
      expires_at: now() + 24 * 3600,
    };
    sessions.set(id, s);
    res.json(s);
  });
  api.get('/checkout/sessions/:id', (req, res) => {
    const s = sessions.get(req.params.id);
    if (!s)
      return apiError(res, 404, `No such checkout.session: '${req.params.id}'`, 'invalid_request_error', { code: 'resource_missing' });
    res.json(s);
  });

  api.get('/subscriptions', (req, res) => {
    const items = [...subscriptions.values()].filter((s) => !req.query.customer || s.customer === req.query.customer).reverse();
    res.json(list(req, items, '/v1/subscriptions'));
  });
  api.get('/subscriptions/:id', (req, res) => {
    const s = subscriptions.get(req.params.id);
    if (!s) return apiError(res, 404, `No such subscription: '${req.params.id}'`, 'invalid_request_error', { code: 'resource_missing' });
    res.json(s);
  });
  api.post('/subscriptions/:id', (req, res) => {
    const s = subscriptions.get(req.params.id);
    if (!s) return apiError(res, 404, `No such subscription: '${req.params.id}'`, 'invalid_request_error', { code: 'resource_missing' });
    if (req.body.cancel_at_period_end !== undefined) {
      s.cancel_at_period_end = req.body.cancel_at_period_end === 'true';
      s.cancel_at = s.cancel_at_period_end ? periodEnd(s) : null;
    }
    emit('customer.subscription.updated', s);
    res.json(s);
  });
  api.delete('/subscriptions/:id', (req, res) => {
    const s = subscriptions.get(req.params.id);
    if (!s) return apiError(res, 404, `No such subscription: '${req.params.id}'`, 'invalid_request_error', { code: 'resource_missing' });
    s.status = 'canceled';
    s.canceled_at = now();
    emit('customer.subscription.deleted', s);
    res.json(s);
  });

  api.post('/billing_portal/sessions', (req, res) => {
    if (!customers.has(req.body.customer))
      return apiError(res, 400, `No such customer: '${req.body.customer}'`, 'invalid_request_error', { param: 'customer' });
    const id = newId('bps');
    const p: Obj = {
      id,
      object: 'billing_portal.session',
      customer: req.body.customer,
      return_url: req.body.return_url ?? null,
      url: `${baseUrl}/portal/${id}`,
      created: now(),
      livemode: false,
    };
    portalSessions.set(id, p);
    res.json(p);
  });

  api.get('/events/:id', (req, res) => {
    const e = events.get(req.params.id);
    if (!e) return apiError(res, 404, `No such event: '${req.params.id}'`, 'invalid_request_error', { code: 'resource_missing' });
    res.json(e);
  });
  api.get('/events', (req, res) => {
    const items = [...events.values()].filter((e) => !req.query.type || e.type === req.query.type).reverse();
    res.json(list(req, items, '/v1/events'));
  });
  api.use((req, res) =>
    apiError(
      res,
      404,
      `Unrecognized request URL (${req.method}: /v1${req.path}). The local payment fake implements only what Brackline calls.`,
    ),
  );
  app.use('/v1', api);

  // ---- The fake's own checkout page.
  const checkoutPage = (s: Obj, error?: string) => {
    const price = prices.get(String(s.price));
    const amount = price ? `${(Number(price.unit_amount) / 100).toFixed(2)} ${String(price.currency).toUpperCase()} a month` : '';
    return page(
      'Pay for the Alerts plan',
      `<h1>Brackline Alerts plan</h1><p class="sub">${escapeHtml(amount)}</p>
${error ? `<div class="err" role="alert">${escapeHtml(error)}</div>` : ''}
<form method="post" action="/checkout/${escapeHtml(s.id)}/pay">
<label for="card">Card number</label><input id="card" name="card" inputmode="numeric" autocomplete="off" required placeholder="4242 4242 4242 4242">
<label for="expiry">Expiry (MM/YY)</label><input id="expiry" name="expiry" value="12/34">
<label for="cvc">Security code</label><input id="cvc" name="cvc" value="123">
<p class="hint">Test cards: 4242 4242 4242 4242 is accepted, 4000 0000 0000 0002 is declined.</p>
<button type="submit">Pay and subscribe</button>
</form>
${s.cancel_url ? `<p><a href="${escapeHtml(String(s.cancel_url))}">Cancel and return to Brackline</a></p>` : ''}`,
    );
  };
  app.get('/checkout/:id', (req, res) => {
    const s = sessions.get(req.params.id);
    if (!s) return void res.status(404).send(page('Not found', '<h1>This checkout has expired or does not exist.</h1>'));
    if (s.status === 'complete') return res.redirect(303, String(s.success_url).replace('{CHECKOUT_SESSION_ID}', s.id));
    res.send(checkoutPage(s));
  });
  app.post('/checkout/:id/pay', (req, res) => {
    const s = sessions.get(req.params.id);
    if (!s) return void res.status(404).send(page('Not found', '<h1>This checkout has expired or does not exist.</h1>'));
    if (s.status === 'complete') return res.redirect(303, String(s.success_url).replace('{CHECKOUT_SESSION_ID}', s.id));
    const card = String(req.body.card ?? '').replace(/\D/g, '');
    if (card === DECLINED_CARD) return void res.status(402).send(checkoutPage(s, 'Your card was declined. Try another card.'));
    if (card !== GOOD_CARD)
      return void res
        .status(400)
        .send(
          checkoutPage(
            s,
            'This test service accepts only its test cards: 4242 4242 4242 4242 (accepted) or 4000 0000 0000 0002 (declined).',
          ),
        );
    let customer = s.customer as string | null;
    if (!customer) {
      const c: Obj = { id: newId('cus'), object: 'customer', created: now(), email: null, metadata: {}, livemode: false };
      customers.set(c.id, c);
      customer = c.id;
    }
    const sub = subscriptionFor(customer, prices.get(String(s.price))!, s.metadata as Record<string, unknown>);
    Object.assign(s, { status: 'complete', payment_status: 'paid', customer, subscription: sub.id });
    emit('customer.subscription.created', sub);
    emit('checkout.session.completed', s);
    emit('invoice.paid', {
      id: newId('in'),
      object: 'invoice',
      customer,
      subscription: sub.id,
      status: 'paid',
      amount_paid: s.amount_total,
      created: now(),
    });
    res.redirect(303, String(s.success_url).replace('{CHECKOUT_SESSION_ID}', s.id));
  });

  // ---- The fake's billing page (portal): cancel at period end, keep, or cancel now.
  app.get('/portal/:id', (req, res) => {
    const p = portalSessions.get(req.params.id);
    if (!p) return void res.status(404).send(page('Not found', '<h1>This billing page has expired.</h1>'));
    const subs = [...subscriptions.values()].filter((s) => s.customer === p.customer && s.status !== 'canceled');
    const rows = subs
      .map(
        (
          s,
        ) => `<p><strong>Alerts plan</strong>: ${escapeHtml(String(s.status))}${s.cancel_at_period_end ? `, ends ${new Date(periodEnd(s) * 1000).toISOString().slice(0, 10)}` : `, renews ${new Date(periodEnd(s) * 1000).toISOString().slice(0, 10)}`}</p>
<form method="post" action="/portal/${escapeHtml(p.id)}/subscriptions/${escapeHtml(s.id)}">
${s.cancel_at_period_end ? '<button name="action" value="keep">Keep the plan</button>' : '<button name="action" value="cancel-at-period-end">Cancel at the end of the period</button>'}
<button class="secondary" name="action" value="cancel-now">Cancel now</button></form>`,
      )
      .join('');
    res.send(
      page(
        'Billing',
        `<h1>Billing</h1>${rows || '<p>No active plan.</p>'}${p.return_url ? `<p><a href="${escapeHtml(String(p.return_url))}">Return to Brackline</a></p>` : ''}`,
      ),
    );
  });
  app.post('/portal/:id/subscriptions/:sub', (req, res) => {
    const p = portalSessions.get(req.params.id);
    const s = subscriptions.get(req.params.sub);
    if (!p || !s || s.customer !== p.customer) return void res.status(404).send(page('Not found', '<h1>Not found.</h1>'));
    if (req.body.action === 'cancel-now') {
      s.status = 'canceled';
      s.canceled_at = now();
      emit('customer.subscription.deleted', s);
    } else {
      s.cancel_at_period_end = req.body.action === 'cancel-at-period-end';
      s.cancel_at = s.cancel_at_period_end ? periodEnd(s) : null;
      emit('customer.subscription.updated', s);
    }
    res.redirect(303, `/portal/${p.id}`);
  });

  // ---- Fake-only controls (tests and demos).
  const fake = express.Router();
  fake.use(express.json());
  fake.post('/subscriptions/:id/fail-renewal', (req, res) => {
    const s = subscriptions.get(req.params.id);
    if (!s) return apiError(res, 404, 'No such subscription.');
    s.status = 'past_due';
    emit('invoice.payment_failed', {
      id: newId('in'),
      object: 'invoice',
      customer: s.customer,
      subscription: s.id,
      status: 'open',
      created: now(),
    });
    emit('customer.subscription.updated', s);
    res.json(s);
  });
  fake.post('/events/:id/deliver', async (req, res) => {
    const e = events.get(req.params.id);
    if (!e) return apiError(res, 404, 'No such event.');
    await deliver(e);
    res.json({ delivered: e.id });
  });
  fake.post('/webhooks/hold', (_req, res) => {
    holding = true;
    res.json({ holding });
  });
  /** Releases held events in the order asked ("reverse" for out-of-order delivery), one after another. */
  fake.post('/webhooks/release', async (req, res) => {
    holding = false;
    const batch = held.splice(0);
    if (req.query.order === 'reverse') batch.reverse();
    for (const e of batch) await deliver(e);
    res.json({ delivered: batch.map((e) => e.id) });
  });
  app.use('/_fake', fake);
  app.use((err: Error, _req: Request, res: Response, _next: NextFunction) => {
    logger.error({ err }, 'payment fake error');
    apiError(res, 500, err.message, 'api_error');
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port, host);
    s.once('error', reject);
    s.once('listening', () => resolve(s));
  });
  const port = (server.address() as AddressInfo).port;
  baseUrl = `http://${host}:${port}`;
  return {
    port,
    url: baseUrl,
    setWebhookUrl(url) {
      webhookUrl = url;
    },
    sign,
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
