import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  fitGevLMoments,
  gevFromLMoments,
  gevQuantile,
  gevShapeApproximation,
  gevShapeExact,
  gevShapeFromTau3,
  gevTau3OfShape,
} from '../../../shared/hydrology/gev';
import { GUADALUPE_1935_1978_CFS, GUADALUPE_PEAKS_CFS } from './fixtures/peak-datasets';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);
const GUMBEL_TAU3 = Math.log(9 / 8) / Math.LN2;

describe('GEV shape from τ3 (science.md §8 #41)', () => {
  it('Gumbel τ3 = 0.169925 gives k ≈ 0 by the approximation', () => {
    // science.md §8 #41 / §7.3: (c) computed, |k| < 1e-4 (4e-5).
    expect(Math.abs(GUMBEL_TAU3 - 0.169925)).toBeLessThan(1e-6);
    expect(Math.abs(gevShapeApproximation(GUMBEL_TAU3))).toBeLessThan(1e-4);
    expect(Math.abs(gevShapeExact(GUMBEL_TAU3))).toBeLessThan(1e-10);
  });
  it('τ3 = 0.4: approximation −0.3302, exact −0.32944', () => {
    // science.md §8 #41: (c) computed.
    expect(Math.abs(gevShapeApproximation(0.4) - -0.3302)).toBeLessThan(1e-4);
    expect(Math.abs(gevShapeExact(0.4) - -0.32944)).toBeLessThan(1e-5);
    expect(gevShapeFromTau3(0.4).method).toBe('approximation');
  });

  // science.md §7.3 accuracy table of the approximation against the exact relation: (c) computed;
  // checked to ±20 % of the stated error (the table rounds to 2 figures) .
  it.each([
    [-0.2, 5.2e-3],
    [0, 8.6e-4],
    [0.3, 8.0e-4],
    [0.5, 2.9e-4],
    [0.564, 1.5e-3],
  ])('approximation error at τ3 = %f is about %f', (t3, error) => {
    const actual = Math.abs(gevShapeApproximation(t3) - gevShapeExact(t3));
    expect(actual).toBeGreaterThan(0.8 * error);
    expect(actual).toBeLessThan(1.2 * error);
  });

  it('outside −0.2…0.5 the exact relation is solved', () => {
    // (c) derived: τ3(k) of the solution reproduces τ3 to 1e-10.
    for (const t3 of [-0.6, -0.3, 0.55, 0.6, 0.9]) {
      const { shape, method } = gevShapeFromTau3(t3);
      expect(method).toBe('exact');
      expect(Math.abs(gevTau3OfShape(shape) - t3)).toBeLessThan(1e-10);
    }
  });

  it('τ3 within (−1, 1) always gives k > −1 that reproduces τ3 (property, (c))', () => {
    fc.assert(
      fc.property(fc.double({ min: -0.95, max: 0.95, noNaN: true }), (t3) => {
        const k = gevShapeExact(t3);
        expect(k).toBeGreaterThan(-1);
        expect(Math.abs(gevTau3OfShape(k) - t3)).toBeLessThan(1e-9);
      }),
      { numRuns: 200 },
    );
  });
});

describe('GEV by L-moments: Guadalupe 1935–2002 (science.md §7.5, §8 #39)', () => {
  // science.md §7.5: (c) computed with Hosking's approximation for k (its k −0.5334 at τ3 0.5636
  // is the approximation's value; the exact relation gives −0.5349, 0.3 % away).
  const approx = fitGevLMoments(GUADALUPE_PEAKS_CFS, 'approximation');
  it.each([
    ['λ1', approx.lMoments.l1, 34406.9, 1e-5],
    ['λ2', approx.lMoments.l2, 19757.9, 1e-5],
    ['τ3', approx.lMoments.t3, 0.5636, 1e-4],
    ['k', approx.shape, -0.5334, 5e-4],
    ['α', approx.scale, 12411.2, 5e-4],
    ['ξ', approx.location, 13509.5, 5e-4],
    ['Q10', gevQuantile(approx, 0.9), 67524, 5e-4],
    ['Q100', gevQuantile(approx, 0.99), 260918, 5e-4],
  ])('approximation path: %s', (_name, actual, expected, tol) => {
    expect(rel(actual, expected)).toBeLessThan(tol);
  });

  const auto = fitGevLMoments(GUADALUPE_PEAKS_CFS);
  it.each([
    ['k', auto.shape, -0.5334],
    ['α', auto.scale, 12411.2],
    ['ξ', auto.location, 13509.5],
    ['Q10', gevQuantile(auto, 0.9), 67524],
    ['Q100', gevQuantile(auto, 0.99), 260918],
  ])('default (exact outside −0.2…0.5) path: %s within 0.5 % (science.md §8 #39)', (_name, actual, expected) => {
    expect(auto.shapeMethod).toBe('exact');
    expect(rel(actual, expected)).toBeLessThan(0.005);
  });

  it('1935–1978: k = −0.3168, Q100 = 153 345 cfs', () => {
    // science.md §7.5: (c) computed.
    const f = fitGevLMoments(GUADALUPE_1935_1978_CFS);
    expect(Math.abs(f.shape - -0.3168)).toBeLessThan(5e-4);
    expect(rel(gevQuantile(f, 0.99), 153345)).toBeLessThan(0.005);
  });
});

describe('gevQuantile', () => {
  it('tends to the Gumbel quantile as k → 0', () => {
    // (c) derived: ξ − α ln(−ln F) at k = 0; continuity at k = 1e-10.
    const g = gevQuantile({ location: 10, scale: 2, shape: 0 }, 0.99);
    expect(Math.abs(g - (10 - 2 * Math.log(-Math.log(0.99))))).toBeLessThan(1e-12);
    expect(Math.abs(gevQuantile({ location: 10, scale: 2, shape: 1e-10 }, 0.99) - g)).toBeLessThan(1e-8);
  });
  it('k = 0 L-moment fit equals the Gumbel L-moment fit', () => {
    // (c) derived: α = λ2/ln 2, ξ = λ1 − γα.
    const p = gevFromLMoments({ l1: 100, l2: 20, t3: GUMBEL_TAU3 }, 'exact');
    expect(Math.abs(p.scale - 20 / Math.LN2)).toBeLessThan(1e-6);
  });
  it('quantiles increase as the AEP falls (property, (c))', () => {
    fc.assert(
      fc.property(fc.double({ min: -0.9, max: 0.9, noNaN: true }), fc.double({ min: 0.001, max: 0.99, noNaN: true }), (k, F) => {
        const params = { location: 100, scale: 30, shape: k };
        expect(gevQuantile(params, F + 0.005)).toBeGreaterThan(gevQuantile(params, F));
      }),
      { numRuns: 200 },
    );
  });
  it.each([
    [() => gevQuantile({ location: 0, scale: 1, shape: 0 }, 0), /nonExceedance must be between 0 and 1/],
    [() => gevQuantile({ location: 0, scale: -1, shape: 0 }, 0.5), /scale must be a finite number greater than 0/],
    [() => gevShapeExact(1), /t3 \(L-skewness\) must be between/],
    [() => gevTau3OfShape(-1), /k must be a finite GEV shape greater than −1/],
  ])('throws a message naming the argument (%#)', (f, message) => {
    expect(f).toThrow(message);
  });
});
