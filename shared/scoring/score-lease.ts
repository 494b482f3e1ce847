/**
 * @module shared/scoring/score-lease
 * Rates one lease under one flow scenario (product.md §4 item 5):
 *
 *   score = exposure fraction × severity × duration          (each term in 0..1)
 *
 * computed for two pathways, low salinity and faecal indicator, and the larger pathway
 * score sets the rating. All cut points and shape constants below are (c) screening
 * defaults chosen for this tool, not regulatory values; every one is overridable.
 *
 * Terms, (c) common practice / derived:
 * - Exposure fraction E: share of the lease area inside the modelled plume. The map's bands
 *   each run from the coast to an offshore line, so they nest and E is the largest band
 *   fraction; with `bandLayout: 'disjoint'` E is their sum (at most 1).
 * - Salinity severity: 0 when the lowest salinity stays at or above the species' chronic
 *   threshold S_c; 1 at or under the acute threshold S_a; in between it rises linearly from
 *   `severityFloor` (0.5) at S_c to 1 at S_a. Crossing the tolerance line is the event that
 *   matters, hence the floor.
 * - Salinity duration: days below S_c divided by the species' chronic duration, capped at 1
 *   (science.md §4.5, (c)).
 * - Indicator severity: 0 at or under the indicator threshold; above it,
 *   severityFloor + (1 − severityFloor) · min(1, log10(C/T) / log10(indicatorFullSeverityRatio)):
 *   full severity at 10× the threshold by default (with the default threshold 14, that is past
 *   the restricted-area limit of 88, science.md §6.1 (b)).
 * - Indicator duration: flood duration divided by `indicatorReferenceDays` (7 days, about the
 *   shortest rainfall closure in science.md §6.1's table, (a) RI DEM 2020), capped at 1.
 * - Rating: Low below 0.10, Moderate from 0.10, High from 0.30, Severe from 0.60.
 */

import { type SpeciesTolerance, validateTolerance } from '../biology/species-tolerance';
import { DEFAULT_INDICATOR_THRESHOLD } from '../biology/water-standards';

/** The four rating steps (ui.md: Low, Moderate, High, Severe). */
export const RATINGS = ['low', 'moderate', 'high', 'severe'] as const;
/** One of {@link RATINGS}. */
export type Rating = (typeof RATINGS)[number];
/** Display words for the ratings (ui.md). */
export const RATING_WORDS: Readonly<Record<Rating, string>> = Object.freeze({
  low: 'Low',
  moderate: 'Moderate',
  high: 'High',
  severe: 'Severe',
});

/** The reason given when the plume does not reach the lease. */
export const NO_REACH_REASON = 'The modelled plume does not reach this lease at this flow';

/** Score cut points: the lowest score of each step above Low. 0 < moderate < high < severe ≤ 1. */
export interface ScoreCutPoints {
  readonly moderate: number;
  readonly high: number;
  readonly severe: number;
}

/** Tunable shape of the score; all (c) screening defaults. */
export interface ScoringSettings {
  /** Rating cut points on the 0..1 score. Default 0.10 / 0.30 / 0.60, (c). */
  readonly cutPoints: ScoreCutPoints;
  /** Severity just past a threshold, 0..1. Default 0.5, (c). */
  readonly severityFloor: number;
  /** Indicator ratio C/T at which indicator severity reaches 1, > 1. Default 10, (c). */
  readonly indicatorFullSeverityRatio: number;
  /** Flood days at which the indicator duration term reaches 1, days > 0. Default 7, (c). */
  readonly indicatorReferenceDays: number;
  /** How band fractions combine into the exposure fraction. Default 'nested', (c). */
  readonly bandLayout: 'nested' | 'disjoint';
}

/** Partial settings; cut points may be given in part. */
export interface ScoringSettingsOverrides {
  readonly cutPoints?: Partial<ScoreCutPoints>;
  readonly severityFloor?: number;
  readonly indicatorFullSeverityRatio?: number;
  readonly indicatorReferenceDays?: number;
  readonly bandLayout?: 'nested' | 'disjoint';
}

/**
 * Default scoring settings, (c) screening defaults of this tool (see the module comment).
 *
 * @example
 * DEFAULT_SCORING_SETTINGS.cutPoints.high; // => 0.3
 */
export const DEFAULT_SCORING_SETTINGS: ScoringSettings = Object.freeze({
  cutPoints: Object.freeze({ moderate: 0.1, high: 0.3, severe: 0.6 }),
  severityFloor: 0.5,
  indicatorFullSeverityRatio: 10,
  indicatorReferenceDays: 7,
  bandLayout: 'nested',
});

/** A flow scenario as the score sees it. */
export interface LeaseScenario {
  /** Annual exceedance probability in (0, 1], or null for typed or seasonal flows. */
  readonly aep: number | null;
  /** River discharge, m³/s, ≥ 0. */
  readonly discharge: number;
  /** Flood duration, days, in (0, 365]. */
  readonly floodDurationDays: number;
  /** Optional name for typed or seasonal flows ("the Dec–Feb high flow"). */
  readonly name?: string;
}

/** Input of {@link scoreLease}. */
export interface ScoreLeaseInput {
  /** The species' tolerance (possibly with user overrides). */
  readonly tolerance: SpeciesTolerance;
  readonly scenario: LeaseScenario;
  /** Fraction (0..1) of the lease area inside each band, by band id. */
  readonly bandFractions: Readonly<Record<string, number>>;
  /** Lowest salinity over the lease, psu (0–45), or null when not computed. */
  readonly lowestSalinity: number | null;
  /** Highest faecal indicator over the lease, per 100 mL (≥ 0), or null when not computed. */
  readonly highestIndicator: number | null;
  /** Days the lease water stays under the chronic threshold, 0–365 (see {@link daysBelowTolerance}). */
  readonly daysBelowTolerance: number;
  /** Indicator screening threshold, per 100 mL, > 0. Default 14 (NSSP approved GM, (a), used as (c)). */
  readonly indicatorThreshold?: number;
  readonly settings?: ScoringSettingsOverrides;
}

/** One pathway's terms. */
export interface PathwayTerms {
  readonly severity: number;
  readonly duration: number;
  /** exposureFraction × severity × duration. */
  readonly score: number;
}

/** Numbers behind a rating. */
export interface ScoreNumbers {
  readonly exposureFraction: number;
  readonly reachesLease: boolean;
  readonly lowestSalinity: number | null;
  readonly acuteLowerSalinity: number;
  readonly chronicLowerSalinity: number;
  readonly chronicDurationDays: number;
  readonly daysBelowTolerance: number;
  readonly highestIndicator: number | null;
  readonly indicatorThreshold: number;
  readonly floodDurationDays: number;
  readonly aep: number | null;
  readonly discharge: number;
  readonly salinity: PathwayTerms;
  readonly indicator: PathwayTerms;
  /** The pathway with the larger score, or 'none' when both are 0. */
  readonly drivingPathway: 'salinity' | 'indicator' | 'none';
  readonly settings: ScoringSettings;
}

/** Output of {@link scoreLease}. */
export interface LeaseScore {
  readonly rating: Rating;
  /** 'Low' | 'Moderate' | 'High' | 'Severe'. */
  readonly ratingWord: string;
  /** 0..1. */
  readonly score: number;
  /** Plain-English reasons with numbers and units. */
  readonly reasons: readonly string[];
  readonly numbers: ScoreNumbers;
}

/**
 * Rates a lease under one scenario. See the module comment for every term and default.
 * Throws on out-of-range input, naming the argument and its range.
 *
 * @param input - {@link ScoreLeaseInput}
 * @returns rating, score (0..1), reasons and the numbers behind them
 * @example
 * scoreLease({
 *   tolerance: getSpeciesTolerance('pacific-oyster'),
 *   scenario: { aep: 0.1, discharge: 900, floodDurationDays: 9 },
 *   bandFractions: { 'fresh-core': 0.62 },
 *   lowestSalinity: 12.5, highestIndicator: null, daysBelowTolerance: 9,
 * }).rating; // => 'high' (0.62 × 0.75 × 1 = 0.465)
 */
export function scoreLease(input: ScoreLeaseInput): LeaseScore {
  const settings = resolveScoringSettings(input.settings);
  const { tolerance, scenario } = input;
  validateTolerance(tolerance);
  validateScenario(scenario);
  const threshold = input.indicatorThreshold ?? DEFAULT_INDICATOR_THRESHOLD;
  if (!Number.isFinite(threshold) || threshold <= 0) {
    throw new Error(`indicatorThreshold must be a count per 100 mL above 0; got ${threshold}`);
  }
  if (input.lowestSalinity !== null && !(input.lowestSalinity >= 0 && input.lowestSalinity <= 45)) {
    throw new Error(`lowestSalinity must be a salinity in psu from 0 to 45, or null; got ${input.lowestSalinity}`);
  }
  if (input.highestIndicator !== null && !(input.highestIndicator >= 0 && Number.isFinite(input.highestIndicator))) {
    throw new Error(`highestIndicator must be a count per 100 mL, 0 or more, or null; got ${input.highestIndicator}`);
  }
  const days = input.daysBelowTolerance;
  if (!(Number.isFinite(days) && days >= 0 && days <= 365)) {
    throw new Error(`daysBelowTolerance must be a number of days from 0 to 365; got ${days}`);
  }
  const exposureFraction = combineBandFractions(input.bandFractions, settings.bandLayout);
  const reachesLease = exposureFraction > 0;

  const salinitySeverity = salinitySeverityOf(input.lowestSalinity, tolerance, settings.severityFloor);
  const salinityDuration = Math.min(1, days / tolerance.chronicDurationDays);
  const indicatorSeverity = indicatorSeverityOf(input.highestIndicator, threshold, settings);
  const indicatorDuration = indicatorSeverity > 0 ? Math.min(1, scenario.floodDurationDays / settings.indicatorReferenceDays) : 0;
  const salinity: PathwayTerms = {
    severity: salinitySeverity,
    duration: salinityDuration,
    score: exposureFraction * salinitySeverity * salinityDuration,
  };
  const indicator: PathwayTerms = {
    severity: indicatorSeverity,
    duration: indicatorDuration,
    score: exposureFraction * indicatorSeverity * indicatorDuration,
  };
  const score = Math.max(salinity.score, indicator.score);
  const drivingPathway = score === 0 ? 'none' : salinity.score >= indicator.score ? 'salinity' : 'indicator';
  const rating = ratingForScore(score, settings.cutPoints);

  const numbers: ScoreNumbers = {
    exposureFraction,
    reachesLease,
    lowestSalinity: input.lowestSalinity,
    acuteLowerSalinity: tolerance.acuteLowerSalinity,
    chronicLowerSalinity: tolerance.chronicLowerSalinity,
    chronicDurationDays: tolerance.chronicDurationDays,
    daysBelowTolerance: days,
    highestIndicator: input.highestIndicator,
    indicatorThreshold: threshold,
    floodDurationDays: scenario.floodDurationDays,
    aep: scenario.aep,
    discharge: scenario.discharge,
    salinity,
    indicator,
    drivingPathway,
    settings,
  };

  const reasons = reachesLease ? buildReasons(input, numbers, rating, score, threshold) : [NO_REACH_REASON];
  return { rating, ratingWord: RATING_WORDS[rating], score, reasons, numbers };
}

/**
 * Maps a 0..1 score to a rating with the given cut points (inclusive lower bounds).
 *
 * @param score - 0..1
 * @param cutPoints - default {@link DEFAULT_SCORING_SETTINGS}.cutPoints, (c)
 * @returns the rating
 * @example
 * ratingForScore(0.3); // => 'high'
 * ratingForScore(0.0999); // => 'low'
 */
export function ratingForScore(score: number, cutPoints: ScoreCutPoints = DEFAULT_SCORING_SETTINGS.cutPoints): Rating {
  if (!(Number.isFinite(score) && score >= 0 && score <= 1)) {
    throw new Error(`score must be from 0 to 1; got ${score}`);
  }
  if (score >= cutPoints.severe) return 'severe';
  if (score >= cutPoints.high) return 'high';
  if (score >= cutPoints.moderate) return 'moderate';
  return 'low';
}

/**
 * Merges overrides into the default scoring settings and checks them.
 * Ranges: 0 < moderate < high < severe ≤ 1; severityFloor in [0, 1];
 * indicatorFullSeverityRatio > 1; indicatorReferenceDays in (0, 365].
 *
 * @param overrides - partial settings
 * @returns complete settings
 * @example
 * resolveScoringSettings({ cutPoints: { severe: 0.7 } }).cutPoints; // => { moderate: 0.1, high: 0.3, severe: 0.7 }
 */
export function resolveScoringSettings(overrides: ScoringSettingsOverrides = {}): ScoringSettings {
  const defaults = DEFAULT_SCORING_SETTINGS;
  const cutPoints = { ...defaults.cutPoints, ...definedOnly(overrides.cutPoints ?? {}) };
  const settings: ScoringSettings = {
    cutPoints,
    severityFloor: overrides.severityFloor ?? defaults.severityFloor,
    indicatorFullSeverityRatio: overrides.indicatorFullSeverityRatio ?? defaults.indicatorFullSeverityRatio,
    indicatorReferenceDays: overrides.indicatorReferenceDays ?? defaults.indicatorReferenceDays,
    bandLayout: overrides.bandLayout ?? defaults.bandLayout,
  };
  const { moderate, high, severe } = cutPoints;
  for (const [name, value] of Object.entries(cutPoints)) {
    if (!(Number.isFinite(value) && value > 0 && value <= 1)) {
      throw new Error(`cutPoints.${name} must be in (0, 1]; got ${value}`);
    }
  }
  if (!(moderate < high && high < severe)) {
    throw new Error(`cutPoints must rise: moderate < high < severe; got ${moderate}, ${high}, ${severe}`);
  }
  if (!(settings.severityFloor >= 0 && settings.severityFloor <= 1)) {
    throw new Error(`severityFloor must be from 0 to 1; got ${settings.severityFloor}`);
  }
  if (!(Number.isFinite(settings.indicatorFullSeverityRatio) && settings.indicatorFullSeverityRatio > 1)) {
    throw new Error(`indicatorFullSeverityRatio must be above 1; got ${settings.indicatorFullSeverityRatio}`);
  }
  if (!(settings.indicatorReferenceDays > 0 && settings.indicatorReferenceDays <= 365)) {
    throw new Error(`indicatorReferenceDays must be in (0, 365] days; got ${settings.indicatorReferenceDays}`);
  }
  if (settings.bandLayout !== 'nested' && settings.bandLayout !== 'disjoint') {
    throw new Error(`bandLayout must be 'nested' or 'disjoint'; got ${String(settings.bandLayout)}`);
  }
  return settings;
}

/** Options of {@link daysBelowTolerance}. */
export interface DaysBelowToleranceOptions {
  /** Days from the start of the flood until the plume reaches the lease, ≥ 0. Default 0. */
  readonly arrivalDays?: number;
  /** Days the lease water takes to recover above the threshold after the flood, ≥ 0. Default 0. */
  readonly recoveryDays?: number;
}

/**
 * Days the lease water stays under the species' chronic threshold, screening rule (c):
 * the plume field is computed for the flood discharge held for the flood's duration, so a
 * lease whose lowest salinity is under the chronic threshold is taken to stay under it from
 * the plume's arrival until the flood ends, plus an optional recovery lag:
 *
 *   days = lowestSalinity < S_c ? max(0, floodDurationDays − arrivalDays) + recoveryDays : 0
 *
 * @param lowestSalinity - lowest salinity over the lease, psu 0–45, or null (plume absent)
 * @param floodDurationDays - flood duration, days, (0, 365]
 * @param tolerance - the species' tolerance (its chronicLowerSalinity is used)
 * @param options - arrival and recovery days
 * @returns days below the chronic threshold, ≥ 0
 * @example
 * daysBelowTolerance(8.4, 9, getSpeciesTolerance('pacific-oyster')); // => 9
 * daysBelowTolerance(18, 9, getSpeciesTolerance('pacific-oyster')); // => 0
 */
export function daysBelowTolerance(
  lowestSalinity: number | null,
  floodDurationDays: number,
  tolerance: SpeciesTolerance,
  options: DaysBelowToleranceOptions = {},
): number {
  if (!(floodDurationDays > 0 && floodDurationDays <= 365)) {
    throw new Error(`floodDurationDays must be in (0, 365] days; got ${floodDurationDays}`);
  }
  const arrival = options.arrivalDays ?? 0;
  const recovery = options.recoveryDays ?? 0;
  if (!(Number.isFinite(arrival) && arrival >= 0)) throw new Error(`arrivalDays must be 0 or more days; got ${arrival}`);
  if (!(Number.isFinite(recovery) && recovery >= 0)) throw new Error(`recoveryDays must be 0 or more days; got ${recovery}`);
  if (lowestSalinity === null) return 0;
  if (!(lowestSalinity >= 0 && lowestSalinity <= 45)) {
    throw new Error(`lowestSalinity must be a salinity in psu from 0 to 45, or null; got ${lowestSalinity}`);
  }
  if (lowestSalinity >= tolerance.chronicLowerSalinity) return 0;
  const inFlood = Math.max(0, floodDurationDays - arrival);
  return inFlood > 0 ? inFlood + recovery : 0;
}

// ---------------------------------------------------------------------------------------------
// Private helpers
// ---------------------------------------------------------------------------------------------

/** @private */
function definedOnly<T extends object>(value: T): Partial<T> {
  return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as Partial<T>;
}

/** @private */
function validateScenario(scenario: LeaseScenario): void {
  if (scenario.aep !== null && !(Number.isFinite(scenario.aep) && scenario.aep > 0 && scenario.aep <= 1)) {
    throw new Error(`scenario.aep must be an annual exceedance probability in (0, 1], or null; got ${scenario.aep}`);
  }
  if (!(Number.isFinite(scenario.discharge) && scenario.discharge >= 0)) {
    throw new Error(`scenario.discharge must be a flow in m³/s, 0 or more; got ${scenario.discharge}`);
  }
  if (!(scenario.floodDurationDays > 0 && scenario.floodDurationDays <= 365)) {
    throw new Error(`scenario.floodDurationDays must be in (0, 365] days; got ${scenario.floodDurationDays}`);
  }
}

/** @private */
function combineBandFractions(bandFractions: Readonly<Record<string, number>>, layout: 'nested' | 'disjoint'): number {
  let max = 0;
  let sum = 0;
  for (const [band, fraction] of Object.entries(bandFractions)) {
    if (!(Number.isFinite(fraction) && fraction >= 0 && fraction <= 1)) {
      throw new Error(`bandFractions["${band}"] must be a fraction of the lease area from 0 to 1; got ${fraction}`);
    }
    max = Math.max(max, fraction);
    sum += fraction;
  }
  if (layout === 'nested') return max;
  if (sum > 1 + 1e-9) {
    throw new Error(`bandFractions must add up to at most 1 when bands are disjoint; got ${sum}`);
  }
  return Math.min(1, sum);
}

/** @private */
function salinitySeverityOf(lowest: number | null, tolerance: SpeciesTolerance, floor: number): number {
  if (lowest === null || lowest >= tolerance.chronicLowerSalinity) return 0;
  if (lowest <= tolerance.acuteLowerSalinity) return 1;
  const depth = (tolerance.chronicLowerSalinity - lowest) / (tolerance.chronicLowerSalinity - tolerance.acuteLowerSalinity);
  return floor + (1 - floor) * depth;
}

/** @private */
function indicatorSeverityOf(highest: number | null, threshold: number, settings: ScoringSettings): number {
  if (highest === null || highest <= threshold) return 0;
  const depth = Math.min(1, Math.log10(highest / threshold) / Math.log10(settings.indicatorFullSeverityRatio));
  return settings.severityFloor + (1 - settings.severityFloor) * depth;
}

/** @private "the 1-in-10-year flood (900 m³/s)" or "a flow of 120 m³/s". */
function scenarioPhrase(scenario: LeaseScenario): string {
  const flow = `${formatFlow(scenario.discharge)} m³/s`;
  if (scenario.aep !== null) {
    const years = 1 / scenario.aep;
    const rounded = Math.abs(years - Math.round(years)) < 0.05 ? String(Math.round(years)) : years.toFixed(1);
    return `the 1-in-${rounded}-year flood (${flow})`;
  }
  if (scenario.name) return `${scenario.name} (${flow})`;
  return `a flow of ${flow}`;
}

/** @private */
function buildReasons(input: ScoreLeaseInput, numbers: ScoreNumbers, rating: Rating, score: number, threshold: number): string[] {
  const { tolerance, scenario } = input;
  const reasons: string[] = [];
  const share = formatPercent(numbers.exposureFraction);
  const at = scenarioPhrase(scenario);
  const plural = tolerance.commonNamePlural;
  const limit = `the ${formatNumber(tolerance.chronicLowerSalinity)} that ${plural} tolerate for no more than ${formatDays(tolerance.chronicDurationDays)}`;
  if (input.lowestSalinity !== null) {
    const lowest = input.lowestSalinity.toFixed(1);
    if (input.lowestSalinity < tolerance.chronicLowerSalinity) {
      reasons.push(
        `Salinity over ${share} of the lease falls to ${lowest}, under ${limit}, for about ${formatDays(input.daysBelowTolerance)} at ${at}.`,
      );
      if (input.lowestSalinity <= tolerance.acuteLowerSalinity) {
        reasons.push(
          `That is at or under the acute limit of ${formatNumber(tolerance.acuteLowerSalinity)}, which ${plural} withstand for only about ${formatDays(tolerance.acuteDurationDays)}.`,
        );
      }
    } else {
      reasons.push(`Salinity over ${share} of the lease falls to ${lowest} at ${at}, staying at or above ${limit}.`);
    }
  }
  if (input.highestIndicator !== null) {
    const standard = threshold === DEFAULT_INDICATOR_THRESHOLD ? ' (the approved-area standard)' : '';
    const value = formatFlow(input.highestIndicator);
    if (input.highestIndicator > threshold) {
      reasons.push(
        `Faecal indicator over ${share} of the lease reaches ${value} per 100 mL, above the screening threshold of ${formatNumber(threshold)} per 100 mL${standard}, during the ${formatDays(scenario.floodDurationDays)} of ${at}.`,
      );
    } else {
      reasons.push(
        `Faecal indicator over the lease peaks at ${value} per 100 mL at ${at}, at or under the screening threshold of ${formatNumber(threshold)} per 100 mL${standard}.`,
      );
    }
  }
  const terms = numbers.drivingPathway === 'indicator' ? numbers.indicator : numbers.salinity;
  const pathway = numbers.drivingPathway === 'indicator' ? 'faecal indicator' : 'salinity';
  reasons.push(
    `Score ${fixed2(score)} of 1 (${pathway}: exposure ${fixed2(numbers.exposureFraction)} × severity ${fixed2(terms.severity)} × duration ${fixed2(terms.duration)}); ${RATING_WORDS[rating]} is ${ratingRange(rating, numbers.settings.cutPoints)}.`,
  );
  return reasons;
}

/** @private */
function ratingRange(rating: Rating, cut: ScoreCutPoints): string {
  const f = fixed2;
  switch (rating) {
    case 'low':
      return `under ${f(cut.moderate)}`;
    case 'moderate':
      return `${f(cut.moderate)} to under ${f(cut.high)}`;
    case 'high':
      return `${f(cut.high)} to under ${f(cut.severe)}`;
    case 'severe':
      return `${f(cut.severe)} or more`;
  }
}

/** @private two decimals, halves rounded up despite binary representation (0.465 → "0.47"). */
function fixed2(value: number): string {
  return (Math.round(value * 100 + 1e-9) / 100).toFixed(2);
}

/** @private */
function formatPercent(fraction: number): string {
  const percent = Math.round(fraction * 100);
  if (percent === 0 && fraction > 0) return 'under 1%';
  return `${percent}%`;
}

/** @private "1 day", "9 days", "0.5 days". */
function formatDays(days: number): string {
  const text = days < 10 && !Number.isInteger(days) ? String(Number(days.toFixed(1))) : String(Math.round(days));
  return `${text} ${text === '1' ? 'day' : 'days'}`;
}

/** @private */
function formatNumber(value: number): string {
  return Number.isInteger(value) ? String(value) : String(Number(value.toFixed(2)));
}

/** @private flows and counts: 3 significant figures below 1000, whole numbers above. */
function formatFlow(value: number): string {
  if (value >= 1000) return String(Math.round(value));
  return String(Number(value.toPrecision(3)));
}
