/**
 * @module shared/geometry/offset-strip
 * The pieces of a one-sided, variable-width strip along a path: for each segment a quad from
 * a little inside the land (the landward extension) out to the offset width on the sea side.
 * At a bend away from the sea (convex) the quads keep their own normals and a fan (circular
 * sector) fills the gap between them; at a bend towards the sea (concave, up to 150°)
 * neighbouring quads share a mitred edge along the bisector that reaches the offset lines'
 * intersection. Along a bay narrower than the band the shared edges cross beyond the centre of
 * curvature; such quads are split into two triangles at the crossing, so the far edge stays
 * continuous (with per-segment normals it would break into a sawtooth there). The union of the
 * pieces (see union-rings) is the band before it is clipped to the sea. Pieces come out in
 * path order, so neighbours in the list are neighbours on the map.
 */

import type { PlanarPoint } from './overlay-rings';

/** Input of {@link offsetStrip}. */
export interface StripInput {
  /** Path vertices [x, y] in metres (consecutive vertices distinct), ≥ 2. */
  readonly points: readonly PlanarPoint[];
  /** Width at the start of each segment k (points[k] → points[k+1]) [m], ≥ 0. */
  readonly widthStart: readonly number[];
  /** Width at the end of each segment k [m], ≥ 0. */
  readonly widthEnd: readonly number[];
  /** +1 when the sea is on the left of the path direction, −1 when on the right. */
  readonly seaSide: 1 | -1;
  /** Extension of every quad onto the land side [m], ≥ 0. */
  readonly landward: number;
  /** Largest gap between a fan's chords and its true arc [m], > 0. */
  readonly arcTolerance: number;
}

/**
 * Builds the quads and fans of a one-sided variable-width strip.
 *
 * @param input - path [m], widths per segment end [m], sea side, landward extension [m], arc tolerance [m]
 * @returns rings [x, y] in metres (open), in path order; segments with zero width at both ends are left out
 * @example
 * offsetStrip({ points: [[0, 0], [0, 10]], widthStart: [4], widthEnd: [2], seaSide: 1, landward: 1, arcTolerance: 0.1 });
 * // => [[[1, 0], [1, 10], [-2, 10], [-4, 0]]] (sea to the west of a path running north)
 * Source: (c) derived: a one-sided buffer as the union of per-segment offset quads with round
 * joins at convex bends and mitre joins at concave bends, the usual construction of polyline
 * offsets; the bow-tie split is ours, for bands wider than a bay's radius of curvature.
 */
export function offsetStrip(input: StripInput): PlanarPoint[][] {
  const { points, widthStart, widthEnd, seaSide, landward, arcTolerance } = input;
  if (!(arcTolerance > 0)) throw new RangeError(`arcTolerance must be > 0 m (got ${String(arcTolerance)})`);
  if (!(landward >= 0)) throw new RangeError(`landward must be ≥ 0 m (got ${String(landward)})`);
  const count = points.length - 1;
  // Sea-side unit normal of each segment (null for a zero-length segment).
  const normals: (PlanarPoint | null)[] = [];
  for (let k = 0; k < count; k += 1) {
    const [ax, ay] = points[k];
    const [bx, by] = points[k + 1];
    const len = Math.hypot(bx - ax, by - ay);
    if (!(widthStart[k] >= 0) || !(widthEnd[k] >= 0)) throw new RangeError(`strip widths must be ≥ 0 m (segment ${k})`);
    normals.push(len === 0 ? null : [(-(by - ay) / len) * seaSide, ((bx - ax) / len) * seaSide]);
  }
  // Offset vectors at both ends of each segment: the segment's own normal, a mitre at a bend
  // towards the sea, and — along a straight run of segments between two bends — the vectors
  // of the run's end joins interpolated by length, so tips stay on the run's offset line.
  const startVector: PlanarPoint[] = [];
  const endVector: PlanarPoint[] = [];
  const joins: Join[] = [];
  for (let k = 0; k <= count; k += 1) joins.push(join(k > 0 ? normals[k - 1] : null, k < count ? normals[k] : null, seaSide));
  let runStart = 0;
  while (runStart < count) {
    let runEnd = runStart + 1;
    while (runEnd < count && joins[runEnd].straight) runEnd += 1;
    const from = joins[runStart].after;
    const to = joins[runEnd].before;
    let total = 0;
    for (let k = runStart; k < runEnd; k += 1) total += distance(points[k], points[k + 1]);
    let done = 0;
    for (let k = runStart; k < runEnd; k += 1) {
      const f0 = total > 0 ? done / total : 0;
      done += distance(points[k], points[k + 1]);
      const f1 = total > 0 ? done / total : 1;
      startVector[k] = lerp(from, to, f0);
      endVector[k] = lerp(from, to, f1);
    }
    runStart = runEnd;
  }
  const rings: PlanarPoint[][] = [];
  for (let k = 0; k < count; k += 1) {
    const ws = widthStart[k];
    const we = widthEnd[k];
    if (!normals[k] || (ws === 0 && we === 0)) continue;
    const a = points[k];
    const b = points[k + 1];
    const j = joins[k];
    if (k > 0 && j.turn !== 0 && normals[k - 1]) {
      const before = normals[k - 1] as PlanarPoint;
      const after = normals[k] as PlanarPoint;
      // Convex bend (away from the sea): a fan fills the gap outside it.
      const radius = Math.min(widthEnd[k - 1], ws);
      if (j.turn < 0 && radius > 0) rings.push(fan(a, before, after, radius, arcTolerance));
      // Sharp bend towards the sea (no mitre): the land side is convex; keep the extension unbroken.
      if (j.turn > 0 && !j.mitred && landward > 0)
        rings.push(fan(a, [-before[0], -before[1]], [-after[0], -after[1]], landward, arcTolerance));
    }
    const va = startVector[k];
    const vb = endVector[k];
    const innerA: PlanarPoint = [a[0] - va[0] * landward, a[1] - va[1] * landward];
    const innerB: PlanarPoint = [b[0] - vb[0] * landward, b[1] - vb[1] * landward];
    const outerB: PlanarPoint = [b[0] + vb[0] * we, b[1] + vb[1] * we];
    const outerA: PlanarPoint = [a[0] + va[0] * ws, a[1] + va[1] * ws];
    // Beyond the centre of curvature of a bay narrower than the band the two sides cross:
    // split the bow-tie into its two triangles.
    const cross = crossing(innerB, outerB, outerA, innerA);
    if (cross) rings.push([innerA, innerB, cross], [cross, outerB, outerA]);
    else rings.push([innerA, innerB, outerB, outerA]);
  }
  return rings;
}

/** @private The join at a vertex: offset vectors for the segment before and after, and the bend. */
interface Join {
  /** Offset vector used at this vertex by the segment before it. */
  readonly before: PlanarPoint;
  /** Offset vector used at this vertex by the segment after it. */
  readonly after: PlanarPoint;
  /** Bend sign: > 0 towards the sea (concave), < 0 away from it (convex), 0 straight. */
  readonly turn: number;
  /** True when the path does not bend here (the vertex is inside a straight run). */
  readonly straight: boolean;
  /** True for a mitre join. */
  readonly mitred: boolean;
}

/** @private The join between two segment normals (either may be missing at the path ends). */
function join(before: PlanarPoint | null, after: PlanarPoint | null, seaSide: 1 | -1): Join {
  if (!before || !after) {
    const n = (before ?? after ?? [0, 0]) as PlanarPoint;
    return { before: n, after: n, turn: 0, straight: false, mitred: false };
  }
  const sin = before[0] * after[1] - before[1] * after[0];
  const cos = before[0] * after[0] + before[1] * after[1];
  if (Math.abs(sin) <= 1e-9 && cos > 0) return { before, after, turn: 0, straight: true, mitred: false };
  const turn = Math.sign(sin * seaSide) || 1;
  if (turn > 0 && cos >= Math.cos(MAX_MITRE_TURN)) {
    // Mitre: along the bisector, 1/cos(θ/2) long, so the tip lies on both offset lines.
    const sx = before[0] + after[0];
    const sy = before[1] + after[1];
    const scale = 1 / (Math.hypot(sx, sy) * Math.sqrt((1 + cos) / 2));
    const m: PlanarPoint = [sx * scale, sy * scale];
    return { before: m, after: m, turn, straight: false, mitred: true };
  }
  return { before, after, turn, straight: false, mitred: false };
}

/** @private Linear interpolation of two vectors (exact at f = 0 and f = 1, so neighbours share corners exactly). */
function lerp(a: PlanarPoint, b: PlanarPoint, f: number): PlanarPoint {
  if (f <= 0) return a;
  if (f >= 1) return b;
  return [a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1])];
}

/** @private Distance between two points. */
function distance(a: PlanarPoint, b: PlanarPoint): number {
  return Math.hypot(b[0] - a[0], b[1] - a[1]);
}

/** Largest bend towards the sea joined by a mitre [rad] (c: beyond it the mitre grows past 4× the width). */
const MAX_MITRE_TURN = (150 * Math.PI) / 180;

/** @private Proper intersection point of segments p1–p2 and p3–p4, or null. */
function crossing(p1: PlanarPoint, p2: PlanarPoint, p3: PlanarPoint, p4: PlanarPoint): PlanarPoint | null {
  const d1x = p2[0] - p1[0];
  const d1y = p2[1] - p1[1];
  const d2x = p4[0] - p3[0];
  const d2y = p4[1] - p3[1];
  const denom = d1x * d2y - d1y * d2x;
  if (denom === 0) return null;
  const wx = p3[0] - p1[0];
  const wy = p3[1] - p1[1];
  const t = (wx * d2y - wy * d2x) / denom;
  const u = (wx * d1y - wy * d1x) / denom;
  if (t <= 1e-12 || t >= 1 - 1e-12 || u <= 1e-12 || u >= 1 - 1e-12) return null;
  return [p1[0] + t * d1x, p1[1] + t * d1y];
}

/** @private A fan (circular sector) at a vertex from direction u0 to u1 (the short way round). */
function fan(centre: PlanarPoint, u0: PlanarPoint, u1: PlanarPoint, radius: number, tolerance: number): PlanarPoint[] {
  const a0 = Math.atan2(u0[1], u0[0]);
  let delta = Math.atan2(u1[1], u1[0]) - a0;
  if (delta > Math.PI) delta -= 2 * Math.PI;
  if (delta < -Math.PI) delta += 2 * Math.PI;
  const maxStep = tolerance >= radius ? Math.PI / 2 : 2 * Math.acos(1 - tolerance / radius);
  const steps = Math.max(1, Math.ceil(Math.abs(delta) / Math.min(maxStep, Math.PI / 8)));
  const ring: PlanarPoint[] = [centre];
  for (let i = 0; i <= steps; i += 1) {
    const a = a0 + (delta * i) / steps;
    ring.push([centre[0] + radius * Math.cos(a), centre[1] + radius * Math.sin(a)]);
  }
  return ring;
}
