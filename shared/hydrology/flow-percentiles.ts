/**
 * @module shared/hydrology/flow-percentiles
 * Monthly, seasonal and whole-record percentiles of daily flow.
 */

import { empiricalQuantile, type QuantileMethod } from './empirical-quantile';
import type { FlowReading } from './parse-flow-record';

/** One percentile of daily flow. */
export interface PercentileValue {
  /** Percentile, 0…100: the share (in %) of days whose flow is at or below `discharge`. */
  p: number;
  /** Daily flow [readings' units, m³/s from the parser], or null if the group has no days. */
  discharge: number | null;
}

/** Percentiles of the days that fall in some months. */
export interface FlowPercentileGroup {
  /** 'Jan' … 'Dec', 'Dec–Feb', 'Mar–May', 'Jun–Aug', 'Sep–Nov' or 'all'. */
  label: string;
  /** The months (1…12) in the group. */
  months: number[];
  /** Number of days with data in the group. */
  days: number;
  /** One entry per requested percentile, in the order asked. */
  percentiles: PercentileValue[];
}

/** The result of {@link flowPercentiles}. */
export interface FlowPercentiles {
  method: QuantileMethod;
  /** Twelve groups, January first. */
  monthly: FlowPercentileGroup[];
  /** Dec–Feb, Mar–May, Jun–Aug, Sep–Nov: named by their months, never by a season, so they read right in either hemisphere. */
  seasonal: FlowPercentileGroup[];
  /** The whole record. */
  all: FlowPercentileGroup;
}

/** Options of {@link flowPercentiles}. */
export interface FlowPercentilesOptions {
  /** Percentiles wanted, each 0…100; default [50, 90, 95, 99]. */
  percentiles?: readonly number[];
  /** Quantile definition, 'hazen' (default) or 'type7'; see {@link QuantileMethod}. */
  method?: QuantileMethod;
}

/** Default percentiles: the median and three high-flow percentiles. */
export const DEFAULT_FLOW_PERCENTILES: readonly number[] = [50, 90, 95, 99];

const MONTH_LABELS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
/**
 * Three-month groups, labelled by their first and last months ("Dec–Feb", with an en dash). A season's name
 * ("summer") or code ("DJF") would mean opposite months in the two hemispheres; month names do not.
 */
const SEASONS: readonly { label: string; months: number[] }[] = [
  { label: 'Dec–Feb', months: [12, 1, 2] },
  { label: 'Mar–May', months: [3, 4, 5] },
  { label: 'Jun–Aug', months: [6, 7, 8] },
  { label: 'Sep–Nov', months: [9, 10, 11] },
];

/**
 * The name of a seasonal high-flow scenario, by its months (never a season's name or code).
 * Source: (c) common practice (names that read the same in both hemispheres).
 *
 * @param group - a seasonal group of {@link flowPercentiles} (its label, e.g. 'Dec–Feb')
 * @param percentile - the percentile of daily flow the scenario takes, 0…100
 * @returns e.g. 'Dec–Feb high flow (99th percentile of daily flow)'
 * @example
 * seasonalScenarioName({ label: 'Dec–Feb' }, 99); // => 'Dec–Feb high flow (99th percentile of daily flow)'
 */
export function seasonalScenarioName(group: Pick<FlowPercentileGroup, 'label'>, percentile: number): string {
  if (!(Number.isFinite(percentile) && percentile >= 0 && percentile <= 100)) {
    throw new RangeError(`percentile must be between 0 and 100 (got ${String(percentile)})`);
  }
  return `${group.label} high flow (${ordinal(percentile)} percentile of daily flow)`;
}

/** "99th", "1st", "2nd", "3rd", "11th", "92.5th". */
function ordinal(n: number): string {
  if (!Number.isInteger(n)) return `${n}th`;
  const teen = n % 100 >= 11 && n % 100 <= 13;
  const suffix = teen ? 'th' : (({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th');
  return `${n}${suffix}`;
}

/**
 * Percentiles of daily flow by calendar month, by three-month group (Dec–Feb, Mar–May, Jun–Aug, Sep–Nov) and
 * over the whole record. Percentile p is the flow that p % of days are at or below
 * (non-exceedance): p = 99 is a high flow, reached on 1 % of days. The flow-duration "Q95"
 * of low-flow practice (exceeded 95 % of the time) is percentile 5 here. A sub-daily record is
 * first reduced to daily means (the plain mean of each date's readings).
 *
 * @param readings - readings with `date` 'YYYY-MM-DD' and `discharge` ≥ 0
 * @param options - { percentiles = [50, 90, 95, 99] (each 0…100), method = 'hazen' }
 * @returns { method, monthly, seasonal, all }
 * @throws RangeError if a percentile is outside 0…100 or the method is unknown
 * @example
 * const r = flowPercentiles(readings, { percentiles: [50, 99] });
 * // r.seasonal[0] => { label: 'Dec–Feb', months: [12, 1, 2], days: 2707, percentiles: [{ p: 50, discharge: 41.2 }, ...] }
 * Source: (c) common practice (percentiles of daily flow; Hazen or Hyndman & Fan type 7
 * quantiles, see empirical-quantile.ts; daily means of sub-daily readings).
 */
export function flowPercentiles(readings: readonly FlowReading[], options: FlowPercentilesOptions = {}): FlowPercentiles {
  const percentiles = options.percentiles ?? DEFAULT_FLOW_PERCENTILES;
  const method = options.method ?? 'hazen';
  if (method !== 'hazen' && method !== 'type7') {
    throw new RangeError(`method must be 'hazen' or 'type7' (got '${String(method)}')`);
  }
  if (!Array.isArray(percentiles)) throw new RangeError('percentiles must be an array of numbers from 0 to 100');
  for (const p of percentiles) {
    if (typeof p !== 'number' || !(p >= 0 && p <= 100)) {
      throw new RangeError(`percentiles must each be between 0 and 100 (got ${String(p)})`);
    }
  }
  const byMonth: number[][] = Array.from({ length: 12 }, () => []);
  for (const day of dailyMeanFlows(readings)) {
    byMonth[Number(day.date.slice(5, 7)) - 1].push(day.discharge);
  }
  for (const list of byMonth) list.sort((a, b) => a - b);

  const group = (label: string, months: number[]): FlowPercentileGroup => {
    const values = months.length === 1 ? byMonth[months[0] - 1] : mergeSorted(months.map((m) => byMonth[m - 1]));
    return {
      label,
      months,
      days: values.length,
      percentiles: percentiles.map((p) => ({
        p,
        discharge: values.length === 0 ? null : empiricalQuantile(values, p / 100, method),
      })),
    };
  };

  return {
    method,
    monthly: MONTH_LABELS.map((label, i) => group(label, [i + 1])),
    seasonal: SEASONS.map((s) => group(s.label, s.months)),
    all: group('all', [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]),
  };
}

/**
 * Daily mean flows: the plain mean of each date's readings, in date order. A daily record
 * comes back unchanged (one reading per date).
 *
 * @param readings - readings with `date` 'YYYY-MM-DD' and `discharge`
 * @returns [{ date, discharge }] sorted by date
 * @example
 * dailyMeanFlows([
 *   { time: '2021-01-01T00:00:00.000Z', date: '2021-01-01', discharge: 10 },
 *   { time: '2021-01-01T12:00:00.000Z', date: '2021-01-01', discharge: 20 },
 * ]); // => [{ date: '2021-01-01', discharge: 15 }]
 * Source: (c) common practice (an arithmetic, not time-weighted, mean).
 */
export function dailyMeanFlows(readings: readonly FlowReading[]): { date: string; discharge: number }[] {
  const sums = new Map<string, { sum: number; count: number }>();
  for (const r of readings) {
    const s = sums.get(r.date);
    if (s) {
      s.sum += r.discharge;
      s.count++;
    } else {
      sums.set(r.date, { sum: r.discharge, count: 1 });
    }
  }
  return [...sums.entries()]
    .sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))
    .map(([date, s]) => ({ date, discharge: s.sum / s.count }));
}

/** @private Merges ascending lists into one ascending list. */
function mergeSorted(lists: number[][]): number[] {
  return lists.flat().sort((a, b) => a - b);
}
