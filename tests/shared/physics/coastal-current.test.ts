import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  coastalCurrent,
  coastalCurrentDepth,
  coastalCurrentMeanSpeed,
  coastalCurrentThickness,
  coastalCurrentVelocity,
  coastalCurrentWidth,
  wallNoseSpeed,
} from '../../../shared/physics/coastal-current';
import { coriolisParameter } from '../../../shared/physics/coriolis';
import { expectRelative, expectWithin } from './tolerance';

// science.md §1.10 worked example (c): Q = 900 m³/s at 43.5° N, g′ from Δρ = 20 and 8 kg/m³
// (g′ = 0.191415 and 0.076566, science.md §8 #18), f = 1.003912e-4 s⁻¹ (§8 #14).
const Q = 900;
const F = coriolisParameter(43.5);

/** Composite Simpson rule on [a, b] with n (even) intervals. */
function simpson(fn: (x: number) => number, a: number, b: number, n: number): number {
  const h = (b - a) / n;
  let sum = fn(a) + fn(b);
  for (let i = 1; i < n; i += 1) sum += (i % 2 === 1 ? 4 : 2) * fn(a + i * h);
  return (sum * h) / 3;
}

describe('worked example Q = 900 m³/s, 43.5° N (science.md §8 #19–#23)', () => {
  it.each([
    // science.md §8 #19 (c): H0 = 0.9716 m (1e-3); #20 (c): W0 = 6075.1 m (1 m);
    // #22 (c): c_w = 0.4313 m/s (1e-4); #23 (c): U0 = 0.2287 m/s (1e-4)
    { drho: 20, gp: 0.191415, h0: 0.9716, w0: 6075.1, cw: 0.4313, u0: 0.2287 },
    // science.md §8 #19 (c): H0 = 1.5363 m; #20 (c): W0 = 4831.4 m; #22 (c): c_w = 0.3430 m/s; #23 (c): U0 = 0.1819 m/s
    { drho: 8, gp: 0.076566, h0: 1.5363, w0: 4831.4, cw: 0.343, u0: 0.1819 },
  ])('Δρ = $drho kg/m³', ({ gp, h0, w0, cw, u0 }) => {
    expectWithin(coastalCurrentDepth(Q, gp, F), h0, 1e-3);
    expectWithin(coastalCurrentWidth(Q, gp, F), w0, 1);
    expectWithin(wallNoseSpeed(Q, gp, F), cw, 1e-4);
    expectWithin(coastalCurrentMeanSpeed(Q, gp, F), u0, 1e-4);
  });
});

describe('identities (science.md §8 #24, rel 1e-9)', () => {
  it.each([
    { gp: 0.191415 },
    { gp: 0.076566 },
  ])('g′ = $gp', ({ gp }) => {
    const c = coastalCurrent(Q, gp, F);
    // science.md §8 #24 (c): ∫₀^{W0} f x (H0 − f²x²/2g′) dx = Q (analytic: f W0²/2 (H0 − f²W0²/(4g′)))
    const analytic = (F * c.width ** 2) / 2 * (c.depth - (F * F * c.width ** 2) / (4 * gp));
    expectRelative(analytic, Q, 1e-9);
    // science.md §8 #24 (c): W0 = √2 c_w/f
    expectRelative(c.width, (Math.SQRT2 * c.wallNoseSpeed) / F, 1e-9);
    // science.md §8 #24 (c): H0 = c_w²/g′
    expectRelative(c.depth, c.wallNoseSpeed ** 2 / gp, 1e-9);
    // science.md §1.4 (c): U0 = Q/A with A = (2/3) H0 W0; v_f = f W0 = 8^{1/4} (f g′ Q)^{1/4}
    expectRelative(c.meanSpeed, Q / c.area, 1e-12);
    expectRelative(c.frontalSpeed, 8 ** 0.25 * (F * gp * Q) ** 0.25, 1e-12);
    // science.md §1.4 (c): W0 = √2 · R(H0), R = c_w/f
    expectRelative(c.width, Math.SQRT2 * c.deformationRadius, 1e-12);
  });
});

describe('profiles', () => {
  const gp = 0.191415;
  const c = coastalCurrent(Q, gp, F);

  it('h(0) = H0, h(W0) = 0, h = H0(1 − (x/W0)²), zero offshore of the front', () => {
    // science.md §1.4 family 1 (c): h(x) = H0 − f²x²/(2g′)
    expect(coastalCurrentThickness(0, c)).toBe(c.depth);
    expectWithin(coastalCurrentThickness(c.width, c), 0, 1e-12);
    expectRelative(coastalCurrentThickness(c.width / 2, c), 0.75 * c.depth, 1e-12);
    expect(coastalCurrentThickness(2 * c.width, c)).toBe(0);
  });

  it('v(x) = |f| x inside the current, 0 outside', () => {
    // science.md §1.4 family 1 (c): v(x) = f x, v(0) = 0
    expect(coastalCurrentVelocity(0, c)).toBe(0);
    expectRelative(coastalCurrentVelocity(1000, c), F * 1000, 1e-15);
    expect(coastalCurrentVelocity(c.width * 1.01, c)).toBe(0);
  });

  it('numerical transport ∫ v h dx = Q (Simpson, 200 intervals)', () => {
    // science.md §8 #24 (c): transport identity, integrated numerically
    const transport = simpson((x) => coastalCurrentVelocity(x, c) * coastalCurrentThickness(x, c), 0, c.width, 200);
    expectRelative(transport, Q, 1e-9);
  });
});

describe('monotonicity and symmetry', () => {
  it('more flow → deeper, wider, faster', () => {
    // science.md §1.3–§1.4 (c): H0 ∝ Q^½, W0 ∝ Q^¼, U0 ∝ Q^¼
    const a = coastalCurrent(500, 0.1, F);
    const b = coastalCurrent(1000, 0.1, F);
    expect(b.depth).toBeGreaterThan(a.depth);
    expect(b.width).toBeGreaterThan(a.width);
    expect(b.meanSpeed).toBeGreaterThan(a.meanSpeed);
    expectRelative(b.depth / a.depth, Math.SQRT2, 1e-12);
    expectRelative(b.width / a.width, 2 ** 0.25, 1e-12);
  });

  it('larger g′ → shallower and wider (W0 ∝ g′^¼, H0 ∝ g′^−½)', () => {
    // science.md §1.3–§1.4 (c): H0 = (2fQ/g′)^½, W0 = (8g′Q/f³)^¼
    const a = coastalCurrent(900, 0.05, F);
    const b = coastalCurrent(900, 0.2, F);
    expect(b.depth).toBeLessThan(a.depth);
    expect(b.width).toBeGreaterThan(a.width);
    expectRelative(a.depth / b.depth, 2, 1e-12);
    expectRelative(b.width / a.width, Math.SQRT2, 1e-12);
  });

  it('same magnitudes at ±latitude', () => {
    // science.md §3 (c): |f| for sizes, sign for direction
    const north = coastalCurrent(900, 0.1, coriolisParameter(35));
    const south = coastalCurrent(900, 0.1, coriolisParameter(-35));
    expect(south.depth).toBe(north.depth);
    expect(south.width).toBe(north.width);
    expect(south.meanSpeed).toBe(north.meanSpeed);
    expect(south.wallNoseSpeed).toBe(north.wallNoseSpeed);
    expect(south.coriolis).toBe(-north.coriolis);
  });
});

describe('property tests (fast-check, seeded)', () => {
  const inputs = fc.record({
    q: fc.double({ min: 1, max: 2e5, noNaN: true }),
    gp: fc.double({ min: 0.005, max: 0.3, noNaN: true }),
    latitude: fc.double({ min: 3, max: 89, noNaN: true }),
    south: fc.boolean(),
  });

  it('∫ v h dx = Q numerically for random valid inputs', () => {
    // science.md §8 #24 (c): transport identity; Simpson is exact for the cubic integrand
    fc.assert(
      fc.property(inputs, ({ q, gp, latitude, south }) => {
        const c = coastalCurrent(q, gp, coriolisParameter(south ? -latitude : latitude));
        const transport = simpson((x) => coastalCurrentVelocity(x, c) * coastalCurrentThickness(x, c), 0, c.width, 64);
        return Math.abs(transport - q) <= 1e-9 * q;
      }),
      { seed: 20240917, numRuns: 300 },
    );
  });

  it('H0 = c_w²/g′ and W0 = √2 c_w/|f| for random valid inputs', () => {
    // science.md §8 #24 (c): identities, rel 1e-9
    fc.assert(
      fc.property(inputs, ({ q, gp, latitude, south }) => {
        const f = coriolisParameter(south ? -latitude : latitude);
        const c = coastalCurrent(q, gp, f);
        return (
          Math.abs(c.depth - c.wallNoseSpeed ** 2 / gp) <= 1e-9 * c.depth &&
          Math.abs(c.width - (Math.SQRT2 * c.wallNoseSpeed) / Math.abs(f)) <= 1e-9 * c.width
        );
      }),
      { seed: 7, numRuns: 300 },
    );
  });
});

describe('argument checks', () => {
  it.each([
    { call: () => coastalCurrentDepth(0, 0.1, 1e-4), message: /discharge must be a finite number greater than 0/ },
    { call: () => coastalCurrentWidth(900, -0.1, 1e-4), message: /reducedGravity must be a finite number greater than 0/ },
    { call: () => wallNoseSpeed(900, 0.1, 0), message: /coriolis must be a finite, non-zero/ },
    { call: () => coastalCurrentThickness(-1, coastalCurrent(900, 0.1, 1e-4)), message: /offshoreDistance must be/ },
  ])('throws $message', ({ call, message }) => {
    expect(call).toThrow(message);
  });
});
