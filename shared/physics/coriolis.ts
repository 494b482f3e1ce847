/**
 * @module shared/physics/coriolis
 * Coriolis parameter f = 2Ω sin(latitude) and the side to which a river plume turns.
 */

import { EARTH_ANGULAR_VELOCITY, EQUATORIAL_CUTOFF_DEGREES } from './constants';
import { requireInRange } from './check-argument';

/** The turning sides in a fixed order (for schemas). */
export const TURNING_SIDES = ['right', 'left', 'none'] as const;

/** Side of the outflow, looking seaward out of the mouth, on which the plume's coastal current runs. */
export type TurningSide = (typeof TURNING_SIDES)[number];

/**
 * Coriolis parameter f = 2 Ω sin(latitude). Positive in the northern hemisphere, negative in
 * the southern; use |f| for sizes and its sign for direction.
 *
 * @param latitude - geodetic latitude [degrees], −90…90 (north positive)
 * @returns f [s⁻¹]
 * @example
 * coriolisParameter(43.5); // => 1.003912e-4
 * coriolisParameter(30); // => 7.292115e-5 (= Ω)
 * Source: (a) published: f = 2Ω sin φ with Ω = 7.292115e-5 rad s⁻¹ (WGS 84), science.md §3;
 * check values (c) computed, science.md §8 #14–#17.
 */
export function coriolisParameter(latitude: number): number {
  requireInRange('latitude', latitude, -90, 90, 'degrees');
  return 2 * EARTH_ANGULAR_VELOCITY * Math.sin((latitude * Math.PI) / 180);
}

/**
 * The side of the outflow (looking seaward out of the river mouth) to which the plume turns
 * and along which its coastal current runs: the coast lies on the right of the downstream
 * flow in the northern hemisphere, i.e. the plume turns right of the outflow; left in the
 * southern hemisphere; 'none' within the equatorial band |latitude| < 2.5°, where the rotating
 * model is not used.
 *
 * @param latitude - geodetic latitude [degrees], −90…90
 * @param equatorialCutoff - half-width of the equatorial band [degrees], 0…90; default 2.5
 * @returns 'right' | 'left' | 'none'
 * @example
 * turningSide(43.5); // => 'right'
 * turningSide(-33); // => 'left'
 * turningSide(1); // => 'none'
 * Source: (a) published: Hetland, Coastal Dynamics book draft, "River plumes" (coast on the
 * right in the NH; mirrored in the SH), science.md §1.1; the 2.5° cutoff is (c) common
 * practice (product.md §4.3: "a few degrees").
 */
export function turningSide(latitude: number, equatorialCutoff = EQUATORIAL_CUTOFF_DEGREES): TurningSide {
  requireInRange('latitude', latitude, -90, 90, 'degrees');
  requireInRange('equatorialCutoff', equatorialCutoff, 0, 90, 'degrees');
  if (Math.abs(latitude) < equatorialCutoff) return 'none';
  if (latitude > 0) return 'right';
  if (latitude < 0) return 'left';
  return 'none';
}
