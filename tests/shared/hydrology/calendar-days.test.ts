import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { dateOfDayNumber, dayNumber, daysFromCivil, splitDate } from '../../../shared/hydrology/calendar-days';

describe('calendar days', () => {
  it.each([
    ['1970-01-01', 0],
    ['1970-01-02', 1],
    ['2000-03-01', 11017],
    ['1969-12-31', -1],
  ])('%s is day %d ((c) Unix day count)', (date, n) => {
    expect(dayNumber(date)).toBe(n);
    expect(dateOfDayNumber(n)).toBe(date);
  });
  it('agrees with the proleptic Gregorian calendar of Date for years 1…9999 (property, (c))', () => {
    fc.assert(
      fc.property(fc.integer({ min: -719162, max: 2932896 }), (n) => {
        const iso = new Date(n * 86_400_000).toISOString().slice(0, 10);
        expect(dateOfDayNumber(n)).toBe(iso);
        const [y, m, d] = iso.split('-').map(Number);
        expect(daysFromCivil(y, m, d)).toBe(n);
      }),
      { numRuns: 500 },
    );
  });
  it('rejects impossible dates', () => {
    expect(splitDate('2021-02-29')).toBeNull();
    expect(splitDate('2020-02-29')).toEqual({ year: 2020, month: 2, day: 29 });
    expect(() => dayNumber('2021-13-01')).toThrow(/date must be a calendar date written YYYY-MM-DD/);
  });
});
