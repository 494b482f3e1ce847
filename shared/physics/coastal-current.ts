/**
 * @module shared/physics/coastal-current
 * The buoyant coastal current against a vertical wall (surface-trapped, 1½-layer, steady,
 * geostrophic), zero-potential-vorticity family of science.md §1.3–§1.4:
 *
 *   H0 = (2|f|Q/g′)^{1/2}, W0 = (8g′Q/|f|³)^{1/4}, U0 = 0.6307 (|f| g′ Q)^{1/4},
 *   h(x) = H0 − f²x²/(2g′), v(x) = |f| x (0 ≤ x ≤ W0), c_w = (2Qg′|f|)^{1/4}.
 *
 * Q here is the transport of the buoyant layer in the coastal current [m³ s⁻¹]. In the plume
 * chain ({@link computePlume}) that is the coastal-current share Q_cc = F_cc · Q of the river
 * discharge (science.md §1.6); the §8 worked example uses Q = 900 m³ s⁻¹ directly.
 * x is the offshore distance from the coast [m]; v is the alongshore (downcoast) speed,
 * reported as a magnitude in both hemispheres (|f| for sizes, sign of f for direction).
 */

import { ZERO_PV_MEAN_SPEED_COEFFICIENT } from './constants';
import { requireNonNegative, requirePositive, requireRotation } from './check-argument';

/**
 * Depth of the buoyant layer at the coast, H0 = (2|f|Q/g′)^{1/2}. Exact for any cross-shore
 * profile (thermal-wind transport integral); identical to the Yankovsky & Chapman (1997)
 * bottom-attachment depth h_b and the Lentz & Helfrich (2002) h_p.
 *
 * @param discharge - buoyant-layer transport Q [m³ s⁻¹], > 0 (Q_cc in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero, either sign
 * @returns H0 [m]
 * @example
 * coastalCurrentDepth(900, 0.191415, 1.003912e-4); // => 0.9716
 * Source: (c) derived: science.md §1.3 (transport constraint); published form (a) Yankovsky
 * & Chapman 1997, JPO 27, 1386 (abstract); check (c) science.md §8 #19.
 */
export function coastalCurrentDepth(discharge: number, reducedGravity: number, coriolis: number): number {
  const [q, gp, f] = checkInputs(discharge, reducedGravity, coriolis);
  return Math.sqrt((2 * f * q) / gp);
}

/**
 * Width of the zero-PV coastal current (coast to offshore front), W0 = (8g′Q/|f|³)^{1/4}
 * = √2 · c_w/|f|.
 *
 * @param discharge - buoyant-layer transport Q [m³ s⁻¹], > 0 (Q_cc in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns W0 [m]
 * @example
 * coastalCurrentWidth(900, 0.191415, 1.003912e-4); // => 6075.1
 * Source: (c) derived: science.md §1.4 family 1 (zero potential vorticity, v(0) = 0);
 * check (c) science.md §8 #20.
 */
export function coastalCurrentWidth(discharge: number, reducedGravity: number, coriolis: number): number {
  const [q, gp, f] = checkInputs(discharge, reducedGravity, coriolis);
  return ((8 * gp * q) / f ** 3) ** 0.25;
}

/**
 * Area-mean alongshore speed of the zero-PV coastal current, U0 = Q/A with A = (2/3) H0 W0,
 * i.e. U0 = (3/2)(|f| g′ Q/32)^{1/4} ≈ 0.6307 (|f| g′ Q)^{1/4}.
 *
 * @param discharge - buoyant-layer transport Q [m³ s⁻¹], > 0 (Q_cc in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns U0 [m s⁻¹]
 * @example
 * coastalCurrentMeanSpeed(900, 0.191415, 1.003912e-4); // => 0.2287
 * Source: (c) derived: science.md §1.4 family 1; check (c) science.md §8 #23.
 */
export function coastalCurrentMeanSpeed(discharge: number, reducedGravity: number, coriolis: number): number {
  const [q, gp, f] = checkInputs(discharge, reducedGravity, coriolis);
  return ZERO_PV_MEAN_SPEED_COEFFICIENT * (f * gp * q) ** 0.25;
}

/**
 * Wall-limit nose (advance) speed of the coastal current, c_w = (2Qg′|f|)^{1/4} = √(g′H0).
 * A scaling (∼) with an order-one laboratory coefficient that is not applied here.
 *
 * @param discharge - buoyant-layer transport Q [m³ s⁻¹], > 0 (Q_cc in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns c_w [m s⁻¹]
 * @example
 * wallNoseSpeed(900, 0.191415, 1.003912e-4); // => 0.4313
 * Source: (a) published: Lentz & Helfrich 2002, J. Fluid Mech. 464, 251–278 (abstract),
 * science.md §1.4 family 2, §1.7; check (c) science.md §8 #22.
 */
export function wallNoseSpeed(discharge: number, reducedGravity: number, coriolis: number): number {
  const [q, gp, f] = checkInputs(discharge, reducedGravity, coriolis);
  return (2 * q * gp * f) ** 0.25;
}

/** The cross-shore scales of a zero-PV coastal current. */
export interface CoastalCurrentScales {
  /** g′ [m s⁻²]. */
  readonly reducedGravity: number;
  /** Coriolis parameter f [s⁻¹] (either sign). */
  readonly coriolis: number;
  /** H0, depth at the coast [m]. */
  readonly depth: number;
  /** W0, coast-to-front width [m]. */
  readonly width: number;
}

/**
 * Cross-shore thickness profile of the zero-PV current, h(x) = H0 − f²x²/(2g′) for
 * 0 ≤ x ≤ W0, and 0 offshore of the front. Equivalently h = H0 (1 − (x/W0)²).
 *
 * @param offshoreDistance - x, distance from the coast [m], ≥ 0
 * @param current - { reducedGravity, coriolis, depth, width } of the current
 * @returns h(x) [m], 0…H0
 * @example
 * coastalCurrentThickness(0, scales); // => H0
 * coastalCurrentThickness(scales.width, scales); // => 0
 * Source: (c) derived: science.md §1.4 family 1.
 */
export function coastalCurrentThickness(offshoreDistance: number, current: CoastalCurrentScales): number {
  requireNonNegative('offshoreDistance', offshoreDistance, 'm');
  if (offshoreDistance >= current.width) return 0;
  const f = requireRotation(current.coriolis);
  return Math.max(0, current.depth - (f * f * offshoreDistance * offshoreDistance) / (2 * current.reducedGravity));
}

/**
 * Alongshore (downcoast) speed of the zero-PV current, v(x) = |f| x for 0 ≤ x ≤ W0 (at rest
 * at the coast, fastest at the front, v_f = |f| W0), and 0 offshore of the front.
 *
 * @param offshoreDistance - x, distance from the coast [m], ≥ 0
 * @param current - { coriolis, width } of the current
 * @returns v(x) [m s⁻¹], magnitude
 * @example
 * coastalCurrentVelocity(1000, { coriolis: 1e-4, width: 6000 }); // => 0.1
 * Source: (c) derived: science.md §1.4 family 1 (zero PV: ∂v/∂x = −f, v(0) = 0).
 */
export function coastalCurrentVelocity(
  offshoreDistance: number,
  current: Pick<CoastalCurrentScales, 'coriolis' | 'width'>,
): number {
  requireNonNegative('offshoreDistance', offshoreDistance, 'm');
  if (offshoreDistance > current.width) return 0;
  return requireRotation(current.coriolis) * offshoreDistance;
}

/** All scales of the zero-PV coastal current for one transport. */
export interface CoastalCurrent extends CoastalCurrentScales {
  /** Buoyant-layer transport Q used [m³ s⁻¹]. */
  readonly discharge: number;
  /** U0, area-mean alongshore speed [m s⁻¹]. */
  readonly meanSpeed: number;
  /** c_w, wall-limit nose speed [m s⁻¹]. */
  readonly wallNoseSpeed: number;
  /** v_f = |f| W0, frontal (maximum) speed [m s⁻¹]. */
  readonly frontalSpeed: number;
  /** R = c_w/|f| = √(g′H0)/|f|, internal deformation radius at the coast depth [m]. */
  readonly deformationRadius: number;
  /** A = (2/3) H0 W0, cross-section area [m²]. */
  readonly area: number;
}

/**
 * Every scale of the zero-PV coastal current for one buoyant-layer transport.
 *
 * @param discharge - buoyant-layer transport Q [m³ s⁻¹], > 0 (Q_cc in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns depth, width, mean, nose and frontal speeds, deformation radius and area
 * @example
 * coastalCurrent(900, 0.191415, 1.003912e-4).width; // => 6075.1
 * Source: (c) derived: science.md §1.3–§1.4 (family 1), c_w (a) Lentz & Helfrich 2002.
 */
export function coastalCurrent(discharge: number, reducedGravity: number, coriolis: number): CoastalCurrent {
  const depth = coastalCurrentDepth(discharge, reducedGravity, coriolis);
  const width = coastalCurrentWidth(discharge, reducedGravity, coriolis);
  const cw = wallNoseSpeed(discharge, reducedGravity, coriolis);
  const f = Math.abs(coriolis);
  return {
    discharge,
    reducedGravity,
    coriolis,
    depth,
    width,
    meanSpeed: coastalCurrentMeanSpeed(discharge, reducedGravity, coriolis),
    wallNoseSpeed: cw,
    frontalSpeed: f * width,
    deformationRadius: cw / f,
    area: (2 / 3) * depth * width,
  };
}

/** @private Shared guard: returns [Q, g′, |f|]. */
function checkInputs(discharge: number, reducedGravity: number, coriolis: number): [number, number, number] {
  requirePositive('discharge', discharge, 'm³ s⁻¹');
  requirePositive('reducedGravity', reducedGravity, 'm s⁻²');
  return [discharge, reducedGravity, requireRotation(coriolis)];
}
