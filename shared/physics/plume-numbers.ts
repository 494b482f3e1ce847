/**
 * @module shared/physics/plume-numbers
 * Internal deformation radius and the dimensionless numbers of a river outflow (Kelvin,
 * Froude, Rossby), science.md §1.2.
 */

import { requirePositive, requireRotation } from './check-argument';

/**
 * Internal deformation (Rossby) radius R = √(g′h)/|f|.
 *
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param depth - layer thickness h [m], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns R [m]
 * @example
 * deformationRadius(0.191415, 0.9716, 1.003912e-4); // => 4295.8
 * Source: (a) published: Hetland, Coastal Dynamics book draft (R = √(g′h)/f; the printed
 * square is a typo), science.md §1.2; check (c) science.md §8 #21.
 */
export function deformationRadius(reducedGravity: number, depth: number, coriolis: number): number {
  requirePositive('reducedGravity', reducedGravity, 'm s⁻²');
  requirePositive('depth', depth, 'm');
  return Math.sqrt(reducedGravity * depth) / requireRotation(coriolis);
}

/**
 * Kelvin number of the outflow, K = W|f|/√(g′h): mouth width over deformation radius.
 * K < 1: narrow energetic jet steered by the mouth; K > 1: flow hugs the downcoast shore.
 *
 * @param mouthWidth - W [m], > 0
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param mouthDepth - outflow thickness h [m], > 0
 * @param coriolis - f [s⁻¹], either sign (0 gives K = 0)
 * @returns K [–]
 * @example
 * kelvinNumber(1500, 0.191415, 6, 1.003912e-4); // => 0.1403
 * Source: (a) published: Hetland book after Garvine 1995, Cont. Shelf Res. 15, 1585–1596
 * (science.md §1.2).
 */
export function kelvinNumber(mouthWidth: number, reducedGravity: number, mouthDepth: number, coriolis: number): number {
  requirePositive('mouthWidth', mouthWidth, 'm');
  requirePositive('reducedGravity', reducedGravity, 'm s⁻²');
  requirePositive('mouthDepth', mouthDepth, 'm');
  if (!Number.isFinite(coriolis)) throw new RangeError(`coriolis must be a finite number in s⁻¹ (got ${coriolis})`);
  return (mouthWidth * Math.abs(coriolis)) / Math.sqrt(reducedGravity * mouthDepth);
}

/**
 * Source (mouth) Froude number Fr = u/√(g′h).
 *
 * @param speed - outflow speed u [m s⁻¹], ≥ 0 (v_i = Q/(W h0) in the plume chain)
 * @param reducedGravity - g′ [m s⁻²], > 0
 * @param depth - outflow thickness h [m], > 0
 * @returns Fr [–]
 * @example
 * froudeNumber(0.1, 0.191415, 6); // => 0.0933
 * Source: (a) published: Hetland book (science.md §1.2); check (c) science.md §1.10.
 */
export function froudeNumber(speed: number, reducedGravity: number, depth: number): number {
  if (!Number.isFinite(speed) || speed < 0) throw new RangeError(`speed must be a finite number of at least 0 m s⁻¹ (got ${speed})`);
  requirePositive('reducedGravity', reducedGravity, 'm s⁻²');
  requirePositive('depth', depth, 'm');
  return speed / Math.sqrt(reducedGravity * depth);
}

/**
 * Rossby number of the outflow, Ro = u/(|f| W) = Fr/K.
 *
 * @param speed - outflow speed u [m s⁻¹], ≥ 0
 * @param mouthWidth - W [m], > 0
 * @param coriolis - f [s⁻¹], non-zero
 * @returns Ro [–]
 * @example
 * rossbyNumber(0.1, 1500, 1.003912e-4); // => 0.664
 * Source: (a) published: Hetland book (science.md §1.2).
 */
export function rossbyNumber(speed: number, mouthWidth: number, coriolis: number): number {
  if (!Number.isFinite(speed) || speed < 0) throw new RangeError(`speed must be a finite number of at least 0 m s⁻¹ (got ${speed})`);
  requirePositive('mouthWidth', mouthWidth, 'm');
  return speed / (requireRotation(coriolis) * mouthWidth);
}
