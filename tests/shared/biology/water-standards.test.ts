import { describe, expect, it } from 'vitest';
import {
  classifyEu,
  classifyNssp,
  classifyNsspSamples,
  DEFAULT_INDICATOR_THRESHOLD,
  EU_CLASS_CRITERIA,
  estimatedP90,
  geometricMean,
  indicatorBands,
  NSSP_CRITERIA,
  type NsspCategory,
  type NsspStrategy,
} from '../../../shared/biology/water-standards';

const repeat = (value: number, times: number) => Array.from({ length: times }, () => value);

describe('NSSP criteria table', () => {
  it.each([
    // strategy, GM, P90, restricted GM, restricted P90
    ['srs-5-tube', 14, 43, 88, 260], // science.md §6.1: 14/43 (a); restricted 88/260 (b)
    ['srs-3-tube', 14, 49, 88, 300], // science.md §6.1: 14/49 (a); restricted 88/300 (b)
    ['srs-mtec', 14, 31, null, null], // science.md §6.1: 14/31 (a); no restricted value given
    ['apc-5-tube', 14, 43, null, null], // science.md §6.1: APC GM/median 14, ≤10 % > 43 (a)
  ] as const)('%s', (strategy, gm, p90, rGm, rP90) => {
    const row = NSSP_CRITERIA[strategy];
    expect(row.approved.geometricMean).toBe(gm);
    expect(row.approved.p90).toBe(p90);
    expect(row.approved.source.label).toBe('a');
    expect(row.restricted?.geometricMean ?? null).toBe(rGm);
    expect(row.restricted?.p90 ?? null).toBe(rP90);
    if (row.restricted) expect(row.restricted.source.label).toBe('b');
  });
});

describe('classifyNssp (science.md §8 #33, boundaries inclusive)', () => {
  it.each([
    // strategy, GM, P90, expected category
    ['srs-5-tube', 14, 43, 'approved'], // #33 (a): GM ≤ 14 and P90 ≤ 43 → approved (boundary inclusive)
    ['srs-5-tube', 15, 43, 'restricted'], // #33 (a): GM 15 → not approved; meets restricted 88/260 (b)
    ['srs-5-tube', 14, 43.01, 'restricted'], // #33 (a): P90 just over 43 → not approved
    ['srs-5-tube', 0, 0, 'approved'], // §6.1 (a): clean water
    ['srs-5-tube', 88, 260, 'restricted'], // §6.1 restricted 88/260 (b), inclusive
    ['srs-5-tube', 89, 260, 'exceeds-restricted'], // §6.1 restricted (b): GM over 88
    ['srs-5-tube', 88, 261, 'exceeds-restricted'], // §6.1 restricted (b): P90 over 260
    ['srs-3-tube', 14, 49, 'approved'], // §6.1 (a): 3-tube 14/49 inclusive
    ['srs-3-tube', 14, 50, 'restricted'], // §6.1 (a) fails 49; (b) restricted 88/300
    ['srs-3-tube', 88, 300, 'restricted'], // §6.1 (b) restricted 3-tube 300 inclusive
    ['srs-mtec', 14, 31, 'approved'], // §6.1 (a): mTEC 14/31 inclusive
    ['srs-mtec', 14, 32, 'not-approved'], // §6.1 (a): fails 31; no restricted value for mTEC
  ] as const)('%s GM %d P90 %d → %s', (strategy, geometricMean, p90, expected) => {
    const result = classifyNssp({ strategy, geometricMean, p90 });
    expect(result.category).toBe(expected as NsspCategory);
    expect(result.meetsApprovedCriteria).toBe(expected === 'approved');
  });

  it('defaults to the 5-tube SRS strategy', () => {
    // science.md §8 #33 (a)
    expect(classifyNssp({ geometricMean: 14, p90: 43 }).criteria.strategy).toBe('srs-5-tube');
  });

  it.each([
    [14, 0.1, 'approved'], // §6.1 APC (a): GM 14 and 10 % above 43, inclusive
    [14, 0.11, 'not-approved'], // §6.1 APC (a): more than 10 % above 43
    [15, 0, 'not-approved'], // §6.1 APC (a): median/GM over 14
  ] as const)('APC GM %d, fraction above %d → %s', (geometricMean, fractionAbove, expected) => {
    expect(classifyNssp({ strategy: 'apc-5-tube', geometricMean, fractionAbove }).category).toBe(expected);
  });

  it.each([
    [{ geometricMean: -1, p90: 2 }, /geometricMean must be a count per 100 mL, 0 or more/],
    [{ geometricMean: 1, p90: Number.NaN }, /p90 must be a count per 100 mL, 0 or more/],
    [{ strategy: 'apc-5-tube' as const, geometricMean: 1, fractionAbove: 2 }, /fractionAbove must be a fraction from 0 to 1/],
    [{ strategy: 'weekly' as unknown as NsspStrategy, geometricMean: 1, p90: 2 }, /strategy must be one of/],
  ])('rejects %o', (input, message) => {
    expect(() => classifyNssp(input as Parameters<typeof classifyNssp>[0])).toThrow(message);
  });
});

describe('geometricMean and estimatedP90', () => {
  it.each([
    [[10, 1000], 100, 1e-9], // (c) hand: 10^((1 + 3)/2) = 100
    [[14], 14, 1e-12], // (c) hand: one sample
    [[2, 8], 4, 1e-12], // (c) hand: √16 = 4
  ])('geometricMean(%o) = %d', (values, expected, tolerance) => {
    expect(Math.abs(geometricMean(values) - expected)).toBeLessThan(tolerance);
  });

  it.each([
    // (b) NSSP formula 10^(mean_log + 1.28 sd_log), sd with n − 1; hand: 10^(1.5 + 1.28·√0.5) = 254.153842
    [[10, 100], 254.153842, 1e-5],
    // (c) hand: identical samples have sd 0, so P90 = GM
    [[20, 20, 20], 20, 1e-9],
  ])('estimatedP90(%o) = %d', (values, expected, tolerance) => {
    expect(Math.abs(estimatedP90(values) - expected)).toBeLessThan(tolerance);
  });

  it('rejects zero, negative and too few values', () => {
    expect(() => geometricMean([])).toThrow(/values must be an array of at least 1 positive counts/);
    expect(() => geometricMean([0, 3])).toThrow(/values must hold counts above 0/);
    expect(() => estimatedP90([5])).toThrow(/values must be an array of at least 2 positive counts/);
  });

  it('classifies raw samples and warns on short records', () => {
    // science.md §6.1 (a): 30 samples minimum for SRS; all 10 → GM 10, P90 10 → meets 14/43
    const full = classifyNsspSamples(repeat(10, 30));
    expect(full.category).toBe('approved');
    expect(full.warnings).toEqual([]);
    expect(full.p90).toBeCloseTo(10, 9);
    const short = classifyNsspSamples([10, 20, 30]);
    expect(short.warnings[0]).toMatch(/Only 3 samples; .* need at least 30/);
    // APC (a): 2 of 20 samples above 43 is exactly 10 % → meets; 3 of 20 does not
    expect(classifyNsspSamples([...repeat(5, 18), 100, 100], 'apc-5-tube').category).toBe('approved');
    expect(classifyNsspSamples([...repeat(5, 17), 100, 100, 100], 'apc-5-tube').category).toBe('not-approved');
  });
});

describe('classifyEu (science.md §8 #34, boundaries inclusive)', () => {
  it.each([
    // samples, expected class — #34: A 80 % ≤ 230 (a) and all ≤ 700 (b); B 90 % ≤ 4600 and all ≤ 46 000 (a); C all ≤ 46 000 (b)
    [[...repeat(230, 8), 700, 700], 'A'], // #34: exactly 80 % at 230, rest at 700 → A
    [[...repeat(230, 7), 231, 700, 700], 'B'], // #34: only 70 % ≤ 230 → not A; 100 % ≤ 4600 → B
    [[...repeat(230, 8), 700, 701], 'B'], // #34: one sample over 700 → not A (b)
    [[...repeat(4600, 9), 46000], 'B'], // #34: exactly 90 % at 4600, rest at 46 000 → B
    [[...repeat(4600, 8), 4601, 46000], 'C'], // #34: 80 % ≤ 4600 → not B; all ≤ 46 000 → C (b)
    [repeat(46000, 5), 'C'], // #34 (b): all at 46 000 → C
    [[...repeat(4600, 9), 46001], 'not-classifiable'], // §6.2 (b): above 46 000 cannot be classified
    [[0], 'A'], // (c) hand: a single clean sample
  ] as const)('%o → %s', (samples, expected) => {
    expect(classifyEu(samples).euClass).toBe(expected);
  });

  it('reports shares and the highest sample', () => {
    // (c) hand: 8 of 10 at 230 → 80 %; all ≤ 4600; max 700
    const result = classifyEu([...repeat(230, 8), 700, 700]);
    expect(result.shareAtOrUnder230).toBeCloseTo(0.8, 12);
    expect(result.shareAtOrUnder4600).toBe(1);
    expect(result.max).toBe(700);
    expect(result.reasons[1]).toBe('Meets the Class A criteria.');
  });

  it('labels each class criterion', () => {
    // science.md §6.2: A 230 (a) with 700 (b); B (a); C (b)
    expect(EU_CLASS_CRITERIA.map((c) => [c.euClass, c.source.label, c.maximumSource.label])).toEqual([
      ['A', 'a', 'b'],
      ['B', 'a', 'a'],
      ['C', 'b', 'b'],
    ]);
  });

  it('rejects empty and negative input', () => {
    expect(() => classifyEu([])).toThrow(/samples must be a non-empty array/);
    expect(() => classifyEu([5, -1])).toThrow(/samples must be counts per 100 g, each 0 or more; got -1/);
  });
});

describe('indicatorBands', () => {
  it('defaults to the approved-area (14, (a)) and restricted-area (88, (b)) standards', () => {
    // science.md §6.1: approved GM 14 (a); restricted GM 88 (b)
    const bands = indicatorBands();
    expect(DEFAULT_INDICATOR_THRESHOLD).toBe(14);
    expect(bands.map((b) => [b.id, b.threshold, b.source.label, b.overridden])).toEqual([
      ['indicator-above-approved', 14, 'a', false],
      ['indicator-above-restricted', 88, 'b', false],
    ]);
    expect(bands[0].label).toBe('indicator above the approved-area standard (14 per 100 mL)');
  });

  it('accepts overrides and labels them as user-set', () => {
    const bands = indicatorBands({ approved: 20 });
    expect(bands[0].threshold).toBe(20);
    expect(bands[0].overridden).toBe(true);
    expect(bands[0].source.label).toBe('c');
    expect(bands[0].label).toBe('indicator above the approved-area standard (20 per 100 mL)');
  });

  it.each([
    [{ approved: 0 }, /approved indicator threshold must be a count per 100 mL above 0/],
    [{ restricted: Number.POSITIVE_INFINITY }, /restricted indicator threshold must be a count per 100 mL above 0/],
    [{ approved: 100 }, /approved indicator threshold must be below the restricted one \(88 per 100 mL\); got 100/],
  ])('rejects %o', (overrides, message) => {
    expect(() => indicatorBands(overrides)).toThrow(message);
  });
});
