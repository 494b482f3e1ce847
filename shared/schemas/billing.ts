/** The Free and Alerts plans: contracts for the Plan screen and the billing API. */
import { z } from 'zod';

export const PLAN_NAMES = { free: 'Free plan', alerts: 'Alerts plan' } as const;

/** Subscription statuses that unlock alerts (a failed renewal keeps them while the payment is retried). */
export const ALERTS_UNLOCKING_STATUSES = ['active', 'trialing', 'past_due'] as const;

export const subscriptionStateSchema = z.object({
  plan: z.enum(['free', 'alerts']),
  status: z.string().describe("The payment service's subscription status, or 'none'"),
  alertsAllowed: z.boolean(),
  cancelAtPeriodEnd: z.boolean(),
  currentPeriodEnd: z.string().nullable(),
  /** Regulators' zone alerts are free; they need no plan. */
  zoneAlertsFree: z.boolean(),
});
export type SubscriptionState = z.infer<typeof subscriptionStateSchema>;

export const redirectSchema = z.object({ url: z.string().url() });
export type Redirect = z.infer<typeof redirectSchema>;

export const webhookAckSchema = z.object({ received: z.literal(true), duplicate: z.boolean() });
