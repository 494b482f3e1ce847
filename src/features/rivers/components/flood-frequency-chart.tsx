import { useMemo, useState } from 'react';
import { Area, CartesianGrid, ComposedChart, Legend, Line, ResponsiveContainer, Scatter, Tooltip, XAxis, YAxis } from 'recharts';
import type { FloodFrequencyResult, FloodQuantile } from '#shared/hydrology/flood-frequency';
import { gevQuantile } from '#shared/hydrology/gev';
import { gumbelQuantile } from '#shared/hydrology/gumbel';
import { logPearson3Quantile } from '#shared/hydrology/log-pearson3';
import { fmtNumber } from '../../../lib/format';

/** Return periods labelled on the probability axis. */
const TICK_PERIODS = [1.01, 1.25, 2, 5, 10, 25, 50, 100, 200, 500];

/**
 * Gumbel reduced variate of an annual exceedance probability, y = −ln(−ln(1 − AEP)): the
 * classic flood-frequency probability axis on which a Gumbel fit is a straight line.
 * Source: (c) common practice (Chow, Maidment & Mays 1988, "extreme value probability paper").
 */
export const reducedVariate = (aep: number) => -Math.log(-Math.log(1 - aep));

export const DISTRIBUTIONS = {
  gev: { label: 'GEV (L-moments)', colour: '#173d61', dash: undefined },
  lp3: { label: 'Log-Pearson III', colour: '#9c7a3f', dash: '8 4' },
  gumbel: { label: 'Gumbel', colour: '#2f7a66', dash: '2 3' },
} as const;
export type DistributionId = keyof typeof DISTRIBUTIONS;

function Tick({ x, y, payload }: { x?: number; y?: number; payload?: { value: number } }) {
  const v = payload?.value ?? 0;
  const aep = 1 - Math.exp(-Math.exp(-v));
  const t = 1 / aep;
  return (
    <g transform={`translate(${x},${y})`}>
      <text y={12} textAnchor="middle" fontSize={11} fill="#22231f">
        {t < 2 ? t.toFixed(2) : fmtNumber(t, 0)} yr
      </text>
      <text y={25} textAnchor="middle" fontSize={10} fill="#4b4c48">
        {fmtNumber(aep * 100, aep < 0.01 ? 1 : 0)}%
      </text>
    </g>
  );
}

/** The band between lower and upper limits, interpolated on the reduced variate between the fitted AEPs. */
function bandAt(quantiles: FloodQuantile[], x: number): [number, number] | undefined {
  const q = quantiles.filter((p) => p.lower !== undefined && p.upper !== undefined).map((p) => ({ x: reducedVariate(p.aep), lo: p.lower!, hi: p.upper! }));
  q.sort((a, b) => a.x - b.x);
  for (let i = 0; i < q.length - 1; i++) {
    if (x >= q[i].x && x <= q[i + 1].x) {
      const f = (x - q[i].x) / (q[i + 1].x - q[i].x);
      return [q[i].lo + f * (q[i + 1].lo - q[i].lo), q[i].hi + f * (q[i + 1].hi - q[i].hi)];
    }
  }
  return undefined;
}

/** Annual peaks at their plotting positions with the three fitted curves and the design distribution's confidence band. */
export function FloodFrequencyChart({ fit, design, unit = 'm³/s' }: { fit: FloodFrequencyResult; design: DistributionId; unit?: string }) {
  const [logFlow, setLogFlow] = useState(false);
  const data = useMemo(() => {
    const lo = reducedVariate(0.99);
    const hi = reducedVariate(0.002);
    const out = [];
    for (let i = 0; i <= 80; i++) {
      const x = lo + ((hi - lo) * i) / 80;
      const aep = 1 - Math.exp(-Math.exp(-x));
      const p = 1 - aep;
      out.push({
        x,
        gev: gevQuantile(fit.gev, p),
        lp3: logPearson3Quantile({ mean: fit.lp3.mean, stdDev: fit.lp3.stdDev, skew: fit.lp3.skewUsed }, p),
        gumbel: gumbelQuantile(fit.gumbel, p),
        band: bandAt(fit[design].quantiles, x),
      });
    }
    return out;
  }, [fit, design]);
  const points = fit.plottingPositions.map((p) => ({ x: reducedVariate(p.aep), peak: p.value, year: p.waterYear }));
  const ticks = TICK_PERIODS.map((t) => reducedVariate(1 / t));
  return (
    <figure className="m-0" aria-label="Flood-frequency chart: annual peak flow against annual exceedance probability">
      <div className="mb-2 flex items-center gap-2 text-sm">
        <input id="ff-log" type="checkbox" checked={logFlow} onChange={(e) => setLogFlow(e.target.checked)} />
        <label htmlFor="ff-log">Log scale for peak flows</label>
      </div>
      <div style={{ height: 360 }} className="w-full" data-testid="flood-frequency-chart">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={data} margin={{ top: 8, right: 24, bottom: 40, left: 16 }}>
            <CartesianGrid stroke="#e9e9e7" />
            <XAxis
              dataKey="x"
              type="number"
              domain={[ticks[0], ticks.at(-1)!]}
              ticks={ticks}
              tick={<Tick />}
              interval={0}
              allowDataOverflow
              label={{ value: 'Return period (years) and annual exceedance probability (AEP)', position: 'insideBottom', offset: -32, fontSize: 11, fill: '#4b4c48' }}
            />
            <YAxis
              type="number"
              scale={logFlow ? 'log' : 'auto'}
              domain={logFlow ? ['auto', 'auto'] : [0, 'auto']}
              allowDataOverflow={logFlow}
              fontSize={11}
              tickFormatter={(v: number) => fmtNumber(v, 0)}
              label={{ value: `Annual peak flow (${unit})`, angle: -90, position: 'insideLeft', fontSize: 11, fill: '#4b4c48', dy: 70 }}
            />
            <Tooltip
              labelFormatter={(v) => {
                const aep = 1 - Math.exp(-Math.exp(-Number(v)));
                return `1-in-${fmtNumber(1 / aep, 1)} years (${fmtNumber(aep * 100, 1)}% AEP)`;
              }}
              formatter={(v, name) => [Array.isArray(v) ? `${fmtNumber(v[0] as number, 0)} – ${fmtNumber(v[1] as number, 0)} ${unit}` : `${fmtNumber(v as number, 0)} ${unit}`, name]}
            />
            <Legend verticalAlign="top" height={28} wrapperStyle={{ fontSize: 12 }} />
            <Area dataKey="band" name={`${Math.round(fit.confidence.level * 100)}% confidence band of the design curve`} stroke="none" fill="#7f9fc0" fillOpacity={0.3} isAnimationActive={false} connectNulls={false} />
            {(Object.keys(DISTRIBUTIONS) as DistributionId[]).map((d) => (
              <Line
                key={d}
                dataKey={d}
                name={`${DISTRIBUTIONS[d].label}${d === design ? ' — design' : ''}`}
                stroke={DISTRIBUTIONS[d].colour}
                strokeDasharray={DISTRIBUTIONS[d].dash}
                strokeWidth={d === design ? 2.5 : 1.5}
                dot={false}
                isAnimationActive={false}
              />
            ))}
            <Scatter data={points} dataKey="peak" name="Annual peaks (Weibull plotting positions)" fill="#22231f" shape="circle" isAnimationActive={false} />
          </ComposedChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 text-xs text-shell-700">
        Each dot is one water year’s highest flow, placed by its rank. The lines are the three fitted distributions; the shaded band is where the design curve could lie
        with the record’s length. Read across at a return period for the design flood.
      </figcaption>
    </figure>
  );
}
