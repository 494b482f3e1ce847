/**
 * @module shared/physics/bulge
 * Yankovsky & Chapman (1997) scales of the recirculating bulge off a river mouth: offshore
 * position of the surface front y_s and bottom-attachment depth h_b.
 *
 *   v_i = Q/(L h0),  y_s = 2(3g′h0 + v_i²) / (|f| (2g′h0 + v_i²)^{1/2}),
 *   h_b = (2 L v_i h0 |f|/g′)^{1/2} = (2Q|f|/g′)^{1/2}.
 *
 * Q is the river inflow through the mouth (the whole discharge), L the mouth width and h0 the
 * inflow (mouth) depth. The surface-front distance y_s is also the bulge diameter (Hetland
 * book: 4.2 R_d for Fr ≪ 1 to 4.6 R_d for Fr = 1).
 *
 * (a) published: Yankovsky & Chapman 1997, J. Phys. Oceanogr. 27, 1386–1401 (abstract),
 * science.md §1.5–§1.6.
 */

import { requirePositive, requireRotation } from './check-argument';

/** Inputs describing the inflow through the river mouth. */
export interface MouthInflow {
  /** River discharge through the mouth, Q [m³ s⁻¹], > 0 (the whole inflow, not Q_cc). */
  readonly discharge: number;
  /** Mouth (inflow) width L [m], > 0. */
  readonly mouthWidth: number;
  /** Mouth (inflow) depth h0 [m], > 0. */
  readonly mouthDepth: number;
  /** g′ [m s⁻²], > 0. */
  readonly reducedGravity: number;
  /** Coriolis parameter f [s⁻¹], non-zero. */
  readonly coriolis: number;
}

/**
 * Mean inflow velocity through the mouth, v_i = Q/(L h0).
 *
 * @param discharge - Q [m³ s⁻¹], > 0
 * @param mouthWidth - L [m], > 0
 * @param mouthDepth - h0 [m], > 0
 * @returns v_i [m s⁻¹]
 * @example
 * inflowVelocity(900, 1500, 6); // => 0.1
 * Source: (c) derived: continuity, Q = L v_i h0 (science.md §1.3, §1.10).
 */
export function inflowVelocity(discharge: number, mouthWidth: number, mouthDepth: number): number {
  requirePositive('discharge', discharge, 'm³ s⁻¹');
  requirePositive('mouthWidth', mouthWidth, 'm');
  requirePositive('mouthDepth', mouthDepth, 'm');
  return discharge / (mouthWidth * mouthDepth);
}

/**
 * Surface-front distance in units of R0 = √(g′h0)/|f|: y_s/R0 = 2(3 + Fr²)/√(2 + Fr²).
 *
 * @param froude - inflow Froude number Fr = v_i/√(g′h0) [–], ≥ 0
 * @returns y_s/R0 [–] (4.2426 at Fr = 0, 4.6188 at Fr = 1)
 * @example
 * bulgeExtentRatio(0); // => 4.2426
 * bulgeExtentRatio(1); // => 4.6188
 * Source: (c) derived from the (a) Yankovsky & Chapman 1997 formula, science.md §1.6;
 * matches the Hetland book's 4.2/4.6 R_d (a); check (c) science.md §8 #25.
 */
export function bulgeExtentRatio(froude: number): number {
  if (typeof froude !== 'number' || !Number.isFinite(froude) || froude < 0) {
    throw new RangeError(`froude must be a finite number of at least 0 (got ${String(froude)})`);
  }
  const fr2 = froude * froude;
  return (2 * (3 + fr2)) / Math.sqrt(2 + fr2);
}

/**
 * Offshore distance of the bulge's surface front (bulge diameter),
 * y_s = 2(3g′h0 + v_i²) / (|f| (2g′h0 + v_i²)^{1/2}), with v_i = Q/(L h0) from the whole
 * river inflow.
 *
 * @param inflow - { discharge (whole Q), mouthWidth, mouthDepth, reducedGravity, coriolis }
 * @returns y_s [m]
 * @example
 * bulgeOffshoreExtent({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.191415, coriolis: 1.003912e-4 });
 * // => 45323
 * Source: (a) published: Yankovsky & Chapman 1997 (abstract), science.md §1.6; check (c) §8 #26.
 */
export function bulgeOffshoreExtent(inflow: MouthInflow): number {
  const vi = inflowVelocity(inflow.discharge, inflow.mouthWidth, inflow.mouthDepth);
  requirePositive('reducedGravity', inflow.reducedGravity, 'm s⁻²');
  const f = requireRotation(inflow.coriolis);
  const gh = inflow.reducedGravity * inflow.mouthDepth;
  const v2 = vi * vi;
  return (2 * (3 * gh + v2)) / (f * Math.sqrt(2 * gh + v2));
}

/**
 * Bottom-attachment depth h_b = (2 L v_i h0 |f|/g′)^{1/2} = (2Q|f|/g′)^{1/2}: the plume stays
 * attached to the bottom down to this depth. Uses the whole river inflow Q.
 *
 * @param inflow - { discharge (whole Q), mouthWidth, mouthDepth, reducedGravity, coriolis }
 * @returns h_b [m]
 * @example
 * bottomAttachmentDepth({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.191415, coriolis: 1.003912e-4 });
 * // => 0.9716
 * Source: (a) published: Yankovsky & Chapman 1997 (abstract); Hetland book h_b = √(2Qf/g′),
 * science.md §1.3, §1.5; check (c) §8 #26.
 */
export function bottomAttachmentDepth(inflow: MouthInflow): number {
  const vi = inflowVelocity(inflow.discharge, inflow.mouthWidth, inflow.mouthDepth);
  requirePositive('reducedGravity', inflow.reducedGravity, 'm s⁻²');
  const f = requireRotation(inflow.coriolis);
  return Math.sqrt((2 * inflow.mouthWidth * vi * inflow.mouthDepth * f) / inflow.reducedGravity);
}

/** Bulge scales of one river mouth. */
export interface Bulge {
  /** v_i = Q/(L h0) [m s⁻¹]. */
  readonly inflowVelocity: number;
  /** R0 = √(g′h0)/|f| [m]. */
  readonly mouthDeformationRadius: number;
  /** Fr = v_i/√(g′h0) [–]. */
  readonly froudeNumber: number;
  /** y_s, offshore distance of the surface front (bulge diameter) [m]. */
  readonly offshoreExtent: number;
  /** h_b, bottom-attachment depth [m]. */
  readonly bottomAttachmentDepth: number;
}

/**
 * All Yankovsky & Chapman (1997) bulge scales of one mouth.
 *
 * @param inflow - { discharge (whole Q), mouthWidth, mouthDepth, reducedGravity, coriolis }
 * @returns v_i, R0, Fr, y_s and h_b
 * @example
 * bulge({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.076566, coriolis: 1.003912e-4 }).offshoreExtent;
 * // => 28696
 * Source: (a) published: Yankovsky & Chapman 1997 (abstract), science.md §1.5–§1.6.
 */
export function bulge(inflow: MouthInflow): Bulge {
  const offshoreExtent = bulgeOffshoreExtent(inflow);
  const hb = bottomAttachmentDepth(inflow);
  const vi = inflowVelocity(inflow.discharge, inflow.mouthWidth, inflow.mouthDepth);
  const c0 = Math.sqrt(inflow.reducedGravity * inflow.mouthDepth);
  return {
    inflowVelocity: vi,
    mouthDeformationRadius: c0 / requireRotation(inflow.coriolis),
    froudeNumber: vi / c0,
    offshoreExtent,
    bottomAttachmentDepth: hb,
  };
}
