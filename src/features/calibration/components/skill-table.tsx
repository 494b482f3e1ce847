import type { Skill } from '#shared/schemas/monitoring';
import { fmtNumber } from '../../../lib/format';

const num = (v: number | null, digits = 2) => (v === null ? '—' : fmtNumber(v, digits));

/** Bias, RMSE and skill per variable; optionally a second set (after a fit) beside the first. */
export function SkillTable({ stats, after, label }: { stats: Skill; after?: Skill; label: string }) {
  const rows: { name: string; unit: string; key: 'salinity' | 'indicator' }[] = [
    { name: 'Salinity', unit: 'psu', key: 'salinity' },
    { name: 'Faecal indicator', unit: 'log10 units', key: 'indicator' },
  ];
  const cols: { title: string; pick: (s: Skill['salinity']) => string }[] = [
    { title: 'Samples', pick: (s) => `${s.n}${s.censored ? ` + ${s.censored} limits (${s.censoredMet} respected)` : ''}` },
    { title: 'Bias', pick: (s) => num(s.bias) },
    { title: 'RMSE', pick: (s) => num(s.rmse) },
    { title: 'Skill score', pick: (s) => num(s.skill) },
  ];
  return (
    <div className="overflow-x-auto rounded-lg border border-sand-200 bg-white">
      <table className="w-full border-collapse text-sm" aria-label={label}>
        <thead>
          <tr className="border-b border-sand-200 text-left">
            <th className="p-2">Variable</th>
            {cols.map((c) => (
              <th key={c.title} className="p-2">
                {c.title}
                {after && c.title !== 'Samples' && <span className="block text-xs font-normal text-shell-700">before → after</span>}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.key} className="border-b border-shell-100">
              <th scope="row" className="p-2 text-left font-semibold">
                {r.name} <span className="text-xs font-normal text-shell-700">({r.unit})</span>
              </th>
              {cols.map((c) => (
                <td key={c.title} className="p-2 tabular-nums">
                  {c.pick(stats[r.key])}
                  {after && c.title !== 'Samples' && (
                    <>
                      {' '}
                      → <strong>{c.pick(after[r.key])}</strong>
                    </>
                  )}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      <p className="px-2 py-1 text-xs text-shell-700">
        Bias is the mean of predicted − measured; the skill score is Nash–Sutcliffe (1 = perfect, 0 = no better than the average of the
        measurements, below 0 = worse). Detection limits are not in bias, RMSE or skill; they count as respected when the prediction lies on
        their side.
      </p>
    </div>
  );
}
