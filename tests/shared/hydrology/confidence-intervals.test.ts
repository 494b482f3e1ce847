import { describe, expect, it } from 'vitest';
import { bootstrapQuantileIntervals, lp3ConfidenceLimits17B } from '../../../shared/hydrology/confidence-intervals';
import { fitGevLMoments, gevQuantile } from '../../../shared/hydrology/gev';
import { fitLogPearson3 } from '../../../shared/hydrology/log-pearson3';
import { FISHKILL_PEAKS_CFS, GUADALUPE_PEAKS_CFS } from './fixtures/peak-datasets';

const AEPS = [0.5, 0.1, 0.01];

describe('lp3ConfidenceLimits17B', () => {
  const fit = fitLogPearson3(FISHKILL_PEAKS_CFS);
  const params = { mean: fit.mean, stdDev: fit.stdDev, skew: 0.7, n: fit.n };
  it('Fishkill Creek 1.01-year flood: limits 568–1100 cfs', () => {
    // science.md §7.5 A: (a) Bulletin 17B App. 12 prints 95 % limits 568–1100 cfs (the 0.05/0.95
    // one-sided levels, i.e. confidence 0.90 here); upper printed to 3 figures, so ±1 %.
    const r = lp3ConfidenceLimits17B(params, 0.99, 0.9);
    expect(Math.abs(r.lower - 568)).toBeLessThanOrEqual(1);
    expect(Math.abs(r.upper - 1100) / 1100).toBeLessThan(0.01);
  });
  it('limits bracket the estimate and widen with confidence ((c))', () => {
    const a = lp3ConfidenceLimits17B(params, 0.01, 0.9);
    const b = lp3ConfidenceLimits17B(params, 0.01, 0.95);
    expect(a.lower).toBeLessThan(11531);
    expect(a.upper).toBeGreaterThan(11531);
    expect(b.lower).toBeLessThan(a.lower);
    expect(b.upper).toBeGreaterThan(a.upper);
  });
  it.each([
    [() => lp3ConfidenceLimits17B(params, 1), /aep must be between 0 and 1/],
    [() => lp3ConfidenceLimits17B({ ...params, n: 2 }, 0.5), /n must be a whole number of at least 3/],
    [() => lp3ConfidenceLimits17B(params, 0.5, 1), /confidence must be between 0 and 1/],
  ])('throws a message naming the argument (%#)', (f, message) => {
    expect(f).toThrow(message);
  });
});

describe('bootstrapQuantileIntervals', () => {
  it('the same seed gives identical intervals; another seed differs ((c) reproducibility)', () => {
    const a = bootstrapQuantileIntervals(GUADALUPE_PEAKS_CFS, 'gev', AEPS, { resamples: 100, seed: 11 });
    const b = bootstrapQuantileIntervals(GUADALUPE_PEAKS_CFS, 'gev', AEPS, { resamples: 100, seed: 11 });
    const c = bootstrapQuantileIntervals(GUADALUPE_PEAKS_CFS, 'gev', AEPS, { resamples: 100, seed: 12 });
    expect(a).toEqual(b);
    expect(a.intervals[2].upper).not.toBe(c.intervals[2].upper);
  });

  it.each(['gev', 'gumbel-moments', 'gumbel-l-moments', 'lp3'] as const)(
    '%s: the limits bracket the fitted quantile and widen towards rare floods ((c) sanity)',
    (distribution) => {
      const r = bootstrapQuantileIntervals(GUADALUPE_PEAKS_CFS, distribution, AEPS, { resamples: 150, seed: 3 });
      expect(r.resamples + r.failed).toBe(150);
      for (const q of r.intervals) expect(q.upper).toBeGreaterThan(q.lower);
      const widths = r.intervals.map((q) => q.upper - q.lower);
      expect(widths[2]).toBeGreaterThan(widths[0]);
    },
  );

  it('GEV 1 % limits contain the point estimate (Guadalupe)', () => {
    // (c): percentile intervals of a parametric bootstrap normally contain the estimate.
    const fit = fitGevLMoments(GUADALUPE_PEAKS_CFS);
    const r = bootstrapQuantileIntervals(GUADALUPE_PEAKS_CFS, 'gev', [0.01], { resamples: 200, seed: 5 });
    const q100 = gevQuantile(fit, 0.99);
    expect(r.intervals[0].lower).toBeLessThan(q100);
    expect(r.intervals[0].upper).toBeGreaterThan(q100);
  });

  it('0 resamples gives no intervals', () => {
    expect(bootstrapQuantileIntervals(FISHKILL_PEAKS_CFS, 'gev', AEPS, { resamples: 0 }).intervals).toEqual([]);
  });

  it.each([
    [() => bootstrapQuantileIntervals(FISHKILL_PEAKS_CFS, 'gev', AEPS, { seed: -1 }), /seed must be a whole number/],
    [() => bootstrapQuantileIntervals(FISHKILL_PEAKS_CFS, 'gev', AEPS, { resamples: 1.5 }), /resamples must be a whole number/],
    // @ts-expect-error testing a bad distribution name at run time
    [() => bootstrapQuantileIntervals(FISHKILL_PEAKS_CFS, 'weibull', AEPS), /distribution must be 'gev'/],
  ])('throws a message naming the argument (%#)', (f, message) => {
    expect(f).toThrow(message);
  });
});
