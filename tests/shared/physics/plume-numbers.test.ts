import { describe, expect, it } from 'vitest';
import { coriolisParameter } from '../../../shared/physics/coriolis';
import { deformationRadius, froudeNumber, kelvinNumber, rossbyNumber } from '../../../shared/physics/plume-numbers';
import { expectRelative, expectWithin } from './tolerance';

const F = coriolisParameter(43.5);

describe('deformationRadius', () => {
  it.each([
    // science.md §8 #21 (c): R = c_w/f = √(g′H0)/f, Δρ = 20 → 4295.8 m (1 m), with H0 = 0.9716 (§8 #19)
    { gp: 0.191415, depth: 0.9716192774885858, r: 4295.8 },
    // science.md §8 #21 (c): Δρ = 8 → 3416.3 m (1 m), with H0 = 1.5363 (§8 #19)
    { gp: 0.076566, depth: 1.5362649676955482, r: 3416.3 },
  ])('g′ = $gp → R = $r m', ({ gp, depth, r }) => {
    expectWithin(deformationRadius(gp, depth, F), r, 1);
  });

  it('is the same in both hemispheres', () => {
    // science.md §3 (c): |f| for sizes
    expect(deformationRadius(0.1, 2, coriolisParameter(-40))).toBe(deformationRadius(0.1, 2, coriolisParameter(40)));
  });
});

describe('mouth numbers (science.md §1.10 worked example)', () => {
  it.each([
    // science.md §1.10 table (c): YC97 Fr = v_i/√(g′h0) = 0.0933 (Δρ = 20) and 0.1475 (Δρ = 8), v_i = 0.100 m/s
    { gp: 0.191415, fr: 0.0933 },
    { gp: 0.076566, fr: 0.1475 },
  ])('Fr for g′ = $gp is $fr', ({ gp, fr }) => {
    expectWithin(froudeNumber(0.1, gp, 6), fr, 1e-4);
  });

  it('K = W f/√(g′h) and Ro = Fr/K', () => {
    // science.md §1.2 (a, Hetland book): K = W f/√(g′h), Ro = Fr/K = u/(f W)
    const k = kelvinNumber(1500, 0.191415, 6, F);
    expectRelative(k, (1500 * F) / Math.sqrt(0.191415 * 6), 1e-15);
    expectRelative(rossbyNumber(0.1, 1500, F), froudeNumber(0.1, 0.191415, 6) / k, 1e-12);
    // (c) derived: K = 0 on the equator
    expect(kelvinNumber(1500, 0.191415, 6, 0)).toBe(0);
  });

  it('rejects bad arguments', () => {
    expect(() => kelvinNumber(0, 0.1, 6, F)).toThrow(/mouthWidth must be a finite number greater than 0/);
    expect(() => froudeNumber(-0.1, 0.1, 6)).toThrow(/speed must be a finite number of at least 0/);
    expect(() => rossbyNumber(0.1, 1500, 0)).toThrow(/coriolis must be a finite, non-zero/);
  });
});
