/**
 * @module shared/geometry/snap-to-coast
 * The nearest point on a set of planar coast lines to a given point (the river mouth, which
 * is often digitised a little off the shoreline).
 */

import type { PlanarPoint } from './overlay-rings';

/** A position on a coast line. */
export interface CoastPosition {
  /** Index of the line in the list given. */
  readonly line: number;
  /** Segment index: points[segment] → points[segment + 1] (the closing segment of a ring is the last). */
  readonly segment: number;
  /** Position along the segment, 0…1. */
  readonly t: number;
  /** The point [x, y] in metres. */
  readonly point: PlanarPoint;
  /** Distance from the point given to this position [m]. */
  readonly distance: number;
}

/**
 * Finds the nearest point on any of the lines.
 *
 * @param lines - planar lines { points [x, y] in metres, closed }
 * @param point - [x, y] in metres
 * @returns the nearest coast position, or null when there are no segments
 * @example
 * snapToCoast([{ points: [[0, -10], [0, 10]], closed: false }], [-3, 2]);
 * // => { line: 0, segment: 0, t: 0.6, point: [0, 2], distance: 3 }
 * Source: (c) common practice: orthogonal projection on each segment, clamped to its ends.
 */
export function snapToCoast(
  lines: readonly { readonly points: readonly PlanarPoint[]; readonly closed: boolean }[],
  point: PlanarPoint,
): CoastPosition | null {
  let best: CoastPosition | null = null;
  const [px, py] = point;
  lines.forEach((line, li) => {
    const pts = line.points;
    const n = pts.length;
    const segments = line.closed ? n : n - 1;
    for (let i = 0; i < segments; i += 1) {
      const [ax, ay] = pts[i];
      const [bx, by] = pts[(i + 1) % n];
      const dx = bx - ax;
      const dy = by - ay;
      const l2 = dx * dx + dy * dy;
      const t = l2 > 0 ? Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / l2)) : 0;
      const x = ax + t * dx;
      const y = ay + t * dy;
      const distance = Math.hypot(px - x, py - y);
      if (!best || distance < best.distance) best = { line: li, segment: i, t, point: [x, y], distance };
    }
  });
  return best;
}
