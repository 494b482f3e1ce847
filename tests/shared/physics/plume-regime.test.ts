import { describe, expect, it } from 'vitest';
import { classifyPlumeRegime } from '../../../shared/physics/plume-regime';

// Regime rules: science.md §1.5 (a, Yankovsky & Chapman 1997 abstract); isobath distance h_b/α on a
// uniform slope and the 2.5° equatorial band are (c) common practice.
describe('classifyPlumeRegime', () => {
  it.each([
    // science.md §8 #26 (c): h_b = 0.9716 m < h0 = 6 m → surface-advected
    { input: { latitude: 43.5, bottomAttachmentDepth: 0.9716, mouthDepth: 6, bulgeOffshoreExtent: 45323 }, regime: 'surface-advected', resolved: true },
    // science.md §8 #26 (c): h_b = 1.5363 m < 6 m → surface-advected
    { input: { latitude: 43.5, bottomAttachmentDepth: 1.5363, mouthDepth: 6, bulgeOffshoreExtent: 28696, shelfSlope: 2e-3 }, regime: 'surface-advected', resolved: true },
    // (c) h_b = 10 m > h0 = 3 m, isobath 10/1e-3 = 10 km shoreward of y_s = 20 km → intermediate
    { input: { latitude: 43.5, bottomAttachmentDepth: 10, mouthDepth: 3, bulgeOffshoreExtent: 20000, shelfSlope: 1e-3 }, regime: 'intermediate', resolved: true },
    // (c) isobath 10/2e-4 = 50 km beyond y_s = 20 km → bottom-advected
    { input: { latitude: 43.5, bottomAttachmentDepth: 10, mouthDepth: 3, bulgeOffshoreExtent: 20000, shelfSlope: 2e-4 }, regime: 'bottom-advected', resolved: true },
    // (c) no slope: intermediate, not resolved
    { input: { latitude: -20, bottomAttachmentDepth: 10, mouthDepth: 3, bulgeOffshoreExtent: 20000 }, regime: 'intermediate', resolved: false },
    // (c) equatorial band
    { input: { latitude: 1, bottomAttachmentDepth: 10, mouthDepth: 3, bulgeOffshoreExtent: 20000 }, regime: 'equatorial-jet', resolved: true },
  ])('$regime', ({ input, regime, resolved }) => {
    const result = classifyPlumeRegime(input);
    expect(result.regime).toBe(regime);
    expect(result.resolved).toBe(resolved);
  });

  it('reports the h_b isobath distance when known', () => {
    // (c) uniform slope: distance = h_b/α = 10/2e-4 = 50 000 m
    const result = classifyPlumeRegime({
      latitude: 43.5,
      bottomAttachmentDepth: 10,
      mouthDepth: 3,
      bulgeOffshoreExtent: 20000,
      shelfSlope: 2e-4,
    });
    expect(result.bottomFrontDistance).toBeCloseTo(50000, 6);
  });

  it('rejects out-of-range input', () => {
    expect(() =>
      classifyPlumeRegime({ latitude: 43.5, bottomAttachmentDepth: 1, mouthDepth: 3, bulgeOffshoreExtent: 1, shelfSlope: 0.6 }),
    ).toThrow(/shelfSlope must be between 0 and 0.5/);
  });
});
