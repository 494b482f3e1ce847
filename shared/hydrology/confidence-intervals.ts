/**
 * @module shared/hydrology/confidence-intervals
 * Confidence limits of flood quantiles: the Bulletin 17B approximate limits for log-Pearson
 * III, and a seeded parametric bootstrap for GEV, Gumbel and log-Pearson III.
 */

import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { requireFiniteArray, requireInteger, requireOpenProbability } from './check-values';
import { empiricalQuantile } from './empirical-quantile';
import { fitGevLMoments, gevQuantile } from './gev';
import { fitGumbelLMoments, fitGumbelMoments, gumbelQuantile } from './gumbel';
import { fitLogPearson3, type LogPearson3Options, logPearson3Quantile, pearson3FrequencyFactor } from './log-pearson3';
import { createUniformStream } from './seeded-uniform';

/** Lower and upper confidence limits of one quantile. */
export interface QuantileInterval {
  /** Annual exceedance probability. */
  aep: number;
  /** Lower limit [data units]. */
  lower: number;
  /** Upper limit [data units]. */
  upper: number;
}

/** Distributions the bootstrap can resample. */
export type BootstrapDistribution = 'gev' | 'gumbel-moments' | 'gumbel-l-moments' | 'lp3';

/** Options of {@link bootstrapQuantileIntervals}. */
export interface BootstrapOptions {
  /** Number of resamples, 0…100 000; default 200 (0 returns no intervals). */
  resamples?: number;
  /** Seed of the random stream, 0…4294967295; default 1. */
  seed?: number;
  /** Two-sided confidence level, 0…1 exclusive; default 0.90 (5 % and 95 % limits). */
  confidence?: number;
  /** For 'lp3': the skew options used in the fit and in every refit (rounding is not applied to refits). */
  lp3?: LogPearson3Options;
}

/** The result of {@link bootstrapQuantileIntervals}. */
export interface BootstrapResult {
  intervals: QuantileInterval[];
  /** Resamples whose refit succeeded. */
  resamples: number;
  /** Resamples whose refit failed (e.g. all values equal) and were skipped. */
  failed: number;
}

/** Default bootstrap resample count: small, so a fit stays fast (about 2–5 ms per 100 resamples of 100 peaks). */
export const DEFAULT_BOOTSTRAP_RESAMPLES = 200;

/** Default two-sided confidence level of the intervals (17B's 0.05 and 0.95 limits). */
export const DEFAULT_CONFIDENCE = 0.9;

/**
 * Bulletin 17B approximate confidence limits of a log-Pearson III quantile, from the
 * noncentral-t approximation: K_U,L = (K ± √(K² − ab))/a with a = 1 − z²/(2(n − 1)) and
 * b = K² − z²/n, z the standard normal deviate of the one-sided level (1 + confidence)/2;
 * limits Q = 10^(ȳ + K_U,L s). The default 0.90 gives 17B's "0.05 and 0.95" limits.
 *
 * @param params - { mean, stdDev (> 0) of log10 Q, skew (the skew used), n (≥ 3) }
 * @param aep - annual exceedance probability, 0 < aep < 1
 * @param confidence - two-sided level, 0 < c < 1 (default 0.90)
 * @returns { aep, lower, upper } [data units]
 * @throws RangeError if an argument is out of range or n is too small for a > 0
 * @example
 * lp3ConfidenceLimits17B({ mean: 3.36835, stdDev: 0.245614, skew: 0.7, n: 24 }, 0.99);
 * // => { aep: 0.99, lower: 568, upper: 1095 } (Fishkill Creek, cfs; 17B prints 568–1100)
 * Source: (b) from memory: Bulletin 17B (IACWD 1982), Appendix 9 (brief to this module);
 * checked (a) against the Fishkill Creek limits 568–1100 cfs quoted in science.md §7.5.
 */
export function lp3ConfidenceLimits17B(
  params: { mean: number; stdDev: number; skew: number; n: number },
  aep: number,
  confidence: number = DEFAULT_CONFIDENCE,
): QuantileInterval {
  requireOpenProbability('aep', aep);
  requireOpenProbability('confidence', confidence);
  const { mean, stdDev, skew, n } = params;
  if (!Number.isInteger(n) || n < 3) throw new RangeError(`n must be a whole number of at least 3 peaks (got ${String(n)})`);
  if (!(stdDev > 0) || !Number.isFinite(stdDev))
    throw new RangeError(`stdDev must be a finite number greater than 0 (got ${String(stdDev)})`);
  if (!Number.isFinite(mean)) throw new RangeError(`mean must be a finite number (got ${String(mean)})`);
  const K = pearson3FrequencyFactor(skew, 1 - aep);
  const z = normalQuantile((1 + confidence) / 2, 0, 1);
  const a = 1 - (z * z) / (2 * (n - 1));
  if (!(a > 0)) {
    throw new RangeError(
      `n must be larger than 1 + z²/2 = ${(1 + (z * z) / 2).toFixed(2)} for the 17B limits at confidence ${confidence} (got ${n})`,
    );
  }
  const b = K * K - (z * z) / n;
  const root = Math.sqrt(Math.max(0, K * K - a * b));
  return { aep, lower: 10 ** (mean + ((K - root) / a) * stdDev), upper: 10 ** (mean + ((K + root) / a) * stdDev) };
}

/**
 * Seeded parametric bootstrap of flood quantiles: fit the distribution to the peaks, draw
 * `resamples` samples of the same size from the fitted distribution (inverse CDF of seeded
 * uniforms), refit each by the same method, and take the (1 − c)/2 and (1 + c)/2 percentiles
 * (Hyndman & Fan type 7) of each quantile's estimates. Same seed → same intervals.
 *
 * @param peaks - annual peaks (any units), at least 3, not all equal; > 0 for 'lp3'
 * @param distribution - 'gev' (L-moments), 'gumbel-moments', 'gumbel-l-moments' or 'lp3'
 * @param aeps - annual exceedance probabilities, each 0…1 exclusive
 * @param options - { resamples = 200, seed = 1, confidence = 0.90, lp3 }
 * @returns { intervals, resamples, failed }
 * @throws RangeError if an argument is out of range or the original fit fails
 * @example
 * bootstrapQuantileIntervals(peaks, 'gev', [0.01], { resamples: 500, seed: 7 });
 * // => { intervals: [{ aep: 0.01, lower: 120000, upper: 610000 }], resamples: 500, failed: 0 }
 * Source: (c) common practice: parametric bootstrap percentile intervals (Efron & Tibshirani
 * 1993, An Introduction to the Bootstrap, (b) from memory).
 */
export function bootstrapQuantileIntervals(
  peaks: readonly number[],
  distribution: BootstrapDistribution,
  aeps: readonly number[],
  options: BootstrapOptions = {},
): BootstrapResult {
  requireFiniteArray('peaks', peaks, 3);
  requireFiniteArray('aeps', aeps, 0);
  for (const aep of aeps) requireOpenProbability('aep', aep);
  const resamples = requireInteger('resamples', options.resamples ?? DEFAULT_BOOTSTRAP_RESAMPLES, 0, 100_000);
  const confidence = requireOpenProbability('confidence', options.confidence ?? DEFAULT_CONFIDENCE);
  const next = createUniformStream(options.seed ?? 1);
  const model = modelFor(distribution, options.lp3 ?? {});
  const fitted = model.fit(peaks);
  const n = peaks.length;

  const estimates: number[][] = aeps.map(() => []);
  let failed = 0;
  const sample = new Array<number>(n);
  for (let b = 0; b < resamples; b++) {
    for (let i = 0; i < n; i++) sample[i] = fitted.quantile(next());
    let refit: FittedModel;
    try {
      refit = model.fit(sample);
    } catch {
      failed++;
      continue;
    }
    aeps.forEach((aep, j) => {
      estimates[j].push(refit.quantile(1 - aep));
    });
  }
  const kept = resamples - failed;
  if (kept === 0) return { intervals: [], resamples: 0, failed };
  const intervals = aeps.map((aep, j) => {
    const sorted = estimates[j].sort((x, y) => x - y);
    return {
      aep,
      lower: empiricalQuantile(sorted, (1 - confidence) / 2, 'type7'),
      upper: empiricalQuantile(sorted, (1 + confidence) / 2, 'type7'),
    };
  });
  return { intervals, resamples: kept, failed };
}

/** @private A fitted distribution's quantile function of the non-exceedance probability. */
interface FittedModel {
  quantile: (nonExceedance: number) => number;
}

/** @private Fit-and-quantile pair for each distribution. */
function modelFor(distribution: BootstrapDistribution, lp3: LogPearson3Options): { fit: (x: readonly number[]) => FittedModel } {
  switch (distribution) {
    case 'gev':
      return {
        fit: (x) => {
          const p = fitGevLMoments(x);
          return { quantile: (F) => gevQuantile(p, F) };
        },
      };
    case 'gumbel-moments':
      return {
        fit: (x) => {
          const p = fitGumbelMoments(x);
          return { quantile: (F) => gumbelQuantile(p, F) };
        },
      };
    case 'gumbel-l-moments':
      return {
        fit: (x) => {
          const p = fitGumbelLMoments(x);
          return { quantile: (F) => gumbelQuantile(p, F) };
        },
      };
    case 'lp3':
      return {
        fit: (x) => {
          const f = fitLogPearson3(x, { ...lp3, roundSkew: false });
          const params = { mean: f.mean, stdDev: f.stdDev, skew: Math.max(-9, Math.min(9, f.skewUsed)) };
          return { quantile: (F) => logPearson3Quantile(params, F) };
        },
      };
    default:
      throw new RangeError(`distribution must be 'gev', 'gumbel-moments', 'gumbel-l-moments' or 'lp3' (got '${String(distribution)}')`);
  }
}
