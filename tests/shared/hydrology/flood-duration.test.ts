import { describe, expect, it } from 'vitest';
import { dateOfDayNumber, dayNumber } from '../../../shared/hydrology/calendar-days';
import { floodEvents, typicalDurationForPeak } from '../../../shared/hydrology/flood-duration';
import type { FlowReading } from '../../../shared/hydrology/parse-flow-record';

const daily = (start: string, values: number[]): FlowReading[] =>
  values.map((discharge, i) => {
    const date = dateOfDayNumber(dayNumber(start) + i);
    return { time: `${date}T00:00:00.000Z`, date, discharge };
  });

describe('floodEvents', () => {
  // (c) constructed daily record: runs above 100 of 1, 3 and 2 days.
  const readings = daily('2021-01-01', [50, 150, 50, 120, 300, 110, 40, 200, 101, 90]);
  const r = floodEvents(readings, 100);
  it('finds the runs above the threshold and their durations (one reading = one day)', () => {
    expect(r.stepHours).toBe(24);
    expect(r.events.map((e) => [e.start.slice(0, 10), e.durationHours, e.peak])).toEqual([
      ['2021-01-02', 24, 150],
      ['2021-01-04', 72, 300],
      ['2021-01-08', 48, 200],
    ]);
    expect(r.medianHours).toBe(48);
    expect(r.meanHours).toBe(48);
  });
  it('a hole in the record ends an event', () => {
    // Daily step (median spacing 1 day); 2021-01-05 and 01-06 are missing.
    const gappy = [...daily('2021-01-01', [50, 50, 200, 200]), ...daily('2021-01-07', [200, 50, 50])];
    expect(floodEvents(gappy, 100).events.map((e) => e.durationHours)).toEqual([48, 24]);
  });
  it('no events gives null centre values; bad input is refused', () => {
    expect(floodEvents(readings, 1000)).toMatchObject({ events: [], medianHours: null, meanHours: null });
    expect(() => floodEvents(readings, -1)).toThrow(/threshold must be a finite discharge of at least 0/);
    expect(() => floodEvents([...readings].reverse(), 1)).toThrow(/readings must be in time order/);
  });
});

describe('typicalDurationForPeak', () => {
  it('measures each annual peak above half of it and takes the median', () => {
    // (c) constructed: two water years, peaks 400 (3 days above 200) and 100 (1 day above 50).
    const values = Array.from({ length: 730 }, () => 10);
    values.splice(30, 5, 150, 250, 400, 300, 100);
    values.splice(400, 1, 100);
    const readings = daily('2020-10-01', values);
    const r = typicalDurationForPeak(readings);
    expect(r.events.map((e) => [e.waterYear, e.peak, e.durationHours])).toEqual([
      [2021, 400, 72],
      [2022, 100, 24],
    ]);
    expect(r.medianHours).toBe(48);
  });
  it('refuses a fraction outside (0, 1)', () => {
    expect(() => typicalDurationForPeak([], { fraction: 1 })).toThrow(/fraction must be between 0 and 1/);
  });
});
