/**
 * @module shared/hydrology/gumbel
 * Gumbel (extreme value type I) distribution: fit by moments or by L-moments, quantiles and
 * the frequency factor K_T.
 */

import { requireFiniteArray, requireOpenProbability } from './check-values';
import { sampleLMoments } from './l-moments';

/**
 * Euler–Mascheroni constant γ = 0.5772156649…
 * Source: (a) published: mathematical constant (science.md §7.2 gives 0.5772156649).
 */
export const EULER_GAMMA = 0.5772156649015329;

/** Gumbel parameters: F(x) = exp(−exp(−(x − u)/α)). */
export interface GumbelParameters {
  /** Location u (the mode) [data units]. */
  location: number;
  /** Scale α [data units], > 0. */
  scale: number;
}

/** A Gumbel fit with the method that produced it. */
export interface GumbelFit extends GumbelParameters {
  method: 'moments' | 'l-moments';
}

/**
 * Gumbel frequency factor K_T = −(√6/π)[γ + ln ln(T/(T − 1))], so that x_T = x̄ + K_T s.
 *
 * @param returnPeriod - T [years], > 1
 * @returns K_T (dimensionless)
 * @throws RangeError if T ≤ 1
 * @example
 * gumbelFrequencyFactor(100); // => 3.1367
 * gumbelFrequencyFactor(10); // => 1.3046
 * Source: (b) from memory: Chow, Maidment & Mays (1988), Applied Hydrology, §12.3
 * (science.md §7.2); values (c) computed.
 */
export function gumbelFrequencyFactor(returnPeriod: number): number {
  if (typeof returnPeriod !== 'number' || !(returnPeriod > 1) || !Number.isFinite(returnPeriod)) {
    throw new RangeError(`returnPeriod must be a finite number of years greater than 1 (got ${String(returnPeriod)})`);
  }
  const T = returnPeriod;
  return -(Math.sqrt(6) / Math.PI) * (EULER_GAMMA + Math.log(Math.log(T / (T - 1))));
}

/**
 * Gumbel parameters from the mean and standard deviation (method of moments):
 * α = √6 s/π, u = x̄ − γ α.
 *
 * @param mean - sample mean x̄ [data units]
 * @param stdDev - sample standard deviation s [data units], > 0
 * @returns { location u, scale α, method: 'moments' }
 * @throws RangeError if stdDev ≤ 0 or either argument is not finite
 * @example
 * gumbelFromMoments(2.5, 0.7); // => { location: 2.185, scale: 0.5458 (1/α = 1.832), method: 'moments' }
 * Source: (b) from memory: Chow, Maidment & Mays (1988), §12.2; checked (a) against the
 * Cornell CEE 304 example (science.md §7.2).
 */
export function gumbelFromMoments(mean: number, stdDev: number): GumbelFit {
  if (typeof mean !== 'number' || !Number.isFinite(mean)) throw new RangeError(`mean must be a finite number (got ${String(mean)})`);
  if (typeof stdDev !== 'number' || !Number.isFinite(stdDev) || stdDev <= 0) {
    throw new RangeError(`stdDev must be a finite number greater than 0 (got ${String(stdDev)})`);
  }
  const scale = (Math.sqrt(6) * stdDev) / Math.PI;
  return { location: mean - EULER_GAMMA * scale, scale, method: 'moments' };
}

/**
 * Fits a Gumbel distribution to a sample by the method of moments (mean and n − 1 standard
 * deviation).
 *
 * @param values - the sample, at least 2 finite values, not all equal
 * @returns { location, scale, method: 'moments' }
 * @throws RangeError if fewer than 2 values or all values are equal
 * @example
 * fitGumbelMoments(guadalupePeaks); // => { location: 7187.2, scale: 47156.9, method: 'moments' } (cfs)
 * Source: (b) from memory: Chow, Maidment & Mays (1988), §12.2 (science.md §7.2).
 */
export function fitGumbelMoments(values: readonly number[]): GumbelFit {
  requireFiniteArray('values', values, 2);
  const n = values.length;
  const mean = values.reduce((a, b) => a + b, 0) / n;
  const variance = values.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1);
  if (!(variance > 0)) throw new RangeError('values must not all be equal: their standard deviation is zero');
  return gumbelFromMoments(mean, Math.sqrt(variance));
}

/**
 * Fits a Gumbel distribution by L-moments: α = λ2/ln 2, u = λ1 − γ α.
 *
 * @param values - the sample, at least 3 finite values, not all equal
 * @returns { location, scale, method: 'l-moments' }
 * @throws RangeError as sampleLMoments
 * @example
 * fitGumbelLMoments(guadalupePeaks); // => { location: 17953.6, scale: 28504.6, method: 'l-moments' } (cfs)
 * Source: (b) from memory: Hosking (1990); Hosking & Wallis (1997) (science.md §7.2).
 */
export function fitGumbelLMoments(values: readonly number[]): GumbelFit {
  const { l1, l2 } = sampleLMoments(values);
  const scale = l2 / Math.LN2;
  return { location: l1 - EULER_GAMMA * scale, scale, method: 'l-moments' };
}

/**
 * Gumbel quantile x(F) = u − α ln(−ln F).
 *
 * @param params - { location u, scale α > 0 }
 * @param nonExceedance - F = 1 − AEP, 0 < F < 1
 * @returns x(F) [data units]
 * @throws RangeError if F is outside (0, 1) or scale ≤ 0
 * @example
 * gumbelQuantile({ location: 2.185, scale: 0.5458 }, 0.98); // => 4.315
 * Source: (b) from memory: Chow, Maidment & Mays (1988), §12.2 (science.md §7.2).
 */
export function gumbelQuantile(params: GumbelParameters, nonExceedance: number): number {
  requireOpenProbability('nonExceedance', nonExceedance);
  if (!(params.scale > 0) || !Number.isFinite(params.scale)) {
    throw new RangeError(`scale must be a finite number greater than 0 (got ${String(params.scale)})`);
  }
  return params.location - params.scale * Math.log(-Math.log(nonExceedance));
}
