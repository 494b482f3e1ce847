/**
 * @module shared/hydrology/calendar-days
 * Whole-day calendar arithmetic on 'YYYY-MM-DD' strings (proleptic Gregorian calendar, no time
 * zone). Pure: uses Date.UTC only as a calendar calculator, never the clock.
 */

const MS_PER_DAY = 86_400_000;
const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * Days in a month of the Gregorian calendar.
 *
 * @param year - calendar year, 1…9999
 * @param month - month 1…12
 * @returns 28…31
 * @example
 * daysInMonth(2024, 2); // => 29
 * Source: (c) common practice (Gregorian leap-year rule).
 */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) {
    const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
    return leap ? 29 : 28;
  }
  return [4, 6, 9, 11].includes(month) ? 30 : 31;
}

/**
 * Splits a 'YYYY-MM-DD' date into numbers, or returns null if it is not a real calendar date.
 *
 * @param date - text such as '2021-03-14'; years 0001…9999
 * @returns { year, month, day } or null
 * @example
 * splitDate('2021-02-29'); // => null (2021 is not a leap year)
 * splitDate('2020-02-29'); // => { year: 2020, month: 2, day: 29 }
 * Source: (c) common practice (ISO 8601 calendar date).
 */
export function splitDate(date: string): { year: number; month: number; day: number } | null {
  const m = DATE_PATTERN.exec(date);
  if (!m) return null;
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  if (year < 1 || month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return null;
  return { year, month, day };
}

/**
 * Whole days since 1970-01-01 of a 'YYYY-MM-DD' date (negative before 1970).
 *
 * @param date - a valid calendar date 'YYYY-MM-DD'
 * @returns day number (integer)
 * @throws RangeError if the date is not a real calendar date
 * @example
 * dayNumber('1970-01-02'); // => 1
 * Source: (c) common practice.
 */
export function dayNumber(date: string): number {
  const parts = splitDate(date);
  if (!parts) throw new RangeError(`date must be a calendar date written YYYY-MM-DD (got '${date}')`);
  return Math.round(utcMs(parts.year, parts.month, parts.day) / MS_PER_DAY);
}

/**
 * The 'YYYY-MM-DD' date of a day number (inverse of {@link dayNumber}).
 *
 * @param day - whole days since 1970-01-01, within years 0001…9999
 * @returns 'YYYY-MM-DD'
 * @example
 * dateOfDayNumber(365); // => '1971-01-01'
 * Source: (c) common practice.
 */
export function dateOfDayNumber(day: number): string {
  if (!Number.isInteger(day)) throw new RangeError(`day must be a whole number of days (got ${String(day)})`);
  const d = new Date(day * MS_PER_DAY);
  return `${pad(d.getUTCFullYear(), 4)}-${pad(d.getUTCMonth() + 1, 2)}-${pad(d.getUTCDate(), 2)}`;
}

/**
 * Milliseconds since 1970-01-01T00:00Z of a UTC calendar instant; works for years 0…99 too
 * (Date.UTC alone would map them to 1900…1999).
 *
 * @param year - calendar year 1…9999
 * @param month - 1…12
 * @param day - 1…31
 * @param hour - 0…23 (default 0)
 * @param minute - 0…59 (default 0)
 * @param second - 0…59, fractions allowed (default 0)
 * @returns milliseconds since the Unix epoch
 * @example
 * utcMs(1970, 1, 2); // => 86400000
 * Source: (c) common practice.
 */
export function utcMs(year: number, month: number, day: number, hour = 0, minute = 0, second = 0): number {
  const d = new Date(0);
  d.setUTCFullYear(year, month - 1, day);
  d.setUTCHours(hour, minute, 0, 0);
  return d.getTime() + second * 1000;
}

/** @private Zero-padded decimal. */
function pad(value: number, width: number): string {
  return String(value).padStart(width, '0');
}
