import type { MultiPolygon, Polygon, Position } from 'geojson';
import { describe, expect, it } from 'vitest';
import { ellipsoidalArea, summariseFeatures } from '../../../shared/geometry/polygon-area';

/**
 * Surface area of the WGS 84 ellipsoid from its authalic formula, S = 2πa²(1 + (1 − e²)/e · atanh e)
 * (Snyder, Map Projections — A Working Manual, USGS PP 1395, 1987, eqs. 3-12 and 3-13), with
 * a = 6 378 137 m and 1/f = 298.257223563 (EPSG:7030).
 */
const a = 6378137;
const f = 1 / 298.257223563;
const e2 = f * (2 - f);
const e = Math.sqrt(e2);
const ELLIPSOID_AREA = 2 * Math.PI * a * a * (1 + ((1 - e2) / e) * Math.atanh(e));

const rect = (w: number, s: number, east: number, n: number): Position[] => [
  [w, s],
  [east, s],
  [east, n],
  [w, n],
  [w, s],
];

describe('ellipsoidalArea', () => {
  it('gives 1/360 of a hemisphere for the triangle equator 0°–1°E and the North Pole (Snyder 1987 authalic area)', () => {
    // Its edges are the equator and two meridians, all geodesics, so the geodesic polygon is exactly this lune half.
    const tri: Polygon = {
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [1, 0],
          [0.5, 90],
          [0, 0],
        ],
      ],
    };
    // (b) from memory: GeographicLib's documentation quotes 510 065 621 724 088.5 m² for the WGS 84 ellipsoid.
    expect(ELLIPSOID_AREA).toBeCloseTo(510_065_621_724_088, -3);
    expect(ellipsoidalArea(tri) / (ELLIPSOID_AREA / 2 / 360)).toBeCloseTo(1, 12);
  });

  it('is the same whichever way the rings turn', () => {
    const ring = rect(-2.951, 47.581, -2.9465, 47.5835);
    const ccw = ellipsoidalArea({ type: 'Polygon', coordinates: [ring] });
    const cw = ellipsoidalArea({ type: 'Polygon', coordinates: [[...ring].reverse()] });
    expect(cw).toBeCloseTo(ccw, 6);
  });

  it('subtracts holes and adds the parts of a MultiPolygon (hand check: outer − hole, part + part)', () => {
    const outer = rect(-2.94, 47.585, -2.932, 47.59);
    const hole = rect(-2.937, 47.5865, -2.935, 47.5885);
    const outerArea = ellipsoidalArea({ type: 'Polygon', coordinates: [outer] });
    const holeArea = ellipsoidalArea({ type: 'Polygon', coordinates: [hole] });
    expect(ellipsoidalArea({ type: 'Polygon', coordinates: [outer, hole] })).toBeCloseTo(outerArea - holeArea, 6);
    const multi: MultiPolygon = { type: 'MultiPolygon', coordinates: [[outer, hole], [rect(-2.962, 47.5725, -2.957, 47.575)]] };
    const second = ellipsoidalArea({ type: 'Polygon', coordinates: [rect(-2.962, 47.5725, -2.957, 47.575)] });
    expect(ellipsoidalArea(multi)).toBeCloseTo(outerArea - holeArea + second, 6);
  });

  it('matches the small-cell approximation (dλ·N cosφ)·(dφ·M) for a 0.01° cell at 47.6° N within 0.01 %', () => {
    // Radii of curvature: M = a(1−e²)/(1−e² sin²φ)^1.5, N = a/(1−e² sin²φ)^0.5 (Snyder 1987, eqs. 4-18 and 4-20).
    const phi = (47.605 * Math.PI) / 180;
    const w = 1 - e2 * Math.sin(phi) ** 2;
    const M = (a * (1 - e2)) / w ** 1.5;
    const N = a / Math.sqrt(w);
    const approx = ((0.01 * Math.PI) / 180) * N * Math.cos(phi) * (((0.01 * Math.PI) / 180) * M);
    const area = ellipsoidalArea({ type: 'Polygon', coordinates: [rect(-2.9, 47.6, -2.89, 47.61)] });
    expect(Math.abs(area - approx) / approx).toBeLessThan(1e-4);
  });

  it('is 0 for a degenerate ring (OpenLayers-style hand case)', () => {
    expect(
      ellipsoidalArea({
        type: 'Polygon',
        coordinates: [
          [
            [0, 0],
            [1, 1],
            [0, 0],
          ],
        ],
      }),
    ).toBe(0);
  });
});

describe('summariseFeatures', () => {
  it('gives index, properties, area (null for lines), bbox and vertex count', () => {
    const out = summariseFeatures([
      {
        type: 'Feature',
        properties: { LEASE_ID: 'FB-014' },
        geometry: { type: 'Polygon', coordinates: [rect(-2.951, 47.581, -2.9465, 47.5835)] },
      },
      {
        type: 'Feature',
        properties: null,
        geometry: {
          type: 'LineString',
          coordinates: [
            [-3, 47.56],
            [-2.97, 47.565],
          ],
        },
      },
    ]);
    expect(out[0]).toMatchObject({
      index: 0,
      properties: { LEASE_ID: 'FB-014' },
      bbox: [-2.951, 47.581, -2.9465, 47.5835],
      vertexCount: 5,
    });
    expect(out[0].areaM2).toBeGreaterThan(90_000); // 0.0045° × 0.0025° at 47.58° N ≈ 338 m × 278 m ≈ 9.4 ha (hand calculation)
    expect(out[0].areaM2).toBeLessThan(96_000);
    expect(out[1]).toEqual({ index: 1, properties: {}, areaM2: null, bbox: [-3, 47.56, -2.97, 47.565], vertexCount: 2 });
  });
});
