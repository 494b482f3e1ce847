/**
 * @module shared/hydrology/calendar-days
 * Whole-day calendar arithmetic on 'YYYY-MM-DD' strings (proleptic Gregorian calendar, no time
 * zone), by integer arithmetic. Pure: never reads the clock.
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
  return daysFromCivil(parts.year, parts.month, parts.day);
}

/**
 * Whole days since 1970-01-01 of a proleptic Gregorian date, by integer arithmetic (no Date
 * object, so it is fast enough for long records).
 *
 * @param year - any integer year
 * @param month - 1…12
 * @param day - 1…31 (not checked against the month)
 * @returns day number (negative before 1970)
 * @example
 * daysFromCivil(2000, 3, 1); // => 11017
 * Source: (c) common practice: the days-from-civil algorithm over 400-year eras (as published
 * by H. Hinnant, "chrono-compatible low-level date algorithms", (b) from memory).
 */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
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
  // Inverse of daysFromCivil.
  const z = day + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const d = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const m = mp < 10 ? mp + 3 : mp - 9;
  const y = yoe + era * 400 + (m <= 2 ? 1 : 0);
  return `${pad(y, 4)}-${pad(m, 2)}-${pad(d, 2)}`;
}

/**
 * Milliseconds since 1970-01-01T00:00Z of a UTC calendar instant; works for years 0…99 too
 * (Date.UTC would map them to 1900…1999).
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
  return daysFromCivil(year, month, day) * MS_PER_DAY + ((hour * 60 + minute) * 60 + second) * 1000;
}

/** @private Zero-padded decimal. */
function pad(value: number, width: number): string {
  return String(value).padStart(width, '0');
}
