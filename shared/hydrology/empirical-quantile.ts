/**
 * @module shared/hydrology/empirical-quantile
 * Sample quantiles by linear interpolation between order statistics.
 */

/**
 * Quantile definitions:
 * - 'hazen': position h = n p + 1/2 (the Hazen plotting position (m − 1/2)/n inverted);
 *   Hyndman & Fan type 5.
 * - 'type7': position h = (n − 1) p + 1; Hyndman & Fan type 7.
 * Both interpolate linearly between the order statistics on either side of h and clamp to the
 * sample's minimum and maximum outside [1, n].
 */
export type QuantileMethod = 'hazen' | 'type7';

/**
 * The p-quantile of a sample sorted in ascending order.
 *
 * @param sortedAscending - the sample, sorted ascending, at least one finite value
 * @param p - non-exceedance probability, 0…1
 * @param method - 'hazen' (default) or 'type7'
 * @returns the quantile, in the sample's units
 * @throws RangeError if the sample is empty or p is outside 0…1
 * @example
 * empiricalQuantile([1, 2, 3, 4], 0.5); // => 2.5
 * empiricalQuantile([1, 2, 3, 4], 0.9, 'type7'); // => 3.7
 * empiricalQuantile([1, 2, 3, 4], 0.9, 'hazen'); // => 4 (position 4.1, clamped)
 * Source: (b) from memory: Hyndman & Fan (1996), "Sample quantiles in statistical packages",
 * The American Statistician 50(4), 361–365, types 5 (Hazen) and 7; the choice is (c) common
 * practice.
 */
export function empiricalQuantile(sortedAscending: readonly number[], p: number, method: QuantileMethod = 'hazen'): number {
  const n = sortedAscending.length;
  if (n === 0) throw new RangeError('sortedAscending must hold at least one value (got an empty array)');
  if (typeof p !== 'number' || !(p >= 0 && p <= 1)) {
    throw new RangeError(`p must be a probability between 0 and 1 (got ${String(p)})`);
  }
  if (method !== 'hazen' && method !== 'type7') {
    throw new RangeError(`method must be 'hazen' or 'type7' (got '${String(method)}')`);
  }
  const h = method === 'hazen' ? n * p + 0.5 : (n - 1) * p + 1;
  if (h <= 1) return sortedAscending[0];
  if (h >= n) return sortedAscending[n - 1];
  const lo = Math.floor(h);
  const frac = h - lo;
  const a = sortedAscending[lo - 1];
  const b = sortedAscending[lo];
  return a + frac * (b - a);
}
