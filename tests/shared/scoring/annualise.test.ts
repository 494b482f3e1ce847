import { describe, expect, it } from 'vitest';
import { annualiseExposure, type ExposurePoint } from '../../../shared/scoring/annualise';

const handExample: ExposurePoint[] = [
  { aep: 0.1, days: 4 },
  { aep: 0.5, days: 0 },
  { aep: 0.01, days: 12 },
  { aep: 0.02, days: 10 },
];

describe('annualiseExposure', () => {
  it.each([
    {
      name: 'hand example, most frequent scenario unexposed',
      points: handExample,
      tail: 'linear-to-zero' as const,
      // (c) hand: 0.01·12 + 0.01·(12+10)/2 + 0.08·(10+4)/2 + 0.4·(4+0)/2 + 0.5·0/2
      //         = 0.12 + 0.11 + 0.56 + 0.8 + 0 = 1.59 days per year
      expected: 1.59,
      probability: 0.1,
      segments: [0.12, 0.11, 0.56, 0.8, 0],
    },
    {
      name: 'most frequent scenario exposed, linear tail to p = 1',
      points: [
        { aep: 0.5, days: 2 },
        { aep: 0.1, days: 6 },
      ],
      tail: 'linear-to-zero' as const,
      // (c) hand: 0.1·6 + 0.4·(6+2)/2 + 0.5·2/2 = 0.6 + 1.6 + 0.5 = 2.7
      expected: 2.7,
      probability: 0.5,
      segments: [0.6, 1.6, 0.5],
    },
    {
      name: 'most frequent scenario exposed, zero tail',
      points: [
        { aep: 0.5, days: 2 },
        { aep: 0.1, days: 6 },
      ],
      tail: 'zero' as const,
      // (c) hand: 0.6 + 1.6 + 0 = 2.2
      expected: 2.2,
      probability: 0.5,
      segments: [0.6, 1.6, 0],
    },
    {
      name: 'single scenario',
      points: [{ aep: 0.01, days: 10 }],
      tail: 'linear-to-zero' as const,
      // (c) hand: 0.01·10 + 0.99·10/2 = 0.1 + 4.95 = 5.05
      expected: 5.05,
      probability: 0.01,
      segments: [0.1, 4.95],
    },
    {
      name: 'never exposed',
      points: [
        { aep: 0.5, days: 0 },
        { aep: 0.01, days: 0 },
      ],
      tail: 'linear-to-zero' as const,
      // (c) hand: all zero
      expected: 0,
      probability: 0,
      segments: [0, 0, 0],
    },
  ])('$name', ({ points, tail, expected, probability, segments }) => {
    const result = annualiseExposure(points, { frequentTail: tail });
    expect(Math.abs(result.expectedDaysPerYear - expected)).toBeLessThan(1e-12);
    expect(result.probabilityOfAnyExposure).toBe(probability);
    expect(result.returnPeriodOfAnyExposureYears).toBe(probability > 0 ? 1 / probability : null);
    expect(result.segments.map((s) => s.daysPerYear)).toHaveLength(segments.length);
    result.segments.forEach((segment, i) => {
      expect(Math.abs(segment.daysPerYear - segments[i])).toBeLessThan(1e-12);
    });
    expect(result.segments[0].fromAep).toBe(0);
    expect(result.segments[result.segments.length - 1].toAep).toBe(1);
  });

  it('defaults to the linear tail and ignores input order', () => {
    // (c) hand example above
    const reversed = annualiseExposure([...handExample].reverse());
    expect(reversed.frequentTail).toBe('linear-to-zero');
    expect(reversed.expectedDaysPerYear).toBeCloseTo(1.59, 12);
  });

  it.each([
    [[], /points must be a non-empty array/],
    [[{ aep: 0, days: 1 }], /points\[0\].aep must be an annual exceedance probability in \(0, 1\); got 0/],
    [[{ aep: 1, days: 1 }], /points\[0\].aep must be an annual exceedance probability in \(0, 1\); got 1/],
    [[{ aep: 0.1, days: -1 }], /points\[0\].days must be 0 or more days; got -1/],
    [
      [
        { aep: 0.1, days: 1 },
        { aep: 0.1, days: 2 },
      ],
      /points must have distinct aep values; 0.1 appears twice/,
    ],
  ])('rejects %o', (points, message) => {
    expect(() => annualiseExposure(points)).toThrow(message);
  });
});
