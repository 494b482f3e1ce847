import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { describe, expect, it } from 'vitest';
import {
  type CalibrationObservation,
  compareObservations,
  fitParameters,
  observationResidual,
  type Prediction,
} from '../../../shared/calibration/fit-parameters';

// ---------------------------------------------------------------------------------------------
// Synthetic "truth": a stand-in with the plume field's structure (science.md §0 item 7, (c)):
//   φ = φ0 · exp(−s/L) · (1 − (x/W)²) for x < W, else 0;   S = S_ocean (1 − φ)   (§2.4)
//   C = φ · C0 · exp(−(ln10/T90) · t),  t = s/U                                    (§5.1)
// ---------------------------------------------------------------------------------------------

interface SyntheticObservation extends CalibrationObservation {
  /** Distance along the coastal current from the mouth, m. */
  readonly s: number;
  /** Distance offshore, m. */
  readonly x: number;
  /** Current width at this flow, m. */
  readonly width: number;
  /** Freshwater fraction at the mouth at this flow. */
  readonly phi0: number;
  /** Current speed at this flow, m/s. */
  readonly speed: number;
}

const S_OCEAN = 34;
const C0 = 2e4;
const TRUTH = { mixingLength: 25_000, t90: 20 };

function syntheticPredict(params: Readonly<Record<string, number>>, o: SyntheticObservation): Prediction {
  const cross = o.x < o.width ? 1 - (o.x / o.width) ** 2 : 0;
  const phi = o.phi0 * Math.exp(-o.s / params.mixingLength) * cross;
  const hours = o.s / o.speed / 3600;
  return {
    salinity: S_OCEAN * (1 - phi),
    indicator: phi * C0 * Math.exp((-Math.LN10 / params.t90) * hours),
  };
}

function makeObservations(seed: number, count: number): SyntheticObservation[] {
  const rng = xoroshiro128plus(seed);
  const uniform = () => uniformFloat64(rng);
  // Box–Muller standard normal from the seeded generator.
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  const out: SyntheticObservation[] = [];
  for (let i = 0; i < count; i++) {
    const flow = 200 + 1800 * uniform(); // m³/s
    const width = 3000 + 2 * flow;
    const place = {
      s: 60_000 * uniform(),
      x: 1.2 * width * uniform(),
      width,
      phi0: flow / (flow + 800),
      speed: 0.15 + flow / 8000,
    };
    const truth = syntheticPredict(TRUTH, { ...place });
    const salinity = Math.min(45, Math.max(0, (truth.salinity as number) + 0.5 * normal()));
    const indicatorValue = (truth.indicator as number) > 0 ? 10 ** (Math.log10(truth.indicator as number) + 0.15 * normal()) : 0;
    const indicator =
      indicatorValue < 2
        ? { value: 2, censored: 'below' as const }
        : indicatorValue > 5000
          ? { value: 5000, censored: 'above' as const }
          : { value: indicatorValue };
    out.push({ ...place, salinity: { value: salinity }, indicator });
  }
  return out;
}

describe('observationResidual', () => {
  it.each([
    // observed, predicted, variable, expected residual — (c) censored-as-inequality rule of the module
    [{ value: 30 }, 28.5, 'salinity', -1.5],
    [{ value: 100 }, 1000, 'indicator', 1], // log10(1000) − log10(100)
    [{ value: 2, censored: 'below' }, 1.2, 'indicator', 0], // "<2" and prediction under 2
    [{ value: 2, censored: 'below' }, 20, 'indicator', 1], // log10(20) − log10(2)
    [{ value: 1600, censored: 'above' }, 5000, 'indicator', 0], // ">1600" and prediction over it
    [{ value: 1600, censored: 'above' }, 160, 'indicator', -1], // log10(160) − log10(1600)
    [{ value: 2, censored: 'below' }, 0, 'indicator', 0], // zero prediction floored at 1e-3, under 2
    [{ value: 5, censored: 'below' }, 6, 'salinity', 1],
  ] as const)('%o vs %d (%s) → %d', (observed, predicted, variable, expected) => {
    expect(observationResidual(observed, predicted, variable)).toBeCloseTo(expected, 12);
  });
});

describe('compareObservations', () => {
  it('matches a hand example', () => {
    // (c) hand: P − O = 1, 1, −1 → bias 1/3, RMSE 1;
    // Nash–Sutcliffe (a, Nash & Sutcliffe 1970): 1 − 3/50 = 0.94;
    // Willmott d (b, Willmott 1981): 1 − 3/(11² + 9² + 1²) = 1 − 3/203 = 0.985222
    const observations = [{ salinity: { value: 30 } }, { salinity: { value: 20 } }, { salinity: { value: 25 } }];
    const predictions = [{ salinity: 31 }, { salinity: 21 }, { salinity: 24 }];
    const result = compareObservations(observations, predictions);
    expect(result.salinity.n).toBe(3);
    expect(result.salinity.bias).toBeCloseTo(1 / 3, 12);
    expect(result.salinity.rmse).toBeCloseTo(1, 12);
    expect(result.salinity.skill).toBeCloseTo(0.94, 12);
    expect(result.salinity.indexOfAgreement).toBeCloseTo(0.985222, 6);
    expect(result.indicator.n).toBe(0);
    expect(result.indicator.skill).toBeNull();
  });

  it('works in log10 units for the indicator and counts censored values apart', () => {
    // (c) hand: log10 residuals 1 and −1 → bias 0, RMSE 1; two censored, one respected
    const observations: CalibrationObservation[] = [
      { indicator: { value: 10 } },
      { indicator: { value: 1000 } },
      { indicator: { value: 2, censored: 'below' } },
      { indicator: { value: 1600, censored: 'above' } },
    ];
    const predictions = [{ indicator: 100 }, { indicator: 100 }, { indicator: 1 }, { indicator: 100 }];
    const result = compareObservations(observations, predictions);
    expect(result.indicator.n).toBe(2);
    expect(result.indicator.bias).toBeCloseTo(0, 12);
    expect(result.indicator.rmse).toBeCloseTo(1, 12);
    expect(result.indicator.censored).toBe(2);
    expect(result.indicator.censoredMet).toBe(1);
    expect(result.censored).toBe(2);
    expect(result.n).toBe(4);
  });

  it.each([
    [[{ salinity: { value: 30 } }], [], /predictions must have one entry per observation \(1\); got 0/],
    [[{ salinity: { value: 30 } }], [{}], /predictions\[0\].salinity must be a finite number/],
    [[{}], [{}], /observations\[0\] must have a salinity or an indicator value/],
    [[{ salinity: { value: 60 } }], [{ salinity: 1 }], /observations\[0\].salinity.value must be a salinity in psu from 0 to 45/],
    [[{ indicator: { value: 0 } }], [{ indicator: 1 }], /observations\[0\].indicator.value must be a count per 100 mL above 0/],
  ] as const)('rejects bad input %#', (observations, predictions, message) => {
    expect(() => compareObservations(observations as unknown as CalibrationObservation[], predictions as unknown as Prediction[])).toThrow(
      message,
    );
  });
});

describe('fitParameters', () => {
  it('fits a one-parameter least-squares problem exactly', () => {
    // (c) hand: minimise (a − 20)² + (2a − 30)² → a = (20 + 60)/5 = 16
    const fit = fitParameters({
      observations: [
        { salinity: { value: 20 }, x: 1 },
        { salinity: { value: 30 }, x: 2 },
      ],
      predict: (p, o) => ({ salinity: p.a * o.x }),
      parameters: [{ name: 'a', initial: 5, min: 0, max: 50 }],
    });
    expect(fit.parameters.a).toBeCloseTo(16, 6);
    expect(fit.converged).toBe(true);
    expect(fit.objective.after).toBeCloseTo(20, 6); // (16 − 20)² + (32 − 30)² = 20
  });

  it('stops at a bound and says so', () => {
    // (c) hand: the unbounded optimum a = 16 lies above max 10
    const fit = fitParameters({
      observations: [
        { salinity: { value: 20 }, x: 1 },
        { salinity: { value: 30 }, x: 2 },
      ],
      predict: (p, o) => ({ salinity: p.a * o.x }),
      parameters: [{ name: 'a', initial: 5, min: 0, max: 10 }],
    });
    expect(fit.parameters.a).toBeCloseTo(10, 9);
    expect(fit.atBound.a).toBe(true);
  });

  const observations = makeObservations(20240611, 150);

  it('builds a synthetic set with both kinds of censoring', () => {
    // (c) synthetic data: "<2" below and ">5000" above the laboratory range
    const below = observations.filter((o) => o.indicator?.censored === 'below').length;
    const above = observations.filter((o) => o.indicator?.censored === 'above').length;
    expect(below).toBeGreaterThan(10);
    expect(above).toBeGreaterThan(0);
    expect(observations.length - below - above).toBeGreaterThan(60);
  });

  it.each([
    { name: 'linear search scale', scale: 'linear' as const },
    { name: 'log search scale', scale: 'log' as const },
  ])('recovers the mixing length and T90 within 5 % from a poor start ($name)', ({ scale }) => {
    // (c) synthetic truth L = 25 000 m, T90 = 20 h; start L = 8 000 m, T90 = 60 h
    const fit = fitParameters({
      observations,
      predict: syntheticPredict,
      parameters: [
        { name: 'mixingLength', initial: 8000, min: 1000, max: 100_000, scale },
        { name: 't90', initial: 60, min: 1, max: 200, scale },
      ],
      seed: 7,
    });
    expect(Math.abs(fit.parameters.mixingLength / TRUTH.mixingLength - 1)).toBeLessThan(0.05);
    expect(Math.abs(fit.parameters.t90 / TRUTH.t90 - 1)).toBeLessThan(0.05);
    expect(fit.converged).toBe(true);
    expect(fit.n).toBe(150);
    expect(fit.objective.after).toBeLessThan(fit.objective.before);
    // Skill (Nash–Sutcliffe, (a) Nash & Sutcliffe 1970) improves for both variables.
    const before = fit.before;
    const after = fit.after;
    expect(after.salinity.skill as number).toBeGreaterThan(before.salinity.skill as number);
    expect(after.indicator.skill as number).toBeGreaterThan(before.indicator.skill as number);
    expect(after.salinity.skill as number).toBeGreaterThan(0.8);
    expect(after.indicator.skill as number).toBeGreaterThan(0.8);
    // RMSE near the noise: salinity σ 0.5 psu, indicator σ 0.15 log10 (c, synthetic noise)
    expect(after.salinity.rmse as number).toBeLessThan(0.6);
    expect(after.indicator.rmse as number).toBeLessThan(0.2);
    expect(after.indicator.indexOfAgreement as number).toBeGreaterThan(before.indicator.indexOfAgreement as number);
    expect(fit.atBound).toEqual({ mixingLength: false, t90: false });
  });

  it('is deterministic for a seed', () => {
    const run = () =>
      fitParameters({
        observations: observations.slice(0, 60),
        predict: syntheticPredict,
        parameters: [
          { name: 'mixingLength', initial: 8000, min: 1000, max: 100_000 },
          { name: 't90', initial: 60, min: 1, max: 200 },
        ],
        seed: 3,
        restarts: 2,
      });
    expect(run().parameters).toEqual(run().parameters);
  });

  it.each([
    [{ parameters: [] }, /parameters must be an array of 1 to 20/],
    [{ parameters: [{ name: 'a', initial: 5, min: 10, max: 1 }] }, /parameter a: min and max must be finite with min < max/],
    [{ parameters: [{ name: 'a', initial: 50, min: 0, max: 10 }] }, /parameter a: initial must be within \[0, 10\]; got 50/],
    [{ parameters: [{ name: 'a', initial: 1, min: 0, max: 10, scale: 'log' }] }, /parameter a: a log scale needs min > 0/],
    [
      {
        parameters: [
          { name: 'a', initial: 1, min: 0, max: 10 },
          { name: 'a', initial: 1, min: 0, max: 10 },
        ],
      },
      /parameters\[\].name must be unique; "a" repeats/,
    ],
    [{ weights: { salinity: 0, indicator: 0 } }, /weights.salinity and weights.indicator must not both be 0/],
    [{ weights: { salinity: -1 } }, /weights.salinity must be 0 or more; got -1/],
    [{ restarts: 100 }, /restarts must be an integer from 0 to 50; got 100/],
    [{ observations: [] }, /observations must be a non-empty array/],
  ] as const)('rejects bad input %#', (overrides, message) => {
    expect(() =>
      fitParameters({
        observations: [{ salinity: { value: 20 } }],
        predict: (p) => ({ salinity: p.a }),
        parameters: [{ name: 'a', initial: 5, min: 0, max: 50 }],
        ...(overrides as object),
      }),
    ).toThrow(message);
  });
});
