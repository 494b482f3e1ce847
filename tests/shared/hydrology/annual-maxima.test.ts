import { describe, expect, it } from 'vitest';
import { annualMaxima, parseWaterYearStart, waterYearOf } from '../../../shared/hydrology/annual-maxima';
import { dateOfDayNumber, dayNumber } from '../../../shared/hydrology/calendar-days';
import type { FlowReading } from '../../../shared/hydrology/parse-flow-record';

const day = (date: string, discharge: number): FlowReading => ({ time: `${date}T00:00:00.000Z`, date, discharge });

describe('waterYearOf', () => {
  // Oct–Sep water year (a) Maidment CE 374K (science.md §7.1); named for the year it ends in (b) USGS.
  it.each([
    ['2020-09-30', '10-01', 2020],
    ['2020-10-01', '10-01', 2021],
    ['2021-09-30', '10-01', 2021],
    ['2021-06-30', '07-01', 2021],
    ['2021-07-01', '07-01', 2022],
    ['2021-12-31', '01-01', 2021],
    ['2021-01-01', '01-01', 2021],
  ])('%s with start %s is water year %d', (date, start, expected) => {
    expect(waterYearOf(date, start)).toBe(expected);
  });
  it.each(['02-29', '13-01', '10-32', '1001', ''])('refuses start %s', (start) => {
    expect(() => parseWaterYearStart(start)).toThrow(/waterYearStart must be a day of the year written MM-DD/);
  });
});

describe('annualMaxima', () => {
  it('takes the largest reading of each water year and flags incomplete years', () => {
    // (c) constructed record: WY 2021 complete (365 days), WY 2022 only 100 days.
    const first = dayNumber('2020-10-01');
    const readings: FlowReading[] = [];
    for (let i = 0; i < 465; i++) {
      const date = dateOfDayNumber(first + i);
      readings.push(day(date, date === '2021-02-10' ? 310 : date === '2021-12-25' ? 90 : 10 + (i % 7)));
    }
    const am = annualMaxima(readings);
    expect(am).toEqual([
      {
        waterYear: 2021,
        discharge: 310,
        date: '2021-02-10',
        time: '2021-02-10T00:00:00.000Z',
        daysOfData: 365,
        daysInYear: 365,
        complete: true,
      },
      {
        waterYear: 2022,
        discharge: 90,
        date: '2021-12-25',
        time: '2021-12-25T00:00:00.000Z',
        daysOfData: 100,
        daysInYear: 365,
        complete: false,
      },
    ]);
  });
  it('counts days, not readings, in a sub-daily record and handles unsorted input', () => {
    const readings = [
      { time: '2021-01-01T12:00:00.000Z', date: '2021-01-01', discharge: 5 },
      { time: '2021-01-01T00:00:00.000Z', date: '2021-01-01', discharge: 7 },
      { time: '2020-12-31T00:00:00.000Z', date: '2020-12-31', discharge: 7 },
    ];
    const am = annualMaxima(readings, { waterYearStart: '01-01', minDaysForComplete: 1 });
    expect(am.map((a) => [a.waterYear, a.discharge, a.daysOfData, a.daysInYear, a.complete])).toEqual([
      [2020, 7, 1, 366, true],
      [2021, 7, 1, 365, true],
    ]);
  });
  it('refuses a bad completeness threshold', () => {
    expect(() => annualMaxima([], { minDaysForComplete: 0 })).toThrow(/minDaysForComplete must be a whole number of days from 1 to 366/);
  });
});
