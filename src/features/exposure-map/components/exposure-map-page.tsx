import { BUILTIN_COAST_ATTRIBUTION } from '#shared/cautions';
import { useQuery } from '@tanstack/react-query';
import type { FeatureCollection, Geometry } from 'geojson';
import { useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { LazyVectorMap, type MapLayerSpec, type MapSelection } from '../../../components/map/lazy-vector-map';
import { Cautions } from '../../../components/ui/cautions';
import { PageHeader } from '../../../components/ui/page-header';
import { RATING_COLOURS, RATING_LABEL, RatingBadge, RatingLegend, type Rating } from '../../../components/ui/rating-badge';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { bandsToDraw } from '../../../lib/bands';
import { exposureKeys, type ScreeningRow } from '../../../lib/exposure-api';
import { fmtDays, fmtFlow, fmtIndicator, fmtNumber, fmtPercent, fmtSalinity } from '../../../lib/format';
import { FlowSlider } from './flow-slider';
import { DownloadLinks } from '../../../components/ui/download-links';

function rgba(hex: string, alpha: number): string {
  const n = Number.parseInt(hex.slice(1), 16);
  return `rgba(${(n >> 16) & 255}, ${(n >> 8) & 255}, ${n & 255}, ${alpha})`;
}

const NOT_SCREENED = { fill: 'rgba(255,255,255,0.7)', stroke: '#4b4c48' };

/** Above this many visible leases the map reads them as vector tiles instead of one GeoJSON download. */
export const LEASE_TILE_THRESHOLD = 2000;

/** Lease polygons turn into dots below this zoom, where a 200 m lease is a pixel or two. */
const LEASE_DOTS_BELOW_ZOOM = 11;

function ratingColours(rating: unknown): { fill: string; stroke: string } {
  const c = typeof rating === 'string' && rating in RATING_COLOURS ? RATING_COLOURS[rating as Rating] : null;
  return c ? { fill: rgba(c.fill, 0.9), stroke: c.edge } : NOT_SCREENED;
}

export function ExposureMapPage() {
  const rivers = useQuery(exposureKeys.rivers());
  const [riverChoice, setRiverChoice] = useState<string>();
  const riverId = riverChoice ?? rivers.data?.items.find((r) => r.hasFlowRecord)?.id ?? rivers.data?.items[0]?.id ?? '';
  const scenarios = useQuery({ ...exposureKeys.scenarios(riverId), enabled: Boolean(riverId) });
  const [scenarioChoice, setScenarioChoice] = useState<string | null>();
  const [flow, setFlow] = useState<number | null>(null);
  const [selection, setSelection] = useState<MapSelection | null>(null);

  const list = useMemo(() => [...(scenarios.data?.items ?? [])].sort((a, b) => a.discharge - b.discharge), [scenarios.data]);
  const defaultScenario = list.find((s) => s.aep === 0.1) ?? list.find((s) => s.kind === 'aep') ?? list[0];
  const scenario = flow === null ? (list.find((s) => s.id === scenarioChoice) ?? defaultScenario) : undefined;
  // With a flow of one's own, lease ratings come from the scenario nearest that flow.
  const ratingScenario =
    scenario ??
    (flow !== null
      ? [...list].sort((a, b) => Math.abs(Math.log(a.discharge / flow)) - Math.abs(Math.log(b.discharge / flow)))[0]
      : undefined);

  const footprint = useQuery({
    ...exposureKeys.footprint(riverId, flow !== null ? { discharge: flow } : { scenarioId: scenario?.id ?? '' }),
    enabled: Boolean(riverId && (flow !== null || scenario)),
  });
  const [searchParams] = useSearchParams();
  const leaseCount = useQuery(exposureKeys.leaseCount());
  // ?leaseTiles=on forces tiles (used by the browser test on the small demo region).
  const useTiles = searchParams.get('leaseTiles') === 'on' || (leaseCount.data !== undefined && leaseCount.data > LEASE_TILE_THRESHOLD);
  // Few leases: every lease's screening for the scenario, to colour them. Thousands: the tiles carry the colours, and
  // only the lease clicked on is read (a jurisdiction's 20 000 screenings are megabytes).
  const screenings = useQuery({
    ...exposureKeys.screenings({ riverId, scenarioId: ratingScenario?.id }),
    enabled: Boolean(ratingScenario) && leaseCount.isSuccess && !useTiles,
  });
  const selectedLeaseId = selection ? String(selection.properties.id) : undefined;
  const selectedScreening = useQuery({
    ...exposureKeys.screenings({ leaseId: selectedLeaseId, scenarioId: ratingScenario?.id }),
    enabled: useTiles && Boolean(ratingScenario && selectedLeaseId),
  });
  const leases = useQuery({ ...exposureKeys.leasesWithGeometry(), enabled: leaseCount.isSuccess && !useTiles });
  const land = useQuery(exposureKeys.land());
  const zones = useQuery(exposureKeys.zones());
  const mapSettings = useQuery(exposureKeys.mapSettings());
  const [showBasemap, setShowBasemap] = useState(false);
  const basemap = mapSettings.data?.basemap ?? null;

  const byLease = useMemo(() => new Map((screenings.data?.items ?? []).map((r) => [r.leaseId, r] as const)), [screenings.data]);

  const layers = useMemo<MapLayerSpec[]>(() => {
    const out: MapLayerSpec[] = [];
    if (land.data?.features.length)
      out.push({ id: 'land', label: 'Land', data: land.data, fill: 'rgba(234,220,191,0.9)', stroke: '#cfb27c', strokeWidth: 1 });
    if (footprint.data) {
      for (const b of bandsToDraw(footprint.data)) {
        out.push({
          id: b.id,
          label: b.style.label,
          data: { type: 'FeatureCollection', features: [b.feature] },
          fill: b.style.fill,
          stroke: b.style.stroke,
          dashed: b.style.dashed,
          strokeWidth: 1.5,
        });
      }
    }
    if (zones.data?.features.length) {
      const zoneStatusWords = { open: 'open', closed: 'CLOSED', 'reopening-pending': 'waiting to reopen' } as const;
      out.push({
        id: 'zones',
        label: 'Closure zone (outline; name and status on the map)',
        data: {
          type: 'FeatureCollection',
          features: zones.data.features.map((f) => ({
            type: 'Feature',
            properties: {
              label: `${f.properties.name} · ${zoneStatusWords[f.properties.status]}`,
              stroke: f.properties.status === 'open' ? '#2f7a66' : '#8a3b12',
            },
            geometry: f.geometry as Geometry,
          })),
        },
        fill: 'rgba(0,0,0,0)',
        stroke: '#2f7a66',
        strokeProperty: 'stroke',
        strokeWidth: 2.5,
        dashed: true,
        labelProperty: 'label',
      });
    }
    const mouths: FeatureCollection = {
      type: 'FeatureCollection',
      features: (rivers.data?.items ?? [])
        .filter((r) => typeof r.settings.mouthLongitude === 'number' && typeof r.settings.mouthLatitude === 'number')
        .map((r) => ({
          type: 'Feature',
          properties: { label: `${r.name} mouth` },
          geometry: { type: 'Point', coordinates: [Number(r.settings.mouthLongitude), Number(r.settings.mouthLatitude)] },
        })),
    };
    if (mouths.features.length)
      out.push({
        id: 'mouths',
        label: 'River mouth',
        data: mouths,
        fill: '#173d61',
        stroke: '#ffffff',
        pointRadius: 6,
        labelProperty: 'label',
      });
    if (useTiles && ratingScenario) {
      out.push({
        id: 'leases',
        label: 'Leases',
        data: { type: 'FeatureCollection', features: [] },
        tileUrl: `/api/v1/tiles/leases/{z}/{x}/{y}.mvt?riverId=${riverId}&scenarioId=${ratingScenario.id}`,
        tileColours: (p) => ratingColours(p.rating),
        fill: NOT_SCREENED.fill,
        stroke: NOT_SCREENED.stroke,
        strokeWidth: 2,
        labelProperty: 'lease',
        pointRadius: 4,
        hideInLegend: true,
      });
    } else if (leases.data?.items.length) {
      const fc: FeatureCollection = {
        type: 'FeatureCollection',
        features: leases.data.items
          .filter((l) => l.geometry)
          .map((l) => {
            const row = byLease.get(l.id);
            const c = ratingColours(row?.rating);
            return {
              type: 'Feature',
              properties: {
                id: l.id,
                lease: l.leaseId,
                label: row ? `${l.leaseId} · ${RATING_LABEL[row.rating as Rating]}` : l.leaseId,
                fill: c.fill,
                stroke: c.stroke,
              },
              geometry: l.geometry as Geometry,
            };
          }),
      };
      out.push({
        id: 'leases',
        label: 'Leases',
        data: fc,
        fill: NOT_SCREENED.fill,
        stroke: NOT_SCREENED.stroke,
        strokeWidth: 2,
        labelProperty: 'label',
        fillProperty: 'fill',
        strokeProperty: 'stroke',
        dotsBelowZoom: LEASE_DOTS_BELOW_ZOOM,
        hideInLegend: true,
      });
    }
    return out;
  }, [land.data, footprint.data, leases.data, byLease, rivers.data, useTiles, ratingScenario, riverId, zones.data]);

  if (rivers.isPending) return <Loading what="Loading rivers…" />;
  if (rivers.isError) return <LoadError error={rivers.error} retry={() => rivers.refetch()} />;

  const fp = footprint.data?.properties;
  const picked: ScreeningRow | undefined = selectedLeaseId
    ? useTiles
      ? selectedScreening.data?.items[0]
      : byLease.get(selectedLeaseId)
    : undefined;
  const plume = fp?.plume as { reach?: number; width?: number } | undefined;

  return (
    <div className="space-y-4">
      <PageHeader title="Exposure map" question="Where does a river’s flood water go, and which leases does it reach?" />
      {!rivers.data.items.length ? (
        <Empty title="No rivers yet">A river with a flow record is needed before plumes can be drawn.</Empty>
      ) : (
        <>
          <div className="flex flex-wrap items-end gap-4 rounded-lg border border-sand-200 bg-white p-3">
            <label className="flex flex-col gap-1 text-sm font-semibold">
              River
              <select
                className="rounded-md border border-shell-300 bg-white px-3 py-2 font-normal"
                value={riverId}
                onChange={(e) => {
                  setRiverChoice(e.target.value);
                  setScenarioChoice(undefined);
                  setFlow(null);
                  setSelection(null);
                }}
              >
                {rivers.data.items.map((r) => (
                  <option key={r.id} value={r.id}>
                    {r.name}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex flex-col gap-1 text-sm font-semibold">
              Flood scenario
              <select
                className="rounded-md border border-shell-300 bg-white px-3 py-2 font-normal"
                value={flow === null ? (scenario?.id ?? '') : ''}
                onChange={(e) => {
                  setScenarioChoice(e.target.value);
                  setFlow(null);
                }}
              >
                {flow !== null && <option value="">A flow of your own ({fmtFlow(flow)})</option>}
                {list.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name} — {fmtFlow(s.discharge)}
                  </option>
                ))}
              </select>
            </label>
            {basemap && (
              <label className="flex items-center gap-2 text-sm font-semibold">
                <input type="checkbox" checked={showBasemap} onChange={(e) => setShowBasemap(e.target.checked)} />
                Background map (needs internet)
              </label>
            )}
            {list.length > 1 && (
              <FlowSlider
                min={list[0].discharge}
                max={list[list.length - 1].discharge}
                value={flow ?? scenario?.discharge ?? list[0].discharge}
                onCommit={(q) => {
                  setFlow(q);
                  setSelection(null);
                }}
              />
            )}
          </div>

          <div className="grid gap-4 lg:grid-cols-[1fr_20rem]">
            <section aria-label="Map" className="relative" data-footprint-id={fp?.footprintId ?? ''}>
              {footprint.isError ? (
                <LoadError error={footprint.error} retry={() => footprint.refetch()} />
              ) : (
                <LazyVectorMap
                  layers={layers}
                  height="max(480px, calc(100vh - 330px))"
                  fitTo={['plume-edge', 'bulge', 'leases']}
                  fit="once"
                  maxZoom={14}
                  clickableLayers={['leases']}
                  basemap={showBasemap ? basemap : null}
                  onSelect={setSelection}
                  drawnKey={fp?.footprintId}
                  ariaLabel={`Map of the ${fp?.riverName ?? 'river'} plume at ${fp ? fmtFlow(fp.discharge) : 'the chosen flow'}, with leases coloured by rating`}
                />
              )}
              {footprint.isFetching && (
                <p role="status" className="absolute top-2 left-2 rounded bg-white/90 px-2 py-1 text-xs shadow">
                  Drawing the plume for {flow !== null ? fmtFlow(flow) : scenario?.name}…
                </p>
              )}
              {selection && (
                <div
                  role="dialog"
                  aria-label={`Lease ${String(selection.properties.lease)}`}
                  className="absolute z-10 w-72 rounded-md border border-shell-300 bg-white p-3 text-sm shadow-lg"
                  style={{ left: Math.min(selection.pixel[0] + 12, 9999), top: selection.pixel[1] + 12, maxWidth: 'calc(100% - 1rem)' }}
                >
                  <div className="flex items-start justify-between gap-2">
                    <p className="font-semibold">Lease {String(selection.properties.lease)}</p>
                    <button type="button" aria-label="Close" className="text-shell-700" onClick={() => setSelection(null)}>
                      ✕
                    </button>
                  </div>
                  {picked ? (
                    <>
                      <p className="mt-1 flex items-center gap-2">
                        <RatingBadge rating={picked.rating} size="sm" /> at the {picked.scenarioName}
                      </p>
                      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
                        <dt className="text-shell-700">In the plume</dt>
                        <dd>{fmtPercent(picked.bandFractions['plume-edge'] ?? 0)} of the lease</dd>
                        <dt className="text-shell-700">Lowest salinity</dt>
                        <dd>{fmtSalinity(picked.lowestSalinity)}</dd>
                        <dt className="text-shell-700">Highest indicator</dt>
                        <dd>{fmtIndicator(picked.highestIndicator)}</dd>
                        <dt className="text-shell-700">Below tolerance</dt>
                        <dd>{fmtDays(picked.daysBelowTolerance)}</dd>
                      </dl>
                      <p className="mt-2 text-xs text-shell-700">{picked.reasons[0]}</p>
                    </>
                  ) : (
                    <p className="mt-1 text-shell-700">Not screened against this river yet.</p>
                  )}
                  <Link
                    className="mt-2 inline-block font-semibold text-deep-700 underline"
                    to={`/leases/${String(selection.properties.id)}`}
                  >
                    Open the lease report
                  </Link>
                </div>
              )}
            </section>

            <aside aria-label="About this plume" className="space-y-4 text-sm">
              {fp && (
                <section className="rounded-lg border border-sand-200 bg-white p-3">
                  <h2 className="font-semibold text-deep-900">{fp.scenarioName ?? 'A flow of your own'}</h2>
                  <p>
                    {fp.riverName} at {fmtFlow(fp.discharge)} for {fmtNumber(fp.durationHours / 24, 1)} days.
                  </p>
                  {plume?.reach !== undefined && (
                    <p className="text-shell-700">
                      The coastal current would run about {fmtNumber(plume.reach / 1000, 0)} km along the coast, about{' '}
                      {fmtNumber((plume.width ?? 0) / 1000, 1)} km wide.
                    </p>
                  )}
                  <p className="mt-1 text-xs text-shell-700">Model {fp.modelVersion}</p>
                  <div className="mt-2">
                    <DownloadLinks
                      verb="Download bands"
                      label={`of ${fp.riverName} at ${fmtFlow(fp.discharge)}`}
                      href={(f) =>
                        `/api/v1/footprints/export?${new URLSearchParams({
                          riverId,
                          ...(flow !== null ? { discharge: String(flow) } : { scenarioId: scenario?.id ?? '' }),
                          format: f,
                        })}`
                      }
                    />
                  </div>
                </section>
              )}
              <section className="space-y-2">
                <h2 className="font-semibold text-deep-900">Leases, by their rating</h2>
                <RatingLegend />
                <p className="text-xs text-shell-700">
                  {ratingScenario
                    ? flow !== null
                      ? `Ratings are for the nearest screened flood: ${ratingScenario.name} (${fmtFlow(ratingScenario.discharge)}).`
                      : `Ratings for the ${ratingScenario.name}.`
                    : 'No screened flood yet.'}{' '}
                  White leases are not screened against this river. Click a lease for its numbers.
                </p>
              </section>
              {rivers.data.items.find((r) => r.id === riverId)?.coastSource === 'builtin' && (
                <p className="text-xs text-shell-700" data-testid="coast-attribution">
                  {BUILTIN_COAST_ATTRIBUTION}
                </p>
              )}
              {fp?.warnings.length ? (
                <section className="space-y-1">
                  <h2 className="font-semibold text-deep-900">What the model warns about</h2>
                  <ul className="list-disc space-y-1 pl-5 text-xs text-shell-700" data-testid="footprint-warnings">
                    {fp.warnings.map((w) => (
                      <li key={w}>{w}</li>
                    ))}
                  </ul>
                </section>
              ) : null}
              <Cautions compact />
            </aside>
          </div>
        </>
      )}
    </div>
  );
}
