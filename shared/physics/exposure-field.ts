/**
 * @module shared/physics/exposure-field
 * Freshwater fraction, salinity and faecal indicator around a river mouth for one design flow
 * (science.md §0 item 7, §1.11, §5.1).
 *
 * Coordinates: s is the signed alongshore distance from the mouth [m]: s > 0 down-coast, the
 * way the coastal current turns (right of the outflow in the northern hemisphere, left in the
 * southern, science.md §1.1), s < 0 up-coast; x ≥ 0 is the offshore distance from the coast [m].
 *
 * Field model (science.md §1.11; labels as there):
 * - (a) Bulge, the steady cyclostrophic disc of Yankovsky & Chapman 1997 (§1.6): radius
 *   R_b = y_s/2, centred at s = 0 and x = R_b, so it touches the coast at the mouth. Inside it a
 *   lens profile φ_lens(r) = φ0·(1 − (r/R_b)²), r from the disc centre (c, the §1.11 choice).
 *   Because the bulge grows with the inflow, a point between the mouth and the disc centre would
 *   see the lens thin as the disc grew past it; the field there keeps the freshest value of the
 *   lens over all bulge sizes up to R_b, φ0·x²/(s² + x²), where that is larger (c, derived: the
 *   maximum over R ≤ R_b of φ0(2x/R − (s² + x²)/R²), reached at R = (s² + x²)/x). So the bulge
 *   fraction never falls as the flow rises, and it never rises away from the mouth along a ray.
 * - (b) Coastal current, s ≥ 0 only (the current does not go up-coast, §1.1, §1.8): freshwater
 *   transport is conserved while the current entrains sea water at w_e = E·U0 over its width, so
 *   φ_coast(s) = φ0/(1 + s/L_e) with L_e = (a/φ0)·H0/E, a = 2/3 the zero-PV shape factor
 *   (c, derived in §1.11); across the current the zero-PV parabola (§1.4):
 *   φ_cc(s, x) = φ_coast(s)·(1 − (x/W0)²) for x < W0, 0 beyond, and 0 beyond the reach.
 * - The field is the larger of the two: φ = max(φ_b, φ_cc). It is continuous wherever the bulge
 *   meets the coastal current (both parts are continuous for s > 0). Up-coast (s < 0) only the
 *   bulge counts, so beyond the bulge that river contributes nothing; on the coast line itself the
 *   field jumps at the mouth (the current starts there, the up-coast shore gets none).
 * - At the equator (regime 'equatorial-jet') there is no bulge or current: a half-disc of
 *   radius r = plume.width, φ = φ0/(1 + |s|/L_e)·(1 − (x/X)²), X(s) = √(r² − s²).
 * - Salinity S = (1 − φ) S_ocean + φ S_river (§2.4).
 * - Indicator C = C_river·max(φ_b·e^(−k t_b), φ_cc·e^(−k t_cc)) (§5.1), with the travel times
 *   t_cc = s/speed along the current and t_b = √(s² + x²)/speed from the mouth into the bulge;
 *   speed = the nose speed (default; the arrival speed of flood water, the shorter travel time
 *   and so the more cautious concentration) or the mean speed U0; k from the day/night T90s.
 * Every part grows with the flow at a fixed point: y_s with the inflow velocity v_i = Q/(L h0)
 * (§1.6), H0 ∝ Q^½ so L_e ∝ Q^½, W0 ∝ Q^¼, the nose speed ∝ Q^¼ (so less decay on the way) and the
 * reach with the speed and the flood duration. (A power-law river indicator C = a·Q^b with b < 0
 * is the one input that can make the indicator fall with flow.)
 */

import { DEFAULT_DAYLIGHT_FRACTION, SECONDS_PER_HOUR, ZERO_PV_SHAPE_FACTOR } from './constants';
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
  /** H0, coastal-current depth at the coast [m] (radial-jet thickness at the equator), > 0. */
  readonly depth: number;
  /** W0, coastal-current width [m] (radial-jet radius at the equator), > 0. */
  readonly width: number;
  /** U0, mean speed [m s⁻¹], > 0. */
  readonly meanSpeed: number;
  /** Nose speed [m s⁻¹], > 0. */
  readonly noseSpeed: number;
  /** y_s, bulge offshore extent (diameter) [m], > 0. */
  readonly bulgeOffshoreExtent: number;
  /** Alongshore reach of the coastal current [m]; absent = no cut-off. */
  readonly reach?: number;
}

/** Field parameters, SI units. */
export interface ExposureParameters {
  /** Sea (ocean) practical salinity, 0…42, > riverSalinity. */
  readonly seaSalinity: number;
  /** River practical salinity, 0…42. */
  readonly riverSalinity: number;
  /** Entrainment coefficient E of the coastal current [–], > 0 (science.md §1.11). */
  readonly entrainmentCoefficient: number;
  /** First-order decay rate k of the indicator [s⁻¹], ≥ 0. */
  readonly decayRate: number;
  /** Indicator concentration in flood water C_river [per 100 mL], ≥ 0. */
  readonly riverIndicator: number;
  /** Freshwater fraction φ0 leaving the mouth [–], 0…1; default 1 (undiluted river water). */
  readonly sourceFreshwaterFraction?: number;
  /** Speed for the travel time t = distance/speed: 'nose' (default) or 'mean'. */
  readonly travelSpeed?: 'nose' | 'mean';
}

/** River settings in user units (the shape of the river-parameters schema). */
export interface RiverExposureSettings {
  /** E [–], > 0. */
  readonly entrainmentCoefficient: number;
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
 * @param settings - entrainment coefficient [–], T90 day/night [h], daylight fraction, indicator spec
 * @param water - { seaSalinity, riverSalinity } practical salinities
 * @param discharge - design discharge Q [m³ s⁻¹], > 0, for the indicator power law
 * @returns parameters for {@link fieldAt} and friends
 * @example
 * exposureParameters({ entrainmentCoefficient: 3e-5, t90DayHours: 6, t90NightHours: 48, indicator: { kind: 'constant', concentration: 1e4 } },
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
    entrainmentCoefficient: requirePositive('entrainmentCoefficient', settings.entrainmentCoefficient, ''),
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
 * Dilution length of the coastal current, L_e = (a/φ0)·H0/E: the distance down-coast over which
 * entrainment halves the freshwater fraction at the coast, φ_coast(s) = φ0/(1 + s/L_e).
 *
 * @param plume - plume scales (H0 = plume.depth [m])
 * @param params - field parameters (E, φ0)
 * @returns L_e [m]; Infinity when φ0 = 0
 * @example
 * // science.md §1.11 check: H0 = 0.9716 m (the §1.10 river, Δρ = 20, F_cc = 1), φ0 = 1, E = 3e-5
 * dilutionLength({ ...plume, depth: 0.9716 }, { ...params, entrainmentCoefficient: 3e-5 }); // => 21 591 m
 * Source: (c) derived, science.md §1.11: freshwater transport φ·Q_plume = F_cc·Q is conserved while
 * dQ_plume/ds = E·U0·W0, so L_e = F_cc·Q/(φ0·E·U0·W0) = (a/φ0)·H0/E with a = Q_cc/(U0·W0·H0) = 2/3
 * for the zero-PV parabola (§1.4); H0 = (2|f|Q_cc/g′)^½ (§1.3), so L_e ∝ Q^½ at fixed g′ and f.
 */
export function dilutionLength(plume: FieldPlume, params: ExposureParameters): number {
  const depth = requirePositive('plume.depth', plume.depth, 'm');
  const e = requirePositive('entrainmentCoefficient', params.entrainmentCoefficient, '');
  const phi0 = params.sourceFreshwaterFraction ?? 1;
  return phi0 > 0 ? (ZERO_PV_SHAPE_FACTOR * depth) / (phi0 * e) : Number.POSITIVE_INFINITY;
}

/**
 * Freshwater fraction of the bulge alone at (s, x): the lens φ0(1 − (r/R_b)²) of the disc of
 * radius R_b = y_s/2 centred at (0, R_b), or, between the mouth and the centre, the freshest
 * value that lens took while the bulge grew to R_b, φ0·x²/(s² + x²) (module comment, (a)).
 * Zero outside the disc and at the equator.
 *
 * @param plume - plume scales
 * @param params - field parameters (φ0)
 * @param along - s [m], signed
 * @param offshore - x [m], ≥ 0
 * @returns φ_b [–]
 * @example
 * bulgeFraction(plume, params, 0, plume.bulgeOffshoreExtent / 2); // => φ0 (the disc centre)
 * bulgeFraction(plume, params, -plume.bulgeOffshoreExtent, 100); // => 0 (up-coast beyond the bulge)
 * Source: disc (a) Yankovsky & Chapman 1997 via science.md §1.6; lens profile (c) science.md §1.11;
 * growth envelope (c) derived here (module comment).
 */
export function bulgeFraction(plume: FieldPlume, params: ExposureParameters, along: number, offshore: number): number {
  if (plume.regime === 'equatorial-jet') return 0;
  const phi0 = params.sourceFreshwaterFraction ?? 1;
  const rb = plume.bulgeOffshoreExtent / 2;
  const x = offshore;
  const d2 = along * along + x * x;
  if (d2 === 0) return phi0;
  if (x <= 0 || d2 >= 2 * x * rb) return 0;
  if (rb * x <= d2) return phi0 * ((2 * x) / rb - d2 / (rb * rb));
  return (phi0 * x * x) / d2;
}

/**
 * Freshwater fraction of the coastal current alone at (s, x): φ0/(1 + s/L_e)·(1 − (x/W0)²) for
 * 0 ≤ s ≤ reach and x < W0; 0 up-coast (s < 0), beyond the reach and beyond the front. At the
 * equator the half-disc of radius r: φ0/(1 + |s|/L_e)·(1 − (x/X)²), X = √(r² − s²).
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param along - s [m], signed
 * @param offshore - x [m], ≥ 0
 * @returns φ_cc [–]
 * @example
 * currentFraction(plume, params, dilutionLength(plume, params), 0); // => φ0/2
 * Source: (c) derived, science.md §1.11 (dilution) and §1.4 (zero-PV parabola); see the module comment.
 */
export function currentFraction(plume: FieldPlume, params: ExposureParameters, along: number, offshore: number): number {
  const coast = coastFraction(plume, params, along);
  if (coast <= 0) return 0;
  const extent = currentExtent(plume, along);
  if (extent <= 0) return 0;
  const ratio = offshore / extent;
  return ratio < 1 ? coast * (1 - ratio * ratio) : 0;
}

/**
 * Offshore extent of any river water at alongshore position s: the larger of the coastal
 * current's width (0 ≤ s ≤ reach) and the bulge disc's far edge (|s| ≤ R_b), or the half-disc
 * edge at the equator.
 *
 * @param plume - plume scales
 * @param along - s [m], signed
 * @returns X(s) [m]
 * @example
 * plumeOffshoreExtent(plume, 0); // => max(W0, y_s)
 * plumeOffshoreExtent(plume, -2 * plume.bulgeOffshoreExtent); // => 0
 * Source: (c) derived: geometry of this module (see module comment).
 */
export function plumeOffshoreExtent(plume: FieldPlume, along: number): number {
  requireFinite('along', along);
  checkPlume(plume);
  const current = currentExtent(plume, along);
  if (plume.regime === 'equatorial-jet') return current;
  const rb = plume.bulgeOffshoreExtent / 2;
  const bulgeEdge = Math.abs(along) <= rb ? rb + Math.sqrt(rb * rb - along * along) : 0;
  return Math.max(current, bulgeEdge);
}

/**
 * Freshwater fraction, salinity and indicator concentration at one point.
 *
 * @param plume - plume scales ({@link FieldPlume}, e.g. a {@link PlumeResult})
 * @param params - field parameters ({@link ExposureParameters})
 * @param along - s, signed alongshore distance from the mouth [m] (> 0 down-coast, < 0 up-coast)
 * @param offshore - x, offshore distance from the coast [m], ≥ 0
 * @returns { freshwaterFraction, salinity, indicator }
 * @example
 * fieldAt(plume, params, 0, 0); // => { freshwaterFraction: 1, salinity: 0, indicator: 1e4 }
 * fieldAt(plume, params, -3 * plume.bulgeOffshoreExtent, 500); // => { freshwaterFraction: 0, salinity: S_ocean, indicator: 0 }
 * Source: (c) derived: science.md §1.11 (bulge, dilution), §2.4 (mixing line), §5.1 (C = φ C_river e^(−kt));
 * geometry and profile choices documented in the module comment.
 */
export function fieldAt(plume: FieldPlume, params: ExposureParameters, along: number, offshore: number): FieldValue {
  requireFinite('along', along);
  requireNonNegative('offshore', offshore, 'm');
  checkPlume(plume);
  checkParams(params);
  const phiB = bulgeFraction(plume, params, along, offshore);
  const phiC = currentFraction(plume, params, along, offshore);
  const phi = Math.max(phiB, phiC);
  const k = params.decayRate;
  const speed = travelSpeed(plume, params);
  const survivalC = phiC > 0 ? Math.exp((-k * Math.abs(along)) / speed) : 0;
  const survivalB = phiB > 0 ? Math.exp((-k * Math.hypot(along, offshore)) / speed) : 0;
  return {
    freshwaterFraction: phi,
    salinity: (1 - phi) * params.seaSalinity + phi * params.riverSalinity,
    indicator: params.riverIndicator * Math.max(phiB * survivalB, phiC * survivalC),
  };
}

/**
 * The worst point of a set of points (e.g. a lease polygon's vertices and edge points): the one
 * with the highest freshwater fraction, and separately the one with the highest indicator.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param points - [{ s, x }] in metres (s signed, x ≥ 0; negative x is taken as 0)
 * @returns { field: lowest salinity / highest φ and highest indicator over the points, at: { s, x } of the freshest point }
 * @example
 * worstField(plume, params, [{ s: 6000, x: 500 }, { s: 6300, x: 800 }]).field.salinity; // => S at (6000, 500)
 * Source: (c) common practice: a site is judged at its most exposed point.
 */
export function worstField(
  plume: FieldPlume,
  params: ExposureParameters,
  points: readonly { readonly s: number; readonly x: number }[],
): { field: FieldValue; at: { s: number; x: number } } {
  if (points.length === 0) throw new RangeError('worstField needs at least one point');
  let best: FieldValue | null = null;
  let at = points[0];
  let indicator = 0;
  for (const p of points) {
    const v = fieldAt(plume, params, p.s, Math.max(0, p.x));
    if (best === null || v.freshwaterFraction > best.freshwaterFraction) {
      best = v;
      at = p;
    }
    indicator = Math.max(indicator, v.indicator);
  }
  const field = best as FieldValue;
  return { field: { ...field, indicator }, at: { s: at.s, x: Math.max(0, at.x) } };
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
 * Offshore distance at alongshore position s out to which the coastal current meets the
 * threshold (the edge of the current's band, measured from the coast): the x where φ_cc equals
 * the threshold. Returns 0 up-coast (s < 0), beyond the reach, or when the threshold is not met
 * even at the coast, and the current's width when it is met everywhere up to the front. Solved
 * analytically. The bulge's part of a band is {@link bulgeEdgeDistance}; a band is the union.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param along - s [m], signed
 * @param threshold - { salinityBelow } | { indicatorAbove } | { presenceAbove }
 * @returns offshore distance [m], 0…W0
 * @example
 * offshoreDistanceWhere(plume, params, 5000, { salinityBelow: 20 }); // => metres from the coast where S = 20
 * Source: (c) derived: inversion of φ_cc(s, x) = φ_coast(s) (1 − (x/X)²) (module comment).
 */
export function offshoreDistanceWhere(
  plume: FieldPlume,
  params: ExposureParameters,
  along: number,
  threshold: FieldThreshold,
): number {
  requireFinite('along', along);
  checkPlume(plume);
  checkParams(params);
  const phiCoast = coastFraction(plume, params, along);
  const extent = currentExtent(plume, along);
  if (phiCoast <= 0 || extent <= 0) return 0;
  const survival = Math.exp((-params.decayRate * Math.abs(along)) / travelSpeed(plume, params));
  const phiThreshold = thresholdFraction(params, survival, threshold);
  if (phiThreshold <= 0) return extent;
  if (phiThreshold >= phiCoast) return 0;
  return extent * Math.sqrt(1 - phiThreshold / phiCoast);
}

/**
 * Distance from the mouth, along a ray at angle θ from the outflow axis, out to which the bulge
 * meets the threshold. Along every such ray the bulge field never rises away from the mouth
 * (module comment), so each band's bulge part is the star-shaped region {d ≤ D(θ)} seen from the
 * mouth. Solved analytically for salinity and presence, by bisection for the indicator.
 *
 * @param plume - plume scales
 * @param params - field parameters
 * @param angle - θ [rad], −π/2…π/2; positive towards down-coast (s = d sin θ, x = d cos θ)
 * @param threshold - { salinityBelow } | { indicatorAbove } | { presenceAbove }
 * @returns D(θ) [m], 0…y_s cos θ
 * @example
 * bulgeEdgeDistance(plume, params, 0, { presenceAbove: 0 }); // => y_s (the disc's far edge on the axis)
 * Source: (c) derived: level sets of the bulge field of this module.
 */
export function bulgeEdgeDistance(
  plume: FieldPlume,
  params: ExposureParameters,
  angle: number,
  threshold: FieldThreshold,
): number {
  requireInRange('angle', angle, -Math.PI / 2, Math.PI / 2, 'rad');
  checkPlume(plume);
  checkParams(params);
  if (plume.regime === 'equatorial-jet') return 0;
  const phi0 = params.sourceFreshwaterFraction ?? 1;
  const rb = plume.bulgeOffshoreExtent / 2;
  const c = Math.cos(angle);
  const outer = 2 * rb * c;
  if (phi0 <= 0 || outer <= 0) return 0;
  const speed = travelSpeed(plume, params);
  const phiAt = (d: number) => bulgeFraction(plume, params, d * Math.sin(angle), d * c);
  if ('indicatorAbove' in threshold && threshold.indicatorAbove !== undefined) {
    const limit = requirePositive('indicatorAbove', threshold.indicatorAbove, 'per 100 mL');
    const value = (d: number) => params.riverIndicator * phiAt(d) * Math.exp((-params.decayRate * d) / speed);
    if (!(value(1e-9 * outer) > limit)) return 0;
    let lo = 1e-9 * outer;
    let hi = outer;
    for (let i = 0; i < 60 && hi - lo > 1e-3; i += 1) {
      const mid = (lo + hi) / 2;
      if (value(mid) > limit) lo = mid;
      else hi = mid;
    }
    return lo;
  }
  const t = thresholdFraction(params, 1, threshold);
  if (t <= 0) return outer;
  // On the ray: φ = φ0 cos²θ for d ≤ R_b cos θ (the growth envelope), then the lens
  // φ0 (2 d cos θ/R_b − d²/R_b²), falling to 0 at d = 2 R_b cos θ.
  if (t >= phi0 * c * c) return 0;
  // Lens root: d² − 2 R_b cos θ d + R_b² t/φ0 = 0, the larger root.
  return rb * (c + Math.sqrt(c * c - t / phi0));
}

/** Options of {@link sampleField}. */
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
 * Default alongshore extent down-coast for sampling: the reach when known, else the larger of the
 * bulge diameter and 20 dilution lengths (where φ_coast has fallen under 5 % of φ0), or the
 * radius at the equator.
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
  const le = dilutionLength(plume, params);
  return Math.max(plume.bulgeOffshoreExtent, Number.isFinite(le) ? 19 * le : plume.bulgeOffshoreExtent);
}

/**
 * Samples the three fields on a regular grid along (s ≥ 0, down-coast) × across.
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
    const rowPhi: number[] = [];
    const rowS: number[] = [];
    const rowC: number[] = [];
    for (const xj of across) {
      const value = fieldAt(plume, params, si, xj);
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
 * The coastal current's band edge along the coast: offshore distance where the threshold is
 * met, at evenly spaced alongshore distances down-coast of the mouth.
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

/** @private Offshore extent of the coastal current at s (the half-disc at the equator); 0 up-coast and beyond the reach. */
function currentExtent(plume: FieldPlume, along: number): number {
  if (plume.regime === 'equatorial-jet') {
    const r = plume.width;
    const a = Math.abs(along);
    if (plume.reach !== undefined && a > plume.reach) return 0;
    return a >= r ? 0 : Math.sqrt(r * r - a * a);
  }
  if (along < 0) return 0;
  if (plume.reach !== undefined && along > plume.reach) return 0;
  return plume.width;
}

/** @private φ_coast(s) = φ0/(1 + s/L_e) for 0 ≤ s ≤ reach (|s| at the equator), else 0. */
function coastFraction(plume: FieldPlume, params: ExposureParameters, along: number): number {
  const a = plume.regime === 'equatorial-jet' ? Math.abs(along) : along;
  if (a < 0) return 0;
  if (plume.reach !== undefined && a > plume.reach) return 0;
  const phi0 = params.sourceFreshwaterFraction ?? 1;
  const le = dilutionLength(plume, params);
  return Number.isFinite(le) ? phi0 / (1 + a / le) : phi0;
}

/** @private The travel speed [m s⁻¹]. */
function travelSpeed(plume: FieldPlume, params: ExposureParameters): number {
  return params.travelSpeed === 'mean' ? plume.meanSpeed : plume.noseSpeed;
}

/** @private The freshwater fraction equivalent to a threshold, given the surviving indicator share. */
function thresholdFraction(params: ExposureParameters, survival: number, threshold: FieldThreshold): number {
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
    const atSource = params.riverIndicator * survival;
    return atSource > 0 ? c / atSource : Infinity;
  }
  if ('presenceAbove' in threshold) {
    return requireInRange('presenceAbove', threshold.presenceAbove, 0, 1, '');
  }
  throw new RangeError('threshold must have exactly one of salinityBelow, indicatorAbove or presenceAbove');
}

/** @private Checks the plume scales the fields use. */
function checkPlume(plume: FieldPlume): void {
  requirePositive('plume.depth', plume.depth, 'm');
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
  requirePositive('entrainmentCoefficient', params.entrainmentCoefficient, '');
  requireNonNegative('decayRate', params.decayRate, 's⁻¹');
  requireNonNegative('riverIndicator', params.riverIndicator, 'per 100 mL');
  if (params.sourceFreshwaterFraction !== undefined) {
    requireInRange('sourceFreshwaterFraction', params.sourceFreshwaterFraction, 0, 1, '');
  }
}

/** @private A finite number check. */
function requireFinite(name: string, value: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new RangeError(`${name} must be a finite number of metres (got ${String(value)})`);
  return value;
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
