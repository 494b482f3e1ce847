/**
 * The yearly rating on screens: the figures beside it in words, and "How the yearly rating is set"
 * (the rule and its reasons, from shared/scoring/annual-rating.ts, so the words and the code agree).
 */
import { ANNUAL_RATING_CUTS, annualRatingRuleLines } from '#shared/scoring/annual-rating';
import { fmtNumber } from '../../lib/format';
import { RatingBadge } from './rating-badge';

/** "3.5 days", "0 days", "under 0.1 days": closure days a year with sensible precision (ui.md "Words"). */
export function closureDaysWords(days: number | null | undefined): string {
  if (days === null || days === undefined) return '—';
  if (days === 0) return '0 days';
  if (days < 0.05) return 'under 0.1 days';
  return `${fmtNumber(days, days < 10 ? 1 : 0)} ${days === 1 ? 'day' : 'days'}`;
}

/** A chance a year in words: "20% a year (about 1 year in 5)". */
export function chanceWords(p: number | null | undefined): string {
  if (p === null || p === undefined) return '—';
  if (p <= 0) return 'Not at any screened flood';
  if (p >= 0.99) return 'Most years';
  // 1/p rounds to "1 year in 1" above one half: say it in words instead.
  if (p > 0.5) return `${fmtNumber(p * 100, 0)}% a year (more years than not)`;
  return `${fmtNumber(p * 100, p < 0.1 ? 1 : 0)}% a year (about 1 year in ${fmtNumber(1 / p, 0)})`;
}

/** A chance a year in few words for narrow cells: "1 year in 5", "more years than not", "none screened". */
export function chanceShort(p: number | null | undefined): string {
  if (p === null || p === undefined) return '—';
  if (p <= 0) return 'none screened';
  if (p > 0.5) return 'more years than not';
  return `1 year in ${fmtNumber(1 / p, 0)}`;
}

/** The yearly rating with the two figures it is set from, for table cells. */
export function AnnualRatingCell({
  rating,
  closureDaysPerYear,
  harmfulSalinityChancePerYear,
}: {
  rating: string | null | undefined;
  closureDaysPerYear: number | null | undefined;
  harmfulSalinityChancePerYear: number | null | undefined;
}) {
  if (!rating) return <span className="text-shell-700">Not screened yet</span>;
  return (
    <span className="flex flex-col gap-0.5">
      <RatingBadge rating={rating} size="sm" />
      <span className="text-xs text-shell-700">{closureDaysWords(closureDaysPerYear)} closed a year</span>
      <span className="text-xs text-shell-700">harmful salinity: {chanceShort(harmfulSalinityChancePerYear)}</span>
    </span>
  );
}

/** How the yearly rating is set: the two figures, the cut points and why. */
export function AnnualRatingExplainer({ open = false }: { open?: boolean }) {
  const severe = ANNUAL_RATING_CUTS[0];
  return (
    <details className="rounded-md border border-sand-200 bg-white px-3 py-2 text-sm text-shell-900" open={open}>
      <summary className="cursor-pointer font-semibold text-deep-900">How the yearly rating is set</summary>
      <div className="mt-2 space-y-2">
        <p>
          The yearly rating weighs every flood of the river’s flood-frequency fit by how often it happens, and looks at two figures: the{' '}
          <strong>closure days a year</strong> (the expected days the faecal indicator on the lease is above the approved-area standard of
          14 per 100 mL, counting each flood’s whole duration) and the <strong>chance a year of a harmful salinity event</strong> (a flood
          that keeps the lease under the species’ acute or chronic salinity limit for longer than it tolerates). The worse of the two sets
          the rating; a figure equal to a cut point takes the higher step.
        </p>
        <ul className="list-disc space-y-1 pl-5" aria-label="Yearly rating cut points">
          {annualRatingRuleLines().map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
        <p className="text-xs text-shell-700">
          Why these numbers: closures are compared with those of conditionally approved areas under a shellfish authority’s management plan,
          which close for at least 7, 10 or 14 days after a trigger (published state practice); {severe.closureDaysPerYear} days a year is
          about two 14-day closures. Chances follow return periods (1 year in 2, 5 and 20), read against a crop that stays about three years
          on the lease. The cut points are common practice for screening, not regulatory values. Only the largest flood of each year is
          counted, so both figures lean low where a river floods several times a year. Per-flood ratings stay on each lease’s page and in
          the leases table’s flood columns.
        </p>
      </div>
    </details>
  );
}
