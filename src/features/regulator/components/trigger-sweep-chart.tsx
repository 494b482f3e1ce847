import { CartesianGrid, Line, LineChart, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import type { TriggerSweep } from '#shared/schemas/zones';
import { fmtFlow, fmtNumber } from '../../../lib/format';

const TICKS = [0.1, 0.3, 1, 3, 10, 30, 100, 300, 1000, 3000, 10000, 30000];

/** Share of the zone over the indicator standard against river flow (log axis), with the plan's and the model's triggers. */
export function TriggerSweepChart({ sweep }: { sweep: TriggerSweep }) {
  const data = sweep.curve.map((p) => ({ discharge: p.discharge, percent: p.fraction * 100 }));
  const min = data[0].discharge;
  const max = data[data.length - 1].discharge;
  const ticks = TICKS.filter((t) => t >= min && t <= max);
  return (
    <figure
      className="m-0"
      aria-label={`Share of ${sweep.zoneName} with the indicator above ${sweep.indicatorStandard} per 100 mL against ${sweep.riverName} flow`}
    >
      <div style={{ height: 300 }} className="w-full">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 24, right: 24, bottom: 28, left: 8 }}>
            <CartesianGrid stroke="#e9e9e7" />
            <XAxis
              dataKey="discharge"
              type="number"
              scale="log"
              domain={[min, max]}
              ticks={ticks}
              interval={0}
              allowDataOverflow
              fontSize={11}
              tickFormatter={(v: number) => fmtNumber(v, v < 1 ? 1 : 0)}
              label={{
                value: `${sweep.riverName} flow (m³/s, log scale)`,
                position: 'insideBottom',
                offset: -20,
                fontSize: 11,
                fill: '#4b4c48',
              }}
            />
            <YAxis
              domain={[0, 100]}
              ticks={[0, 25, 50, 75, 100]}
              fontSize={11}
              tickFormatter={(v: number) => `${v}%`}
              label={{ value: 'Share of zone over standard', angle: -90, position: 'insideLeft', fontSize: 11, fill: '#4b4c48', dy: 80 }}
            />
            <Tooltip
              formatter={(v) => [`${fmtNumber(Number(v), 0)}%`, 'Share of zone over the standard']}
              labelFormatter={(v) => fmtFlow(Number(v))}
            />
            {sweep.share > 0 && (
              <ReferenceLine
                y={sweep.share * 100}
                stroke="#4b4c48"
                strokeDasharray="2 3"
                label={{ value: 'Chosen share', fontSize: 10, position: 'right' }}
              />
            )}
            {sweep.suggestedTrigger != null && (
              <ReferenceLine
                x={sweep.suggestedTrigger}
                stroke="#4f1a3f"
                strokeDasharray="6 4"
                label={{ value: `Model: ${fmtFlow(sweep.suggestedTrigger)}`, fontSize: 11, position: 'top', fill: '#4f1a3f' }}
              />
            )}
            {sweep.planTrigger != null && sweep.planTrigger >= min && sweep.planTrigger <= max && (
              <ReferenceLine
                x={sweep.planTrigger}
                stroke="#0c2238"
                strokeWidth={2}
                label={{ value: `Plan: ${fmtFlow(sweep.planTrigger)}`, fontSize: 11, position: 'insideTopRight', fill: '#0c2238' }}
              />
            )}
            <Line type="monotone" dataKey="percent" stroke="#173d61" strokeWidth={2} dot={false} isAnimationActive={false} />
          </LineChart>
        </ResponsiveContainer>
      </div>
      <figcaption className="mt-1 text-xs text-shell-700">{sweep.note}</figcaption>
    </figure>
  );
}
