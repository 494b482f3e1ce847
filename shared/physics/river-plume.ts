/**
 * @module shared/physics/river-plume
 * The plume of one river at one flow from the river's settings, and the two profiles the river
 * page draws: across the coastal current (thickness and salinity against distance from the coast)
 * and along the coast (salinity and indicator against distance from the mouth). The server uses
 * it to build footprints and to answer the saved numbers; the browser uses it to preview unsaved
 * settings, so both show the same numbers.
 */

import type { IndicatorSpec } from './exposure-field';
import { type ExposureParameters, exposureParameters, fieldAt, defaultAlongExtent } from './exposure-field';
import { computePlume, type PlumeInput, type PlumeResult } from './compute-plume';
import { coastalCurrentThickness } from './coastal-current';
import {
  DEFAULT_ENTRAINMENT_COEFFICIENT,
  MAX_ENTRAINMENT_COEFFICIENT,
  MIN_ENTRAINMENT_COEFFICIENT,
  ZERO_PV_SHAPE_FACTOR,
} from './constants';

/** The river settings the plume needs (the shape of shared/schemas/river RiverSettings). */
export interface RiverPlumeSettings {
  readonly mouthLatitude: number;
  readonly mouthWidth: number;
  readonly mouthDepth: number;
  readonly shelfSlope?: number;
  readonly riverSalinity: number;
  readonly riverTemperature: number;
  readonly seaSalinity: number;
  readonly seaTemperature: number;
  readonly alongshoreShare: number;
  readonly entrainmentCoefficient: number;
  readonly t90DayHours: number;
  readonly t90NightHours: number;
  readonly daylightFraction?: number;
  readonly indicator: IndicatorSpec;
  readonly nearFieldFreshwaterFraction?: number;
}

/**
 * The inputs of {@link computePlume} for a river's settings at one flow (no flood duration, so no
 * alongshore cut-off unless the caller adds one).
 * Source: (c) a mapping of names; the physics is computePlume's.
 */
export function plumeInput(
  settings: Omit<RiverPlumeSettings, 'entrainmentCoefficient' | 't90DayHours' | 't90NightHours' | 'indicator'>,
  discharge: number,
  alongshoreShare = settings.alongshoreShare,
): PlumeInput {
  return {
    latitude: settings.mouthLatitude,
    discharge,
    riverSalinity: settings.riverSalinity,
    riverTemperature: settings.riverTemperature,
    seaSalinity: settings.seaSalinity,
    seaTemperature: settings.seaTemperature,
    mouthWidth: settings.mouthWidth,
    mouthDepth: settings.mouthDepth,
    shelfSlope: settings.shelfSlope,
    alongshoreShare,
  };
}

/**
 * The water and plume inputs of the engine for a river at one flow.
 *
 * @param settings - river settings with defaults filled in
 * @param flow - { discharge [m³ s⁻¹] > 0, durationHours [h] > 0 }
 * @returns the plume scales and the exposure-field parameters
 * @example
 * riverPlume(settings, { discharge: 650, durationHours: 72 }).plume.regime; // => 'surface-advected'
 * Source: (c) derived: the chain of {@link computePlume} and {@link exposureParameters}.
 */
export function riverPlume(
  settings: RiverPlumeSettings,
  flow: { discharge: number; durationHours: number },
): { plume: PlumeResult; params: ExposureParameters } {
  const plume = computePlume({ ...plumeInput(settings, flow.discharge), floodDurationHours: flow.durationHours });
  const base = exposureParameters(
    {
      // (a river saved before the setting existed and not yet carried over at start-up takes the default)
      entrainmentCoefficient: settings.entrainmentCoefficient ?? DEFAULT_ENTRAINMENT_COEFFICIENT,
      t90DayHours: settings.t90DayHours,
      t90NightHours: settings.t90NightHours,
      daylightFraction: settings.daylightFraction,
      indicator: settings.indicator,
    },
    { seaSalinity: settings.seaSalinity, riverSalinity: settings.riverSalinity },
    flow.discharge,
  );
  const params: ExposureParameters = { ...base, sourceFreshwaterFraction: settings.nearFieldFreshwaterFraction ?? 1 };
  return { plume, params };
}

/** One point of the cross-shore profile. */
export interface CrossShorePoint {
  /** Distance from the coast [km]. */
  readonly offshoreKm: number;
  /** Thickness of the fresh layer [m]; null at the equator (no rotating current). */
  readonly thickness: number | null;
  /** Practical salinity at the surface. */
  readonly salinity: number;
}

/** One point of the alongshore profile, on the coast. */
export interface AlongshorePoint {
  /** Distance downcoast from the mouth [km]. */
  readonly alongKm: number;
  /** Practical salinity. */
  readonly salinity: number;
  /** Indicator concentration [per 100 mL]. */
  readonly indicator: number;
}

/** The two profiles of {@link plumeProfiles}. */
export interface PlumeProfiles {
  /** Where the cross-shore section is taken, downcoast of the mouth [km]. */
  readonly sectionAlongKm: number;
  readonly crossShore: CrossShorePoint[];
  readonly alongshore: AlongshorePoint[];
}

/**
 * Cross-shore and alongshore profiles of a plume. The cross-shore section is taken one bulge
 * diameter (y_s) downcoast of the mouth, where the coastal current has left the bulge; it runs
 * from the coast to 1.25 × the plume's offshore extent there. The alongshore profile follows the
 * coast from the mouth to the reach (or three mixing lengths without one).
 *
 * @param plume - plume scales from {@link riverPlume}
 * @param params - field parameters from {@link riverPlume}
 * @param steps - points per profile, ≥ 2 (default 60)
 * @returns the section position and both profiles, distances in km
 * @example
 * plumeProfiles(plume, params).crossShore[0]; // => { offshoreKm: 0, thickness: H0, salinity: S at the coast }
 * Source: (c) derived: thickness h = H0 (1 − (x/W0)²) (science.md §1.4), fields of exposure-field.ts.
 */
export function plumeProfiles(plume: PlumeResult, params: ExposureParameters, steps = 60): PlumeProfiles {
  const n = Math.max(2, Math.floor(steps));
  const rotating = plume.regime !== 'equatorial-jet';
  const section = rotating ? plume.bulgeOffshoreExtent : 0;
  const reachCut = plume.reach !== undefined && section > plume.reach ? plume.reach : section;
  const extent = Math.max(plume.width, 1);
  const crossShore: CrossShorePoint[] = [];
  for (let i = 0; i < n; i++) {
    const x = (1.25 * extent * i) / (n - 1);
    crossShore.push({
      offshoreKm: x / 1000,
      thickness: rotating ? coastalCurrentThickness(x, plume) : null,
      salinity: fieldAt(plume, params, reachCut, x).salinity,
    });
  }
  const alongExtent = defaultAlongExtent(plume, params);
  const alongshore: AlongshorePoint[] = [];
  for (let i = 0; i < n; i++) {
    const s = (alongExtent * i) / (n - 1);
    const v = fieldAt(plume, params, s, 0);
    alongshore.push({ alongKm: s / 1000, salinity: v.salinity, indicator: v.indicator });
  }
  return { sectionAlongKm: reachCut / 1000, crossShore, alongshore };
}

/**
 * The entrainment coefficient E that gives a river the dilution length L_e it had as a fixed
 * "mixing length" at a reference flow: E = (a/φ0)·H0(Q_ref)/L_e, clamped to the allowed range.
 * Used to carry settings saved before the dilution length followed the flow (science.md §1.11).
 *
 * @param settings - river settings (mouth, water, alongshore share, φ0)
 * @param dilutionLengthM - the old fixed length [m], > 0
 * @param referenceDischarge - Q_ref [m³ s⁻¹], > 0: the flow at which the old length should hold
 *   (the median annual peak of the river's record is the natural choice: the floods it screened)
 * @returns E [–], within MIN_ENTRAINMENT_COEFFICIENT…MAX_ENTRAINMENT_COEFFICIENT
 * @example
 * entrainmentForDilutionLength(settings, 25000, 450); // => (2/3)·H0(450 m³/s)/(φ0·25000)
 * Source: (c) derived: inversion of L_e = (a/φ0)·H0/E (science.md §1.11), a = 2/3.
 */
export function entrainmentForDilutionLength(
  settings: Omit<RiverPlumeSettings, 'entrainmentCoefficient' | 't90DayHours' | 't90NightHours' | 'indicator'>,
  dilutionLengthM: number,
  referenceDischarge: number,
): number {
  if (!(dilutionLengthM > 0) || !Number.isFinite(dilutionLengthM)) throw new RangeError(`dilution length must be > 0 m (got ${String(dilutionLengthM)})`);
  const plume = computePlume(plumeInput(settings, referenceDischarge));
  const phi0 = settings.nearFieldFreshwaterFraction ?? 1;
  const e = (ZERO_PV_SHAPE_FACTOR * plume.depth) / (Math.max(phi0, 1e-6) * dilutionLengthM);
  return Number(Math.min(MAX_ENTRAINMENT_COEFFICIENT, Math.max(MIN_ENTRAINMENT_COEFFICIENT, e)).toPrecision(4));
}
