import { useQuery } from '@tanstack/react-query';
import { useEffect, useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { Cautions } from '../../components/ui/cautions';
import { PageHeader } from '../../components/ui/page-header';
import { AnnualRatingExplainer, chanceWords, closureDaysWords } from '../../components/ui/annual-rating';
import { RatingBadge, RatingLegend } from '../../components/ui/rating-badge';
import { Empty, LoadError, Loading } from '../../components/ui/states';
import { useMe } from '../../features/account/api/get-me';
import { leaseKeys } from '../../features/leases/api/leases-api';
import { fmtDateTime, fmtNumber } from '../../lib/format';
import { inboxKeys } from '../../lib/inbox-api';
import { regionKeys } from '../../lib/regions-api';

const QUESTION = {
  grower: 'How exposed are my leases to river flood water?',
  adviser: "How exposed are my clients' sites to river flood water?",
  regulator: 'Which zones and leases does the current river flow put at risk?',
  admin: 'Who is using Brackline, and is everything running?',
} as const;

/** Leases a page of the ranking shows: a jurisdiction of 20 000 leases is read 25 at a time, not all at once. */
const RANKING_PAGE = 25;
/** How often the ranking is read again while a lease on the page has no yearly rating yet. */
const UNRATED_REFRESH_MS = 10_000;

function LeasesByRating() {
  const [offset, setOffset] = useState(0);
  // The server ranks (GET /leases?sort=annualRating: the yearly rating over every river, then closure days, then the
  // chance); leases uploaded or rivers screened since the last visit change it, so it is read again on every visit.
  const ranked = useQuery({
    ...leaseKeys.list({ sort: 'annualRating', order: 'desc', limit: RANKING_PAGE, offset }),
    refetchOnMount: 'always',
    // A lease just uploaded, or one whose river is being re-screened, gets its rating within a minute or so: look again
    // while the page shows one without it (a kept answer on the server, so this costs little).
    refetchInterval: (query) => (query.state.data?.items.some((l) => !l.annualRating) ? UNRATED_REFRESH_MS : false),
  });
  // Leases deleted elsewhere can leave this page past the end of the ranking: go back to its first page.
  const pastTheEnd = ranked.data !== undefined && ranked.data.items.length === 0 && offset > 0;
  useEffect(() => {
    if (pastTheEnd) setOffset(0);
  }, [pastTheEnd]);
  if (ranked.isPending) return <Loading what="Loading your leases’ ratings…" />;
  if (ranked.isError) return <LoadError error={ranked.error} retry={() => ranked.refetch()} />;
  const { items, total } = ranked.data;
  if (!total) {
    return (
      <Empty title="No leases yet">
        Upload your lease boundaries on the{' '}
        <Link className="font-semibold text-deep-700 underline" to="/leases">
          Leases
        </Link>{' '}
        page; they are screened against every river whose plume can reach them.
      </Empty>
    );
  }
  const last = Math.min(offset + items.length, total);
  return (
    <div className="space-y-2">
      <div className="overflow-x-auto rounded-lg border border-sand-200 bg-white">
        <table className="w-full border-collapse text-sm" aria-label="Leases by yearly rating">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Lease</th>
              <th className="p-2">Yearly rating</th>
              <th className="p-2">Expected closure days a year</th>
              <th className="p-2">Chance a year of a harmful salinity event</th>
              <th className="p-2">Expected days a year below salinity tolerance</th>
            </tr>
          </thead>
          <tbody>
            {items.map((r) => (
              <tr key={r.id} className="border-b border-shell-100 hover:bg-sand-50">
                <td className="whitespace-nowrap p-2">
                  <Link className="font-semibold text-deep-700 underline" to={`/leases/${r.id}`}>
                    {r.leaseId}
                  </Link>
                </td>
                <td className="p-2">
                  {r.annualRating ? (
                    <RatingBadge rating={r.annualRating} />
                  ) : (
                    <span className="text-shell-700">{r.worstRating ? 'Being re-screened' : 'Not screened by any river yet'}</span>
                  )}
                </td>
                <td className="p-2">{closureDaysWords(r.closureDaysPerYear)}</td>
                <td className="p-2">{chanceWords(r.harmfulSalinityChancePerYear)}</td>
                <td className="p-2">{r.expectedDaysPerYear === null ? '—' : fmtNumber(r.expectedDaysPerYear, r.expectedDaysPerYear < 10 ? 1 : 0)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <nav className="flex flex-wrap items-center gap-3 text-sm" aria-label="Pages of the ranking">
        <span data-testid="ranking-range">
          {offset + 1}–{last} of {total}
        </span>
        <Button type="button" variant="secondary" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - RANKING_PAGE))}>
          Previous {RANKING_PAGE}
        </Button>
        <Button type="button" variant="secondary" disabled={last >= total} onClick={() => setOffset(offset + RANKING_PAGE)}>
          Next {RANKING_PAGE}
        </Button>
        <Link className="font-semibold text-deep-700 underline" to="/leases">
          Every lease, with filters and export
        </Link>
      </nav>
    </div>
  );
}

/** A new grower's steps to an answer, each ticked when done; hidden once every step is done. */
function FirstRunPath() {
  const q = useQuery({ ...regionKeys.firstRun(), refetchOnMount: 'always' });
  if (q.isPending) return <Loading what="Checking your first steps…" />;
  if (q.isError) return <LoadError error={q.error} retry={() => q.refetch()} />;
  const d = q.data;
  const region = d.region?.name;
  const steps = [
    {
      done: d.leases > 0,
      title: 'Upload your lease boundaries',
      detail: d.leases > 0 ? `${d.leases} lease${d.leases === 1 ? '' : 's'} saved.` : 'A zipped shapefile or a GeoJSON file of your leases.',
      to: '/leases',
      link: 'Leases',
    },
    {
      done: d.rivers > 0,
      title: region ? `A river (${region} has its rivers)` : 'Set up a river',
      detail:
        d.rivers > 0
          ? `${d.rivers} river${d.rivers === 1 ? '' : 's'} can screen your leases.`
          : 'Place its mouth on the map; a region’s rivers count too (choose a region in your account settings).',
      to: '/rivers',
      link: 'Rivers',
    },
    {
      done: d.riversWithRecord > 0,
      title: region ? 'A flow record (or the region’s)' : 'Upload a flow record',
      detail: d.riversWithRecord > 0 ? `${d.riversWithRecord} river${d.riversWithRecord === 1 ? ' has' : 's have'} a flow record and flood scenarios.` : 'A CSV of dates and discharges from the river’s gauge.',
      to: '/rivers',
      link: 'Rivers',
    },
    {
      done: d.leasesRated > 0,
      title: 'Read your ratings',
      detail: d.leasesRated > 0 ? `${d.leasesRated} of your leases rated; see them below.` : 'They appear once a river with a flow record reaches a lease.',
      to: '/leases',
      link: 'Leases',
    },
  ];
  if (steps.every((s) => s.done)) return null;
  return (
    <section aria-labelledby="first-steps" className="space-y-2 rounded-lg border border-deep-300 bg-deep-50 p-4">
      <h2 id="first-steps" className="text-lg font-semibold text-deep-900">
        Your steps to an answer
      </h2>
      <p className="text-sm text-shell-700">
        {region ? `Region: ${region}.` : 'No region chosen: set up your own rivers, or choose a region.'}{' '}
        <Link className="font-semibold text-deep-700 underline" to="/account">
          Account settings
        </Link>
      </p>
      <ol className="space-y-1" aria-label="Steps to an answer">
        {steps.map((s, i) => (
          <li key={s.title} className="flex gap-2 text-sm" data-done={s.done ? 'yes' : 'no'}>
            <span aria-hidden className={`font-bold ${s.done ? 'text-estuary-700' : 'text-shell-500'}`}>
              {s.done ? '✓' : `${i + 1}.`}
            </span>
            <span>
              <span className="font-semibold">{s.title}</span>
              <span className="sr-only">{s.done ? ' (done)' : ' (to do)'}</span> — {s.detail}{' '}
              {!s.done && (
                <Link className="font-semibold text-deep-700 underline" to={s.to}>
                  {s.link}
                </Link>
              )}
            </span>
          </li>
        ))}
      </ol>
    </section>
  );
}

const STATUS_WORDS = { open: 'Open', closed: 'Closed', 'reopening-pending': 'Waiting to reopen' } as const;

function ClosuresNearMyLeases() {
  const closures = useQuery(inboxKeys.nearbyClosures());
  if (closures.isPending) return <Loading what="Checking closures near your leases…" />;
  if (closures.isError) return <LoadError error={closures.error} retry={() => closures.refetch()} />;
  const km = fmtNumber(closures.data.distanceM / 1000, 0);
  if (!closures.data.items.length) {
    return (
      <Empty title="No closure in force near your leases">
        No zone within {km} km of a lease you can see is closed or waiting to reopen. The shellfish authority’s own notices decide whether
        you may harvest.
      </Empty>
    );
  }
  return (
    <ul className="space-y-2" aria-label="Closures near your leases">
      {closures.data.items.map((z) => (
        <li key={z.zoneId} className="rounded-lg border-l-4 border-sand-600 bg-white p-3 shadow-sm">
          <p className="font-semibold text-deep-900">
            {z.zoneName}: {STATUS_WORDS[z.status].toLowerCase()} since {fmtDateTime(z.since)}
            {z.riverName ? ` (flow of ${z.riverName})` : ''}
          </p>
          <p className="mt-1 text-sm text-shell-900">
            Your leases in or within {km} km of it:{' '}
            {z.leases.map((l, i) => (
              <span key={l.leaseId}>
                {i > 0 && ', '}
                <Link className="font-semibold text-deep-700 underline" to={`/leases/${l.leaseId}`}>
                  {l.leaseCode}
                </Link>{' '}
                ({l.distanceM === 0 ? 'inside' : `${fmtNumber(l.distanceM / 1000, 1)} km`})
              </span>
            ))}
          </p>
        </li>
      ))}
    </ul>
  );
}

function LatestMessages() {
  const inbox = useQuery(inboxKeys.list());
  if (inbox.isPending) return <Loading what="Loading your latest alerts and notices…" />;
  if (inbox.isError) return <LoadError error={inbox.error} retry={() => inbox.refetch()} />;
  const latest = inbox.data.items.filter((m) => m.kind === 'alert' || m.kind === 'notice').slice(0, 5);
  if (!latest.length) {
    return (
      <Empty title="No alerts or notices yet">
        When a river’s flow puts one of your leases in a plume band, or the authority closes a zone you hold a lease in, it appears here and
        by e-mail.
      </Empty>
    );
  }
  return (
    <ul className="space-y-2" aria-label="Latest alerts and notices">
      {latest.map((m) => (
        <li key={m.id} className="rounded-lg border border-sand-200 bg-white p-3">
          <p className="font-semibold text-deep-900">
            {m.title}
            {m.readAt === null && <span className="ml-2 text-xs text-deep-700">(unread)</span>}
          </p>
          <p className="text-xs text-shell-700">{fmtDateTime(m.createdAt)}</p>
          <p className="mt-1 line-clamp-2 text-sm text-shell-900">{m.body}</p>
        </li>
      ))}
      <li>
        <Link className="text-sm font-semibold text-deep-700 underline" to="/inbox">
          All messages in the inbox
        </Link>
      </li>
    </ul>
  );
}

export function OverviewPage() {
  const me = useMe();
  const role = me.data?.role ?? 'grower';
  return (
    <div className="space-y-6">
      <PageHeader title="Overview" question={QUESTION[role]} />
      <Cautions />
      {role === 'admin' ? (
        <Empty title="Nothing to show yet">
          Invite advisers and regulators from the People page; e-mail sent by Brackline appears in the Outbox.
        </Empty>
      ) : (
        <>
          {role === 'grower' && <FirstRunPath />}
          <section aria-labelledby="by-rating" className="space-y-2">
            <div className="flex flex-wrap items-end justify-between gap-2">
              <h2 id="by-rating" className="text-lg font-semibold text-deep-900">
                {role === 'regulator' ? 'Leases of your jurisdiction' : role === 'adviser' ? 'Your clients’ leases' : 'Your leases'}, worst
                first
              </h2>
              <RatingLegend />
            </div>
            <p className="text-xs text-shell-700">
              Ranked by the yearly rating, set from two figures that weigh each flood by how often it happens: the expected closure days a
              year and the chance a year of a salinity event harmful to the lease’s species; then by closure days, then by that chance.
            </p>
            <AnnualRatingExplainer />
            <LeasesByRating />
          </section>
          <section aria-labelledby="closures" className="space-y-2">
            <h2 id="closures" className="text-lg font-semibold text-deep-900">
              Closures in force near your leases
            </h2>
            <ClosuresNearMyLeases />
          </section>
          <section aria-labelledby="alerts" className="space-y-2">
            <h2 id="alerts" className="text-lg font-semibold text-deep-900">
              Latest alerts and notices
            </h2>
            <LatestMessages />
          </section>
        </>
      )}
    </div>
  );
}
