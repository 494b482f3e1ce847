// walkCoast and snapToCoast: hand-checkable polylines (c).
import { describe, expect, it } from 'vitest';
import { snapToCoast } from '../../../shared/geometry/snap-to-coast';
import { walkCoast } from '../../../shared/geometry/walk-coast';

const line = {
  points: [
    [0, 0],
    [0, 10],
    [10, 10],
  ] as [number, number][],
  closed: false,
};
const square = {
  points: [
    [0, 0],
    [10, 0],
    [10, 10],
    [0, 10],
  ] as [number, number][],
  closed: true,
};

describe('snapToCoast', () => {
  it('projects onto the nearest segment', () => {
    expect(
      snapToCoast(
        [
          {
            points: [
              [0, -10],
              [0, 10],
            ],
            closed: false,
          },
        ],
        [-3, 2],
      ),
    ).toEqual({ line: 0, segment: 0, t: 0.6, point: [0, 2], distance: 3 });
  });
  it('looks at every line, including the closing segment of a ring', () => {
    const snap = snapToCoast([line, square], [-1, 5]);
    expect(snap?.line).toBe(0);
    expect(snapToCoast([square], [-1, 5])).toMatchObject({ segment: 3, point: [0, 5], distance: 1 });
    expect(snapToCoast([], [0, 0])).toBeNull();
  });
});

describe('walkCoast', () => {
  it('walks forwards for the length asked', () => {
    expect(walkCoast(line, { segment: 0, t: 0.5, point: [0, 5] }, 1, 8)).toEqual({
      points: [
        [0, 5],
        [0, 10],
        [3, 10],
      ],
      along: [0, 5, 8],
      segments: [0, 1],
      length: 8,
      stop: 'length',
    });
  });
  it('walks backwards and stops where the line ends', () => {
    expect(walkCoast(line, { segment: 1, t: 0.5, point: [5, 10] }, -1, 100)).toEqual({
      points: [
        [5, 10],
        [0, 10],
        [0, 0],
      ],
      along: [0, 5, 15],
      segments: [1, 0],
      length: 15,
      stop: 'line-end',
    });
  });
  it('goes round a ring once at most', () => {
    const walk = walkCoast(square, { segment: 0, t: 0.5, point: [5, 0] }, 1, 100);
    expect(walk.stop).toBe('ring-complete');
    expect(walk.length).toBeCloseTo(40, 12);
    expect(walk.points[walk.points.length - 1]).toEqual([5, 0]);
    expect(walk.segments).toEqual([0, 1, 2, 3, 0]);
  });
  it('rejects a negative length', () => {
    expect(() => walkCoast(line, { segment: 0, t: 0, point: [0, 0] }, 1, -1)).toThrow(RangeError);
  });
});
