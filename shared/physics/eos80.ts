/**
 * @module shared/physics/eos80
 * UNESCO EOS-80 equation of state of seawater: one-atmosphere density, secant bulk modulus,
 * in-situ density, σ and specific-volume anomaly.
 *
 * (a) published: Fofonoff & Millard 1983, UNESCO Tech. Pap. Mar. Sci. 44; Millero & Poisson
 * 1981, Deep-Sea Res. 28A, 625–629 (one-atmosphere equation); Millero, Chen, Bradshaw &
 * Schleicher 1980, Deep-Sea Res. 27A, 255–264 (high pressure). Coefficients as printed in
 * science.md §2.1, which reproduce the UNESCO 44 p. 19 check table.
 *
 * Units: salinity S is practical salinity (PSS-78, dimensionless), temperature t68 is IPTS-68
 * [°C] unless a function says ITS-90, pressure is sea pressure in dbar (converted to bar
 * inside: P = p/10). Valid for 0 ≤ S ≤ 42, −2 ≤ t ≤ 40 °C, 0 ≤ p ≤ 10 000 dbar; pressures up
 * to 11 000 dbar are accepted as an extrapolation.
 */

import {
  ACCEPTED_MAX_PRESSURE_DBAR,
  EOS80_MAX_SALINITY,
  EOS80_MAX_TEMPERATURE,
  EOS80_MIN_SALINITY,
  EOS80_MIN_TEMPERATURE,
  ITS90_TO_IPTS68,
} from './constants';
import { requireInRange } from './check-argument';

/** Lowest IPTS-68 temperature accepted (the ITS-90 limit converted) [°C]. */
const MIN_T68 = EOS80_MIN_TEMPERATURE * ITS90_TO_IPTS68;
/** Highest IPTS-68 temperature accepted (the ITS-90 limit converted) [°C]. */
const MAX_T68 = EOS80_MAX_TEMPERATURE * ITS90_TO_IPTS68;

/**
 * Converts an ITS-90 temperature to the IPTS-68 scale used by EOS-80: t68 = 1.00024 · t90.
 *
 * @param t90 - temperature on ITS-90 [°C], finite
 * @returns temperature on IPTS-68 [°C]
 * @example
 * its90ToIpts68(10); // => 10.0024
 * Source: (a) published: science.md §2.1 (t68 = 1.00024 t90), §8 #10.
 */
export function its90ToIpts68(t90: number): number {
  if (typeof t90 !== 'number' || !Number.isFinite(t90)) {
    throw new RangeError(`t90 must be a finite temperature in °C (got ${String(t90)})`);
  }
  return ITS90_TO_IPTS68 * t90;
}

/**
 * Density of seawater at one standard atmosphere (sea pressure 0), EOS-80 ρ(S, t, 0).
 *
 * @param salinity - practical salinity, 0…42
 * @param temperature68 - temperature on IPTS-68 [°C], −2…40 (±0.01 for the scale conversion)
 * @returns density [kg m⁻³]
 * @example
 * surfaceDensityEos80(35, 25); // => 1023.34306 (UNESCO 44 check value)
 * Source: (a) published: Millero & Poisson 1981; UNESCO Tech. Pap. 44 (science.md §2.1).
 */
export function surfaceDensityEos80(salinity: number, temperature68: number): number {
  checkSalinityTemperature(salinity, temperature68);
  return oneAtmosphereDensity(salinity, temperature68);
}

/**
 * Secant bulk modulus K(S, t, P) of seawater, EOS-80.
 *
 * @param salinity - practical salinity, 0…42
 * @param temperature68 - temperature on IPTS-68 [°C], −2…40
 * @param pressureDbar - sea pressure [dbar], 0…11 000 (published validity 0…10 000)
 * @returns secant bulk modulus [bar]
 * @example
 * secantBulkModulus(0, 5, 0); // => 20337.80375
 * secantBulkModulus(35, 25, 10000); // => 27108.94504
 * Source: (a) published: Millero et al. 1980; UNESCO Tech. Pap. 44 (science.md §2.1).
 */
export function secantBulkModulus(salinity: number, temperature68: number, pressureDbar: number): number {
  checkSalinityTemperature(salinity, temperature68);
  checkPressure(pressureDbar);
  return bulkModulus(salinity, temperature68, pressureDbar / 10);
}

/**
 * In-situ density of seawater, EOS-80: ρ(S, t, P) = ρ(S, t, 0) / (1 − P/K(S, t, P)).
 *
 * @param salinity - practical salinity, 0…42
 * @param temperature68 - temperature on IPTS-68 [°C], −2…40
 * @param pressureDbar - sea pressure [dbar], 0…11 000 (published validity 0…10 000); default 0
 * @returns density [kg m⁻³]
 * @example
 * densityEos80(35, 25, 10000); // => 1062.53817 (UNESCO 44 check value)
 * Source: (a) published: Fofonoff & Millard 1983, UNESCO Tech. Pap. 44 (science.md §2.1).
 */
export function densityEos80(salinity: number, temperature68: number, pressureDbar = 0): number {
  checkSalinityTemperature(salinity, temperature68);
  checkPressure(pressureDbar);
  return inSituDensity(salinity, temperature68, pressureDbar);
}

/**
 * Density anomaly σ = ρ(S, t, p) − 1000, EOS-80.
 *
 * @param salinity - practical salinity, 0…42
 * @param temperature68 - temperature on IPTS-68 [°C], −2…40
 * @param pressureDbar - sea pressure [dbar], 0…11 000; default 0
 * @returns σ [kg m⁻³]
 * @example
 * sigmaEos80(40, 40, 10000); // => 59.82037 (UNESCO 44 check value)
 * Source: (a) published: UNESCO Tech. Pap. 44 (science.md §2.1, §8 #8).
 */
export function sigmaEos80(salinity: number, temperature68: number, pressureDbar = 0): number {
  return densityEos80(salinity, temperature68, pressureDbar) - 1000;
}

/**
 * Specific-volume anomaly SVAN = v(S, t, p) − v(35, 0, p), with v = 1/ρ, EOS-80.
 *
 * @param salinity - practical salinity, 0…42
 * @param temperature68 - temperature on IPTS-68 [°C], −2…40
 * @param pressureDbar - sea pressure [dbar], 0…11 000; default 0
 * @returns specific-volume anomaly [m³ kg⁻¹]
 * @example
 * specificVolumeAnomaly(40, 40, 10000); // => 9.813019e-6 (published 981.30210e-8, ±3e-12)
 * Source: (a) published: UNESCO Tech. Pap. 44 (science.md §2.1, §8 #9).
 */
export function specificVolumeAnomaly(salinity: number, temperature68: number, pressureDbar = 0): number {
  checkSalinityTemperature(salinity, temperature68);
  checkPressure(pressureDbar);
  return 1 / inSituDensity(salinity, temperature68, pressureDbar) - 1 / inSituDensity(35, 0, pressureDbar);
}

/**
 * In-situ density of seawater from an ITS-90 temperature (the temperature scale of the API
 * and of modern instruments): converts to IPTS-68, then applies EOS-80.
 *
 * @param salinity - practical salinity, 0…42
 * @param temperature90 - temperature on ITS-90 [°C], −2…40
 * @param pressureDbar - sea pressure [dbar], 0…11 000 (published validity 0…10 000); default 0
 * @returns density [kg m⁻³]
 * @example
 * seawaterDensity(34, 10); // => 1026.1711 (science.md §2.1 table)
 * Source: (a) published: EOS-80 (UNESCO Tech. Pap. 44) with t68 = 1.00024 t90; the check
 * value is (c) computed, science.md §8 #11.
 */
export function seawaterDensity(salinity: number, temperature90: number, pressureDbar = 0): number {
  requireInRange('temperature', temperature90, EOS80_MIN_TEMPERATURE, EOS80_MAX_TEMPERATURE, '°C (ITS-90)');
  return densityEos80(salinity, its90ToIpts68(temperature90), pressureDbar);
}

/** @private Range checks shared by every public function. */
function checkSalinityTemperature(salinity: number, temperature68: number): void {
  requireInRange('salinity', salinity, EOS80_MIN_SALINITY, EOS80_MAX_SALINITY, '(practical salinity)');
  requireInRange('temperature68', temperature68, MIN_T68, MAX_T68, '°C (IPTS-68)');
}

/** @private Pressure range check. */
function checkPressure(pressureDbar: number): void {
  requireInRange('pressureDbar', pressureDbar, 0, ACCEPTED_MAX_PRESSURE_DBAR, 'dbar');
}

/** @private ρ(S, t, 0) [kg m⁻³], no range checks. */
function oneAtmosphereDensity(s: number, t: number): number {
  const rhoW =
    999.842594 +
    t * (6.793952e-2 + t * (-9.09529e-3 + t * (1.001685e-4 + t * (-1.120083e-6 + t * 6.536332e-9))));
  const a = 8.24493e-1 + t * (-4.0899e-3 + t * (7.6438e-5 + t * (-8.2467e-7 + t * 5.3875e-9)));
  const b = -5.72466e-3 + t * (1.0227e-4 + t * -1.6546e-6);
  const c = 4.8314e-4;
  return rhoW + a * s + b * s * Math.sqrt(s) + c * s * s;
}

/** @private K(S, t, P) [bar] with P in bar, no range checks. */
function bulkModulus(s: number, t: number, p: number): number {
  const s15 = s * Math.sqrt(s);
  const kw = 19652.21 + t * (148.4206 + t * (-2.327105 + t * (1.360477e-2 + t * -5.155288e-5)));
  const k0 =
    kw +
    (54.6746 + t * (-0.603459 + t * (1.09987e-2 + t * -6.167e-5))) * s +
    (7.944e-2 + t * (1.6483e-2 + t * -5.3009e-4)) * s15;
  const aw = 3.239908 + t * (1.43713e-3 + t * (1.16092e-4 + t * -5.77905e-7));
  const ap = aw + (2.2838e-3 + t * (-1.0981e-5 + t * -1.6078e-6)) * s + 1.91075e-4 * s15;
  const bw = 8.50935e-5 + t * (-6.12293e-6 + t * 5.2787e-8);
  const bp = bw + (-9.9348e-7 + t * (2.0816e-8 + t * 9.1697e-10)) * s;
  return k0 + ap * p + bp * p * p;
}

/** @private ρ(S, t, p) [kg m⁻³] with p in dbar, no range checks. */
function inSituDensity(s: number, t: number, pressureDbar: number): number {
  const rho0 = oneAtmosphereDensity(s, t);
  if (pressureDbar === 0) return rho0;
  const p = pressureDbar / 10;
  return rho0 / (1 - p / bulkModulus(s, t, p));
}
