import { queryOptions } from '@tanstack/react-query';
import type { Redirect, SubscriptionState } from '#shared/schemas/billing';
import { api } from '../../../lib/api-client';

export const billingKeys = {
  all: ['billing'] as const,
  subscription: () =>
    queryOptions({
      queryKey: [...billingKeys.all, 'subscription'] as const,
      queryFn: () => api<SubscriptionState>('/billing/subscription'),
    }),
};

/** The payment page of the Alerts plan; the browser goes there and comes back to /plan. */
export function startCheckout() {
  return api<Redirect>('/billing/checkout', { method: 'POST' });
}

export function openBillingPage() {
  return api<Redirect>('/billing/portal', { method: 'POST' });
}
