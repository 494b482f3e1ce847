import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computePlume } from '../../../shared/physics/compute-plume';
import { dielDecayRate } from '../../../shared/physics/decay';
import {
  bandProfile,
  bulgeEdgeDistance,
  bulgeFraction,
  currentFraction,
  dilutionLength,
  type ExposureParameters,
  exposureParameters,
  fieldAt,
  floodIndicatorConcentration,
  offshoreDistanceWhere,
  plumeOffshoreExtent,
  sampleField,
} from '../../../shared/physics/exposure-field';
import { expectRelative, expectWithin } from './tolerance';

// Plume: science.md §1.10 worked example (c), Δρ = 20, α = 2e-3, F_cc = 1, flood of 36 h.
const PLUME = computePlume({
  latitude: 43.5,
  discharge: 900,
  reducedGravity: 0.191415,
  mouthWidth: 1500,
  mouthDepth: 6,
  shelfSlope: 2e-3,
  alongshoreShare: 1,
  floodDurationHours: 36,
});
const REACH = PLUME.reach ?? Number.NaN;
const HOUR = 3600;

// Parameters: science.md §5.2 screening T90s 6 h / 48 h (c), §5.3 C_river = 1e4 (c), mixing length 30 km (c).
const PARAMS: ExposureParameters = {
  seaSalinity: 34,
  riverSalinity: 0,
  entrainmentCoefficient: 3e-5,
  decayRate: dielDecayRate({ t90Day: 6 * HOUR, t90Night: 48 * HOUR, daylightFraction: 0.5 }),
  riverIndicator: 1e4,
};

describe('fieldAt', () => {
  it('is undiluted river water at the mouth on the coast', () => {
    // (c) derived: φ0 = 1 at s = 0, x = 0; S = S_river; C = C_river
    expect(fieldAt(PLUME, PARAMS, 0, 0)).toEqual({ freshwaterFraction: 1, salinity: 0, indicator: 1e4 });
  });

  it('dilutes as φ0/(1 + s/L_e) along the coast, L_e = (2/3)·H0/(φ0·E), and with travel time s/c_p', () => {
    // science.md §1.11 check (c): H0 = 0.9716 m, a = 2/3, φ0 = 1, E = 3e-5 → L_e = 21.6 km
    const le = dilutionLength(PLUME, PARAMS);
    expectWithin(le / 1000, 21.6, 0.05);
    const value = fieldAt(PLUME, PARAMS, le, 0);
    // (c) derived: φ_coast(L_e) = φ0/2 (the bulge gives nothing on the coast away from the mouth)
    expectWithin(value.freshwaterFraction, 0.5, 1e-12);
    // science.md §2.4 (c): S = (1 − φ) S_o
    expectWithin(value.salinity, 0.5 * 34, 1e-10);
    // science.md §5.1 (c): C = φ C_river e^{−k t}, t = s/c_p
    expectRelative(value.indicator, 0.5 * 1e4 * Math.exp((-PARAMS.decayRate * le) / PLUME.noseSpeed), 1e-12);
    // science.md §1.11 (c): at four times the flow H0 doubles and so does L_e
    const four = computePlume({ latitude: 43.5, discharge: 3600, reducedGravity: 0.191415, mouthWidth: 1500, mouthDepth: 6, shelfSlope: 2e-3, alongshoreShare: 1 });
    expectRelative(dilutionLength(four, PARAMS), 2 * le, 1e-9);
  });

  it('follows the parabolic thickness profile across the current', () => {
    // science.md §1.4 (c): h(x)/H0 = 1 − (x/W0)² → φ(W0/2) = 0.75 φ_coast beyond the bulge
    const s = 40000;
    expect(plumeOffshoreExtent(PLUME, s)).toBe(PLUME.width);
    const coast = fieldAt(PLUME, PARAMS, s, 0).freshwaterFraction;
    expectRelative(fieldAt(PLUME, PARAMS, s, PLUME.width / 2).freshwaterFraction, 0.75 * coast, 1e-12);
    expect(fieldAt(PLUME, PARAMS, s, PLUME.width).freshwaterFraction).toBe(0);
    expect(fieldAt(PLUME, PARAMS, s, PLUME.width * 2)).toEqual({ freshwaterFraction: 0, salinity: 34, indicator: 0 });
  });

  it('uses the bulge (diameter y_s) near the mouth and nothing beyond the reach', () => {
    // science.md §1.6 (a): y_s is the bulge diameter; geometry (c)
    expect(plumeOffshoreExtent(PLUME, 0)).toBeCloseTo(PLUME.bulgeOffshoreExtent, 9);
    // here W0 (6.1 km) < y_s/2 (22.7 km), so at s = y_s/2 the edge is the bulge radius
    expect(PLUME.width).toBeLessThan(PLUME.bulgeOffshoreExtent / 2);
    expectRelative(plumeOffshoreExtent(PLUME, PLUME.bulgeOffshoreExtent / 2), PLUME.bulgeOffshoreExtent / 2, 1e-12);
    expect(fieldAt(PLUME, PARAMS, REACH * 1.001, 0).freshwaterFraction).toBe(0);
    expect(fieldAt(PLUME, PARAMS, REACH * 0.999, 0).freshwaterFraction).toBeGreaterThan(0);
  });

  it('mean travel speed gives more die-off than the nose speed', () => {
    // (c) documented choice: the nose speed is the default (shorter travel time, cautious)
    const nose = fieldAt(PLUME, PARAMS, 20000, 0).indicator;
    const mean = fieldAt(PLUME, { ...PARAMS, travelSpeed: 'mean' }, 20000, 0).indicator;
    expect(mean).toBeLessThan(nose);
  });

  it('scales with the source freshwater fraction, whose dilution length is longer', () => {
    // (c) derived, science.md §1.11: φ_cc = φ0/(1 + s/L_e)(1 − (x/W0)²), L_e ∝ 1/φ0
    const half = { ...PARAMS, sourceFreshwaterFraction: 0.5 };
    const le = dilutionLength(PLUME, half);
    expectRelative(le, 2 * dilutionLength(PLUME, PARAMS), 1e-12);
    const expected = (0.5 / (1 + 30000 / le)) * (1 - (2000 / PLUME.width) ** 2);
    expectRelative(fieldAt(PLUME, half, 30000, 2000).freshwaterFraction, expected, 1e-12);
  });

  it('up-coast: only the bulge lens, nothing beyond it', () => {
    // science.md §1.11 (c): R_b = y_s/2, centre (0, R_b); φ_b = φ0 (1 − (r/R_b)²) on the far side of the centre
    const rb = PLUME.bulgeOffshoreExtent / 2;
    expectWithin(fieldAt(PLUME, PARAMS, 0, rb).freshwaterFraction, 1, 1e-12);
    expectWithin(fieldAt(PLUME, PARAMS, -rb / 2, rb).freshwaterFraction, 1 - 0.25, 1e-12);
    expectWithin(bulgeFraction(PLUME, PARAMS, 0, 1.5 * rb), 1 - 0.25, 1e-12);
    // Between the mouth and the centre: the freshest the lens was as the bulge grew, φ0 x²/(s² + x²)
    expectWithin(bulgeFraction(PLUME, PARAMS, -rb / 4, rb / 4), 0.5, 1e-12);
    // Outside the disc, up-coast: nothing at all
    expect(fieldAt(PLUME, PARAMS, -rb * 1.01, rb)).toEqual({ freshwaterFraction: 0, salinity: 34, indicator: 0 });
    expect(fieldAt(PLUME, PARAMS, -1000, 0).freshwaterFraction).toBe(0);
    expect(fieldAt(PLUME, PARAMS, -6000, 500).freshwaterFraction).toBeLessThan(0.03);
  });

  it('rejects negative offshore distances and non-finite positions', () => {
    expect(() => fieldAt(PLUME, PARAMS, 0, -1)).toThrow(/offshore must be a finite number of at least 0 m/);
    expect(() => fieldAt(PLUME, PARAMS, Number.NaN, 0)).toThrow(/along must be a finite number/);
  });
});

describe('monotonicity (fast-check, seeded)', () => {
  const point = fc.record({
    s1: fc.double({ min: 0, max: 80000, noNaN: true }),
    ds: fc.double({ min: 0, max: 40000, noNaN: true }),
    x: fc.double({ min: 0, max: 50000, noNaN: true }),
  });

  it('further along: φ never increases, salinity never decreases', () => {
    // (c) derived: φ_coast(s) and X(s) are non-increasing in s
    fc.assert(
      fc.property(point, ({ s1, ds, x }) => {
        const a = fieldAt(PLUME, PARAMS, s1, x);
        const b = fieldAt(PLUME, PARAMS, s1 + ds, x);
        return b.freshwaterFraction <= a.freshwaterFraction && b.salinity >= a.salinity && b.indicator <= a.indicator;
      }),
      { seed: 101, numRuns: 500 },
    );
  });

  it('further offshore: φ never increases', () => {
    // (c) derived: the parabolic profile decreases offshore
    fc.assert(
      fc.property(point, ({ s1, ds, x }) => {
        return fieldAt(PLUME, PARAMS, s1, x + ds).freshwaterFraction <= fieldAt(PLUME, PARAMS, s1, x).freshwaterFraction;
      }),
      { seed: 102, numRuns: 500 },
    );
  });

  it('the salinity-below band edge never widens along the coast', () => {
    // (c) derived: consequence of the two properties above
    fc.assert(
      fc.property(point, fc.double({ min: 1, max: 33.9, noNaN: true }), ({ s1, ds }, threshold) => {
        const a = offshoreDistanceWhere(PLUME, PARAMS, s1, { salinityBelow: threshold });
        const b = offshoreDistanceWhere(PLUME, PARAMS, s1 + ds, { salinityBelow: threshold });
        return b <= a;
      }),
      { seed: 103, numRuns: 500 },
    );
  });
});

describe('offshoreDistanceWhere', () => {
  it.each([5, 15, 20, 25, 30, 33])('salinity at the returned distance equals %s within 1e-6', (threshold) => {
    // (c) derived: analytic inversion; consistency check required by the brief
    for (const s of [0, 5000, 20000, 40000, 60000]) {
      const x = offshoreDistanceWhere(PLUME, PARAMS, s, { salinityBelow: threshold });
      if (x > 0 && x < PLUME.width) {
        // the coastal current's edge (the bulge's part of a band is bulgeEdgeDistance)
        expectWithin((1 - currentFraction(PLUME, PARAMS, s, x)) * 34, threshold, 1e-6);
      }
      if (s > PLUME.bulgeOffshoreExtent && x > 0 && x < PLUME.width) expectWithin(fieldAt(PLUME, PARAMS, s, x).salinity, threshold, 1e-6);
    }
  });

  it('indicator and presence thresholds are met at the returned distance', () => {
    // (c) derived: analytic inversion
    const s = 30000;
    const xi = offshoreDistanceWhere(PLUME, PARAMS, s, { indicatorAbove: 10 });
    expect(xi).toBeGreaterThan(0);
    expectRelative(fieldAt(PLUME, PARAMS, s, xi).indicator, 10, 1e-9);
    const xp = offshoreDistanceWhere(PLUME, PARAMS, s, { presenceAbove: 0.2 });
    expectWithin(fieldAt(PLUME, PARAMS, s, xp).freshwaterFraction, 0.2, 1e-12);
    // bulge lobe: on each ray from the mouth the field equals the threshold at D(θ)
    for (const theta of [-1.2, -0.5, 0, 0.4, 1.1]) {
      const d = bulgeEdgeDistance(PLUME, PARAMS, theta, { salinityBelow: 20 });
      // (c) a ray whose envelope φ0 cos²θ stays under the threshold has none of the band (D = 0)
      if (Math.cos(theta) ** 2 <= 14 / 34) expect(d).toBe(0);
      else expectWithin((1 - bulgeFraction(PLUME, PARAMS, d * Math.sin(theta), d * Math.cos(theta))) * 34, 20, 1e-9);
      const di = bulgeEdgeDistance(PLUME, PARAMS, theta, { indicatorAbove: 500 });
      const phi = bulgeFraction(PLUME, PARAMS, di * Math.sin(theta), di * Math.cos(theta));
      if (di > 0) expectRelative(1e4 * phi * Math.exp((-PARAMS.decayRate * di) / PLUME.noseSpeed), 500, 1e-4);
    }
  });

  it.each([
    // (c) limits: never met → 0; met everywhere → the plume's offshore extent; beyond reach → 0
    { s: 10000, threshold: { salinityBelow: 0 }, expected: (): number => 0 },
    { s: 10000, threshold: { salinityBelow: 35 }, expected: (): number => PLUME.width },
    { s: 10000, threshold: { salinityBelow: 34 }, expected: (): number => PLUME.width },
    { s: 10000, threshold: { presenceAbove: 0 }, expected: (): number => PLUME.width },
    { s: -10000, threshold: { presenceAbove: 0 }, expected: (): number => 0 },
    { s: 10000, threshold: { presenceAbove: 1 }, expected: (): number => 0 },
    { s: 10000, threshold: { indicatorAbove: 1e9 }, expected: (): number => 0 },
    { s: REACH * 1.01, threshold: { salinityBelow: 35 }, expected: (): number => 0 },
  ])('limit at s = $s for $threshold', ({ s, threshold, expected }) => {
    expect(offshoreDistanceWhere(PLUME, PARAMS, s, threshold)).toBe(expected());
  });

  it('no indicator in the flood water → never above a threshold', () => {
    // (c) limit
    expect(offshoreDistanceWhere(PLUME, { ...PARAMS, riverIndicator: 0 }, 0, { indicatorAbove: 1 })).toBe(0);
  });

  it('rejects malformed thresholds', () => {
    expect(() => offshoreDistanceWhere(PLUME, PARAMS, 0, { salinityBelow: 50 })).toThrow(/salinityBelow must be between 0 and 42/);
    expect(() =>
      offshoreDistanceWhere(PLUME, PARAMS, 0, { salinityBelow: 10, presenceAbove: 0.1 } as unknown as { salinityBelow: number }),
    ).toThrow(/exactly one of salinityBelow, indicatorAbove or presenceAbove/);
  });
});

describe('sampleField and bandProfile', () => {
  it('samples a 200 × 50 grid that matches fieldAt', () => {
    // (c) derived: grid evaluation of fieldAt; the 200×50 benchmark size
    const grid = sampleField(PLUME, PARAMS, { alongSteps: 200, acrossSteps: 50 });
    expect(grid.s).toHaveLength(200);
    expect(grid.x).toHaveLength(50);
    expect(grid.salinity).toHaveLength(200);
    expect(grid.salinity[0]).toHaveLength(50);
    expect(grid.s[0]).toBe(0);
    expect(grid.s[199]).toBeCloseTo(REACH, 6);
    expect(grid.x[49]).toBeCloseTo(plumeOffshoreExtent(PLUME, 0), 6);
    expect(grid.freshwaterFraction[37][11]).toBe(fieldAt(PLUME, PARAMS, grid.s[37], grid.x[11]).freshwaterFraction);
    expect(grid.indicator[120][3]).toBe(fieldAt(PLUME, PARAMS, grid.s[120], grid.x[3]).indicator);
  });

  it('band profile for S < 20 narrows away from the mouth and ends at the reach', () => {
    // (c) derived: offshoreDistanceWhere at each point
    const band = bandProfile(PLUME, PARAMS, { salinityBelow: 20 }, 101);
    expect(band).toHaveLength(101);
    expect(band[0].s).toBe(0);
    expect(band[100].s).toBeCloseTo(REACH, 6);
    for (let i = 1; i < band.length; i += 1) expect(band[i].offshore).toBeLessThanOrEqual(band[i - 1].offshore);
    expect(band[0].offshore).toBeGreaterThan(0);
  });

  it('rejects too few steps', () => {
    expect(() => bandProfile(PLUME, PARAMS, { salinityBelow: 20 }, 1)).toThrow(/alongSteps must be an integer between 2 and 100000/);
  });
});

describe('equatorial half-disc', () => {
  const jet = computePlume({ latitude: 0, discharge: 900, reducedGravity: 0.19, mouthWidth: 1500, mouthDepth: 6, floodDurationHours: 24 });
  it('extends to the radius along and across', () => {
    // (c) derived: half-disc of radius r
    expect(plumeOffshoreExtent(jet, 0)).toBe(jet.width);
    expectRelative(plumeOffshoreExtent(jet, jet.width * 0.6), jet.width * 0.8, 1e-12);
    expect(plumeOffshoreExtent(jet, jet.width)).toBe(0);
  });
});

describe('indicator concentration and parameters', () => {
  it.each([
    // science.md §5.3 (c): constant screening default 1e4 per 100 mL
    { spec: { kind: 'constant', concentration: 1e4 } as const, q: 900, expected: 1e4 },
    // (c) power law C = a Q^b
    { spec: { kind: 'power-law', coefficient: 10, exponent: 1 } as const, q: 900, expected: 9000 },
    { spec: { kind: 'power-law', coefficient: 100, exponent: 0.5 } as const, q: 400, expected: 2000 },
  ])('$spec at Q = $q', ({ spec, q, expected }) => {
    expectRelative(floodIndicatorConcentration(spec, q), expected, 1e-12);
  });

  it('converts hours to seconds', () => {
    // (c) unit conversion; science.md §5.2 defaults 6 h / 48 h, daylight fraction 0.5
    const params = exposureParameters(
      { entrainmentCoefficient: 3e-5, t90DayHours: 6, t90NightHours: 48, indicator: { kind: 'constant', concentration: 1e4 } },
      { seaSalinity: 34, riverSalinity: 0 },
      900,
    );
    expectWithin(params.decayRate * HOUR, 0.5 * (Math.LN10 / 6) + 0.5 * (Math.LN10 / 48), 1e-12);
    expect(params.riverIndicator).toBe(1e4);
  });

  it('rejects negative concentrations', () => {
    expect(() => floodIndicatorConcentration({ kind: 'constant', concentration: -1 }, 900)).toThrow(
      /indicator concentration must be a finite number of at least 0/,
    );
  });
});
