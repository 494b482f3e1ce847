import type { Feature, Geometry } from 'geojson';
import { describe, expect, it } from 'vitest';
import { bboxOf, checkCoordinates, coordinateCheck } from '../../../shared/geometry/check-coordinates';
import type { UploadError } from '../../../shared/geometry/upload-error';

const poly = (coords: number[][]): Feature<Geometry> => ({
  type: 'Feature',
  properties: {},
  geometry: { type: 'Polygon', coordinates: [coords] },
});
const errorOf = (fn: () => unknown): UploadError => {
  try {
    fn();
  } catch (e) {
    return e as UploadError;
  }
  throw new Error('expected an UploadError');
};
const FENNICK: [number, number, number, number] = [-3.2, 47.4, -2.6, 47.8];
const lease = poly([
  [-2.95, 47.58],
  [-2.94, 47.58],
  [-2.94, 47.59],
  [-2.95, 47.58],
]);

describe('checkCoordinates (limits: |lon| ≤ 180, |lat| ≤ 90 — RFC 7946 §4, WGS 84 degrees)', () => {
  it('accepts data inside the range and the expected region without warnings', () => {
    expect(checkCoordinates([lease], { expectedBbox: FENNICK })).toEqual([]);
    expect(
      checkCoordinates([
        poly([
          [180, 90],
          [-180, -90],
          [0, 0],
          [180, 90],
        ]),
      ]),
    ).toEqual([]);
  });

  it('names the feature and the value for projected metres, and suggests a missing or wrong .prj', () => {
    const e = errorOf(() =>
      checkCoordinates([
        lease,
        poly([
          [503684.7, 5269733],
          [503700, 5269733],
          [503700, 5269800],
          [503684.7, 5269733],
        ]),
      ]),
    );
    expect(e.status).toBe(422);
    expect(e.code).toBe('coordinates_out_of_range');
    expect(e.message).toMatch(/^Feature 1 has the coordinate \(503684\.7, 5269733\)/);
    expect(e.message).toMatch(/\.prj is missing or wrong/);
    expect(e.details).toMatchObject({ index: 1, features: 1 });
  });

  it('says "swapped" when every first value is a latitude and a second value passes 90', () => {
    const e = errorOf(() =>
      checkCoordinates(
        [
          poly([
            [-41.2, 173.9],
            [-41.2, 173.95],
            [-41.1, 173.95],
            [-41.2, 173.9],
          ]),
        ],
        { layerName: 'leases' },
      ),
    );
    expect(e.code).toBe('coordinates_swapped');
    expect(e.message).toMatch(/latitude and longitude are swapped: feature 0 of layer “leases” has \(-41\.2, 173\.9\)/);
  });

  it('does not call values beyond 180 "swapped"', () => {
    expect(
      errorOf(() =>
        checkCoordinates([
          poly([
            [45, 200],
            [46, 200],
            [46, 201],
            [45, 200],
          ]),
        ]),
      ).code,
    ).toBe('coordinates_out_of_range');
  });

  it('refuses non-finite values', () => {
    expect(
      errorOf(() =>
        checkCoordinates([
          poly([
            [Number.NaN, 1],
            [2, 2],
            [3, 1],
            [Number.NaN, 1],
          ]),
        ]),
      ).code,
    ).toBe('coordinates_out_of_range');
  });

  it('warns when only the swapped data fall in the expected region', () => {
    const swapped = poly([
      [47.58, -2.95],
      [47.58, -2.94],
      [47.59, -2.94],
      [47.58, -2.95],
    ]);
    expect(checkCoordinates([swapped], { expectedBbox: FENNICK })[0]).toMatch(/may have latitude and longitude swapped/);
  });

  it('warns when no feature falls in the expected region', () => {
    const far = poly([
      [7.05, 27.58],
      [7.06, 27.58],
      [7.06, 27.59],
      [7.05, 27.58],
    ]);
    expect(checkCoordinates([far], { expectedBbox: FENNICK })[0]).toMatch(/None of the 1 features lie within the expected region/);
  });
});

describe('bboxOf', () => {
  it('spans every position of every geometry type', () => {
    const features: Feature<Geometry | null>[] = [
      { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [5, 5] } },
      {
        type: 'Feature',
        properties: {},
        geometry: {
          type: 'MultiPolygon',
          coordinates: [
            [
              [
                [-1, 2],
                [0, 3],
                [1, 2],
                [-1, 2],
              ],
            ],
          ],
        },
      },
      { type: 'Feature', properties: {}, geometry: null },
    ];
    expect(bboxOf(features)).toEqual([-1, 2, 5, 5]);
    expect(bboxOf([])).toBeNull();
  });
});

describe('coordinateCheck (checkCoordinates a chunk at a time, as the server stages large layers)', () => {
  // The reference is checkCoordinates on the whole layer (above, checked against RFC 7946 §4's ranges): chunked,
  // every verdict, message and detail must be the same, including those that need layer-wide figures.
  const chunked = (features: Feature<Geometry>[], size: number, options = {}) => {
    const check = coordinateCheck(options);
    for (let at = 0; at < features.length; at += size) check.add(features.slice(at, at + size), at);
    return check;
  };
  const verdict = (fn: () => string[]) => {
    try {
      return { warnings: fn() };
    } catch (e) {
      const err = e as UploadError;
      return { code: err.code, message: err.message, details: err.details };
    }
  };
  const metres = poly([
    [503684.7, 5269733],
    [503700, 5269733],
    [503700, 5269800],
    [503684.7, 5269733],
  ]);
  const swapped = poly([
    [47.58, -2.95],
    [47.58, -2.94],
    [47.59, -2.94],
    [47.58, -2.95],
  ]);
  const swappedBeyond90 = poly([
    [47.58, 120.5],
    [47.58, 120.6],
    [47.59, 120.6],
    [47.58, 120.5],
  ]);
  const layers: [string, Feature<Geometry>[], object][] = [
    ['all in range and in the region', [lease, lease, lease, lease, lease], { expectedBbox: FENNICK }],
    ['projected metres in the fourth feature, counted over every chunk', [lease, lease, lease, metres, lease, metres, metres], { layerName: 'leases' }],
    ['latitude and longitude swapped past 90° in a later chunk', [swapped, swapped, swapped, swapped, swappedBeyond90], {}],
    ['swapped inside the region (a warning)', [swapped, swapped, lease, swapped, swapped], { expectedBbox: FENNICK }],
    ['nothing in the expected region (a warning)', [swapped, swapped, swapped], { expectedBbox: [10, 10, 11, 11] }],
  ];
  for (const [what, features, options] of layers) {
    it(`gives the whole-layer verdict in chunks of 1, 2 and 3: ${what}`, () => {
      const whole = verdict(() => checkCoordinates(features, options));
      for (const size of [1, 2, 3]) expect(verdict(() => chunked(features, size, options).finish())).toEqual(whole);
    });
  }

  it('says it is failing from the first chunk with a position out of range', () => {
    const check = coordinateCheck();
    check.add([lease, lease], 0);
    expect(check.failing).toBe(false);
    check.add([metres], 2);
    expect(check.failing).toBe(true);
    expect(() => check.finish()).toThrow(/^Feature 2 has the coordinate \(503684\.7, 5269733\)/);
  });
});
