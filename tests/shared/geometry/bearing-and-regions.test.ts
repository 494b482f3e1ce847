import geodesic from 'geographiclib-geodesic';
import { describe, expect, it } from 'vitest';
import { initialBearingDeg } from '../../../shared/geometry/bearing';
import { ringProblem, toRegionArea } from '../../../shared/schemas/regions';

const WGS84 = geodesic.Geodesic.WGS84;

describe('initialBearingDeg (the outflow arrow)', () => {
  it.each([
    [[0, 0], [1, 0], 90],
    [[0, 0], [0, 1], 0],
    [[0, 0], [-1, 0], 270],
    [[0, 0], [0, -1], 180],
  ] as const)('gives the compass directions along the equator and a meridian (%j → %j is %d°)', (a, b, expected) => {
    expect(initialBearingDeg(a, b)).toBeCloseTo(expected, 9);
  });

  it.each([
    [[-1.25, 44.5], [-1.3, 44.5]],
    [[-1.25, 44.5], [-1.28, 44.53]],
    [[151.3, -33.8], [151.33, -33.77]],
    [[10.7, 59.5], [10.68, 59.47]],
  ] as const)('agrees with the WGS 84 azimuth of geographiclib within 0.2° over a few kilometres (%j → %j)', (a, b) => {
    // geographiclib-geodesic (Karney 2013) Inverse: azi1 is the ellipsoidal forward azimuth.
    const { azi1 } = WGS84.Inverse(a[1], a[0], b[1], b[0]);
    const reference = (((azi1 ?? Number.NaN) % 360) + 360) % 360;
    const diff = Math.abs(((initialBearingDeg(a, b) - reference + 540) % 360) - 180);
    expect(diff).toBeLessThan(0.2);
  });
});

describe('region areas', () => {
  const square = [
    [0, 0],
    [1, 0],
    [1, 1],
    [0, 1],
    [0, 0],
  ];
  it('reads a Polygon, a Feature and a FeatureCollection into one MultiPolygon', () => {
    expect(toRegionArea({ type: 'Polygon', coordinates: [square] })).toEqual({ area: { type: 'MultiPolygon', coordinates: [[square]] } });
    expect(toRegionArea({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [square] } })).toEqual({
      area: { type: 'MultiPolygon', coordinates: [[square]] },
    });
    const fc = { type: 'FeatureCollection', features: [{ type: 'Feature', geometry: { type: 'MultiPolygon', coordinates: [[square], [square]] } }] };
    expect(toRegionArea(fc)).toEqual({ area: { type: 'MultiPolygon', coordinates: [[square], [square]] } });
  });

  it('says which ring does not close and how to fix it', () => {
    expect(ringProblem([[square.slice(0, 4)]])).toMatch(/ring 1 of polygon 1 starts at \[0, 0\] but ends at \[0, 1\]\. Repeat the first position at the end/);
    expect(ringProblem([[square.slice(0, 3)]])).toMatch(/needs at least 4/);
    expect(ringProblem([[[[0, 0], [200, 0], [1, 1], [0, 0]]]])).toMatch(/outside longitude/);
    expect(ringProblem([[square]])).toBeNull();
  });

  it('refuses what is not a polygon', () => {
    expect(toRegionArea({ type: 'LineString', coordinates: [[0, 0], [1, 1]] })).toMatchObject({ problem: expect.stringMatching(/a Polygon or MultiPolygon/) });
    expect(toRegionArea({ type: 'FeatureCollection', features: [] })).toMatchObject({ problem: expect.stringMatching(/no features/) });
  });
});
