import { describe, expect, it } from 'vitest';
import { radialSpread } from '../../../shared/physics/radial-jet';
import { expectRelative } from './tolerance';

// The radial spreading box model is (c) derived in shared/physics/radial-jet.ts: half-disc volume
// Q t = (π/2) r² h, front speed dr/dt = Fr √(g′h), Fr = 1.
describe('radialSpread', () => {
  it.each([
    { discharge: 900, reducedGravity: 0.19, time: 86400 },
    { discharge: 50, reducedGravity: 0.05, time: 3600 },
    { discharge: 20000, reducedGravity: 0.24, time: 5 * 86400 },
  ])('is self-consistent for Q = $discharge, g′ = $reducedGravity, t = $time s', (input) => {
    const s = radialSpread(input);
    // (c) derived: volume conservation Q t = (π/2) r² h
    expectRelative((Math.PI / 2) * s.radius ** 2 * s.thickness, input.discharge * input.time, 1e-12);
    // (c) derived: critical front dr/dt = √(g′h)
    expectRelative(s.frontSpeed, Math.sqrt(input.reducedGravity * s.thickness), 1e-12);
    // (c) derived: r ∝ t^¾ so dr/dt = (3/4) r/t
    expectRelative(s.frontSpeed, 0.75 * s.meanFrontSpeed, 1e-12);
  });

  it('grows as t^¾ and (g′Q)^¼', () => {
    // (c) derived: r = (4/3)^½ (2g′Q/π)^¼ t^¾
    const a = radialSpread({ discharge: 900, reducedGravity: 0.19, time: 3600 });
    const b = radialSpread({ discharge: 900, reducedGravity: 0.19, time: 16 * 3600 });
    expectRelative(b.radius / a.radius, 8, 1e-12);
    const c = radialSpread({ discharge: 16 * 900, reducedGravity: 0.19, time: 3600 });
    expectRelative(c.radius / a.radius, 2, 1e-12);
  });

  it('rejects a zero time', () => {
    expect(() => radialSpread({ discharge: 900, reducedGravity: 0.19, time: 0 })).toThrow(/time must be a finite number greater than 0 s/);
  });
});
