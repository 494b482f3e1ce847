import { describe, expect, it } from 'vitest';
import { windMixedThickness } from '../../../shared/physics/wind-mixing';
import { expectRelative } from './tolerance';

describe('windMixedThickness (science.md §8 #28, formula (a) Hetland book §1.8)', () => {
  const si = { windStress: 0.1, coriolis: 1e-4, initialThickness: 1, initialDensityDifference: 20 };

  it('matches the printed formula', () => {
    // science.md §1.8 (a): h_final = (2τ/(ρ0 f)) √(Ri_c ρ0/(g h Δρ)), ρ0 = 1025, g = 9.81, Ri_c = 0.6
    const expected = ((2 * 0.1) / (1025 * 1e-4)) * Math.sqrt((0.6 * 1025) / (9.81 * 1 * 20));
    expectRelative(windMixedThickness(si), expected, 1e-14);
  });

  it('is dimensionally consistent: the same answer in CGS units, ×100', () => {
    // science.md §8 #28 (a formula, c test): τ 1 N/m² = 10 dyn/cm², ρ 1 kg/m³ = 1e-3 g/cm³,
    // g 1 m/s² = 100 cm/s², h 1 m = 100 cm; the result must be 100× larger (cm).
    const cgs = windMixedThickness({
      windStress: si.windStress * 10,
      coriolis: si.coriolis,
      initialThickness: si.initialThickness * 100,
      initialDensityDifference: si.initialDensityDifference * 1e-3,
      referenceDensity: 1025 * 1e-3,
      gravity: 9.81 * 100,
    });
    expectRelative(cgs, 100 * windMixedThickness(si), 1e-12);
  });

  it('scales as τ and as (h Δρ)^−½; the buoyancy content h Δρ sets the limit', () => {
    // science.md §1.8 (a): h_final ∝ τ/√(h_initial Δρ_initial)
    expectRelative(windMixedThickness({ ...si, windStress: 0.2 }), 2 * windMixedThickness(si), 1e-12);
    expectRelative(
      windMixedThickness({ ...si, initialThickness: 4 }),
      windMixedThickness({ ...si, initialDensityDifference: 80 }),
      1e-12,
    );
    expectRelative(windMixedThickness({ ...si, initialThickness: 4 }), windMixedThickness(si) / 2, 1e-12);
  });

  it('rejects calm wind and the equator', () => {
    expect(() => windMixedThickness({ ...si, windStress: 0 })).toThrow(/windStress must be a finite number greater than 0/);
    expect(() => windMixedThickness({ ...si, coriolis: 0 })).toThrow(/coriolis must be a finite, non-zero/);
  });
});
