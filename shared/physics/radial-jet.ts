/**
 * @module shared/physics/radial-jet
 * Equatorial fallback: a non-rotating buoyant layer spreading radially off a straight coast.
 * FLAGGED ESTIMATE — used only where the rotating model does not apply (|latitude| < 2.5°).
 *
 * Box model (c, derived here): the river discharge Q fills a half-disc of radius r and
 * uniform thickness h, V = Q t = (π/2) r² h; the front advances at a gravity-current speed
 * dr/dt = Fr_f √(g′h) with front Froude number Fr_f = 1. Integrating,
 *
 *   r(t) = (4 Fr_f/3)^{1/2} (2g′Q/π)^{1/4} t^{3/4},  dr/dt = (3/4) r/t,  h(t) = 2Qt/(π r²).
 *
 * No mixing, wind, tide or ambient current; real equatorial plumes are steered by those.
 */

import { RADIAL_FRONT_FROUDE_NUMBER } from './constants';
import { requirePositive } from './check-argument';

/** Inputs of {@link radialSpread}. */
export interface RadialSpreadInput {
  /** River discharge Q [m³ s⁻¹], > 0 (the whole discharge). */
  readonly discharge: number;
  /** g′ [m s⁻²], > 0. */
  readonly reducedGravity: number;
  /** Time since the start of the outflow t [s], > 0. */
  readonly time: number;
  /** Front Froude number Fr_f [–], > 0; default 1. */
  readonly frontFroude?: number;
}

/** State of the radially spreading layer at one time. */
export interface RadialSpread {
  /** r, front radius (offshore and alongshore extent) [m]. */
  readonly radius: number;
  /** dr/dt, front speed [m s⁻¹]. */
  readonly frontSpeed: number;
  /** r/t, mean front speed since the start [m s⁻¹]. */
  readonly meanFrontSpeed: number;
  /** h, mean layer thickness [m]. */
  readonly thickness: number;
}

/**
 * Radius, front speed and thickness of a buoyant half-disc spreading off a straight coast
 * without rotation.
 *
 * @param input - { discharge [m³ s⁻¹] > 0, reducedGravity [m s⁻²] > 0, time [s] > 0, frontFroude [–] }
 * @returns radius [m], front speed [m s⁻¹], mean front speed [m s⁻¹], thickness [m]
 * @example
 * radialSpread({ discharge: 900, reducedGravity: 0.19, time: 86400 }).radius; // ≈ 1.88e4
 * Source: (c) derived: box model with Fr_f = 1 (common practice for gravity-current fronts),
 * documented in this module; product.md §4.3 asks for a flagged radial-jet estimate.
 */
export function radialSpread(input: RadialSpreadInput): RadialSpread {
  const q = requirePositive('discharge', input.discharge, 'm³ s⁻¹');
  const gp = requirePositive('reducedGravity', input.reducedGravity, 'm s⁻²');
  const t = requirePositive('time', input.time, 's');
  const fr = requirePositive('frontFroude', input.frontFroude ?? RADIAL_FRONT_FROUDE_NUMBER, '');
  const radius = Math.sqrt((4 * fr) / 3) * ((2 * gp * q) / Math.PI) ** 0.25 * t ** 0.75;
  return {
    radius,
    frontSpeed: (0.75 * radius) / t,
    meanFrontSpeed: radius / t,
    thickness: (2 * q * t) / (Math.PI * radius * radius),
  };
}
