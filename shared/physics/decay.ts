/**
 * @module shared/physics/decay
 * First-order die-off of faecal indicator bacteria: k = ln10/T90, C/C0 = exp(−k t), a
 * day/night weighted rate, and Mancini's (1978) dark rate.
 *
 * Units are SI: T90 and t in seconds, k in s⁻¹ (multiply by 3600 for h⁻¹, 86 400 for d⁻¹).
 */

import {
  LN10,
  MANCINI_FRESH_RATE_PER_DAY,
  MANCINI_SEAWATER_RATE_PER_DAY_PERCENT,
  MANCINI_TEMPERATURE_FACTOR,
  SECONDS_PER_DAY,
} from './constants';
import { requireInRange, requireNonNegative, requirePositive } from './check-argument';

/**
 * First-order decay rate from the time to 90 % reduction: k = ln10/T90.
 *
 * @param t90 - T90 [s], > 0
 * @returns k [s⁻¹]
 * @example
 * decayRate(6 * 3600) * 3600; // => 0.38376 h⁻¹
 * Source: (c) common practice: first-order decay, science.md §5.1, §8 #31.
 */
export function decayRate(t90: number): number {
  return LN10 / requirePositive('t90', t90, 's');
}

/**
 * T90 from a first-order decay rate: T90 = ln10/k.
 *
 * @param rate - k [s⁻¹], > 0
 * @returns T90 [s]
 * @example
 * t90FromRate(1.4 / 86400) / 3600; // => 39.47 h
 * Source: (c) common practice: first-order decay, science.md §5.1.
 */
export function t90FromRate(rate: number): number {
  return LN10 / requirePositive('rate', rate, 's⁻¹');
}

/**
 * Surviving fraction after first-order decay, C/C0 = exp(−k t).
 *
 * @param rate - k [s⁻¹], ≥ 0
 * @param time - t [s], ≥ 0
 * @returns C/C0 [–], 0…1
 * @example
 * survivingFraction(decayRate(6 * 3600), 12 * 3600); // => 0.01
 * Source: (c) common practice: first-order decay, science.md §5.1, §8 #31.
 */
export function survivingFraction(rate: number, time: number): number {
  requireNonNegative('rate', rate, 's⁻¹');
  requireNonNegative('time', time, 's');
  return Math.exp(-rate * time);
}

/** Inputs of {@link dielDecayRate}. */
export interface DielDecayInput {
  /** Daytime T90 [s], > 0. */
  readonly t90Day: number;
  /** Night-time T90 [s], > 0. */
  readonly t90Night: number;
  /** Fraction of the day in daylight [–], 0…1 (e.g. 0.5 for 12 h of light). */
  readonly daylightFraction: number;
}

/**
 * Day/night averaged decay rate: the time-weighted mean of the two rates,
 * k = d · ln10/T90_day + (1 − d) · ln10/T90_night, with d the daylight fraction. Over whole
 * days this gives exactly the log-survival of alternating day and night decay; over parts of
 * a day it spreads the sunlit decay evenly (no clock is used).
 *
 * @param input - { t90Day [s] > 0, t90Night [s] > 0, daylightFraction 0…1 }
 * @returns k [s⁻¹]
 * @example
 * dielDecayRate({ t90Day: 6 * 3600, t90Night: 48 * 3600, daylightFraction: 0.5 }) * 3600; // => 0.21588 h⁻¹
 * Source: (c) common practice: "two static day-time and night-time T90 values" (a, Kay et al.
 * 2005 abstract), daylight-hours weighting derived here; science.md §5.1–§5.2.
 */
export function dielDecayRate(input: DielDecayInput): number {
  const kDay = decayRate(input.t90Day);
  const kNight = decayRate(input.t90Night);
  const d = requireInRange('daylightFraction', input.daylightFraction, 0, 1, '');
  return d * kDay + (1 - d) * kNight;
}

/**
 * Mancini (1978) dark die-off rate of coliforms:
 * k [d⁻¹] = (0.8 + 0.006 P_sw) · 1.07^(T − 20), returned in s⁻¹. The sunlight term α·I of the
 * full formula is left out (dark rate).
 *
 * @param percentSeawater - P_sw [%], 0…100
 * @param temperature - water temperature [°C], −2…40
 * @returns k [s⁻¹]
 * @example
 * manciniDarkDecayRate(100, 20) * 86400; // => 1.4 d⁻¹ (T90 ≈ 39.5 h)
 * manciniDarkDecayRate(0, 20) * 86400; // => 0.8 d⁻¹ (T90 ≈ 69.1 h)
 * Source: (b) from memory: Mancini 1978, J. Water Pollut. Control Fed. 50, 2477–2484
 * (science.md §5.1, §8 #32).
 */
export function manciniDarkDecayRate(percentSeawater: number, temperature: number): number {
  requireInRange('percentSeawater', percentSeawater, 0, 100, '%');
  requireInRange('temperature', temperature, -2, 40, '°C');
  const perDay =
    (MANCINI_FRESH_RATE_PER_DAY + MANCINI_SEAWATER_RATE_PER_DAY_PERCENT * percentSeawater) *
    MANCINI_TEMPERATURE_FACTOR ** (temperature - 20);
  return perDay / SECONDS_PER_DAY;
}
