/**
 * @module shared/physics/compute-plume
 * The whole plume chain of science.md §0 items 1–6 for one river and one flow: water
 * densities → g′ and f → bulge (y_s, h_b) and regime → coastal current (H0, W0, U0, c_w) →
 * slope correction (c_p, W_p) → reach, with plain-English warnings where the inputs break the
 * model's assumptions (science.md §1.9).
 *
 * Which discharge each scale uses:
 * - the bulge (y_s, via v_i = Q/(L h0)), h_b, the regime, the Kelvin/Froude/Rossby numbers
 *   and the equatorial radial spread use the whole river discharge Q;
 * - the coastal current (H0, W0, U0, c_w, R) and the slope scales (c_p, W_p) use the
 *   coastal-current share Q_cc = F_cc · Q (science.md §1.6), F_cc = alongshoreShare.
 */

import { bulge } from './bulge';
import { coastalCurrent } from './coastal-current';
import {
  DEFAULT_ALONGSHORE_SHARE,
  EOS80_MAX_SALINITY,
  EOS80_MAX_TEMPERATURE,
  EOS80_MIN_TEMPERATURE,
  EQUATORIAL_CUTOFF_DEGREES,
  GRAVITY,
  LENTZ_HELFRICH_MAX_SPEED_RATIO,
  LOW_LATITUDE_WARNING_DEGREES,
  MAX_ALONGSHORE_SHARE,
  MIN_ALONGSHORE_SHARE,
  RADIAL_REFERENCE_TIME,
  REFERENCE_DENSITY,
  SECONDS_PER_HOUR,
  TINY_DISCHARGE,
  WEAK_DENSITY_DIFFERENCE,
} from './constants';
import { coriolisParameter, type TurningSide, turningSide } from './coriolis';
import { requireInRange, requirePositive } from './check-argument';
import { kelvinNumber } from './plume-numbers';
import { classifyPlumeRegime, type PlumeRegime } from './plume-regime';
import { radialSpread } from './radial-jet';
import { reducedGravityFromWater } from './reduced-gravity';
import { slopeCurrent } from './slope-current';

/**
 * Inputs of {@link computePlume}. Give either the four water properties (riverSalinity,
 * riverTemperature, seaSalinity, seaTemperature) or reducedGravity, not both.
 */
export interface PlumeInput {
  /** Latitude of the mouth [degrees], −90…90. */
  readonly latitude: number;
  /** River discharge Q [m³ s⁻¹], > 0. */
  readonly discharge: number;
  /** River water practical salinity, 0…42. */
  readonly riverSalinity?: number;
  /** River water temperature [°C, ITS-90], −2…40. */
  readonly riverTemperature?: number;
  /** Sea water practical salinity, 0…42. */
  readonly seaSalinity?: number;
  /** Sea water temperature [°C, ITS-90], −2…40. */
  readonly seaTemperature?: number;
  /** Mouth width L [m], > 0. */
  readonly mouthWidth: number;
  /** Mouth (inflow) depth h0 [m], > 0. */
  readonly mouthDepth: number;
  /** Bottom slope off the mouth α [–], 0…0.5; absent or 0 = unknown (vertical-wall limit used). */
  readonly shelfSlope?: number;
  /** Share of Q carried into the coastal current F_cc [–], 0.3…1; default 0.6. */
  readonly alongshoreShare?: number;
  /** Flood duration for the reach [h], > 0; absent = no reach. */
  readonly floodDurationHours?: number;
  /** g′ [m s⁻²], > 0, given directly instead of the four water properties. */
  readonly reducedGravity?: number;
}

/** Result of {@link computePlume}. Lengths in m, speeds in m s⁻¹. */
export interface PlumeResult {
  /** f [s⁻¹], signed (negative in the southern hemisphere). */
  readonly coriolis: number;
  /** g′ [m s⁻²]. */
  readonly reducedGravity: number;
  /** Δρ = g′ρ0/g [kg m⁻³]. */
  readonly densityDifference: number;
  /** River water surface density [kg m⁻³] (absent when g′ was given). */
  readonly riverDensity?: number;
  /** Sea water surface density [kg m⁻³] (absent when g′ was given). */
  readonly seaDensity?: number;
  /** Plume regime. */
  readonly regime: PlumeRegime;
  /** H0, coastal-current depth at the coast (from Q_cc) [m]; radial-jet thickness at the equator. */
  readonly depth: number;
  /** W0, zero-PV coastal-current width (from Q_cc) [m]; radial-jet radius at the equator. */
  readonly width: number;
  /** U0, area-mean speed of the coastal current (from Q_cc) [m s⁻¹]; mean front speed at the equator. */
  readonly meanSpeed: number;
  /** Nose speed: c_p on a known slope, else c_w (from Q_cc) [m s⁻¹]; radial front speed at the equator. */
  readonly noseSpeed: number;
  /** c_w, wall-limit nose speed (from Q_cc) [m s⁻¹] (absent at the equator). */
  readonly wallNoseSpeed?: number;
  /** c_α = αg′/|f| [m s⁻¹], when a slope is known. */
  readonly slopeSpeed?: number;
  /** W_p, Lentz & Helfrich width (from Q_cc) [m], when a slope is known. */
  readonly slopeWidth?: number;
  /** y_s, offshore distance of the bulge's surface front (from Q) [m]; radial-jet radius at the equator. */
  readonly bulgeOffshoreExtent: number;
  /** h_b, bottom-attachment depth (from Q) [m]; radial-jet thickness at the equator. */
  readonly bottomAttachmentDepth: number;
  /** h_b/α, offshore distance of the h_b isobath [m], when known. */
  readonly bottomFrontDistance?: number;
  /** Alongshore reach after the flood, noseSpeed × duration [m]; radius at the equator. */
  readonly reach?: number;
  /** Side of the outflow (looking seaward) to which the plume turns. */
  readonly turnsTo: TurningSide;
  /** R = c_w/|f| = √(g′H0)/|f| [m]; null where f = 0. */
  readonly deformationRadius: number | null;
  /** Kelvin number of the mouth, L|f|/√(g′h0) [–]. */
  readonly kelvinNumber: number;
  /** Froude number of the mouth, v_i/√(g′h0) [–]. */
  readonly froudeNumber: number;
  /** Rossby number of the mouth, v_i/(|f| L) [–]; null where f = 0. */
  readonly rossbyNumber: number | null;
  /** v_i = Q/(L h0) [m s⁻¹]. */
  readonly inflowVelocity: number;
  /** F_cc used [–]. */
  readonly alongshoreShare: number;
  /** Q_cc = F_cc · Q [m³ s⁻¹]. */
  readonly alongshoreDischarge: number;
  /** Plain-English list of the model assumptions these inputs break. */
  readonly warnings: string[];
  /** Plain-English list of the assumptions every result rests on. */
  readonly assumptions: string[];
}

const WATER_KEYS = ['riverSalinity', 'riverTemperature', 'seaSalinity', 'seaTemperature'] as const;

/**
 * Runs the whole plume chain for one river and one flow.
 *
 * @param input - see {@link PlumeInput}; SI units except floodDurationHours [h]
 * @returns scales, regime, side, dimensionless numbers, warnings and assumptions
 * @example
 * computePlume({ latitude: 43.5, discharge: 900, reducedGravity: 0.191415, mouthWidth: 1500,
 *   mouthDepth: 6, shelfSlope: 2e-3, alongshoreShare: 1 });
 * // => { regime: 'surface-advected', depth: 0.9716, width: 6075.1, noseSpeed: 0.3874, turnsTo: 'right', … }
 * Source: chain of science.md §0; each scale carries its own label: g′ (a) Hetland book,
 * EOS-80 (a) UNESCO 44, f (a), y_s and h_b (a) Yankovsky & Chapman 1997, H0/W0/U0 (c) derived,
 * c_w, c_p, W_p (a) Lentz & Helfrich 2002, F_cc (b) from memory, reach (c), radial jet (c).
 */
export function computePlume(input: PlumeInput): PlumeResult {
  requireInRange('latitude', input.latitude, -90, 90, 'degrees');
  const discharge = requirePositive('discharge', input.discharge, 'm³ s⁻¹');
  const mouthWidth = requirePositive('mouthWidth', input.mouthWidth, 'm');
  const mouthDepth = requirePositive('mouthDepth', input.mouthDepth, 'm');
  const shelfSlope = input.shelfSlope ?? 0;
  requireInRange('shelfSlope', shelfSlope, 0, 0.5, '');
  const share = input.alongshoreShare ?? DEFAULT_ALONGSHORE_SHARE;
  requireInRange('alongshoreShare', share, MIN_ALONGSHORE_SHARE, MAX_ALONGSHORE_SHARE, '');
  if (input.floodDurationHours !== undefined) requirePositive('floodDurationHours', input.floodDurationHours, 'h');

  const warnings: string[] = [];
  const assumptions: string[] = [
    'The plume is a surface layer over deep sea water at rest: no wind, tides or ambient currents.',
    'No mixing with sea water on the way: the density difference stays constant (dilution in the exposure fields is a separate parameter).',
    'Straight coast.',
    'Speeds and widths are scalings with order-one coefficients: treat them as ±50 %.',
  ];

  const water = resolveBuoyancy(input, assumptions);
  const coriolis = coriolisParameter(input.latitude);
  const turnsTo = turningSide(input.latitude);
  const f = Math.abs(coriolis);
  const gp = water.reducedGravity;
  const inflowVelocity = discharge / (mouthWidth * mouthDepth);
  const mouthWaveSpeed = Math.sqrt(gp * mouthDepth);
  const froude = inflowVelocity / mouthWaveSpeed;
  const kelvin = kelvinNumber(mouthWidth, gp, mouthDepth, coriolis);
  const rossby = f > 0 ? inflowVelocity / (f * mouthWidth) : null;
  const alongshoreDischarge = share * discharge;
  const durationSeconds =
    input.floodDurationHours === undefined ? undefined : input.floodDurationHours * SECONDS_PER_HOUR;

  addCommonWarnings(warnings, { discharge, densityDifference: water.densityDifference, froude });

  const common = {
    coriolis,
    reducedGravity: gp,
    densityDifference: water.densityDifference,
    ...(water.riverDensity === undefined ? {} : { riverDensity: water.riverDensity, seaDensity: water.seaDensity }),
    turnsTo,
    kelvinNumber: kelvin,
    froudeNumber: froude,
    rossbyNumber: rossby,
    inflowVelocity,
    alongshoreShare: share,
    alongshoreDischarge,
    warnings,
    assumptions,
  };

  if (Math.abs(input.latitude) < EQUATORIAL_CUTOFF_DEGREES) {
    const time = durationSeconds ?? RADIAL_REFERENCE_TIME;
    const spread = radialSpread({ discharge, reducedGravity: gp, time });
    warnings.unshift(
      `Latitude ${fmt(input.latitude)}° is within ${EQUATORIAL_CUTOFF_DEGREES}° of the equator: the Earth's rotation ` +
        'is too weak to turn the plume into a coastal current. The numbers are a rough non-rotating estimate of ' +
        'fresh water spreading as a half-disc from the mouth, not the rotating plume model.',
    );
    assumptions.push(
      `Equatorial fallback: the whole discharge spreads as a half-disc with a critical front (Froude number 1), ` +
        `evaluated after ${fmt(time / SECONDS_PER_HOUR)} h${durationSeconds === undefined ? ' (no flood duration given; one day assumed)' : ''}. ` +
        'Depth and bottom-attachment depth are the layer thickness, width and bulge extent the radius.',
    );
    return {
      ...common,
      regime: 'equatorial-jet',
      depth: spread.thickness,
      width: spread.radius,
      meanSpeed: spread.meanFrontSpeed,
      noseSpeed: spread.frontSpeed,
      bulgeOffshoreExtent: spread.radius,
      bottomAttachmentDepth: spread.thickness,
      ...(durationSeconds === undefined ? {} : { reach: spread.radius }),
      deformationRadius: f > 0 ? Math.sqrt(gp * spread.thickness) / f : null,
    };
  }

  const mouth = bulge({ discharge, mouthWidth, mouthDepth, reducedGravity: gp, coriolis });
  const regime = classifyPlumeRegime({
    latitude: input.latitude,
    bottomAttachmentDepth: mouth.bottomAttachmentDepth,
    mouthDepth,
    bulgeOffshoreExtent: mouth.offshoreExtent,
    shelfSlope,
  });
  const current = coastalCurrent(alongshoreDischarge, gp, coriolis);
  const slope = shelfSlope > 0 ? slopeCurrent(alongshoreDischarge, gp, coriolis, shelfSlope) : undefined;
  const noseSpeed = slope ? slope.noseSpeed : current.wallNoseSpeed;

  assumptions.push(
    'Steady, hydrostatic flow; away from the mouth the current is in geostrophic balance with a constant Coriolis parameter.',
    'The coastal current flows downcoast only, never upcoast.',
  );
  if (Math.abs(input.latitude) < LOW_LATITUDE_WARNING_DEGREES) {
    warnings.push(
      `Latitude ${fmt(input.latitude)}° is within ${LOW_LATITUDE_WARNING_DEGREES}° of the equator: widths and the bulge ` +
        'size grow as 1/f there and are unreliable.',
    );
  }
  if (kelvin < 1) {
    warnings.push(
      `The mouth is narrow compared with the deformation radius (Kelvin number ${fmt(kelvin)} < 1): within a few km ` +
        'of the mouth the outflow is a jet steered by the mouth and the sea bed, and the rotating scales apply only ' +
        'from the bulge outward.',
    );
  }
  addRegimeWarnings(warnings, regime, mouth.bottomAttachmentDepth, mouthDepth, mouth.offshoreExtent);
  if (slope) {
    if (slope.speedRatio > 1) {
      warnings.push(
        `The shelf is gentle enough for the sea bed to control the current (c_w/c_α = ${fmt(slope.speedRatio)} > 1): ` +
          'it is bottom-trapped, wider and slower than a surface current.',
      );
    }
    if (slope.speedRatio > LENTZ_HELFRICH_MAX_SPEED_RATIO) {
      warnings.push(
        `c_w/c_α = ${fmt(slope.speedRatio)} is beyond the laboratory range (0.11–13.1) of the sloping-bottom ` +
          'scalings: the nose speed and width are extrapolated.',
      );
    }
    assumptions.push(
      `Nose speed and slope width follow the sloping-bottom scalings for a shelf slope of ${fmt(shelfSlope)}.`,
    );
  } else {
    assumptions.push(
      input.shelfSlope === 0
        ? 'A shelf slope of 0 cannot be used by the sloping-bottom scalings: the nose speed is the vertical-wall limit c_w, an upper bound.'
        : 'No shelf slope was given: the nose speed is the vertical-wall limit c_w, an upper bound.',
    );
  }
  assumptions.push(
    `A share of ${fmt(share)} of the discharge (${fmt(alongshoreDischarge)} m³/s) goes on into the coastal current; ` +
      'the rest stays in the bulge (a share recalled from published studies, not confirmed).',
    'Depth, width and mean speed are those of a current with zero potential vorticity (at rest at the coast).',
  );
  if (durationSeconds === undefined) {
    assumptions.push('No flood duration was given, so the reach along the coast was not computed.');
  } else {
    assumptions.push(
      `Reach is the nose speed times the flood duration (${fmt(input.floodDurationHours ?? 0)} h); the nose slows ` +
        'over long times, so this is an upper estimate.',
    );
  }

  return {
    ...common,
    regime: regime.regime,
    depth: current.depth,
    width: current.width,
    meanSpeed: current.meanSpeed,
    noseSpeed,
    wallNoseSpeed: current.wallNoseSpeed,
    ...(slope ? { slopeSpeed: slope.slopeSpeed, slopeWidth: slope.width } : {}),
    bulgeOffshoreExtent: mouth.offshoreExtent,
    bottomAttachmentDepth: mouth.bottomAttachmentDepth,
    ...(regime.bottomFrontDistance === undefined ? {} : { bottomFrontDistance: regime.bottomFrontDistance }),
    ...(durationSeconds === undefined ? {} : { reach: noseSpeed * durationSeconds }),
    deformationRadius: current.deformationRadius,
  };
}

/** @private g′ and densities from the input (either the four water properties or g′). */
function resolveBuoyancy(
  input: PlumeInput,
  assumptions: string[],
): { reducedGravity: number; densityDifference: number; riverDensity?: number; seaDensity?: number } {
  const given = WATER_KEYS.filter((key) => input[key] !== undefined);
  if (input.reducedGravity !== undefined) {
    if (given.length > 0) {
      throw new RangeError(
        'give either the four water properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) ' +
          `or reducedGravity, not both (got reducedGravity and ${given.join(', ')})`,
      );
    }
    const gp = requirePositive('reducedGravity', input.reducedGravity, 'm s⁻²');
    assumptions.push(`Reduced gravity was given directly (${fmt(gp)} m/s²); water densities were not computed.`);
    return { reducedGravity: gp, densityDifference: (gp * REFERENCE_DENSITY) / GRAVITY };
  }
  if (given.length !== WATER_KEYS.length) {
    const missing = WATER_KEYS.filter((key) => input[key] === undefined);
    throw new RangeError(
      'give either the four water properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) ' +
        `or reducedGravity (missing: ${missing.join(', ')})`,
    );
  }
  for (const key of ['riverSalinity', 'seaSalinity'] as const) {
    requireInRange(key, input[key] as number, 0, EOS80_MAX_SALINITY, '(practical salinity)');
  }
  for (const key of ['riverTemperature', 'seaTemperature'] as const) {
    requireInRange(key, input[key] as number, EOS80_MIN_TEMPERATURE, EOS80_MAX_TEMPERATURE, '°C (ITS-90)');
  }
  const pair = reducedGravityFromWater({
    riverSalinity: input.riverSalinity as number,
    riverTemperature: input.riverTemperature as number,
    seaSalinity: input.seaSalinity as number,
    seaTemperature: input.seaTemperature as number,
  });
  assumptions.push(
    `Densities from the UNESCO EOS-80 equation of state at the surface: river ${pair.riverDensity.toFixed(2)} kg/m³, ` +
      `sea ${pair.seaDensity.toFixed(2)} kg/m³; the river water leaves the mouth undiluted.`,
  );
  return pair;
}

/** @private Warnings that apply in every regime. */
function addCommonWarnings(
  warnings: string[],
  values: { discharge: number; densityDifference: number; froude: number },
): void {
  if (values.densityDifference < WEAK_DENSITY_DIFFERENCE) {
    warnings.push(
      `River and sea water differ in density by only ${fmt(values.densityDifference)} kg/m³ (under ` +
        `${WEAK_DENSITY_DIFFERENCE} kg/m³): the plume is barely buoyant, wind and tides will mix it quickly, and all ` +
        'numbers are very uncertain.',
    );
  }
  if (values.discharge < TINY_DISCHARGE) {
    warnings.push(
      `The discharge of ${fmt(values.discharge)} m³/s is very small (under ${TINY_DISCHARGE} m³/s): the plume would be ` +
        'only centimetres thick, and wind and tides dominate.',
    );
  }
  if (values.froude > 1) {
    warnings.push(
      `The outflow is supercritical at the mouth (Froude number ${fmt(values.froude)} > 1): a jet mixes strongly ` +
        'with sea water near the mouth, and the bulge formula assumes a Froude number of at most 1.',
    );
  }
}

/** @private Warnings for intermediate and bottom-advected plumes. */
function addRegimeWarnings(
  warnings: string[],
  regime: ReturnType<typeof classifyPlumeRegime>,
  hb: number,
  mouthDepth: number,
  ys: number,
): void {
  if (regime.regime === 'bottom-advected') {
    warnings.push(
      `The plume is bottom-advected: it stays in contact with the sea bed out to the ${fmt(hb)} m depth contour ` +
        `(${fmt((regime.bottomFrontDistance ?? 0) / 1000)} km offshore), beyond the bulge (${fmt(ys / 1000)} km). ` +
        'The surface-current depth, width and speeds are rough here; the real plume is wider and slower.',
    );
  } else if (regime.regime === 'intermediate') {
    warnings.push(
      `The plume touches the sea bed near the mouth (bottom-attachment depth ${fmt(hb)} m is not less than the ` +
        `mouth depth ${fmt(mouthDepth)} m) before spreading at the surface; near the mouth it is wider and slower ` +
        'than computed.',
    );
    if (!regime.resolved) {
      warnings.push(
        'No shelf slope was given, so an intermediate plume could not be told apart from a bottom-advected one.',
      );
    }
  }
}

/** @private Number formatting for messages: 4 significant figures, no exponent for ordinary sizes. */
function fmt(value: number): string {
  if (value === 0) return '0';
  const abs = Math.abs(value);
  if (abs >= 1e-3 && abs < 1e7) return String(Number(value.toPrecision(4)));
  return value.toExponential(3);
}
