/**
 * @module shared/hydrology/gev
 * Generalized extreme value (GEV) distribution fitted by L-moments, in Hosking's
 * parameterisation: x(F) = ξ + α [1 − (−ln F)^k] / k, with k > 0 a bounded upper tail and
 * k < 0 a heavy (Fréchet) tail; k = 0 is the Gumbel distribution.
 */

import gamma from '@stdlib/math-base-special-gamma';
import { requireBetween, requireOpenProbability } from './check-values';
import { EULER_GAMMA } from './gumbel';
import { type LMoments, sampleLMoments } from './l-moments';

/** GEV parameters in Hosking's form. */
export interface GevParameters {
  /** Location ξ [data units]. */
  location: number;
  /** Scale α [data units], > 0. */
  scale: number;
  /** Shape k (Hosking's sign: k < 0 heavy tail), > −1. */
  shape: number;
}

/** A GEV fitted by L-moments. */
export interface GevFit extends GevParameters {
  /** The sample L-moments the fit used. */
  lMoments: LMoments;
  /** How k was found from τ3: Hosking's approximation, or the exact relation solved numerically. */
  shapeMethod: 'approximation' | 'exact';
}

/** Lower and upper τ3 between which Hosking's approximation of k is used (error ≤ 5.2e-3 there). */
export const GEV_APPROXIMATION_TAU3_RANGE: readonly [number, number] = [-0.2, 0.5];

/**
 * Hosking's approximation of the GEV shape from the L-skewness:
 * z = 2/(3 + τ3) − ln 2/ln 3, k ≈ 7.8590 z + 2.9554 z².
 *
 * @param t3 - sample L-skewness τ3, −1 < τ3 < 1 (accurate for about −0.5…0.5; see
 *   science.md §7.3 for its error: 5.2e-3 at τ3 = −0.2, under 1e-3 for 0…0.5)
 * @returns k (dimensionless)
 * @throws RangeError if t3 is outside (−1, 1)
 * @example
 * gevShapeApproximation(0.4); // => −0.3302
 * gevShapeApproximation(Math.log(9 / 8) / Math.log(2)); // => 4e-5 (Gumbel: k ≈ 0)
 * Source: (b) from memory: Hosking, Wallis & Wood (1985), Technometrics 27, 251–261;
 * Hosking (1990) (science.md §7.3).
 */
export function gevShapeApproximation(t3: number): number {
  requireTau3(t3);
  const z = 2 / (3 + t3) - Math.LN2 / Math.log(3);
  return 7.859 * z + 2.9554 * z * z;
}

/**
 * The exact L-skewness of a GEV with shape k: τ3(k) = 2(1 − 3^−k)/(1 − 2^−k) − 3, with the
 * Gumbel limit 2 ln 3/ln 2 − 3 = 0.169925 at k = 0.
 *
 * @param k - GEV shape, > −1
 * @returns τ3 in (−1, 1)
 * @throws RangeError if k ≤ −1 or not finite
 * @example
 * gevTau3OfShape(0); // => 0.169925 (= ln(9/8)/ln 2)
 * gevTau3OfShape(-0.32944); // => 0.4
 * Source: (b) from memory: Hosking (1990); relation as in science.md §7.3.
 */
export function gevTau3OfShape(k: number): number {
  if (typeof k !== 'number' || !Number.isFinite(k) || k <= -1) {
    throw new RangeError(`k must be a finite GEV shape greater than −1 (got ${String(k)})`);
  }
  if (k === 0) return (2 * Math.log(3)) / Math.LN2 - 3;
  return (2 * Math.expm1(-k * Math.log(3))) / Math.expm1(-k * Math.LN2) - 3;
}

/**
 * Solves the exact relation τ3(k) = 2(1 − 3^−k)/(1 − 2^−k) − 3 for k by bisection (τ3 falls
 * monotonically from 1 at k = −1 towards −1 as k grows). Converges to |Δk| < 1e-13.
 *
 * @param t3 - L-skewness τ3, −1 < τ3 < 1
 * @returns k, > −1
 * @throws RangeError if t3 is outside (−1, 1)
 * @example
 * gevShapeExact(0.4); // => −0.32944
 * gevShapeExact(0.5636); // => −0.5349 (Guadalupe 1935–2002)
 * Source: (c) derived: numerical inversion of the exact relation of science.md §7.3.
 */
export function gevShapeExact(t3: number): number {
  requireTau3(t3);
  let lo = -1 + 1e-12;
  let hi = 1;
  while (gevTau3OfShape(hi) > t3) {
    lo = hi;
    hi *= 2;
    if (hi > 1e3) return hi;
  }
  for (let i = 0; i < 200 && hi - lo > 1e-13; i++) {
    const mid = 0.5 * (lo + hi);
    if (gevTau3OfShape(mid) > t3) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** How to find k from τ3: 'auto' (approximation inside −0.2…0.5, exact outside), or always one. */
export type GevShapeMethod = 'auto' | 'approximation' | 'exact';

/**
 * The GEV shape from τ3: by default Hosking's approximation for −0.2 ≤ τ3 ≤ 0.5 and the exact
 * relation solved numerically outside that range.
 *
 * @param t3 - L-skewness τ3, −1 < τ3 < 1
 * @param method - 'auto' (default), 'approximation' or 'exact'
 * @returns { shape: k, method }
 * @throws RangeError if t3 is outside (−1, 1)
 * @example
 * gevShapeFromTau3(0.4); // => { shape: −0.3302, method: 'approximation' }
 * gevShapeFromTau3(0.6); // => { shape: −0.59, method: 'exact' }
 * Source: (b) from memory: Hosking et al. (1985) inside the range; (c) exact solution outside
 * it (science.md §7.3).
 */
export function gevShapeFromTau3(t3: number, method: GevShapeMethod = 'auto'): { shape: number; method: 'approximation' | 'exact' } {
  requireTau3(t3);
  if (method !== 'auto' && method !== 'approximation' && method !== 'exact') {
    throw new RangeError(`method must be 'auto', 'approximation' or 'exact' (got '${String(method)}')`);
  }
  const [lo, hi] = GEV_APPROXIMATION_TAU3_RANGE;
  const inside = t3 >= lo && t3 <= hi;
  if (method === 'approximation' || (method === 'auto' && inside)) {
    return { shape: gevShapeApproximation(t3), method: 'approximation' };
  }
  return { shape: gevShapeExact(t3), method: 'exact' };
}

/**
 * GEV parameters from L-moments: k from τ3 ({@link gevShapeFromTau3}), then
 * α = λ2 k / ((1 − 2^−k) Γ(1 + k)) and ξ = λ1 − α (1 − Γ(1 + k))/k, with the Gumbel limits
 * α = λ2/ln 2 and ξ = λ1 − γ α as k → 0.
 *
 * @param lMoments - { l1, l2 (> 0), t3 (−1…1 exclusive) } in data units
 * @param method - how to find k: 'auto' (default), 'approximation' or 'exact'
 * @returns { location ξ, scale α, shape k, shapeMethod }
 * @throws RangeError if λ2 ≤ 0 or τ3 is outside (−1, 1)
 * @example
 * gevFromLMoments({ l1: 34406.9, l2: 19757.9, t3: 0.5636 });
 * // => { location: 13505, scale: 12365, shape: −0.5349, shapeMethod: 'exact' } (Guadalupe, cfs)
 * gevFromLMoments({ l1: 34406.9, l2: 19757.9, t3: 0.5636 }, 'approximation');
 * // => { location: 13509.5, scale: 12411.2, shape: −0.5334, ... } (science.md §7.5)
 * Source: (b) from memory: Hosking (1990); Hosking & Wallis (1997) (science.md §7.3).
 */
export function gevFromLMoments(
  lMoments: Pick<LMoments, 'l1' | 'l2' | 't3'>,
  method: GevShapeMethod = 'auto',
): GevParameters & { shapeMethod: 'approximation' | 'exact' } {
  const { l1, l2, t3 } = lMoments;
  if (typeof l2 !== 'number' || !(l2 > 0) || !Number.isFinite(l2)) {
    throw new RangeError(`l2 (the L-scale) must be a finite number greater than 0 (got ${String(l2)})`);
  }
  if (typeof l1 !== 'number' || !Number.isFinite(l1)) throw new RangeError(`l1 must be a finite number (got ${String(l1)})`);
  const { shape: k, method: used } = gevShapeFromTau3(t3, method);
  let scale: number;
  let location: number;
  if (Math.abs(k) < 1e-9) {
    scale = l2 / Math.LN2;
    location = l1 - EULER_GAMMA * scale;
  } else {
    const g = gamma(1 + k);
    scale = (l2 * k) / (-Math.expm1(-k * Math.LN2) * g);
    location = l1 - (scale * (1 - g)) / k;
  }
  return { location, scale, shape: k, shapeMethod: used };
}

/**
 * Fits a GEV to a sample by L-moments.
 *
 * @param values - the sample, e.g. annual peaks (any units), at least 3 values, not all equal
 * @param method - how to find k: 'auto' (default), 'approximation' or 'exact'
 * @returns { location, scale, shape, lMoments, shapeMethod }
 * @throws RangeError as {@link sampleLMoments}
 * @example
 * const fit = fitGevLMoments(guadalupePeaks); // cfs, 1935–2002
 * // => { shape: −0.5349, scale: 12365, location: 13505, shapeMethod: 'exact', ... }
 * Source: (b) from memory: Hosking (1990) (science.md §7.3).
 */
export function fitGevLMoments(values: readonly number[], method: GevShapeMethod = 'auto'): GevFit {
  const lMoments = sampleLMoments(values);
  const p = gevFromLMoments(lMoments, method);
  return { location: p.location, scale: p.scale, shape: p.shape, shapeMethod: p.shapeMethod, lMoments };
}

/**
 * GEV quantile x(F) = ξ + α [1 − (−ln F)^k]/k, computed as ξ − α expm1(k ln(−ln F))/k so that
 * it tends smoothly to the Gumbel ξ − α ln(−ln F) as k → 0.
 *
 * @param params - { location ξ, scale α > 0, shape k > −1 }
 * @param nonExceedance - F = 1 − AEP, 0 < F < 1
 * @returns x(F) [data units]
 * @throws RangeError if F is outside (0, 1), scale ≤ 0 or shape ≤ −1
 * @example
 * gevQuantile({ location: 13509.5, scale: 12411.2, shape: -0.5334 }, 0.99); // => 260 918 (cfs)
 * Source: (b) from memory: Hosking (1990) (science.md §7.3).
 */
export function gevQuantile(params: GevParameters, nonExceedance: number): number {
  requireOpenProbability('nonExceedance', nonExceedance);
  const { location, scale, shape } = params;
  if (!(scale > 0) || !Number.isFinite(scale)) throw new RangeError(`scale must be a finite number greater than 0 (got ${String(scale)})`);
  if (!(shape > -1) || !Number.isFinite(shape))
    throw new RangeError(`shape must be a finite number greater than −1 (got ${String(shape)})`);
  const y = Math.log(-Math.log(nonExceedance));
  // Below |k| = 1e-12, k·y can underflow; use the series −y (1 + k y/2) of expm1(k y)/k.
  if (Math.abs(shape) < 1e-12) return location - scale * y * (1 + (shape * y) / 2);
  return location - (scale * Math.expm1(shape * y)) / shape;
}

/** @private Throws unless −1 < τ3 < 1. */
function requireTau3(t3: number): void {
  requireBetween('t3 (L-skewness)', t3, -1, 1);
  if (t3 === -1 || t3 === 1) throw new RangeError(`t3 (L-skewness) must be between −1 and 1, both excluded (got ${t3})`);
}
