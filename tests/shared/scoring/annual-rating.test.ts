import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  ANNUAL_RATING_CUTS,
  annualRating,
  annualRatingRuleLines,
  combineAnnualFigures,
  compareAnnualWorstFirst,
} from '../../../shared/scoring/annual-rating';
import { RATINGS } from '../../../shared/scoring/score-lease';

const rate = (closureDaysPerYear: number, harmfulSalinityChancePerYear: number) =>
  annualRating({ closureDaysPerYear, harmfulSalinityChancePerYear });
const rank = (r: string) => RATINGS.indexOf(r as never);

describe('annualRating', () => {
  it('uses the agreed cut points: 30/10/2 closure days a year and 0.5/0.2/0.05 a year (issue #14, (c) common practice)', () => {
    expect(ANNUAL_RATING_CUTS.map((c) => [c.rating, c.closureDaysPerYear, c.harmfulSalinityChancePerYear])).toEqual([
      ['severe', 30, 0.5],
      ['high', 10, 0.2],
      ['moderate', 2, 0.05],
    ]);
  });

  // Boundaries are inclusive: a figure equal to a cut point takes the higher step (module comment).
  it.each([
    // closure days alone
    [0, 0, 'low'],
    [1.999999, 0, 'low'],
    [2, 0, 'moderate'],
    [9.999999, 0, 'moderate'],
    [10, 0, 'high'],
    [29.999999, 0, 'high'],
    [30, 0, 'severe'],
    [365, 0, 'severe'],
    // chance alone
    [0, 0.049999, 'low'],
    [0, 0.05, 'moderate'],
    [0, 0.199999, 'moderate'],
    [0, 0.2, 'high'],
    [0, 0.499999, 'high'],
    [0, 0.5, 'severe'],
    [0, 1, 'severe'],
    // the worse of the two decides
    [2, 0.2, 'high'],
    [30, 0.05, 'severe'],
    [1.9, 0.049, 'low'],
  ])('%s closure days and a chance of %s a year → %s', (days, chance, expected) => {
    expect(rate(days, chance)).toBe(expected);
  });

  it('never falls when either figure rises (fast-check, monotone by construction)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 365, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 365, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (d, p, dd, dp) => {
          const base = rank(rate(d, p));
          expect(rank(rate(Math.min(365, d + dd), p))).toBeGreaterThanOrEqual(base);
          expect(rank(rate(d, Math.min(1, p + dp)))).toBeGreaterThanOrEqual(base);
        },
      ),
      { seed: 14_004, numRuns: 500 },
    );
  });

  it.each([
    [-1, 0, /closureDaysPerYear must be a number of days from 0 to 366; got -1/],
    [Number.NaN, 0, /closureDaysPerYear must be/],
    [0, 1.5, /harmfulSalinityChancePerYear must be a probability from 0 to 1; got 1.5/],
  ])('refuses %s days, chance %s', (days, chance, message) => {
    expect(() => rate(days, chance)).toThrow(message);
  });
});

describe('combineAnnualFigures', () => {
  it('adds closure days and combines chances as independent rivers ((c) derived, hand values)', () => {
    const c = combineAnnualFigures([
      { closureDaysPerYear: 4, harmfulSalinityChancePerYear: 0.1 },
      { closureDaysPerYear: 3, harmfulSalinityChancePerYear: 0.2 },
    ]);
    expect(c.closureDaysPerYear).toBe(7);
    // (c) hand: 1 − 0.9 × 0.8 = 0.28
    expect(c.harmfulSalinityChancePerYear).toBeCloseTo(0.28, 12);
    // One river's figures come back unchanged, so a chance of exactly 0.2 still reaches High.
    const one = combineAnnualFigures([{ closureDaysPerYear: 2, harmfulSalinityChancePerYear: 0.2 }]);
    expect(one).toEqual({ closureDaysPerYear: 2, harmfulSalinityChancePerYear: 0.2 });
    expect(annualRating(one)).toBe('high');
    expect(combineAnnualFigures([])).toEqual({ closureDaysPerYear: 0, harmfulSalinityChancePerYear: 0 });
    expect(
      combineAnnualFigures([
        { closureDaysPerYear: 300, harmfulSalinityChancePerYear: 0 },
        { closureDaysPerYear: 300, harmfulSalinityChancePerYear: 0 },
      ]).closureDaysPerYear,
    ).toBe(365);
  });
});

describe('compareAnnualWorstFirst', () => {
  it('orders by rating, then closure days, then chance; unrated last', () => {
    const rows = [
      { id: 'a', annualRating: 'high' as const, closureDaysPerYear: 12, harmfulSalinityChancePerYear: 0 },
      { id: 'b', annualRating: null, closureDaysPerYear: null, harmfulSalinityChancePerYear: null },
      { id: 'c', annualRating: 'severe' as const, closureDaysPerYear: 0, harmfulSalinityChancePerYear: 0.6 },
      { id: 'd', annualRating: 'high' as const, closureDaysPerYear: 12, harmfulSalinityChancePerYear: 0.3 },
      { id: 'e', annualRating: 'high' as const, closureDaysPerYear: 15, harmfulSalinityChancePerYear: 0 },
      { id: 'f', annualRating: 'low' as const, closureDaysPerYear: 0, harmfulSalinityChancePerYear: 0 },
    ];
    expect(rows.sort(compareAnnualWorstFirst).map((r) => r.id)).toEqual(['c', 'e', 'd', 'a', 'f', 'b']);
  });
});

describe('annualRatingRuleLines', () => {
  it('states every cut point in words', () => {
    const lines = annualRatingRuleLines();
    expect(lines).toHaveLength(4);
    expect(lines[0]).toMatch(/^Severe: 30 or more closure days a year, or a chance a year of 0.5 \(1 year in 2\) or more/);
    expect(lines[1]).toMatch(/^High: 10 or more closure days a year, or a chance a year of 0.2 \(1 year in 5\) or more/);
    expect(lines[2]).toMatch(/^Moderate: 2 or more closure days a year, or a chance a year of 0.05 \(1 year in 20\) or more/);
    expect(lines[3]).toBe('Low: fewer than 2 closure days a year and a chance under 0.05 (1 year in 20).');
  });
});
