/**
 * @module shared/geometry/overlay-rings
 * Planar polygon overlay for the plume footprint: the water covered by any of many small
 * "positive" rings (offset quads, fan wedges, discs), minus "negative" land rings, cut into
 * faces by "barrier" lines (a shoreline given as lines, island rings), with the faces that lie
 * beside marked coast edges flagged.
 *
 * Why not a general polygon clipper: the footprint unions thousands of heavily overlapping
 * quads; the sweep-line clipper bundled with the installed geometry package takes seconds
 * for a few hundred of them and can fail to close its output rings. This module does one
 * thing, fast and predictably (c, derived; the standard "arrangement + winding number"
 * method of computational geometry):
 *
 * 1. every edge is split at every intersection with every other edge (a uniform grid finds
 *    candidate pairs); points closer than {@link OVERLAY_MERGE_DISTANCE} are merged, so
 *    nearly concurrent intersections share one vertex;
 * 2. each piece is classified by the region's membership just left and just right of its
 *    midpoint: inside = (winding number of the positive rings ≠ 0) and (winding number of
 *    the negative rings = 0) — the non-zero rule, so overlapping positive rings simply union;
 * 3. a piece with the region on one side only is a boundary piece, directed with the region
 *    on its left; a barrier piece with the region on both sides becomes two opposite pieces,
 *    which split the region into separate faces;
 * 4. pieces are linked into rings by always taking the first outgoing piece clockwise from
 *    the reversed incoming one (each face traced on its own), rings are split where they touch
 *    themselves, spikes and slivers are dropped, and holes are put in the smallest outer ring
 *    that contains them.
 *
 * Coordinates are planar metres (a local projection). Output rings are open (first vertex not
 * repeated), outers anticlockwise, holes clockwise, as OGC simple-feature polygons.
 */

/** A planar point [x, y] in metres. */
export type PlanarPoint = readonly [number, number];

/** A line or ring that may carry marks on its segments. */
export interface OverlayLine {
  /** Vertices [x, y] in metres (open: do not repeat the first vertex for rings). */
  readonly points: readonly PlanarPoint[];
  /** True for a ring (the last vertex joins the first). Negative rings are always closed. */
  readonly closed?: boolean;
  /**
   * Optional mark per segment i (points[i] → points[i+1], the closing segment last):
   * +1 = the face on the left of the segment's own direction is wanted, −1 = the face on its
   * right, 0 = no mark. Used to find the sea faces beside the walked coast.
   */
  readonly marks?: readonly number[];
}

/** Input of {@link overlayRings}. */
export interface OverlayInput {
  /** Rings whose union is the region (any orientation; each is made anticlockwise). */
  readonly positive: readonly (readonly PlanarPoint[])[];
  /** Land rings subtracted from the region, exterior rings anticlockwise, holes clockwise. */
  readonly negative?: readonly OverlayLine[];
  /** Lines that cut the region into faces without removing area (open lines or rings). */
  readonly barriers?: readonly OverlayLine[];
  /** Faces and holes with a smaller area are dropped [m²], ≥ 0; default 2. */
  readonly minArea?: number;
  /**
   * True (default): each positive ring is made anticlockwise, so any ring adds its area.
   * False: positive rings are taken as given (outer rings anticlockwise, holes clockwise),
   * e.g. faces of an earlier overlay.
   */
  readonly orientPositive?: boolean;
  /**
   * True: an edge of one positive ring that runs exactly back along an edge of another (the
   * side two neighbouring pieces of a strip share) cancels it before the overlay. The winding
   * number, and so the result, is unchanged, but a long chain of pieces then costs about as
   * much as its outline. Default false.
   */
  readonly dissolveShared?: boolean;
}

/** One face of the result: a polygon with holes. */
export interface OverlayFace {
  /** Exterior ring, anticlockwise, open. */
  readonly outer: PlanarPoint[];
  /** Hole rings, clockwise, open. */
  readonly holes: PlanarPoint[][];
  /** Area of the face (exterior minus holes) [m²]. */
  readonly area: number;
  /** True when a marked segment bounds this face on its marked side. */
  readonly marked: boolean;
  /** For each exterior edge i (outer[i] → outer[i+1], the closing edge last): true when it lies along a negative ring or barrier. */
  readonly outerOnLine: boolean[];
  /** The same for each hole's edges. */
  readonly holesOnLine: boolean[][];
}

/** Result of {@link overlayRings}. */
export interface OverlayResult {
  /** The faces of the region. */
  readonly faces: OverlayFace[];
  /** Number of boundary traces that could not be closed (0 for a sound result). */
  readonly brokenRings: number;
}

/**
 * An overlay implementation: {@link overlayRings} itself or another with the same contract (e.g. a GEOS-backed one,
 * bench/geos-overlay-contract.ts), passed to the footprint and union code that needs one.
 */
export type OverlayFn = (input: OverlayInput) => OverlayResult;

/** Points closer than this are merged into one vertex [m] (c: far above rounding error at 10⁶ m, far below any mapped detail). */
export const OVERLAY_MERGE_DISTANCE = 1e-5;

const SIDE_OFFSET = 1e-4;
const KIND_POSITIVE = 0;
const KIND_NEGATIVE = 1;
const KIND_BARRIER = 2;
const SMALL_RING = 64;

/**
 * Overlays positive rings, negative rings and barrier lines (see the module comment).
 *
 * @param input - positive rings (union), negative rings (subtracted), barriers (cuts), minArea [m²]
 * @returns faces (exterior anticlockwise, holes clockwise, open rings, metres) and a count of
 *   boundary traces that could not be closed
 * @example
 * overlayRings({ positive: [[[0, 0], [2, 0], [2, 2], [0, 2]], [[1, 1], [3, 1], [3, 3], [1, 3]]] }).faces[0].area; // => 7
 * overlayRings({ positive: [[[0, 0], [4, 0], [4, 4], [0, 4]]], barriers: [{ points: [[2, -1], [2, 5]], marks: [1] }] })
 *   .faces.filter((f) => f.marked).map((f) => f.area); // => [8] (the half left of the barrier)
 * Source: (c) derived: arrangement and non-zero winding rule, as in standard computational
 * geometry texts; face tracing by the clockwise-next rule of a doubly connected edge list.
 */
export function overlayRings(input: OverlayInput): OverlayResult {
  const minArea = input.minArea ?? 2;
  if (!(minArea >= 0)) throw new RangeError(`minArea must be ≥ 0 m² (got ${String(minArea)})`);
  const graph = new EdgeGraph();
  const orient = input.orientPositive ?? true;
  for (const ring of input.positive) graph.addRing(ring, KIND_POSITIVE, true, undefined, orient);
  if (input.dissolveShared) graph.dissolveSharedPositive();
  for (const ring of input.negative ?? []) graph.addRing(ring.points, KIND_NEGATIVE, true, ring.marks, false);
  for (const line of input.barriers ?? []) graph.addRing(line.points, KIND_BARRIER, line.closed === true, line.marks, false);
  if (graph.positiveCount === 0) return { faces: [], brokenRings: 0 };
  graph.splitAtIntersections();
  const pieces = graph.classifyPieces();
  const traced = traceRings(graph, pieces);
  return { faces: assembleFaces(traced.rings, minArea), brokenRings: traced.broken };
}

// ---------------------------------------------------------------------------------------------
// Edge graph: vertices, edges, splitting
// ---------------------------------------------------------------------------------------------

/** @private A directed boundary piece of the result. */
interface DirectedPiece {
  readonly from: number;
  readonly to: number;
  readonly angle: number;
  readonly marked: boolean;
  readonly onLine: boolean;
}

/** @private Vertices (merged within OVERLAY_MERGE_DISTANCE), edges and the winding indexes. */
class EdgeGraph {
  readonly xs: number[] = [];
  readonly ys: number[] = [];
  private readonly cells = new Map<number, number[]>();
  // Edges: endpoints (vertex ids), kind, mark (+1/−1/0 in the edge's own direction).
  readonly ea: number[] = [];
  readonly eb: number[] = [];
  readonly kind: number[] = [];
  readonly mark: number[] = [];
  splits: { t: number; v: number }[][] = [];
  positiveCount = 0;
  private grid = new Map<number, number[]>();
  private gridMinX = 0;
  private gridMinY = 0;
  private gridCell = 1;
  private gridNx = 1;
  private readonly smallRings: { ring: number[]; minX: number; minY: number; maxX: number; maxY: number }[] = [];
  private readonly bigPositiveEdges: number[] = [];

  /** Adds a ring or line; positive rings are made anticlockwise; small positive rings are indexed whole. */
  addRing(points: readonly PlanarPoint[], kind: number, closed: boolean, marks: readonly number[] | undefined, orient: boolean): void {
    const n = points.length;
    if (n < 2 || (closed && n < 3)) return;
    let pts = points;
    let markList = marks;
    if (orient && ringArea(points) < 0) {
      pts = [...points].reverse();
      markList = undefined;
    }
    const ids: number[] = [];
    for (const p of pts) {
      if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) throw new RangeError('overlay: coordinates must be finite numbers');
      ids.push(this.vertex(p[0], p[1]));
    }
    if (kind === KIND_POSITIVE) {
      if (Math.abs(ringArea(pts)) <= 0) return;
      this.positiveCount += 1;
    }
    const segments = closed ? n : n - 1;
    const firstEdge = this.ea.length;
    for (let i = 0; i < segments; i += 1) {
      const a = ids[i];
      const b = ids[(i + 1) % n];
      if (a === b) continue;
      this.ea.push(a);
      this.eb.push(b);
      this.kind.push(kind);
      this.mark.push(markList?.[i] ?? 0);
    }
    if (kind === KIND_POSITIVE) {
      if (n <= SMALL_RING) {
        let minX = Infinity;
        let minY = Infinity;
        let maxX = -Infinity;
        let maxY = -Infinity;
        for (const p of pts) {
          minX = Math.min(minX, p[0]);
          minY = Math.min(minY, p[1]);
          maxX = Math.max(maxX, p[0]);
          maxY = Math.max(maxY, p[1]);
        }
        this.smallRings.push({ ring: pts.flatMap((p) => [p[0], p[1]]), minX, minY, maxX, maxY });
      } else {
        for (let e = firstEdge; e < this.ea.length; e += 1) this.bigPositiveEdges.push(e);
      }
    }
  }

  /**
   * Cancels pairs of opposite positive edges (a→b in one ring, b→a in another). Each ring's
   * winding adds up, so removing a pair leaves every winding number as it was; the remaining
   * positive edges are indexed as edges, not rings.
   */
  dissolveSharedPositive(): void {
    const open = new Map<number, number[]>();
    const removed = new Uint8Array(this.ea.length);
    const key = (a: number, b: number) => a * 67_108_864 + b;
    for (let e = 0; e < this.ea.length; e += 1) {
      if (this.kind[e] !== KIND_POSITIVE) continue;
      const twin = open.get(key(this.eb[e], this.ea[e]));
      if (twin && twin.length > 0) {
        removed[twin.pop() as number] = 1;
        removed[e] = 1;
        continue;
      }
      const k = key(this.ea[e], this.eb[e]);
      const list = open.get(k);
      if (list) list.push(e);
      else open.set(k, [e]);
    }
    let out = 0;
    for (let e = 0; e < this.ea.length; e += 1) {
      if (removed[e]) continue;
      this.ea[out] = this.ea[e];
      this.eb[out] = this.eb[e];
      this.kind[out] = this.kind[e];
      this.mark[out] = this.mark[e];
      out += 1;
    }
    this.ea.length = out;
    this.eb.length = out;
    this.kind.length = out;
    this.mark.length = out;
    this.smallRings.length = 0;
    this.bigPositiveEdges.length = 0;
    for (let e = 0; e < out; e += 1) if (this.kind[e] === KIND_POSITIVE) this.bigPositiveEdges.push(e);
  }

  /** Returns the id of the vertex at (x, y), merging with any vertex within the merge distance. */
  vertex(x: number, y: number): number {
    const size = 2 * OVERLAY_MERGE_DISTANCE;
    const cx = Math.floor(x / size);
    const cy = Math.floor(y / size);
    const fx = x / size - cx;
    const fy = y / size - cy;
    const dx = fx < 0.5 ? -1 : 1;
    const dy = fy < 0.5 ? -1 : 1;
    const d2 = OVERLAY_MERGE_DISTANCE * OVERLAY_MERGE_DISTANCE;
    for (let k = 0; k < 4; k += 1) {
      const list = this.cells.get(cellKey(cx + (k & 1 ? dx : 0), cy + (k & 2 ? dy : 0)));
      if (!list) continue;
      for (const id of list) {
        const ex = this.xs[id] - x;
        const ey = this.ys[id] - y;
        if (ex * ex + ey * ey <= d2) return id;
      }
    }
    const id = this.xs.length;
    this.xs.push(x);
    this.ys.push(y);
    const key = cellKey(cx, cy);
    const list = this.cells.get(key);
    if (list) list.push(id);
    else this.cells.set(key, [id]);
    return id;
  }

  /** Finds every pair of intersecting edges (grid of cells) and records the split points. */
  splitAtIntersections(): void {
    const m = this.ea.length;
    this.splits = Array.from({ length: m }, () => []);
    if (m === 0) return;
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    const lengths: number[] = [];
    for (let e = 0; e < m; e += 1) {
      const ax = this.xs[this.ea[e]];
      const ay = this.ys[this.ea[e]];
      const bx = this.xs[this.eb[e]];
      const by = this.ys[this.eb[e]];
      minX = Math.min(minX, ax, bx);
      minY = Math.min(minY, ay, by);
      maxX = Math.max(maxX, ax, bx);
      maxY = Math.max(maxY, ay, by);
      lengths.push(Math.hypot(bx - ax, by - ay));
    }
    const sorted = [...lengths].sort((p, q) => p - q);
    const median = sorted[Math.floor(m / 2)];
    const extent = Math.max(maxX - minX, maxY - minY, 1e-9);
    const cell = Math.max(2 * median, extent / 2048, 1e-6);
    const nx = Math.floor((maxX - minX) / cell) + 1;
    const grid = new Map<number, number[]>();
    const edgeCells: number[][] = [];
    for (let e = 0; e < m; e += 1) {
      const list = supercover(
        (this.xs[this.ea[e]] - minX) / cell,
        (this.ys[this.ea[e]] - minY) / cell,
        (this.xs[this.eb[e]] - minX) / cell,
        (this.ys[this.eb[e]] - minY) / cell,
        nx,
      );
      edgeCells.push(list);
      for (const c of list) {
        const bucket = grid.get(c);
        if (bucket) bucket.push(e);
        else grid.set(c, [e]);
      }
    }
    this.grid = grid;
    this.gridMinX = minX;
    this.gridMinY = minY;
    this.gridCell = cell;
    this.gridNx = nx;
    const stamp = new Int32Array(m).fill(-1);
    for (let e = 0; e < m; e += 1) {
      for (const c of edgeCells[e]) {
        for (const f of grid.get(c) ?? []) {
          if (f <= e || stamp[f] === e) continue;
          stamp[f] = e;
          if (this.kind[e] === KIND_BARRIER && this.kind[f] === KIND_BARRIER && !sharesNoVertex(this, e, f)) continue;
          this.intersect(e, f);
        }
      }
    }
  }

  /** Records the intersection (or collinear overlap) of edges e and f as split points. */
  private intersect(e: number, f: number): void {
    const a = this.ea[e];
    const b = this.eb[e];
    const c = this.ea[f];
    const d = this.eb[f];
    const ax = this.xs[a];
    const ay = this.ys[a];
    const d1x = this.xs[b] - ax;
    const d1y = this.ys[b] - ay;
    const cx = this.xs[c];
    const cy = this.ys[c];
    const d2x = this.xs[d] - cx;
    const d2y = this.ys[d] - cy;
    const len1 = Math.hypot(d1x, d1y);
    const len2 = Math.hypot(d2x, d2y);
    if (len1 === 0 || len2 === 0) return;
    // Quick reject on bounding boxes (with tolerance).
    const tol = OVERLAY_MERGE_DISTANCE;
    if (
      Math.min(ax, ax + d1x) > Math.max(cx, cx + d2x) + tol ||
      Math.max(ax, ax + d1x) < Math.min(cx, cx + d2x) - tol ||
      Math.min(ay, ay + d1y) > Math.max(cy, cy + d2y) + tol ||
      Math.max(ay, ay + d1y) < Math.min(cy, cy + d2y) - tol
    ) {
      return;
    }
    const denom = d1x * d2y - d1y * d2x;
    const wx = cx - ax;
    const wy = cy - ay;
    if (Math.abs(denom) <= 1e-12 * len1 * len2) {
      // Parallel: split each at the other's endpoints if collinear and inside.
      const dist = Math.abs(wx * d1y - wy * d1x) / len1;
      if (dist > tol) return;
      this.splitAtPoint(e, c, len1);
      this.splitAtPoint(e, d, len1);
      this.splitAtPoint(f, a, len2);
      this.splitAtPoint(f, b, len2);
      return;
    }
    const t = (wx * d2y - wy * d2x) / denom;
    const u = (wx * d1y - wy * d1x) / denom;
    const te = tol / len1;
    const ue = tol / len2;
    if (t < -te || t > 1 + te || u < -ue || u > 1 + ue) return;
    let v: number;
    if (t * len1 <= tol) v = a;
    else if ((1 - t) * len1 <= tol) v = b;
    else if (u * len2 <= tol) v = c;
    else if ((1 - u) * len2 <= tol) v = d;
    else v = this.vertex(ax + t * d1x, ay + t * d1y);
    if (v !== a && v !== b) this.splits[e].push({ t: this.param(e, v), v });
    if (v !== c && v !== d) this.splits[f].push({ t: this.param(f, v), v });
  }

  /** Splits edge e at vertex v if v lies on its interior (collinear case). */
  private splitAtPoint(e: number, v: number, len: number): void {
    const a = this.ea[e];
    const b = this.eb[e];
    if (v === a || v === b) return;
    const t = this.param(e, v);
    if (t * len <= OVERLAY_MERGE_DISTANCE || (1 - t) * len <= OVERLAY_MERGE_DISTANCE) return;
    this.splits[e].push({ t, v });
  }

  /** Parameter of the projection of vertex v on edge e. */
  private param(e: number, v: number): number {
    const ax = this.xs[this.ea[e]];
    const ay = this.ys[this.ea[e]];
    const dx = this.xs[this.eb[e]] - ax;
    const dy = this.ys[this.eb[e]] - ay;
    return ((this.xs[v] - ax) * dx + (this.ys[v] - ay) * dy) / (dx * dx + dy * dy);
  }

  /**
   * Distance from (x, y) to the nearest edge not in `exclude`, or `limit` when none is nearer
   * (edges are looked up in the point's grid cell, and in the neighbouring cells only when the
   * point is within `limit` of the cell's side; limit is far below the cell size).
   */
  private clearance(x: number, y: number, exclude: number[], limit: number): number {
    const gx = (x - this.gridMinX) / this.gridCell;
    const gy = (y - this.gridMinY) / this.gridCell;
    const cx = Math.floor(gx);
    const cy = Math.floor(gy);
    const margin = limit / this.gridCell;
    const x0 = gx - cx < margin ? -1 : 0;
    const x1 = cx + 1 - gx < margin ? 1 : 0;
    const y0 = gy - cy < margin ? -1 : 0;
    const y1 = cy + 1 - gy < margin ? 1 : 0;
    let best = limit;
    for (let ox = x0; ox <= x1; ox += 1) {
      for (let oy = y0; oy <= y1; oy += 1) {
        if (cx + ox < 0 || cy + oy < 0 || cx + ox > this.gridNx) continue;
        const list = this.grid.get((cy + oy) * (this.gridNx + 1) + cx + ox);
        if (!list) continue;
        for (const e of list) {
          const ax = this.xs[this.ea[e]];
          const ay = this.ys[this.ea[e]];
          const bx = this.xs[this.eb[e]];
          const by = this.ys[this.eb[e]];
          if (x < Math.min(ax, bx) - best || x > Math.max(ax, bx) + best || y < Math.min(ay, by) - best || y > Math.max(ay, by) + best)
            continue;
          if (exclude.includes(e)) continue;
          best = Math.min(best, segmentDistance(x, y, ax, ay, bx, by));
        }
      }
    }
    return best;
  }

  /** Splits edges into pieces, groups coincident pieces, and keeps the boundary pieces. */
  classifyPieces(): DirectedPiece[] {
    const winding = new WindingIndex(this, this.smallRings, this.bigPositiveEdges);
    interface Group {
      a: number;
      b: number;
      barrier: boolean;
      onLine: boolean;
      markAB: boolean;
      markBA: boolean;
      edges: number[];
    }
    const groups = new Map<number, Group>();
    const nv = this.xs.length;
    for (let e = 0; e < this.ea.length; e += 1) {
      const list = this.splits[e];
      list.sort((p, q) => p.t - q.t);
      let prev = this.ea[e];
      const vertices: number[] = [];
      for (const s of list) vertices.push(s.v);
      vertices.push(this.eb[e]);
      for (const v of vertices) {
        if (v === prev) continue;
        const lo = Math.min(prev, v);
        const hi = Math.max(prev, v);
        const key = lo * nv + hi;
        let g = groups.get(key);
        if (!g) {
          g = { a: prev, b: v, barrier: false, onLine: false, markAB: false, markBA: false, edges: [] };
          groups.set(key, g);
        }
        g.edges.push(e);
        if (this.kind[e] === KIND_BARRIER) g.barrier = true;
        if (this.kind[e] !== KIND_POSITIVE) g.onLine = true;
        const mk = this.mark[e];
        if (mk !== 0) {
          const sameDirection = g.a === prev;
          if (mk > 0 === sameDirection) g.markAB = true;
          else g.markBA = true;
        }
        prev = v;
      }
    }
    const pieces: DirectedPiece[] = [];
    for (const g of groups.values()) {
      const ax = this.xs[g.a];
      const ay = this.ys[g.a];
      const dx = this.xs[g.b] - ax;
      const dy = this.ys[g.b] - ay;
      const len = Math.hypot(dx, dy);
      if (len === 0) continue;
      const mx = ax + dx / 2;
      const my = ay + dy / 2;
      // Test points must not cross any other edge: stay within half the clearance around the midpoint.
      const wanted = Math.min(SIDE_OFFSET, len / 4);
      const offset = Math.min(wanted, this.clearance(mx, my, g.edges, 2 * wanted) / 2);
      const nx = (-dy / len) * offset;
      const ny = (dx / len) * offset;
      const inLeft = winding.inside(mx + nx, my + ny);
      const inRight = winding.inside(mx - nx, my - ny);
      const angle = Math.atan2(dy, dx);
      const back = angle > 0 ? angle - Math.PI : angle + Math.PI;
      const onLine = g.onLine;
      if (inLeft && !inRight) pieces.push({ from: g.a, to: g.b, angle, marked: g.markAB, onLine });
      else if (inRight && !inLeft) pieces.push({ from: g.b, to: g.a, angle: back, marked: g.markBA, onLine });
      else if (inLeft && inRight && g.barrier) {
        pieces.push({ from: g.a, to: g.b, angle, marked: g.markAB, onLine });
        pieces.push({ from: g.b, to: g.a, angle: back, marked: g.markBA, onLine });
      }
    }
    return pieces;
  }
}

/** @private Distance from a point to a segment. */
function segmentDistance(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const l2 = dx * dx + dy * dy;
  const t = l2 > 0 ? Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / l2)) : 0;
  return Math.hypot(px - ax - t * dx, py - ay - t * dy);
}

/** @private True when edges e and f have no endpoint in common (adjacent barrier segments meet only at their shared vertex). */
function sharesNoVertex(graph: EdgeGraph, e: number, f: number): boolean {
  return graph.ea[e] !== graph.ea[f] && graph.ea[e] !== graph.eb[f] && graph.eb[e] !== graph.ea[f] && graph.eb[e] !== graph.eb[f];
}

/** @private Integer key of a grid cell. */
function cellKey(ix: number, iy: number): number {
  return ix * 94_906_267 + iy;
}

/** @private Cells (column-major keys) crossed by a segment in grid units. */
function supercover(x0: number, y0: number, x1: number, y1: number, nx: number): number[] {
  const out: number[] = [];
  const c0 = Math.floor(Math.min(x0, x1));
  const c1 = Math.floor(Math.max(x0, x1));
  for (let c = c0; c <= c1; c += 1) {
    // y-range of the segment within column c (clamped to the segment's x-range).
    let ya: number;
    let yb: number;
    if (x1 === x0) {
      ya = y0;
      yb = y1;
    } else {
      const xa = Math.max(c, Math.min(x0, x1));
      const xb = Math.min(c + 1, Math.max(x0, x1));
      ya = y0 + ((xa - x0) * (y1 - y0)) / (x1 - x0);
      yb = y0 + ((xb - x0) * (y1 - y0)) / (x1 - x0);
    }
    const r0 = Math.floor(Math.min(ya, yb));
    const r1 = Math.floor(Math.max(ya, yb));
    for (let r = r0; r <= r1; r += 1) out.push(r * (nx + 1) + c);
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Winding numbers
// ---------------------------------------------------------------------------------------------

/** @private Winding numbers of the positive and negative rings at a point. */
class WindingIndex {
  private readonly ringCell: number;
  private readonly ringGrid = new Map<number, number[]>();
  private readonly negStrips: StripIndex;
  private readonly bigStrips: StripIndex;
  private readonly rings: { ring: number[]; minX: number; minY: number; maxX: number; maxY: number }[];

  constructor(
    graph: EdgeGraph,
    rings: { ring: number[]; minX: number; minY: number; maxX: number; maxY: number }[],
    bigPositiveEdges: number[],
  ) {
    this.rings = rings;
    const sizes = rings.map((r) => Math.max(r.maxX - r.minX, r.maxY - r.minY)).sort((p, q) => p - q);
    this.ringCell = Math.max(sizes.length ? sizes[Math.floor(sizes.length / 2)] : 1, 1e-6);
    rings.forEach((r, i) => {
      for (let cx = Math.floor(r.minX / this.ringCell); cx <= Math.floor(r.maxX / this.ringCell); cx += 1) {
        for (let cy = Math.floor(r.minY / this.ringCell); cy <= Math.floor(r.maxY / this.ringCell); cy += 1) {
          const key = cellKey(cx, cy);
          const list = this.ringGrid.get(key);
          if (list) list.push(i);
          else this.ringGrid.set(key, [i]);
        }
      }
    });
    const negative: number[] = [];
    for (let e = 0; e < graph.ea.length; e += 1) if (graph.kind[e] === KIND_NEGATIVE) negative.push(e);
    this.negStrips = new StripIndex(graph, negative);
    this.bigStrips = new StripIndex(graph, bigPositiveEdges);
  }

  /** True when (x, y) is inside the region: positive winding ≠ 0 and negative winding = 0. */
  inside(x: number, y: number): boolean {
    if (!this.inPositive(x, y)) return false;
    return this.negStrips.winding(x, y) === 0;
  }

  private inPositive(x: number, y: number): boolean {
    let w = this.bigStrips.winding(x, y);
    const list = this.ringGrid.get(cellKey(Math.floor(x / this.ringCell), Math.floor(y / this.ringCell)));
    if (list) {
      for (const i of list) {
        const r = this.rings[i];
        if (x < r.minX || x > r.maxX || y < r.minY || y > r.maxY) continue;
        w += ringWinding(r.ring, x, y);
      }
    }
    return w !== 0;
  }
}

/** @private Horizontal strips of edges for ray-casting winding numbers. */
class StripIndex {
  private readonly minY: number;
  private readonly height: number;
  private readonly strips: number[][];
  private readonly graph: EdgeGraph;

  constructor(graph: EdgeGraph, edges: number[]) {
    this.graph = graph;
    let lo = Infinity;
    let hi = -Infinity;
    for (const e of edges) {
      lo = Math.min(lo, graph.ys[graph.ea[e]], graph.ys[graph.eb[e]]);
      hi = Math.max(hi, graph.ys[graph.ea[e]], graph.ys[graph.eb[e]]);
    }
    const count = edges.length === 0 ? 0 : Math.max(1, Math.min(8192, Math.ceil(edges.length / 4)));
    this.minY = lo;
    this.height = count > 0 ? Math.max((hi - lo) / count, 1e-9) : 1;
    this.strips = Array.from({ length: count }, () => []);
    for (const e of edges) {
      const y0 = graph.ys[graph.ea[e]];
      const y1 = graph.ys[graph.eb[e]];
      const s0 = this.strip(Math.min(y0, y1));
      const s1 = this.strip(Math.max(y0, y1));
      for (let s = s0; s <= s1; s += 1) this.strips[s].push(e);
    }
  }

  private strip(y: number): number {
    return Math.max(0, Math.min(this.strips.length - 1, Math.floor((y - this.minY) / this.height)));
  }

  /** Winding number at (x, y) by a ray to +x, half-open rule on vertices. */
  winding(x: number, y: number): number {
    if (this.strips.length === 0) return 0;
    if (y < this.minY || y > this.minY + this.height * this.strips.length) return 0;
    const g = this.graph;
    let w = 0;
    for (const e of this.strips[this.strip(y)]) {
      const y0 = g.ys[g.ea[e]];
      const y1 = g.ys[g.eb[e]];
      if (y0 > y === y1 > y) continue;
      const x0 = g.xs[g.ea[e]];
      const x1 = g.xs[g.eb[e]];
      const xi = x0 + ((y - y0) * (x1 - x0)) / (y1 - y0);
      if (xi > x) w += y1 > y0 ? 1 : -1;
    }
    return w;
  }
}

/** @private Winding number of a flat ring [x0, y0, x1, y1, …] at (x, y). */
function ringWinding(ring: number[], x: number, y: number): number {
  let w = 0;
  const n = ring.length;
  for (let i = 0; i < n; i += 2) {
    const x0 = ring[i];
    const y0 = ring[i + 1];
    const x1 = ring[(i + 2) % n];
    const y1 = ring[(i + 3) % n];
    if (y0 > y === y1 > y) continue;
    const xi = x0 + ((y - y0) * (x1 - x0)) / (y1 - y0);
    if (xi > x) w += y1 > y0 ? 1 : -1;
  }
  return w;
}

// ---------------------------------------------------------------------------------------------
// Tracing rings and assembling faces
// ---------------------------------------------------------------------------------------------

/** @private A traced ring: points, marked flag, and per edge whether it lies along a line. */
interface TracedRing {
  readonly points: PlanarPoint[];
  readonly marked: boolean;
  readonly onLine: boolean[];
}

/** Gaps up to this size are bridged when linking outline pieces [m] (c: 100 × the merge distance, far below mapped detail). */
const HEAL_DISTANCE = 1e-3;

/** @private Links directed pieces into closed rings, one face at a time. */
function traceRings(graph: EdgeGraph, pieces: DirectedPiece[]): { rings: TracedRing[]; broken: number } {
  const outgoing = new Map<number, number[]>();
  pieces.forEach((p, i) => {
    const list = outgoing.get(p.from);
    if (list) list.push(i);
    else outgoing.set(p.from, [i]);
  });
  // Starts of pieces by small cells, to bridge a gap of a few micrometres left by rounding.
  const starts = new Map<number, number[]>();
  const cellOf = (v: number, dx = 0, dy = 0) =>
    cellKey(Math.floor(graph.xs[v] / HEAL_DISTANCE) + dx, Math.floor(graph.ys[v] / HEAL_DISTANCE) + dy);
  for (const v of outgoing.keys()) {
    const key = cellOf(v);
    const list = starts.get(key);
    if (list) list.push(v);
    else starts.set(key, [v]);
  }
  const used = new Uint8Array(pieces.length);
  const bridge = (v: number, start: number): number => {
    // The nearest other vertex within the heal distance with an unused outgoing piece (or the start piece).
    let best = -1;
    let bestDistance = HEAL_DISTANCE;
    for (let dx = -1; dx <= 1; dx += 1) {
      for (let dy = -1; dy <= 1; dy += 1) {
        for (const u of starts.get(cellOf(v, dx, dy)) ?? []) {
          if (u === v) continue;
          const d = Math.hypot(graph.xs[u] - graph.xs[v], graph.ys[u] - graph.ys[v]);
          if (d > bestDistance) continue;
          const candidate = (outgoing.get(u) ?? []).find((i) => i === start || !used[i]);
          if (candidate === undefined) continue;
          best = candidate;
          bestDistance = d;
        }
      }
    }
    return best;
  };
  const rings: TracedRing[] = [];
  let broken = 0;
  for (let start = 0; start < pieces.length; start += 1) {
    if (used[start]) continue;
    const ids: number[] = [];
    const markedIds: boolean[] = [];
    const onLineIds: boolean[] = [];
    let current = start;
    let ok = false;
    for (let guard = 0; guard <= pieces.length; guard += 1) {
      used[current] = 1;
      const piece = pieces[current];
      ids.push(piece.from);
      markedIds.push(piece.marked);
      onLineIds.push(piece.onLine);
      let next = nextPiece(pieces, outgoing.get(piece.to) ?? [], piece.angle);
      if (next !== start && (next < 0 || used[next])) next = bridge(piece.to, start);
      if (next === start) {
        ok = true;
        break;
      }
      if (next < 0 || used[next]) break;
      current = next;
    }
    if (!ok) {
      broken += 1;
      continue;
    }
    for (const ring of splitAtRepeats(ids, markedIds, onLineIds)) {
      rings.push({ points: ring.ids.map((v) => [graph.xs[v], graph.ys[v]] as const), marked: ring.marked, onLine: ring.onLine });
    }
  }
  return { rings, broken };
}

/** @private The outgoing piece first clockwise from the reversed incoming direction. */
function nextPiece(pieces: DirectedPiece[], candidates: number[], incomingAngle: number): number {
  const reverse = incomingAngle + Math.PI;
  let best = -1;
  let bestTurn = Infinity;
  for (const i of candidates) {
    let turn = (reverse - pieces[i].angle) % (2 * Math.PI);
    if (turn < 0) turn += 2 * Math.PI;
    if (turn < 1e-12) turn = 2 * Math.PI;
    if (turn < bestTurn) {
      bestTurn = turn;
      best = i;
    }
  }
  return best;
}

/** @private Splits a closed vertex sequence into simple loops where a vertex repeats (edge i starts at ids[i]). */
function splitAtRepeats(ids: number[], marks: boolean[], onLine: boolean[]): { ids: number[]; marked: boolean; onLine: boolean[] }[] {
  const out: { ids: number[]; marked: boolean; onLine: boolean[] }[] = [];
  const stackIds: number[] = [];
  const stackMarks: boolean[] = [];
  const stackOnLine: boolean[] = [];
  const position = new Map<number, number>();
  let pendingMark = false;
  for (let i = 0; i < ids.length; i += 1) {
    const v = ids[i];
    const at = position.get(v);
    if (at !== undefined) {
      const loopIds = stackIds.splice(at);
      const loopMarks = stackMarks.splice(at);
      const loopOnLine = stackOnLine.splice(at);
      for (const id of loopIds) position.delete(id);
      if (loopIds.length >= 3) out.push({ ids: loopIds, marked: loopMarks.some(Boolean), onLine: loopOnLine });
      else if (loopMarks.some(Boolean)) pendingMark = true; // a spike (dangling barrier) marks the face around it
    }
    position.set(v, stackIds.length);
    stackIds.push(v);
    stackMarks.push(marks[i] || pendingMark);
    stackOnLine.push(onLine[i]);
    pendingMark = false;
  }
  if (stackIds.length >= 3) out.push({ ids: stackIds, marked: stackMarks.some(Boolean), onLine: stackOnLine });
  return out;
}

/** @private Groups rings into faces: outers (anticlockwise) and the holes inside them. */
function assembleFaces(rings: TracedRing[], minArea: number): OverlayFace[] {
  const outers: {
    ring: TracedRing;
    area: number;
    holes: PlanarPoint[][];
    holesOnLine: boolean[][];
    holeArea: number;
    marked: boolean;
    box: number[];
  }[] = [];
  const holes: { ring: TracedRing; area: number }[] = [];
  for (const ring of rings) {
    const area = ringArea(ring.points);
    if (Math.abs(area) < minArea) continue;
    if (area > 0) outers.push({ ring, area, holes: [], holesOnLine: [], holeArea: 0, marked: ring.marked, box: bbox(ring.points) });
    else holes.push({ ring, area: -area });
  }
  outers.sort((p, q) => p.area - q.area);
  for (const hole of holes) {
    const probe = insideProbe(hole.ring.points);
    const owner = outers.find(
      (o) =>
        probe[0] >= o.box[0] &&
        probe[0] <= o.box[2] &&
        probe[1] >= o.box[1] &&
        probe[1] <= o.box[3] &&
        o.area > hole.area &&
        pointInRing(o.ring.points, probe),
    );
    if (!owner) continue;
    owner.holes.push(hole.ring.points);
    owner.holesOnLine.push(hole.ring.onLine);
    owner.holeArea += hole.area;
    if (hole.ring.marked) owner.marked = true;
  }
  return outers
    .map((o) => ({
      outer: o.ring.points,
      holes: o.holes,
      area: o.area - o.holeArea,
      marked: o.marked,
      outerOnLine: o.ring.onLine,
      holesOnLine: o.holesOnLine,
    }))
    .filter((f) => f.area >= minArea);
}

/** @private A point just inside the region beside the first long edge of a hole ring (the region is on the left). */
function insideProbe(ring: PlanarPoint[]): PlanarPoint {
  let best = 0;
  let bestLen = -1;
  for (let i = 0; i < ring.length; i += 1) {
    const a = ring[i];
    const b = ring[(i + 1) % ring.length];
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
    if (len > bestLen) {
      bestLen = len;
      best = i;
    }
  }
  const a = ring[best];
  const b = ring[(best + 1) % ring.length];
  const offset = Math.min(SIDE_OFFSET, bestLen / 4) / bestLen;
  return [(a[0] + b[0]) / 2 - (b[1] - a[1]) * offset, (a[1] + b[1]) / 2 + (b[0] - a[0]) * offset];
}

/** @private Bounding box [minX, minY, maxX, maxY]. */
function bbox(ring: readonly PlanarPoint[]): number[] {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const p of ring) {
    minX = Math.min(minX, p[0]);
    minY = Math.min(minY, p[1]);
    maxX = Math.max(maxX, p[0]);
    maxY = Math.max(maxY, p[1]);
  }
  return [minX, minY, maxX, maxY];
}

/**
 * Signed area of an open planar ring (shoelace formula): positive when anticlockwise.
 *
 * @param ring - vertices [x, y] in metres, first vertex not repeated (a repeated one adds nothing)
 * @returns area [m²], signed
 * @example
 * ringArea([[0, 0], [2, 0], [2, 1], [0, 1]]); // => 2
 * Source: (a) published: the shoelace (surveyor's) formula, any computational-geometry text.
 */
export function ringArea(ring: readonly PlanarPoint[]): number {
  let sum = 0;
  const n = ring.length;
  for (let i = 0; i < n; i += 1) {
    const a = ring[i];
    const b = ring[(i + 1) % n];
    sum += a[0] * b[1] - b[0] * a[1];
  }
  return sum / 2;
}

/**
 * Point-in-ring test by ray casting (even–odd), for an open planar ring.
 *
 * @param ring - vertices [x, y] in metres
 * @param point - [x, y] in metres
 * @returns true when the point is inside (points on the boundary may go either way)
 * @example
 * pointInRing([[0, 0], [2, 0], [2, 2], [0, 2]], [1, 1]); // => true
 * Source: (a) published: crossing-number test, any computational-geometry text.
 */
export function pointInRing(ring: readonly PlanarPoint[], point: PlanarPoint): boolean {
  let inside = false;
  const [x, y] = point;
  const n = ring.length;
  for (let i = 0, j = n - 1; i < n; j = i, i += 1) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}
