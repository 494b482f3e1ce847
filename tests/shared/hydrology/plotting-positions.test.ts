import { describe, expect, it } from 'vitest';
import { plottingPositions } from '../../../shared/hydrology/plotting-positions';

describe('plottingPositions', () => {
  // science.md §7.1 formulas: (b) from memory; expected values (c) hand-computed for n = 9, m = 1.
  it.each([
    ['weibull', 1 / 10],
    ['gringorten', 0.56 / 9.12],
    ['cunnane', 0.6 / 9.2],
    ['hazen', 0.5 / 9],
  ] as const)('%s: largest of 9 has AEP %f and T = 1/AEP', (formula, aep) => {
    const p = plottingPositions([5, 1, 9, 3, 7, 2, 8, 4, 6], formula);
    expect(p[0].value).toBe(9);
    expect(p[0].index).toBe(2);
    expect(Math.abs(p[0].aep - aep)).toBeLessThan(1e-12);
    expect(Math.abs(p[0].returnPeriod - 1 / aep)).toBeLessThan(1e-9);
    expect(Math.abs(p[0].nonExceedance - (1 - aep))).toBeLessThan(1e-12);
  });

  it('exceedance ranks from the top equal 1 − non-exceedance ranks from the bottom ((c), symmetric formulas)', () => {
    const values = [10, 40, 20, 30];
    const p = plottingPositions(values, 'gringorten');
    const n = values.length;
    p.forEach((row) => {
      const ascendingRank = n + 1 - row.rank;
      expect(Math.abs(row.nonExceedance - (ascendingRank - 0.44) / (n + 0.12))).toBeLessThan(1e-12);
    });
  });

  it('Weibull T for the largest of n is n + 1 ((c))', () => {
    expect(plottingPositions([3, 2, 1])[0].returnPeriod).toBeCloseTo(4, 12);
  });

  it('ties get consecutive ranks in input order', () => {
    const p = plottingPositions([5, 5, 1]);
    expect(p.map((r) => r.index)).toEqual([0, 1, 2]);
  });

  it.each([
    [[], 'weibull', /values must hold at least 1 values/],
    [[1, 2], 'median', /formula must be 'weibull', 'gringorten', 'cunnane' or 'hazen'/],
  ])('refuses %j with %s', (values, formula, message) => {
    // @ts-expect-error testing a bad formula name at run time
    expect(() => plottingPositions(values, formula)).toThrow(message);
  });
});
