import { useQuery } from '@tanstack/react-query';
import type { FeatureCollection, Geometry } from 'geojson';
import { useMemo, useRef, useState } from 'react';
import { Link, useParams } from 'react-router-dom';
import { LazyVectorMap, type MapLayerSpec, mapImageOf } from '../../../components/map/lazy-vector-map';
import { Button } from '../../../components/ui/button';
import { AnnualRatingExplainer, chanceWords, closureDaysWords } from '../../../components/ui/annual-rating';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { RatingBadge, RatingLegend, ratingRank } from '../../../components/ui/rating-badge';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { bandsToDraw } from '../../../lib/bands';
import { exposureKeys, type ScreeningRow } from '../../../lib/exposure-api';
import { fmtArea, fmtFlow, fmtNumber, speciesName, speciesPlural } from '../../../lib/format';
import { orderScenarios, speciesBandId, useLeaseReport } from '../api/use-lease-report';
import { useMe } from '../../account/api/get-me';
import { ExposureTable } from './exposure-table';
import { LeaseNotes } from './lease-notes';
import { LeaseShares } from './lease-shares';
import { SalinityChart } from './salinity-chart';

/** The worst-rated scenario, the most frequent first among equals: the one a grower meets soonest. */
function headline(rows: ScreeningRow[]): ScreeningRow | undefined {
  let best: ScreeningRow | undefined;
  for (const r of rows) if (!best || ratingRank(r.rating) > ratingRank(best.rating)) best = r;
  return best;
}

export function LeaseReportPage() {
  const { id = '' } = useParams();
  const { lease, screenings, rivers } = useLeaseReport(id);
  const me = useMe();
  const [riverChoice, setRiverChoice] = useState<string>();
  const [scenarioChoice, setScenarioChoice] = useState<string>();
  const [pdfState, setPdfState] = useState<'idle' | 'working' | 'failed'>('idle');
  const mapBox = useRef<HTMLDivElement>(null);

  const byRiver = useMemo(() => {
    const m = new Map<string, ScreeningRow[]>();
    for (const r of screenings.data?.items ?? []) m.set(r.riverId, [...(m.get(r.riverId) ?? []), r]);
    return [...m.entries()]
      .map(([riverId, rows]) => ({
        riverId,
        riverName: rows[0].riverName,
        rows: orderScenarios(rows),
        worst: headline(orderScenarios(rows)),
      }))
      .sort((a, b) => ratingRank(b.worst?.rating) - ratingRank(a.worst?.rating) || a.riverName.localeCompare(b.riverName));
  }, [screenings.data]);

  const river = byRiver.find((r) => r.riverId === riverChoice) ?? byRiver[0];
  const rows = river?.rows ?? [];
  const selected = rows.find((r) => r.scenarioId === scenarioChoice) ?? river?.worst;
  const bandId = speciesBandId(selected);
  const riverSettings = rivers.data?.items.find((r) => r.id === river?.riverId);

  const land = useQuery(exposureKeys.land());
  const footprint = useQuery({
    ...exposureKeys.footprint(river?.riverId ?? '', { scenarioId: selected?.scenarioId ?? '' }),
    enabled: Boolean(river && selected),
  });

  const layers = useMemo<MapLayerSpec[]>(() => {
    const out: MapLayerSpec[] = [];
    if (land.data?.features.length)
      out.push({ id: 'land', label: 'Land', data: land.data, fill: 'rgba(234,220,191,0.9)', stroke: '#cfb27c', strokeWidth: 1 });
    if (footprint.data) {
      for (const b of bandsToDraw(footprint.data, bandId)) {
        out.push({
          id: b.id,
          label: b.style.label,
          data: { type: 'FeatureCollection', features: [b.feature] },
          fill: b.style.fill,
          stroke: b.style.stroke,
          dashed: b.style.dashed,
          strokeWidth: b.id === 'path' ? 2 : 1.5,
        });
      }
    }
    if (lease.data?.geometry) {
      const fc: FeatureCollection = {
        type: 'FeatureCollection',
        features: [{ type: 'Feature', properties: { label: lease.data.leaseId }, geometry: lease.data.geometry as Geometry }],
      };
      out.push({
        id: 'lease',
        label: `Lease ${lease.data.leaseId}`,
        data: fc,
        fill: 'rgba(255,255,255,0.55)',
        stroke: '#22231f',
        strokeWidth: 3,
        labelProperty: 'label',
      });
    }
    return out;
  }, [land.data, footprint.data, lease.data, bandId]);

  if (lease.isPending || screenings.isPending) return <Loading what="Loading the lease and its screenings…" />;
  if (lease.isError) return <LoadError error={lease.error} retry={() => lease.refetch()} />;
  if (screenings.isError) return <LoadError error={screenings.error} retry={() => screenings.refetch()} />;
  const l = lease.data;
  const limit = selected?.numbers.chronicLowerSalinity;

  const inputs: [string, string][] = [];
  if (river) {
    const s = (riverSettings?.settings ?? {}) as Record<string, unknown>;
    const num = (k: string, unit: string, d = 1) => (typeof s[k] === 'number' ? `${fmtNumber(s[k] as number, d)}${unit}` : 'default');
    inputs.push(['River', `${river.riverName}${s.gaugeName ? ` (gauge: ${s.gaugeName})` : ''}`]);
    inputs.push([
      'Flows and durations',
      rows.map((r) => `${r.scenarioName}: ${fmtFlow(r.discharge)} for ${fmtNumber(r.durationHours, 0)} h`).join('; '),
    ]);
    inputs.push([
      'Mouth',
      `${num('mouthWidth', ' m', 0)} wide, ${num('mouthDepth', ' m', 1)} deep; shelf slope ${num('shelfSlope', '', 3)}`,
    ]);
    inputs.push([
      'Water',
      `river salinity ${num('riverSalinity', ' psu')}, sea salinity ${num('seaSalinity', ' psu')}; river ${num('riverTemperature', ' °C')}, sea ${num('seaTemperature', ' °C')}`,
    ]);
    inputs.push([
      'Mixing and die-off',
      `entrainment coefficient ${typeof s.entrainmentCoefficient === 'number' ? s.entrainmentCoefficient.toExponential(2) : 'default'} (the dilution length grows with flow); T90 ${num('t90DayHours', ' h', 0)} by day, ${num('t90NightHours', ' h', 0)} by night`,
    ]);
    if (riverSettings?.defaultsUsed.length) inputs.push(['Still on defaults', riverSettings.defaultsUsed.join(', ')]);
    inputs.push(['Model version', selected?.modelVersion ?? '—']);
  }

  async function downloadPdf() {
    if (!river) return;
    setPdfState('working');
    try {
      const { buildLeaseReportPdf } = await import('./report-pdf');
      const map = await mapImageOf(mapBox.current).catch(() => null);
      const blob = await buildLeaseReportPdf({ lease: l, riverName: river.riverName, rows, selected, speciesBand: bandId, inputs, map });
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = `brackline-${l.leaseId}-${river.riverName.toLowerCase().replace(/\W+/g, '-')}.pdf`;
      document.body.append(a);
      a.click();
      a.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
      setPdfState('idle');
    } catch {
      setPdfState('failed');
    }
  }

  return (
    <article className="space-y-6" data-testid="lease-report">
      <nav className="no-print text-sm">
        <Link to="/leases" className="text-deep-700 underline">
          ← All leases
        </Link>
      </nav>
      <PageHeader
        title={`Lease ${l.leaseId}`}
        question={`How exposed is ${l.leaseId} to flood water?`}
        actions={
          <span className="no-print flex gap-2">
            <Button variant="secondary" onClick={() => window.print()}>
              Print
            </Button>
            <Button onClick={downloadPdf} disabled={!river || pdfState === 'working'}>
              {pdfState === 'working' ? 'Building the PDF…' : 'Download PDF'}
            </Button>
          </span>
        }
      />
      {pdfState === 'failed' && <Notice tone="problem">The PDF could not be built. Try again, or print the page instead.</Notice>}

      <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-5">
        {[
          ['Holder', l.holder ?? '—'],
          ['Species', speciesName(l.species)],
          ['Status', l.status === 'held' ? 'Held' : 'Candidate'],
          ['Area', fmtArea(l.areaM2)],
          ['Account', l.ownerName ?? '—'],
        ].map(([k, v]) => (
          <div key={k}>
            <dt className="text-xs text-shell-700">{k}</dt>
            <dd className="font-semibold">{v}</dd>
          </div>
        ))}
      </dl>

      {!river ? (
        <Empty title="This lease has not been screened yet">
          No river near it has flood scenarios yet, or screening is still running. Screenings appear here once a river with a flow record
          covers this coast.
        </Empty>
      ) : (
        <>
          {l.annualRating && (
            <section aria-labelledby="yearly" className="space-y-2 rounded-lg border border-sand-200 bg-white p-4">
              <h2 id="yearly" className="text-sm font-semibold text-shell-700">
                Yearly rating, every river
              </h2>
              <div className="flex flex-wrap items-center gap-3">
                <RatingBadge rating={l.annualRating} size="lg" />
                <span>
                  {closureDaysWords(l.closureDaysPerYear)} a year with the faecal indicator above the standard · chance a year of a harmful
                  salinity event: {chanceWords(l.harmfulSalinityChancePerYear).toLowerCase()}
                </span>
              </div>
              <AnnualRatingExplainer />
            </section>
          )}
          <section aria-labelledby="answer" className="rounded-lg border border-sand-200 bg-white p-4">
            <div className="flex flex-wrap items-end justify-between gap-4">
              <div>
                <h2 id="answer" className="text-sm font-semibold text-shell-700">
                  Worst rating from {river.riverName}
                </h2>
                <div className="mt-1 flex flex-wrap items-center gap-3">
                  <RatingBadge rating={river.worst?.rating} size="lg" />
                  <span>
                    at the {river.worst?.scenarioName} ({fmtFlow(river.worst?.discharge ?? 0)})
                  </span>
                </div>
              </div>
              {byRiver.length > 1 && (
                <label className="no-print flex flex-col gap-1 text-sm font-semibold">
                  River
                  <select
                    className="rounded-md border border-shell-300 bg-white px-3 py-2 font-normal"
                    value={river.riverId}
                    onChange={(e) => {
                      setRiverChoice(e.target.value);
                      setScenarioChoice(undefined);
                    }}
                  >
                    {byRiver.map((r) => (
                      <option key={r.riverId} value={r.riverId}>
                        {r.riverName} (worst: {r.worst ? r.worst.rating : 'not screened'})
                      </option>
                    ))}
                  </select>
                </label>
              )}
            </div>
          </section>

          <Cautions compact />

          <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
            <section aria-labelledby="map-title" className="space-y-2">
              <div className="flex flex-wrap items-end justify-between gap-2">
                <h2 id="map-title" className="font-semibold text-deep-900">
                  Where the water goes at the {selected?.scenarioName}
                </h2>
                <label className="no-print flex items-center gap-2 text-sm">
                  Flood
                  <select
                    className="rounded-md border border-shell-300 bg-white px-2 py-1"
                    value={selected?.scenarioId}
                    onChange={(e) => setScenarioChoice(e.target.value)}
                  >
                    {rows.map((r) => (
                      <option key={r.scenarioId} value={r.scenarioId}>
                        {r.scenarioName}
                      </option>
                    ))}
                  </select>
                </label>
              </div>
              <div ref={mapBox}>
                {footprint.isError ? (
                  <LoadError error={footprint.error} retry={() => footprint.refetch()} />
                ) : (
                  <LazyVectorMap
                    layers={layers}
                    height={360}
                    fitTo={['lease']}
                    maxZoom={13}
                    drawnKey={footprint.data?.properties.footprintId}
                    ariaLabel={`Map of lease ${l.leaseId} with the plume bands of the ${selected?.scenarioName ?? 'chosen flood'}`}
                  />
                )}
              </div>
            </section>
            <section aria-labelledby="why" className="space-y-3">
              <h2 id="why" className="font-semibold text-deep-900">
                Why <RatingBadge rating={selected?.rating} size="sm" /> at the {selected?.scenarioName}
              </h2>
              <ul className="list-disc space-y-2 pl-5 text-sm" data-testid="reasons">
                {selected?.reasons.map((reason) => (
                  <li key={reason}>{reason}</li>
                ))}
              </ul>
              <p className="text-xs text-shell-700">
                The rating weighs how much of the lease the water covers, how far salinity falls below what {speciesPlural(l.species)}{' '}
                tolerate or how far the faecal indicator rises above the standard, and for how long.
              </p>
            </section>
          </div>

          <section aria-labelledby="table-title" className="space-y-2">
            <h2 id="table-title" className="font-semibold text-deep-900">
              Exposure at each flood of {river.riverName}
            </h2>
            <div className="flex flex-wrap items-center justify-between gap-2 text-xs text-shell-700">
              <span>
                “Under the species’ limit” is the share of the lease where salinity falls below{' '}
                {limit !== undefined ? `${limit} psu` : 'the limit'}, the sustained limit for {speciesPlural(l.species)}.
              </span>
              <RatingLegend />
            </div>
            <ExposureTable rows={rows} selectedId={selected?.scenarioId} onSelect={setScenarioChoice} />
          </section>

          <section aria-labelledby="chart-title" className="space-y-2 break-inside-avoid">
            <h2 id="chart-title" className="font-semibold text-deep-900">
              How fresh the water over the lease gets as floods get rarer
            </h2>
            <SalinityChart
              rows={rows}
              limit={limit}
              limitLabel={`Sustained limit for ${speciesPlural(l.species)} (${limit ?? ''} psu)`}
              seaSalinity={typeof riverSettings?.settings.seaSalinity === 'number' ? riverSettings.settings.seaSalinity : undefined}
            />
          </section>

          <section aria-labelledby="inputs-title" className="space-y-2 break-inside-avoid">
            <h2 id="inputs-title" className="font-semibold text-deep-900">
              What went in
            </h2>
            <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[12rem_1fr]">
              {inputs.map(([k, v]) => (
                <div key={k} className="contents">
                  <dt className="text-shell-700">{k}</dt>
                  <dd>{v}</dd>
                </div>
              ))}
            </dl>
            {footprint.data?.properties.warnings.length ? (
              <details className="text-sm">
                <summary className="cursor-pointer font-semibold">
                  Model notes for this flood ({footprint.data.properties.warnings.length})
                </summary>
                <ul className="mt-1 list-disc space-y-1 pl-5 text-shell-700">
                  {footprint.data.properties.warnings.map((w) => (
                    <li key={w}>{w}</li>
                  ))}
                </ul>
              </details>
            ) : null}
          </section>
        </>
      )}

      {l.ownerId === me.data?.id && <LeaseShares leaseId={l.id} leaseCode={l.leaseId} />}
      <LeaseNotes leaseId={l.id} canWrite={l.ownerId === me.data?.id || me.data?.role === 'adviser'} />

      <Cautions />
    </article>
  );
}
