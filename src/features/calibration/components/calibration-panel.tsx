import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Calibration } from '#shared/schemas/monitoring';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { LoadError, Loading } from '../../../components/ui/states';
import { fmtNumber } from '../../../lib/format';
import { applyCalibration, monitoringKeys, rollbackCalibration } from '../api/monitoring-api';
import { SkillTable } from './skill-table';

const VALUE_ROWS: { key: keyof Calibration['fitted']; label: string; show: (v: number) => string }[] = [
  { key: 'entrainmentCoefficient', label: 'Entrainment coefficient', show: (v) => v.toExponential(2) },
  { key: 't90Hours', label: 'T90 (day and night combined)', show: (v) => `${fmtNumber(v, 1)} h` },
  { key: 'alongshoreShare', label: 'Share carried alongshore', show: (v) => fmtNumber(v, 2) },
  { key: 'nearFieldFreshwaterFraction', label: 'River water leaving the mouth region', show: (v) => `${fmtNumber(v * 100, 0)} %` },
];

/** River settings in plain words, with units. */
function describeSettings(values: Record<string, number>): string {
  const words: Record<string, (v: number) => string> = {
    entrainmentCoefficient: (v) => `entrainment coefficient ${v.toExponential(2)}`,
    mixingLength: (v) => `mixing length ${fmtNumber(v / 1000, 1)} km`,
    t90DayHours: (v) => `T90 by day ${fmtNumber(v, 1)} h`,
    t90NightHours: (v) => `T90 by night ${fmtNumber(v, 1)} h`,
    alongshoreShare: (v) => `share carried alongshore ${fmtNumber(v, 2)}`,
    nearFieldFreshwaterFraction: (v) => `river water leaving the mouth region ${fmtNumber(v * 100, 0)} %`,
  };
  return Object.entries(values)
    .map(([k, v]) => (words[k] ? words[k](v) : `${k} ${v}`))
    .join(', ');
}

const STATUS_LABEL: Record<Calibration['status'], string> = {
  fitted: 'Fitted, not applied',
  applied: 'Applied to the river',
  'rolled-back': 'Rolled back',
};

/** One fit: values and agreement before and after, side by side; cautions; apply or roll back. */
export function CalibrationResult({ calibration, riverName }: { calibration: Calibration; riverName: string }) {
  const queryClient = useQueryClient();
  const done = () => queryClient.invalidateQueries({ queryKey: ['monitoring'] });
  const apply = useMutation({ mutationFn: () => applyCalibration(calibration.id), onSuccess: done });
  const rollback = useMutation({ mutationFn: () => rollbackCalibration(calibration.id), onSuccess: done });
  const c = calibration;
  return (
    <article className="space-y-3 rounded-lg border border-deep-300 bg-white p-4" aria-label="Calibration result">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-semibold text-deep-900">
          Fit of {new Date(c.createdAt).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })}
        </h3>
        <span className="rounded border border-shell-300 px-2 py-0.5 text-xs font-semibold">{STATUS_LABEL[c.status]}</span>
      </header>
      <div className="grid gap-4 lg:grid-cols-2">
        <table className="w-full border-collapse text-sm" aria-label="Settings before and after the fit">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Setting</th>
              <th className="p-2">Before the fit</th>
              <th className="p-2">Fitted</th>
            </tr>
          </thead>
          <tbody>
            {VALUE_ROWS.map((r) => {
              const fitted = c.fittedNames.includes(r.key);
              return (
                <tr key={r.key} className="border-b border-shell-100">
                  <th scope="row" className="p-2 text-left font-normal">
                    {r.label}
                  </th>
                  <td className="p-2 tabular-nums">{c.start[r.key] === undefined ? '—' : r.show(c.start[r.key] as number)}</td>
                  <td className="p-2 tabular-nums">
                    {fitted ? <strong>{c.fitted[r.key] === undefined ? '—' : r.show(c.fitted[r.key] as number)}</strong> : <span className="text-shell-700">kept</span>}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        <div className="text-sm">
          <p>
            Applying writes {describeSettings(c.settingsPatch)} into {riverName}’s settings and screens its leases again. Day and night T90
            keep their ratio.
          </p>
          <p className="mt-1 text-shell-700">
            Based on {c.samples} samples over {c.years} years, at flows {fmtNumber(c.flowRange.min, 0)}–{fmtNumber(c.flowRange.max, 0)}{' '}
            m³/s.
          </p>
        </div>
      </div>
      <SkillTable stats={c.before} after={c.after} label="Agreement before and after the fit" />
      <Notice tone="info" title="What this fit rests on">
        <ul className="list-disc space-y-1 pl-5">
          {c.cautions.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
      </Notice>
      <div className="flex flex-wrap items-center gap-2">
        {c.status === 'fitted' && c.canApply && (
          <Button onClick={() => apply.mutate()} disabled={apply.isPending}>
            {apply.isPending ? 'Applying and re-screening…' : `Apply to ${riverName}`}
          </Button>
        )}
        {c.status === 'applied' && c.canApply && (
          <Button variant="secondary" onClick={() => rollback.mutate()} disabled={rollback.isPending}>
            {rollback.isPending ? 'Restoring and re-screening…' : 'Roll back to the previous values'}
          </Button>
        )}
        {!c.canApply && c.status === 'fitted' && (
          <p className="text-sm text-shell-700">
            Only the river’s creator, a regulator of its jurisdiction or an admin can apply a fit. They can see this one.
          </p>
        )}
      </div>
      {apply.isError && (
        <Notice tone="problem" title="Not applied">
          {apply.error.message}
        </Notice>
      )}
      {rollback.isError && (
        <Notice tone="problem" title="Not rolled back">
          {rollback.error.message}
        </Notice>
      )}
      {c.status === 'applied' && c.previous && <p className="text-sm text-shell-700">Replaced: {describeSettings(c.previous)}.</p>}
    </article>
  );
}

/** The river's fits, newest first. */
export function CalibrationHistory({ riverId, riverName }: { riverId: string; riverName: string }) {
  const list = useQuery(monitoringKeys.calibrations(riverId));
  if (list.isPending) return <Loading what="Loading earlier fits…" />;
  if (list.isError) return <LoadError error={list.error} retry={() => list.refetch()} />;
  if (!list.data.items.length) return <p className="text-sm text-shell-700">No fit has been run for {riverName} yet.</p>;
  return (
    <div className="space-y-4">
      {list.data.items.slice(0, 3).map((c) => (
        <CalibrationResult key={c.id} calibration={c} riverName={riverName} />
      ))}
      {list.data.items.length > 3 && <p className="text-sm text-shell-700">{list.data.items.length - 3} older fits are not shown.</p>}
    </div>
  );
}
