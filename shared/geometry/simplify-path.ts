/**
 * @module shared/geometry/simplify-path
 * Douglas–Peucker simplification of a planar polyline that returns the indices it keeps, so
 * that values attached to the vertices (arc lengths along the coast) stay attached.
 */

import type { PlanarPoint } from './overlay-rings';

/**
 * Indices of the vertices kept by Douglas–Peucker simplification: every dropped vertex lies
 * within `tolerance` of the kept polyline's segment that spans it.
 *
 * @param points - polyline vertices [x, y] in metres
 * @param tolerance - largest allowed distance [m], ≥ 0 (0 keeps every non-collinear vertex)
 * @param keep - indices that must be kept (the ends always are)
 * @returns sorted indices into points
 * @example
 * simplifyPath([[0, 0], [5, 0.1], [10, 0], [10, 10]], 0.5); // => [0, 2, 3]
 * Source: (a) published: Douglas & Peucker 1973, The Canadian Cartographer 10(2), 112–122;
 * iterative form with an explicit stack (c).
 */
export function simplifyPath(points: readonly PlanarPoint[], tolerance: number, keep: readonly number[] = []): number[] {
  if (!(tolerance >= 0)) throw new RangeError(`simplify tolerance must be ≥ 0 m (got ${String(tolerance)})`);
  const n = points.length;
  if (n <= 2) return points.map((_, i) => i);
  const kept = new Uint8Array(n);
  kept[0] = 1;
  kept[n - 1] = 1;
  const forced = [...new Set([0, n - 1, ...keep.filter((i) => i >= 0 && i < n)])].sort((a, b) => a - b);
  for (const i of forced) kept[i] = 1;
  const stack: number[] = [];
  for (let k = 0; k + 1 < forced.length; k += 1) stack.push(forced[k], forced[k + 1]);
  while (stack.length > 0) {
    const last = stack.pop() as number;
    const first = stack.pop() as number;
    if (last - first < 2) continue;
    const [ax, ay] = points[first];
    const [bx, by] = points[last];
    const dx = bx - ax;
    const dy = by - ay;
    const l2 = dx * dx + dy * dy;
    let worst = -1;
    let index = -1;
    for (let i = first + 1; i < last; i += 1) {
      const [px, py] = points[i];
      let d: number;
      if (l2 === 0) d = Math.hypot(px - ax, py - ay);
      else {
        const t = Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / l2));
        d = Math.hypot(px - ax - t * dx, py - ay - t * dy);
      }
      if (d > worst) {
        worst = d;
        index = i;
      }
    }
    if (worst > tolerance) {
      kept[index] = 1;
      stack.push(first, index, index, last);
    }
  }
  const out: number[] = [];
  for (let i = 0; i < n; i += 1) if (kept[i]) out.push(i);
  return out;
}
