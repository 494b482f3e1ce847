// prepareCoast and localProjection: joining shoreline pieces, rings, land-ring orientation,
// dividing long segments (c); projection centre and round trip (c, checked against the
// published definition of the azimuthal equidistant projection: distances from the centre
// are true, 0.1° of latitude at 41° N ≈ 11.1 km).
import { describe, expect, it } from 'vitest';
import { localProjection } from '../../../shared/geometry/local-projection';
import { ringArea } from '../../../shared/geometry/overlay-rings';
import { COAST_MAX_SEGMENT, prepareCoast } from '../../../shared/geometry/prepare-coast';

const projection = localProjection([-70, 41]);

describe('localProjection', () => {
  it('puts the centre at the origin and keeps distances from it', () => {
    expect(projection.forward([-70, 41])).toEqual([0, 0]);
    expect(projection.forward([-70, 41.1])[1]).toBeCloseTo(11_105.49, 1);
    const back = projection.inverse(projection.forward([-69.5, 41.3]));
    expect(back[0]).toBeCloseTo(-69.5, 9);
    expect(back[1]).toBeCloseTo(41.3, 9);
    expect(() => localProjection([200, 0])).toThrow(RangeError);
  });
});

describe('prepareCoast', () => {
  it('joins shoreline pieces that meet end to end (reversing one) into one line', () => {
    const coast = prepareCoast(
      {
        type: 'MultiLineString',
        coordinates: [
          [
            [-70, 40.99],
            [-70, 41],
          ],
          [
            [-70, 41.01],
            [-70, 41],
          ],
        ],
      },
      projection,
    );
    expect(coast.lines).toHaveLength(1);
    expect(coast.lines[0].closed).toBe(false);
    expect(coast.lines[0].points[0][1]).toBeLessThan(0);
    expect(coast.lines[0].points[coast.lines[0].points.length - 1][1]).toBeGreaterThan(0);
  });

  it('treats a closed shoreline as a ring (an island) and divides segments longer than 250 m', () => {
    const coast = prepareCoast(
      {
        type: 'LineString',
        coordinates: [
          [-70, 41],
          [-69.99, 41],
          [-69.99, 41.01],
          [-70, 41],
        ],
      },
      projection,
    );
    expect(coast.lines[0].closed).toBe(true);
    const pts = coast.lines[0].points;
    for (let i = 0; i < pts.length; i += 1) {
      const a = pts[i];
      const b = pts[(i + 1) % pts.length];
      expect(Math.hypot(b[0] - a[0], b[1] - a[1])).toBeLessThanOrEqual(COAST_MAX_SEGMENT + 1);
    }
  });

  it('orients land-polygon rings: exterior anticlockwise, holes clockwise', () => {
    const coast = prepareCoast(
      {
        type: 'Feature',
        properties: {},
        geometry: {
          type: 'Polygon',
          coordinates: [
            [
              [-70, 41],
              [-70, 41.01],
              [-69.99, 41.01],
              [-69.99, 41],
              [-70, 41],
            ],
            [
              [-69.996, 41.004],
              [-69.994, 41.004],
              [-69.994, 41.006],
              [-69.996, 41.004],
            ],
          ],
        },
      },
      projection,
    );
    expect(coast.landPolygons).toBe(1);
    expect(coast.lines.map((l) => l.source)).toEqual(['land-ring', 'land-ring']);
    expect(ringArea(coast.lines[0].points)).toBeGreaterThan(0);
    expect(ringArea(coast.lines[1].points)).toBeLessThan(0);
  });

  it('skips pieces outside the window and rejects bad coordinates', () => {
    const coast = prepareCoast(
      {
        type: 'FeatureCollection',
        features: [
          {
            type: 'Feature',
            properties: {},
            geometry: {
              type: 'LineString',
              coordinates: [
                [-60, 10],
                [-60, 10.1],
              ],
            },
          },
        ],
      },
      projection,
      { centre: [-70, 41], radius: 50_000 },
    );
    expect(coast.lines).toEqual([]);
    expect(() =>
      prepareCoast(
        {
          type: 'LineString',
          coordinates: [
            [-70, 95],
            [-70, 41],
          ],
        },
        projection,
      ),
    ).toThrow(/EPSG:4326/);
  });
});
