import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { getSpeciesTolerance, SPECIES_IDS } from '../../../shared/biology/species-tolerance';
import {
  DEFAULT_SCORING_SETTINGS,
  daysBelowTolerance,
  NO_REACH_REASON,
  RATINGS,
  type Rating,
  ratingForScore,
  resolveScoringSettings,
  type ScoreLeaseInput,
  scoreLease,
} from '../../../shared/scoring/score-lease';

// Pacific oyster defaults used below: acute 10 psu / 2 days, chronic 15 psu / 7 days
// (science.md §4.1 suggested screening thresholds, (c)).
const oyster = getSpeciesTolerance('pacific-oyster');

const base = (overrides: Partial<ScoreLeaseInput>): ScoreLeaseInput => ({
  tolerance: oyster,
  scenario: { aep: 0.1, discharge: 900, floodDurationDays: 9 },
  bandFractions: {},
  lowestSalinity: null,
  highestIndicator: null,
  daysBelowTolerance: 0,
  ...overrides,
});

describe('scoreLease: one example per rating step (all numbers (c) hand-computed from the score-lease module rule)', () => {
  it.each([
    {
      name: 'Low',
      // (c): severity 0.5 + 0.5·(15 − 14)/(15 − 10) = 0.6; duration 3/7; 0.2 × 0.6 × 0.4286 = 0.0514
      input: base({
        scenario: { aep: 0.5, discharge: 450, floodDurationDays: 3 },
        bandFractions: { 'plume-edge': 0.2 },
        lowestSalinity: 14,
        daysBelowTolerance: 3,
      }),
      rating: 'low',
      score: 0.2 * 0.6 * (3 / 7),
      reasons: [
        'Salinity over 20% of the lease falls to 14.0, under the 15 that Pacific oysters tolerate for no more than 7 days, for about 3 days at the 1-in-2-year flood (450 m³/s).',
        'Score 0.05 of 1 (salinity: exposure 0.20 × severity 0.60 × duration 0.43); Low is under 0.10.',
      ],
    },
    {
      name: 'Moderate',
      // (c): severity 0.5 + 0.5·(15 − 13)/5 = 0.7; duration 4/7; 0.5 × 0.7 × 0.5714 = 0.2
      input: base({
        scenario: { aep: 0.2, discharge: 640, floodDurationDays: 4 },
        bandFractions: { 'brackish-margin': 0.5, 'plume-edge': 0.5 },
        lowestSalinity: 13,
        daysBelowTolerance: 4,
      }),
      rating: 'moderate',
      score: 0.5 * 0.7 * (4 / 7),
      reasons: [
        'Salinity over 50% of the lease falls to 13.0, under the 15 that Pacific oysters tolerate for no more than 7 days, for about 4 days at the 1-in-5-year flood (640 m³/s).',
        'Score 0.20 of 1 (salinity: exposure 0.50 × severity 0.70 × duration 0.57); Moderate is 0.10 to under 0.30.',
      ],
    },
    {
      name: 'High',
      // (c): severity 0.5 + 0.5·(15 − 12.5)/5 = 0.75; duration min(1, 9/7) = 1; 0.62 × 0.75 = 0.465
      input: base({
        bandFractions: { 'fresh-core': 0.3, 'brackish-margin': 0.62 },
        lowestSalinity: 12.5,
        daysBelowTolerance: 9,
      }),
      rating: 'high',
      score: 0.62 * 0.75,
      reasons: [
        'Salinity over 62% of the lease falls to 12.5, under the 15 that Pacific oysters tolerate for no more than 7 days, for about 9 days at the 1-in-10-year flood (900 m³/s).',
        'Score 0.47 of 1 (salinity: exposure 0.62 × severity 0.75 × duration 1.00); High is 0.30 to under 0.60.',
      ],
    },
    {
      name: 'Severe',
      // (c): 8.4 ≤ acute 10 → severity 1; duration 1; 0.9 × 1 × 1 = 0.9
      input: base({
        bandFractions: { 'fresh-core': 0.9 },
        lowestSalinity: 8.4,
        daysBelowTolerance: 9,
      }),
      rating: 'severe',
      score: 0.9,
      reasons: [
        'Salinity over 90% of the lease falls to 8.4, under the 15 that Pacific oysters tolerate for no more than 7 days, for about 9 days at the 1-in-10-year flood (900 m³/s).',
        'That is at or under the acute limit of 10, which Pacific oysters withstand for only about 2 days.',
        'Score 0.90 of 1 (salinity: exposure 0.90 × severity 1.00 × duration 1.00); Severe is 0.60 or more.',
      ],
    },
    {
      name: 'High from the faecal indicator',
      // (c): indicator 1400 = 100 × 14 → severity 0.5 + 0.5·min(1, 2/1) = 1; duration 5/7; 0.8 × 1 × 0.714 = 0.571
      input: base({
        scenario: { aep: 0.04, discharge: 1500, floodDurationDays: 5 },
        bandFractions: { 'plume-edge': 0.8 },
        lowestSalinity: 20,
        highestIndicator: 1400,
        daysBelowTolerance: 0,
      }),
      rating: 'high',
      score: 0.8 * (5 / 7),
      reasons: [
        'Salinity over 80% of the lease falls to 20.0 at the 1-in-25-year flood (1500 m³/s), staying at or above the 15 that Pacific oysters tolerate for no more than 7 days.',
        'Faecal indicator over 80% of the lease reaches 1400 per 100 mL, above the screening threshold of 14 per 100 mL (the approved-area standard), during the 5 days of the 1-in-25-year flood (1500 m³/s).',
        'Score 0.57 of 1 (faecal indicator: exposure 0.80 × severity 1.00 × duration 0.71); High is 0.30 to under 0.60.',
      ],
    },
    {
      name: 'Low for a typed flow that stays within tolerance',
      // (c): salinity 22 ≥ 15 and indicator 9 ≤ 14 → both severities 0 → score 0
      input: base({
        scenario: { aep: null, discharge: 120, floodDurationDays: 2, name: 'the spring median flow' },
        bandFractions: { 'plume-edge': 0.35 },
        lowestSalinity: 22,
        highestIndicator: 9,
      }),
      rating: 'low',
      score: 0,
      reasons: [
        'Salinity over 35% of the lease falls to 22.0 at the spring median flow (120 m³/s), staying at or above the 15 that Pacific oysters tolerate for no more than 7 days.',
        'Faecal indicator over the lease peaks at 9 per 100 mL at the spring median flow (120 m³/s), at or under the screening threshold of 14 per 100 mL (the approved-area standard).',
        'Score 0.00 of 1 (salinity: exposure 0.35 × severity 0.00 × duration 0.00); Low is under 0.10.',
      ],
    },
  ])('$name', ({ input, rating, score, reasons }) => {
    const result = scoreLease(input);
    expect(result.rating).toBe(rating as Rating);
    expect(Math.abs(result.score - score)).toBeLessThan(1e-12);
    expect(result.reasons).toEqual(reasons);
  });

  it('gives the no-reach reason and a Low rating when no band touches the lease', () => {
    // product brief: "The modelled plume does not reach this lease at this flow" (c)
    const cases: Record<string, number>[] = [{}, { 'fresh-core': 0, 'plume-edge': 0 }];
    for (const bandFractions of cases) {
      const result = scoreLease(base({ bandFractions, lowestSalinity: 30 }));
      expect(result.rating).toBe('low');
      expect(result.ratingWord).toBe('Low');
      expect(result.score).toBe(0);
      expect(result.reasons).toEqual([NO_REACH_REASON]);
      expect(result.numbers.reachesLease).toBe(false);
    }
  });

  it('keeps the numbers behind the rating', () => {
    // (c) hand: High example above
    const result = scoreLease(base({ bandFractions: { a: 0.62 }, lowestSalinity: 12.5, daysBelowTolerance: 9 }));
    expect(result.numbers.exposureFraction).toBe(0.62);
    expect(result.numbers.salinity).toEqual({ severity: 0.75, duration: 1, score: 0.62 * 0.75 });
    expect(result.numbers.indicator.score).toBe(0);
    expect(result.numbers.drivingPathway).toBe('salinity');
    expect(result.numbers.chronicLowerSalinity).toBe(15);
  });

  it('uses overridden species thresholds and indicator threshold', () => {
    // (c): chronic overridden to 12 → 12.5 stays above it → salinity severity 0
    const tolerance = getSpeciesTolerance('pacific-oyster', { chronicLowerSalinity: 12 });
    const result = scoreLease(base({ tolerance, bandFractions: { a: 0.62 }, lowestSalinity: 12.5, daysBelowTolerance: 9 }));
    expect(result.rating).toBe('low');
    expect(result.reasons[0]).toContain('staying at or above the 12 that Pacific oysters');
    // (c): threshold 2000 → 1400 is under it; the reason drops "(the approved-area standard)"
    const indicator = scoreLease(base({ bandFractions: { a: 0.8 }, highestIndicator: 1400, indicatorThreshold: 2000 }));
    expect(indicator.rating).toBe('low');
    expect(indicator.reasons[0]).toBe(
      'Faecal indicator over the lease peaks at 1400 per 100 mL at the 1-in-10-year flood (900 m³/s), at or under the screening threshold of 2000 per 100 mL.',
    );
  });

  it('combines disjoint bands by their sum', () => {
    // (c): disjoint 0.3 + 0.3 = 0.6 exposure; nested takes the max 0.3
    const input = base({ bandFractions: { a: 0.3, b: 0.3 }, lowestSalinity: 8, daysBelowTolerance: 9 });
    expect(scoreLease(input).numbers.exposureFraction).toBe(0.3);
    expect(scoreLease({ ...input, settings: { bandLayout: 'disjoint' } }).numbers.exposureFraction).toBeCloseTo(0.6, 12);
    expect(() => scoreLease({ ...input, bandFractions: { a: 0.7, b: 0.4 }, settings: { bandLayout: 'disjoint' } })).toThrow(
      /bandFractions must add up to at most 1 when bands are disjoint/,
    );
  });

  it('applies overridden cut points', () => {
    // (c): score 0.465 is High by default, Severe with severe cut 0.45
    const input = base({ bandFractions: { a: 0.62 }, lowestSalinity: 12.5, daysBelowTolerance: 9 });
    expect(scoreLease({ ...input, settings: { cutPoints: { severe: 0.45 } } }).rating).toBe('severe');
  });

  it.each([
    [{ bandFractions: { a: 1.2 } }, /bandFractions\["a"\] must be a fraction of the lease area from 0 to 1; got 1.2/],
    [{ lowestSalinity: 50 }, /lowestSalinity must be a salinity in psu from 0 to 45, or null; got 50/],
    [{ highestIndicator: -3 }, /highestIndicator must be a count per 100 mL, 0 or more, or null; got -3/],
    [{ daysBelowTolerance: -1 }, /daysBelowTolerance must be a number of days from 0 to 365; got -1/],
    [{ indicatorThreshold: 0 }, /indicatorThreshold must be a count per 100 mL above 0; got 0/],
    [
      { scenario: { aep: 0, discharge: 1, floodDurationDays: 1 } },
      /scenario.aep must be an annual exceedance probability in \(0, 1\], or null; got 0/,
    ],
    [{ scenario: { aep: 0.1, discharge: -1, floodDurationDays: 1 } }, /scenario.discharge must be a flow in m³\/s, 0 or more; got -1/],
    [{ scenario: { aep: 0.1, discharge: 1, floodDurationDays: 0 } }, /scenario.floodDurationDays must be in \(0, 365\] days; got 0/],
    [{ settings: { cutPoints: { moderate: 0.5 } } }, /cutPoints must rise: moderate < high < severe; got 0.5, 0.3, 0.6/],
    [{ settings: { cutPoints: { severe: 1.5 } } }, /cutPoints.severe must be in \(0, 1\]; got 1.5/],
    [{ settings: { indicatorFullSeverityRatio: 1 } }, /indicatorFullSeverityRatio must be above 1; got 1/],
  ] as const)('rejects %o', (overrides, message) => {
    expect(() => scoreLease(base(overrides as Partial<ScoreLeaseInput>))).toThrow(message);
  });
});

describe('ratingForScore and settings', () => {
  it.each([
    [0, 'low'], // (c) default cut points 0.10 / 0.30 / 0.60, inclusive lower bounds
    [0.0999, 'low'],
    [0.1, 'moderate'],
    [0.2999, 'moderate'],
    [0.3, 'high'],
    [0.5999, 'high'],
    [0.6, 'severe'],
    [1, 'severe'],
  ] as const)('score %d → %s', (score, rating) => {
    expect(ratingForScore(score)).toBe(rating);
  });

  it('merges partial cut points over the defaults', () => {
    // (c) defaults 0.1 / 0.3 / 0.6
    expect(resolveScoringSettings({ cutPoints: { severe: 0.7 } }).cutPoints).toEqual({ moderate: 0.1, high: 0.3, severe: 0.7 });
    expect(resolveScoringSettings()).toEqual(DEFAULT_SCORING_SETTINGS);
  });
});

describe('daysBelowTolerance (c) screening rule', () => {
  it.each([
    // lowest salinity, flood days, options, expected days — (c): flood days from arrival, plus recovery, when under S_c = 15
    [8.4, 9, {}, 9],
    [14.99, 9, {}, 9],
    [15, 9, {}, 0], // at the threshold is not under it
    [18, 9, {}, 0],
    [null, 9, {}, 0],
    [8.4, 9, { arrivalDays: 2 }, 7],
    [8.4, 9, { arrivalDays: 2, recoveryDays: 3 }, 10],
    [8.4, 9, { arrivalDays: 12, recoveryDays: 3 }, 0], // plume arrives after the flood ends
  ] as const)('S %s for %d days %o → %d', (lowest, flood, options, expected) => {
    expect(daysBelowTolerance(lowest, flood, oyster, options)).toBe(expected);
  });

  it('rejects bad arguments', () => {
    expect(() => daysBelowTolerance(8, 0, oyster)).toThrow(/floodDurationDays must be in \(0, 365\] days; got 0/);
    expect(() => daysBelowTolerance(8, 3, oyster, { arrivalDays: -1 })).toThrow(/arrivalDays must be 0 or more days/);
    expect(() => daysBelowTolerance(-2, 3, oyster)).toThrow(/lowestSalinity must be a salinity in psu from 0 to 45/);
  });
});

describe('scoreLease properties (fast-check)', () => {
  const rank = (rating: Rating) => RATINGS.indexOf(rating);
  const inputArb = fc.record({
    species: fc.constantFrom(...SPECIES_IDS),
    aep: fc.option(fc.double({ min: 0.001, max: 1, noNaN: true }), { nil: null }),
    discharge: fc.double({ min: 0, max: 50_000, noNaN: true }),
    floodDurationDays: fc.double({ min: 0.1, max: 60, noNaN: true }),
    fractionA: fc.double({ min: 0, max: 1, noNaN: true }),
    fractionB: fc.double({ min: 0, max: 1, noNaN: true }),
    daysA: fc.double({ min: 0, max: 365, noNaN: true }),
    daysB: fc.double({ min: 0, max: 365, noNaN: true }),
    lowestSalinity: fc.option(fc.double({ min: 0, max: 45, noNaN: true }), { nil: null }),
    highestIndicator: fc.option(fc.double({ min: 0, max: 1e6, noNaN: true }), { nil: null }),
  });
  type Sample = typeof inputArb extends fc.Arbitrary<infer T> ? T : never;
  const make = (v: Sample, fraction: number, days: number) =>
    scoreLease({
      tolerance: getSpeciesTolerance(v.species),
      scenario: { aep: v.aep, discharge: v.discharge, floodDurationDays: v.floodDurationDays },
      bandFractions: { band: fraction },
      lowestSalinity: v.lowestSalinity,
      highestIndicator: v.highestIndicator,
      daysBelowTolerance: days,
    });

  it('rating never falls as the band fraction or the days below tolerance grow; reasons never say "safe"', () => {
    // (c) property of score = exposure × severity × duration with non-negative terms
    fc.assert(
      fc.property(inputArb, (v) => {
        const [f1, f2] = [Math.min(v.fractionA, v.fractionB), Math.max(v.fractionA, v.fractionB)];
        const [d1, d2] = [Math.min(v.daysA, v.daysB), Math.max(v.daysA, v.daysB)];
        const low = make(v, f1, d1);
        const moreFraction = make(v, f2, d1);
        const moreDays = make(v, f1, d2);
        expect(rank(moreFraction.rating)).toBeGreaterThanOrEqual(rank(low.rating));
        expect(rank(moreDays.rating)).toBeGreaterThanOrEqual(rank(low.rating));
        for (const result of [low, moreFraction, moreDays]) {
          expect(result.score).toBeGreaterThanOrEqual(0);
          expect(result.score).toBeLessThanOrEqual(1);
          for (const reason of result.reasons) expect(reason).not.toMatch(/safe/i);
        }
      }),
      { numRuns: 400, seed: 20240611 },
    );
  });
});
