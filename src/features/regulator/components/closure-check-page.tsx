import { useMutation, useQuery } from '@tanstack/react-query';
import type { Feature, FeatureCollection } from 'geojson';
import Papa from 'papaparse';
import { useMemo, useState } from 'react';
import type { ClosureCheckResult } from '#shared/schemas/zones';
import { LazyVectorMap, type MapLayerSpec } from '../../../components/map/lazy-vector-map';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { api } from '../../../lib/api-client';
import { bandStyle } from '../../../lib/bands';
import { fmtFlow, fmtNumber, fmtPercent, returnPeriodLabel, speciesName } from '../../../lib/format';
import { runClosureCheck, zoneKeys } from '../api/zones-api';
import { fmtWhen, ZoneStatusBadge } from './zone-status';

/** The bands shown as table columns, in this order (salinity bands per species stay in the CSV). */
const COLUMNS = ['indicator-over-standard', 'plume-edge', 'brackish-margin', 'fresh-core'];

function toCsv(r: ClosureCheckResult): string {
  const bandIds = r.bands.map((b) => b.bandId);
  const rows = [
    ...r.zones.map((z) => ({
      kind: 'zone',
      name: z.name,
      holder: '',
      species: '',
      zones: z.name,
      status: z.status,
      trigger_m3s: z.triggerFlow ?? '',
      at_or_above_trigger: z.atOrAboveTrigger == null ? '' : z.atOrAboveTrigger ? 'yes' : 'no',
      ...Object.fromEntries(bandIds.map((b) => [`fraction_${b}`, (z.bandFractions[b] ?? 0).toFixed(4)])),
    })),
    ...r.leases.map((l) => ({
      kind: 'held lease',
      name: l.leaseId,
      holder: l.holder ?? '',
      species: l.species ?? '',
      zones: l.zones.join('; '),
      status: '',
      trigger_m3s: '',
      at_or_above_trigger: '',
      ...Object.fromEntries(bandIds.map((b) => [`fraction_${b}`, (l.bandFractions[b] ?? 0).toFixed(4)])),
    })),
  ];
  const head = [
    `# Closure check: ${r.riverName}, flow ${r.flow} m3/s (${r.flowSource.kind}${r.flowSource.gaugeCode ? ` ${r.flowSource.gaugeCode} at ${r.flowSource.observedAt}` : ''})`,
    `# Model ${r.modelVersion}; flood held ${r.durationHours} h; computed ${r.computedAt}`,
    '# Screening-level estimates; the authority decides closures.',
  ].join('\n');
  return `${head}\n${Papa.unparse(rows)}\n`;
}

function download(name: string, text: string) {
  const url = URL.createObjectURL(new Blob([text], { type: 'text/csv;charset=utf-8' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

export function ClosureCheckPage() {
  const rivers = useQuery(zoneKeys.rivers());
  const gauges = useQuery(zoneKeys.gauges());
  const [riverId, setRiverId] = useState('');
  const [source, setSource] = useState<'typed' | 'latest-gauge-reading'>('typed');
  const [flow, setFlow] = useState('');
  const check = useMutation({ mutationFn: runClosureCheck });
  const river = riverId || rivers.data?.items[0]?.id || '';
  const riverGauges = gauges.data?.items.filter((g) => g.riverId === river) ?? [];
  const latest = riverGauges.filter((g) => g.latestAt).sort((a, b) => (b.latestAt ?? '').localeCompare(a.latestAt ?? ''))[0];

  return (
    <div className="space-y-6">
      <PageHeader title="Closure check" question="At this river flow, which zones and which held leases does the model put in each band?" />
      <form
        aria-label="Closure check"
        className="flex flex-wrap items-end gap-4 rounded-lg border border-sand-200 bg-white p-4"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          check.mutate({ riverId: river, source, flow: source === 'typed' && flow !== '' ? Number(flow) : undefined });
        }}
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="check-river" className="text-sm font-semibold">
            River
          </label>
          <select
            id="check-river"
            className="rounded-md border border-shell-300 bg-white px-3 py-2"
            value={river}
            onChange={(e) => setRiverId(e.target.value)}
          >
            {rivers.data?.items.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </div>
        <fieldset className="flex flex-col gap-1">
          <legend className="text-sm font-semibold">Flow</legend>
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="source" checked={source === 'typed'} onChange={() => setSource('typed')} /> Type a flow
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              name="source"
              checked={source === 'latest-gauge-reading'}
              onChange={() => setSource('latest-gauge-reading')}
            />{' '}
            Latest gauge reading
            <span className="text-shell-700">
              {latest
                ? `(${latest.code}: ${fmtFlow(latest.latestDischarge ?? 0)} at ${fmtWhen(latest.latestAt)})`
                : riverGauges.length
                  ? '(no reading yet)'
                  : '(no gauge)'}
            </span>
          </label>
        </fieldset>
        {source === 'typed' && (
          <TextField
            label="Flow (m³/s)"
            type="number"
            step="any"
            min="0"
            value={flow}
            onChange={(e) => setFlow(e.target.value)}
            className="w-40"
          />
        )}
        <Button type="submit" disabled={check.isPending || !river}>
          {check.isPending ? 'Checking…' : 'Run the check'}
        </Button>
      </form>
      {check.isPending && <Loading what="Building the plume at this flow and measuring each zone and lease…" />}
      {check.isError && (
        <Notice tone="problem" title="The check could not run">
          {(check.error as Error).message}
        </Notice>
      )}
      {check.data ? (
        <Result r={check.data} />
      ) : (
        !check.isPending && <Empty title="No check yet">Choose a river and a flow, then run the check.</Empty>
      )}
    </div>
  );
}

function Result({ r }: { r: ClosureCheckResult }) {
  const coasts = useQuery({ queryKey: ['coasts'], queryFn: () => api<FeatureCollection>('/coasts'), staleTime: 5 * 60_000 });
  const columns = COLUMNS.filter((c) => r.bands.some((b) => b.bandId === c));
  const bandName = (id: string) => r.bands.find((b) => b.bandId === id)?.name ?? id;
  const layers = useMemo<MapLayerSpec[]>(() => {
    const fc = r.map as FeatureCollection;
    const of = (layer: string) => fc.features.filter((f: Feature) => f.properties?.layer === layer);
    const bands = of('band').filter((f) => columns.includes(String(f.properties?.bandId)));
    const land = (coasts.data?.features ?? []).filter((f) => f.properties?.form === 'land');
    return [
      {
        id: 'land',
        label: 'Land',
        data: { type: 'FeatureCollection', features: land },
        fill: '#e6dcc3',
        stroke: '#9c8a5f',
        strokeWidth: 1,
      },
      ...bands
        .sort((a, b) => bandStyle(String(a.properties?.bandId)).order - bandStyle(String(b.properties?.bandId)).order)
        .map((f) => {
          const s = bandStyle(String(f.properties?.bandId), String(f.properties?.name));
          return {
            id: `band-${f.properties?.bandId}`,
            label: s.label,
            data: { type: 'FeatureCollection' as const, features: [f] },
            fill: s.fill,
            stroke: s.stroke,
            dashed: s.dashed,
          };
        }),
      {
        id: 'zones',
        label: 'Closure zones',
        data: { type: 'FeatureCollection', features: of('zone') },
        fill: 'rgba(0,0,0,0)',
        stroke: '#0c2238',
        strokeWidth: 3,
        labelProperty: 'name',
      },
      {
        id: 'leases',
        label: 'Held leases',
        data: { type: 'FeatureCollection', features: of('lease') },
        fill: 'rgba(156,122,63,0.55)',
        stroke: '#5c4520',
        strokeWidth: 1,
      },
    ];
  }, [r, columns, coasts.data]);

  return (
    <section aria-label="Closure check result" className="space-y-6">
      <div className="rounded-lg border border-sand-200 bg-white p-4">
        <p className="text-lg font-semibold text-deep-900">
          {r.riverName} at {fmtFlow(r.flow)}
          {r.aep != null ? ` · ${fmtNumber(r.aep * 100, r.aep < 0.01 ? 2 : 1)}% AEP (about ${returnPeriodLabel(r.aep)})` : ''}
        </p>
        <p className="text-sm text-shell-700">{r.note}</p>
        <div className="mt-2">
          <Button
            variant="secondary"
            onClick={() => download(`closure-check-${r.riverName.replace(/\W+/g, '-').toLowerCase()}-${Math.round(r.flow)}.csv`, toCsv(r))}
          >
            Export CSV
          </Button>
        </div>
      </div>
      <Cautions compact />
      <h2 className="text-lg font-semibold text-deep-900">Zones</h2>
      {r.zones.length === 0 ? (
        <Empty title="No zone is linked to this river" />
      ) : (
        <table aria-label="Zones at this flow" className="w-full border-collapse bg-white text-sm tabular-nums">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Zone</th>
              <th className="p-2">Status now</th>
              <th className="p-2">Against the plan’s trigger</th>
              {columns.map((c) => (
                <th key={c} className="p-2 text-right">
                  {bandName(c)}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {r.zones.map((z) => (
              <tr key={z.id} className="border-b border-shell-100">
                <td className="p-2 font-semibold">{z.name}</td>
                <td className="p-2">
                  <ZoneStatusBadge status={z.status} />
                </td>
                <td className="p-2">
                  {z.triggerFlow == null
                    ? 'No trigger set'
                    : z.atOrAboveTrigger
                      ? `At or above (${fmtFlow(z.triggerFlow)})`
                      : `Below (${fmtFlow(z.triggerFlow)})`}
                </td>
                {columns.map((c) => (
                  <td key={c} className="p-2 text-right">
                    {fmtPercent(z.bandFractions[c] ?? 0)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <h2 className="text-lg font-semibold text-deep-900">Map</h2>
      <LazyVectorMap
        layers={layers}
        height={460}
        ariaLabel={`Plume bands of ${r.riverName} at ${fmtFlow(r.flow)}, closure zones and held leases`}
        fitTo={['zones', 'leases']}
        drawnKey={r.footprintId}
      />
      <h2 className="text-lg font-semibold text-deep-900">Held leases reached by the plume ({r.leases.length})</h2>
      {r.leases.length === 0 ? (
        <Empty title="The plume reaches no held lease at this flow" />
      ) : (
        <table aria-label="Held leases at this flow" className="w-full border-collapse bg-white text-sm tabular-nums">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Lease</th>
              <th className="p-2">Holder</th>
              <th className="p-2">Species</th>
              <th className="p-2">Zone</th>
              {columns.map((c) => (
                <th key={c} className="p-2 text-right">
                  {bandName(c)}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {r.leases.map((l) => (
              <tr key={l.id} className="border-b border-shell-100">
                <td className="p-2 font-semibold whitespace-nowrap">{l.leaseId}</td>
                <td className="p-2">{l.holder ?? '—'}</td>
                <td className="p-2">{speciesName(l.species)}</td>
                <td className="p-2">{l.zones.length ? l.zones.join(', ') : 'Outside the zones'}</td>
                {columns.map((c) => (
                  <td key={c} className="p-2 text-right">
                    {fmtPercent(l.bandFractions[c] ?? 0)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
