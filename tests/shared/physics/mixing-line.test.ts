import { describe, expect, it } from 'vitest';
import {
  freshwaterFractionFromSalinity,
  mixtureDensity,
  salinityFromFreshwaterFraction,
} from '../../../shared/physics/mixing-line';
import { seawaterDensity } from '../../../shared/physics/eos80';
import { expectWithin } from './tolerance';

describe('mixing line', () => {
  it.each([
    // science.md §8 #29 (c): S_o = 34, S_r = 0: S = 17 → φ = 0.5 (exact)
    { salinity: 17, phi: 0.5 },
    // science.md §8 #29 (c): S = 27.2 → φ = 0.2 (exact up to floating point)
    { salinity: 27.2, phi: 0.2 },
    // (c) derived: end members
    { salinity: 34, phi: 0 },
    { salinity: 0, phi: 1 },
  ])('S = $salinity ↔ φ = $phi (S_o = 34, S_r = 0)', ({ salinity, phi }) => {
    expectWithin(freshwaterFractionFromSalinity(salinity, 34), phi, 1e-15);
    expectWithin(salinityFromFreshwaterFraction(phi, 34), salinity, 1e-13);
  });

  it('handles a non-zero river salinity', () => {
    // (c) derived: φ = (S_o − S)/(S_o − S_r) = (32 − 17)/(32 − 2) = 0.5
    expect(freshwaterFractionFromSalinity(17, 32, 2)).toBe(0.5);
    expect(salinityFromFreshwaterFraction(0.5, 32, 2)).toBe(17);
  });

  it('throws or clamps outside the mixing line', () => {
    // (c) common practice: a salinity above the ocean end member is not on the line
    expect(() => freshwaterFractionFromSalinity(35, 34)).toThrow(/salinity must be between 0 and 34/);
    expect(freshwaterFractionFromSalinity(35, 34, 0, { clamp: true })).toBe(0);
    expect(freshwaterFractionFromSalinity(-1, 34, 0, { clamp: true })).toBe(1);
    expect(() => freshwaterFractionFromSalinity(5, 10, 10)).toThrow(/seaSalinity \(10\) must be greater than riverSalinity/);
    expect(() => salinityFromFreshwaterFraction(1.2, 34)).toThrow(/freshwaterFraction must be between 0 and 1/);
  });
});

describe('mixtureDensity', () => {
  const cases = [5, 10, 15].flatMap((temperature) =>
    [0.25, 0.5, 0.75].map((phi) => ({ temperature, phi })),
  );
  it.each(cases)('T = $temperature °C, φ = $phi is within 0.03 kg/m³ of the straight line', ({ temperature, phi }) => {
    const river = { salinity: 0, temperature };
    const sea = { salinity: 34, temperature };
    const linear = (1 - phi) * seawaterDensity(34, temperature) + phi * seawaterDensity(0, temperature);
    // science.md §8 #30 (c): |ρ(S_mix) − linear| ≤ 0.03 kg/m³ at 5–15 °C (§2.4: ≤ 0.026 for φ = 0.25–0.75)
    expect(Math.abs(mixtureDensity(phi, river, sea) - linear)).toBeLessThanOrEqual(0.03);
  });

  it('returns the end members at φ = 0 and φ = 1', () => {
    // (c) definition of the mixing line
    const river = { salinity: 0, temperature: 12 };
    const sea = { salinity: 33, temperature: 8 };
    expect(mixtureDensity(0, river, sea)).toBe(seawaterDensity(33, 8));
    expect(mixtureDensity(1, river, sea)).toBe(seawaterDensity(0, 12));
  });
});
