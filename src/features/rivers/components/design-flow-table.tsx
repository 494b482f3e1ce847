import type { FloodFrequencyResult } from '#shared/hydrology/flood-frequency';
import { Notice } from '../../../components/ui/notice';
import { fmtNumber } from '../../../lib/format';
import { DISTRIBUTIONS, type DistributionId } from './flood-frequency-chart';

/** Design flows per return period for each distribution, with the confidence limits and the engine's warnings. */
export function DesignFlowTable({ fit, design }: { fit: FloodFrequencyResult; design: DistributionId }) {
  const ids = Object.keys(DISTRIBUTIONS) as DistributionId[];
  const aeps = fit.gev.quantiles.map((q) => q.aep);
  const cell = (d: DistributionId, aep: number) => {
    const q = fit[d].quantiles.find((x) => Math.abs(x.aep - aep) < 1e-9);
    if (!q) return '—';
    const range = q.lower !== undefined && q.upper !== undefined ? ` (${fmtNumber(q.lower, 0)}–${fmtNumber(q.upper, 0)})` : '';
    return `${fmtNumber(q.discharge, 0)}${range}`;
  };
  return (
    <div className="space-y-3">
      <div className="overflow-x-auto">
        <table className="w-full border-collapse bg-white text-sm tabular-nums" data-testid="design-flows">
          <caption className="p-2 text-left font-semibold text-deep-900">
            Design flows (m³/s) with {Math.round(fit.confidence.level * 100)}% confidence limits, from {fit.n} annual peaks
          </caption>
          <thead>
            <tr className="border-b border-shell-300 text-left">
              <th scope="col" className="p-2">Flood</th>
              <th scope="col" className="p-2">AEP</th>
              {ids.map((d) => (
                <th key={d} scope="col" className={`p-2 ${d === design ? 'bg-deep-50' : ''}`}>
                  {DISTRIBUTIONS[d].label}
                  {d === design ? ' (design)' : ''}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {aeps.map((aep) => (
              <tr key={aep} className="border-t border-shell-100">
                <th scope="row" className="p-2 text-left font-semibold">1-in-{fmtNumber(1 / aep, 0)} years</th>
                <td className="p-2">{fmtNumber(aep * 100, 1)}%</td>
                {ids.map((d) => (
                  <td key={d} className={`p-2 ${d === design ? 'bg-deep-50 font-semibold' : ''}`}>
                    {cell(d, aep)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-xs text-shell-700">
        GEV and Gumbel limits by parametric bootstrap ({fit.confidence.resamples} resamples); log-Pearson III limits by the Bulletin 17B method. LP3 skew used:{' '}
        {fmtNumber(fit.lp3.skewUsed, 3)}; GEV shape k = {fmtNumber(fit.gev.shape, 3)}.
      </p>
      {fit.warnings.length > 0 && (
        <Notice tone="problem" title="What the fit warns about">
          <ul className="list-disc pl-5">
            {fit.warnings.map((w) => (
              <li key={w}>{w}</li>
            ))}
          </ul>
        </Notice>
      )}
    </div>
  );
}
