/**
 * @module demo-data/lib/planar
 * Small planar-geometry helpers in the local metric frame (metres), used to build and check the
 * demo geography: ring area and orientation, point-in-ring, segment and ring distances.
 */
import type { Xy } from './local-frame';

/** Signed area of a ring [m²]: positive when counter-clockwise (shoelace formula). */
export function signedArea(ring: readonly Xy[]): number {
  let sum = 0;
  for (let i = 0; i < ring.length; i++) {
    const a = ring[i];
    const b = ring[(i + 1) % ring.length];
    sum += a[0] * b[1] - b[0] * a[1];
  }
  return sum / 2;
}

/** Returns the ring counter-clockwise (exterior rings in GeoJSON, RFC 7946 §3.1.6). */
export function counterClockwise(ring: readonly Xy[]): Xy[] {
  return signedArea(ring) >= 0 ? [...ring] : [...ring].reverse();
}

/** Returns the ring clockwise. */
export function clockwise(ring: readonly Xy[]): Xy[] {
  return signedArea(ring) <= 0 ? [...ring] : [...ring].reverse();
}

/** Closes a ring (repeats the first point at the end) if it is open. */
export function closeRing(ring: readonly Xy[]): Xy[] {
  const first = ring[0];
  const last = ring[ring.length - 1];
  return first[0] === last[0] && first[1] === last[1] ? [...ring] : [...ring, first];
}

/** True when the point lies inside the (open or closed) ring, by ray casting. */
export function pointInRing(p: Xy, ring: readonly Xy[]): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > p[1] !== yj > p[1] && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/** Distance from a point to a segment [m]. */
export function pointSegmentDistance(p: Xy, a: Xy, b: Xy): number {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2));
  return Math.hypot(p[0] - (a[0] + t * dx), p[1] - (a[1] + t * dy));
}

/** True when segments ab and cd cross or touch. */
export function segmentsIntersect(a: Xy, b: Xy, c: Xy, d: Xy): boolean {
  const o1 = orient(a, b, c);
  const o2 = orient(a, b, d);
  const o3 = orient(c, d, a);
  const o4 = orient(c, d, b);
  if (o1 * o2 < 0 && o3 * o4 < 0) return true;
  return (
    (o1 === 0 && onSegment(a, c, b)) ||
    (o2 === 0 && onSegment(a, d, b)) ||
    (o3 === 0 && onSegment(c, a, d)) ||
    (o4 === 0 && onSegment(c, b, d))
  );
}

/** Smallest distance between two segments [m] (0 when they cross). */
export function segmentDistance(a: Xy, b: Xy, c: Xy, d: Xy): number {
  if (segmentsIntersect(a, b, c, d)) return 0;
  return Math.min(
    pointSegmentDistance(a, c, d),
    pointSegmentDistance(b, c, d),
    pointSegmentDistance(c, a, b),
    pointSegmentDistance(d, a, b),
  );
}

/** Smallest distance between the boundaries of two rings, or polylines when `open` [m]. */
export function boundaryDistance(p: readonly Xy[], q: readonly Xy[], open = { p: false, q: false }): number {
  let best = Number.POSITIVE_INFINITY;
  const np = open.p ? p.length - 1 : p.length;
  const nq = open.q ? q.length - 1 : q.length;
  for (let i = 0; i < np; i++) {
    const a = p[i];
    const b = p[(i + 1) % p.length];
    for (let j = 0; j < nq; j++) {
      const d = segmentDistance(a, b, q[j], q[(j + 1) % q.length]);
      if (d < best) best = d;
    }
  }
  return best;
}

/** Centroid of a ring (area-weighted). */
export function ringCentroid(ring: readonly Xy[]): Xy {
  let cx = 0;
  let cy = 0;
  let a2 = 0;
  for (let i = 0; i < ring.length; i++) {
    const p = ring[i];
    const q = ring[(i + 1) % ring.length];
    const cross = p[0] * q[1] - q[0] * p[1];
    a2 += cross;
    cx += (p[0] + q[0]) * cross;
    cy += (p[1] + q[1]) * cross;
  }
  return [cx / (3 * a2), cy / (3 * a2)];
}

/** @private Orientation sign of the triangle abc. */
function orient(a: Xy, b: Xy, c: Xy): number {
  const v = (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
  return v > 0 ? 1 : v < 0 ? -1 : 0;
}

/** @private True when q lies within the bounding box of pr (for collinear points). */
function onSegment(p: Xy, q: Xy, r: Xy): boolean {
  return q[0] <= Math.max(p[0], r[0]) && q[0] >= Math.min(p[0], r[0]) && q[1] <= Math.max(p[1], r[1]) && q[1] >= Math.min(p[1], r[1]);
}
