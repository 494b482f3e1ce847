/**
 * @module shared/hydrology/plotting-positions
 * Empirical annual exceedance probabilities of ranked annual peaks.
 */

import { requireFiniteArray } from './check-values';

/** Plotting-position formulas (all of the form (m − a)/(n + 1 − 2a)). */
export type PlottingPositionFormula = 'weibull' | 'gringorten' | 'cunnane' | 'hazen';

/** The constant a of each formula (m − a)/(n + 1 − 2a). */
export const PLOTTING_POSITION_CONSTANTS: Readonly<Record<PlottingPositionFormula, number>> = {
  weibull: 0,
  gringorten: 0.44,
  cunnane: 0.4,
  hazen: 0.5,
};

/** One ranked value with its plotting position. */
export interface PlottingPosition {
  /** Rank m, 1 for the largest value. */
  rank: number;
  /** The value [input units]. */
  value: number;
  /** Index of the value in the input array. */
  index: number;
  /** Annual exceedance probability (m − a)/(n + 1 − 2a). */
  aep: number;
  /** Non-exceedance probability 1 − aep. */
  nonExceedance: number;
  /** Return period T = 1/aep [years]. */
  returnPeriod: number;
}

/**
 * Plotting positions of a sample, largest first: Weibull m/(n+1), Gringorten
 * (m − 0.44)/(n + 0.12), Cunnane (m − 0.4)/(n + 0.2), Hazen (m − 0.5)/n, with m the rank from
 * the largest (m = 1) — the exceedance form. The non-exceedance form of science.md §7.1 ranks
 * from the smallest instead; the formulas are symmetric, so both give the same positions.
 * Tied values get consecutive ranks in input order.
 *
 * @param values - annual peaks (any units), at least 1 finite value
 * @param formula - 'weibull' (default), 'gringorten', 'cunnane' or 'hazen'
 * @returns one entry per value, sorted from the largest value down
 * @throws RangeError if values is empty or holds a non-finite number, or the formula is unknown
 * @example
 * plottingPositions([10, 30, 20]);
 * // => [{ rank: 1, value: 30, index: 1, aep: 0.25, nonExceedance: 0.75, returnPeriod: 4 }, ...]
 * Source: (b) from memory: the four formulas as listed in science.md §7.1 (Weibull 1939,
 * Gringorten 1963, Cunnane 1978, Hazen 1914); T = 1/(1 − p), science.md §7.1.
 */
export function plottingPositions(values: readonly number[], formula: PlottingPositionFormula = 'weibull'): PlottingPosition[] {
  requireFiniteArray('values', values, 1);
  const a = PLOTTING_POSITION_CONSTANTS[formula];
  if (a === undefined) {
    throw new RangeError(`formula must be 'weibull', 'gringorten', 'cunnane' or 'hazen' (got '${String(formula)}')`);
  }
  const n = values.length;
  const order = values.map((value, index) => ({ value, index })).sort((p, q) => q.value - p.value || p.index - q.index);
  return order.map(({ value, index }, i) => {
    const rank = i + 1;
    const aep = (rank - a) / (n + 1 - 2 * a);
    return { rank, value, index, aep, nonExceedance: 1 - aep, returnPeriod: 1 / aep };
  });
}
