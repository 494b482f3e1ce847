import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { FeatureCollection, Geometry } from 'geojson';
import { lazy, Suspense, useEffect, useMemo, useState } from 'react';
import { type UseFormRegister, useForm } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import type { z } from 'zod';
import { type SampleForm, sampleFormSchema, type TriggerSweep, type Zone, zonePlanSchema } from '#shared/schemas/zones';
import { LazyVectorMap, type MapLayerSpec } from '../../../components/map/lazy-vector-map';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { api } from '../../../lib/api-client';
import { fmtFlow, fmtNumber, returnPeriodLabel } from '../../../lib/format';
import { addSample, type GaugeOption, updateZone, zoneKeys } from '../api/zones-api';
import { fmtWhen, ZoneStatusBadge } from './zone-status';
import { type PlanNumbers, PlanValueFields } from './plan-value-fields';

const TriggerSweepChart = lazy(() => import('./trigger-sweep-chart').then((m) => ({ default: m.TriggerSweepChart })));

const planFormSchema = zonePlanSchema.pick({
  riverId: true,
  gaugeId: true,
  triggerFlow: true,
  minClosureDays: true,
  indicatorStandard: true,
});
type PlanForm = z.infer<typeof planFormSchema>;

const SHARES = [
  { value: 0, label: 'Any part of the zone' },
  { value: 0.1, label: 'A tenth of the zone' },
  { value: 0.5, label: 'Half of the zone' },
  { value: 1, label: 'The whole zone' },
];

function aepText(aep: number | null): string {
  if (aep == null) return 'rarer than the largest fitted flood';
  if (aep > 0.5) return `${fmtNumber(aep * 100, 0)}% AEP: reached in most years`;
  return `${fmtNumber(aep * 100, aep < 0.01 ? 2 : 1)}% AEP, about ${returnPeriodLabel(aep)}`;
}

/** Rounds a suggested flow to three significant figures, the precision a plan quotes. */
function roundFlow(q: number): number {
  return Number(q.toPrecision(3));
}

export function ZonePage() {
  const { id = '' } = useParams();
  const zone = useQuery(zoneKeys.detail(id));
  return (
    <div className="space-y-8">
      {zone.isPending ? (
        <Loading what="Loading the zone…" />
      ) : zone.isError ? (
        <LoadError error={zone.error} retry={() => zone.refetch()} />
      ) : (
        <ZoneView zone={zone.data} />
      )}
    </div>
  );
}

function ZoneView({ zone }: { zone: Zone }) {
  const [share, setShare] = useState(0);
  const [suggested, setSuggested] = useState<number | null>(null);
  const sweep = useQuery({ ...zoneKeys.sweep(zone.id, share), enabled: Boolean(zone.riverId && zone.indicatorStandard) });
  return (
    <>
      <PageHeader
        title={zone.name}
        question="Is the zone open, and does the model support its trigger flow?"
        actions={
          <Link
            to={`/notices?zone=${zone.id}`}
            className="rounded-md border border-deep-300 bg-white px-4 py-2 text-sm font-semibold text-deep-700"
          >
            Issue a notice
          </Link>
        }
      />
      <section aria-label="Status" className="flex flex-wrap items-center gap-x-8 gap-y-2 rounded-lg border border-sand-200 bg-white p-4">
        <p className="text-lg">
          <ZoneStatusBadge status={zone.status} /> <span className="ml-2">since {fmtWhen(zone.statusSince)}</span>
        </p>
        {zone.earliestReopening && <p>Earliest reopening: {fmtWhen(zone.earliestReopening)}, and only after a passing sample result.</p>}
        <p className="text-sm text-shell-700">{zone.heldLeases} held leases touch this zone.</p>
      </section>

      <ZoneMap zone={zone} />
      <div className="grid gap-8 lg:grid-cols-2">
        <PlanValuesLoader zone={zone} suggested={suggested} />
        <section aria-labelledby="model-trigger" className="space-y-3">
          <h2 id="model-trigger" className="text-lg font-semibold text-deep-900">
            The model’s trigger
          </h2>
          <div className="flex flex-col gap-1">
            <label htmlFor="share" className="text-sm font-semibold">
              Close when the indicator is above the standard over
            </label>
            <select
              id="share"
              className="max-w-72 rounded-md border border-shell-300 bg-white px-3 py-2"
              value={share}
              onChange={(e) => setShare(Number(e.target.value))}
            >
              {SHARES.map((s) => (
                <option key={s.value} value={s.value}>
                  {s.label}
                </option>
              ))}
            </select>
          </div>
          {!zone.riverId || !zone.indicatorStandard ? (
            <Empty title="No sweep yet">Link the zone to a river and set its indicator standard to see the model’s trigger.</Empty>
          ) : sweep.isPending ? (
            <Loading what={`Sweeping flows of ${zone.riverName}…`} />
          ) : sweep.isError ? (
            <LoadError error={sweep.error} retry={() => sweep.refetch()} />
          ) : (
            <SweepSummary sweep={sweep.data} onUse={(q) => setSuggested(q)} />
          )}
        </section>
      </div>
      {sweep.data && (
        <Suspense fallback={<Loading what="Drawing the chart…" />}>
          <TriggerSweepChart sweep={sweep.data} />
        </Suspense>
      )}
      <Cautions compact />
      <div className="grid gap-8 lg:grid-cols-2">
        <Samples zone={zone} />
        <ZoneNotices zoneId={zone.id} />
      </div>
    </>
  );
}

/** The zone's outline on the coast (land from the jurisdiction's shared coasts). */
function ZoneMap({ zone }: { zone: Zone }) {
  const coasts = useQuery({ queryKey: ['coasts'], queryFn: () => api<FeatureCollection>('/coasts'), staleTime: 5 * 60_000 });
  const layers = useMemo<MapLayerSpec[]>(
    () => [
      {
        id: 'land',
        label: 'Land',
        data: { type: 'FeatureCollection', features: (coasts.data?.features ?? []).filter((f) => f.properties?.form === 'land') },
        fill: '#e6dcc3',
        stroke: '#9c8a5f',
        strokeWidth: 1,
      },
      {
        id: 'zone',
        label: zone.name,
        data: {
          type: 'FeatureCollection',
          features: zone.geometry ? [{ type: 'Feature', properties: { name: zone.name }, geometry: zone.geometry as Geometry }] : [],
        },
        fill: 'rgba(23, 61, 97, 0.2)',
        stroke: '#0c2238',
        strokeWidth: 3,
      },
    ],
    [coasts.data, zone],
  );
  return <LazyVectorMap layers={layers} height={260} ariaLabel={`Outline of ${zone.name}`} fitTo={['zone']} fit="once" maxZoom={14} />;
}

function SweepSummary({ sweep, onUse }: { sweep: TriggerSweep; onUse: (q: number) => void }) {
  if (sweep.suggestedTrigger == null) {
    return <Notice title="The model suggests no trigger">{sweep.note}</Notice>;
  }
  const margin = sweep.marginM3s;
  return (
    <div className="space-y-2">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm tabular-nums" aria-label="Trigger comparison">
        <dt className="font-semibold">Model’s suggestion</dt>
        <dd>
          {fmtFlow(sweep.suggestedTrigger)} · {aepText(sweep.suggestedAep)}
        </dd>
        <dt className="font-semibold">Plan’s trigger</dt>
        <dd>{sweep.planTrigger != null ? `${fmtFlow(sweep.planTrigger)} · ${aepText(sweep.planAep)}` : 'not set'}</dd>
        <dt className="font-semibold">Margin</dt>
        <dd>
          {margin == null
            ? '—'
            : Math.abs(margin) <= 0.005 * sweep.suggestedTrigger
              ? 'The plan matches the model’s suggestion (within 0.5 %).'
              : margin > 0
                ? `The plan closes ${fmtFlow(margin)} later than the model suggests (${
                    (sweep.marginPercent ?? 0) > 1000
                      ? `${fmtNumber(sweep.planTrigger! / sweep.suggestedTrigger, 0)} times its flow`
                      : `${fmtNumber(sweep.marginPercent, 0)}% above it`
                  }).`
                : margin < 0
                  ? `The plan closes ${fmtFlow(-margin)} earlier than the model suggests.`
                  : 'The plan matches the model.'}
        </dd>
      </dl>
      <Button variant="secondary" onClick={() => onUse(roundFlow(sweep.suggestedTrigger!))}>
        Use the model’s suggestion
      </Button>
    </div>
  );
}

/** The form mounts once the river and gauge choices are loaded, so its selects start on the zone's own values. */
function PlanValuesLoader({ zone, suggested }: { zone: Zone; suggested: number | null }) {
  const rivers = useQuery(zoneKeys.rivers());
  const gauges = useQuery(zoneKeys.gauges());
  if (rivers.isPending || gauges.isPending) return <Loading what="Loading the rivers and gauges…" />;
  if (rivers.isError || gauges.isError)
    return (
      <LoadError
        error={rivers.error ?? gauges.error}
        retry={() => {
          void rivers.refetch();
          void gauges.refetch();
        }}
      />
    );
  return <PlanValues zone={zone} suggested={suggested} rivers={rivers.data.items} gauges={gauges.data.items} />;
}

function PlanValues({
  zone,
  suggested,
  rivers,
  gauges,
}: {
  zone: Zone;
  suggested: number | null;
  rivers: { id: string; name: string }[];
  gauges: GaugeOption[];
}) {
  const queryClient = useQueryClient();
  const form = useForm<PlanForm>({
    resolver: zodResolver(planFormSchema),
    defaultValues: {
      riverId: zone.riverId,
      gaugeId: zone.gaugeId,
      triggerFlow: zone.triggerFlow,
      minClosureDays: zone.minClosureDays,
      indicatorStandard: zone.indicatorStandard,
    },
  });
  useEffect(() => {
    if (suggested != null) form.setValue('triggerFlow', suggested, { shouldDirty: true, shouldValidate: true });
  }, [suggested, form]);
  const save = useMutation({
    // Only the fields the regulator changed are sent, so the audit entry shows exactly those.
    mutationFn: (v: PlanForm) => {
      const dirty = form.formState.dirtyFields as Partial<Record<keyof PlanForm, boolean>>;
      return updateZone(zone.id, Object.fromEntries(Object.entries(v).filter(([k]) => dirty[k as keyof PlanForm])));
    },
    onSuccess: (z) => {
      form.reset({
        riverId: z.riverId,
        gaugeId: z.gaugeId,
        triggerFlow: z.triggerFlow,
        minClosureDays: z.minClosureDays,
        indicatorStandard: z.indicatorStandard,
      });
      void queryClient.invalidateQueries({ queryKey: zoneKeys.all });
    },
  });
  const riverId = form.watch('riverId');
  const errors = form.formState.errors;
  return (
    <section aria-labelledby="plan-values" className="space-y-3">
      <h2 id="plan-values" className="text-lg font-semibold text-deep-900">
        Plan values
      </h2>
      <form className="grid gap-3 sm:grid-cols-2" noValidate onSubmit={form.handleSubmit((v) => save.mutate(v))} aria-label="Plan values">
        <div className="flex flex-col gap-1">
          <label htmlFor="plan-river" className="text-sm font-semibold">
            River
          </label>
          <select
            id="plan-river"
            className="rounded-md border border-shell-300 bg-white px-3 py-2"
            {...form.register('riverId', { setValueAs: (v) => v || null })}
          >
            <option value="">None</option>
            {rivers.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="plan-gauge" className="text-sm font-semibold">
            Gauge
          </label>
          <select
            id="plan-gauge"
            className="rounded-md border border-shell-300 bg-white px-3 py-2"
            {...form.register('gaugeId', { setValueAs: (v) => v || null })}
          >
            <option value="">None</option>
            {gauges
              .filter((g) => g.riverId === riverId)
              .map((g) => (
                <option key={g.id} value={g.id}>
                  {g.code} · {g.name}
                </option>
              ))}
          </select>
        </div>
        <PlanValueFields register={form.register as unknown as UseFormRegister<PlanNumbers>} errors={errors} />
        <div className="flex items-end">
          <Button type="submit" disabled={save.isPending || !form.formState.isDirty}>
            {save.isPending ? 'Saving…' : 'Save plan values'}
          </Button>
        </div>
      </form>
      <p className="text-xs text-shell-700">
        Reopening rule: after the minimum closure, and only once a sample result at or under the standard is entered below.
      </p>
      {save.isSuccess && !form.formState.isDirty && <Notice tone="done">Plan values saved; the change is in the audit log.</Notice>}
      {save.isError && (
        <Notice tone="problem" title="Not saved">
          {(save.error as Error).message}
        </Notice>
      )}
    </section>
  );
}

function Samples({ zone }: { zone: Zone }) {
  const queryClient = useQueryClient();
  const samples = useQuery(zoneKeys.samples(zone.id));
  const [formKey, setFormKey] = useState(0);
  const form = useForm<SampleForm>({ resolver: zodResolver(sampleFormSchema), defaultValues: { sampledAt: '', notes: '' } });
  const add = useMutation({
    mutationFn: (v: SampleForm) =>
      addSample(zone.id, { sampledAt: new Date(v.sampledAt).toISOString(), indicator: v.indicator, notes: v.notes || undefined }),
    onSuccess: () => {
      form.reset({ sampledAt: '', notes: '' });
      // A fresh form element clears the number field too (it has no default value).
      setFormKey((k) => k + 1);
      void queryClient.invalidateQueries({ queryKey: zoneKeys.all });
    },
  });
  const errors = form.formState.errors;
  return (
    <section aria-labelledby="samples" className="space-y-3">
      <h2 id="samples" className="text-lg font-semibold text-deep-900">
        Sample results
      </h2>
      <form
        key={formKey}
        className="grid gap-3 sm:grid-cols-3"
        noValidate
        aria-label="Enter a sample result"
        onSubmit={form.handleSubmit((v) => add.mutate(v))}
      >
        <TextField label="Taken at" type="datetime-local" {...form.register('sampledAt')} error={errors.sampledAt?.message} />
        <TextField
          label="Result (per 100 mL)"
          type="number"
          step="any"
          hint={zone.indicatorStandard != null ? `Passes at or under ${zone.indicatorStandard}.` : undefined}
          {...form.register('indicator', { setValueAs: (v) => (v === '' ? undefined : Number(v)) })}
          error={errors.indicator?.message}
        />
        <TextField label="Notes (optional)" {...form.register('notes')} />
        <div>
          <Button type="submit" disabled={add.isPending}>
            {add.isPending ? 'Saving…' : 'Enter the result'}
          </Button>
        </div>
      </form>
      {add.isError && (
        <Notice tone="problem" title="Not saved">
          {(add.error as Error).message}
        </Notice>
      )}
      {samples.isPending ? (
        <Loading what="Loading sample results…" />
      ) : samples.isError ? (
        <LoadError error={samples.error} retry={() => samples.refetch()} />
      ) : samples.data.items.length === 0 ? (
        <Empty title="No sample results yet" />
      ) : (
        <table aria-label="Sample results" className="w-full border-collapse bg-white text-sm tabular-nums">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Taken</th>
              <th className="p-2 text-right">Result</th>
              <th className="p-2">Against the standard</th>
              <th className="p-2">Notes</th>
            </tr>
          </thead>
          <tbody>
            {samples.data.items.map((s) => (
              <tr key={s.id} className="border-b border-shell-100">
                <td className="p-2">{fmtWhen(s.sampledAt)}</td>
                <td className="p-2 text-right">{fmtNumber(s.indicator, s.indicator < 10 ? 1 : 0)} per 100 mL</td>
                <td className="p-2">{s.passed ? `Passes (at or under ${s.standard})` : `Fails (over ${s.standard})`}</td>
                <td className="p-2">{s.notes ?? ''}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

function ZoneNotices({ zoneId }: { zoneId: string }) {
  const notices = useQuery(zoneKeys.zoneNotices(zoneId));
  return (
    <section aria-labelledby="zone-notices" className="space-y-3">
      <h2 id="zone-notices" className="text-lg font-semibold text-deep-900">
        Notices
      </h2>
      {notices.isPending ? (
        <Loading what="Loading notices…" />
      ) : notices.isError ? (
        <LoadError error={notices.error} retry={() => notices.refetch()} />
      ) : notices.data.items.length === 0 ? (
        <Empty title="No notices for this zone yet" />
      ) : (
        <ol aria-label="Notices for this zone" className="space-y-2">
          {notices.data.items.map((n) => (
            <li key={n.id} className="rounded-md border border-shell-200 bg-white p-3 text-sm">
              <p className="font-semibold">
                {n.kind === 'closure' ? 'Closure' : 'Reopening'} · {fmtWhen(n.issuedAt)}
              </p>
              <p className="text-shell-700">
                {n.recipients} growers told; {n.emailsSent} e-mails sent{n.issuedBy ? ` · by ${n.issuedBy}` : ''}
              </p>
              {n.message && <p className="mt-1">{n.message}</p>}
            </li>
          ))}
        </ol>
      )}
      <p className="text-xs text-shell-700">
        Minimum closure and reopening follow the plan values.{' '}
        <Link className="underline" to="/audit-log">
          Audit log
        </Link>
      </p>
    </section>
  );
}
