import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  fitLogPearson3,
  logPearson3Quantile,
  pearson3FrequencyFactor,
  roundSkew17B,
  stationSkewMse17B,
  weightedSkew,
} from '../../../shared/hydrology/log-pearson3';
import { FISHKILL_PEAKS_CFS, GUADALUPE_1935_1978_CFS, GUADALUPE_PEAKS_CFS } from './fixtures/peak-datasets';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('pearson3FrequencyFactor: the whole K table of science.md §7.4', () => {
  // science.md §7.4 K table and §8 #37: (c) exact gamma-quantile values, matching the classic
  // published Pearson III K tables (b). Tolerance 1e-4.
  const table: [number, number, number, number, number][] = [
    [-1.0, 0.16397, 1.12762, 1.49188, 1.58838],
    [-0.5, 0.08302, 1.21618, 1.77716, 1.95472],
    [-0.1, 0.01666, 1.27037, 1.99973, 2.25258],
    [0.0, 0, 1.28155, 2.05375, 2.32635],
    [0.5, -0.08302, 1.32309, 2.31084, 2.68572],
    [0.7, -0.11578, 1.33294, 2.4067, 2.82359],
    [1.0, -0.16397, 1.34039, 2.54206, 3.02256],
    [2.0, -0.30685, 1.30259, 2.91202, 3.60517],
  ];
  const rows = table.flatMap(([G, ...ks]) => [2, 10, 50, 100].map((T, i) => [G, T, ks[i]] as const));
  it.each(rows)('G = %f, T = %d → K = %f', (G, T, expected) => {
    expect(Math.abs(pearson3FrequencyFactor(G, 1 - 1 / T) - expected)).toBeLessThan(1e-4);
  });

  it('is continuous across the small-skew switch at |G| = 0.1 and near 0', () => {
    // (c) computed: K(0.1, 0.99) = 2.4000 from the classic tables (b); the expansion and the
    // gamma quantile agree on either side within 1e-5.
    expect(Math.abs(pearson3FrequencyFactor(0.1, 0.99) - 2.4)).toBeLessThan(1e-3);
    expect(Math.abs(pearson3FrequencyFactor(0.0999999, 0.99) - pearson3FrequencyFactor(0.1, 0.99))).toBeLessThan(1e-5);
    expect(Math.abs(pearson3FrequencyFactor(1e-9, 0.99) - 2.326348)).toBeLessThan(1e-6);
  });

  it('is monotonic in p and odd under reflection (property, (c))', () => {
    fc.assert(
      fc.property(fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: 0.001, max: 0.998, noNaN: true }), (G, p) => {
        const k1 = pearson3FrequencyFactor(G, p);
        const k2 = pearson3FrequencyFactor(G, p + 0.001);
        expect(k2).toBeGreaterThan(k1);
        expect(Math.abs(pearson3FrequencyFactor(-G, 1 - p) + k1)).toBeLessThan(1e-9);
      }),
      { numRuns: 200 },
    );
  });
});

describe('Fishkill Creek, Bulletin 17B Appendix 12', () => {
  // science.md §8 #38: statistics (c) computed; 841 cfs (a) Bulletin 17B App. 12; 11 531 cfs (c).
  const fit = fitLogPearson3(FISHKILL_PEAKS_CFS, { regionalSkew: 0.6, regionalSkewMse: 0.302, roundSkew: true });
  it.each([
    ['log10 mean', fit.mean, 3.3684, 1e-4],
    ['s', fit.stdDev, 0.2456, 1e-4],
    ['station skew G', fit.stationSkew, 0.73, 1e-4],
    ['weighted skew (c) §7.5', fit.weightedSkew ?? Number.NaN, 0.668, 1e-3],
    ['rounded skew used (17B path)', fit.skewUsed, 0.7, 1e-12],
  ])('%s', (_name, actual, expected, tol) => {
    expect(Math.abs(actual - expected)).toBeLessThan(tol);
  });

  const params = { mean: fit.mean, stdDev: fit.stdDev, skew: fit.skewUsed };
  it('Q(T = 1.0101 years) = 841 cfs ± 1 cfs', () => {
    // science.md §8 #38: (a) Bulletin 17B App. 12 prints 841 cfs.
    expect(Math.abs(logPearson3Quantile(params, 0.01) - 841)).toBeLessThanOrEqual(1);
  });
  it.each([
    [0.5, 2187],
    [0.1, 4963],
    [0.01, 11531],
  ])('AEP %f → %d cfs within 0.5 %', (aep, expected) => {
    // science.md §7.5 A and §8 #38: (c) computed with G = 0.7 (Q100 consistent with 17B's "11 500").
    expect(rel(logPearson3Quantile(params, 1 - aep), expected)).toBeLessThan(0.005);
  });
  it('with the unrounded station skew Q100 = 11 664 cfs', () => {
    // science.md §7.5 A: (c) computed with G = 0.730.
    const q = logPearson3Quantile({ mean: fit.mean, stdDev: fit.stdDev, skew: fit.stationSkew }, 0.99);
    expect(rel(q, 11664)).toBeLessThan(0.005);
  });
  it('17B station-skew MSE and weighting', () => {
    // science.md §7.4 formulas (b) from memory; 0.2775 and 0.668 (c) computed by hand from them.
    expect(Math.abs(stationSkewMse17B(0.73, 24) - 0.2775)).toBeLessThan(5e-4);
    expect(Math.abs(weightedSkew(0.73, stationSkewMse17B(0.73, 24), 0.6, 0.302) - 0.668)).toBeLessThan(1e-3);
  });
});

describe('Guadalupe River, station skew only', () => {
  // science.md §8 #39 (1935–2002) and #40 (1935–1978): (c) computed, tolerance 0.5 %
  // (absolute 1e-4 on the log statistics, 5e-4 on G).
  const full = fitLogPearson3(GUADALUPE_PEAKS_CFS);
  const early = fitLogPearson3(GUADALUPE_1935_1978_CFS);
  const q = (f: typeof full, p: number): number => logPearson3Quantile({ mean: f.mean, stdDev: f.stdDev, skew: f.skewUsed }, p);
  it.each([
    ['1935–2002 log mean', full.mean, 4.2816, 1e-4],
    ['1935–2002 s', full.stdDev, 0.4422, 1e-4],
    ['1935–2002 G', full.stationSkew, 0.3541, 5e-4],
    ['1935–1978 log mean', early.mean, 4.2776, 1e-4],
    ['1935–1978 s', early.stdDev, 0.4043, 1e-4],
    ['1935–1978 G', early.stationSkew, -0.0852, 5e-4],
    ['1935–2002 K(0.99)', pearson3FrequencyFactor(full.stationSkew, 0.99), 2.5828, 1e-4],
    ['1935–1978 K(0.99)', pearson3FrequencyFactor(early.stationSkew, 0.99), 2.2635, 1e-4],
  ])('%s', (_name, actual, expected, tol) => {
    expect(Math.abs(actual - expected)).toBeLessThan(tol);
  });
  it.each([
    ['1935–2002 Q100', () => q(full, 0.99), 265213],
    ['1935–1978 Q100', () => q(early, 0.99), 155885],
    ['1935–1978 Q50', () => q(early, 0.98), 122855],
  ])('%s', (_name, f, expected) => {
    expect(rel(f(), expected)).toBeLessThan(0.005);
  });
});

describe('roundSkew17B and argument checks', () => {
  it.each([
    [0.668, 0.7],
    [-0.25, -0.3],
    [0.04, 0],
    [-1.449, -1.4],
  ])('rounds %f to %f ((b) 17B rounds to 0.1)', (g, expected) => {
    expect(roundSkew17B(g)).toBe(expected);
  });
  it.each([
    [() => fitLogPearson3([100, 0, 300]), /peaks\[1\] must be greater than 0/],
    [() => fitLogPearson3([100, 200]), /peaks must hold at least 3 values/],
    [() => fitLogPearson3([100, 100, 100]), /must not all be equal/],
    [() => fitLogPearson3([100, 200, 300], { regionalSkew: 4 }), /regionalSkew must be between -3 and 3/],
    [() => fitLogPearson3([100, 200, 300], { regionalSkewMse: 0.3 }), /regionalSkewMse was given without regionalSkew/],
    [() => pearson3FrequencyFactor(0.5, 0), /nonExceedance must be between 0 and 1/],
  ])('throws a message naming the argument (%#)', (f, message) => {
    expect(f).toThrow(message);
  });
});
