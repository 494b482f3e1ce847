import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { ScreeningRow } from '../../../lib/exposure-api';
import { fmtNumber, fmtSalinity } from '../../../lib/format';

const TICKS = [2, 5, 10, 25, 50, 100, 200, 500];

function Tick({ x, y, payload }: { x?: number; y?: number; payload?: { value: number } }) {
  const n = payload?.value ?? 0;
  return (
    <g transform={`translate(${x},${y})`}>
      <text y={12} textAnchor="middle" fontSize={11} fill="#22231f">
        1-in-{n}
      </text>
      <text y={25} textAnchor="middle" fontSize={10} fill="#4b4c48">
        {fmtNumber(100 / n, n > 100 ? 1 : 0)}% AEP
      </text>
    </g>
  );
}

/** Lowest salinity over the lease against how rare the flood is (return period on a log axis). */
export function SalinityChart({
  rows,
  limit,
  limitLabel,
  seaSalinity,
}: {
  rows: ScreeningRow[];
  limit?: number;
  limitLabel: string;
  seaSalinity?: number;
}) {
  const points = rows
    .filter((r) => r.aep !== null && r.aep > 0)
    .map((r) => ({ returnPeriod: 1 / (r.aep as number), salinity: r.lowestSalinity, name: r.scenarioName }))
    .sort((a, b) => a.returnPeriod - b.returnPeriod);
  if (!points.length)
    return <p className="text-sm text-shell-700">This river has no flood-frequency scenarios yet, so there is nothing to plot.</p>;
  if (points.every((p) => p.salinity === null)) {
    return (
      <p className="text-sm text-shell-700">
        River water does not reach the lease at any of these floods, so salinity over it stays at the sea’s.
      </p>
    );
  }
  const min = points[0].returnPeriod;
  const max = points[points.length - 1].returnPeriod;
  const ticks = TICKS.filter((t) => t >= min * 0.99 && t <= max * 1.01);
  const top = Math.ceil(Math.max(seaSalinity ?? 0, ...points.map((p) => p.salinity ?? 0)) / 5) * 5 || 35;
  return (
    <figure className="m-0" aria-label="Lowest salinity over the lease against flood return period">
      <div style={{ height: 280 }} className="w-full">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={points} margin={{ top: 12, right: 24, bottom: 28, left: 8 }}>
            <CartesianGrid stroke="#e9e9e7" />
            <XAxis
              dataKey="returnPeriod"
              type="number"
              scale="log"
              domain={[min, max]}
              ticks={ticks}
              tick={<Tick />}
              interval={0}
              allowDataOverflow
              label={{
                value: 'How rare the flood is (return period)',
                position: 'insideBottom',
                offset: -22,
                fontSize: 11,
                fill: '#4b4c48',
              }}
            />
            <YAxis
              domain={[0, top]}
              tickCount={6}
              fontSize={11}
              label={{ value: 'Lowest salinity (psu)', angle: -90, position: 'insideLeft', fontSize: 11, fill: '#4b4c48', dy: 60 }}
            />
            {limit !== undefined && (
              <ReferenceLine
                y={limit}
                stroke="#4f1a3f"
                strokeDasharray="6 4"
                label={{ value: limitLabel, position: 'insideBottomRight', fontSize: 11, fill: '#4f1a3f' }}
              />
            )}
            <Tooltip
              formatter={(v) => [fmtSalinity(typeof v === 'number' ? v : null), 'Lowest salinity']}
              labelFormatter={(_l, payload) => String(payload?.[0]?.payload?.name ?? '')}
            />
            <Line
              type="monotone"
              dataKey="salinity"
              stroke="#173d61"
              strokeWidth={2}
              dot={{ r: 4, fill: '#173d61' }}
              connectNulls
              isAnimationActive={false}
            />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 text-xs text-shell-700">
        Each point is one flood scenario from the river’s flood-frequency fit. Lower is fresher; below the dashed line the species is under
        sustained stress.
      </figcaption>
    </figure>
  );
}
