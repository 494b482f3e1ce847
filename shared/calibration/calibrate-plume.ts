/**
 * @module shared/calibration/calibrate-plume
 * Thin adapter between the plume's exposure field (shared/physics/exposure-field) and the
 * generic calibration core (./fit-parameters): fits the entrainment coefficient E [–] (which sets
 * the flow-dependent dilution length L_e = (2/3)·H0/(φ0·E), science.md §1.11) and an
 * effective die-off T90 [h] to monitoring data (product.md §4 item 6).
 *
 * Each observation carries the plume scales and flood-water indicator concentration of its
 * own flow (the caller computes them with the plume model for the flow on the sample date),
 * and its place as alongshore and offshore distances from the mouth.
 *
 * The effective T90 is the single constant T90 whose rate k = ln10/T90 (science.md §5.1, (c))
 * equals the day/night-averaged rate the river settings use; a user who keeps separate day and
 * night T90s can scale both by the fitted ratio. Both parameters are searched on a log scale,
 * (c): they span orders of magnitude (science.md §5.2: T90 from under an hour to ~100 h).
 */

import { decayRate } from '../physics/decay';
import { type ExposureParameters, type FieldPlume, fieldAt } from '../physics/exposure-field';
import { type CalibrationObservation, type FitResult, type FitWeights, fitParameters, type Prediction } from './fit-parameters';

/** An observation placed in the plume's coordinates. */
export interface PlumeObservation extends CalibrationObservation {
  /** s, signed alongshore distance from the mouth, m (> 0 down-coast, < 0 up-coast). */
  readonly along: number;
  /** x, offshore distance from the coast, m, ≥ 0. */
  readonly offshore: number;
  /** Plume scales at this observation's flow. */
  readonly plume: FieldPlume;
  /** Indicator concentration in flood water at this flow, per 100 mL, ≥ 0. */
  readonly riverIndicator: number;
}

/** Start and bounds of one parameter. */
export interface PlumeParameterBounds {
  readonly initial: number;
  /** > 0 (log-scale search). */
  readonly min: number;
  readonly max: number;
}

/** The values being fitted. */
export interface PlumeFieldParameters {
  /** E, –, > 0. */
  readonly entrainmentCoefficient: number;
  /** Effective T90, h, > 0. */
  readonly t90Hours: number;
}

/** Fixed (not fitted) settings of the field. */
export interface PlumeFieldSettings {
  /** Sea practical salinity, > riverSalinity. */
  readonly seaSalinity: number;
  /** River practical salinity. */
  readonly riverSalinity: number;
  /** φ0 at the mouth, 0–1 (default 1). */
  readonly sourceFreshwaterFraction?: number;
  /** Travel-time speed (default 'nose'). */
  readonly travelSpeed?: 'nose' | 'mean';
}

/** Input of {@link calibratePlume}. */
export interface CalibratePlumeInput {
  readonly observations: readonly PlumeObservation[];
  readonly settings: PlumeFieldSettings;
  /** Entrainment coefficient E, –. Suggested bounds 1e-6–1e-3, (c) around science.md §1.11's 1e-5–1e-4. */
  readonly entrainmentCoefficient: PlumeParameterBounds;
  /** Effective T90, h. Suggested bounds 0.5–200 h, (c) from science.md §5.2's ranges. */
  readonly t90Hours: PlumeParameterBounds;
  readonly weights?: Partial<FitWeights>;
  readonly seed?: number;
  readonly restarts?: number;
}

/** Result: the generic fit plus the two named values. */
export interface PlumeCalibration extends FitResult {
  readonly fitted: PlumeFieldParameters;
}

/**
 * Predicts salinity and indicator at one observation with the exposure field.
 * Source: (c) derived: fieldAt of shared/physics/exposure-field with k = ln10/T90.
 *
 * @param values - entrainment coefficient [–] and effective T90 [h]
 * @param settings - sea and river salinity, source fraction, travel speed
 * @param observation - place, plume scales and flood-water concentration
 * @returns { salinity (psu), indicator (per 100 mL) }
 * @example
 * predictPlumeObservation({ entrainmentCoefficient: 3e-5, t90Hours: 20 }, { seaSalinity: 34, riverSalinity: 0 }, obs);
 */
export function predictPlumeObservation(
  values: PlumeFieldParameters,
  settings: PlumeFieldSettings,
  observation: PlumeObservation,
): Prediction {
  const params: ExposureParameters = {
    seaSalinity: settings.seaSalinity,
    riverSalinity: settings.riverSalinity,
    entrainmentCoefficient: values.entrainmentCoefficient,
    decayRate: decayRate(values.t90Hours * 3600),
    riverIndicator: observation.riverIndicator,
    sourceFreshwaterFraction: settings.sourceFreshwaterFraction,
    travelSpeed: settings.travelSpeed,
  };
  const field = fieldAt(observation.plume, params, observation.along, observation.offshore);
  return { salinity: field.salinity, indicator: field.indicator };
}

/**
 * Fits the plume's entrainment coefficient and effective T90 to observations (see the module comment;
 * misfit, optimiser and skill statistics as in {@link fitParameters}).
 *
 * @param input - observations, fixed settings, parameter bounds, weights, seed
 * @returns the fit with before/after bias, RMSE and Nash–Sutcliffe skill
 * @example
 * calibratePlume({ observations, settings: { seaSalinity: 34, riverSalinity: 0 },
 *   entrainmentCoefficient: { initial: 3e-5, min: 1e-6, max: 1e-3 },
 *   t90Hours: { initial: 24, min: 0.5, max: 200 } }).fitted; // => { entrainmentCoefficient: …, t90Hours: … }
 */
export function calibratePlume(input: CalibratePlumeInput): PlumeCalibration {
  const { settings } = input;
  if (
    !(Number.isFinite(settings.seaSalinity) && Number.isFinite(settings.riverSalinity) && settings.seaSalinity > settings.riverSalinity)
  ) {
    throw new Error(`settings.seaSalinity must be above settings.riverSalinity; got ${settings.seaSalinity} and ${settings.riverSalinity}`);
  }
  input.observations.forEach((observation, i) => {
    if (!Number.isFinite(observation.along)) {
      throw new Error(`observations[${i}].along must be a signed distance in m; got ${observation.along}`);
    }
    if (!(Number.isFinite(observation.offshore) && observation.offshore >= 0)) {
      throw new Error(`observations[${i}].offshore must be a distance in m, 0 or more; got ${observation.offshore}`);
    }
    if (!(Number.isFinite(observation.riverIndicator) && observation.riverIndicator >= 0)) {
      throw new Error(`observations[${i}].riverIndicator must be a count per 100 mL, 0 or more; got ${observation.riverIndicator}`);
    }
  });
  const fit = fitParameters({
    observations: input.observations,
    predict: (p, observation) => predictPlumeObservation({ entrainmentCoefficient: p.entrainmentCoefficient, t90Hours: p.t90Hours }, settings, observation),
    parameters: [
      { name: 'entrainmentCoefficient', ...input.entrainmentCoefficient, scale: 'log' },
      { name: 't90Hours', ...input.t90Hours, scale: 'log' },
    ],
    weights: input.weights,
    seed: input.seed,
    restarts: input.restarts,
  });
  return {
    ...fit,
    fitted: { entrainmentCoefficient: fit.parameters.entrainmentCoefficient, t90Hours: fit.parameters.t90Hours },
  };
}
