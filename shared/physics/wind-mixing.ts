/**
 * @module shared/physics/wind-mixing
 * Wind-mixing limit on the thickness of a surface-trapped plume (Fong & Geyer 2001; Lentz
 * 2004; as printed in the Hetland book, science.md §1.8):
 *
 *   u_e = τ/(ρ0 f h),  Ri_B = Δρ g h/(ρ0 u_e²),  h Δρ = const,
 *   h_final = (2τ/(ρ0 |f|)) · √( Ri_c ρ0 / (g h_initial Δρ_initial) ).
 *
 * Note (c): substituting u_e and h Δρ = const into Ri_B = Ri_c gives the same expression
 * without the leading 2; the factor 2 is kept as printed in the source (a), which may define
 * the velocity difference across the plume base differently. Treat h_final as an order-of-
 * magnitude limit.
 */

import { CRITICAL_RICHARDSON_NUMBER, GRAVITY, REFERENCE_DENSITY } from './constants';
import { requirePositive, requireRotation } from './check-argument';

/** Inputs of {@link windMixedThickness}. */
export interface WindMixingInput {
  /** Wind stress τ [N m⁻²], > 0. */
  readonly windStress: number;
  /** Coriolis parameter f [s⁻¹], non-zero. */
  readonly coriolis: number;
  /** Plume thickness before the wind event, h_initial [m], > 0. */
  readonly initialThickness: number;
  /** Plume density anomaly before the wind event, Δρ_initial [kg m⁻³], > 0. */
  readonly initialDensityDifference: number;
  /** ρ0 [kg m⁻³]; default 1025. */
  readonly referenceDensity?: number;
  /** g [m s⁻²]; default 9.81. */
  readonly gravity?: number;
  /** Ri_c [–]; default 0.6. */
  readonly criticalRichardson?: number;
}

/**
 * Thickness to which a wind event mixes a surface-trapped plume, after which stratification
 * stops further mixing.
 *
 * @param input - τ [N m⁻²], f [s⁻¹], h_initial [m], Δρ_initial [kg m⁻³], optional ρ0, g, Ri_c
 * @returns h_final [m]
 * @example
 * windMixedThickness({ windStress: 0.1, coriolis: 1e-4, initialThickness: 1, initialDensityDifference: 20 });
 * // => 2 · 0.1/(1025 · 1e-4) · √(0.6 · 1025/(9.81 · 1 · 20)) ≈ 3.45 m
 * Source: (a) published: Hetland, Coastal Dynamics book draft, "River plumes", after Fong &
 * Geyer 2001 and Lentz 2004 (science.md §1.8, §8 #28).
 */
export function windMixedThickness(input: WindMixingInput): number {
  const tau = requirePositive('windStress', input.windStress, 'N m⁻²');
  const f = requireRotation(input.coriolis);
  const h = requirePositive('initialThickness', input.initialThickness, 'm');
  const drho = requirePositive('initialDensityDifference', input.initialDensityDifference, 'kg m⁻³');
  const rho0 = requirePositive('referenceDensity', input.referenceDensity ?? REFERENCE_DENSITY, 'kg m⁻³');
  const g = requirePositive('gravity', input.gravity ?? GRAVITY, 'm s⁻²');
  const ric = requirePositive('criticalRichardson', input.criticalRichardson ?? CRITICAL_RICHARDSON_NUMBER, '');
  return ((2 * tau) / (rho0 * f)) * Math.sqrt((ric * rho0) / (g * h * drho));
}
