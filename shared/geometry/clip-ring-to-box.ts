/**
 * @module shared/geometry/clip-ring-to-box
 * Clips a planar ring to an axis-aligned box (Sutherland–Hodgman), carrying a mark per edge,
 * so only the part of a large land polygon near the plume enters the overlay.
 */

import type { PlanarPoint } from './overlay-rings';

/** A ring with one mark per edge (edge i: points[i] → points[i+1], the closing edge last). */
export interface MarkedRing {
  /** Vertices [x, y] in metres (open ring). */
  readonly points: PlanarPoint[];
  /** Mark of each edge (0 for edges along the box). */
  readonly marks: number[];
}

/**
 * Clips a ring to a box. Concave rings may come back with edges doubled back along the box
 * side; they enclose no area and leave the winding number of every other point unchanged,
 * which is all the overlay needs.
 *
 * @param ring - open ring [x, y] in metres
 * @param marks - one mark per edge (copied to the pieces of that edge; new edges along the box get 0)
 * @param box - [minX, minY, maxX, maxY] in metres
 * @returns the clipped ring and marks; an empty ring when nothing is inside
 * @example
 * clipRingToBox([[0, 0], [10, 0], [10, 10], [0, 10]], [1, 2, 3, 4], [5, -1, 20, 20]);
 * // => { points: [[5, 10], [5, 0], [10, 0], [10, 10]], marks: [0, 1, 2, 3] }
 * Source: (a) published: Sutherland & Hodgman 1974, "Reentrant polygon clipping",
 * Communications of the ACM 17(1), 32–42; the mark bookkeeping is (c).
 */
export function clipRingToBox(ring: readonly PlanarPoint[], marks: readonly number[], box: readonly number[]): MarkedRing {
  let points: PlanarPoint[] = [...ring];
  let edgeMarks: number[] = ring.map((_, i) => marks[i] ?? 0);
  const [minX, minY, maxX, maxY] = box;
  const planes: [number, number, number][] = [
    [0, 1, minX],
    [0, -1, maxX],
    [1, 1, minY],
    [1, -1, maxY],
  ];
  for (const [axis, sign, value] of planes) {
    if (points.length === 0) break;
    const inside = (p: PlanarPoint) => sign * (p[axis] - value) >= 0;
    const cut = (a: PlanarPoint, b: PlanarPoint): PlanarPoint => {
      const t = (value - a[axis]) / (b[axis] - a[axis]);
      const p: [number, number] = [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])];
      p[axis] = value;
      return p;
    };
    const outPoints: PlanarPoint[] = [];
    const outMarks: number[] = [];
    const n = points.length;
    for (let i = 0; i < n; i += 1) {
      const s = points[i];
      const e = points[(i + 1) % n];
      const mark = edgeMarks[i];
      const nextMark = edgeMarks[(i + 1) % n];
      if (inside(e)) {
        if (!inside(s)) {
          outPoints.push(cut(s, e));
          outMarks.push(mark);
        }
        outPoints.push(e);
        outMarks.push(nextMark);
      } else if (inside(s)) {
        outPoints.push(cut(s, e));
        outMarks.push(0);
      }
    }
    points = outPoints;
    edgeMarks = outMarks;
  }
  return { points, marks: edgeMarks };
}
