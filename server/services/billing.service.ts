/**
 * The Free and Alerts plans, through the payment service's official SDK (the local fake in
 * development and tests, the hosted service in production: PAYMENT_API_URL and the keys).
 *
 * Webhooks: the signature is verified over the raw body (forged, tampered and stale events are
 * refused); each event id is processed once (billing_events); and the account's state is always
 * re-read from the payment API (the customer's subscriptions, best one first), so events arriving
 * out of order or repeated still end in the payment service's own final state.
 */
import { eq } from 'drizzle-orm';
import Stripe from 'stripe';
import { ALERTS_UNLOCKING_STATUSES, PLAN_NAMES, type SubscriptionState } from '#shared/schemas/billing';
import type { Database } from '../db/client';
import { billingAccounts, billingEvents } from '../db/schema';
import type { CurrentUser } from '../http/route';
import { AppError, ConflictError, ForbiddenError, UnprocessableError } from '../lib/errors';
import { logger } from '../lib/logger';
import { recordAudit } from './audit.service';

export interface BillingConfig {
  apiUrl: string;
  secretKey: string;
  webhookSecret: string;
  priceLookupKey: string;
  appUrl: string;
}

export class WebhookSignatureError extends AppError {
  constructor(message: string) {
    super(400, 'invalid_signature', message);
  }
}

/** The 403 for alert features without the plan: it names the plan that unlocks them. */
export const PLAN_REQUIRED_MESSAGE = `Lease alerts are part of the ${PLAN_NAMES.alerts}. Your account is on the ${PLAN_NAMES.free} (screening and reports). Choose the ${PLAN_NAMES.alerts} on the Plan page to unlock alerts.`;

/** Precedence when a customer has several subscriptions: the one that grants the most wins, newest first. */
const STATUS_RANK: Record<string, number> = {
  active: 6,
  trialing: 5,
  past_due: 4,
  unpaid: 3,
  incomplete: 2,
  paused: 1,
  incomplete_expired: 0,
  canceled: 0,
};

export function createPaymentClient(config: Pick<BillingConfig, 'apiUrl' | 'secretKey'>): Stripe {
  const url = new URL(config.apiUrl);
  const protocol = url.protocol === 'http:' ? 'http' : 'https';
  return new Stripe(config.secretKey, {
    host: url.hostname,
    port: Number(url.port || (protocol === 'http' ? 80 : 443)),
    protocol,
    maxNetworkRetries: 2,
    timeout: 10_000,
  });
}

function periodEndOf(sub: Stripe.Subscription): Date | null {
  const end = sub.items?.data?.[0]?.current_period_end;
  return typeof end === 'number' ? new Date(end * 1000) : null;
}

export function createBillingService(deps: { db: Database; config: BillingConfig }) {
  const { db, config } = deps;
  const payments = createPaymentClient(config);
  const isLocalFake = ['127.0.0.1', 'localhost', '::1'].includes(new URL(config.apiUrl).hostname);
  let priceId: string | null = null;

  /** The Alerts plan's price, by lookup key; the local fake gets it created on first use. */
  async function alertsPrice(): Promise<string> {
    if (priceId) return priceId;
    const found = await payments.prices.list({ lookup_keys: [config.priceLookupKey], limit: 1 });
    if (found.data[0]) {
      priceId = found.data[0].id;
      return priceId;
    }
    if (!isLocalFake) {
      throw new AppError(
        503,
        'billing_not_configured',
        `The payment service has no price with lookup key "${config.priceLookupKey}". Create the Alerts plan's monthly price with that lookup key, or set PAYMENT_PRICE_LOOKUP_KEY.`,
      );
    }
    const product = await payments.products.create({ name: 'Brackline Alerts plan' });
    const price = await payments.prices.create({
      product: product.id,
      currency: 'aud',
      unit_amount: 2900,
      recurring: { interval: 'month' },
      lookup_key: config.priceLookupKey,
    });
    priceId = price.id;
    return priceId;
  }

  async function account(userId: string) {
    const [row] = await db.select().from(billingAccounts).where(eq(billingAccounts.userId, userId));
    return row ?? null;
  }

  async function state(user: CurrentUser): Promise<SubscriptionState> {
    const row = await account(user.id);
    const status = row?.status ?? 'none';
    const alertsAllowed = (ALERTS_UNLOCKING_STATUSES as readonly string[]).includes(status);
    return {
      plan: alertsAllowed ? 'alerts' : 'free',
      status,
      alertsAllowed,
      cancelAtPeriodEnd: row?.cancelAtPeriodEnd ?? false,
      currentPeriodEnd: row?.currentPeriodEnd ? row.currentPeriodEnd.toISOString() : null,
      zoneAlertsFree: user.role === 'regulator',
    };
  }

  /** Throws the 403 that names the Alerts plan unless the user's subscription unlocks alerts. */
  async function requireAlertsPlan(user: CurrentUser): Promise<void> {
    if (!(await state(user)).alertsAllowed) throw new ForbiddenError(PLAN_REQUIRED_MESSAGE, 'plan_required');
  }

  async function checkout(user: CurrentUser): Promise<{ url: string }> {
    const current = await state(user);
    if (current.alertsAllowed)
      throw new ConflictError(`You already have the ${PLAN_NAMES.alerts}. Change or cancel it with "Manage billing" on the Plan page.`);
    const row = await account(user.id);
    let customerId: string | undefined = row?.customerId;
    // A customer the payment service no longer knows (e.g. a restarted local fake) is replaced.
    if (
      customerId &&
      !(await payments.customers.retrieve(customerId).then(
        () => true,
        (err) => (err as { statusCode?: number }).statusCode !== 404,
      ))
    )
      customerId = undefined;
    if (!customerId) {
      const customer = await payments.customers.create({ email: user.email, name: user.name ?? undefined, metadata: { userId: user.id } });
      customerId = customer.id;
      await db
        .insert(billingAccounts)
        .values({ userId: user.id, customerId })
        .onConflictDoUpdate({
          target: billingAccounts.userId,
          set: {
            customerId,
            subscriptionId: null,
            status: 'none',
            cancelAtPeriodEnd: false,
            currentPeriodEnd: null,
            updatedAt: new Date(),
          },
        });
    }
    const session = await payments.checkout.sessions.create({
      mode: 'subscription',
      customer: customerId,
      client_reference_id: user.id,
      line_items: [{ price: await alertsPrice(), quantity: 1 }],
      success_url: `${config.appUrl}/plan?checkout=done&session_id={CHECKOUT_SESSION_ID}`,
      cancel_url: `${config.appUrl}/plan?checkout=cancelled`,
      metadata: { userId: user.id },
    });
    if (!session.url) throw new AppError(502, 'payment_service_error', 'The payment service gave no checkout page. Try again in a minute.');
    await recordAudit(db, { actorId: user.id, action: 'billing.checkout.started', subjectType: 'billing', subjectId: session.id });
    return { url: session.url };
  }

  async function portal(user: CurrentUser): Promise<{ url: string }> {
    const row = await account(user.id);
    if (!row) throw new UnprocessableError(`You have no plan to manage yet. Choose the ${PLAN_NAMES.alerts} first.`);
    const session = await payments.billingPortal.sessions.create({ customer: row.customerId, return_url: `${config.appUrl}/plan` });
    return { url: session.url };
  }

  /** Re-reads the customer's subscriptions from the payment API and stores the best one. */
  async function syncCustomer(tx: Parameters<Parameters<Database['transaction']>[0]>[0], customerId: string, eventId: string) {
    const [row] = await tx.select().from(billingAccounts).where(eq(billingAccounts.customerId, customerId)).for('update');
    if (!row) {
      logger.warn({ customerId, eventId }, 'billing event for a customer Brackline does not know');
      return;
    }
    const subs = await payments.subscriptions.list({ customer: customerId, status: 'all', limit: 100 });
    const best = [...subs.data].sort((a, b) => (STATUS_RANK[b.status] ?? 0) - (STATUS_RANK[a.status] ?? 0) || b.created - a.created)[0];
    const after = best
      ? { subscriptionId: best.id, status: best.status, cancelAtPeriodEnd: best.cancel_at_period_end, currentPeriodEnd: periodEndOf(best) }
      : { subscriptionId: null, status: 'none', cancelAtPeriodEnd: false, currentPeriodEnd: null };
    const before = {
      subscriptionId: row.subscriptionId,
      status: row.status,
      cancelAtPeriodEnd: row.cancelAtPeriodEnd,
      currentPeriodEnd: row.currentPeriodEnd,
    };
    await tx
      .update(billingAccounts)
      .set({ ...after, updatedAt: new Date() })
      .where(eq(billingAccounts.userId, row.userId));
    await recordAudit(tx, {
      actorId: null,
      action: 'billing.subscription.synced',
      subjectType: 'billing_event',
      subjectId: eventId,
      before,
      after: { ...after, userId: row.userId },
    });
  }

  function customerOf(event: Stripe.Event): string | null {
    const o = event.data.object as { object?: string; customer?: string | { id: string } | null };
    if (!o.customer) return null;
    return typeof o.customer === 'string' ? o.customer : o.customer.id;
  }

  /** Verifies and processes one webhook delivery; a repeated event id changes nothing. */
  async function handleWebhook(rawBody: Buffer, signature: string | undefined): Promise<{ received: true; duplicate: boolean }> {
    if (!signature) throw new WebhookSignatureError('No Stripe-Signature header: webhooks must be signed with the webhook secret.');
    let event: Stripe.Event;
    try {
      // Default tolerance: 300 s; older timestamps are refused as replays.
      event = payments.webhooks.constructEvent(rawBody, signature, config.webhookSecret);
    } catch (err) {
      throw new WebhookSignatureError(`The webhook signature does not match, or it is too old: ${(err as Error).message}`);
    }
    return db.transaction(async (tx) => {
      const inserted = await tx
        .insert(billingEvents)
        .values({ id: event.id, type: event.type, createdAt: new Date(event.created * 1000) })
        .onConflictDoNothing()
        .returning({ id: billingEvents.id });
      if (inserted.length === 0) return { received: true as const, duplicate: true };
      const customer = customerOf(event);
      if (
        customer &&
        (event.type.startsWith('customer.subscription.') ||
          event.type === 'checkout.session.completed' ||
          event.type.startsWith('invoice.'))
      ) {
        await syncCustomer(tx, customer, event.id);
      }
      return { received: true as const, duplicate: false };
    });
  }

  return { state, requireAlertsPlan, checkout, portal, handleWebhook, payments };
}

export type BillingService = ReturnType<typeof createBillingService>;
