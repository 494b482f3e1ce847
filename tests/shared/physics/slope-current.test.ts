import { describe, expect, it } from 'vitest';
import { coastalCurrentDepth } from '../../../shared/physics/coastal-current';
import { coriolisParameter } from '../../../shared/physics/coriolis';
import { slopeCurrent, slopeCurrentWidth, slopeNoseSpeed, slopeSpeed } from '../../../shared/physics/slope-current';
import { expectRelative, expectWithin } from './tolerance';

const F = coriolisParameter(43.5);

describe('Lentz & Helfrich (2002) scales, α = 2e-3, Q = 900 m³/s, 43.5° N', () => {
  it.each([
    // science.md §8 #27 (c): c_p = 0.3874 m/s, W_p = 4781.6 m (rel 1e-3); §1.10 (c): c_α = 3.8134, c_w/c_α = 0.1131
    { gp: 0.191415, ca: 3.8134, ratio: 0.1131, cp: 0.3874, wp: 4781.6 },
    // science.md §8 #27 (c): c_p = 0.2800 m/s, W_p = 4184.4 m (rel 1e-3); §1.10 (c): c_α = 1.5253, c_w/c_α = 0.2248
    { gp: 0.076566, ca: 1.5253, ratio: 0.2248, cp: 0.28, wp: 4184.4 },
  ])('g′ = $gp', ({ gp, ca, ratio, cp, wp }) => {
    const s = slopeCurrent(900, gp, F, 2e-3);
    expectWithin(s.slopeSpeed, ca, 1e-4);
    expectWithin(s.speedRatio, ratio, 1e-4);
    expectRelative(s.noseSpeed, cp, 1e-3);
    expectRelative(s.width, wp, 1e-3);
  });
});

describe('limits', () => {
  it('steep slope → wall limit (c_p → c_w, W_p → c_w/f)', () => {
    // science.md §1.5 (a, LH02 abstract): c_w/c_α → 0 is the vertical-wall limit
    const cw = 0.4;
    expectRelative(slopeNoseSpeed(cw, 1e6), cw, 1e-6);
    expectRelative(slopeCurrentWidth(cw, 1e6, F), cw / F, 1e-6);
  });

  it('gentle slope → c_p → c_α and W_p → h_p/α', () => {
    // science.md §1.5 (c, check): (c_w/f)(c_w/c_α) = h_p/α in the slope-controlled limit
    const gp = 0.19;
    const alpha = 1e-8; // c_w/c_α ≈ 2e4
    const s = slopeCurrent(900, gp, F, alpha);
    expectRelative(s.noseSpeed, s.slopeSpeed, 1e-3);
    expectRelative(s.width, coastalCurrentDepth(900, gp, F) / alpha, 1e-3);
  });

  it('c_α = α g′/|f| in both hemispheres', () => {
    // science.md §1.5 (a): c_α = α g′/f
    expectRelative(slopeSpeed(2e-3, 0.191415, F), (2e-3 * 0.191415) / F, 1e-15);
    expect(slopeSpeed(2e-3, 0.1, coriolisParameter(-43.5))).toBe(slopeSpeed(2e-3, 0.1, F));
  });

  it('rejects a zero slope', () => {
    expect(() => slopeSpeed(0, 0.1, F)).toThrow(/shelfSlope must be a finite number greater than 0/);
  });
});
