/**
 * @module shared/scoring/annual-rating
 * The yearly rating of a lease: the headline a grower or a lender decides on (product.md §5
 * "Overview"). It is set from two yearly figures, both weighted by how often each flood happens
 * (annualise.ts):
 *
 * - closure days a year: the expected days a year the faecal indicator on the lease is above the
 *   approved-area standard (14 per 100 mL, science.md §6.1 (a)); the sum over the scenarios'
 *   annual-exceedance-probability bands of the band's probability mass × its days over the
 *   standard;
 * - chance a year of a harmful salinity event: the chance a year of a flood whose low salinity
 *   harms the lease's species (harmful-salinity.ts, the species table of shared/biology).
 *
 * Cut points (inclusive: a figure equal to a cut point takes the higher step), the worse of the
 * two figures decides:
 *
 * | rating   | closure days a year | or chance a year            |
 * |----------|---------------------|-----------------------------|
 * | Severe   | ≥ 30                | ≥ 0.5 (1 year in 2)         |
 * | High     | ≥ 10                | ≥ 0.2 (1 year in 5)         |
 * | Moderate | ≥ 2                 | ≥ 0.05 (1 year in 20)       |
 * | Low      | below both          |                             |
 *
 * Why these numbers:
 * - Closure days are measured against the closures a conditionally approved area sees under an
 *   NSSP conditional management plan (science.md §6.1 (a), the table of real closure triggers):
 *   a closure lasts at least 7 days (Rhode Island DEM, approved areas), 10 days (Rhode Island,
 *   conditional areas) or 14 days (South Carolina DHEC). 10 days a year is about one such
 *   conditional-area closure every year; 30 days a year is two 14-day closures a year, a month of
 *   harvest lost; 2 days a year is one 10-day closure about every five years. The cut points
 *   themselves are (c) common practice of this tool, not regulatory values.
 * - Chances follow return-period practice (science.md §7.1: T = 1/AEP; the fit's scenarios run
 *   from the 1-in-2-year flood to the 1-in-100-year one): 1 year in 2, 1 in 5 and 1 in 20. Read
 *   against a crop that stays on the lease about three years (b, from memory: Pacific oysters
 *   reach market size in 18–36 months), a chance p a year meets a crop with chance 1 − (1 − p)³
 *   (c, derived): 0.5 → 0.88 (nearly every crop), 0.2 → 0.49 (about every second crop),
 *   0.05 → 0.14 (about one crop in seven). (c) common practice, not regulatory values.
 */

import { RATINGS, type Rating } from './score-lease';

/** The two yearly figures the rating is set from. */
export interface AnnualFigures {
  /** Expected days a year the indicator on the lease is above the standard, 0–365. */
  readonly closureDaysPerYear: number;
  /** Chance a year of a salinity event harmful to the lease's species, 0–1. */
  readonly harmfulSalinityChancePerYear: number;
}

/** The lowest figures of one step above Low. */
export interface AnnualRatingCut {
  readonly rating: Exclude<Rating, 'low'>;
  /** Closure days a year at or above which the step applies. */
  readonly closureDaysPerYear: number;
  /** Chance a year at or above which the step applies. */
  readonly harmfulSalinityChancePerYear: number;
  /** Why, in words for screens. */
  readonly reason: string;
}

/**
 * The cut points, worst step first (see the module comment for their sources).
 *
 * @example
 * ANNUAL_RATING_CUTS[0]; // => { rating: 'severe', closureDaysPerYear: 30, harmfulSalinityChancePerYear: 0.5, … }
 */
export const ANNUAL_RATING_CUTS: readonly AnnualRatingCut[] = Object.freeze([
  Object.freeze({
    rating: 'severe' as const,
    closureDaysPerYear: 30,
    harmfulSalinityChancePerYear: 0.5,
    reason: 'about a month of harvest lost each year (two 14-day closures), or harm in most years: nearly every three-year crop meets it',
  }),
  Object.freeze({
    rating: 'high' as const,
    closureDaysPerYear: 10,
    harmfulSalinityChancePerYear: 0.2,
    reason: 'about one conditional-area closure (10 days) every year, or harm about every second three-year crop',
  }),
  Object.freeze({
    rating: 'moderate' as const,
    closureDaysPerYear: 2,
    harmfulSalinityChancePerYear: 0.05,
    reason: 'about one 10-day closure every five years, or harm to about one three-year crop in seven',
  }),
]);

/**
 * Rate a lease's year from its two figures: the worst step either figure reaches (cut points
 * inclusive, see {@link ANNUAL_RATING_CUTS}).
 *
 * @param figures - closure days a year (0–366) and chance a year (0–1)
 * @returns 'low' | 'moderate' | 'high' | 'severe'
 * @throws when a figure is not finite or out of range
 * @example
 * annualRating({ closureDaysPerYear: 10, harmfulSalinityChancePerYear: 0 }); // => 'high'
 * annualRating({ closureDaysPerYear: 1.9, harmfulSalinityChancePerYear: 0.049 }); // => 'low'
 * annualRating({ closureDaysPerYear: 0, harmfulSalinityChancePerYear: 0.5 }); // => 'severe'
 */
export function annualRating(figures: AnnualFigures): Rating {
  const { closureDaysPerYear: days, harmfulSalinityChancePerYear: chance } = figures;
  if (!(Number.isFinite(days) && days >= 0 && days <= 366)) {
    throw new Error(`closureDaysPerYear must be a number of days from 0 to 366; got ${days}`);
  }
  if (!(Number.isFinite(chance) && chance >= 0 && chance <= 1)) {
    throw new Error(`harmfulSalinityChancePerYear must be a probability from 0 to 1; got ${chance}`);
  }
  for (const cut of ANNUAL_RATING_CUTS) {
    if (days >= cut.closureDaysPerYear || chance >= cut.harmfulSalinityChancePerYear) return cut.rating;
  }
  return 'low';
}

/**
 * The yearly figures of a lease screened by several rivers, (c) derived: closure days add up
 * (an upper bound when two rivers flood in the same storm; capped at 365), and the chance of at
 * least one harmful event treats the rivers as flooding independently, 1 − Π(1 − pᵢ) (rounded to 12 decimals, so a
 * single river's figure comes back unchanged and a cut point is not missed by rounding).
 *
 * @param figures - one entry per river (may be empty: no exposure)
 * @returns the combined figures
 * @example
 * combineAnnualFigures([
 *   { closureDaysPerYear: 4, harmfulSalinityChancePerYear: 0.1 },
 *   { closureDaysPerYear: 3, harmfulSalinityChancePerYear: 0.2 },
 * ]); // => { closureDaysPerYear: 7, harmfulSalinityChancePerYear: 0.28 }
 */
export function combineAnnualFigures(figures: readonly AnnualFigures[]): AnnualFigures {
  let days = 0;
  let none = 1;
  for (const f of figures) {
    days += f.closureDaysPerYear;
    none *= 1 - f.harmfulSalinityChancePerYear;
  }
  // Rounded to 12 decimals so that one river's 0.2 stays 0.2 (1 − (1 − 0.2) is 0.19999999999999996 in binary).
  return { closureDaysPerYear: Math.min(365, days), harmfulSalinityChancePerYear: Math.round((1 - none) * 1e12) / 1e12 };
}

/** Rank of a rating for ordering, -1 for none. */
function rank(rating: Rating | null | undefined): number {
  return rating ? RATINGS.indexOf(rating) : -1;
}

/** What {@link compareAnnualWorstFirst} orders. */
export interface RankedAnnual {
  readonly annualRating: Rating | null;
  readonly closureDaysPerYear: number | null;
  readonly harmfulSalinityChancePerYear: number | null;
}

/**
 * Order for the Overview, the leases table and Compare: the worse yearly rating first, then more
 * closure days a year, then the higher chance a year; leases not yet rated last.
 *
 * @example
 * rows.sort(compareAnnualWorstFirst);
 */
export function compareAnnualWorstFirst(a: RankedAnnual, b: RankedAnnual): number {
  return (
    rank(b.annualRating) - rank(a.annualRating) ||
    (b.closureDaysPerYear ?? -1) - (a.closureDaysPerYear ?? -1) ||
    (b.harmfulSalinityChancePerYear ?? -1) - (a.harmfulSalinityChancePerYear ?? -1)
  );
}

/** "1 year in 20" for a chance of 0.05. */
function oneIn(chance: number): string {
  return `1 year in ${Math.round(1 / chance)}`;
}

/**
 * The rule in words, one line per step, for the "How the yearly rating is set" explanation on
 * screens and in reports.
 *
 * @example
 * annualRatingRuleLines()[0];
 * // => 'Severe: 30 or more closure days a year, or a chance a year of 0.5 (1 year in 2) or more — about a month …'
 */
export function annualRatingRuleLines(): string[] {
  const words: Record<Rating, string> = { low: 'Low', moderate: 'Moderate', high: 'High', severe: 'Severe' };
  const lines = ANNUAL_RATING_CUTS.map(
    (c) =>
      `${words[c.rating]}: ${c.closureDaysPerYear} or more closure days a year, or a chance a year of ${c.harmfulSalinityChancePerYear} (${oneIn(
        c.harmfulSalinityChancePerYear,
      )}) or more — ${c.reason}.`,
  );
  const last = ANNUAL_RATING_CUTS[ANNUAL_RATING_CUTS.length - 1];
  lines.push(
    `Low: fewer than ${last.closureDaysPerYear} closure days a year and a chance under ${last.harmfulSalinityChancePerYear} (${oneIn(
      last.harmfulSalinityChancePerYear,
    )}).`,
  );
  return lines;
}
