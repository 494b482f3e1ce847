/**
 * @module shared/physics/mixing-line
 * Conservative mixing of river and sea water: salinity ↔ freshwater fraction, and the density
 * of a mixture.
 *
 * Freshwater fraction φ is the share of river water in a parcel (0 = pure sea water, 1 = pure
 * river water). Mass and volume fractions differ by < 2.5 % and are not distinguished
 * ((c), science.md §2.4).
 */

import { EOS80_MAX_SALINITY } from './constants';
import { seawaterDensity } from './eos80';
import { requireInRange } from './check-argument';

/**
 * Salinity of a river/sea mixture: S = (1 − φ) S_ocean + φ S_river.
 *
 * @param freshwaterFraction - φ [–], 0…1
 * @param seaSalinity - S_ocean, practical salinity 0…42
 * @param riverSalinity - S_river, practical salinity 0…42; default 0
 * @returns mixture practical salinity
 * @example
 * salinityFromFreshwaterFraction(0.5, 34); // => 17
 * Source: (c) derived: conservative mixing, science.md §2.4, §8 #29.
 */
export function salinityFromFreshwaterFraction(
  freshwaterFraction: number,
  seaSalinity: number,
  riverSalinity = 0,
): number {
  requireInRange('freshwaterFraction', freshwaterFraction, 0, 1, '');
  requireInRange('seaSalinity', seaSalinity, 0, EOS80_MAX_SALINITY, '(practical salinity)');
  requireInRange('riverSalinity', riverSalinity, 0, EOS80_MAX_SALINITY, '(practical salinity)');
  return (1 - freshwaterFraction) * seaSalinity + freshwaterFraction * riverSalinity;
}

/** Options of {@link freshwaterFractionFromSalinity}. */
export interface FreshwaterFractionOptions {
  /**
   * When true, salinities outside [S_river, S_ocean] (e.g. a measured value slightly above
   * the chosen ocean salinity) give φ clamped to 0…1 instead of an error. Default false.
   */
  readonly clamp?: boolean;
}

/**
 * Freshwater fraction of a mixture from its salinity: φ = (S_ocean − S)/(S_ocean − S_river),
 * i.e. φ = 1 − S/S_ocean when S_river = 0.
 *
 * @param salinity - mixture practical salinity, between riverSalinity and seaSalinity (0…42)
 * @param seaSalinity - S_ocean, practical salinity, > riverSalinity
 * @param riverSalinity - S_river, practical salinity, 0…42; default 0
 * @param options - { clamp } to clamp out-of-range salinities instead of throwing
 * @returns φ [–], 0…1
 * @example
 * freshwaterFractionFromSalinity(27.2, 34); // => 0.2
 * Source: (c) derived: conservative mixing, science.md §2.4, §8 #29.
 */
export function freshwaterFractionFromSalinity(
  salinity: number,
  seaSalinity: number,
  riverSalinity = 0,
  options: FreshwaterFractionOptions = {},
): number {
  requireInRange('seaSalinity', seaSalinity, 0, EOS80_MAX_SALINITY, '(practical salinity)');
  requireInRange('riverSalinity', riverSalinity, 0, EOS80_MAX_SALINITY, '(practical salinity)');
  if (!(seaSalinity > riverSalinity)) {
    throw new RangeError(
      `seaSalinity (${seaSalinity}) must be greater than riverSalinity (${riverSalinity}) for a mixing line`,
    );
  }
  if (options.clamp) {
    if (typeof salinity !== 'number' || !Number.isFinite(salinity)) {
      throw new RangeError(`salinity must be a finite practical salinity (got ${String(salinity)})`);
    }
    const phi = (seaSalinity - salinity) / (seaSalinity - riverSalinity);
    return Math.min(1, Math.max(0, phi));
  }
  requireInRange('salinity', salinity, riverSalinity, seaSalinity, '(practical salinity, from riverSalinity to seaSalinity)');
  return (seaSalinity - salinity) / (seaSalinity - riverSalinity);
}

/** One end member of the mixing line. */
export interface EndMember {
  /** Practical salinity, 0…42. */
  readonly salinity: number;
  /** Temperature [°C, ITS-90], −2…40. */
  readonly temperature: number;
}

/**
 * Surface density of a river/sea mixture: salinity and temperature mix linearly in φ, then
 * EOS-80 gives the density. Along the mixing line this is within 0.03 kg m⁻³ of the straight
 * line (1 − φ) ρ_sea + φ ρ_river at 5–15 °C, so g′(φ) ≈ φ g′_fresh.
 *
 * @param freshwaterFraction - φ [–], 0…1
 * @param river - river end member (salinity 0…42, temperature −2…40 °C ITS-90)
 * @param sea - sea end member (salinity 0…42, temperature −2…40 °C ITS-90)
 * @returns mixture density at the surface [kg m⁻³]
 * @example
 * mixtureDensity(0.5, { salinity: 0, temperature: 10 }, { salinity: 34, temperature: 10 }); // ≈ 1012.95
 * Source: (c) derived: conservative mixing with EOS-80 (science.md §2.4, §8 #30).
 */
export function mixtureDensity(freshwaterFraction: number, river: EndMember, sea: EndMember): number {
  requireInRange('freshwaterFraction', freshwaterFraction, 0, 1, '');
  const salinity = (1 - freshwaterFraction) * sea.salinity + freshwaterFraction * river.salinity;
  const temperature = (1 - freshwaterFraction) * sea.temperature + freshwaterFraction * river.temperature;
  return seawaterDensity(salinity, temperature, 0);
}
