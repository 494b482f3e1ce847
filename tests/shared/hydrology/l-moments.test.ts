import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { sampleLMoments } from '../../../shared/hydrology/l-moments';

describe('sampleLMoments', () => {
  // (c) hand-computed from the unbiased PWM formulas of science.md §7.3 (Hosking 1990, (b)).
  it.each([
    [[1, 2, 3, 4, 10], { b0: 4, b1: 3, b2: 2.5, l1: 4, l2: 2, l3: 1, t3: 0.5 }],
    [[3, 1, 2], { b0: 2, b1: 4 / 3, b2: 1, l1: 2, l2: 2 / 3, l3: 0, t3: 0 }],
    [[0, 0.25, 1], { b0: 1.25 / 3, b1: (0.125 + 1) / 3, b2: 1 / 3, l1: 1.25 / 3, l2: 1 / 3, l3: 0.5 / 3, t3: 0.5 }],
  ])('%j', (values, expected) => {
    const l = sampleLMoments(values);
    for (const [key, value] of Object.entries(expected)) {
      expect(Math.abs(l[key as keyof typeof l] - value)).toBeLessThan(1e-12);
    }
  });

  it('symmetric samples have τ3 = 0 ((c) by symmetry)', () => {
    expect(Math.abs(sampleLMoments([-3, -1, 0, 1, 3]).t3)).toBeLessThan(1e-15);
  });

  it('τ3 stays within (−1, 1) for distinct values (property, (c): |τ3| < 1 unless values tie)', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: -1_000_000, max: 1_000_000 }), { minLength: 3, maxLength: 60 }), (ints) => {
        const l = sampleLMoments(ints.map((i) => i / 7));
        expect(l.t3).toBeGreaterThan(-1);
        expect(l.t3).toBeLessThan(1);
        expect(l.l2).toBeGreaterThan(0);
      }),
      { numRuns: 300 },
    );
  });

  it.each([
    [[1, 2], /values must hold at least 3 values/],
    [[4, 4, 4], /must not all be equal/],
    [[1, Number.NaN, 3], /values\[1\] must be a finite number/],
  ])('refuses %j', (values, message) => {
    expect(() => sampleLMoments(values)).toThrow(message);
  });
});
