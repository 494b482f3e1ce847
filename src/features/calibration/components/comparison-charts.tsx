import { CartesianGrid, Legend, ReferenceLine, ResponsiveContainer, Scatter, ScatterChart, Tooltip, XAxis, YAxis, ZAxis } from 'recharts';
import type { ComparisonPoint } from '#shared/schemas/monitoring';
import { fmtNumber } from '../../../lib/format';

const MEASURED = '#173d61';
const LIMIT = '#b5651d';
const AXIS = { fontSize: 11, fill: '#4b4c48' };
const FLOOR = 0.5;

type Datum = { x: number; y: number; station: string; date: string };

function split(points: ComparisonPoint[], pick: (p: ComparisonPoint) => { x: number | null; y: number | null } | null) {
  const measured: Datum[] = [];
  const limits: Datum[] = [];
  for (const p of points) {
    const v = pick(p);
    if (!v || v.x === null || v.y === null || !Number.isFinite(v.x) || !Number.isFinite(v.y)) continue;
    const d = { x: v.x, y: v.y, station: p.stationCode, date: p.sampledAt.slice(0, 10) };
    (p.indicatorCensored ? limits : measured).push(d);
  }
  return { measured, limits };
}

function ChartFrame({ label, children }: { label: string; children: React.ReactElement }) {
  return (
    <figure className="m-0 rounded-lg border border-sand-200 bg-white p-3" aria-label={label}>
      <figcaption className="mb-1 text-sm font-semibold text-deep-900">{label}</figcaption>
      <div style={{ height: 260 }} className="w-full">
        <ResponsiveContainer width="100%" height="100%">
          {children}
        </ResponsiveContainer>
      </div>
    </figure>
  );
}

function tooltipFormatter(value: unknown, name: unknown) {
  return [typeof value === 'number' ? fmtNumber(value, Math.abs(value) < 10 ? 2 : 0) : String(value), String(name)];
}

/** Observed against predicted salinity (psu, linear) with the 1:1 line. */

/** The dashed line of perfect agreement (measured = predicted) from `from` to `to` on both axes. */
function oneToOneLine(from: number, to: number) {
  return (
    <ReferenceLine
      segment={[
        { x: from, y: from },
        { x: to, y: to },
      ]}
      stroke="#8a8b86"
      strokeDasharray="4 3"
      ifOverflow="hidden"
    />
  );
}

export function SalinityScatter({ points }: { points: ComparisonPoint[] }) {
  const data = points
    .filter((p) => p.observedSalinity !== null)
    .map((p) => ({ x: p.predictedSalinity, y: p.observedSalinity as number, station: p.stationCode, date: p.sampledAt.slice(0, 10) }));
  const lo = Math.floor(Math.min(...data.map((d) => Math.min(d.x, d.y)), 30) / 5) * 5;
  const hi = Math.ceil(Math.max(...data.map((d) => Math.max(d.x, d.y)), 34) / 5) * 5;
  return (
    <ChartFrame label="Salinity: measured against predicted (psu)">
      <ScatterChart margin={{ top: 8, right: 16, bottom: 28, left: 8 }}>
        <CartesianGrid stroke="#e9e9e7" />
        <XAxis
          type="number"
          dataKey="x"
          name="Predicted"
          domain={[lo, hi]}
          fontSize={11}
          label={{ value: 'Predicted salinity (psu)', position: 'insideBottom', offset: -16, ...AXIS }}
        />
        <YAxis
          type="number"
          dataKey="y"
          name="Measured"
          domain={[lo, hi]}
          fontSize={11}
          label={{ value: 'Measured (psu)', angle: -90, position: 'insideLeft', ...AXIS }}
        />
        <ZAxis range={[28, 28]} />
        {oneToOneLine(lo, hi)}
        <Tooltip formatter={tooltipFormatter} />
        <Scatter isAnimationActive={false} name="Sample" data={data} fill={MEASURED} fillOpacity={0.7} />
      </ScatterChart>
    </ChartFrame>
  );
}

/** Observed against predicted indicator, both on log axes; detection limits drawn as triangles at the limit. */
export function IndicatorScatter({ points, unit }: { points: ComparisonPoint[]; unit: string }) {
  const { measured, limits } = split(points, (p) =>
    p.observedIndicator === null ? null : { x: Math.max(FLOOR, p.predictedIndicator), y: Math.max(FLOOR, p.observedIndicator) },
  );
  const all = [...measured, ...limits];
  const hi = 10 ** Math.ceil(Math.log10(Math.max(10, ...all.map((d) => Math.max(d.x, d.y)))));
  const ticks = [];
  for (let t = 1; t <= hi; t *= 10) ticks.push(t);
  return (
    <ChartFrame label={`Faecal indicator: measured against predicted (${unit}, log scales)`}>
      <ScatterChart margin={{ top: 8, right: 16, bottom: 28, left: 8 }}>
        <CartesianGrid stroke="#e9e9e7" />
        <XAxis
          type="number"
          dataKey="x"
          name="Predicted"
          scale="log"
          domain={[FLOOR, hi]}
          ticks={ticks}
          allowDataOverflow
          fontSize={11}
          label={{ value: 'Predicted (per 100 mL)', position: 'insideBottom', offset: -16, ...AXIS }}
        />
        <YAxis
          type="number"
          dataKey="y"
          name="Measured"
          scale="log"
          domain={[FLOOR, hi]}
          ticks={ticks}
          allowDataOverflow
          fontSize={11}
          label={{ value: 'Measured', angle: -90, position: 'insideLeft', ...AXIS }}
        />
        <ZAxis range={[28, 28]} />
        {oneToOneLine(FLOOR, hi)}
        <Tooltip formatter={tooltipFormatter} />
        <Legend verticalAlign="top" height={24} wrapperStyle={{ fontSize: 11 }} />
        <Scatter isAnimationActive={false} name="Measured count" data={measured} fill={MEASURED} fillOpacity={0.7} />
        <Scatter isAnimationActive={false} name="Detection limit (< or >)" data={limits} fill={LIMIT} shape="triangle" />
      </ScatterChart>
    </ChartFrame>
  );
}

/** Residuals (predicted − measured) against a driver: river flow or distance from the mouth. */
export function ResidualChart({ points, against }: { points: ComparisonPoint[]; against: 'flow' | 'distance' }) {
  const xOf = (p: ComparisonPoint) => (against === 'flow' ? p.flow : p.distanceFromMouth / 1000);
  const salinity = points
    .filter((p) => p.salinityResidual !== null)
    .map((p) => ({ x: xOf(p), y: p.salinityResidual as number, station: p.stationCode, date: p.sampledAt.slice(0, 10) }));
  const indicator = points
    .filter((p) => p.indicatorResidual !== null)
    .map((p) => ({ x: xOf(p), y: p.indicatorResidual as number, station: p.stationCode, date: p.sampledAt.slice(0, 10) }));
  const flows = points.map((p) => p.flow);
  const flowTicks = [1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000, 5000, 10_000].filter(
    (t) => t >= Math.min(...flows) * 0.8 && t <= Math.max(...flows) * 1.25,
  );
  const xLabel = against === 'flow' ? 'River flow on the day (m³/s, log scale)' : 'Distance from the mouth (km)';
  return (
    <ChartFrame label={`Residuals against ${against === 'flow' ? 'river flow' : 'distance from the mouth'}`}>
      <ScatterChart margin={{ top: 8, right: 16, bottom: 28, left: 8 }}>
        <CartesianGrid stroke="#e9e9e7" />
        <XAxis
          type="number"
          dataKey="x"
          name={against === 'flow' ? 'Flow' : 'Distance'}
          scale={against === 'flow' ? 'log' : 'auto'}
          domain={against === 'flow' ? [Math.min(...flows) * 0.8, Math.max(...flows) * 1.25] : [0, 'auto']}
          {...(against === 'flow' ? { ticks: flowTicks, allowDataOverflow: true } : {})}
          fontSize={11}
          label={{ value: xLabel, position: 'insideBottom', offset: -16, ...AXIS }}
        />
        <YAxis
          type="number"
          dataKey="y"
          name="Predicted − measured"
          fontSize={11}
          label={{ value: 'Predicted − measured', angle: -90, position: 'insideLeft', ...AXIS, dy: 60 }}
        />
        <ZAxis range={[24, 24]} />
        <ReferenceLine y={0} stroke="#8a8b86" />
        <Tooltip formatter={tooltipFormatter} />
        <Legend verticalAlign="top" height={24} wrapperStyle={{ fontSize: 11 }} />
        <Scatter isAnimationActive={false} name="Salinity (psu)" data={salinity} fill={MEASURED} fillOpacity={0.6} />
        <Scatter isAnimationActive={false} name="Indicator (log10)" data={indicator} fill={LIMIT} fillOpacity={0.7} shape="diamond" />
      </ScatterChart>
    </ChartFrame>
  );
}
