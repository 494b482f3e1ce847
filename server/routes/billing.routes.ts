import express, { type Express } from 'express';
import { z } from 'zod';
import { redirectSchema, subscriptionStateSchema, webhookAckSchema } from '#shared/schemas/billing';
import { defineRoute, documentRoute, type RouteContext } from '../http/route';
import type { BillingService } from '../services/billing.service';

const PAYING_ROLES = ['grower', 'adviser', 'regulator'] as const;

export function registerBillingRoutes(ctx: RouteContext, billing: BillingService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/billing/subscription',
    operationId: 'getSubscription',
    summary: 'Your plan: Free (screening and reports) or Alerts, and the subscription status',
    tags: ['billing'],
    access: { roles: PAYING_ROLES },
    response: subscriptionStateSchema,
    handler: ({ user }) => billing.state(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/billing/checkout',
    operationId: 'startCheckout',
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
    operationId: 'openBillingPortal',
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
  documentRoute(ctx, {
    method: 'post',
    path: '/billing/webhook',
    operationId: 'receiveBillingWebhook',
    summary: 'Payment service events (signed with the webhook secret; each event id is processed once)',
    tags: ['billing'],
    // Open: the payment service proves itself with the Stripe-Signature header, checked on the raw body.
    access: { public: true },
    requestContent: {
      'application/json': z
        .looseObject({ id: z.string(), type: z.string().describe('e.g. checkout.session.completed'), data: z.looseObject({ object: z.looseObject({}) }) })
        .describe('A payment service event, verified with its Stripe-Signature header before it is read'),
    },
    response: webhookAckSchema,
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
