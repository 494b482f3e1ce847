import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { describe, expect, it } from 'vitest';
import { grubbsBeckCriticalValue, grubbsBeckTest, mgbtPValue, multipleGrubbsBeckTest } from '../../../shared/hydrology/grubbs-beck';
import { createUniformStream } from '../../../shared/hydrology/seeded-uniform';
import { FISHKILL_PEAKS_CFS, GUADALUPE_PEAKS_CFS } from './fixtures/peak-datasets';

describe('grubbsBeckCriticalValue', () => {
  // Formula (b) from memory (brief; Bulletin 17B App. 4); expected K_N (b) from memory of the
  // 17B 10 % table (2.036, 2.467, 2.768, 3.017), which the formula approximates.
  it.each([
    [10, 2.036],
    [24, 2.467],
    [50, 2.768],
    [100, 3.017],
  ])('n = %d → K_N = %f', (n, expected) => {
    expect(Math.abs(grubbsBeckCriticalValue(n) - expected)).toBeLessThan(1e-3);
  });
  it.each([9, 150, 24.5])('refuses n = %f', (n) => {
    expect(() => grubbsBeckCriticalValue(n)).toThrow(/n must be a whole number of peaks from 10 to 149/);
  });
});

describe('grubbsBeckTest', () => {
  it('Fishkill Creek: threshold 10^(ȳ − K_N s) ≈ 579 cfs, no low outliers', () => {
    // (c) computed from science.md §7.5 A statistics: 10^(3.36835 − 2.46705 × 0.245614) = 578.6 cfs.
    const r = grubbsBeckTest(FISHKILL_PEAKS_CFS);
    expect(r.applicable).toBe(true);
    expect(Math.abs((r.threshold ?? 0) - 578.6)).toBeLessThan(1);
    expect(r.lowOutliers).toEqual([]);
  });
  it('flags an added 50 cfs year in the Fishkill record', () => {
    // (c): 50 cfs is far below the threshold of the 25-year record.
    const r = grubbsBeckTest([...FISHKILL_PEAKS_CFS, 50]);
    expect(r.lowOutliers).toEqual([{ index: 24, value: 50 }]);
  });
  it('is not applicable below 10 peaks', () => {
    expect(grubbsBeckTest([5, 6, 7]).applicable).toBe(false);
  });
  it('refuses zero peaks', () => {
    expect(() => grubbsBeckTest([0, 6, 7])).toThrow(/peaks\[0\] must be greater than 0/);
  });
});

describe('mgbtPValue (Cohn et al. 2013)', () => {
  // (c) consistency check: for r = 1 the MGBT statistic is a monotone function of the single
  // Grubbs–Beck statistic T = (ȳ − y(1))/s; at the 10 % critical value K_N of the 17B table
  // (formula (b)), the MGBT p-value must be close to 0.10.
  it.each([10, 24, 50, 100])('n = %d: p-value at the Grubbs–Beck 10 %% critical point ≈ 0.10', (n) => {
    const K = grubbsBeckCriticalValue(n);
    const statistic = (w: number): number => (((n - 1) / n) * w) / Math.sqrt((n - 2 + ((n - 1) / n) * w * w) / (n - 1));
    let lo = 0;
    let hi = 20;
    for (let i = 0; i < 100; i++) {
      const mid = (lo + hi) / 2;
      if (statistic(mid) < K) lo = mid;
      else hi = mid;
    }
    expect(Math.abs(mgbtPValue(n, 1, -lo) - 0.1)).toBeLessThan(0.006);
  });

  it('p-values are about uniform for normal samples (seeded simulation, (c))', () => {
    // (c) simulation: 1500 seeded standard-normal samples of n = 30; the share of p-values
    // below 0.10 for r = 1 and r = 3 should be 0.10 (binomial s.e. 0.008; allow ±0.03).
    const next = createUniformStream(2024);
    const n = 30;
    const reps = 1500;
    const below = [0, 0];
    for (let k = 0; k < reps; k++) {
      const z = Array.from({ length: n }, () => normalQuantile(next(), 0, 1)).sort((a, b) => a - b);
      [1, 3].forEach((r, j) => {
        const rest = z.slice(r);
        const mean = rest.reduce((a, b) => a + b, 0) / rest.length;
        const sd = Math.sqrt(rest.reduce((a, b) => a + (b - mean) ** 2, 0) / (rest.length - 1));
        if (mgbtPValue(n, r, (z[r - 1] - mean) / sd) < 0.1) below[j]++;
      });
    }
    expect(Math.abs(below[0] / reps - 0.1)).toBeLessThan(0.03);
    expect(Math.abs(below[1] / reps - 0.1)).toBeLessThan(0.03);
  });

  it('returns 0.5 where the test does not apply (n < 10 or r > n/2)', () => {
    expect(mgbtPValue(9, 1, -5)).toBe(0.5);
    expect(mgbtPValue(20, 11, -5)).toBe(0.5);
  });
});

describe('multipleGrubbsBeckTest', () => {
  it('finds no low outliers in the Guadalupe and Fishkill records ((c) computed)', () => {
    expect(multipleGrubbsBeckTest(GUADALUPE_PEAKS_CFS).numberOfLowOutliers).toBe(0);
    expect(multipleGrubbsBeckTest(FISHKILL_PEAKS_CFS).numberOfLowOutliers).toBe(0);
  });
  it('finds three added tiny years and sets the threshold at the smallest kept value', () => {
    // (c): three values of 20–40 cfs in a record whose smallest value is 980 cfs.
    const peaks = [...FISHKILL_PEAKS_CFS, 40, 20, 30];
    const r = multipleGrubbsBeckTest(peaks);
    expect(r.numberOfLowOutliers).toBe(3);
    expect(r.lowOutliers.map((o) => o.value)).toEqual([20, 30, 40]);
    expect(r.threshold).toBe(980);
    expect(r.pValues).toHaveLength(Math.floor(peaks.length / 2));
  });
  it('is not applied below 10 peaks', () => {
    expect(multipleGrubbsBeckTest([1, 100, 120, 130]).applicable).toBe(false);
  });
  it('refuses a bad alpha', () => {
    expect(() => multipleGrubbsBeckTest(FISHKILL_PEAKS_CFS, { alphaOut: 0 })).toThrow(/alphaOut must be between 0 and 1/);
  });
});
