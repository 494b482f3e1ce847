/**
 * @module shared/calibration/river-calibration
 * A river's plume against its monitoring samples: the prediction at a sample (the plume of the
 * flow on the sample's date, at the station's alongshore and offshore place), the fit of the
 * river's calibrated settings with the calibration core (./fit-parameters), and the cautions
 * that go with a fit.
 *
 * Calibrated settings, in river units: the entrainment coefficient E [–] of the coastal current
 * (it sets the flow-dependent dilution length L_e = (2/3)·H0/(φ0·E), science.md §1.11); the effective T90 [h], the single
 * T90 whose rate equals the day/night-weighted rate of the river's two T90s (applying it scales
 * both by the same ratio, so their ratio stays the user's); optionally the alongshore share F_cc
 * and the near-field freshwater fraction φ0.
 *
 * Samples are steady-state snapshots: the plume has no alongshore cut-off (no flood duration),
 * (c) — a sample is taken within a plume that has had days to set up.
 */
import { computePlume, type PlumeResult } from '../physics/compute-plume';
import {
  DEFAULT_ENTRAINMENT_COEFFICIENT,
  MAX_ALONGSHORE_SHARE,
  MAX_ENTRAINMENT_COEFFICIENT,
  MIN_ALONGSHORE_SHARE,
  MIN_ENTRAINMENT_COEFFICIENT,
} from '../physics/constants';
import { plumeInput } from '../physics/river-plume';
import { dielDecayRate } from '../physics/decay';
import {
  type ExposureParameters,
  type FieldPlume,
  fieldAt,
  floodIndicatorConcentration,
  type IndicatorSpec,
  plumeOffshoreExtent,
} from '../physics/exposure-field';
import {
  type CalibrationObservation,
  type FitParameterSpec,
  type FitResult,
  fitParameters,
  type ObservationComparison,
} from './fit-parameters';

/** The river settings a prediction needs (the shape of shared/schemas/river RiverSettings). */
export interface CalibrationRiverSettings {
  readonly mouthLatitude: number;
  readonly riverSalinity: number;
  readonly riverTemperature: number;
  readonly seaSalinity: number;
  readonly seaTemperature: number;
  readonly mouthWidth: number;
  readonly mouthDepth: number;
  readonly shelfSlope: number;
  readonly alongshoreShare: number;
  readonly entrainmentCoefficient: number;
  readonly t90DayHours: number;
  readonly t90NightHours: number;
  readonly daylightFraction: number;
  readonly indicator: IndicatorSpec;
  readonly nearFieldFreshwaterFraction?: number;
}

/** The values calibration fits, in river units. */
export interface CalibratedValues {
  /** E, –. */
  entrainmentCoefficient: number;
  /** Effective T90, h. */
  t90Hours: number;
  /** F_cc, 0.3–1. */
  alongshoreShare: number;
  /** φ0, 0–1. */
  nearFieldFreshwaterFraction: number;
}

export type CalibratedName = keyof CalibratedValues;

/** Bounds of the search, (c): science.md §5.2 for T90 (under an hour to ~100 h); E from 1e-6 to 1e-3 (science.md §1.11: 1e-5 to 1e-4, widened tenfold each way). */
export const CALIBRATION_BOUNDS: Record<CalibratedName, { min: number; max: number; scale: 'log' | 'linear' }> = {
  entrainmentCoefficient: { min: MIN_ENTRAINMENT_COEFFICIENT, max: MAX_ENTRAINMENT_COEFFICIENT, scale: 'log' },
  t90Hours: { min: 0.5, max: 200, scale: 'log' },
  alongshoreShare: { min: MIN_ALONGSHORE_SHARE, max: MAX_ALONGSHORE_SHARE, scale: 'linear' },
  nearFieldFreshwaterFraction: { min: 0.02, max: 1, scale: 'linear' },
};

/**
 * Effective T90 of a day/night pair: ln10 / k̄ with k̄ the daylight-weighted rate.
 * Source: (c) derived from science.md §5.1 (k = ln10/T90) and the diel weighting of decay.ts.
 *
 * @param settings - T90 day/night [h] and the daylight fraction
 * @returns T90 [h]
 * @example
 * effectiveT90Hours({ t90DayHours: 8, t90NightHours: 40, daylightFraction: 0.5 }); // => 13.33
 */
export function effectiveT90Hours(settings: Pick<CalibrationRiverSettings, 't90DayHours' | 't90NightHours' | 'daylightFraction'>): number {
  const k = dielDecayRate({
    t90Day: settings.t90DayHours * 3600,
    t90Night: settings.t90NightHours * 3600,
    daylightFraction: settings.daylightFraction,
  });
  return Math.LN10 / k / 3600;
}

/** The calibrated values a river's settings hold now. */
export function calibratedValuesOf(settings: CalibrationRiverSettings): CalibratedValues {
  return {
    entrainmentCoefficient: settings.entrainmentCoefficient ?? DEFAULT_ENTRAINMENT_COEFFICIENT,
    t90Hours: effectiveT90Hours(settings),
    alongshoreShare: settings.alongshoreShare,
    nearFieldFreshwaterFraction: settings.nearFieldFreshwaterFraction ?? 1,
  };
}

/**
 * The settings fields that carry calibrated values: T90 day and night are both scaled by
 * fitted/current effective T90, (c).
 *
 * @param settings - the river's settings now
 * @param values - the values to carry (any subset)
 * @returns the changed settings fields, rounded to sensible precision
 * @example
 * settingsPatchFor(settings, { t90Hours: 2 * effectiveT90Hours(settings) }); // => { t90DayHours: 16, t90NightHours: 80 }
 */
export function settingsPatchFor(settings: CalibrationRiverSettings, values: Partial<CalibratedValues>): Record<string, number> {
  const patch: Record<string, number> = {};
  const round = (v: number, digits: number) => Number(v.toPrecision(digits));
  if (values.entrainmentCoefficient !== undefined) patch.entrainmentCoefficient = round(values.entrainmentCoefficient, 4);
  if (values.t90Hours !== undefined) {
    const ratio = values.t90Hours / effectiveT90Hours(settings);
    patch.t90DayHours = round(settings.t90DayHours * ratio, 4);
    patch.t90NightHours = round(settings.t90NightHours * ratio, 4);
  }
  if (values.alongshoreShare !== undefined) patch.alongshoreShare = round(values.alongshoreShare, 3);
  if (values.nearFieldFreshwaterFraction !== undefined) patch.nearFieldFreshwaterFraction = round(values.nearFieldFreshwaterFraction, 3);
  return patch;
}

/** The plume scales of a river at one flow (no alongshore cut-off). */
export function samplePlume(
  settings: CalibrationRiverSettings,
  discharge: number,
  alongshoreShare = settings.alongshoreShare,
): PlumeResult {
  return computePlume(plumeInput(settings, discharge, alongshoreShare));
}

/** A sample placed relative to one river. */
export interface PlacedSample extends CalibrationObservation {
  /** River flow on the sample's date, m³/s, > 0. */
  readonly flow: number;
  /** s, signed alongshore distance from the mouth, m (> 0 down-coast, < 0 up-coast). */
  readonly along: number;
  /** x, offshore distance from the walked coast, m. */
  readonly offshore: number;
}

/** Prediction at a sample. */
export interface SamplePrediction {
  /** True when the sample lies within the plume's offshore extent X(s), whatever E and T90 are. */
  readonly inside: boolean;
  readonly freshwaterFraction: number;
  readonly salinity: number;
  readonly indicator: number;
}

function predictWith(
  settings: CalibrationRiverSettings,
  values: CalibratedValues,
  plume: FieldPlume,
  flow: number,
  along: number,
  offshore: number,
): SamplePrediction {
  const params: ExposureParameters = {
    seaSalinity: settings.seaSalinity,
    riverSalinity: settings.riverSalinity,
    entrainmentCoefficient: values.entrainmentCoefficient,
    decayRate: Math.LN10 / (values.t90Hours * 3600),
    riverIndicator: floodIndicatorConcentration(settings.indicator, flow),
    sourceFreshwaterFraction: values.nearFieldFreshwaterFraction,
  };
  const s = along;
  const x = Math.max(0, offshore);
  const f = fieldAt(plume, params, s, x);
  return {
    // Up-coast only the bulge disc holds river water (science.md §1.11): s² + x² < 2 x R_b.
    inside: s < 0 && plume.regime !== 'equatorial-jet' ? s * s + x * x < x * plume.bulgeOffshoreExtent : x < plumeOffshoreExtent(plume, s),
    freshwaterFraction: f.freshwaterFraction,
    salinity: f.salinity,
    indicator: f.indicator,
  };
}

/**
 * The model's salinity and indicator at a sample, for given calibrated values (default: the
 * river's own).
 * Source: (c) derived: computePlume for the flow, then fieldAt (science.md §0 item 7, §5.1).
 *
 * @param settings - the river's settings
 * @param sample - flow [m³/s], along and offshore [m]
 * @param values - calibrated values to use instead of the settings' own
 * @returns φ, salinity (psu) and indicator (per 100 mL)
 * @example
 * predictSample(amberlin, { flow: 400, along: 3000, offshore: 1500 }).salinity; // => ~27
 */
export function predictSample(
  settings: CalibrationRiverSettings,
  sample: Pick<PlacedSample, 'flow' | 'along' | 'offshore'>,
  values: CalibratedValues = calibratedValuesOf(settings),
): SamplePrediction {
  const plume = samplePlume(settings, sample.flow, values.alongshoreShare);
  return predictWith(settings, values, plume, sample.flow, sample.along, sample.offshore);
}

/** Which values to fit besides E and T90. */
export interface RiverFitOptions {
  readonly fitAlongshoreShare?: boolean;
  readonly fitNearFieldFraction?: boolean;
  readonly seed?: number;
  readonly restarts?: number;
}

export interface RiverFit {
  readonly start: CalibratedValues;
  readonly fitted: CalibratedValues;
  readonly fittedNames: CalibratedName[];
  readonly before: ObservationComparison;
  readonly after: ObservationComparison;
  readonly atBound: Partial<Record<CalibratedName, boolean>>;
  readonly converged: boolean;
  readonly evaluations: number;
}

/** Grid step of the alongshore share for the plume-scale table, (c): the scales are smooth power laws of Q_cc. */
const SHARE_STEP = 0.01;

/**
 * Fits the river's calibrated values to placed samples with the calibration core (bounded,
 * seeded Nelder–Mead; censored values as inequalities — see fit-parameters.ts). When the
 * alongshore share is fitted, the plume scales of each flow are tabulated over the share in
 * steps of 0.01 and interpolated linearly, (c), so the fit stays quick.
 *
 * @param settings - the river's settings (start values)
 * @param samples - placed samples with salinity and/or indicator
 * @param options - which extra values to fit; seed and restarts of the optimiser
 * @returns start and fitted values with agreement before and after
 * @example
 * fitRiver(settings, samples, { fitNearFieldFraction: true }).fitted.entrainmentCoefficient; // => –
 */
export function fitRiver(settings: CalibrationRiverSettings, samples: readonly PlacedSample[], options: RiverFitOptions = {}): RiverFit {
  if (samples.length === 0) throw new RangeError('samples must hold at least one sample placed in the plume');
  const start = calibratedValuesOf(settings);
  const names: CalibratedName[] = ['entrainmentCoefficient', 't90Hours'];
  if (options.fitAlongshoreShare) names.push('alongshoreShare');
  if (options.fitNearFieldFraction) names.push('nearFieldFreshwaterFraction');
  const parameters: FitParameterSpec[] = names.map((name) => {
    const b = CALIBRATION_BOUNDS[name];
    return { name, min: b.min, max: b.max, scale: b.scale, initial: Math.min(b.max, Math.max(b.min, start[name])) };
  });

  // Plume scales per sample: fixed, or a table over the share.
  const fixed = samples.map((s) => samplePlume(settings, s.flow));
  const shares: number[] = [];
  for (let v = MIN_ALONGSHORE_SHARE; v <= MAX_ALONGSHORE_SHARE + 1e-9; v += SHARE_STEP) shares.push(Math.min(MAX_ALONGSHORE_SHARE, v));
  const table = options.fitAlongshoreShare ? samples.map((s) => shares.map((share) => samplePlume(settings, s.flow, share))) : null;
  const plumeAt = (i: number, share: number): FieldPlume => {
    if (!table) return fixed[i];
    const pos = (share - MIN_ALONGSHORE_SHARE) / SHARE_STEP;
    const j = Math.max(0, Math.min(shares.length - 2, Math.floor(pos)));
    const w = Math.max(0, Math.min(1, pos - j));
    const a = table[i][j];
    const b = table[i][j + 1];
    const mix = (p: number, q: number) => p + w * (q - p);
    return {
      regime: w < 0.5 ? a.regime : b.regime,
      depth: mix(a.depth, b.depth),
      width: mix(a.width, b.width),
      meanSpeed: mix(a.meanSpeed, b.meanSpeed),
      noseSpeed: mix(a.noseSpeed, b.noseSpeed),
      bulgeOffshoreExtent: mix(a.bulgeOffshoreExtent, b.bulgeOffshoreExtent),
    };
  };
  const indexOf = new Map(samples.map((s, i) => [s, i]));
  const fit: FitResult = fitParameters({
    observations: samples,
    parameters,
    seed: options.seed ?? 1,
    restarts: options.restarts ?? 4,
    predict: (p, obs) => {
      const values: CalibratedValues = { ...start, ...(p as Partial<CalibratedValues>) };
      const i = indexOf.get(obs) as number;
      const r = predictWith(settings, values, plumeAt(i, values.alongshoreShare), obs.flow, obs.along, obs.offshore);
      return { salinity: r.salinity, indicator: r.indicator };
    },
  });
  const fitted: CalibratedValues = { ...start, ...(fit.parameters as Partial<CalibratedValues>) };
  return {
    start,
    fitted,
    fittedNames: names,
    before: fit.before,
    after: fit.after,
    atBound: fit.atBound as Partial<Record<CalibratedName, boolean>>,
    converged: fit.converged,
    evaluations: fit.evaluations,
  };
}

/** What a fit rests on, for its cautions. */
export interface FitBasis {
  readonly samples: number;
  /** Distinct calendar years sampled. */
  readonly years: number;
  /** Distinct stations sampled (default: not said). */
  readonly stations?: number;
  readonly flowMin: number;
  readonly flowMax: number;
  /** Censored indicator values. */
  readonly censored: number;
  /** Design flows the river is screened at (scenarios), m³/s. */
  readonly scenarioFlows: readonly { name: string; discharge: number }[];
  readonly atBound?: Partial<Record<CalibratedName, boolean>>;
}

/** Fewer samples than this: the fit is weak. (a) at least 30 samples for a shellfish growing-area classification (science.md §6, Whatcom County page). */
export const MIN_FIT_SAMPLES = 30;
/** Fewer distinct years: one season's weather may drive the fit, (c). */
export const MIN_FIT_YEARS = 2;
/** Fewer stations than this cannot separate the alongshore thinning (E) from the water leaving the mouth (φ0), (c). */
export const MIN_FIT_STATIONS = 3;
/** The sampled flows should span at least this ratio max/min, (c) common practice: a factor of 5 covers low flows to moderate floods. */
export const MIN_FLOW_RATIO = 5;

/**
 * Plain-language cautions of a fit (or of a comparison): how many samples and years it rests
 * on, whether too few or too narrow a flow range, and which design flows lie beyond the sampled
 * flows (the fitted values are extrapolated there).
 *
 * @param basis - counts, flow range and the river's design flows
 * @returns sentences, the first always saying what the fit rests on
 * @example
 * calibrationCautions({ samples: 12, years: 1, flowMin: 20, flowMax: 40, censored: 0, scenarioFlows: [] })[1]; // => 'Only 12 samples: …'
 * Source: (a) 30 samples (science.md §6); the other thresholds (c).
 */
export function calibrationCautions(basis: FitBasis): string[] {
  const f = (q: number) => `${q.toLocaleString('en', { maximumFractionDigits: q < 10 ? 1 : 0 })} m³/s`;
  const out: string[] = [];
  out.push(
    `Rests on ${basis.samples} sample${basis.samples === 1 ? '' : 's'} over ${basis.years} year${basis.years === 1 ? '' : 's'}, at flows from ${f(basis.flowMin)} to ${f(basis.flowMax)}` +
      (basis.censored
        ? `; ${basis.censored} indicator result${basis.censored === 1 ? ' is a detection limit' : 's are detection limits'}, used as bounds.`
        : '.'),
  );
  if (basis.samples < MIN_FIT_SAMPLES)
    out.push(
      `Only ${basis.samples} samples: a fit needs at least ${MIN_FIT_SAMPLES} to be trusted. Treat the fitted values as a first guess.`,
    );
  if (basis.years < MIN_FIT_YEARS)
    out.push(
      `The samples cover only ${basis.years} year${basis.years === 1 ? '' : 's'}: one season's weather may drive the fit. Add samples from other years.`,
    );
  if (basis.stations !== undefined && basis.stations < MIN_FIT_STATIONS) {
    out.push(
      `The samples come from only ${basis.stations} station${basis.stations === 1 ? '' : 's'}: the fit cannot tell how fast the plume thins along the coast from how much river water leaves the mouth. Add stations at other distances from the mouth.`,
    );
  }
  if (basis.flowMin > 0 && basis.flowMax / basis.flowMin < MIN_FLOW_RATIO) {
    out.push(
      `The sampled flows span a narrow range (${f(basis.flowMin)}–${f(basis.flowMax)}, under a factor of ${MIN_FLOW_RATIO}): the fit cannot tell how the plume changes with flow.`,
    );
  }
  const beyond = basis.scenarioFlows.filter((s) => s.discharge > basis.flowMax);
  if (beyond.length) {
    out.push(
      `No sample was taken at a flow above ${f(basis.flowMax)}. ${beyond.length} of the screened floods (${beyond
        .slice(0, 3)
        .map((s) => `${s.name}, ${f(s.discharge)}`)
        .join('; ')}${beyond.length > 3 ? '…' : ''}) lie beyond it: there the fitted values are extrapolated, not tested.`,
    );
  }
  for (const [name, at] of Object.entries(basis.atBound ?? {})) {
    if (at)
      out.push(
        `The fitted ${CALIBRATED_LABEL[name as CalibratedName]} ended at the edge of its search range; the data may want a value beyond it.`,
      );
  }
  out.push('The model predicts; the authority decides on closures and classification.');
  return out;
}

export const CALIBRATED_LABEL: Record<CalibratedName, string> = {
  entrainmentCoefficient: 'entrainment coefficient',
  t90Hours: 'T90',
  alongshoreShare: 'alongshore share',
  nearFieldFreshwaterFraction: 'near-field freshwater fraction',
};
