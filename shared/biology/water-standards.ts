/**
 * @module shared/biology/water-standards
 * Shellfish harvesting-area bacteriological standards (science.md §6) and the screening
 * indicator bands the map draws from them.
 *
 * - NSSP (United States): faecal coliform in the water column, MPN or CFU per 100 mL
 *   (science.md §6.1; FDA Guide for the Control of Molluscan Shellfish, Model Ordinance
 *   Chapter IV).
 * - EU Regulation (EU) 2019/627 Articles 53–55: E. coli per 100 g of flesh and
 *   intravalvular liquid (science.md §6.2).
 *
 * The classify functions say which numeric criterion a set of statistics meets. They are not
 * the authority's classification, which also needs a sanitary survey and the authority's
 * decision (science.md §6.1). Boundaries are inclusive (science.md §8 #33–#34).
 */

import type { SourceNote } from './source-note';

// ---------------------------------------------------------------------------------------------
// Statistics
// ---------------------------------------------------------------------------------------------

/**
 * Geometric mean of positive counts: 10^(mean of log10 values).
 * Censored results ("<2") must be replaced by a number before calling, as the authority's
 * own practice requires; this function does not guess.
 * Source: (c) common practice / derived — the NSSP criteria are stated as geometric means
 * (science.md §6.1, (a)).
 *
 * @param values - counts per 100 mL (or per 100 g), each > 0; at least one
 * @returns the geometric mean, same units
 * @example
 * geometricMean([10, 1000]); // => 100
 */
export function geometricMean(values: readonly number[]): number {
  checkPositiveCounts('values', values, 1);
  return 10 ** mean(values.map(Math.log10));
}

/** The NSSP multiplier of the log standard deviation for the estimated 90th percentile. */
export const NSSP_P90_Z = 1.28;

/**
 * NSSP estimated 90th percentile of a log-normal sample:
 * 10^(mean_log + 1.28 · sd_log), with log10 values and the sample standard deviation
 * (n − 1 denominator).
 * Source: (b) from memory: NSSP Model Ordinance Chapter IV, estimated 90th percentile for
 * systematic random sampling; the 43/49/31 limits it is compared with are (a) (science.md §6.1).
 *
 * @param values - counts per 100 mL, each > 0; at least two
 * @returns the estimated 90th percentile, same units
 * @example
 * estimatedP90([10, 100]); // => 10^(1.5 + 1.28 × 0.7071) ≈ 254.15
 */
export function estimatedP90(values: readonly number[]): number {
  checkPositiveCounts('values', values, 2);
  const logs = values.map(Math.log10);
  return 10 ** (mean(logs) + NSSP_P90_Z * sampleSd(logs));
}

// ---------------------------------------------------------------------------------------------
// NSSP
// ---------------------------------------------------------------------------------------------

/** NSSP sampling strategy and laboratory method. */
export type NsspStrategy = 'srs-5-tube' | 'srs-3-tube' | 'srs-mtec' | 'apc-5-tube';

/** Limits for one class under one strategy. */
export interface NsspLimits {
  /** Geometric mean (APC: median or geometric mean) limit, per 100 mL. */
  readonly geometricMean: number;
  /** SRS: estimated 90th-percentile limit; APC: the value no more than 10 % of samples may exceed. Per 100 mL. */
  readonly p90: number;
  /** Source of these two numbers. */
  readonly source: SourceNote;
}

/** One row of the NSSP water-column criteria. */
export interface NsspCriteria {
  readonly strategy: NsspStrategy;
  /** What the row applies to, in words. */
  readonly appliesTo: string;
  /** Unit of the counts. */
  readonly unit: 'MPN/100 mL' | 'CFU/100 mL';
  /** Approved-area limits. */
  readonly approved: NsspLimits;
  /** Restricted-area limits, or null when science.md gives none for this method. */
  readonly restricted: NsspLimits | null;
  /** Minimum number of samples for the statistics. */
  readonly minimumSamples: number;
  /** Source of the minimum. */
  readonly minimumSamplesSource: SourceNote;
}

const NSSP_APPROVED_SOURCE =
  'FDA Guide for the Control of Molluscan Shellfish, Model Ordinance Chapter IV, as given by Virginia 9VAC25-260-160, S.C. Regs 61-47 (B)(3) and the Whatcom County shellfish classification page (science.md §6.1)';
const NSSP_RESTRICTED_SOURCE = 'NSSP Model Ordinance restricted criteria (science.md §6.1)';

/**
 * NSSP water-column criteria for faecal coliform (science.md §6.1).
 * Approved: GM ≤ 14 with estimated P90 ≤ 43 (SRS 5-tube MPN), ≤ 49 (SRS 3-tube MPN) or ≤ 31
 * (SRS mTEC membrane filtration), (a); APC: median or GM ≤ 14 and not more than 10 % of
 * samples > 43, (a). Restricted: GM ≤ 88 with P90 ≤ 260 (5-tube) or ≤ 300 (3-tube), (b).
 *
 * @example
 * NSSP_CRITERIA['srs-5-tube'].approved.p90; // => 43
 */
export const NSSP_CRITERIA: Readonly<Record<NsspStrategy, NsspCriteria>> = Object.freeze({
  'srs-5-tube': {
    strategy: 'srs-5-tube',
    appliesTo: 'systematic random sampling, 5-tube 3-dilution MPN',
    unit: 'MPN/100 mL',
    approved: { geometricMean: 14, p90: 43, source: { label: 'a', citation: NSSP_APPROVED_SOURCE } },
    restricted: { geometricMean: 88, p90: 260, source: { label: 'b', citation: NSSP_RESTRICTED_SOURCE } },
    minimumSamples: 30,
    minimumSamplesSource: { label: 'a', citation: 'Whatcom County shellfish classification page: a minimum of the last 30 samples' },
  },
  'srs-3-tube': {
    strategy: 'srs-3-tube',
    appliesTo: 'systematic random sampling, 3-tube MPN',
    unit: 'MPN/100 mL',
    approved: { geometricMean: 14, p90: 49, source: { label: 'a', citation: NSSP_APPROVED_SOURCE } },
    restricted: { geometricMean: 88, p90: 300, source: { label: 'b', citation: NSSP_RESTRICTED_SOURCE } },
    minimumSamples: 30,
    minimumSamplesSource: { label: 'a', citation: 'Whatcom County shellfish classification page: a minimum of the last 30 samples' },
  },
  'srs-mtec': {
    strategy: 'srs-mtec',
    appliesTo: 'systematic random sampling, membrane filtration (mTEC)',
    unit: 'CFU/100 mL',
    approved: { geometricMean: 14, p90: 31, source: { label: 'a', citation: NSSP_APPROVED_SOURCE } },
    restricted: null,
    minimumSamples: 30,
    minimumSamplesSource: { label: 'a', citation: 'Whatcom County shellfish classification page: a minimum of the last 30 samples' },
  },
  'apc-5-tube': {
    strategy: 'apc-5-tube',
    appliesTo: 'adverse pollution condition strategy, 5-tube MPN: not more than 10 % of samples above the limit',
    unit: 'MPN/100 mL',
    approved: { geometricMean: 14, p90: 43, source: { label: 'a', citation: NSSP_APPROVED_SOURCE } },
    restricted: null,
    minimumSamples: 15,
    minimumSamplesSource: { label: 'b', citation: 'NSSP Model Ordinance APC minimum of 15 samples, from memory (science.md §6.1)' },
  },
});

/** Share of APC samples allowed above the limit, (a) science.md §6.1. */
export const NSSP_APC_MAX_FRACTION_ABOVE = 0.1;

/** Statistics in for an SRS strategy (the default strategy is 'srs-5-tube'). */
export interface NsspSrsInput {
  readonly strategy?: 'srs-5-tube' | 'srs-3-tube' | 'srs-mtec';
  /** Geometric mean, per 100 mL, ≥ 0. */
  readonly geometricMean: number;
  /** Estimated 90th percentile, per 100 mL, ≥ 0. */
  readonly p90: number;
}

/** Statistics in for the APC strategy. */
export interface NsspApcInput {
  readonly strategy: 'apc-5-tube';
  /** Median or geometric mean, per 100 mL, ≥ 0. */
  readonly geometricMean: number;
  /** Fraction (0–1) of samples above 43 per 100 mL. */
  readonly fractionAbove: number;
}

/** Which water-column criterion the statistics meet. */
export type NsspCategory = 'approved' | 'restricted' | 'exceeds-restricted' | 'not-approved';

/** Result of {@link classifyNssp}. */
export interface NsspResult {
  /**
   * 'approved' or 'restricted': the statistics meet that class's criteria;
   * 'exceeds-restricted': they meet neither; 'not-approved': they fail the approved criteria
   * and science.md gives no restricted criteria for this strategy.
   */
  readonly category: NsspCategory;
  readonly meetsApprovedCriteria: boolean;
  /** null when the strategy has no restricted criteria here. */
  readonly meetsRestrictedCriteria: boolean | null;
  readonly criteria: NsspCriteria;
  /** Plain-English reasons with the numbers. */
  readonly reasons: readonly string[];
}

/**
 * Compares NSSP statistics with the approved and restricted water-column criteria.
 * Boundaries are inclusive: GM = 14 with P90 = 43 meets the approved criteria (science.md
 * §8 #33, (a)); GM = 15 does not.
 *
 * @param input - {@link NsspSrsInput} or {@link NsspApcInput}
 * @returns the category met, with reasons
 * @example
 * classifyNssp({ geometricMean: 14, p90: 43 }).category; // => 'approved'
 * classifyNssp({ geometricMean: 15, p90: 43 }).category; // => 'restricted'
 */
export function classifyNssp(input: NsspSrsInput | NsspApcInput): NsspResult {
  checkNonNegative('geometricMean', input.geometricMean);
  if (input.strategy === 'apc-5-tube') {
    const criteria = NSSP_CRITERIA['apc-5-tube'];
    const fraction = input.fractionAbove;
    if (!Number.isFinite(fraction) || fraction < 0 || fraction > 1) {
      throw new Error(`fractionAbove must be a fraction from 0 to 1; got ${fraction}`);
    }
    const gmOk = input.geometricMean <= criteria.approved.geometricMean;
    const shareOk = fraction <= NSSP_APC_MAX_FRACTION_ABOVE;
    const reasons = [
      `Median or geometric mean ${fmt(input.geometricMean)} ${criteria.unit} is ${gmOk ? 'at or under' : 'above'} the approved limit of ${criteria.approved.geometricMean}.`,
      `${fmt(fraction * 100)} % of samples are above ${criteria.approved.p90} ${criteria.unit}; the approved limit is 10 %.`,
    ];
    const meets = gmOk && shareOk;
    return {
      category: meets ? 'approved' : 'not-approved',
      meetsApprovedCriteria: meets,
      meetsRestrictedCriteria: null,
      criteria,
      reasons,
    };
  }
  const strategy = input.strategy ?? 'srs-5-tube';
  const criteria = NSSP_CRITERIA[strategy];
  if (!criteria) {
    throw new Error(`strategy must be one of ${Object.keys(NSSP_CRITERIA).join(', ')}; got "${String(strategy)}"`);
  }
  checkNonNegative('p90', input.p90);
  const meetsApproved = meetsLimits(input, criteria.approved);
  const meetsRestricted = criteria.restricted ? meetsLimits(input, criteria.restricted) : null;
  const reasons = [
    `Geometric mean ${fmt(input.geometricMean)} and estimated 90th percentile ${fmt(input.p90)} ${criteria.unit}, against the approved limits ${criteria.approved.geometricMean} and ${criteria.approved.p90} (${criteria.appliesTo}).`,
  ];
  if (!meetsApproved && criteria.restricted) {
    reasons.push(`Restricted limits are ${criteria.restricted.geometricMean} and ${criteria.restricted.p90} ${criteria.unit}.`);
  }
  let category: NsspCategory;
  if (meetsApproved) category = 'approved';
  else if (meetsRestricted === null) category = 'not-approved';
  else category = meetsRestricted ? 'restricted' : 'exceeds-restricted';
  return { category, meetsApprovedCriteria: meetsApproved, meetsRestrictedCriteria: meetsRestricted, criteria, reasons };
}

/** Result of {@link classifyNsspSamples}. */
export interface NsspSampleResult extends NsspResult {
  readonly n: number;
  readonly geometricMean: number;
  /** Estimated 90th percentile (SRS) or null (APC). */
  readonly p90: number | null;
  /** Fraction of samples above the 90th-percentile limit (APC) or null (SRS). */
  readonly fractionAbove: number | null;
  /** E.g. fewer samples than the strategy's minimum. */
  readonly warnings: readonly string[];
}

/**
 * Computes the NSSP statistics from raw counts and classifies them with {@link classifyNssp}.
 * For APC the geometric mean is used (the criterion accepts the median or the GM).
 *
 * @param samples - faecal coliform counts per 100 mL, each > 0, at least 2
 * @param strategy - sampling strategy (default 'srs-5-tube')
 * @returns the category, statistics and warnings
 * @example
 * classifyNsspSamples(Array(30).fill(10)).category; // => 'approved'
 */
export function classifyNsspSamples(samples: readonly number[], strategy: NsspStrategy = 'srs-5-tube'): NsspSampleResult {
  checkPositiveCounts('samples', samples, 2);
  const criteria = NSSP_CRITERIA[strategy];
  if (!criteria) {
    throw new Error(`strategy must be one of ${Object.keys(NSSP_CRITERIA).join(', ')}; got "${String(strategy)}"`);
  }
  const gm = geometricMean(samples);
  const warnings =
    samples.length < criteria.minimumSamples
      ? [`Only ${samples.length} samples; the ${criteria.appliesTo} statistics need at least ${criteria.minimumSamples}.`]
      : [];
  if (strategy === 'apc-5-tube') {
    const fractionAbove = samples.filter((value) => value > criteria.approved.p90).length / samples.length;
    const result = classifyNssp({ strategy, geometricMean: gm, fractionAbove });
    return { ...result, n: samples.length, geometricMean: gm, p90: null, fractionAbove, warnings };
  }
  const p90 = estimatedP90(samples);
  const result = classifyNssp({ strategy, geometricMean: gm, p90 });
  return { ...result, n: samples.length, geometricMean: gm, p90, fractionAbove: null, warnings };
}

// ---------------------------------------------------------------------------------------------
// EU Regulation (EU) 2019/627
// ---------------------------------------------------------------------------------------------

/** EU production-area class, or not classifiable for harvest. */
export type EuClass = 'A' | 'B' | 'C' | 'not-classifiable';

/** Limits of one EU class, E. coli per 100 g of flesh and intravalvular liquid. */
export interface EuClassCriteria {
  readonly euClass: 'A' | 'B' | 'C';
  /** Share of samples (0–1) that must be at or under `limit`; 1 means all samples. */
  readonly share: number;
  /** Limit for that share, per 100 g. */
  readonly limit: number;
  /** Limit for every sample, per 100 g. */
  readonly maximum: number;
  /** What the class allows. */
  readonly use: string;
  readonly source: SourceNote;
  /** Source of `maximum`, when it differs from `source`. */
  readonly maximumSource: SourceNote;
}

/**
 * Regulation (EU) 2019/627 flesh criteria (science.md §6.2). Class A: 80 % ≤ 230 (a) and all
 * ≤ 700 (b). Class B: 90 % ≤ 4 600 and all ≤ 46 000 (a). Class C: all ≤ 46 000 (b).
 *
 * @example
 * EU_CLASS_CRITERIA[1].limit; // => 4600
 */
export const EU_CLASS_CRITERIA: readonly EuClassCriteria[] = Object.freeze([
  {
    euClass: 'A',
    share: 0.8,
    limit: 230,
    maximum: 700,
    use: 'direct human consumption',
    source: { label: 'a', citation: 'Regulation (EU) 2019/627 Art. 53; wording in Reg. (EU) 2015/2285 Art. 1(3)' },
    maximumSource: {
      label: 'b',
      citation: 'Regulation (EU) 2019/627 Art. 53, remaining 20 % ≤ 700 (text cut off in excerpt; standard value)',
    },
  },
  {
    euClass: 'B',
    share: 0.9,
    limit: 4600,
    maximum: 46000,
    use: 'market only after purification in a depuration centre or after relaying',
    source: { label: 'a', citation: 'Regulation (EU) 2019/627 Art. 54(2)–(3)' },
    maximumSource: { label: 'a', citation: 'Regulation (EU) 2019/627 Art. 54(2)–(3)' },
  },
  {
    euClass: 'C',
    share: 1,
    limit: 46000,
    maximum: 46000,
    use: 'market only after relaying over a long period',
    source: { label: 'b', citation: 'Regulation (EU) 2019/627 Art. 55' },
    maximumSource: { label: 'b', citation: 'Regulation (EU) 2019/627 Art. 55' },
  },
] as const satisfies readonly EuClassCriteria[]);

/** Result of {@link classifyEu}. */
export interface EuResult {
  readonly euClass: EuClass;
  readonly n: number;
  /** Share of samples at or under 230 per 100 g. */
  readonly shareAtOrUnder230: number;
  /** Share of samples at or under 4 600 per 100 g. */
  readonly shareAtOrUnder4600: number;
  /** Highest sample, per 100 g. */
  readonly max: number;
  readonly reasons: readonly string[];
}

/**
 * Which Regulation (EU) 2019/627 class a review period's flesh results meet. Boundaries are
 * inclusive (science.md §8 #34): 230, 700, 4 600 and 46 000 themselves pass.
 *
 * @param samples - E. coli per 100 g flesh and intravalvular liquid, each ≥ 0; at least one
 * @returns the class met, shares and reasons
 * @example
 * classifyEu([230, 230, 230, 230, 700]).euClass; // => 'A'
 * classifyEu([230, 230, 230, 230, 701]).euClass; // => 'B'
 */
export function classifyEu(samples: readonly number[]): EuResult {
  if (!Array.isArray(samples) || samples.length === 0) {
    throw new Error('samples must be a non-empty array of E. coli counts per 100 g');
  }
  for (const value of samples) {
    if (!Number.isFinite(value) || value < 0) {
      throw new Error(`samples must be counts per 100 g, each 0 or more; got ${value}`);
    }
  }
  const n = samples.length;
  const shareAtOrUnder = (limit: number) => samples.filter((value) => value <= limit).length / n;
  const max = Math.max(...samples);
  const shareAtOrUnder230 = shareAtOrUnder(230);
  const shareAtOrUnder4600 = shareAtOrUnder(4600);
  let euClass: EuClass = 'not-classifiable';
  for (const criteria of EU_CLASS_CRITERIA) {
    if (shareAtOrUnder(criteria.limit) >= criteria.share - 1e-12 && max <= criteria.maximum) {
      euClass = criteria.euClass;
      break;
    }
  }
  const reasons = [
    `${n} samples; ${fmt(shareAtOrUnder230 * 100)} % at or under 230 and ${fmt(shareAtOrUnder4600 * 100)} % at or under 4 600 E. coli per 100 g; highest ${fmt(max)}.`,
    euClass === 'not-classifiable'
      ? 'A sample above 46 000 E. coli per 100 g: the area cannot be classified for harvest.'
      : `Meets the Class ${euClass} criteria.`,
  ];
  return { euClass, n, shareAtOrUnder230, shareAtOrUnder4600, max, reasons };
}

// ---------------------------------------------------------------------------------------------
// Screening indicator bands for the map
// ---------------------------------------------------------------------------------------------

/**
 * Default screening indicator threshold, faecal indicator per 100 mL: the NSSP approved-area
 * geometric-mean limit of 14 (a, science.md §6.1). Comparing a modelled flood concentration
 * with a long-run geometric-mean standard is a screening convention, (c): users may change it.
 */
export const DEFAULT_INDICATOR_THRESHOLD = 14;
/** Second band: the NSSP restricted-area geometric-mean limit of 88 per 100 mL, (b) science.md §6.1. */
export const DEFAULT_RESTRICTED_INDICATOR_THRESHOLD = 88;

/** A screening band of the indicator field. */
export interface IndicatorBand {
  readonly id: 'indicator-above-approved' | 'indicator-above-restricted';
  /** Band name for the map, with its threshold. */
  readonly label: string;
  /** The band covers water whose indicator is above this, per 100 mL. */
  readonly threshold: number;
  readonly unit: 'per 100 mL';
  readonly source: SourceNote;
  /** True when the user changed the threshold. */
  readonly overridden: boolean;
}

/** User overrides of the indicator band thresholds, per 100 mL, each > 0. */
export interface IndicatorThresholdOverrides {
  readonly approved?: number;
  readonly restricted?: number;
}

/**
 * The screening indicator bands, lowest threshold first. Defaults: above the approved-area
 * standard (14 per 100 mL, (a) NSSP GM, used as a screening threshold (c)) and above the
 * restricted-area standard (88 per 100 mL, (b)). Both are overridable; the approved threshold
 * must stay below the restricted one.
 *
 * @param overrides - thresholds per 100 mL, each > 0
 * @returns the two bands
 * @example
 * indicatorBands()[0].label; // => 'indicator above the approved-area standard (14 per 100 mL)'
 * indicatorBands({ approved: 20 })[0].threshold; // => 20
 */
export function indicatorBands(overrides: IndicatorThresholdOverrides = {}): readonly IndicatorBand[] {
  const approved = overrides.approved ?? DEFAULT_INDICATOR_THRESHOLD;
  const restricted = overrides.restricted ?? DEFAULT_RESTRICTED_INDICATOR_THRESHOLD;
  for (const [name, value] of [
    ['approved', approved],
    ['restricted', restricted],
  ] as const) {
    if (!Number.isFinite(value) || value <= 0 || value > 1e7) {
      throw new Error(`${name} indicator threshold must be a count per 100 mL above 0 and at most 1e7; got ${value}`);
    }
  }
  if (approved >= restricted) {
    throw new Error(`approved indicator threshold must be below the restricted one (${fmt(restricted)} per 100 mL); got ${fmt(approved)}`);
  }
  return [
    {
      id: 'indicator-above-approved',
      label: `indicator above the approved-area standard (${fmt(approved)} per 100 mL)`,
      threshold: approved,
      unit: 'per 100 mL',
      source:
        overrides.approved === undefined
          ? { label: 'a', citation: `NSSP approved-area geometric mean ≤ 14 (${NSSP_APPROVED_SOURCE}); used as a screening threshold (c)` }
          : { label: 'c', citation: 'user-set screening threshold' },
      overridden: overrides.approved !== undefined,
    },
    {
      id: 'indicator-above-restricted',
      label: `indicator above the restricted-area standard (${fmt(restricted)} per 100 mL)`,
      threshold: restricted,
      unit: 'per 100 mL',
      source:
        overrides.restricted === undefined
          ? { label: 'b', citation: `${NSSP_RESTRICTED_SOURCE}: geometric mean ≤ 88; used as a screening threshold (c)` }
          : { label: 'c', citation: 'user-set screening threshold' },
      overridden: overrides.restricted !== undefined,
    },
  ];
}

// ---------------------------------------------------------------------------------------------
// Private helpers
// ---------------------------------------------------------------------------------------------

/** @private */
function meetsLimits(stats: { geometricMean: number; p90: number }, limits: NsspLimits): boolean {
  return stats.geometricMean <= limits.geometricMean && stats.p90 <= limits.p90;
}

/** @private */
function mean(values: readonly number[]): number {
  let sum = 0;
  for (const value of values) sum += value;
  return sum / values.length;
}

/** @private sample standard deviation (n − 1). */
function sampleSd(values: readonly number[]): number {
  const m = mean(values);
  let ss = 0;
  for (const value of values) ss += (value - m) ** 2;
  return Math.sqrt(ss / (values.length - 1));
}

/** @private */
function checkPositiveCounts(name: string, values: readonly number[], minLength: number): void {
  if (!Array.isArray(values) || values.length < minLength) {
    throw new Error(
      `${name} must be an array of at least ${minLength} positive counts; got ${Array.isArray(values) ? values.length : typeof values}`,
    );
  }
  for (const value of values) {
    if (!Number.isFinite(value) || value <= 0) {
      throw new Error(`${name} must hold counts above 0 (replace censored results such as "<2" first); got ${value}`);
    }
  }
}

/** @private */
function checkNonNegative(name: string, value: number): void {
  if (!Number.isFinite(value) || value < 0) {
    throw new Error(`${name} must be a count per 100 mL, 0 or more; got ${value}`);
  }
}

/** @private plain number formatting: up to 3 significant decimals, no trailing zeros. */
function fmt(value: number): string {
  if (Number.isInteger(value)) return String(value);
  return String(Number(value.toFixed(Math.abs(value) >= 10 ? 1 : 2)));
}
