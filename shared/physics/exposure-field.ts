/**
 * @module shared/physics/exposure-field
 * Freshwater fraction, salinity and faecal indicator along and across a river plume for one
 * design flow (science.md §0 item 7, §5.1).
 *
 * Coordinates: s is the alongshore distance downcoast from the mouth [m], s ≥ 0; x is the
 * offshore distance from the coast [m], x ≥ 0.
 *
 * Field model (c, derived / chosen here):
 * - Along the coast the source freshwater fraction φ0 decays with an entrainment e-folding
 *   length L (mixingLength): φ_coast(s) = φ0 · exp(−s/L).
 * - Across the plume φ follows the parabolic thickness profile of the zero-PV current,
 *   h(x)/H0 = 1 − (x/X)²: φ(s, x) = φ_coast(s) · (1 − (x/X(s))²) for x < X(s), 0 beyond.
 * - The offshore extent X(s) is the larger of the coastal-current width W0 (constant along
 *   the coast) and the bulge: a disc of diameter y_s touching the coast at the mouth, whose
 *   offshore edge at s ≤ y_s/2 is y_s/2 + √((y_s/2)² − s²). At the equator (regime
 *   'equatorial-jet') X(s) is the half-disc of radius r = plume.width: √(r² − s²).
 * - Beyond the reach (s > reach, when a flood duration gave one) φ = 0.
 * - Salinity S = (1 − φ) S_ocean + φ S_river.
 * - Indicator C = φ · C_river · exp(−k t) with t = s/speed, speed = the nose speed (default;
 *   the arrival speed of flood water, which gives the shorter travel time and so the higher,
 *   more cautious concentration) or the mean speed U0; k from the day/night T90s.
 * The thresholds of {@link offshoreDistanceWhere} are solved analytically.
 */

import { DEFAULT_DAYLIGHT_FRACTION, SECONDS_PER_HOUR } from './constants';
import { dielDecayRate } from './decay';
import { requireInRange, requireNonNegative, requirePositive } from './check-argument';
import type { PlumeRegime } from './plume-regime';

/** Concentration of faecal indicator in flood water: a constant, or a power law of flow C = a·Q^b. */
export type IndicatorSpec =
  | {
      /** A constant concentration. */
      readonly kind: 'constant';
      /** C_river [CFU or MPN per 100 mL], ≥ 0. */
      readonly concentration: number;
    }
  | {
      /** C = a·Q^b with Q in m³ s⁻¹. */
      readonly kind: 'power-law';
      /** a [CFU or MPN per 100 mL per (m³ s⁻¹)^b], ≥ 0. */
      readonly coefficient: number;
      /** b [–], −5…5. */
      readonly exponent: number;
    };

/**
 * Indicator concentration in flood water for a discharge.
 *
 * @param spec - constant { concentration } or power law { coefficient a, exponent b }
 * @param discharge - river discharge Q [m³ s⁻¹], > 0
 * @returns C_river [CFU or MPN per 100 mL]
 * @example
 * floodIndicatorConcentration({ kind: 'constant', concentration: 1e4 }, 900); // => 10000
 * floodIndicatorConcentration({ kind: 'power-law', coefficient: 10, exponent: 1 }, 900); // => 9000
 * Source: (c) common practice: screening defaults of science.md §5.3 (10⁴ E. coli/100 mL for
 * mixed rural catchments); a rating-curve power law is a common regression form.
 */
export function floodIndicatorConcentration(spec: IndicatorSpec, discharge: number): number {
  requirePositive('discharge', discharge, 'm³ s⁻¹');
  if (spec.kind === 'constant') {
    return requireNonNegative('indicator concentration', spec.concentration, 'per 100 mL');
  }
  if (spec.kind === 'power-law') {
    const a = requireNonNegative('indicator coefficient', spec.coefficient, 'per 100 mL');
    const b = requireInRange('indicator exponent', spec.exponent, -5, 5, '');
    return a * discharge ** b;
  }
  throw new RangeError(`indicator kind must be 'constant' or 'power-law'`);
}

/** The plume scales the fields need (a subset of {@link PlumeResult}). Lengths m, speeds m s⁻¹. */
export interface FieldPlume {
  /** Regime; 'equatorial-jet' switches to the half-disc geometry. */
  readonly regime: PlumeRegime;
  /** W0, coastal-current width [m] (radial-jet radius at the equator), > 0. */
  readonly width: number;
  /** U0, mean speed [m s⁻¹], > 0. */
  readonly meanSpeed: number;
  /** Nose speed [m s⁻¹], > 0. */
  readonly noseSpeed: number;
  /** y_s, bulge offshore extent (diameter) [m], > 0. */
  readonly bulgeOffshoreExtent: number;
  /** Alongshore reach [m]; absent = no cut-off. */
  readonly reach?: number;
}

/** Field parameters, SI units. */
export interface ExposureParameters {
  /** Sea (ocean) practical salinity, 0…42, > riverSalinity. */
  readonly seaSalinity: number;
  /** River practical salinity, 0…42. */
  readonly riverSalinity: number;
  /** Alongshore e-folding length L of the freshwater fraction [m], > 0. */
  readonly mixingLength: number;
  /** First-order decay rate k of the indicator [s⁻¹], ≥ 0. */
  readonly decayRate: number;
  /** Indicator concentration in flood water C_river [per 100 mL], ≥ 0. */
  readonly riverIndicator: number;
  /** Freshwater fraction φ0 leaving the mouth [–], 0…1; default 1 (undiluted river water). */
  readonly sourceFreshwaterFraction?: number;
  /** Speed for the travel time t = s/speed: 'nose' (default) or 'mean'. */
  readonly travelSpeed?: 'nose' | 'mean';
}

/** River settings in user units (the shape of the river-parameters schema). */
export interface RiverExposureSettings {
  /** L [m], > 0. */
  readonly mixingLength: number;
  /** Daytime T90 [h], > 0. */
  readonly t90DayHours: number;
  /** Night-time T90 [h], > 0. */
  readonly t90NightHours: number;
  /** Daylight fraction [–], 0…1; default 0.5. */
  readonly daylightFraction?: number;
  /** Indicator concentration in flood water. */
  readonly indicator: IndicatorSpec;
}

/**
 * Builds SI field parameters from river settings in user units (T90 in hours) and the water.
 *
 * @param settings - mixing length [m], T90 day/night [h], daylight fraction, indicator spec
 * @param water - { seaSalinity, riverSalinity } practical salinities
 * @param discharge - design discharge Q [m³ s⁻¹], > 0, for the indicator power law
 * @returns parameters for {@link fieldAt} and friends
 * @example
 * exposureParameters({ mixingLength: 30000, t90DayHours: 6, t90NightHours: 48, indicator: { kind: 'constant', concentration: 1e4 } },
 *   { seaSalinity: 34, riverSalinity: 0 }, 900).decayRate; // => 5.996e-5 s⁻¹ (0.21588 h⁻¹)
 * Source: (c) common practice: unit conversion; decay weighting as in {@link dielDecayRate}.
 */
export function exposureParameters(
  settings: RiverExposureSettings,
  water: { readonly seaSalinity: number; readonly riverSalinity: number },
  discharge: number,
): ExposureParameters {
  return {
    seaSalinity: water.seaSalinity,
    riverSalinity: water.riverSalinity,
    mixingLength: requirePositive('mixingLength', settings.mixingLength, 'm'),
    decayRate: dielDecayRate({
      t90Day: requirePositive('t90DayHours', settings.t90DayHours, 'h') * SECONDS_PER_HOUR,
      t90Night: requirePositive('t90NightHours', settings.t90NightHours, 'h') * SECONDS_PER_HOUR,
      daylightFraction: settings.daylightFraction ?? DEFAULT_DAYLIGHT_FRACTION,
    }),
    riverIndicator: floodIndicatorConcentration(settings.indicator, discharge),
  };
}

/** Values of the fields at one point. */
export interface FieldValue {
  /** φ [–], 0…1. */
  readonly freshwaterFraction: number;
  /** Practical salinity. */
  readonly salinity: number;
  /** Indicator concentration [per 100 mL]. */
  readonly indicator: number;
}

/**
 * Offshore extent of the plume X(s) at alongshore distance s: the larger of the coastal
 * current width and the bulge edge (or the half-disc edge at the equator); 0 beyond the reach.
 *
 * @param plume - plume scales
 * @param along - s [m], ≥ 0
 * @returns X(s) [m]
 * @example
 * plumeOffshoreExtent(plume, 0); // => max(W0, y_s)
 * Source: (c) derived: geometry of this module (see module comment).
 */
export function plumeOffshoreExtent(plume: FieldPlume, along: number): number {
  requireNonNegative('along', along, 'm');
  checkPlume(plume);
  if (plume.reach !== undefined && along > plume.reach) return 0;
  if (plume.regime === 'equatorial-jet') {
    const r = plume.width;
    return along >= r ? 0 : Math.sqrt(r * r - along * along);
  }
  const rb = plume.bulgeOffshoreExtent / 2;
  const bulgeEdge = along <= rb ? rb + Math.sqrt(rb * rb - along * along) : 0;
  return Math.max(plume.width, bulgeEdge);
}

/**
 * Freshwater fraction, salinity and indicator concentration at one point.
 *
 * @param plume - plume scales ({@link FieldPlume}, e.g. a {@link PlumeResult})
 * @param params - field parameters ({@link ExposureParameters})
 * @param along - s, alongshore distance downcoast from the mouth [m], ≥ 0
 * @param offshore - x, offshore distance from the coast [m], ≥ 0
 * @returns { freshwaterFraction, salinity, indicator }
 * @example
 * fieldAt(plume, params, 0, 0); // => { freshwaterFraction: 1, salinity: 0, indicator: 1e4 }
 * Source: (c) derived: science.md §0 item 7, §2.4 (mixing line), §5.1 (C = φ C_river e^(−kt));
 * geometry and profile choices documented in the module comment.
 */
export function fieldAt(plume: FieldPlume, params: ExposureParameters, along: number, offshore: number): FieldValue {
  requireNonNegative('offshore', offshore, 'm');
  return valueAt(rowFactors(plume, params, along), params, offshore);
}

/** A threshold for {@link offshoreDistanceWhere}: exactly one of the three forms. */
export type FieldThreshold =
  | {
      /** Salinity below this value (practical salinity). */
      readonly salinityBelow: number;
    }
  | {
      /** Indicator concentration above this value [per 100 mL], > 0. */
      readonly indicatorAbove: number;
    }
  | {
      /** Freshwater fraction above this value [–], 0…1. */
      readonly presenceAbove: number;
    };

/**
 * Offshore distance at alongshore distance s out to which the threshold is met (the band
 * edge): the x where the field equals the threshold. Returns 0 when the threshold is not met
 * even at the coast (or s is beyond the reach), and the plume's offshore extent X(s) when it
 * is met everywhere up to the front. Solved analytically.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param along - s [m], ≥ 0
 * @param threshold - { salinityBelow } | { indicatorAbove } | { presenceAbove }
 * @returns offshore distance [m], 0…X(s)
 * @example
 * offshoreDistanceWhere(plume, params, 5000, { salinityBelow: 20 }); // => metres from the coast where S = 20
 * Source: (c) derived: inversion of φ(s, x) = φ_coast(s) (1 − (x/X)²) (module comment).
 */
export function offshoreDistanceWhere(
  plume: FieldPlume,
  params: ExposureParameters,
  along: number,
  threshold: FieldThreshold,
): number {
  const phiCoast = coastFraction(plume, params, along);
  const extent = plumeOffshoreExtent(plume, along);
  if (phiCoast <= 0 || extent <= 0) return 0;
  const phiThreshold = thresholdFraction(plume, params, along, threshold);
  if (phiThreshold <= 0) return extent;
  if (phiThreshold >= phiCoast) return 0;
  return extent * Math.sqrt(1 - phiThreshold / phiCoast);
}

/** Options of {@link sampleField} and {@link bandProfile}. */
export interface SampleOptions {
  /** Number of points along the coast (inclusive of 0 and the extent), ≥ 2. */
  readonly alongSteps: number;
  /** Number of points across (inclusive of 0 and the extent), ≥ 2. */
  readonly acrossSteps: number;
  /** Alongshore extent [m], > 0; default {@link defaultAlongExtent}. */
  readonly alongExtent?: number;
  /** Offshore extent [m], > 0; default X(0), the widest point of the plume. */
  readonly acrossExtent?: number;
}

/** A sampled field; value arrays are indexed [along index][across index]. */
export interface SampledField {
  /** s, alongshore distance of each row [m]. */
  readonly s: number[];
  /** x, offshore distance of each column [m]. */
  readonly x: number[];
  /** φ [–]. */
  readonly freshwaterFraction: number[][];
  /** Practical salinity. */
  readonly salinity: number[][];
  /** Indicator [per 100 mL]. */
  readonly indicator: number[][];
}

/**
 * Default alongshore extent for sampling: the reach when known, else the larger of the bulge
 * radius and three mixing lengths (where φ_coast has fallen to 5 %), or the radius at the
 * equator.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @returns extent [m]
 * @example
 * defaultAlongExtent({ ...plume, reach: 40000 }, params); // => 40000
 * Source: (c) common practice.
 */
export function defaultAlongExtent(plume: FieldPlume, params: ExposureParameters): number {
  checkPlume(plume);
  if (plume.reach !== undefined && plume.reach > 0) return plume.reach;
  if (plume.regime === 'equatorial-jet') return plume.width;
  return Math.max(plume.bulgeOffshoreExtent / 2, 3 * requirePositive('mixingLength', params.mixingLength, 'm'));
}

/**
 * Samples the three fields on a regular grid along × across.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param options - { alongSteps ≥ 2, acrossSteps ≥ 2, alongExtent?, acrossExtent? }
 * @returns grid coordinates [m] and the fields, indexed [along][across]
 * @example
 * sampleField(plume, params, { alongSteps: 200, acrossSteps: 50 }).salinity[0][0]; // => S at the mouth, on the coast
 * Source: (c) derived: evaluates {@link fieldAt} on a grid.
 */
export function sampleField(plume: FieldPlume, params: ExposureParameters, options: SampleOptions): SampledField {
  const along = grid('alongSteps', options.alongSteps, options.alongExtent ?? defaultAlongExtent(plume, params));
  const across = grid('acrossSteps', options.acrossSteps, options.acrossExtent ?? plumeOffshoreExtent(plume, 0));
  const freshwaterFraction: number[][] = [];
  const salinity: number[][] = [];
  const indicator: number[][] = [];
  for (const si of along) {
    const row = rowFactors(plume, params, si);
    const rowPhi: number[] = [];
    const rowS: number[] = [];
    const rowC: number[] = [];
    for (const xj of across) {
      const value = valueAt(row, params, xj);
      rowPhi.push(value.freshwaterFraction);
      rowS.push(value.salinity);
      rowC.push(value.indicator);
    }
    freshwaterFraction.push(rowPhi);
    salinity.push(rowS);
    indicator.push(rowC);
  }
  return { s: along, x: across, freshwaterFraction, salinity, indicator };
}

/** One point of a band edge. */
export interface BandPoint {
  /** s, alongshore distance from the mouth [m]. */
  readonly s: number;
  /** Offshore distance of the band edge [m]. */
  readonly offshore: number;
}

/**
 * The band edge along the coast: offshore distance where the threshold is met, at evenly
 * spaced alongshore distances from the mouth.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param threshold - { salinityBelow } | { indicatorAbove } | { presenceAbove }
 * @param alongSteps - number of points (inclusive of 0 and the extent), ≥ 2
 * @param alongExtent - alongshore extent [m], > 0; default {@link defaultAlongExtent}
 * @returns [{ s, offshore }] in metres
 * @example
 * bandProfile(plume, params, { salinityBelow: 15 }, 100); // => [{ s: 0, offshore: … }, …]
 * Source: (c) derived: {@link offshoreDistanceWhere} at each point.
 */
export function bandProfile(
  plume: FieldPlume,
  params: ExposureParameters,
  threshold: FieldThreshold,
  alongSteps: number,
  alongExtent?: number,
): BandPoint[] {
  const along = grid('alongSteps', alongSteps, alongExtent ?? defaultAlongExtent(plume, params));
  return along.map((si) => ({ s: si, offshore: offshoreDistanceWhere(plume, params, si, threshold) }));
}

/** @private Quantities that depend on s only: φ_coast(s), X(s) and the surviving indicator fraction. */
interface RowFactors {
  readonly coast: number;
  readonly extent: number;
  readonly survival: number;
}

/** @private Computes the s-only factors once per alongshore position. */
function rowFactors(plume: FieldPlume, params: ExposureParameters, along: number): RowFactors {
  const coast = coastFraction(plume, params, along);
  return {
    coast,
    extent: plumeOffshoreExtent(plume, along),
    survival: Math.exp(-params.decayRate * travelTime(plume, params, along)),
  };
}

/** @private φ, S and C at offshore distance x from the row factors. */
function valueAt(row: RowFactors, params: ExposureParameters, offshore: number): FieldValue {
  const ratio = row.extent > 0 ? offshore / row.extent : 1;
  const phi = ratio < 1 ? row.coast * (1 - ratio * ratio) : 0;
  return {
    freshwaterFraction: phi,
    salinity: (1 - phi) * params.seaSalinity + phi * params.riverSalinity,
    indicator: phi * params.riverIndicator * row.survival,
  };
}

/** @private φ_coast(s) = φ0 exp(−s/L), 0 beyond the reach. */
function coastFraction(plume: FieldPlume, params: ExposureParameters, along: number): number {
  requireNonNegative('along', along, 'm');
  checkParams(params);
  if (plume.reach !== undefined && along > plume.reach) return 0;
  const phi0 = params.sourceFreshwaterFraction ?? 1;
  return phi0 * Math.exp(-along / params.mixingLength);
}

/** @private Travel time t = s/speed [s]. */
function travelTime(plume: FieldPlume, params: ExposureParameters, along: number): number {
  const speed = params.travelSpeed === 'mean' ? plume.meanSpeed : plume.noseSpeed;
  return along / speed;
}

/** @private The freshwater fraction equivalent to a threshold at s. */
function thresholdFraction(
  plume: FieldPlume,
  params: ExposureParameters,
  along: number,
  threshold: FieldThreshold,
): number {
  const keys = Object.keys(threshold).filter((k) => (threshold as Record<string, unknown>)[k] !== undefined);
  if (keys.length !== 1) {
    throw new RangeError('threshold must have exactly one of salinityBelow, indicatorAbove or presenceAbove');
  }
  if ('salinityBelow' in threshold) {
    const s = requireInRange('salinityBelow', threshold.salinityBelow, 0, 42, '(practical salinity)');
    if (!(params.seaSalinity > params.riverSalinity)) {
      throw new RangeError('seaSalinity must be greater than riverSalinity for a salinity threshold');
    }
    return (params.seaSalinity - s) / (params.seaSalinity - params.riverSalinity);
  }
  if ('indicatorAbove' in threshold) {
    const c = requirePositive('indicatorAbove', threshold.indicatorAbove, 'per 100 mL');
    const atSource = params.riverIndicator * Math.exp(-params.decayRate * travelTime(plume, params, along));
    return atSource > 0 ? c / atSource : Infinity;
  }
  if ('presenceAbove' in threshold) {
    return requireInRange('presenceAbove', threshold.presenceAbove, 0, 1, '');
  }
  throw new RangeError('threshold must have exactly one of salinityBelow, indicatorAbove or presenceAbove');
}

/** @private Checks the plume scales the fields use. */
function checkPlume(plume: FieldPlume): void {
  requirePositive('plume.width', plume.width, 'm');
  requirePositive('plume.meanSpeed', plume.meanSpeed, 'm s⁻¹');
  requirePositive('plume.noseSpeed', plume.noseSpeed, 'm s⁻¹');
  requirePositive('plume.bulgeOffshoreExtent', plume.bulgeOffshoreExtent, 'm');
  if (plume.reach !== undefined) requireNonNegative('plume.reach', plume.reach, 'm');
}

/** @private Checks the field parameters. */
function checkParams(params: ExposureParameters): void {
  requireInRange('seaSalinity', params.seaSalinity, 0, 42, '(practical salinity)');
  requireInRange('riverSalinity', params.riverSalinity, 0, 42, '(practical salinity)');
  requirePositive('mixingLength', params.mixingLength, 'm');
  requireNonNegative('decayRate', params.decayRate, 's⁻¹');
  requireNonNegative('riverIndicator', params.riverIndicator, 'per 100 mL');
  if (params.sourceFreshwaterFraction !== undefined) {
    requireInRange('sourceFreshwaterFraction', params.sourceFreshwaterFraction, 0, 1, '');
  }
}

/** @private n evenly spaced points from 0 to extent inclusive. */
function grid(name: string, steps: number, extent: number): number[] {
  if (!Number.isInteger(steps) || steps < 2 || steps > 100_000) {
    throw new RangeError(`${name} must be an integer between 2 and 100000 (got ${String(steps)})`);
  }
  requirePositive(`${name} extent`, extent, 'm');
  const out: number[] = [];
  for (let i = 0; i < steps; i += 1) out.push((extent * i) / (steps - 1));
  return out;
}
