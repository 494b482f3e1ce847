/**
 * @module shared/hydrology/annual-maxima
 * Annual maximum series by water year from a gauge record.
 */

import { dayNumber, daysInMonth } from './calendar-days';
import type { FlowReading } from './parse-flow-record';

/** The annual maximum of one water year. */
export interface AnnualMaximum {
  /** Water year, named for the calendar year in which it ends. */
  waterYear: number;
  /** Largest discharge of the water year, in the readings' units (m³/s from the parser). */
  discharge: number;
  /** Date of the largest reading (the first, if it repeats), 'YYYY-MM-DD'. */
  date: string;
  /** Instant of the largest reading, ISO 8601 UTC. */
  time: string;
  /** Distinct calendar days with at least one reading in this water year. */
  daysOfData: number;
  /** Days in this water year (365 or 366). */
  daysInYear: number;
  /** false if daysOfData is below the completeness threshold (default 330 days). */
  complete: boolean;
}

/** Options of {@link annualMaxima}. */
export interface AnnualMaximaOptions {
  /** First day of the water year, 'MM-DD' (not '02-29'); default '10-01' (1 October). */
  waterYearStart?: string;
  /** Fewest days with data for a complete year, 1…366; default 330. */
  minDaysForComplete?: number;
}

/** The default first day of the water year: 1 October (USGS). */
export const DEFAULT_WATER_YEAR_START = '10-01';

/**
 * The smallest number of days with data for a water year to count as complete.
 * Source: (c) common practice: about 90 % of the year, so that a missing month or so (often
 * in a dry season) does not exclude the year, while a year missing its flood season is flagged.
 */
export const MIN_DAYS_FOR_COMPLETE_YEAR = 330;

/**
 * Reads a water-year start 'MM-DD' into numbers.
 *
 * @param waterYearStart - 'MM-DD', a real day of a non-leap year (01-01 … 12-31; '02-29' is refused)
 * @returns { month, day }
 * @throws RangeError naming the argument if the text is not a valid 'MM-DD'
 * @example
 * parseWaterYearStart('10-01'); // => { month: 10, day: 1 }
 * Source: (c) common practice.
 */
export function parseWaterYearStart(waterYearStart: string): { month: number; day: number } {
  const m = typeof waterYearStart === 'string' ? /^(\d{2})-(\d{2})$/.exec(waterYearStart) : null;
  const month = m ? Number(m[1]) : Number.NaN;
  const day = m ? Number(m[2]) : Number.NaN;
  if (!m || month < 1 || month > 12 || day < 1 || day > daysInMonth(2001, month)) {
    throw new RangeError(
      `waterYearStart must be a day of the year written MM-DD, from 01-01 to 12-31 and not 02-29 (got '${String(waterYearStart)}')`,
    );
  }
  return { month, day };
}

/**
 * The water year a date falls in. A water year starting on MM-DD runs to the day before the
 * next MM-DD and is named for the calendar year in which it ends: with the default start
 * '10-01', 1 October 2020 – 30 September 2021 is water year 2021. With '01-01' the water year
 * is the calendar year.
 *
 * @param date - 'YYYY-MM-DD'
 * @param waterYearStart - 'MM-DD', default '10-01'
 * @returns the water year (a calendar year number)
 * @example
 * waterYearOf('2020-10-01'); // => 2021
 * waterYearOf('2021-09-30'); // => 2021
 * waterYearOf('2021-06-30', '07-01'); // => 2021
 * Source: the 1 October – 30 September year is (a) published: Maidment, UT Austin CE 374K
 * (science.md §7.1); naming it for the year in which it ends is (b) from memory: USGS
 * water-data definitions of the "water year".
 */
export function waterYearOf(date: string, waterYearStart: string = DEFAULT_WATER_YEAR_START): number {
  const start = parseWaterYearStart(waterYearStart);
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) throw new RangeError(`date must be written YYYY-MM-DD (got '${date}')`);
  return waterYearFromParts(Number(m[1]), Number(m[2]), Number(m[3]), start);
}

/**
 * Annual maximum series: the largest reading of each water year that has data, in water-year
 * order. Years with fewer than `minDaysForComplete` days of data are kept but flagged
 * `complete: false`, so the caller can drop or keep them; a sub-daily record counts the days
 * that have at least one reading. The maximum is that of the readings given (daily means give
 * the annual maximum daily flow; instantaneous readings give the annual peak).
 *
 * @param readings - readings with `date` 'YYYY-MM-DD' and `discharge` ≥ 0, any order
 * @param options - { waterYearStart = '10-01', minDaysForComplete = 330 }
 * @returns one entry per water year with data
 * @throws RangeError if waterYearStart or minDaysForComplete is invalid
 * @example
 * annualMaxima([
 *   { time: '2020-10-05T00:00:00.000Z', date: '2020-10-05', discharge: 40 },
 *   { time: '2021-02-10T00:00:00.000Z', date: '2021-02-10', discharge: 310 },
 * ]);
 * // => [{ waterYear: 2021, discharge: 310, date: '2021-02-10', daysOfData: 2, daysInYear: 365, complete: false, ... }]
 * Source: (c) common practice (annual maximum series, science.md §7.1); the 330-day
 * completeness threshold is (c) common practice.
 */
export function annualMaxima(readings: readonly FlowReading[], options: AnnualMaximaOptions = {}): AnnualMaximum[] {
  const waterYearStart = options.waterYearStart ?? DEFAULT_WATER_YEAR_START;
  const start = parseWaterYearStart(waterYearStart);
  const minDays = options.minDaysForComplete ?? MIN_DAYS_FOR_COMPLETE_YEAR;
  if (!Number.isInteger(minDays) || minDays < 1 || minDays > 366) {
    throw new RangeError(`minDaysForComplete must be a whole number of days from 1 to 366 (got ${String(minDays)})`);
  }
  // Count distinct dates per water year; a date-ordered record (the parser's output) needs no set.
  let ordered = true;
  for (let i = 1; i < readings.length && ordered; i++) ordered = readings[i].date >= readings[i - 1].date;
  const years = new Map<number, { best: FlowReading; days: number; lastDate: string; seen: Set<string> | null }>();
  let lastDate = '';
  let lastYear = 0;
  for (const r of readings) {
    const d = r.date;
    const wy = d === lastDate ? lastYear : waterYearFromParts(Number(d.slice(0, 4)), Number(d.slice(5, 7)), Number(d.slice(8, 10)), start);
    lastDate = d;
    lastYear = wy;
    const entry = years.get(wy);
    if (!entry) {
      years.set(wy, { best: r, days: 1, lastDate: d, seen: ordered ? null : new Set([d]) });
      continue;
    }
    if (entry.seen) {
      if (!entry.seen.has(d)) {
        entry.seen.add(d);
        entry.days++;
      }
    } else if (d !== entry.lastDate) {
      entry.days++;
      entry.lastDate = d;
    }
    if (r.discharge > entry.best.discharge || (r.discharge === entry.best.discharge && r.time < entry.best.time)) {
      entry.best = r;
    }
  }
  return [...years.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([waterYear, { best, days }]) => {
      const daysInYear = waterYearLength(waterYear, start);
      return {
        waterYear,
        discharge: best.discharge,
        date: best.date,
        time: best.time,
        daysOfData: days,
        daysInYear,
        complete: days >= minDays,
      };
    });
}

/** @private Water year of a calendar date, named for the year in which it ends. */
function waterYearFromParts(year: number, month: number, day: number, start: { month: number; day: number }): number {
  if (start.month === 1 && start.day === 1) return year;
  const onOrAfterStart = month > start.month || (month === start.month && day >= start.day);
  return onOrAfterStart ? year + 1 : year;
}

/** @private Number of days in a water year. */
function waterYearLength(waterYear: number, start: { month: number; day: number }): number {
  const mmdd = `${String(start.month).padStart(2, '0')}-${String(start.day).padStart(2, '0')}`;
  const firstYear = start.month === 1 && start.day === 1 ? waterYear : waterYear - 1;
  const first = dayNumber(`${String(firstYear).padStart(4, '0')}-${mmdd}`);
  const next = dayNumber(`${String(firstYear + 1).padStart(4, '0')}-${mmdd}`);
  return next - first;
}
