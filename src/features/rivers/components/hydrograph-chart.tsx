import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Brush, CartesianGrid, Line, LineChart, ResponsiveContainer, Tooltip, XAxis, YAxis } from 'recharts';
import { LoadError, Loading } from '../../../components/ui/states';
import { fmtNumber } from '../../../lib/format';
import { riverKeys } from '../api/rivers-api';

const day = (t: number) => new Date(t).toISOString().slice(0, 10);

/** The whole record (thinned to its highest flows by the server), zoomable with the brush below. */
export function HydrographChart({ riverId }: { riverId: string }) {
  const q = useQuery(riverKeys.readings(riverId));
  const [log, setLog] = useState(false);
  if (q.isPending) return <Loading what="Loading the flow record…" />;
  if (q.isError) return <LoadError error={q.error} retry={() => q.refetch()} />;
  const data = q.data.points.map((p) => ({ t: Date.parse(p.t), q: log && p.q <= 0 ? null : p.q }));
  return (
    <figure className="m-0" aria-label="Hydrograph: river flow through the record">
      <div className="mb-2 flex items-center gap-2 text-sm">
        <input id="hydro-log" type="checkbox" checked={log} onChange={(e) => setLog(e.target.checked)} />
        <label htmlFor="hydro-log">Log scale for the hydrograph</label>
        <span className="text-xs text-shell-700">Drag the handles under the chart to zoom into a period.</span>
      </div>
      <div style={{ height: 300 }} className="w-full" data-testid="hydrograph">
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data} margin={{ top: 8, right: 24, bottom: 8, left: 16 }}>
            <CartesianGrid stroke="#e9e9e7" />
            <XAxis dataKey="t" type="number" scale="time" domain={['dataMin', 'dataMax']} tickFormatter={(t: number) => day(t).slice(0, 7)} fontSize={11} />
            <YAxis
              scale={log ? 'log' : 'auto'}
              domain={log ? ['auto', 'auto'] : [0, 'auto']}
              allowDataOverflow={log}
              fontSize={11}
              tickFormatter={(v: number) => fmtNumber(v, 0)}
              label={{ value: 'Flow (m³/s)', angle: -90, position: 'insideLeft', fontSize: 11, fill: '#4b4c48', dy: 40 }}
            />
            <Tooltip labelFormatter={(t) => day(Number(t))} formatter={(v) => [`${fmtNumber(v as number, 1)} m³/s`, 'Flow']} />
            <Line dataKey="q" stroke="#173d61" strokeWidth={1} dot={false} isAnimationActive={false} connectNulls={false} />
            <Brush dataKey="t" height={28} stroke="#2e5b86" tickFormatter={(t: number) => day(t)} />
          </LineChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
