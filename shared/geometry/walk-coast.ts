/**
 * @module shared/geometry/walk-coast
 * Walks along one planar coast line from a position on it, forwards (the digitised
 * direction) or backwards, for a given arc length: the stretch of coast a plume follows.
 */

import type { PlanarPoint } from './overlay-rings';

/** The start of a walk: a position on the line. */
export interface WalkStart {
  /** Segment index (points[segment] → points[segment + 1]; the closing segment of a ring is the last). */
  readonly segment: number;
  /** Position along the segment, 0…1. */
  readonly t: number;
  /** The start point [x, y] in metres. */
  readonly point: PlanarPoint;
}

/** A walked stretch of coast. */
export interface WalkedPath {
  /** Vertices [x, y] in metres, the start point first. */
  readonly points: PlanarPoint[];
  /** Arc length of each vertex from the start [m]. */
  readonly along: number[];
  /** For each path segment k (points[k] → points[k+1]), the index of the coast segment it lies on. */
  readonly segments: number[];
  /** Total arc length walked [m]. */
  readonly length: number;
  /** Why the walk stopped: the length was reached, the line ended, or a ring was walked right round. */
  readonly stop: 'length' | 'line-end' | 'ring-complete';
}

/**
 * Walks a coast line from a start position.
 *
 * @param line - { points [x, y] in metres, closed }
 * @param start - segment, t and point on the line
 * @param direction - +1 along the digitised direction, −1 against it
 * @param length - arc length to walk [m], ≥ 0
 * @returns the walked path (vertices, arc lengths, coast segments) and why it stopped
 * @example
 * walkCoast({ points: [[0, 0], [0, 10], [10, 10]], closed: false }, { segment: 0, t: 0.5, point: [0, 5] }, 1, 8);
 * // => { points: [[0, 5], [0, 10], [3, 10]], along: [0, 5, 8], segments: [0, 1], length: 8, stop: 'length' }
 * Source: (c) common practice: arc-length parametrisation of a polyline.
 */
export function walkCoast(
  line: { readonly points: readonly PlanarPoint[]; readonly closed: boolean },
  start: WalkStart,
  direction: 1 | -1,
  length: number,
): WalkedPath {
  if (!(length >= 0)) throw new RangeError(`walk length must be ≥ 0 m (got ${String(length)})`);
  const pts = line.points;
  const n = pts.length;
  const segmentCount = line.closed ? n : n - 1;
  let limit = length;
  let stop: WalkedPath['stop'] = 'length';
  if (line.closed) {
    let perimeter = 0;
    for (let i = 0; i < n; i += 1) perimeter += dist(pts[i], pts[(i + 1) % n]);
    if (perimeter <= limit) {
      limit = perimeter;
      stop = 'ring-complete';
    }
  }
  const points: PlanarPoint[] = [start.point];
  const along: number[] = [0];
  const segments: number[] = [];
  let walked = 0;
  let segment = start.segment;
  let here = start.point;
  for (let steps = 0; steps <= segmentCount + 1; steps += 1) {
    const vertexIndex = direction > 0 ? (segment + 1) % n : segment;
    const target = pts[vertexIndex];
    const step = dist(here, target);
    if (walked + step >= limit) {
      const f = step > 0 ? (limit - walked) / step : 0;
      const end: PlanarPoint = [here[0] + f * (target[0] - here[0]), here[1] + f * (target[1] - here[1])];
      if (limit - walked > 0) {
        points.push(end);
        along.push(limit);
        segments.push(segment);
      }
      walked = limit;
      break;
    }
    if (step > 0) {
      points.push(target);
      walked += step;
      along.push(walked);
      segments.push(segment);
    }
    here = target;
    const next = segment + direction;
    if (!line.closed && (next < 0 || next >= segmentCount)) {
      stop = 'line-end';
      break;
    }
    segment = (next + segmentCount) % segmentCount;
  }
  return { points, along, segments, length: walked, stop };
}

/** @private Distance between two points. */
function dist(a: PlanarPoint, b: PlanarPoint): number {
  return Math.hypot(b[0] - a[0], b[1] - a[1]);
}
