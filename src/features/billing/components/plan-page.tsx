import { useMutation, useQuery } from '@tanstack/react-query';
import { Link, useSearchParams } from 'react-router-dom';
import { PLAN_NAMES, type SubscriptionState } from '#shared/schemas/billing';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { LoadError, Loading } from '../../../components/ui/states';
import { billingKeys, openBillingPage, startCheckout } from '../api/billing-api';

const STATUS_WORDS: Record<string, string> = {
  none: 'No subscription',
  active: 'Active',
  trialing: 'Active (trial)',
  past_due: 'Payment failed — retrying',
  canceled: 'Cancelled',
  unpaid: 'Unpaid',
  incomplete: 'Waiting for payment',
};

const day = (iso: string | null) =>
  iso ? new Date(iso).toLocaleDateString(undefined, { day: 'numeric', month: 'long', year: 'numeric' }) : '';

function PlanCard({
  title,
  price,
  items,
  current,
  children,
}: {
  title: string;
  price: string;
  items: string[];
  current: boolean;
  children?: React.ReactNode;
}) {
  return (
    <section
      aria-label={title}
      className={`flex flex-col rounded-lg border bg-white p-5 ${current ? 'border-deep-700 ring-2 ring-deep-300' : 'border-sand-300'}`}
    >
      <div className="flex items-baseline justify-between gap-2">
        <h2 className="text-lg font-bold text-deep-900">{title}</h2>
        {current && <span className="rounded bg-deep-700 px-2 py-0.5 text-xs font-semibold text-white">Your plan</span>}
      </div>
      <p className="mt-1 text-sm text-shell-700">{price}</p>
      <ul className="mt-3 flex-1 list-disc space-y-1 pl-5 text-sm text-shell-900">
        {items.map((i) => (
          <li key={i}>{i}</li>
        ))}
      </ul>
      {children && <div className="mt-4">{children}</div>}
    </section>
  );
}

function CheckoutReturn({ state }: { state: SubscriptionState }) {
  const [params] = useSearchParams();
  const outcome = params.get('checkout');
  if (outcome === 'cancelled')
    return <Notice title="Checkout cancelled">Nothing was charged. You are still on the {PLAN_NAMES.free}.</Notice>;
  if (outcome !== 'done') return null;
  return state.alertsAllowed ? (
    <Notice tone="done" title={`Your ${PLAN_NAMES.alerts} is on`}>
      <p>
        Set your first alert on the{' '}
        <Link to="/alerts" className="font-semibold underline">
          Alerts
        </Link>{' '}
        page.
      </p>
    </Notice>
  ) : (
    <Notice title="Payment received — switching your plan on…">
      <p>This takes a few seconds, while the payment service confirms it.</p>
    </Notice>
  );
}

/** Free (screening and reports) or Alerts (paid): the plan, checkout and billing. */
export function PlanPage() {
  const [params] = useSearchParams();
  const waiting = params.get('checkout') === 'done';
  const query = useQuery({
    ...billingKeys.subscription(),
    refetchInterval: (q) => (waiting && !q.state.data?.alertsAllowed ? 1000 : false),
  });
  const checkout = useMutation({ mutationFn: startCheckout, onSuccess: ({ url }) => window.location.assign(url) });
  const billing = useMutation({ mutationFn: openBillingPage, onSuccess: ({ url }) => window.location.assign(url) });

  return (
    <div className="space-y-6">
      <PageHeader title="Plan" question="Which plan are you on, and what does it unlock?" />
      {query.isPending && <Loading what="Loading your plan…" />}
      {query.isError && <LoadError error={query.error} retry={() => void query.refetch()} />}
      {query.data && (
        <>
          <CheckoutReturn state={query.data} />
          <p className="text-sm text-shell-900">
            <span className="font-semibold">Subscription:</span> {STATUS_WORDS[query.data.status] ?? query.data.status}
            {query.data.alertsAllowed &&
              query.data.currentPeriodEnd &&
              (query.data.cancelAtPeriodEnd
                ? `, ends on ${day(query.data.currentPeriodEnd)}`
                : `, renews on ${day(query.data.currentPeriodEnd)}`)}
          </p>
          {query.data.status === 'past_due' && (
            <Notice tone="problem" title="Your last payment failed">
              Alerts keep running while the payment is retried. Update your card with “Manage billing”.
            </Notice>
          )}
          <div className="grid gap-4 md:grid-cols-2">
            <PlanCard
              title={PLAN_NAMES.free}
              price="No charge"
              current={query.data.plan === 'free'}
              items={[
                'Screening of your leases against every river and scenario',
                'Lease reports (print and PDF), the exposure map, compare and the plume calculator',
                'Share leases with your adviser',
              ]}
            />
            <PlanCard
              title={PLAN_NAMES.alerts}
              price="29.00 AUD a month, cancel any time"
              current={query.data.plan === 'alerts'}
              items={[
                `Everything in the ${PLAN_NAMES.free}`,
                'Alerts: an e-mail and an inbox message when a river gauge reading — or a forecast flow you type — reaches the flow at which your lease enters a band you choose',
                'Live gauge readings for your rivers',
              ]}
            >
              {query.data.plan === 'alerts' ? (
                <Button variant="secondary" onClick={() => billing.mutate()} disabled={billing.isPending}>
                  {billing.isPending ? 'Opening…' : 'Manage billing'}
                </Button>
              ) : (
                <Button onClick={() => checkout.mutate()} disabled={checkout.isPending}>
                  {checkout.isPending ? 'Opening the payment page…' : `Choose the ${PLAN_NAMES.alerts}`}
                </Button>
              )}
            </PlanCard>
          </div>
          {query.data.zoneAlertsFree && (
            <Notice title="Closure-zone alerts are free for regulators">Set them on the Alerts page without a plan.</Notice>
          )}
          {(checkout.isError || billing.isError) && (
            <Notice tone="problem" title="The payment service could not be reached">
              {((checkout.error ?? billing.error) as Error).message}
            </Notice>
          )}
          <p className="text-xs text-shell-700">Payments go through the payment service; Brackline never sees your card number.</p>
        </>
      )}
    </div>
  );
}
