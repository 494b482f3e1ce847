/**
 * @module shared/hydrology/l-moments
 * Sample L-moments from unbiased probability-weighted moments.
 */

import { requireFiniteArray } from './check-values';

/** Sample probability-weighted moments and the first three L-moments. */
export interface LMoments {
  /** Sample size. */
  n: number;
  /** Unbiased probability-weighted moments b0, b1, b2 [sample units]. */
  b0: number;
  b1: number;
  b2: number;
  /** L-location λ1 = b0 (the mean) [sample units]. */
  l1: number;
  /** L-scale λ2 = 2b1 − b0 [sample units], > 0. */
  l2: number;
  /** Third L-moment λ3 = 6b2 − 6b1 + b0 [sample units]. */
  l3: number;
  /** L-skewness τ3 = λ3/λ2, within [−1, 1]. */
  t3: number;
}

/**
 * Sample L-moments of a sample, from the unbiased probability-weighted moments of the
 * ascending order statistics x(1) ≤ … ≤ x(n):
 * b0 = mean, b1 = (1/n) Σ (j−1)/(n−1) x(j), b2 = (1/n) Σ (j−1)(j−2)/((n−1)(n−2)) x(j);
 * λ1 = b0, λ2 = 2b1 − b0, λ3 = 6b2 − 6b1 + b0, τ3 = λ3/λ2.
 *
 * @param values - the sample (any units, any order), at least 3 finite values, not all equal
 * @returns { n, b0, b1, b2, l1, l2, l3, t3 }
 * @throws RangeError if fewer than 3 values, a value is not finite, or all values are equal (λ2 = 0)
 * @example
 * sampleLMoments([1, 2, 3, 4, 10]); // => { n: 5, b0: 4, b1: 3, b2: 2.5, l1: 4, l2: 2, l3: 1, t3: 0.5 }
 * Source: (b) from memory: Hosking (1990), J. R. Stat. Soc. B 52, 105–124 (science.md §7.3).
 */
export function sampleLMoments(values: readonly number[]): LMoments {
  requireFiniteArray('values', values, 3);
  const x = [...values].sort((a, b) => a - b);
  const n = x.length;
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  for (let j = 1; j <= n; j++) {
    const v = x[j - 1];
    s0 += v;
    s1 += ((j - 1) / (n - 1)) * v;
    s2 += (((j - 1) * (j - 2)) / ((n - 1) * (n - 2))) * v;
  }
  const b0 = s0 / n;
  const b1 = s1 / n;
  const b2 = s2 / n;
  const l1 = b0;
  const l2 = 2 * b1 - b0;
  const l3 = 6 * b2 - 6 * b1 + b0;
  if (!(l2 > 1e-12 * Math.max(Math.abs(x[0]), Math.abs(x[n - 1])))) {
    throw new RangeError('values must not all be equal: their L-scale λ2 is zero, so no distribution can be fitted');
  }
  const t3 = Math.min(1, Math.max(-1, l3 / l2));
  return { n, b0, b1, b2, l1, l2, l3, t3 };
}
