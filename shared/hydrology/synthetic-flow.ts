/**
 * @module shared/hydrology/synthetic-flow
 * A seeded generator of invented daily river flows for the demo and for tests, and a CSV
 * writer that the gauge-record parser reads back exactly.
 */

import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { dateOfDayNumber, dayNumber, splitDate } from './calendar-days';
import { requireBetween, requireInteger, requirePositiveNumber } from './check-values';
import { gevQuantile } from './gev';
import type { FlowReading } from './parse-flow-record';
import { createUniformStream } from './seeded-uniform';

/** Options of {@link generateSyntheticFlow}; every field has a default. */
export interface SyntheticFlowOptions {
  /** Seed, 0…4294967295; default 1. The same options and seed always give the same series. */
  seed?: number;
  /** First day, 'YYYY-MM-DD' (not 29 February); default '1985-10-01'. */
  startDate?: string;
  /** Length in years, 1…200 (30–40 is typical for a gauge); default 35. */
  years?: number;
  /** Mean base flow [m³/s], > 0; default 40. */
  meanBaseFlow?: number;
  /** Seasonal swing of the base flow as a fraction of its mean, 0 ≤ A < 1; default 0.5. */
  seasonalAmplitude?: number;
  /** Month (1…12) in whose middle base flow and flood frequency peak; default 3 (March). */
  peakMonth?: number;
  /** Mean number of flood events a year, 0…50; default 4. */
  floodsPerYear?: number;
  /** How strongly floods cluster in the wet season, 0 (none) … 1; default 0.8. */
  floodSeasonality?: number;
  /** Median flood peak above base flow [m³/s], > 0; default 250. */
  medianFloodPeak?: number;
  /** GEV shape k of the flood peaks (Hosking's sign: k < 0 heavy tail), −0.5…0.3; default −0.15. */
  peakShapeK?: number;
  /** Recession constant [days], e-folding time of the falling limb, 0.2…60; default 4. */
  recessionDays?: number;
  /** Length of the rising limb [days], 1…5; default 1. */
  riseDays?: number;
}

/** The defaults of {@link generateSyntheticFlow}. */
export const SYNTHETIC_FLOW_DEFAULTS: Readonly<Required<SyntheticFlowOptions>> = {
  seed: 1,
  startDate: '1985-10-01',
  years: 35,
  meanBaseFlow: 40,
  seasonalAmplitude: 0.5,
  peakMonth: 3,
  floodsPerYear: 4,
  floodSeasonality: 0.8,
  medianFloodPeak: 250,
  peakShapeK: -0.15,
  recessionDays: 4,
  riseDays: 1,
};

/** GEV scale of flood peaks as a fraction of their median. Source: (c) our choice for a plausible spread. */
const PEAK_SCALE_FRACTION = 0.45;
/** Smallest flood peak as a fraction of the median (the GEV with k < 0 reaches below zero). Source: (c). */
const PEAK_FLOOR_FRACTION = 0.05;
/** Day-to-day multiplicative noise of base flow: lag-one correlation and standard deviation (log space). Source: (c). */
const NOISE_CORRELATION = 0.9;
const NOISE_SD = 0.1;
const DAYS_PER_YEAR = 365.25;

/**
 * Generates an invented daily flow record (m³/s), reproducible from its seed:
 * - base flow Q_b(t) = mean × (1 + A cos(2π (t − t_peak)/365.25)) × e^(ε_t − σ²/2), with ε an
 *   AR(1) series (lag-one correlation 0.9, σ = 0.1) for day-to-day wobble and t_peak the 15th
 *   of `peakMonth`;
 * - flood events arriving as a Poisson process with seasonal rate
 *   λ(t) = (floodsPerYear/365.25)(1 + s cos(2π (t − t_peak)/365.25)), s = floodSeasonality;
 * - each event's peak above base flow drawn from a GEV with shape k = peakShapeK, scale
 *   0.45 × median and location set so that its median is `medianFloodPeak` (floored at 5 % of
 *   the median, since a GEV with k < 0 reaches below zero);
 * - a linear rise over `riseDays` to the peak, then an exponential recession
 *   P e^(−t/recessionDays); overlapping events add up.
 * Flows are rounded to 0.001 m³/s and are never negative. Days run from startDate to the day
 * before the same date `years` later, at 00:00 UTC.
 *
 * @param options - see {@link SyntheticFlowOptions}; all optional
 * @returns daily readings { time, date, discharge [m³/s] }, in date order
 * @throws RangeError naming the option that is out of range
 * @example
 * const readings = generateSyntheticFlow({ seed: 7, years: 30, medianFloodPeak: 400 });
 * readings.length; // => 10957
 * Source: (c) common practice: seasonal sinusoid, Poisson flood arrivals, GEV peaks
 * (heavy-tailed for k < 0, Hosking's parameterisation as in gev.ts) and linear-reservoir
 * (exponential) recessions; every number here is invented, for demonstration only.
 */
export function generateSyntheticFlow(options: SyntheticFlowOptions = {}): FlowReading[] {
  const o = { ...SYNTHETIC_FLOW_DEFAULTS, ...withoutUndefined(options) };
  requireInteger('seed', o.seed, 0, 0xffffffff);
  const start = splitDate(o.startDate);
  if (!start || (start.month === 2 && start.day === 29)) {
    throw new RangeError(`startDate must be a calendar date written YYYY-MM-DD, not 29 February (got '${o.startDate}')`);
  }
  requireInteger('years', o.years, 1, 200);
  requirePositiveNumber('meanBaseFlow', o.meanBaseFlow, 'm³/s');
  requireBetween('seasonalAmplitude', o.seasonalAmplitude, 0, 0.99);
  requireInteger('peakMonth', o.peakMonth, 1, 12);
  requireBetween('floodsPerYear', o.floodsPerYear, 0, 50);
  requireBetween('floodSeasonality', o.floodSeasonality, 0, 1);
  requirePositiveNumber('medianFloodPeak', o.medianFloodPeak, 'm³/s');
  requireBetween('peakShapeK', o.peakShapeK, -0.5, 0.3);
  requireBetween('recessionDays', o.recessionDays, 0.2, 60);
  requireInteger('riseDays', o.riseDays, 1, 5);

  const first = dayNumber(o.startDate);
  const endYear = String(start.year + o.years).padStart(4, '0');
  const last = dayNumber(`${endYear}${o.startDate.slice(4)}`) - 1;
  const days = last - first + 1;
  const next = createUniformStream(o.seed);

  const scale = PEAK_SCALE_FRACTION * o.medianFloodPeak;
  const medianOfUnitLocation = gevQuantile({ location: 0, scale, shape: o.peakShapeK }, 0.5);
  const peakParams = { location: o.medianFloodPeak - medianOfUnitLocation, scale, shape: o.peakShapeK };
  const peakFloor = PEAK_FLOOR_FRACTION * o.medianFloodPeak;

  const floods = new Float64Array(days);
  const tail = Math.ceil(o.recessionDays * Math.log(1e4)); // until the flood falls below 1e-4 of its peak
  const values: FlowReading[] = new Array(days);
  let noise = 0;
  for (let i = 0; i < days; i++) {
    const date = dateOfDayNumber(first + i);
    const phase = (2 * Math.PI * (dayOfYear(date) - peakDayOfYear(o.peakMonth))) / DAYS_PER_YEAR;
    const seasonal = Math.cos(phase);

    // Flood arrivals today (Poisson by inversion).
    const rate = (o.floodsPerYear / DAYS_PER_YEAR) * (1 + o.floodSeasonality * seasonal);
    let arrivals = 0;
    if (rate > 0) {
      const u = next();
      let p = Math.exp(-rate);
      let cumulative = p;
      while (u > cumulative && arrivals < 10) {
        arrivals++;
        p *= rate / arrivals;
        cumulative += p;
      }
    }
    for (let e = 0; e < arrivals; e++) {
      const peak = Math.max(peakFloor, gevQuantile(peakParams, next()));
      for (let j = 0; j < o.riseDays; j++) {
        if (i + j < days) floods[i + j] += (peak * (j + 1)) / (o.riseDays + 1);
      }
      for (let j = 0; j <= tail; j++) {
        const d = i + o.riseDays + j;
        if (d >= days) break;
        floods[d] += peak * Math.exp(-j / o.recessionDays);
      }
    }

    noise = NOISE_CORRELATION * noise + Math.sqrt(1 - NOISE_CORRELATION ** 2) * NOISE_SD * normalQuantile(next(), 0, 1);
    const base = o.meanBaseFlow * (1 + o.seasonalAmplitude * seasonal) * Math.exp(noise - (NOISE_SD * NOISE_SD) / 2);
    const discharge = Math.max(0.001, Math.round((base + floods[i]) * 1000) / 1000);
    values[i] = { time: `${date}T00:00:00.000Z`, date, discharge };
  }
  return values;
}

/**
 * Writes readings as CSV that {@link parseFlowRecord} reads back to the same readings (with
 * units 'm3s'): a 'date,discharge' file when every reading is at 00:00 UTC of its date
 * (a daily record), else 'datetime,discharge' with UTC times. Discharges are written with
 * JavaScript's shortest round-trip number form. (Readings parsed from a file with time zones
 * keep their local `date`, which a UTC time cannot carry; such records round-trip in `time`
 * and `discharge` only.)
 *
 * @param readings - readings { time, date, discharge [m³/s] }
 * @returns CSV text with a header row and a final newline
 * @example
 * toFlowCsv([{ time: '2021-01-01T00:00:00.000Z', date: '2021-01-01', discharge: 12.5 }]);
 * // => 'date,discharge\n2021-01-01,12.5\n'
 * Source: (c) common practice (CSV, ISO 8601).
 */
export function toFlowCsv(readings: readonly FlowReading[]): string {
  const daily = readings.every((r) => r.time === `${r.date}T00:00:00.000Z`);
  const lines = [daily ? 'date,discharge' : 'datetime,discharge'];
  for (const r of readings) {
    if (typeof r.discharge !== 'number' || !Number.isFinite(r.discharge)) {
      throw new RangeError(`discharge must be a finite number (got ${String(r.discharge)} at ${r.time})`);
    }
    lines.push(`${daily ? r.date : r.time},${String(r.discharge)}`);
  }
  return `${lines.join('\n')}\n`;
}

/** @private Day of the year, 1…366. */
function dayOfYear(date: string): number {
  return dayNumber(date) - dayNumber(`${date.slice(0, 4)}-01-01`) + 1;
}

/** @private Day of the year of the 15th of a month in a non-leap year. */
function peakDayOfYear(month: number): number {
  const starts = [0, 31, 59, 90, 120, 151, 181, 212, 243, 273, 304, 334];
  return starts[month - 1] + 15;
}

/** @private Drops undefined fields so that they do not override defaults. */
function withoutUndefined(options: SyntheticFlowOptions): SyntheticFlowOptions {
  return Object.fromEntries(Object.entries(options ?? {}).filter(([, v]) => v !== undefined)) as SyntheticFlowOptions;
}
