import { describe, expect, it } from 'vitest';
import { reducedGravity, reducedGravityFromWater } from '../../../shared/physics/reduced-gravity';
import { seawaterDensity } from '../../../shared/physics/eos80';
import { expectWithin } from './tolerance';

describe('reducedGravity', () => {
  it.each([
    // science.md §8 #18 (c): g = 9.81, ρ0 = 1025, Δρ = 20 → 0.191415, tolerance 1e-6
    { drho: 20, gp: 0.191415 },
    // science.md §8 #18 (c): Δρ = 8 → 0.076566, tolerance 1e-6
    { drho: 8, gp: 0.076566 },
  ])('Δρ = $drho kg/m³ → g′ = $gp', ({ drho, gp }) => {
    expectWithin(reducedGravity(drho), gp, 1e-6);
  });

  it('uses the given ρ0 and g', () => {
    // science.md §1.2 (c): ρ0 = 1000 instead of 1025 raises g′ by 2.5 %
    expectWithin(reducedGravity(20, 1000) / reducedGravity(20, 1025), 1.025, 1e-12);
    // (c) definition: g′ = g Δρ/ρ0 with standard gravity
    expectWithin(reducedGravity(10, 1000, 9.80665), 0.0980665, 1e-15);
  });

  it.each([
    { call: () => reducedGravity(-1), message: /densityDifference must be a finite number of at least 0/ },
    { call: () => reducedGravity(1, 0), message: /referenceDensity must be a finite number greater than 0/ },
    { call: () => reducedGravity(1, 1025, -9.81), message: /gravity must be a finite number greater than 0/ },
  ])('rejects: $message', ({ call, message }) => {
    expect(call).toThrow(message);
  });
});

describe('reducedGravityFromWater', () => {
  it('fresh river water against S = 34 sea water at 10 °C', () => {
    const result = reducedGravityFromWater({ riverSalinity: 0, riverTemperature: 10, seaSalinity: 34, seaTemperature: 10 });
    // science.md §2.1 surface table (c): ρ(0, 10) = 999.7019, ρ(34, 10) = 1026.1711
    expectWithin(result.riverDensity, 999.7019, 1e-4);
    expectWithin(result.seaDensity, 1026.1711, 1e-4);
    // (c) derived: g′ = 9.81 × (1026.1711 − 999.7019)/1025 = 0.253330
    expectWithin(result.reducedGravity, (9.81 * (1026.1711 - 999.7019)) / 1025, 2e-6);
    // science.md §2.1 (c): Δρ fresh vs S = 34 is about 25–27 kg/m³
    expect(result.densityDifference).toBeGreaterThan(25);
    expect(result.densityDifference).toBeLessThan(27);
  });

  it('uses EOS-80 at p = 0 for both waters', () => {
    // (c) definition: Δρ = ρ_sea − ρ_river
    const result = reducedGravityFromWater({ riverSalinity: 2, riverTemperature: 18, seaSalinity: 31, seaTemperature: 12 });
    expect(result.densityDifference).toBe(seawaterDensity(31, 12) - seawaterDensity(2, 18));
  });

  it('refuses river water that is not lighter than the sea', () => {
    // (c) common practice: no surface plume without positive buoyancy
    expect(() =>
      reducedGravityFromWater({ riverSalinity: 35, riverTemperature: 5, seaSalinity: 30, seaTemperature: 20 }),
    ).toThrow(/river water must be lighter than sea water/);
  });
});
