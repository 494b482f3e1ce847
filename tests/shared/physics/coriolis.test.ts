import { describe, expect, it } from 'vitest';
import { EARTH_ANGULAR_VELOCITY } from '../../../shared/physics/constants';
import { coriolisParameter, turningSide } from '../../../shared/physics/coriolis';
import { expectWithin } from './tolerance';

describe('coriolisParameter', () => {
  it.each([
    // science.md §8 #14 (c, = GSW gsw.f): f(43.5° N) = 1.003912e-4, tolerance 1e-9
    { latitude: 43.5, f: 1.003912e-4, tolerance: 1e-9 },
    // science.md §8 #15 (c): f(30°) = Ω = 7.292115e-5, tolerance 1e-12
    { latitude: 30, f: 7.292115e-5, tolerance: 1e-12 },
    // science.md §8 #16 (c): f(−43.5°) = −1.003912e-4, tolerance 1e-9
    { latitude: -43.5, f: -1.003912e-4, tolerance: 1e-9 },
    // science.md §8 #17 (c): f(45°) = 1.031261e-4, tolerance 1e-9
    { latitude: 45, f: 1.031261e-4, tolerance: 1e-9 },
    // science.md §8 #17 (c): f(90°) = 2Ω = 1.458423e-4, tolerance 1e-9
    { latitude: 90, f: 1.458423e-4, tolerance: 1e-9 },
    // science.md §3 table (c): f(10°) = 2.532525e-5, f(60°) = 1.263031e-4, f(0) = 0
    { latitude: 10, f: 2.532525e-5, tolerance: 1e-11 },
    { latitude: 60, f: 1.263031e-4, tolerance: 1e-10 },
    { latitude: 0, f: 0, tolerance: 0 },
  ])('f($latitude°) = $f', ({ latitude, f, tolerance }) => {
    expectWithin(coriolisParameter(latitude), f, tolerance);
  });

  it('f(90°) is exactly 2Ω and f is odd in latitude', () => {
    // science.md §3 (a): Ω = 7.292115e-5 rad/s; f = 2Ω sin φ
    expect(coriolisParameter(90)).toBe(2 * EARTH_ANGULAR_VELOCITY);
    expect(coriolisParameter(-27.3)).toBe(-coriolisParameter(27.3));
  });

  it.each([91, -90.5, Number.NaN, Number.POSITIVE_INFINITY])('rejects latitude %s', (latitude) => {
    expect(() => coriolisParameter(latitude)).toThrow(/latitude must be between -90 and 90 degrees/);
  });
});

describe('turningSide', () => {
  // science.md §1.1 (a, Hetland book): coast on the right in the NH, mirrored in the SH;
  // equatorial band 2.5° is (c) common practice (product.md §4.3 "a few degrees").
  it.each([
    { latitude: 43.5, side: 'right' },
    { latitude: 2.5, side: 'right' },
    { latitude: 2.49, side: 'none' },
    { latitude: 0, side: 'none' },
    { latitude: -2.49, side: 'none' },
    { latitude: -2.5, side: 'left' },
    { latitude: -43.5, side: 'left' },
    { latitude: 90, side: 'right' },
    { latitude: -90, side: 'left' },
  ])('latitude $latitude → $side', ({ latitude, side }) => {
    expect(turningSide(latitude)).toBe(side);
  });

  it('takes a custom equatorial cutoff', () => {
    // (c) common practice: the cutoff is a parameter
    expect(turningSide(4, 5)).toBe('none');
    expect(turningSide(0.1, 0)).toBe('right');
  });
});
