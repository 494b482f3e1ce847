/**
 * @module shared/physics/reduced-gravity
 * Reduced gravity g′ = g Δρ/ρ0 of river (plume) water against sea (ambient) water.
 */

import { GRAVITY, REFERENCE_DENSITY } from './constants';
import { seawaterDensity } from './eos80';
import { requireNonNegative, requirePositive } from './check-argument';

/**
 * Reduced gravity from a density difference: g′ = g Δρ/ρ0.
 *
 * @param densityDifference - Δρ = ρ_ambient − ρ_plume [kg m⁻³], ≥ 0
 * @param referenceDensity - ρ0 [kg m⁻³], > 0; default 1025
 * @param gravity - g [m s⁻²], > 0; default 9.81
 * @returns g′ [m s⁻²]
 * @example
 * reducedGravity(20); // => 0.191415
 * reducedGravity(8); // => 0.076566
 * Source: (a) published: Hetland, Coastal Dynamics book draft, "River plume classification"
 * (science.md §1.2, §2.4); g = 9.81 and ρ0 = 1025 are (c) common practice; check values
 * (c), science.md §8 #18.
 */
export function reducedGravity(
  densityDifference: number,
  referenceDensity = REFERENCE_DENSITY,
  gravity = GRAVITY,
): number {
  requireNonNegative('densityDifference', densityDifference, 'kg m⁻³');
  requirePositive('referenceDensity', referenceDensity, 'kg m⁻³');
  requirePositive('gravity', gravity, 'm s⁻²');
  return (gravity * densityDifference) / referenceDensity;
}

/** River and sea water properties at the surface (practical salinity, ITS-90 °C). */
export interface WaterPair {
  /** River water practical salinity, 0…42. */
  readonly riverSalinity: number;
  /** River water temperature [°C, ITS-90], −2…40. */
  readonly riverTemperature: number;
  /** Sea (ambient) water practical salinity, 0…42. */
  readonly seaSalinity: number;
  /** Sea (ambient) water temperature [°C, ITS-90], −2…40. */
  readonly seaTemperature: number;
}

/** Densities and reduced gravity of a river/sea pair. */
export interface WaterReducedGravity {
  /** River water density at the surface [kg m⁻³]. */
  readonly riverDensity: number;
  /** Sea water density at the surface [kg m⁻³]. */
  readonly seaDensity: number;
  /** Δρ = ρ_sea − ρ_river [kg m⁻³], > 0. */
  readonly densityDifference: number;
  /** g′ [m s⁻²]. */
  readonly reducedGravity: number;
}

/**
 * Reduced gravity of river water against sea water, both at the surface (p = 0), with
 * densities from EOS-80. Throws when the river water is not lighter than the sea water,
 * because a surface plume then does not form.
 *
 * @param water - river and sea salinity (0…42) and ITS-90 temperature (−2…40 °C)
 * @param referenceDensity - ρ0 [kg m⁻³]; default 1025
 * @param gravity - g [m s⁻²]; default 9.81
 * @returns densities, Δρ and g′
 * @example
 * reducedGravityFromWater({ riverSalinity: 0, riverTemperature: 10, seaSalinity: 34, seaTemperature: 10 });
 * // => { riverDensity: 999.70, seaDensity: 1026.17, densityDifference: 26.47, reducedGravity: 0.2533 }
 * Source: (a) published: g′ = g Δρ/ρ0 (Hetland book) with EOS-80 densities (UNESCO Tech.
 * Pap. 44), science.md §0 item 1, §2.4.
 */
export function reducedGravityFromWater(
  water: WaterPair,
  referenceDensity = REFERENCE_DENSITY,
  gravity = GRAVITY,
): WaterReducedGravity {
  const riverDensity = seawaterDensity(water.riverSalinity, water.riverTemperature, 0);
  const seaDensity = seawaterDensity(water.seaSalinity, water.seaTemperature, 0);
  const densityDifference = seaDensity - riverDensity;
  if (!(densityDifference > 0)) {
    throw new RangeError(
      `river water must be lighter than sea water: river density ${riverDensity.toFixed(3)} kg m⁻³ ` +
        `is not below sea density ${seaDensity.toFixed(3)} kg m⁻³; check riverSalinity, riverTemperature, ` +
        'seaSalinity and seaTemperature',
    );
  }
  return {
    riverDensity,
    seaDensity,
    densityDifference,
    reducedGravity: reducedGravity(densityDifference, referenceDensity, gravity),
  };
}
