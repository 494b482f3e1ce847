/**
 * @module shared/calibration/fit-parameters
 * Calibration core (product.md §4 item 6): compare a model with monitoring data and fit its
 * parameters. Generic: the model is any `predict(params, observation)` function, so this
 * module knows nothing of the plume's internals.
 *
 * Misfit, (c) common practice: the weighted sum of squared residuals, salinity in psu and
 * faecal indicator in log10 units (bacteria counts are close to log-normal, science.md §6.1
 * uses log statistics). Censored results ("<2", ">1600") are inequalities: the residual is 0
 * when the prediction lies on the allowed side of the bound, otherwise the distance to the
 * bound.
 *
 * Optimiser, bounded Nelder–Mead, (b) from memory: Nelder & Mead 1965, Computer Journal 7,
 * 308–313, with the standard coefficients reflection 1, expansion 2, contraction 0.5,
 * shrink 0.5 (Lagarias, Reeds, Wright & Wright 1998, SIAM J. Optim. 9, 112–147, (b)). It
 * works in coordinates scaled to the unit box [0, 1]ⁿ (linear, or logarithmic per parameter)
 * and projects every trial point onto the box, (c). Robustness, (c): it runs from the user's
 * initial values and from `restarts` further starts drawn uniformly in the box with a seeded
 * generator, re-starts each run from its own end point until it stops improving (a collapsed
 * simplex is the usual failure of Nelder–Mead), and keeps the best result. The
 * derivative-free method suits the kinks that censored residuals put in the misfit; the
 * installed Levenberg–Marquardt package only clamps its steps to the bounds and evaluates
 * finite differences outside them, so it is not used here.
 */

import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

/** A measured value; `censored` marks a result reported as "<value" ('below') or ">value" ('above'). */
export interface ObservedValue {
  /** Salinity in psu (0–45) or indicator count per 100 mL (> 0). */
  readonly value: number;
  /** 'below': true value is under `value` ("<2"); 'above': true value is over `value` (">1600"). */
  readonly censored?: 'below' | 'above';
}

/** What calibration needs from an observation; callers add their own fields (place, flow, date). */
export interface CalibrationObservation {
  /** Salinity, psu. */
  readonly salinity?: ObservedValue;
  /** Faecal indicator, per 100 mL. */
  readonly indicator?: ObservedValue;
}

/** The model's prediction at one observation. */
export interface Prediction {
  /** Salinity, psu. */
  readonly salinity?: number;
  /** Faecal indicator, per 100 mL, ≥ 0. */
  readonly indicator?: number;
}

/** One parameter to fit. */
export interface FitParameterSpec {
  /** Name, unique and non-empty; the key in the params record given to `predict`. */
  readonly name: string;
  /** Starting value, within [min, max]. */
  readonly initial: number;
  /** Lower bound, finite. */
  readonly min: number;
  /** Upper bound, finite, > min. */
  readonly max: number;
  /** Search scale; 'log' needs min > 0 and suits parameters spanning orders of magnitude. Default 'linear'. */
  readonly scale?: 'linear' | 'log';
}

/** Weights that multiply each variable's squared residuals (e.g. 1/σ²). Each ≥ 0, not both 0. */
export interface FitWeights {
  readonly salinity: number;
  readonly indicator: number;
}

/** Input of {@link fitParameters}. */
export interface FitParametersInput<Obs extends CalibrationObservation> {
  readonly observations: readonly Obs[];
  readonly predict: (params: Readonly<Record<string, number>>, observation: Obs) => Prediction;
  readonly parameters: readonly FitParameterSpec[];
  /** Default { salinity: 1, indicator: 1 }. */
  readonly weights?: Partial<FitWeights>;
  /** Seed of the extra starting points. Default 1. */
  readonly seed?: number;
  /** Number of seeded extra starts, 0–50. Default 4. */
  readonly restarts?: number;
  /** Iteration cap of each Nelder–Mead run, 10–100 000. Default 1000. */
  readonly maxIterations?: number;
}

/** Agreement statistics for one variable, over uncensored observations. */
export interface VariableSkill {
  /** Uncensored pairs used for the statistics. */
  readonly n: number;
  /** Censored observations (not in bias, RMSE or skill). */
  readonly censored: number;
  /** Censored observations whose prediction lies on the allowed side of the bound. */
  readonly censoredMet: number;
  /** Mean of (predicted − observed); psu, or log10 units for the indicator. Null when n = 0. */
  readonly bias: number | null;
  /** Root-mean-square error, same units. Null when n = 0. */
  readonly rmse: number | null;
  /** Nash–Sutcliffe efficiency, ≤ 1 (1 perfect, 0 no better than the observed mean). Null when n < 2 or the observations do not vary. */
  readonly skill: number | null;
  /** Willmott index of agreement d, 0–1. Null when undefined (n = 0 or a zero denominator). */
  readonly indexOfAgreement: number | null;
}

/** Result of {@link compareObservations}. */
export interface ObservationComparison {
  readonly salinity: VariableSkill;
  /** In log10 units. */
  readonly indicator: VariableSkill;
  /** Observations compared. */
  readonly n: number;
  /** Censored values over both variables. */
  readonly censored: number;
}

/** Result of {@link fitParameters}. */
export interface FitResult {
  /** Fitted values by name. */
  readonly parameters: Record<string, number>;
  /** Agreement at the initial values. */
  readonly before: ObservationComparison;
  /** Agreement at the fitted values. */
  readonly after: ObservationComparison;
  /** Weighted sum of squared residuals at the initial and fitted values. */
  readonly objective: { readonly before: number; readonly after: number };
  /** Nelder–Mead iterations over all runs. */
  readonly iterations: number;
  /** Model evaluations of the whole observation set. */
  readonly evaluations: number;
  /** True when the best run stopped on its tolerance rather than its iteration cap. */
  readonly converged: boolean;
  /** Observations used. */
  readonly n: number;
  /** True for each parameter that ended within 0.1 % of a bound (the fit may want to go further). */
  readonly atBound: Record<string, boolean>;
}

/** Predictions of the indicator are floored at this count per 100 mL before taking log10. (c) */
export const INDICATOR_FLOOR = 1e-3;

/**
 * Residual of one value in working units (psu, or log10 for the indicator), with censoring:
 * 'below' gives 0 when predicted ≤ bound, else predicted − bound; 'above' gives 0 when
 * predicted ≥ bound, else predicted − bound. (c) common practice for censored data.
 *
 * @param observed - the observation
 * @param predicted - the prediction (psu, or per 100 mL for the indicator)
 * @param variable - 'salinity' or 'indicator'
 * @returns the residual, predicted minus observed
 * @example
 * observationResidual({ value: 2, censored: 'below' }, 1.2, 'indicator'); // => 0
 * observationResidual({ value: 100 }, 1000, 'indicator'); // => 1
 */
export function observationResidual(observed: ObservedValue, predicted: number, variable: 'salinity' | 'indicator'): number {
  const p = variable === 'indicator' ? Math.log10(Math.max(predicted, INDICATOR_FLOOR)) : predicted;
  const o = variable === 'indicator' ? Math.log10(observed.value) : observed.value;
  if (observed.censored === 'below') return p <= o ? 0 : p - o;
  if (observed.censored === 'above') return p >= o ? 0 : p - o;
  return p - o;
}

/**
 * Bias, RMSE, Nash–Sutcliffe skill and Willmott index of agreement per variable, salinity
 * in psu and indicator in log10 units, over uncensored pairs; censored values are counted,
 * with how many predictions respect their bound.
 * Sources: Nash–Sutcliffe efficiency NSE = 1 − Σ(P−O)²/Σ(O−Ō)², (a) Nash & Sutcliffe 1970,
 * J. Hydrol. 10, 282–290; index of agreement d = 1 − Σ(P−O)²/Σ(|P−Ō| + |O−Ō|)², (b) from
 * memory: Willmott 1981, Phys. Geogr. 2, 184–194; bias and RMSE, (c).
 *
 * @param observations - observations (salinity and/or indicator)
 * @param predictions - one prediction per observation, same order; must give every variable the observation has
 * @returns statistics per variable
 * @example
 * compareObservations([{ salinity: { value: 30 } }, { salinity: { value: 20 } }],
 *   [{ salinity: 31 }, { salinity: 21 }]).salinity.bias; // => 1
 */
export function compareObservations(
  observations: readonly CalibrationObservation[],
  predictions: readonly Prediction[],
): ObservationComparison {
  if (!Array.isArray(observations) || !Array.isArray(predictions)) {
    throw new Error('observations and predictions must be arrays');
  }
  if (observations.length !== predictions.length) {
    throw new Error(`predictions must have one entry per observation (${observations.length}); got ${predictions.length}`);
  }
  observations.forEach(validateObservation);
  const salinity = variableSkill(observations, predictions, 'salinity');
  const indicator = variableSkill(observations, predictions, 'indicator');
  return { salinity, indicator, n: observations.length, censored: salinity.censored + indicator.censored };
}

/**
 * Fits model parameters to observations by minimising the weighted sum of squared
 * residuals (see the module comment for the misfit and the bounded Nelder–Mead search).
 * Deterministic for a given seed.
 *
 * @param input - observations, model, parameter bounds, weights and search options
 * @returns fitted parameters, before/after agreement, iterations and convergence
 * @example
 * const fit = fitParameters({
 *   observations: [{ salinity: { value: 20 }, x: 1 }, { salinity: { value: 30 }, x: 2 }],
 *   predict: (p, o) => ({ salinity: p.a * o.x }),
 *   parameters: [{ name: 'a', initial: 5, min: 0, max: 50 }],
 * });
 * // fit.parameters.a ≈ 16 (least squares of 20 = a, 30 = 2a)
 */
export function fitParameters<Obs extends CalibrationObservation>(input: FitParametersInput<Obs>): FitResult {
  const { observations, predict, parameters } = input;
  if (typeof predict !== 'function') throw new Error('predict must be a function (params, observation) => prediction');
  if (!Array.isArray(observations) || observations.length === 0) {
    throw new Error('observations must be a non-empty array');
  }
  observations.forEach(validateObservation);
  validateParameters(parameters);
  const weights = resolveWeights(input.weights);
  const seed = input.seed ?? 1;
  const restarts = input.restarts ?? 4;
  const maxIterations = input.maxIterations ?? 1000;
  if (!Number.isInteger(seed)) throw new Error(`seed must be an integer; got ${seed}`);
  if (!(Number.isInteger(restarts) && restarts >= 0 && restarts <= 50)) {
    throw new Error(`restarts must be an integer from 0 to 50; got ${restarts}`);
  }
  if (!(Number.isInteger(maxIterations) && maxIterations >= 10 && maxIterations <= 100_000)) {
    throw new Error(`maxIterations must be an integer from 10 to 100000; got ${maxIterations}`);
  }

  const toParams = (u: readonly number[]): Record<string, number> => {
    const params: Record<string, number> = {};
    parameters.forEach((spec, i) => {
      params[spec.name] = fromUnit(spec, u[i]);
    });
    return params;
  };
  let evaluations = 0;
  const predictAll = (params: Record<string, number>): Prediction[] => observations.map((observation) => predict(params, observation));
  const objective = (u: readonly number[]): number => {
    evaluations += 1;
    const value = weightedSse(observations, predictAll(toParams(u)), weights);
    return Number.isFinite(value) ? value : Number.POSITIVE_INFINITY;
  };

  const initialUnit = parameters.map((spec) => toUnit(spec, spec.initial));
  const rng = xoroshiro128plus(seed);
  const starts: number[][] = [initialUnit];
  for (let k = 0; k < restarts; k++) starts.push(parameters.map(() => uniformFloat64(rng)));

  let best: NelderMeadResult | null = null;
  let iterations = 0;
  for (const start of starts) {
    let run = nelderMead(objective, start, maxIterations);
    iterations += run.iterations;
    // Re-start from the end point until the misfit stops improving (at most 5 times).
    for (let again = 0; again < 5; again++) {
      const next = nelderMead(objective, run.x, maxIterations);
      iterations += next.iterations;
      const improved = next.f < run.f - 1e-10 * (Math.abs(run.f) + 1e-12);
      if (next.f <= run.f) run = next;
      if (!improved) break;
    }
    if (!best || run.f < best.f) best = run;
  }
  if (!best) throw new Error('fitParameters found no starting point');

  const fitted = toParams(best.x);
  const initial = toParams(initialUnit);
  const beforePredictions = predictAll(initial);
  const afterPredictions = predictAll(fitted);
  const atBound: Record<string, boolean> = {};
  parameters.forEach((spec, i) => {
    atBound[spec.name] = best.x[i] <= 1e-3 || best.x[i] >= 1 - 1e-3;
  });
  return {
    parameters: fitted,
    before: compareObservations(observations, beforePredictions),
    after: compareObservations(observations, afterPredictions),
    objective: {
      before: weightedSse(observations, beforePredictions, weights),
      after: weightedSse(observations, afterPredictions, weights),
    },
    iterations,
    evaluations,
    converged: best.converged,
    n: observations.length,
    atBound,
  };
}

// ---------------------------------------------------------------------------------------------
// Private helpers
// ---------------------------------------------------------------------------------------------

interface NelderMeadResult {
  x: number[];
  f: number;
  iterations: number;
  converged: boolean;
}

/**
 * @private Nelder–Mead on the unit box with projection (see the module comment).
 * Stops when the simplex spans less than 1e-9 in every coordinate and the misfit spread is
 * under 1e-12 relative, or after maxIterations.
 */
function nelderMead(f: (u: readonly number[]) => number, start: readonly number[], maxIterations: number): NelderMeadResult {
  const n = start.length;
  const clamp = (u: number[]) => u.map((v) => Math.min(1, Math.max(0, v)));
  const step = 0.1;
  const points: number[][] = [clamp([...start])];
  for (let i = 0; i < n; i++) {
    const p = [...points[0]];
    p[i] = p[i] + step <= 1 ? p[i] + step : p[i] - step;
    points.push(p);
  }
  let values = points.map(f);
  let iterations = 0;
  let converged = false;
  const combine = (a: readonly number[], b: readonly number[], t: number) => clamp(a.map((v, i) => v + t * (b[i] - v)));

  while (iterations < maxIterations) {
    const order = values.map((_, i) => i).sort((a, b) => values[a] - values[b]);
    const sortedPoints = order.map((i) => points[i]);
    const sortedValues = order.map((i) => values[i]);
    points.splice(0, points.length, ...sortedPoints);
    values = sortedValues;

    const spread = Math.abs(values[n] - values[0]);
    let size = 0;
    for (let i = 1; i <= n; i++) {
      for (let d = 0; d < n; d++) size = Math.max(size, Math.abs(points[i][d] - points[0][d]));
    }
    if (size < 1e-9 && spread <= 1e-12 * (Math.abs(values[0]) + 1e-300)) {
      converged = true;
      break;
    }
    if (size < 1e-12) {
      converged = true;
      break;
    }
    iterations += 1;

    const centroid = new Array<number>(n).fill(0);
    for (let i = 0; i < n; i++) for (let d = 0; d < n; d++) centroid[d] += points[i][d] / n;
    const worst = points[n];
    const reflected = combine(centroid, worst, -1);
    const fr = f(reflected);
    if (fr < values[0]) {
      const expanded = combine(centroid, worst, -2);
      const fe = f(expanded);
      if (fe < fr) {
        points[n] = expanded;
        values[n] = fe;
      } else {
        points[n] = reflected;
        values[n] = fr;
      }
      continue;
    }
    if (fr < values[n - 1]) {
      points[n] = reflected;
      values[n] = fr;
      continue;
    }
    if (fr < values[n]) {
      const outside = combine(centroid, reflected, 0.5);
      const fo = f(outside);
      if (fo <= fr) {
        points[n] = outside;
        values[n] = fo;
        continue;
      }
    } else {
      const inside = combine(centroid, worst, 0.5);
      const fi = f(inside);
      if (fi < values[n]) {
        points[n] = inside;
        values[n] = fi;
        continue;
      }
    }
    for (let i = 1; i <= n; i++) {
      points[i] = combine(points[0], points[i], 0.5);
      values[i] = f(points[i]);
    }
  }
  let bestIndex = 0;
  for (let i = 1; i <= n; i++) if (values[i] < values[bestIndex]) bestIndex = i;
  return { x: points[bestIndex], f: values[bestIndex], iterations, converged };
}

/** @private */
function toUnit(spec: FitParameterSpec, value: number): number {
  if (spec.scale === 'log') return (Math.log(value) - Math.log(spec.min)) / (Math.log(spec.max) - Math.log(spec.min));
  return (value - spec.min) / (spec.max - spec.min);
}

/** @private */
function fromUnit(spec: FitParameterSpec, u: number): number {
  const t = Math.min(1, Math.max(0, u));
  if (spec.scale === 'log') return Math.exp(Math.log(spec.min) + t * (Math.log(spec.max) - Math.log(spec.min)));
  return spec.min + t * (spec.max - spec.min);
}

/** @private */
function weightedSse(observations: readonly CalibrationObservation[], predictions: readonly Prediction[], weights: FitWeights): number {
  let total = 0;
  for (let i = 0; i < observations.length; i++) {
    for (const variable of ['salinity', 'indicator'] as const) {
      const observed = observations[i][variable];
      if (!observed || weights[variable] === 0) continue;
      const predicted = predictions[i][variable];
      if (predicted === undefined || !Number.isFinite(predicted)) return Number.NaN;
      total += weights[variable] * observationResidual(observed, predicted, variable) ** 2;
    }
  }
  return total;
}

/** @private */
function variableSkill(
  observations: readonly CalibrationObservation[],
  predictions: readonly Prediction[],
  variable: 'salinity' | 'indicator',
): VariableSkill {
  const observed: number[] = [];
  const predicted: number[] = [];
  let censored = 0;
  let censoredMet = 0;
  observations.forEach((observation, i) => {
    const value = observation[variable];
    if (!value) return;
    const prediction = predictions[i][variable];
    if (prediction === undefined || !Number.isFinite(prediction)) {
      throw new Error(`predictions[${i}].${variable} must be a finite number because observation ${i} has ${variable}; got ${prediction}`);
    }
    if (value.censored) {
      censored += 1;
      if (observationResidual(value, prediction, variable) === 0) censoredMet += 1;
      return;
    }
    observed.push(variable === 'indicator' ? Math.log10(value.value) : value.value);
    predicted.push(variable === 'indicator' ? Math.log10(Math.max(prediction, INDICATOR_FLOOR)) : prediction);
  });
  const n = observed.length;
  if (n === 0) return { n, censored, censoredMet, bias: null, rmse: null, skill: null, indexOfAgreement: null };
  let sumDiff = 0;
  let sse = 0;
  let meanObserved = 0;
  for (let i = 0; i < n; i++) {
    sumDiff += predicted[i] - observed[i];
    sse += (predicted[i] - observed[i]) ** 2;
    meanObserved += observed[i] / n;
  }
  let variance = 0;
  let agreementDenominator = 0;
  for (let i = 0; i < n; i++) {
    variance += (observed[i] - meanObserved) ** 2;
    agreementDenominator += (Math.abs(predicted[i] - meanObserved) + Math.abs(observed[i] - meanObserved)) ** 2;
  }
  return {
    n,
    censored,
    censoredMet,
    bias: sumDiff / n,
    rmse: Math.sqrt(sse / n),
    skill: n >= 2 && variance > 0 ? 1 - sse / variance : null,
    indexOfAgreement: agreementDenominator > 0 ? 1 - sse / agreementDenominator : null,
  };
}

/** @private */
function validateObservation(observation: CalibrationObservation, index: number): void {
  if (!observation || typeof observation !== 'object') {
    throw new Error(`observations[${index}] must be an object; got ${String(observation)}`);
  }
  const { salinity, indicator } = observation;
  if (!salinity && !indicator) {
    throw new Error(`observations[${index}] must have a salinity or an indicator value`);
  }
  for (const [name, value] of [
    ['salinity', salinity],
    ['indicator', indicator],
  ] as const) {
    if (!value) continue;
    if (value.censored !== undefined && value.censored !== 'below' && value.censored !== 'above') {
      throw new Error(`observations[${index}].${name}.censored must be 'below' or 'above'; got ${String(value.censored)}`);
    }
    const ok =
      name === 'salinity'
        ? Number.isFinite(value.value) && value.value >= 0 && value.value <= 45
        : Number.isFinite(value.value) && value.value > 0;
    if (!ok) {
      const range = name === 'salinity' ? 'a salinity in psu from 0 to 45' : 'a count per 100 mL above 0';
      throw new Error(`observations[${index}].${name}.value must be ${range}; got ${value.value}`);
    }
  }
}

/** @private */
function validateParameters(parameters: readonly FitParameterSpec[]): void {
  if (!Array.isArray(parameters) || parameters.length === 0 || parameters.length > 20) {
    throw new Error('parameters must be an array of 1 to 20 { name, initial, min, max }');
  }
  const names = new Set<string>();
  for (const spec of parameters) {
    if (typeof spec.name !== 'string' || spec.name.length === 0) throw new Error('parameters[].name must be a non-empty string');
    if (names.has(spec.name)) throw new Error(`parameters[].name must be unique; "${spec.name}" repeats`);
    names.add(spec.name);
    if (!(Number.isFinite(spec.min) && Number.isFinite(spec.max) && spec.min < spec.max)) {
      throw new Error(`parameter ${spec.name}: min and max must be finite with min < max; got ${spec.min}, ${spec.max}`);
    }
    if (!(Number.isFinite(spec.initial) && spec.initial >= spec.min && spec.initial <= spec.max)) {
      throw new Error(`parameter ${spec.name}: initial must be within [${spec.min}, ${spec.max}]; got ${spec.initial}`);
    }
    if (spec.scale !== undefined && spec.scale !== 'linear' && spec.scale !== 'log') {
      throw new Error(`parameter ${spec.name}: scale must be 'linear' or 'log'; got ${String(spec.scale)}`);
    }
    if (spec.scale === 'log' && spec.min <= 0) {
      throw new Error(`parameter ${spec.name}: a log scale needs min > 0; got ${spec.min}`);
    }
  }
}

/** @private */
function resolveWeights(weights: Partial<FitWeights> = {}): FitWeights {
  const resolved = { salinity: weights.salinity ?? 1, indicator: weights.indicator ?? 1 };
  for (const [name, value] of Object.entries(resolved)) {
    if (!(Number.isFinite(value) && value >= 0)) throw new Error(`weights.${name} must be 0 or more; got ${value}`);
  }
  if (resolved.salinity === 0 && resolved.indicator === 0) {
    throw new Error('weights.salinity and weights.indicator must not both be 0');
  }
  return resolved;
}
