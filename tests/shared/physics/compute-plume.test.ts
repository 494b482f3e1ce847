import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { computePlume, type PlumeInput } from '../../../shared/physics/compute-plume';
import { coastalCurrentDepth } from '../../../shared/physics/coastal-current';
import { coriolisParameter } from '../../../shared/physics/coriolis';
import { reducedGravityFromWater } from '../../../shared/physics/reduced-gravity';
import { expectRelative, expectWithin } from './tolerance';

// science.md §1.10 worked example (c): Q = 900 m³/s, 43.5° N, L = 1.5 km, h0 = 6 m, α = 2e-3.
const EXAMPLE = {
  latitude: 43.5,
  discharge: 900,
  mouthWidth: 1500,
  mouthDepth: 6,
  shelfSlope: 2e-3,
  alongshoreShare: 1,
} as const;

describe('computePlume reproduces the worked example with alongshoreShare = 1', () => {
  it.each([
    // science.md §8 #18–#27 (c), Δρ = 20 kg/m³: g′ 0.191415; H0 0.9716; W0 6075.1; R 4295.8; c_w 0.4313;
    // U0 0.2287; y_s 45 323; h_b 0.9716 → surface-advected; c_p 0.3874; W_p 4781.6
    { gp: 0.191415, h0: 0.9716, w0: 6075.1, r: 4295.8, cw: 0.4313, u0: 0.2287, ys: 45323, hb: 0.9716, cp: 0.3874, wp: 4781.6 },
    // science.md §8 #18–#27 (c), Δρ = 8 kg/m³
    { gp: 0.076566, h0: 1.5363, w0: 4831.4, r: 3416.3, cw: 0.343, u0: 0.1819, ys: 28696, hb: 1.5363, cp: 0.28, wp: 4184.4 },
  ])('g′ = $gp', ({ gp, h0, w0, r, cw, u0, ys, hb, cp, wp }) => {
    const p = computePlume({ ...EXAMPLE, reducedGravity: gp });
    // science.md §8 #14 (c): f(43.5°) = 1.003912e-4 (1e-9)
    expectWithin(p.coriolis, 1.003912e-4, 1e-9);
    expect(p.reducedGravity).toBe(gp);
    // science.md §8 #19 (c): H0 (1e-3 m)
    expectWithin(p.depth, h0, 1e-3);
    // science.md §8 #20 (c): W0 (1 m)
    expectWithin(p.width, w0, 1);
    // science.md §8 #21 (c): R = c_w/f (1 m)
    expectWithin(p.deformationRadius ?? Number.NaN, r, 1);
    // science.md §8 #22 (c): c_w (1e-4 m/s)
    expectWithin(p.wallNoseSpeed ?? Number.NaN, cw, 1e-4);
    // science.md §8 #23 (c): U0 (1e-4 m/s)
    expectWithin(p.meanSpeed, u0, 1e-4);
    // science.md §8 #26 (c): y_s (1 m), h_b (1e-3 m), surface-advected
    expectWithin(p.bulgeOffshoreExtent, ys, 1);
    expectWithin(p.bottomAttachmentDepth, hb, 1e-3);
    expect(p.regime).toBe('surface-advected');
    // science.md §8 #27 (c): c_p and W_p (rel 1e-3)
    expectRelative(p.noseSpeed, cp, 1e-3);
    expectRelative(p.slopeWidth ?? Number.NaN, wp, 1e-3);
    // science.md §1.1 (a): northern hemisphere → right of the outflow
    expect(p.turnsTo).toBe('right');
  });

  it('reach = nose speed × duration (science.md §1.7, c)', () => {
    // science.md §1.7 (c): 50 km at c_w = 0.4313 m/s takes 32.2 h → reach after 32.2 h ≈ 50 km without a slope
    const p = computePlume({ ...EXAMPLE, shelfSlope: undefined, reducedGravity: 0.191415, floodDurationHours: 32.2 });
    expectRelative(p.reach ?? Number.NaN, 50000, 2e-3);
    expect(p.noseSpeed).toBe(p.wallNoseSpeed);
    expect(computePlume({ ...EXAMPLE, reducedGravity: 0.191415 }).reach).toBeUndefined();
  });
});

describe('which discharge each scale uses', () => {
  it('coastal-current scales use Q_cc = F_cc Q, the bulge uses the whole Q', () => {
    const full = computePlume({ ...EXAMPLE, reducedGravity: 0.191415 });
    const share = computePlume({ ...EXAMPLE, alongshoreShare: 0.6, reducedGravity: 0.191415 });
    // science.md §1.6 (c suggestion): Q_cc = F_cc Q in H0, W0 and c_w
    expect(share.alongshoreDischarge).toBeCloseTo(540, 12);
    expectRelative(share.depth, coastalCurrentDepth(540, 0.191415, coriolisParameter(43.5)), 1e-12);
    expectRelative(share.depth / full.depth, Math.sqrt(0.6), 1e-12);
    expectRelative(share.width / full.width, 0.6 ** 0.25, 1e-12);
    // science.md §1.6 (a, YC97): y_s and h_b use the inflow v_i = Q/(L h0), unchanged by F_cc
    expect(share.bulgeOffshoreExtent).toBe(full.bulgeOffshoreExtent);
    expect(share.bottomAttachmentDepth).toBe(full.bottomAttachmentDepth);
  });

  it('defaults alongshoreShare to 0.6', () => {
    // science.md §1.6 (b, from memory; default 0.6 suggested)
    const { alongshoreShare: _ignored, ...rest } = EXAMPLE;
    expect(computePlume({ ...rest, reducedGravity: 0.1 }).alongshoreShare).toBe(0.6);
  });
});

describe('water properties', () => {
  it('computes g′ from EOS-80 densities at the surface', () => {
    const water = { riverSalinity: 0, riverTemperature: 12, seaSalinity: 33, seaTemperature: 10 };
    const p = computePlume({ ...EXAMPLE, ...water });
    const expected = reducedGravityFromWater(water);
    // science.md §0 item 1 (a/c): g′ from EOS-80 densities, g = 9.81, ρ0 = 1025
    expect(p.reducedGravity).toBe(expected.reducedGravity);
    expect(p.riverDensity).toBe(expected.riverDensity);
    expect(p.seaDensity).toBe(expected.seaDensity);
  });

  it.each([
    {
      input: { ...EXAMPLE, reducedGravity: 0.1, seaSalinity: 34 },
      message: /give either the four water properties .* or reducedGravity, not both/,
    },
    {
      input: { ...EXAMPLE, riverSalinity: 0, riverTemperature: 10, seaSalinity: 34 },
      message: /give either the four water properties .* or reducedGravity \(missing: seaTemperature\)/,
    },
    { input: { ...EXAMPLE }, message: /give either the four water properties/ },
    {
      input: { ...EXAMPLE, riverSalinity: 34, riverTemperature: 5, seaSalinity: 30, seaTemperature: 20 },
      message: /river water must be lighter than sea water/,
    },
    { input: { ...EXAMPLE, reducedGravity: 0.1, alongshoreShare: 0.2 }, message: /alongshoreShare must be between 0.3 and 1/ },
    { input: { ...EXAMPLE, reducedGravity: 0.1, discharge: 0 }, message: /discharge must be a finite number greater than 0/ },
    { input: { ...EXAMPLE, reducedGravity: 0.1, latitude: 95 }, message: /latitude must be between -90 and 90/ },
    { input: { ...EXAMPLE, reducedGravity: 0.1, floodDurationHours: 0 }, message: /floodDurationHours must be a finite number greater than 0/ },
    { input: { ...EXAMPLE, riverSalinity: 0, riverTemperature: 45, seaSalinity: 34, seaTemperature: 10 }, message: /riverTemperature must be between -2 and 40/ },
  ])('rejects: $message', ({ input, message }) => {
    expect(() => computePlume(input as PlumeInput)).toThrow(message);
  });
});

describe('hemisphere mirror symmetry', () => {
  it('same magnitudes at ±latitude, turnsTo and the sign of f flip (fast-check, seeded)', () => {
    // science.md §1.1 (a) and §3 (c): |f| for sizes, sign(f) for direction
    fc.assert(
      fc.property(
        fc.double({ min: 2.5, max: 89, noNaN: true }),
        fc.double({ min: 1, max: 50000, noNaN: true }),
        fc.double({ min: 0.01, max: 0.3, noNaN: true }),
        (latitude, discharge, reducedGravity) => {
          const base = { discharge, reducedGravity, mouthWidth: 800, mouthDepth: 5, shelfSlope: 1e-3, floodDurationHours: 24 };
          const north = computePlume({ ...base, latitude });
          const south = computePlume({ ...base, latitude: -latitude });
          expect(north.turnsTo).toBe('right');
          expect(south.turnsTo).toBe('left');
          expect(south.coriolis).toBe(-north.coriolis);
          const { coriolis: _n, turnsTo: _tn, ...northRest } = north;
          const { coriolis: _s, turnsTo: _ts, ...southRest } = south;
          expect(southRest).toEqual({ ...northRest, warnings: southRest.warnings, assumptions: southRest.assumptions });
          expect(south.warnings.map((w) => w.replace('Latitude -', 'Latitude '))).toEqual(north.warnings);
        },
      ),
      { seed: 43, numRuns: 100 },
    );
  });
});

describe('monotonicity', () => {
  const base = { latitude: 40, mouthWidth: 1000, mouthDepth: 8, reducedGravity: 0.15 };
  it('more flow → deeper, wider, bigger bulge', () => {
    // science.md §1.3–§1.6 (c): H0 ∝ Q^½, W0 ∝ Q^¼, y_s grows with v_i
    const small = computePlume({ ...base, discharge: 300 });
    const large = computePlume({ ...base, discharge: 3000 });
    expect(large.depth).toBeGreaterThan(small.depth);
    expect(large.width).toBeGreaterThan(small.width);
    expect(large.noseSpeed).toBeGreaterThan(small.noseSpeed);
    expect(large.bulgeOffshoreExtent).toBeGreaterThan(small.bulgeOffshoreExtent);
  });

  it('larger g′ → shallower and wider (W0 ∝ g′^¼)', () => {
    // science.md §1.3–§1.4 (c)
    const weak = computePlume({ ...base, discharge: 900, reducedGravity: 0.05 });
    const strong = computePlume({ ...base, discharge: 900, reducedGravity: 0.2 });
    expect(strong.depth).toBeLessThan(weak.depth);
    expectRelative(strong.width / weak.width, 4 ** 0.25, 1e-12);
  });

  it('H0 = c_w²/g′ and W0 = √2 c_w/|f| for random inputs without a slope (fast-check, seeded)', () => {
    // science.md §8 #24 (c): identities, rel 1e-9
    fc.assert(
      fc.property(
        fc.double({ min: -89, max: 89, noNaN: true }).filter((lat) => Math.abs(lat) >= 2.5),
        fc.double({ min: 0.5, max: 1e5, noNaN: true }),
        fc.double({ min: 0.001, max: 0.3, noNaN: true }),
        fc.double({ min: 0.3, max: 1, noNaN: true }),
        (latitude, discharge, reducedGravity, alongshoreShare) => {
          const p = computePlume({ latitude, discharge, reducedGravity, alongshoreShare, mouthWidth: 500, mouthDepth: 4 });
          const cw = p.noseSpeed;
          return (
            Math.abs(p.depth - (cw * cw) / reducedGravity) <= 1e-9 * p.depth &&
            Math.abs(p.width - (Math.SQRT2 * cw) / Math.abs(p.coriolis)) <= 1e-9 * p.width
          );
        },
      ),
      { seed: 11, numRuns: 200 },
    );
  });
});

describe('warnings (science.md §1.9)', () => {
  const base = { latitude: 43.5, discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.19 };

  it('the worked example only warns about the narrow mouth (K < 1)', () => {
    // science.md §1.9 (a, Hetland): near field of a narrow mouth, K = 0.14 here
    const p = computePlume({ ...base, shelfSlope: 2e-3 });
    expect(p.warnings).toHaveLength(1);
    expect(p.warnings[0]).toMatch(/Kelvin number 0.14\d* < 1/);
  });

  it.each([
    { input: { ...base, latitude: 6 }, pattern: /within 10° of the equator/ },
    { input: { ...base, reducedGravity: 0.005 }, pattern: /differ in density by only 0.52\d* kg\/m³/ },
    { input: { ...base, discharge: 0.5 }, pattern: /very small \(under 1 m³\/s\)/ },
    { input: { ...base, discharge: 20000, mouthDepth: 2, mouthWidth: 300 }, pattern: /supercritical at the mouth/ },
    { input: { ...base, mouthDepth: 0.5 }, pattern: /touches the sea bed near the mouth/ },
    { input: { ...base, mouthDepth: 0.5 }, pattern: /No shelf slope was given, so an intermediate plume could not be told apart/ },
    { input: { ...base, mouthDepth: 0.5, shelfSlope: 1e-6 }, pattern: /bottom-advected/ },
    { input: { ...base, shelfSlope: 1e-5 }, pattern: /sea bed to control the current/ },
    { input: { ...base, shelfSlope: 1e-6 }, pattern: /beyond the laboratory range/ },
    { input: { ...base, mouthWidth: 30000 }, pattern: null },
  ])('$pattern', ({ input, pattern }) => {
    const p = computePlume(input);
    if (pattern) expect(p.warnings.some((w) => pattern.test(w))).toBe(true);
    else expect(p.warnings.some((w) => /Kelvin number/.test(w))).toBe(false);
  });

  it('reports bottom-advected when the h_b isobath lies beyond y_s', () => {
    // science.md §1.5 (a, YC97): bottom-advected when the h_b isobath is seaward of y_s
    const p = computePlume({ ...base, mouthDepth: 0.5, shelfSlope: 1e-6 });
    expect(p.regime).toBe('bottom-advected');
    expect(p.bottomFrontDistance).toBeGreaterThan(p.bulgeOffshoreExtent);
  });

  it('notes a zero slope as the wall limit', () => {
    const p = computePlume({ ...base, shelfSlope: 0 });
    expect(p.slopeWidth).toBeUndefined();
    expect(p.assumptions.some((a) => /shelf slope of 0/.test(a))).toBe(true);
  });
});

describe('equatorial fallback', () => {
  const base = { discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.19 };

  it('uses the radial jet within 2.5° of the equator and says so', () => {
    // product.md §4.3 and science.md §1.9 (c): flagged non-rotating estimate
    const p = computePlume({ ...base, latitude: 0, floodDurationHours: 24 });
    expect(p.regime).toBe('equatorial-jet');
    expect(p.turnsTo).toBe('none');
    expect(p.coriolis).toBe(0);
    expect(p.deformationRadius).toBeNull();
    expect(p.rossbyNumber).toBeNull();
    expect(p.reach).toBe(p.width);
    expect(p.warnings[0]).toMatch(/within 2.5° of the equator/);
    // (c) derived box model: volume after 24 h, Q t = (π/2) r² h
    expectRelative((Math.PI / 2) * p.width ** 2 * p.depth, 900 * 86400, 1e-12);
  });

  it('assumes one day without a flood duration and gives no reach', () => {
    const p = computePlume({ ...base, latitude: -1.5 });
    expect(p.reach).toBeUndefined();
    expect(p.assumptions.some((a) => /one day assumed/.test(a))).toBe(true);
    expect(Number.isFinite(p.deformationRadius ?? Number.NaN)).toBe(true);
  });
});
