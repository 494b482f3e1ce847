/**
 * @module shared/geometry/coast-position
 * Where a point lies in a plume's coordinates (science.md §1.11): the signed alongshore position
 * s (> 0 down-coast along the coast walked by the plume, < 0 up-coast) and the offshore distance x.
 *
 * Method (c, derived):
 * - Work in the azimuthal equidistant projection centred on the mouth (metres).
 * - Down-coast: s is the arc length along the walked coast (the footprint's path, which starts at
 *   the mouth) to the point's nearest point on it, x the distance to that nearest point.
 * - Up-coast: a point whose nearest point on the path is the mouth itself and which lies on the
 *   up-coast side of the outflow axis takes its coordinates in the mouth's own frame: s = the
 *   component along the down-coast direction (negative), x = the component along the outflow.
 *   That frame is the one the bulge disc is drawn in (centred y_s/2 seaward along the outflow),
 *   so "inside the bulge" means the same for a lease, a sample and a band.
 * - Near the equator (no turning side) every point takes the mouth frame, s signed across the axis.
 * Limits: up-coast, a coast that curves away from the mouth's tangent is not followed (the bulge
 * is a disc in the mouth's frame, not along the coast); the path must start at the mouth.
 */

import type { Position } from 'geojson';
import type { TurningSide } from '../physics/coriolis';
import { type LocalProjection, localProjection } from './local-projection';
import type { PlanarPoint } from './overlay-rings';

/** A plume's coordinate frame on a real coast. */
export interface CoastFrame {
  readonly projection: LocalProjection;
  /** The walked coast in metres, from the mouth. */
  readonly path: PlanarPoint[];
  /** Arc length at each path vertex [m]. */
  readonly arc: number[];
  /** Unit vector down-coast at the mouth (right of the outflow when the plume turns right). */
  readonly downCoast: PlanarPoint;
  /** Unit vector of the outflow (seaward). */
  readonly seaward: PlanarPoint;
  /** True near the equator: the mouth frame for every point. */
  readonly radial: boolean;
}

/**
 * Builds the frame of a plume from its walked coast (a footprint's path, EPSG:4326, starting at
 * the mouth), the outflow direction and the turning side.
 *
 * @param path - [lon, lat] positions of the walked coast, first = the mouth
 * @param outflowAzimuth - seaward direction of the outflow [degrees clockwise from north]
 * @param turnsTo - 'right' (northern hemisphere), 'left' (southern) or 'none' (equator)
 * @param mouth - the mouth [lon, lat] for the radial (equatorial) frame; default path[0]
 * @returns the frame for {@link coastPosition}
 * @example
 * coastFrame([[174, -41], [174, -41.5]], 270, 'left'); // => downCoast ≈ [0, −1] (south)
 * Source: (c) derived; turning side (a) science.md §1.1.
 */
export function coastFrame(
  path: readonly Position[],
  outflowAzimuth: number,
  turnsTo: TurningSide,
  mouth?: readonly [number, number],
): CoastFrame {
  if (path.length === 0) throw new RangeError('the walked coast has no points');
  const origin: [number, number] = mouth ? [mouth[0], mouth[1]] : [path[0][0], path[0][1]];
  const projection = localProjection(origin);
  const points = path.map((p) => projection.forward(p));
  const arc = [0];
  for (let i = 1; i < points.length; i += 1) {
    arc.push(arc[i - 1] + Math.hypot(points[i][0] - points[i - 1][0], points[i][1] - points[i - 1][1]));
  }
  const a = (outflowAzimuth * Math.PI) / 180;
  const seaward: PlanarPoint = [Math.sin(a), Math.cos(a)];
  const downCoast: PlanarPoint = turnsTo === 'left' ? [-seaward[1], seaward[0]] : [seaward[1], -seaward[0]];
  return { projection, path: points, arc, downCoast, seaward, radial: turnsTo === 'none' };
}

/**
 * Signed alongshore position s and offshore distance x of one point (module comment).
 *
 * @param frame - from {@link coastFrame}
 * @param lonLat - the point [lon, lat]
 * @param hint - optional { s, window }: search only path segments whose arc overlaps s ± window [m]
 *   (e.g. the arc of the nearest point of the whole lease, from the database); the full path otherwise
 * @returns { s [m], signed; x [m], ≥ 0 }
 * @example
 * coastPosition(frame, [174.005, -41.054]); // => { s: 6000, x: 420 } (6 km down-coast, 420 m off)
 * Source: (c) derived.
 */
export function coastPosition(
  frame: CoastFrame,
  lonLat: readonly number[],
  hint?: { readonly s: number; readonly window: number },
): { s: number; x: number } {
  return coastPositionOf(frame, frame.projection.forward(lonLat), hint);
}

/**
 * {@link coastPosition} of a point already in the frame's metres (the projection centred on the mouth).
 *
 * @param frame - from {@link coastFrame}
 * @param p - [x east, y north] in metres from the frame's origin
 * @param hint - optional { s, window } as for {@link coastPosition}
 * @returns { s [m], signed; x [m], ≥ 0 }
 * @example
 * coastPositionOf(frame, [-500, -6000]); // => { s: 6000, x: 500 } on a north–south coast turning south
 * Source: (c) derived.
 */
export function coastPositionOf(
  frame: CoastFrame,
  p: PlanarPoint,
  hint?: { readonly s: number; readonly window: number },
): { s: number; x: number } {
  const along = p[0] * frame.downCoast[0] + p[1] * frame.downCoast[1];
  const out = p[0] * frame.seaward[0] + p[1] * frame.seaward[1];
  if (frame.radial) return { s: along, x: Math.max(0, out) };
  const near = nearestOnPath(frame, p, hint);
  if (near.s <= 1e-6 && along < 0) return { s: along, x: Math.max(0, out) };
  return near;
}

/** @private Nearest point of the path to p: its arc length and distance. */
function nearestOnPath(frame: CoastFrame, p: PlanarPoint, hint?: { readonly s: number; readonly window: number }): { s: number; x: number } {
  const { path, arc } = frame;
  if (path.length === 1) return { s: 0, x: Math.hypot(p[0] - path[0][0], p[1] - path[0][1]) };
  let lo = 0;
  let hi = path.length - 2;
  if (hint && Number.isFinite(hint.s) && hint.window >= 0) {
    lo = Math.max(0, upperBound(arc, hint.s - hint.window) - 1);
    hi = Math.min(path.length - 2, upperBound(arc, hint.s + hint.window));
  }
  const best = nearestSegment(path, arc, p, lo, hi);
  return { s: best.s, x: Math.sqrt(best.d2) };
}

/** @private The segment of path[lo..hi+1] nearest p: squared distance, arc length at the nearest point, segment index. */
function nearestSegment(
  path: readonly PlanarPoint[],
  arc: readonly number[],
  p: PlanarPoint,
  lo: number,
  hi: number,
): { d2: number; s: number; index: number } {
  let bestD2 = Number.POSITIVE_INFINITY;
  let bestS = 0;
  let best = -1;
  for (let i = lo; i <= hi; i += 1) {
    const a = path[i];
    const b = path[i + 1];
    const dx = b[0] - a[0];
    const dy = b[1] - a[1];
    const len2 = dx * dx + dy * dy;
    const t = len2 > 0 ? Math.min(1, Math.max(0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len2)) : 0;
    const qx = a[0] + t * dx - p[0];
    const qy = a[1] + t * dy - p[1];
    const d2 = qx * qx + qy * qy;
    if (d2 < bestD2) {
      bestD2 = d2;
      bestS = arc[i] + t * (arc[i + 1] - arc[i]);
      best = i;
    }
  }
  return { d2: bestD2, s: bestS, index: best };
}

/** @private First index with arc[i] > v (binary search). */
function upperBound(arc: number[], v: number): number {
  let lo = 0;
  let hi = arc.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (arc[mid] <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Signed positions of a polygon's outline (vertices and points no more than `spacing` apart) and
 * of its vertex centroid, projected once; the outline's own size bounds the path search around
 * `hint` (the arc of the polygon's nearest point to the walked coast), when given.
 *
 * @param frame - from {@link coastFrame}
 * @param rings - polygon rings [lon, lat]
 * @param spacing - largest gap between points [m], > 0
 * @param hint - arc [m] of the polygon's nearest point on the path, or undefined to search the whole path
 * @returns [{ s, x }] in metres
 * @example
 * outlinePositions(frame, lease.coordinates, 30, 5800).length; // => about 41 for a 300 m square
 * Source: (c) common practice: a site is judged at its most exposed point.
 */
export function outlinePositions(
  frame: CoastFrame,
  rings: readonly (readonly Position[])[],
  spacing: number,
  hint?: number,
): { s: number; x: number }[] {
  const outline = outlinePoints(frame, rings, spacing);
  if (!outline) return [];
  const window = hint === undefined || !Number.isFinite(hint) ? undefined : { s: Math.max(0, hint), window: 2 * outline.span + 2000 };
  return outline.points.map((p) => coastPositionOf(frame, p, window));
}

/**
 * {@link outlinePositions} with its hint known only within [hintLow, hintHigh]: the same positions when every
 * point's nearest segment is the same for every hint in the range ({@link coastPositionWithin}), else null.
 *
 * @param frame - from {@link coastFrame}
 * @param rings - polygon rings [lon, lat]
 * @param spacing - largest gap between points [m], > 0
 * @param hintLow - smallest possible arc [m] of the polygon's nearest point on the path
 * @param hintHigh - largest possible arc [m], ≥ hintLow
 * @returns [{ s, x }] as outlinePositions(frame, rings, spacing, hint) for every hint in the range, or null
 * @example
 * outlinePositionsWithin(frame, lease.coordinates, 30, 5790, 5810)?.length; // => about 41 for a 300 m square
 * Source: (c) derived.
 */
export function outlinePositionsWithin(
  frame: CoastFrame,
  rings: readonly (readonly Position[])[],
  spacing: number,
  hintLow: number,
  hintHigh: number,
): { s: number; x: number }[] | null {
  const outline = outlinePoints(frame, rings, spacing);
  if (!outline) return [];
  const w = 2 * outline.span + 2000;
  const out: { s: number; x: number }[] = [];
  for (const p of outline.points) {
    const at = coastPositionWithin(frame, p, Math.max(0, hintLow), Math.max(0, hintHigh), w, w);
    if (!at) return null;
    out.push(at);
  }
  return out;
}

/** @private The outline's points (every `spacing` m, then the vertex centroid) in the frame's metres, and its span. */
function outlinePoints(
  frame: CoastFrame,
  rings: readonly (readonly Position[])[],
  spacing: number,
): { points: PlanarPoint[]; span: number } | null {
  const pts: PlanarPoint[] = [];
  let cx = 0;
  let cy = 0;
  let n = 0;
  let minX = Number.POSITIVE_INFINITY;
  let minY = Number.POSITIVE_INFINITY;
  let maxX = Number.NEGATIVE_INFINITY;
  let maxY = Number.NEGATIVE_INFINITY;
  for (const ring of rings) {
    const local = ring.map((q) => frame.projection.forward(q));
    for (let i = 0; i + 1 < local.length; i += 1) {
      const a = local[i];
      const b = local[i + 1];
      // (a millimetre's slack, so a side of exactly n·spacing gives n pieces after a lon/lat round trip)
      const pieces = Math.max(1, Math.ceil((Math.hypot(b[0] - a[0], b[1] - a[1]) - 1e-3) / spacing));
      for (let k = 0; k < pieces; k += 1) {
        const f = k / pieces;
        pts.push([a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1])]);
      }
      cx += a[0];
      cy += a[1];
      n += 1;
      minX = Math.min(minX, a[0]);
      minY = Math.min(minY, a[1]);
      maxX = Math.max(maxX, a[0]);
      maxY = Math.max(maxY, a[1]);
    }
  }
  if (n === 0) return null;
  pts.push([cx / n, cy / n]);
  const span = Math.hypot(maxX - minX, maxY - minY);
  return { points: pts, span };
}

/**
 * {@link coastPosition} of a point whose search window is known only within bounds: the window's centre is in
 * [sLow, sHigh] and its half-width in [windowLow, windowHigh]. The nearest segment found in the widest window is the
 * answer of every window between the two when it lies inside the narrowest one (the same segment, the same
 * arithmetic, so the same figures as {@link coastPosition} with the exact window); otherwise the bounds do not decide
 * it and the result is null (the caller asks for the exact window).
 *
 * @param frame - from {@link coastFrame}
 * @param p - the point in the frame's metres
 * @param sLow - smallest possible centre of the window [m] (the hint's s)
 * @param sHigh - largest possible centre [m], ≥ sLow
 * @param windowLow - smallest possible half-width [m]
 * @param windowHigh - largest possible half-width [m], ≥ windowLow
 * @returns { s, x } as coastPositionOf(frame, p, { s, window }) for every centre and window in the ranges, or null
 * @example
 * coastPositionWithin(frame, [-500, -6000], 6000, 6000, 2000, 2100); // => { s: 6000, x: 500 }
 * Source: (c) derived (the search of {@link coastPositionOf} is monotone in its window).
 */
export function coastPositionWithin(
  frame: CoastFrame,
  p: PlanarPoint,
  sLow: number,
  sHigh: number,
  windowLow: number,
  windowHigh: number,
): { s: number; x: number } | null {
  const along = p[0] * frame.downCoast[0] + p[1] * frame.downCoast[1];
  const out = p[0] * frame.seaward[0] + p[1] * frame.seaward[1];
  if (frame.radial) return { s: along, x: Math.max(0, out) };
  const { path, arc } = frame;
  if (path.length === 1) return coastPositionOf(frame, p);
  if (!Number.isFinite(sLow) || !(sHigh >= sLow) || !(windowLow >= 0) || !(windowHigh >= windowLow)) return null;
  const range = (from: number, to: number): [number, number] => [
    Math.max(0, upperBound(arc, from) - 1),
    Math.min(path.length - 2, upperBound(arc, to)),
  ];
  const [loIn, hiIn] = range(sHigh - windowLow, sLow + windowLow);
  const [lo, hi] = range(sLow - windowHigh, sHigh + windowHigh);
  // The loop of nearestOnPath, over the widest window, remembering which segment won.
  const { d2: bestD2, s: bestS, index: best } = nearestSegment(path, arc, p, lo, hi);
  if (best < loIn || best > hiIn) return null;
  if (bestS <= 1e-6 && along < 0) return { s: along, x: Math.max(0, out) };
  return { s: bestS, x: Math.sqrt(bestD2) };
}

/**
 * Distance [m] from a point in the frame's metres to the nearest point of the whole walked coast.
 *
 * @param frame - from {@link coastFrame}
 * @param p - the point in the frame's metres
 * @returns the distance [m], ≥ 0
 * @example
 * distanceToPath(frame, [-500, -6000]); // => 500 on a north–south coast
 * Source: (c) derived.
 */
export function distanceToPath(frame: CoastFrame, p: PlanarPoint): number {
  return nearestOnPath(frame, p).x;
}
