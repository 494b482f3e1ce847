import { describe, expect, it } from 'vitest';
import {
  bottomAttachmentDepth,
  bulge,
  bulgeExtentRatio,
  bulgeOffshoreExtent,
  inflowVelocity,
} from '../../../shared/physics/bulge';
import { coastalCurrentDepth } from '../../../shared/physics/coastal-current';
import { coriolisParameter } from '../../../shared/physics/coriolis';
import { expectRelative, expectWithin } from './tolerance';

const F = coriolisParameter(43.5);

describe('bulgeExtentRatio (y_s/R0)', () => {
  it.each([
    // science.md §8 #25 (c, matches Hetland's 4.2 R_d (a)): Fr → 0 gives 4.2426 (1e-4)
    { fr: 0, ratio: 4.2426 },
    // science.md §8 #25 (c, matches Hetland's 4.6 R_d (a)): Fr = 1 gives 4.6188 (1e-4)
    { fr: 1, ratio: 4.6188 },
  ])('Fr = $fr → $ratio', ({ fr, ratio }) => {
    expectWithin(bulgeExtentRatio(fr), ratio, 1e-4);
  });

  it('matches y_s / R0 from the dimensional formula', () => {
    // science.md §1.6 (c, algebra): y_s/R0 = 2(3 + Fr²)/√(2 + Fr²)
    const b = bulge({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.191415, coriolis: F });
    expectRelative(b.offshoreExtent / b.mouthDeformationRadius, bulgeExtentRatio(b.froudeNumber), 1e-12);
  });
});

describe('Yankovsky & Chapman worked example (L = 1.5 km, h0 = 6 m, Q = 900, 43.5° N)', () => {
  it.each([
    // science.md §8 #26 (c): Δρ = 20 → y_s = 45 323 m (1 m), h_b = 0.9716 m (1e-3)
    { gp: 0.191415, ys: 45323, hb: 0.9716 },
    // science.md §8 #26 (c): Δρ = 8 → y_s = 28 696 m (1 m), h_b = 1.5363 m (1e-3)
    { gp: 0.076566, ys: 28696, hb: 1.5363 },
  ])('g′ = $gp', ({ gp, ys, hb }) => {
    const inflow = { discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: gp, coriolis: F };
    expectWithin(bulgeOffshoreExtent(inflow), ys, 1);
    expectWithin(bottomAttachmentDepth(inflow), hb, 1e-3);
    // science.md §1.3 (a/c): h_b = (2 L v_i h0 f/g′)^½ equals H0 for the same Q
    expectRelative(bottomAttachmentDepth(inflow), coastalCurrentDepth(900, gp, F), 1e-12);
  });

  it('v_i = Q/(L h0) = 0.100 m/s', () => {
    // science.md §1.10 (c): v_i = 0.100 m/s
    expectWithin(inflowVelocity(900, 1500, 6), 0.1, 1e-15);
  });

  it('same sizes in the southern hemisphere', () => {
    // science.md §3 (c): |f| for sizes
    const north = bulge({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.1, coriolis: F });
    const south = bulge({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.1, coriolis: -F });
    expect(south).toEqual(north);
  });

  it('rejects bad inflow', () => {
    expect(() => inflowVelocity(900, 0, 6)).toThrow(/mouthWidth must be a finite number greater than 0/);
    expect(() => bulgeExtentRatio(-1)).toThrow(/froude must be a finite number of at least 0/);
    expect(() =>
      bulgeOffshoreExtent({ discharge: 900, mouthWidth: 1500, mouthDepth: 6, reducedGravity: 0.1, coriolis: 0 }),
    ).toThrow(/coriolis must be a finite, non-zero/);
  });
});
