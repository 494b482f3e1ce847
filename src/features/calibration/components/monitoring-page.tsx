import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect, useId, useState } from 'react';
import { useForm } from 'react-hook-form';
import { type CalibrationCreate, type CalibrationCreateInput, calibrationCreateSchema, type Comparison } from '#shared/schemas/monitoring';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { exposureKeys } from '../../../lib/exposure-api';
import { fmtNumber } from '../../../lib/format';
import { fitCalibration, monitoringKeys } from '../api/monitoring-api';
import { CalibrationHistory } from './calibration-panel';
import { IndicatorScatter, ResidualChart, SalinityScatter } from './comparison-charts';
import { SkillTable } from './skill-table';
import { UploadPanel } from './upload-panel';
import { DownloadLinks } from '../../../components/ui/download-links';

function StationsSummary() {
  const stations = useQuery(monitoringKeys.stations());
  if (stations.isPending) return <Loading what="Loading stations…" />;
  if (stations.isError) return <LoadError error={stations.error} retry={() => stations.refetch()} />;
  const items = stations.data.items;
  if (!items.length) return <Empty title="No monitoring stations yet">Upload your stations, then their samples.</Empty>;
  return (
    <details className="rounded-lg border border-sand-200 bg-white p-3 text-sm">
      <summary className="cursor-pointer font-semibold">
        {items.length} stations you can see, {items.reduce((n, s) => n + s.samples, 0)} samples
      </summary>
      <table className="mt-2 w-full border-collapse" aria-label="Monitoring stations">
        <thead>
          <tr className="border-b border-sand-200 text-left">
            <th className="p-1">Station</th>
            <th className="p-1">Name</th>
            <th className="p-1">Samples</th>
            <th className="p-1">From – to</th>
            <th className="p-1">Uploaded by</th>
          </tr>
        </thead>
        <tbody>
          {items.map((s) => (
            <tr key={s.id} className="border-b border-shell-100">
              <td className="p-1">{s.code}</td>
              <td className="p-1">{s.name ?? '—'}</td>
              <td className="p-1 tabular-nums">{s.samples}</td>
              <td className="p-1 tabular-nums">{s.firstSample ? `${s.firstSample.slice(0, 10)} – ${s.lastSample?.slice(0, 10)}` : '—'}</td>
              <td className="p-1">{s.mine ? 'you' : 'the authority'}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="mt-2">
        <DownloadLinks label="monitoring stations" href={(f) => `/api/v1/stations/export?format=${f}`} />
      </div>
    </details>
  );
}

function OutsideTable({ comparison }: { comparison: Comparison }) {
  if (!comparison.outside.length) return null;
  return (
    <details className="rounded-lg border border-sand-200 bg-white p-3 text-sm">
      <summary className="cursor-pointer font-semibold">{comparison.outside.length} samples outside every plume (not compared)</summary>
      <div className="max-h-72 overflow-y-auto">
        <table className="mt-2 w-full border-collapse" aria-label="Samples outside every plume">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-1">Station</th>
              <th className="p-1">Date</th>
              <th className="p-1">Salinity</th>
              <th className="p-1">Indicator</th>
              <th className="p-1">Why</th>
            </tr>
          </thead>
          <tbody>
            {comparison.outside.map((o) => (
              <tr key={o.sampleId} className="border-b border-shell-100 align-top">
                <td className="p-1">{o.stationCode}</td>
                <td className="p-1 tabular-nums">{o.sampledAt.slice(0, 10)}</td>
                <td className="p-1 tabular-nums">{o.observedSalinity ?? '—'}</td>
                <td className="p-1 tabular-nums">
                  {o.observedIndicator === null
                    ? '—'
                    : `${o.indicatorCensored === 'below' ? '<' : o.indicatorCensored === 'above' ? '>' : ''}${o.observedIndicator}`}
                </td>
                <td className="p-1">{o.reason}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}

function ComparisonView({ riverId, lagDays }: { riverId: string; lagDays: number }) {
  const comparison = useQuery(monitoringKeys.comparison(riverId, lagDays));
  if (comparison.isPending) return <Loading what="Matching each sample with the river's flow that day and the plume at its station…" />;
  if (comparison.isError) return <LoadError error={comparison.error} retry={() => comparison.refetch()} />;
  const c = comparison.data;
  const v = c.values;
  return (
    <div className="space-y-4">
      <Notice tone="info" title="What the comparison rests on">
        <ul className="list-disc space-y-1 pl-5">
          {c.cautions.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
      </Notice>
      {c.points.length === 0 ? (
        <Empty title={`No sample lies in ${c.riverName}'s plume`}>Upload stations and samples from its coast to compare.</Empty>
      ) : (
        <>
          <p className="text-sm text-shell-700">
            {c.points.length} samples in {c.riverName}’s plume
            {c.otherRivers ? `; ${c.otherRivers} more belong to another river’s plume` : ''}. Settings now: entrainment coefficient{' '}
            {v.entrainmentCoefficient === undefined ? '—' : v.entrainmentCoefficient.toExponential(2)}, T90 {fmtNumber(v.t90Hours, 1)} h, alongshore share {fmtNumber(v.alongshoreShare, 2)},
            river water leaving the mouth region {fmtNumber(v.nearFieldFreshwaterFraction * 100, 0)} %.
          </p>
          <SkillTable stats={c.stats} label="Agreement of the plume with the samples" />
          <div className="grid gap-4 lg:grid-cols-2">
            <SalinityScatter points={c.points} />
            <IndicatorScatter points={c.points} unit="per 100 mL" />
            <ResidualChart points={c.points} against="flow" />
            <ResidualChart points={c.points} against="distance" />
          </div>
        </>
      )}
      <OutsideTable comparison={c} />
    </div>
  );
}

/** Monitoring: upload stations and samples, see how well each river's plume matches them, fit, apply, roll back. */
export function MonitoringPage() {
  const ids = { river: useId(), lag: useId(), share: useId(), near: useId() };
  const rivers = useQuery(exposureKeys.rivers());
  const queryClient = useQueryClient();
  const [riverId, setRiverId] = useState('');
  const form = useForm<CalibrationCreateInput, unknown, CalibrationCreate>({
    resolver: zodResolver(calibrationCreateSchema),
    mode: 'onChange',
    defaultValues: { lagDays: 1, fitAlongshoreShare: false, fitNearFieldFraction: true },
  });
  const lagValue = form.watch('lagDays');
  const lagDays = Number.isInteger(lagValue) && (lagValue as number) >= 0 && (lagValue as number) <= 10 ? (lagValue as number) : 1;
  useEffect(() => {
    if (!riverId && rivers.data?.items.length) setRiverId(rivers.data.items[0].id);
  }, [riverId, rivers.data]);
  const river = rivers.data?.items.find((r) => r.id === riverId);
  const fit = useMutation({
    mutationFn: (body: CalibrationCreate) => fitCalibration(riverId, body),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['monitoring', 'calibrations', riverId] }),
  });

  return (
    <div className="space-y-8">
      <PageHeader
        title="Monitoring and calibration"
        question="How well does each river's plume match what was measured at sea, and should its settings change?"
      />
      <Cautions compact />
      <UploadPanel />
      <StationsSummary />

      <section aria-labelledby="compare-heading" className="space-y-3">
        <h2 id="compare-heading" className="text-lg font-semibold text-deep-900">
          2. Compare a river’s plume with the samples
        </h2>
        {rivers.isPending ? (
          <Loading what="Loading rivers…" />
        ) : rivers.isError ? (
          <LoadError error={rivers.error} retry={() => rivers.refetch()} />
        ) : !rivers.data.items.length ? (
          <Empty title="No rivers yet">Add a river with its flow record first; its plume is what the samples are compared with.</Empty>
        ) : (
          <div className="flex flex-wrap items-end gap-4 rounded-lg border border-sand-200 bg-white p-3">
            <div>
              <label htmlFor={ids.river} className="block text-sm font-semibold">
                River
              </label>
              <select
                id={ids.river}
                value={riverId}
                onChange={(e) => setRiverId(e.target.value)}
                className="mt-1 rounded-md border border-shell-300 bg-white px-3 py-2 text-sm"
              >
                {rivers.data.items.map((r) => (
                  <option key={r.id} value={r.id}>
                    {r.name}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor={ids.lag} className="block text-sm font-semibold">
                Flow lag (days before the sample)
              </label>
              <input
                id={ids.lag}
                type="number"
                min={0}
                max={10}
                step={1}
                className="mt-1 w-24 rounded-md border border-shell-300 px-3 py-2 text-sm"
                {...form.register('lagDays', { valueAsNumber: true })}
              />
              {form.formState.errors.lagDays && <p className="text-xs text-[#5c2509]">{form.formState.errors.lagDays.message}</p>}
            </div>
            <p className="max-w-md text-xs text-shell-700">
              Each sample is matched with the largest daily flow of its day and the lag days before (flood water takes time to reach the
              stations).
            </p>
          </div>
        )}
        {river && <ComparisonView riverId={river.id} lagDays={lagDays} />}
      </section>

      {river && (
        <section aria-labelledby="fit-heading" className="space-y-3">
          <h2 id="fit-heading" className="text-lg font-semibold text-deep-900">
            3. Fit {river.name}’s settings to the samples
          </h2>
          <form
            className="flex flex-wrap items-center gap-4 rounded-lg border border-sand-200 bg-white p-3"
            noValidate
            onSubmit={form.handleSubmit((v) => fit.mutate(v))}
          >
            <p className="text-sm">Always fitted: entrainment coefficient (how fast the coastal current dilutes; its dilution length grows with flow) and T90.</p>
            <label htmlFor={ids.near} className="flex items-center gap-2 text-sm">
              <input id={ids.near} type="checkbox" {...form.register('fitNearFieldFraction')} />
              Also fit the river water leaving the mouth region
            </label>
            <label htmlFor={ids.share} className="flex items-center gap-2 text-sm">
              <input id={ids.share} type="checkbox" {...form.register('fitAlongshoreShare')} />
              Also fit the share carried alongshore
            </label>
            <Button type="submit" disabled={fit.isPending}>
              {fit.isPending ? 'Fitting…' : 'Run the fit'}
            </Button>
          </form>
          {fit.isError && (
            <Notice tone="problem" title="The fit did not run">
              {fit.error.message}
            </Notice>
          )}
          <CalibrationHistory riverId={river.id} riverName={river.name} />
        </section>
      )}
    </div>
  );
}
