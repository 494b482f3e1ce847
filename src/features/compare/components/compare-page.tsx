import { useQueries, useQuery } from '@tanstack/react-query';
import { Link, useSearchParams } from 'react-router-dom';
import { compareAnnualWorstFirst } from '#shared/scoring/annual-rating';
import { AnnualRatingCell, AnnualRatingExplainer } from '../../../components/ui/annual-rating';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { PageHeader } from '../../../components/ui/page-header';
import { RatingBadge, RatingLegend, worstRating } from '../../../components/ui/rating-badge';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { exposureKeys, type ScreeningRow } from '../../../lib/exposure-api';
import { fmtArea, fmtDays, fmtFlow, fmtIndicator, speciesName } from '../../../lib/format';

const MAX = 6;

/** Two to six leases side by side, worst yearly rating first: yearly rating, rating per flood, days below tolerance, highest indicator, area. */
export function ComparePage() {
  const [params, setParams] = useSearchParams();
  const ids = (params.get('ids') ?? '').split(',').filter(Boolean).slice(0, MAX);
  const leases = useQuery(exposureKeys.leasesBrief());
  const screenings = useQueries({ queries: ids.map((leaseId) => exposureKeys.screenings({ leaseId })) });

  const toggle = (id: string) => {
    const next = ids.includes(id) ? ids.filter((x) => x !== id) : [...ids, id].slice(0, MAX);
    setParams(next.length ? { ids: next.join(',') } : {}, { replace: true });
  };

  // Ranked as on the Overview: worst yearly rating first, then closure days a year, then the chance a year.
  const chosen = ids
    .map((id, i) => ({
      id,
      lease: leases.data?.items.find((l) => l.id === id),
      rows: screenings[i]?.data?.items ?? [],
      q: screenings[i],
    }))
    .sort(
      (a, b) =>
        compareAnnualWorstFirst(
          {
            annualRating: a.lease?.annualRating ?? null,
            closureDaysPerYear: a.lease?.closureDaysPerYear ?? null,
            harmfulSalinityChancePerYear: a.lease?.harmfulSalinityChancePerYear ?? null,
          },
          {
            annualRating: b.lease?.annualRating ?? null,
            closureDaysPerYear: b.lease?.closureDaysPerYear ?? null,
            harmfulSalinityChancePerYear: b.lease?.harmfulSalinityChancePerYear ?? null,
          },
        ) || (a.lease?.leaseId ?? '').localeCompare(b.lease?.leaseId ?? ''),
    );

  const firstOfEach = new Map<string, ScreeningRow>();
  for (const c of chosen) for (const r of c.rows) if (!firstOfEach.has(r.scenarioId)) firstOfEach.set(r.scenarioId, r);
  const scenarios = [...firstOfEach.values()].sort(
    (a, b) =>
      a.riverName.localeCompare(b.riverName) ||
      (a.aep !== null && b.aep !== null ? b.aep - a.aep : a.aep !== null ? -1 : b.aep !== null ? 1 : a.discharge - b.discharge),
  );

  if (leases.isPending) return <Loading what="Loading leases…" />;
  if (leases.isError) return <LoadError error={leases.error} retry={() => leases.refetch()} />;

  const cell = (rows: ScreeningRow[], scenarioId: string) => rows.find((r) => r.scenarioId === scenarioId);
  const maxOf = (rows: ScreeningRow[], pick: (r: ScreeningRow) => number | null) => {
    const v = rows.map(pick).filter((x): x is number => x !== null);
    return v.length ? Math.max(...v) : null;
  };

  return (
    <div className="space-y-6">
      <PageHeader
        title="Compare sites"
        question="Which of these sites sits least in the way of flood water?"
        actions={
          ids.length >= 2 && (
            <Button variant="secondary" className="no-print" onClick={() => window.print()}>
              Print
            </Button>
          )
        }
      />
      <fieldset className="no-print rounded-lg border border-sand-200 bg-white p-3">
        <legend className="px-1 text-sm font-semibold">
          Pick two to six leases ({ids.length} of {MAX} chosen)
        </legend>
        {leases.data.items.length === 0 ? (
          <p className="text-sm text-shell-700">No leases yet. Upload lease boundaries on the Leases page first.</p>
        ) : (
          <div className="grid max-h-56 grid-cols-2 gap-1 overflow-y-auto sm:grid-cols-4 lg:grid-cols-6">
            {leases.data.items.map((l) => (
              <label key={l.id} className="flex items-center gap-2 text-sm">
                <input
                  type="checkbox"
                  checked={ids.includes(l.id)}
                  disabled={!ids.includes(l.id) && ids.length >= MAX}
                  onChange={() => toggle(l.id)}
                />
                <span>
                  {l.leaseId} <span className="text-xs text-shell-700">{l.status === 'candidate' ? '(candidate)' : ''}</span>
                </span>
              </label>
            ))}
          </div>
        )}
      </fieldset>

      <Cautions compact />

      {ids.length < 2 ? (
        <Empty title="Choose at least two leases">
          Tick two to six leases above to see them side by side. The choice stays in the address, so you can share or print it.
        </Empty>
      ) : screenings.some((q) => q.isPending) ? (
        <Loading what={`Loading the screenings of ${ids.length} leases…`} />
      ) : (
        <div className="space-y-2">
          <RatingLegend />
          <div className="overflow-x-auto rounded-lg border border-sand-200 bg-white">
            <table className="w-full border-collapse text-sm" aria-label="Leases compared">
              <thead>
                <tr className="border-b border-sand-200 text-left align-bottom">
                  <th className="p-2">
                    <span className="sr-only">What</span>
                  </th>
                  {chosen.map((c) => (
                    <th key={c.id} className="p-2">
                      <Link className="text-deep-700 underline" to={`/leases/${c.id}`}>
                        {c.lease?.leaseId ?? 'Unknown lease'}
                      </Link>
                      <span className="block text-xs font-normal text-shell-700">
                        {speciesName(c.lease?.species)} · {c.lease?.status === 'candidate' ? 'candidate' : 'held'}
                      </span>
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                <tr className="border-b border-shell-100">
                  <th scope="row" className="p-2 text-left font-semibold">
                    Area
                  </th>
                  {chosen.map((c) => (
                    <td key={c.id} className="p-2">
                      {c.lease ? fmtArea(c.lease.areaM2) : '—'}
                    </td>
                  ))}
                </tr>
                <tr className="border-b border-shell-100">
                  <th scope="row" className="p-2 text-left font-semibold">
                    Yearly rating
                  </th>
                  {chosen.map((c) => (
                    <td key={c.id} className="p-2">
                      <AnnualRatingCell
                        rating={c.lease?.annualRating}
                        closureDaysPerYear={c.lease?.closureDaysPerYear}
                        harmfulSalinityChancePerYear={c.lease?.harmfulSalinityChancePerYear}
                      />
                    </td>
                  ))}
                </tr>
                <tr className="border-b border-shell-100">
                  <th scope="row" className="p-2 text-left font-semibold">
                    Worst rating, any flood
                  </th>
                  {chosen.map((c) => (
                    <td key={c.id} className="p-2">
                      <RatingBadge rating={worstRating(c.rows.map((r) => r.rating))} />
                    </td>
                  ))}
                </tr>
                <tr className="border-b border-shell-100">
                  <th scope="row" className="p-2 text-left font-semibold">
                    Most days below tolerance
                  </th>
                  {chosen.map((c) => (
                    <td key={c.id} className="p-2">
                      {fmtDays(maxOf(c.rows, (r) => r.daysBelowTolerance))}
                    </td>
                  ))}
                </tr>
                <tr className="border-b-2 border-sand-200">
                  <th scope="row" className="p-2 text-left font-semibold">
                    Highest faecal indicator
                  </th>
                  {chosen.map((c) => (
                    <td key={c.id} className="p-2">
                      {fmtIndicator(maxOf(c.rows, (r) => r.highestIndicator))}
                    </td>
                  ))}
                </tr>
                {scenarios.map((s) => (
                  <tr key={s.scenarioId} className="border-b border-shell-100 break-inside-avoid">
                    <th scope="row" className="p-2 text-left font-normal">
                      <span className="font-semibold">{s.scenarioName}</span>
                      <span className="block text-xs text-shell-700">
                        {s.riverName}, {fmtFlow(s.discharge)}
                      </span>
                    </th>
                    {chosen.map((c) => {
                      const r = cell(c.rows, s.scenarioId);
                      return (
                        <td key={c.id} className="p-2 align-top">
                          {r ? (
                            <>
                              <RatingBadge rating={r.rating} size="sm" />
                              <span className="mt-0.5 block text-xs text-shell-700">
                                {fmtDays(r.daysBelowTolerance)} below tolerance · {fmtIndicator(r.highestIndicator)}
                              </span>
                            </>
                          ) : (
                            <span className="text-xs text-shell-700">Not screened</span>
                          )}
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {screenings.some((q) => q.isError) && <LoadError error={screenings.find((q) => q.isError)?.error} />}
          <p className="text-xs text-shell-700">
            Sites are ranked by their yearly rating, worst first; then by closure days a year, then by the chance a year.
          </p>
          <AnnualRatingExplainer />
        </div>
      )}
      <Cautions />
    </div>
  );
}
