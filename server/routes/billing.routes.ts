import express, { type Express } from 'express';
import { redirectSchema, subscriptionStateSchema, webhookAckSchema } from '#shared/schemas/billing';
import { defineRoute, type RouteContext } from '../http/route';
import type { BillingService } from '../services/billing.service';

const PAYING_ROLES = ['grower', 'adviser', 'regulator'] as const;

export function registerBillingRoutes(ctx: RouteContext, billing: BillingService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/billing/subscription',
    summary: 'Your plan: Free (screening and reports) or Alerts, and the subscription status',
    tags: ['billing'],
    access: { roles: PAYING_ROLES },
    response: subscriptionStateSchema,
    handler: ({ user }) => billing.state(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/billing/checkout',
    summary: 'Start paying for the Alerts plan: returns the payment page to send the browser to',
    tags: ['billing'],
    access: { roles: PAYING_ROLES },
    response: redirectSchema,
    errors: [409, 502, 503],
    handler: ({ user }) => billing.checkout(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/billing/portal',
    summary: 'Manage or cancel the plan: returns the billing page to send the browser to',
    tags: ['billing'],
    access: { roles: PAYING_ROLES },
    response: redirectSchema,
    errors: [422],
    handler: ({ user }) => billing.portal(user!),
  });
}

/**
 * The webhook needs the raw body to verify its signature, so it is mounted on the app before the
 * API router (whose JSON parser would consume the body). Documented in the OpenAPI document as public.
 */
export function mountBillingWebhook(app: Express, ctx: RouteContext, billing: BillingService): void {
  const path = `${ctx.basePath}/billing/webhook`;
  ctx.registry.registerPath({
    method: 'post',
    path,
    summary: 'Payment service events (signed with the webhook secret; each event id is processed once)',
    tags: ['billing'],
    responses: {
      200: { description: 'Received', content: { 'application/json': { schema: webhookAckSchema } } },
      400: { description: 'Signature missing, forged, tampered or too old' },
    },
  });
  app.post(path, express.raw({ type: '*/*', limit: '1mb' }), async (req, res, next) => {
    try {
      const body = Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0);
      res.json(await billing.handleWebhook(body, req.header('stripe-signature')));
    } catch (err) {
      next(err);
    }
  });
}
