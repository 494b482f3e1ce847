import type { Feature, Geometry } from 'geojson';
import { describe, expect, it } from 'vitest';
import { bboxOf, checkCoordinates } from '../../../shared/geometry/check-coordinates';
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
