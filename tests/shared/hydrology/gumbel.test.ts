import { describe, expect, it } from 'vitest';
import {
  EULER_GAMMA,
  fitGumbelLMoments,
  fitGumbelMoments,
  gumbelFrequencyFactor,
  gumbelFromMoments,
  gumbelQuantile,
} from '../../../shared/hydrology/gumbel';
import { GUADALUPE_1935_1978_CFS, GUADALUPE_PEAKS_CFS } from './fixtures/peak-datasets';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('gumbelFrequencyFactor', () => {
  // science.md §8 #35 and §7.2 K_T table: (c) computed from Chow et al. (1988) (b).
  it.each([
    [2, -0.1643],
    [5, 0.7194],
    [10, 1.3046],
    [50, 2.5923],
    [100, 3.1367],
  ])('T = %d years gives K_T = %f', (T, expected) => {
    expect(Math.abs(gumbelFrequencyFactor(T) - expected)).toBeLessThan(1e-4);
  });

  it('refuses T ≤ 1', () => {
    expect(() => gumbelFrequencyFactor(1)).toThrow(/returnPeriod must be a finite number of years greater than 1/);
  });

  it('x̄ + K_T s equals the moment-fit quantile (identity, (c))', () => {
    const p = gumbelFromMoments(100, 30);
    expect(Math.abs(100 + gumbelFrequencyFactor(50) * 30 - gumbelQuantile(p, 1 - 1 / 50))).toBeLessThan(1e-9);
  });
});

describe('Gumbel by moments: Cornell CEE 304 example', () => {
  // science.md §8 #36: (a) Cornell CEE 304, Vermont 24-h rainfall, mean 2.5 in, s.d. 0.7 in.
  const p = gumbelFromMoments(2.5, 0.7);
  it.each([
    ['1/α', 1 / p.scale, 1.832],
    ['ξ', p.location, 2.185],
    ['x0.98', gumbelQuantile(p, 0.98), 4.315],
  ])('%s', (_name, actual, expected) => {
    expect(Math.abs(actual - expected)).toBeLessThan(2e-3);
  });

  it('Chicago 10-min rainfall textbook check', () => {
    // science.md §7.2: (b) from memory, Chow et al. (1988) Ex. 12.2.1: x̄ 0.649, s 0.177 → α 0.138, u 0.569, x5 0.78 in.
    const c = gumbelFromMoments(0.649, 0.177);
    expect(Math.abs(c.scale - 0.138)).toBeLessThan(1e-3);
    expect(Math.abs(c.location - 0.569)).toBeLessThan(1e-3);
    expect(Math.abs(gumbelQuantile(c, 0.8) - 0.78)).toBeLessThan(5e-3);
  });
});

describe('Gumbel fits of the Guadalupe record', () => {
  // science.md §8 #39 and §7.5: (c) computed, 1935–2002, cfs; tolerance 0.5 %.
  const mom = fitGumbelMoments(GUADALUPE_PEAKS_CFS);
  const lmom = fitGumbelLMoments(GUADALUPE_PEAKS_CFS);
  const mom78 = fitGumbelMoments(GUADALUPE_1935_1978_CFS);
  it.each([
    ['MoM α 1935–2002', mom.scale, 47156.9],
    ['MoM u 1935–2002', mom.location, 7187.2],
    ['MoM Q100 1935–2002', gumbelQuantile(mom, 0.99), 224116],
    ['L-mom α 1935–2002', lmom.scale, 28504.6],
    ['L-mom u 1935–2002', lmom.location, 17953.6],
    ['L-mom Q100 1935–2002', gumbelQuantile(lmom, 0.99), 149079],
    ['MoM α 1935–1978', mom78.scale, 23448.8],
    ['MoM u 1935–1978', mom78.location, 14978.6],
    ['MoM Q100 1935–1978', gumbelQuantile(mom78, 0.99), 122847],
  ])('%s', (_name, actual, expected) => {
    expect(rel(actual, expected)).toBeLessThan(0.005);
  });

  it('uses γ = 0.5772156649', () => {
    // science.md §7.2: (a) Euler–Mascheroni constant.
    expect(Math.abs(EULER_GAMMA - 0.5772156649)).toBeLessThan(1e-10);
  });
});

describe('argument checks', () => {
  it.each([
    [() => gumbelFromMoments(1, 0), /stdDev must be a finite number greater than 0/],
    [() => fitGumbelMoments([5, 5, 5]), /must not all be equal/],
    [() => gumbelQuantile({ location: 0, scale: 1 }, 1), /nonExceedance must be between 0 and 1/],
  ])('throws a message naming the argument (%#)', (f, message) => {
    expect(f).toThrow(message);
  });
});
