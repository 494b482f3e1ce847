/**
 * @module shared/physics/plume-regime
 * Yankovsky & Chapman (1997) plume regime: surface-advected, intermediate or bottom-advected,
 * plus the equatorial band where the rotating model is not used.
 */

import { EQUATORIAL_CUTOFF_DEGREES } from './constants';
import { requireInRange, requirePositive } from './check-argument';

/** The regimes in a fixed order (for schemas and tables). */
export const PLUME_REGIMES = ['surface-advected', 'intermediate', 'bottom-advected', 'equatorial-jet'] as const;

/** Regime of a river plume. */
export type PlumeRegime = (typeof PLUME_REGIMES)[number];

/** Inputs of {@link classifyPlumeRegime}. */
export interface RegimeInput {
  /** Latitude [degrees], −90…90. */
  readonly latitude: number;
  /** h_b, bottom-attachment depth [m], > 0. */
  readonly bottomAttachmentDepth: number;
  /** h0, mouth (inflow) depth [m], > 0. */
  readonly mouthDepth: number;
  /** y_s, offshore distance of the bulge's surface front [m], > 0. */
  readonly bulgeOffshoreExtent: number;
  /** Bottom slope α [–], 0…0.5; 0 or absent = unknown. */
  readonly shelfSlope?: number;
  /** Half-width of the equatorial band [degrees]; default 2.5. */
  readonly equatorialCutoff?: number;
}

/** Result of {@link classifyPlumeRegime}. */
export interface RegimeResult {
  /** The regime. */
  readonly regime: PlumeRegime;
  /**
   * Offshore distance of the h_b isobath, h_b/α [m], when a slope is known and the plume
   * reaches the bottom (h_b ≥ h0).
   */
  readonly bottomFrontDistance?: number;
  /**
   * False when h_b ≥ h0 but no slope was given, so intermediate (reported) and
   * bottom-advected could not be told apart.
   */
  readonly resolved: boolean;
}

/**
 * Classifies the plume after Yankovsky & Chapman (1997):
 * - |latitude| < equatorial cutoff (2.5°): 'equatorial-jet' (rotating model not used);
 * - h_b < h0: 'surface-advected';
 * - h_b ≥ h0 and the h_b isobath (offshore distance h_b/α on a uniform slope from the coast)
 *   lies farther offshore than y_s: 'bottom-advected';
 * - otherwise 'intermediate' (also when no slope is known; then `resolved` is false).
 *
 * @param input - latitude [°], h_b [m], h0 [m], y_s [m], optional slope α [–] and cutoff [°]
 * @returns regime, the h_b isobath distance [m] when known, and whether the test was complete
 * @example
 * classifyPlumeRegime({ latitude: 43.5, bottomAttachmentDepth: 0.97, mouthDepth: 6, bulgeOffshoreExtent: 45323 });
 * // => { regime: 'surface-advected', resolved: true }
 * Source: (a) published: Yankovsky & Chapman 1997, J. Phys. Oceanogr. 27, 1386 (abstract),
 * science.md §1.5; the uniform-slope isobath distance h_b/α and the 2.5° equatorial band are
 * (c) common practice.
 */
export function classifyPlumeRegime(input: RegimeInput): RegimeResult {
  requireInRange('latitude', input.latitude, -90, 90, 'degrees');
  requirePositive('bottomAttachmentDepth', input.bottomAttachmentDepth, 'm');
  requirePositive('mouthDepth', input.mouthDepth, 'm');
  requirePositive('bulgeOffshoreExtent', input.bulgeOffshoreExtent, 'm');
  const cutoff = input.equatorialCutoff ?? EQUATORIAL_CUTOFF_DEGREES;
  requireInRange('equatorialCutoff', cutoff, 0, 90, 'degrees');
  const slope = input.shelfSlope ?? 0;
  requireInRange('shelfSlope', slope, 0, 0.5, '');

  if (Math.abs(input.latitude) < cutoff) return { regime: 'equatorial-jet', resolved: true };
  if (input.bottomAttachmentDepth < input.mouthDepth) return { regime: 'surface-advected', resolved: true };
  if (slope === 0) return { regime: 'intermediate', resolved: false };
  const bottomFrontDistance = input.bottomAttachmentDepth / slope;
  return {
    regime: bottomFrontDistance > input.bulgeOffshoreExtent ? 'bottom-advected' : 'intermediate',
    bottomFrontDistance,
    resolved: true,
  };
}
