import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import type { Alert, AlertRule, LeaseRuleForm, ZoneRuleForm } from '#shared/schemas/alerts';
import { leaseRuleFormSchema, zoneRuleFormSchema } from '#shared/schemas/alerts';
import { TextField } from '../../../components/ui/text-field';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { alertKeys, checkForecast, createRule, deleteRule, getPlan } from '../api/alerts-api';

const flow = (q: number) => `${q >= 100 ? Math.round(q) : Number(q.toPrecision(3))} m³/s`;
const when = (iso: string) =>
  new Date(iso).toLocaleString(undefined, { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit' });

function Select({ label, error, children, ...props }: React.SelectHTMLAttributes<HTMLSelectElement> & { label: string; error?: string }) {
  const id = useId();
  return (
    <div className="flex min-w-56 flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-shell-900">
        {label}
      </label>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        className="rounded-md border border-shell-300 bg-white px-3 py-2 text-base"
        {...props}
      >
        {children}
      </select>
      {error && (
        <p role="alert" className="text-sm font-semibold text-[#8a3b12]">
          {error}
        </p>
      )}
    </div>
  );
}

function Gauges() {
  const gauges = useQuery({ ...alertKeys.gauges(), refetchInterval: 15_000 });
  return (
    <section aria-labelledby="gauges-h" className="rounded-lg border border-sand-300 bg-white p-4">
      <h2 id="gauges-h" className="font-bold text-deep-900">
        River gauges now
      </h2>
      {gauges.isPending && <Loading what="Loading gauges…" />}
      {gauges.isError && <LoadError error={gauges.error} retry={() => void gauges.refetch()} />}
      {gauges.data && gauges.data.items.length === 0 && <Empty title="No gauges yet" />}
      {gauges.data && gauges.data.items.length > 0 && (
        <ul className="mt-2 grid gap-2 sm:grid-cols-2">
          {gauges.data.items.map((g) => (
            <li key={g.id} className="rounded-md bg-deep-50 px-3 py-2 text-sm">
              <span className="font-semibold">{g.riverName}</span> <span className="text-shell-700">({g.code})</span>
              <br />
              {g.latest ? (
                <>
                  <span className="text-lg font-bold text-deep-900">{flow(g.latest.discharge)}</span>{' '}
                  <span className="text-shell-700">at {when(g.latest.observedAt)}</span>
                </>
              ) : (
                <span className="text-shell-700">No reading yet</span>
              )}
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function NewLeaseRule({ allowed }: { allowed: boolean }) {
  const queryClient = useQueryClient();
  const leases = useQuery(alertKeys.leases());
  const rivers = useQuery(alertKeys.rivers());
  const form = useForm<LeaseRuleForm>({
    resolver: zodResolver(leaseRuleFormSchema),
    defaultValues: { leaseId: '', riverId: '', bandId: '' },
  });
  const leaseId = form.watch('leaseId');
  const riverId = form.watch('riverId');
  const sweep = useQuery(alertKeys.sweep(leaseId, riverId));
  const create = useMutation({
    mutationFn: (v: LeaseRuleForm) => createRule({ kind: 'lease', ...v }),
    onSuccess: () => {
      form.reset({ leaseId: '', riverId: '', bandId: '' });
      void queryClient.invalidateQueries({ queryKey: alertKeys.all });
    },
  });
  return (
    <section aria-labelledby="new-rule-h" className="rounded-lg border border-sand-300 bg-white p-4">
      <h2 id="new-rule-h" className="font-bold text-deep-900">
        New lease alert
      </h2>
      <p className="mt-1 text-sm text-shell-700">
        Choose a lease, the river, and the band: you are alerted when a gauge reading, or a forecast flow you check below, reaches the flow
        at which the lease enters that band (from the lease's flow sweep).
      </p>
      <form
        aria-label="New lease alert"
        noValidate
        className="mt-3 flex flex-wrap items-end gap-3"
        onSubmit={form.handleSubmit((v) => create.mutate(v))}
      >
        <fieldset disabled={!allowed} className="contents">
          <Select label="Lease" {...form.register('leaseId')} error={form.formState.errors.leaseId?.message}>
            <option value="">{leases.isPending ? 'Loading leases…' : 'Choose a lease'}</option>
            {leases.data?.items.map((l) => (
              <option key={l.id} value={l.id}>
                {l.leaseId}
              </option>
            ))}
          </Select>
          <Select label="River" {...form.register('riverId')} error={form.formState.errors.riverId?.message}>
            <option value="">{rivers.isPending ? 'Loading rivers…' : 'Choose a river'}</option>
            {rivers.data?.items.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </Select>
          <Select label="Band" {...form.register('bandId')} error={form.formState.errors.bandId?.message}>
            <option value="">
              {sweep.isFetching ? 'Working out the flows…' : leaseId && riverId ? 'Choose a band' : 'Choose a lease and river first'}
            </option>
            {sweep.data?.bands.map((b) => (
              <option key={b.bandId} value={b.bandId} disabled={b.entersAtDischarge === null}>
                {b.name} — {b.entersAtDischarge === null ? 'not entered at any flow' : `from ${flow(b.entersAtDischarge)}`}
              </option>
            ))}
          </Select>
          <Button type="submit" disabled={create.isPending}>
            {create.isPending ? 'Saving…' : 'Set alert'}
          </Button>
        </fieldset>
      </form>
      {sweep.isError && (
        <div className="mt-3">
          <LoadError error={sweep.error} />
        </div>
      )}
      {create.isError && <AlertNotSet error={create.error} />}
    </section>
  );
}

/** Why a new alert rule was refused (the server's message names what to fix, or the plan that unlocks it). */
function AlertNotSet({ error }: { error: unknown }) {
  return (
    <div className="mt-3">
      <Notice tone="problem" title="The alert was not set">
        {(error as Error).message}
      </Notice>
    </div>
  );
}

function NewZoneRule() {
  const queryClient = useQueryClient();
  const zones = useQuery(alertKeys.zones());
  const form = useForm<z.input<typeof zoneRuleFormSchema>, unknown, ZoneRuleForm>({
    resolver: zodResolver(zoneRuleFormSchema),
    defaultValues: { zoneId: '', approachPercent: 80 },
  });
  const create = useMutation({
    mutationFn: (v: ZoneRuleForm) => createRule({ kind: 'zone', zoneId: v.zoneId, approachFraction: v.approachPercent / 100 }),
    onSuccess: () => {
      form.reset({ zoneId: '', approachPercent: 80 });
      void queryClient.invalidateQueries({ queryKey: alertKeys.all });
    },
  });
  return (
    <section aria-labelledby="new-zone-h" className="rounded-lg border border-sand-300 bg-white p-4">
      <h2 id="new-zone-h" className="font-bold text-deep-900">
        New closure-zone alert
      </h2>
      <p className="mt-1 text-sm text-shell-700">
        You are alerted when the zone's gauge approaches its trigger flow, and again when it passes it. Free for regulators.
      </p>
      {zones.isError && <LoadError error={zones.error} retry={() => void zones.refetch()} />}
      <form
        aria-label="New closure-zone alert"
        noValidate
        className="mt-3 flex flex-wrap items-end gap-3"
        onSubmit={form.handleSubmit((v) => create.mutate(v))}
      >
        <Select label="Closure zone" {...form.register('zoneId')} error={form.formState.errors.zoneId?.message}>
          <option value="">{zones.isPending ? 'Loading zones…' : 'Choose a zone'}</option>
          {zones.data?.items.map((z) => (
            <option key={z.id} value={z.id} disabled={z.triggerFlow === null}>
              {z.name} — {z.triggerFlow === null ? 'no trigger flow set' : `${z.riverName ?? ''} trigger ${flow(z.triggerFlow)}`}
            </option>
          ))}
        </Select>
        <TextField
          label="Approaching at (% of the trigger)"
          inputMode="numeric"
          className="w-64"
          {...form.register('approachPercent')}
          error={form.formState.errors.approachPercent?.message}
        />
        <Button type="submit" disabled={create.isPending}>
          {create.isPending ? 'Saving…' : 'Set alert'}
        </Button>
      </form>
      {create.isError && <AlertNotSet error={create.error} />}
    </section>
  );
}

function ForecastCheck({ rule }: { rule: AlertRule }) {
  const [value, setValue] = useState('');
  const queryClient = useQueryClient();
  const id = useId();
  const check = useMutation({
    mutationFn: (q: number) => checkForecast(rule.id, q),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: alertKeys.all }),
  });
  const q = Number(value);
  return (
    <form
      className="flex flex-wrap items-center gap-2"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        if (q > 0) check.mutate(q);
      }}
    >
      <label htmlFor={id} className="text-sm">
        Forecast flow (m³/s)
      </label>
      <input
        id={id}
        inputMode="decimal"
        value={value}
        onChange={(e) => setValue(e.target.value)}
        className="w-24 rounded-md border border-shell-300 px-2 py-1"
      />
      <Button type="submit" variant="secondary" className="px-2 py-1" disabled={!(q > 0) || check.isPending}>
        Check
      </Button>
      {check.data && (
        <span className="text-sm">
          {check.data.reaches ? 'Reaches it — alert sent.' : `Below ${flow(check.data.thresholdFlow)} — no alert.`}
        </span>
      )}
      {check.isError && <span className="text-sm text-[#8a3b12]">{(check.error as Error).message}</span>}
    </form>
  );
}

function Rules() {
  const queryClient = useQueryClient();
  const rules = useQuery(alertKeys.rules());
  const remove = useMutation({ mutationFn: deleteRule, onSuccess: () => void queryClient.invalidateQueries({ queryKey: alertKeys.all }) });
  return (
    <section aria-labelledby="rules-h" className="rounded-lg border border-sand-300 bg-white p-4">
      <h2 id="rules-h" className="font-bold text-deep-900">
        Your alerts
      </h2>
      {rules.isPending && <Loading what="Loading your alerts…" />}
      {rules.isError && <LoadError error={rules.error} retry={() => void rules.refetch()} />}
      {rules.data && rules.data.items.length === 0 && <Empty title="No alerts set yet">Set one above.</Empty>}
      {rules.data && rules.data.items.length > 0 && (
        <ul className="mt-2 divide-y divide-sand-200">
          {rules.data.items.map((r) => (
            <li key={r.id} className="flex flex-wrap items-center justify-between gap-3 py-3 text-sm">
              <div>
                <p className="font-semibold text-deep-900">
                  {r.kind === 'lease' ? `Lease ${r.leaseCode}: ${r.bandName}` : `Closure zone ${r.zoneName}: trigger flow`}
                </p>
                <p className="text-shell-700">
                  {r.riverName} at or above <strong>{flow(r.thresholdFlow)}</strong>
                  {r.approachFlow !== null && ` (approaching from ${flow(r.approachFlow)})`}
                </p>
              </div>
              <div className="flex flex-wrap items-center gap-3">
                <ForecastCheck rule={r} />
                <Button
                  variant="quiet"
                  onClick={() => remove.mutate(r.id)}
                  aria-label={`Delete the alert for ${r.leaseCode ?? r.zoneName}`}
                >
                  Delete
                </Button>
              </div>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function Delivery({ a }: { a: Alert }) {
  if (a.emailStatus === 'sent') return <span className="text-estuary-900">E-mailed {a.emailSentAt ? when(a.emailSentAt) : ''}</span>;
  if (a.emailStatus === 'failed')
    return <span className="font-semibold text-[#8a3b12]">E-mail could not be sent ({a.emailAttempts} tries). It is in your inbox.</span>;
  return (
    <span className="text-[#8a3b12]" title={a.emailLastError ?? undefined}>
      E-mail waiting to send
      {a.emailAttempts > 0 ? ` — tried ${a.emailAttempts} ${a.emailAttempts === 1 ? 'time' : 'times'}, trying again` : ''}
    </span>
  );
}

function SentAlerts() {
  const alerts = useQuery({ ...alertKeys.alerts(), refetchInterval: 15_000 });
  return (
    <section aria-labelledby="sent-h" className="rounded-lg border border-sand-300 bg-white p-4">
      <h2 id="sent-h" className="font-bold text-deep-900">
        Alerts sent
      </h2>
      {alerts.isPending && <Loading what="Loading alerts…" />}
      {alerts.isError && <LoadError error={alerts.error} retry={() => void alerts.refetch()} />}
      {alerts.data && alerts.data.items.length === 0 && (
        <Empty title="No alerts yet">When a flow reaches one of your alerts, it appears here, in your inbox and in your e-mail.</Empty>
      )}
      {alerts.data && alerts.data.items.length > 0 && (
        <table className="mt-2 w-full text-left text-sm">
          <thead className="text-shell-700">
            <tr>
              <th className="py-1 pr-3">When</th>
              <th className="py-1 pr-3">Alert</th>
              <th className="py-1 pr-3">Flow</th>
              <th className="py-1">E-mail</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-sand-200">
            {alerts.data.items.map((a) => (
              <tr key={a.id}>
                <td className="py-2 pr-3 whitespace-nowrap">{when(a.createdAt)}</td>
                <td className="py-2 pr-3">
                  {a.subject}
                  {a.source === 'forecast' && <span className="ml-1 rounded bg-sand-100 px-1 text-xs">forecast</span>}
                </td>
                <td className="py-2 pr-3 whitespace-nowrap">{flow(a.discharge)}</td>
                <td className="py-2">
                  <Delivery a={a} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

/** Alerts: live gauges, the user's alert rules, and the alerts sent with their e-mail delivery. */
export function AlertsPage() {
  const plan = useQuery({ queryKey: [...alertKeys.all, 'plan'], queryFn: getPlan });
  return (
    <div className="space-y-6">
      <PageHeader title="Alerts" question="Which river flows should warn you, and what has been sent?" />
      {plan.isPending && <Loading what="Checking your plan…" />}
      {plan.isError && <LoadError error={plan.error} retry={() => void plan.refetch()} />}
      {plan.data && !plan.data.alertsAllowed && plan.data.zoneAlertsFree && (
        <Notice title="Closure-zone alerts are free for regulators">
          <p>
            Lease alerts are part of the Alerts plan;{' '}
            <Link to="/plan" className="font-semibold underline">
              see the Plan page
            </Link>{' '}
            if you want them too.
          </p>
        </Notice>
      )}
      {plan.data && !plan.data.alertsAllowed && !plan.data.zoneAlertsFree && (
        <Notice title="Lease alerts are part of the Alerts plan">
          <p>
            You are on the Free plan (screening and reports).{' '}
            <Link to="/plan" className="font-semibold underline">
              Choose the Alerts plan
            </Link>{' '}
            to set lease alerts.
          </p>
        </Notice>
      )}
      <Gauges />
      {plan.data?.zoneAlertsFree && <NewZoneRule />}
      {plan.data && (plan.data.alertsAllowed || !plan.data.zoneAlertsFree) && <NewLeaseRule allowed={plan.data.alertsAllowed} />}
      <Rules />
      <SentAlerts />
      <Cautions compact />
    </div>
  );
}
