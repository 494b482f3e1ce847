import { describe, expect, it } from 'vitest';
import { annualMaxima } from '../../../shared/hydrology/annual-maxima';
import { flowPercentiles } from '../../../shared/hydrology/flow-percentiles';
import { fitGevLMoments, gevQuantile } from '../../../shared/hydrology/gev';
import { parseFlowRecord } from '../../../shared/hydrology/parse-flow-record';
import { generateSyntheticFlow, toFlowCsv } from '../../../shared/hydrology/synthetic-flow';

describe('generateSyntheticFlow', () => {
  const a = generateSyntheticFlow({ seed: 42, years: 30, startDate: '1990-10-01' });
  it('runs daily from the start date for the given years ((c) 30 × 365 + 8 leap days = 10 958 days)', () => {
    expect(a).toHaveLength(10958);
    expect(a[0].date).toBe('1990-10-01');
    expect(a[a.length - 1].date).toBe('2020-09-30');
  });
  it('is reproducible: the same seed gives an identical series, another seed differs', () => {
    expect(generateSyntheticFlow({ seed: 42, years: 30, startDate: '1990-10-01' })).toEqual(a);
    const b = generateSyntheticFlow({ seed: 43, years: 30, startDate: '1990-10-01' });
    expect(b.some((r, i) => r.discharge !== a[i].discharge)).toBe(true);
  });
  it('is never negative and peaks seasonally around the peak month ((c) sanity)', () => {
    expect(a.every((r) => r.discharge > 0)).toBe(true);
    const p = flowPercentiles(a, { percentiles: [50] });
    const march = p.monthly[2].percentiles[0].discharge ?? 0;
    const september = p.monthly[8].percentiles[0].discharge ?? 0;
    expect(march).toBeGreaterThan(1.5 * september);
  });
  it('annual maxima fitted by GEV show a plausible heavy tail (loose sanity check, (c))', () => {
    // (c) sanity only: with peakShapeK = −0.15 the GEV of annual maxima (seed 42) should have
    // k < 0.15 and a 100-year flood well above the 10-year flood.
    const am = annualMaxima(a).map((m) => m.discharge);
    expect(am).toHaveLength(30);
    const fit = fitGevLMoments(am);
    expect(fit.shape).toBeLessThan(0.15);
    expect(fit.shape).toBeGreaterThan(-0.8);
    expect(gevQuantile(fit, 0.99) / gevQuantile(fit, 0.9)).toBeGreaterThan(1.3);
  });
  it.each([
    [{ years: 0 }, /years must be a whole number between 1 and 200/],
    [{ startDate: '2020-02-29' }, /startDate must be a calendar date written YYYY-MM-DD, not 29 February/],
    [{ seasonalAmplitude: 1 }, /seasonalAmplitude must be between 0 and 0.99/],
    [{ peakMonth: 13 }, /peakMonth must be a whole number between 1 and 12/],
    [{ meanBaseFlow: 0 }, /meanBaseFlow must be a finite number greater than 0/],
    [{ peakShapeK: -1 }, /peakShapeK must be between -0.5 and 0.3/],
  ])('refuses %j', (options, message) => {
    expect(() => generateSyntheticFlow(options)).toThrow(message);
  });
});

describe('toFlowCsv', () => {
  it('round-trips a synthetic daily record through parseFlowRecord exactly', () => {
    const readings = generateSyntheticFlow({ seed: 7, years: 31 });
    const parsed = parseFlowRecord(toFlowCsv(readings), { units: 'm3s' });
    expect(parsed.problems).toEqual([]);
    expect(parsed.gaps).toEqual([]);
    expect(parsed.interval).toBe('daily');
    expect(parsed.readings).toEqual(readings);
  });
  it('writes UTC date-times for sub-daily records and they round-trip', () => {
    const readings = [
      { time: '2021-01-01T06:00:00.000Z', date: '2021-01-01', discharge: 0.1 + 0.2 },
      { time: '2021-01-01T12:30:00.000Z', date: '2021-01-01', discharge: 1e-7 },
    ];
    const csv = toFlowCsv(readings);
    expect(csv.split('\n')[0]).toBe('datetime,discharge');
    expect(parseFlowRecord(csv, { units: 'm3s' }).readings).toEqual(readings);
  });
});
