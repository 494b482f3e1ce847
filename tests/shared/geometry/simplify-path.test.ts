// simplifyPath and clipRingToBox: hand-checkable cases (c).
import { describe, expect, it } from 'vitest';
import { clipRingToBox } from '../../../shared/geometry/clip-ring-to-box';
import { simplifyPath } from '../../../shared/geometry/simplify-path';

describe('simplifyPath', () => {
  it('drops vertices within the tolerance and keeps the rest', () => {
    expect(
      simplifyPath(
        [
          [0, 0],
          [5, 0.1],
          [10, 0],
          [10, 10],
        ],
        0.5,
      ),
    ).toEqual([0, 2, 3]);
    expect(
      simplifyPath(
        [
          [0, 0],
          [5, 0.1],
          [10, 0],
          [10, 10],
        ],
        0.05,
      ),
    ).toEqual([0, 1, 2, 3]);
  });
  it('keeps forced vertices', () => {
    expect(
      simplifyPath(
        [
          [0, 0],
          [1, 0],
          [2, 0],
          [3, 0],
        ],
        1,
        [2],
      ),
    ).toEqual([0, 2, 3]);
  });
  it('rejects a negative tolerance', () => {
    expect(() =>
      simplifyPath(
        [
          [0, 0],
          [1, 1],
          [2, 0],
        ],
        -1,
      ),
    ).toThrow(RangeError);
  });
});

describe('clipRingToBox', () => {
  it('clips a square to a box, carrying the edge marks (new box edges get 0)', () => {
    expect(
      clipRingToBox(
        [
          [0, 0],
          [10, 0],
          [10, 10],
          [0, 10],
        ],
        [1, 2, 3, 4],
        [5, -1, 20, 20],
      ),
    ).toEqual({
      points: [
        [5, 10],
        [5, 0],
        [10, 0],
        [10, 10],
      ],
      marks: [0, 1, 2, 3],
    });
  });
  it('returns an empty ring when nothing is inside', () => {
    expect(
      clipRingToBox(
        [
          [0, 0],
          [1, 0],
          [1, 1],
        ],
        [0, 0, 0],
        [5, 5, 6, 6],
      ).points,
    ).toEqual([]);
  });
});
