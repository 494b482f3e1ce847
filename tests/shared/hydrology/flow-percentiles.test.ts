import { describe, expect, it } from 'vitest';
import { dateOfDayNumber, dayNumber } from '../../../shared/hydrology/calendar-days';
import { empiricalQuantile } from '../../../shared/hydrology/empirical-quantile';
import { dailyMeanFlows, flowPercentiles, seasonalScenarioName } from '../../../shared/hydrology/flow-percentiles';
import type { FlowReading } from '../../../shared/hydrology/parse-flow-record';

describe('empiricalQuantile', () => {
  // (b) Hyndman & Fan (1996) types 5 (Hazen) and 7; values (c) hand-computed.
  it.each([
    [[1, 2, 3, 4], 0.5, 'hazen', 2.5],
    [[1, 2, 3, 4], 0.9, 'type7', 3.7],
    [[1, 2, 3, 4], 0.9, 'hazen', 4],
    [[1, 2, 3, 4], 0.25, 'hazen', 1.5],
    [[1, 2, 3, 4], 0.25, 'type7', 1.75],
    [[10], 0.99, 'hazen', 10],
  ] as const)('%j at p = %f (%s) = %f', (values, p, method, expected) => {
    expect(empiricalQuantile(values, p, method)).toBeCloseTo(expected, 12);
  });
  it('refuses p outside 0…1 and empty samples', () => {
    expect(() => empiricalQuantile([1], 1.5)).toThrow(/p must be a probability between 0 and 1/);
    expect(() => empiricalQuantile([], 0.5)).toThrow(/at least one value/);
  });
});

describe('flowPercentiles', () => {
  // (c) constructed: flow on day d of a month is d (1…28/30/31) in a non-leap year.
  const first = dayNumber('2021-01-01');
  const readings: FlowReading[] = Array.from({ length: 365 }, (_, i) => {
    const date = dateOfDayNumber(first + i);
    return { time: `${date}T00:00:00.000Z`, date, discharge: Number(date.slice(8, 10)) };
  });
  const r = flowPercentiles(readings, { percentiles: [50, 90] });
  it('monthly medians by the Hazen definition', () => {
    expect(r.monthly[0]).toMatchObject({ label: 'Jan', months: [1], days: 31 });
    expect(r.monthly[0].percentiles[0]).toEqual({ p: 50, discharge: 16 });
    expect(r.monthly[0].percentiles[1].discharge).toBeCloseTo(28.4, 10);
    expect(r.monthly[1].percentiles[0].discharge).toBe(14.5);
  });
  it('seasons are named by months and pool their days', () => {
    // Named by their months, never by season codes (issue #14 item 6): the same words in both hemispheres.
    expect(r.seasonal.map((s) => [s.label, s.days])).toEqual([
      ['Dec–Feb', 90],
      ['Mar–May', 92],
      ['Jun–Aug', 92],
      ['Sep–Nov', 91],
    ]);
    for (const s of r.seasonal) expect(s.label).not.toMatch(/DJF|MAM|JJA|SON|summer|winter|spring|autumn|fall/i);
    expect(r.all.days).toBe(365);
  });
  it('names seasonal scenarios by their months', () => {
    expect(seasonalScenarioName(r.seasonal[0], 99)).toBe('Dec–Feb high flow (99th percentile of daily flow)');
    expect(seasonalScenarioName(r.seasonal[2], 91)).toBe('Jun–Aug high flow (91st percentile of daily flow)');
    expect(seasonalScenarioName(r.seasonal[1], 92)).toBe('Mar–May high flow (92nd percentile of daily flow)');
    expect(seasonalScenarioName(r.seasonal[3], 13)).toBe('Sep–Nov high flow (13th percentile of daily flow)');
    expect(() => seasonalScenarioName(r.seasonal[0], 101)).toThrow(/percentile must be between 0 and 100/);
  });
  it('averages sub-daily readings to daily means first', () => {
    expect(
      dailyMeanFlows([
        { time: '2021-01-01T00:00:00.000Z', date: '2021-01-01', discharge: 10 },
        { time: '2021-01-01T12:00:00.000Z', date: '2021-01-01', discharge: 20 },
      ]),
    ).toEqual([{ date: '2021-01-01', discharge: 15 }]);
  });
  it('gives null for months without data and refuses bad percentiles', () => {
    expect(flowPercentiles(readings.slice(0, 5)).monthly[5].percentiles[0].discharge).toBeNull();
    expect(() => flowPercentiles(readings, { percentiles: [101] })).toThrow(/percentiles must each be between 0 and 100/);
  });
});
