/**
 * @module shared/physics/slope-current
 * Lentz & Helfrich (2002) scalings of a buoyant coastal current over a sloping bottom:
 *
 *   c_α = α g′/|f|,  c_p ∼ c_w/(1 + c_w/c_α),  W_p ∼ (c_w/|f|)(1 + c_w/c_α).
 *
 * These are scalings (∼): the order-one coefficients fitted to laboratory data are not
 * applied ((b), not seen). c_w/c_α → 0 is the vertical-wall limit; c_w/c_α → ∞ the
 * slope-controlled limit where W_p → h_p/α and c_p → c_α. Laboratory range 0.11–13.1.
 *
 * (a) published: Lentz & Helfrich 2002, J. Fluid Mech. 464, 251–278 (abstract), science.md
 * §1.5; the product form of W_p is (c), checked by W_p → h_p/α on gentle slopes.
 */

import { wallNoseSpeed } from './coastal-current';
import { requirePositive, requireRotation } from './check-argument';

/**
 * Slope (topographic) speed c_α = α g′/|f|.
 *
 * @param shelfSlope - bottom slope α [–], > 0 (e.g. 2e-3)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns c_α [m s⁻¹]
 * @example
 * slopeSpeed(2e-3, 0.191415, 1.003912e-4); // => 3.8134
 * Source: (a) published: Lentz & Helfrich 2002 (abstract), science.md §1.5; check (c) §1.10.
 */
export function slopeSpeed(shelfSlope: number, reducedGravity: number, coriolis: number): number {
  requirePositive('shelfSlope', shelfSlope, '');
  requirePositive('reducedGravity', reducedGravity, 'm s⁻²');
  return (shelfSlope * reducedGravity) / requireRotation(coriolis);
}

/**
 * Nose speed over a sloping bottom, c_p ∼ c_w/(1 + c_w/c_α).
 *
 * @param wallSpeed - wall-limit nose speed c_w [m s⁻¹], > 0
 * @param slopeSpeedValue - slope speed c_α [m s⁻¹], > 0
 * @returns c_p [m s⁻¹], < c_w
 * @example
 * slopeNoseSpeed(0.4313, 3.8134); // => 0.3874
 * Source: (a) published: Lentz & Helfrich 2002 (abstract), science.md §1.5, §1.7; check (c) §8 #27.
 */
export function slopeNoseSpeed(wallSpeed: number, slopeSpeedValue: number): number {
  requirePositive('wallSpeed', wallSpeed, 'm s⁻¹');
  requirePositive('slopeSpeed', slopeSpeedValue, 'm s⁻¹');
  return wallSpeed / (1 + wallSpeed / slopeSpeedValue);
}

/**
 * Width of the current over a sloping bottom, W_p ∼ (c_w/|f|)(1 + c_w/c_α).
 *
 * @param wallSpeed - wall-limit nose speed c_w [m s⁻¹], > 0
 * @param slopeSpeedValue - slope speed c_α [m s⁻¹], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns W_p [m]
 * @example
 * slopeCurrentWidth(0.4313, 3.8134, 1.003912e-4); // => 4781.6
 * Source: (a) published: Lentz & Helfrich 2002 (abstract; product form (c)), science.md §1.5;
 * check (c) §8 #27.
 */
export function slopeCurrentWidth(wallSpeed: number, slopeSpeedValue: number, coriolis: number): number {
  requirePositive('wallSpeed', wallSpeed, 'm s⁻¹');
  requirePositive('slopeSpeed', slopeSpeedValue, 'm s⁻¹');
  return (wallSpeed / requireRotation(coriolis)) * (1 + wallSpeed / slopeSpeedValue);
}

/** Lentz & Helfrich scales of one current over one slope. */
export interface SlopeCurrent {
  /** c_w, wall-limit nose speed [m s⁻¹]. */
  readonly wallNoseSpeed: number;
  /** c_α, slope speed [m s⁻¹]. */
  readonly slopeSpeed: number;
  /** c_w/c_α [–]: → 0 wall limit, → ∞ slope-controlled. */
  readonly speedRatio: number;
  /** c_p, nose speed over the slope [m s⁻¹]. */
  readonly noseSpeed: number;
  /** W_p, width over the slope [m]. */
  readonly width: number;
}

/**
 * All Lentz & Helfrich (2002) slope scales for one buoyant-layer transport.
 *
 * @param discharge - buoyant-layer transport Q [m³ s⁻¹], > 0 (Q_cc in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @param shelfSlope - bottom slope α [–], > 0
 * @returns c_w, c_α, c_w/c_α, c_p and W_p
 * @example
 * slopeCurrent(900, 0.191415, 1.003912e-4, 2e-3).noseSpeed; // => 0.3874
 * Source: (a) published: Lentz & Helfrich 2002 (abstract), science.md §1.5; check (c) §8 #27.
 */
export function slopeCurrent(
  discharge: number,
  reducedGravity: number,
  coriolis: number,
  shelfSlope: number,
): SlopeCurrent {
  const cw = wallNoseSpeed(discharge, reducedGravity, coriolis);
  const ca = slopeSpeed(shelfSlope, reducedGravity, coriolis);
  return {
    wallNoseSpeed: cw,
    slopeSpeed: ca,
    speedRatio: cw / ca,
    noseSpeed: slopeNoseSpeed(cw, ca),
    width: slopeCurrentWidth(cw, ca, coriolis),
  };
}
