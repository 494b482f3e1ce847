/**
 * @module shared/hydrology/log-pearson3
 * Log-Pearson type III by the Bulletin 17B method of moments on log10 flows (which Bulletin
 * 17C's Expected Moments Algorithm reduces to with no censoring, historical floods or
 * low outliers), with the exact Pearson III frequency factor, the 17B weighted skew and its
 * rounding to 0.1.
 */

import gammaQuantile from '@stdlib/stats-base-dists-gamma-quantile';
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { requireBetween, requireFiniteArray, requireOpenProbability } from './check-values';

/**
 * MSE of the generalized skew read from the Bulletin 17B national skew map.
 * Source: (b) from memory: Bulletin 17B (IACWD 1981/1982), science.md §7.4.
 */
export const BULLETIN_17B_MAP_SKEW_MSE = 0.302;

/**
 * Below this |G| the frequency factor uses a third-order Cornish–Fisher expansion instead of
 * the gamma quantile. Source: (c) computed: the installed gamma quantile loses accuracy in the
 * upper tail (p ≥ 0.5) for shapes 4/G² above about 1000 (|G| below about 0.06; K is off by
 * 6e-4 at G = 0.01, p = 0.99), while the expansion's truncation error at |G| = 0.1 is below
 * 3e-6 in K for 1e-4 ≤ p ≤ 0.9999 and shrinks as G⁴.
 */
export const PEARSON3_SMALL_SKEW = 0.1;

/** Log-space moments of a log-Pearson III fit. */
export interface LogPearson3Parameters {
  /** Mean of log10 Q (Q in data units). */
  mean: number;
  /** Standard deviation of log10 Q (n − 1 divisor), > 0. */
  stdDev: number;
  /** Skew used for quantiles (station, weighted, or rounded). */
  skew: number;
}

/** A log-Pearson III fit. */
export interface LogPearson3Fit {
  /** Number of peaks. */
  n: number;
  /** Mean of log10 Q. */
  mean: number;
  /** Standard deviation of log10 Q (n − 1). */
  stdDev: number;
  /** Station skew G of log10 Q. */
  stationSkew: number;
  /** 17B MSE of the station skew, 10^(A − B log10(n/10)). */
  stationSkewMse: number;
  /** Weighted skew G_w, present when a regional skew was given. */
  weightedSkew?: number;
  /** The skew used for quantiles: weighted if given, else station; rounded to 0.1 if asked. */
  skewUsed: number;
}

/** Options of {@link fitLogPearson3}. */
export interface LogPearson3Options {
  /** Regional (generalized) skew Ḡ, −3…3. */
  regionalSkew?: number;
  /** MSE of the regional skew, > 0; default 0.302 (17B map) when regionalSkew is given. */
  regionalSkewMse?: number;
  /** Round the skew used to the nearest 0.1, as Bulletin 17B does; default false. */
  roundSkew?: boolean;
}

/**
 * Pearson type III frequency factor K(p; G): the standardised p-quantile of a Pearson III
 * variate with skew G, so that y_p = ȳ + K s.
 * - G > 0: K = (G/2) Y_p − 2/G with Y_p the p-quantile of a gamma variate of shape 4/G², scale 1;
 * - G < 0: K(p; G) = −K(1 − p; −G);
 * - G = 0: K = Φ⁻¹(p);
 * - 0 < |G| < 0.1: third-order Cornish–Fisher expansion in G (see {@link PEARSON3_SMALL_SKEW}).
 *
 * @param skew - G, −9…9
 * @param nonExceedance - p = 1 − AEP, 0 < p < 1
 * @returns K (dimensionless)
 * @throws RangeError if p is outside (0, 1) or G outside −9…9
 * @example
 * pearson3FrequencyFactor(0.7, 0.99); // => 2.82359
 * pearson3FrequencyFactor(-0.5, 0.99); // => 1.95472
 * pearson3FrequencyFactor(1, 0.9); // => 1.34039
 * Source: (c) exact, science.md §7.4 (verified there against a reference Pearson III); the
 * small-skew expansion is (b) from memory: the Cornish–Fisher expansion (Abramowitz & Stegun
 * 26.2.49) with the gamma cumulants, (c) checked numerically against the exact form.
 */
export function pearson3FrequencyFactor(skew: number, nonExceedance: number): number {
  requireBetween('skew', skew, -9, 9);
  requireOpenProbability('nonExceedance', nonExceedance);
  return frequencyFactor(skew, nonExceedance);
}

/**
 * Bulletin 17B mean-square error of a station skew:
 * MSE_G ≈ 10^(A − B log10(n/10)), A = −0.33 + 0.08|G| (|G| ≤ 0.9) else −0.52 + 0.30|G|,
 * B = 0.94 − 0.26|G| (|G| ≤ 1.5) else 0.55.
 *
 * @param stationSkew - G, −9…9
 * @param n - record length [years], ≥ 3
 * @returns MSE_G (dimensionless)
 * @throws RangeError if n < 3 or G outside −9…9
 * @example
 * stationSkewMse17B(0.73, 24); // => 0.2775
 * Source: (b) from memory: Bulletin 17B (IACWD 1982), science.md §7.4.
 */
export function stationSkewMse17B(stationSkew: number, n: number): number {
  requireBetween('stationSkew', stationSkew, -9, 9);
  if (typeof n !== 'number' || !Number.isFinite(n) || n < 3) {
    throw new RangeError(`n must be a record length of at least 3 years (got ${String(n)})`);
  }
  const g = Math.abs(stationSkew);
  const A = g <= 0.9 ? -0.33 + 0.08 * g : -0.52 + 0.3 * g;
  const B = g <= 1.5 ? 0.94 - 0.26 * g : 0.55;
  return 10 ** (A - B * Math.log10(n / 10));
}

/**
 * Weighted skew G_w = (MSE_Ḡ G + MSE_G Ḡ)/(MSE_Ḡ + MSE_G), weighting the station and regional
 * skews inversely to their mean-square errors.
 *
 * @param stationSkew - G, −9…9
 * @param stationSkewMse - MSE_G, > 0
 * @param regionalSkew - Ḡ, −3…3
 * @param regionalSkewMse - MSE_Ḡ, > 0 (0.302 for the 17B map)
 * @returns G_w
 * @example
 * weightedSkew(0.73, 0.2775, 0.6, 0.302); // => 0.668 (Fishkill Creek)
 * Source: (b) from memory: Bulletin 17B, science.md §7.4.
 */
export function weightedSkew(stationSkew: number, stationSkewMse: number, regionalSkew: number, regionalSkewMse: number): number {
  requireBetween('stationSkew', stationSkew, -9, 9);
  requireBetween('regionalSkew', regionalSkew, -3, 3);
  for (const [name, v] of [
    ['stationSkewMse', stationSkewMse],
    ['regionalSkewMse', regionalSkewMse],
  ] as const) {
    if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
      throw new RangeError(`${name} must be a finite number greater than 0 (got ${String(v)})`);
    }
  }
  return (regionalSkewMse * stationSkew + stationSkewMse * regionalSkew) / (regionalSkewMse + stationSkewMse);
}

/**
 * Rounds a skew to the nearest 0.1 (halves away from zero), as Bulletin 17B does before
 * reading its K tables.
 *
 * @param skew - any finite skew
 * @returns the skew rounded to one decimal
 * @example
 * roundSkew17B(0.668); // => 0.7
 * roundSkew17B(-0.25); // => -0.3
 * Source: (b) from memory: Bulletin 17B, science.md §7.4.
 */
export function roundSkew17B(skew: number): number {
  if (typeof skew !== 'number' || !Number.isFinite(skew)) throw new RangeError(`skew must be a finite number (got ${String(skew)})`);
  const r = (Math.sign(skew) * Math.round(Math.abs(skew) * 10 + 1e-9)) / 10;
  return r === 0 ? 0 : r;
}

/**
 * Fits a log-Pearson III distribution to annual peaks by the Bulletin 17B moments of
 * y = log10 Q: mean ȳ, standard deviation s (n − 1) and station skew
 * G = n Σ(y − ȳ)³ / ((n − 1)(n − 2) s³); optionally weighted with a regional skew and
 * rounded to 0.1.
 *
 * @param peaks - annual peaks (any units), at least 3, all > 0, not all equal
 * @param options - { regionalSkew (−3…3), regionalSkewMse (> 0, default 0.302), roundSkew = false }
 * @returns { n, mean, stdDev, stationSkew, stationSkewMse, weightedSkew?, skewUsed }
 * @throws RangeError if fewer than 3 peaks, a peak is ≤ 0 (logarithms need positive flows),
 *   all peaks are equal, or an option is out of range
 * @example
 * fitLogPearson3(fishkillPeaks, { regionalSkew: 0.6, regionalSkewMse: 0.302, roundSkew: true });
 * // => { n: 24, mean: 3.3684, stdDev: 0.2456, stationSkew: 0.7300, weightedSkew: 0.668, skewUsed: 0.7, ... }
 * Source: (b) from memory: Bulletin 17B procedure without censoring (science.md §7.4); the
 * Fishkill Creek numbers are (c) computed there, with the 841 cfs result (a) published.
 */
export function fitLogPearson3(peaks: readonly number[], options: LogPearson3Options = {}): LogPearson3Fit {
  requireFiniteArray('peaks', peaks, 3);
  peaks.forEach((q, i) => {
    if (q <= 0) {
      throw new RangeError(
        `peaks[${i}] must be greater than 0 for log-Pearson III, which takes logarithms (got ${q}); remove zero-flow years or analyse them separately`,
      );
    }
  });
  const n = peaks.length;
  const y = peaks.map((q) => Math.log10(q));
  const mean = y.reduce((a, b) => a + b, 0) / n;
  let m2 = 0;
  let m3 = 0;
  for (const v of y) {
    const d = v - mean;
    m2 += d * d;
    m3 += d * d * d;
  }
  const stdDev = Math.sqrt(m2 / (n - 1));
  if (!(stdDev > 0)) throw new RangeError('peaks must not all be equal: the standard deviation of their logarithms is zero');
  const stationSkew = (n * m3) / ((n - 1) * (n - 2) * stdDev ** 3);
  const stationSkewMse = stationSkewMse17B(Math.max(-9, Math.min(9, stationSkew)), n);

  let skewUsed = stationSkew;
  let weighted: number | undefined;
  if (options.regionalSkew !== undefined) {
    requireBetween('regionalSkew', options.regionalSkew, -3, 3);
    const mse = options.regionalSkewMse ?? BULLETIN_17B_MAP_SKEW_MSE;
    if (typeof mse !== 'number' || !Number.isFinite(mse) || mse <= 0) {
      throw new RangeError(`regionalSkewMse must be a finite number greater than 0 (got ${String(mse)})`);
    }
    weighted = weightedSkew(Math.max(-9, Math.min(9, stationSkew)), stationSkewMse, options.regionalSkew, mse);
    skewUsed = weighted;
  } else if (options.regionalSkewMse !== undefined) {
    throw new RangeError('regionalSkewMse was given without regionalSkew; give both, or neither');
  }
  if (options.roundSkew) skewUsed = roundSkew17B(skewUsed);
  const fit: LogPearson3Fit = { n, mean, stdDev, stationSkew, stationSkewMse, skewUsed };
  if (weighted !== undefined) fit.weightedSkew = weighted;
  return fit;
}

/**
 * Log-Pearson III quantile Q = 10^(ȳ + K(p; G) s).
 *
 * @param params - { mean, stdDev (> 0), skew (−9…9) } of log10 Q
 * @param nonExceedance - p = 1 − AEP, 0 < p < 1
 * @returns Q [data units]
 * @example
 * logPearson3Quantile({ mean: 3.36835, stdDev: 0.245614, skew: 0.7 }, 0.99); // => 11 531 (cfs)
 * Source: (b) from memory: Bulletin 17B, science.md §7.4.
 */
export function logPearson3Quantile(params: LogPearson3Parameters, nonExceedance: number): number {
  if (!(params.stdDev > 0) || !Number.isFinite(params.stdDev)) {
    throw new RangeError(`stdDev must be a finite number greater than 0 (got ${String(params.stdDev)})`);
  }
  return 10 ** (params.mean + pearson3FrequencyFactor(params.skew, nonExceedance) * params.stdDev);
}

/** @private K(p; G) without argument checks. */
function frequencyFactor(g: number, p: number): number {
  if (g === 0) return normalQuantile(p, 0, 1);
  if (Math.abs(g) < PEARSON3_SMALL_SKEW) return cornishFisher(g, p);
  if (g < 0) return -frequencyFactor(-g, 1 - p);
  const shape = 4 / (g * g);
  return (g / 2) * gammaQuantile(p, shape, 1) - 2 / g;
}

/**
 * @private Third-order Cornish–Fisher expansion of the standardised gamma (Pearson III)
 * quantile, with standardised cumulants γ1 = G, γ2 = 1.5 G², γ3 = 3 G³.
 */
function cornishFisher(g: number, p: number): number {
  const z = normalQuantile(p, 0, 1);
  const z2 = z * z;
  const z3 = z2 * z;
  const z4 = z2 * z2;
  const first = (g * (z2 - 1)) / 6;
  const second = (1.5 * g * g * (z3 - 3 * z)) / 24 - (g * g * (2 * z3 - 5 * z)) / 36;
  const third = g ** 3 * ((3 * (z4 - 6 * z2 + 3)) / 120 - (1.5 * (z4 - 5 * z2 + 2)) / 24 + (12 * z4 - 53 * z2 + 17) / 324);
  return z + first + second + third;
}
