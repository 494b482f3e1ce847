/**
 * The contract of overlayRings (shared/geometry/overlay-rings.ts: OverlayInput → OverlayResult with faces, marks,
 * edges along lines, brokenRings) computed with GEOS, for the adoption measurement of issue 17 (the overlay bench,
 * the screening bench's coast line "with GEOS overlay", and tests/shared/geometry/overlay-rings.test.ts, which runs
 * its cases against both). Not used by the product (DEVELOPERS.md 2026-12-02: not adopted). Pure: it is given an
 * initialised geos-wasm instance (the caller awaits initGeosJs once) and does no I/O.
 *  - region = union of the positive polygons (GEOSUnaryUnionPrec) minus the land (GEOSDifferencePrec); with
 *    `orientPositive` (default) every ring is a polygon of its own; without it the rings are read as outer rings
 *    (anticlockwise) each followed by, or containing, its holes (clockwise), the form the overlay's faces come in;
 *  - land = union of the anticlockwise negative rings minus the union of the clockwise ones (lakes);
 *  - barriers: the region's boundary and the barrier lines are noded and dissolved (a union of the lines on the same
 *    grid) and polygonized (GEOSPolygonize_full); faces whose interior point lies in the region are kept;
 *  - marks and "along a line" flags are found in JavaScript, O(edges): each face edge's midpoint is looked up in a
 *    grid of the input's negative and barrier segments (within the overlay's merge distance, parallel); the face is
 *    left of each of its edges (GEOSOrientPolygons), so it is marked when an edge runs with a +1 segment or against
 *    a −1 one. A marked dangle or cut edge dropped by the polygonizer marks the face it lies in, as a spike does in
 *    the overlay;
 *  - invalid input rings (a spike, a repeated vertex) make GEOS throw; then every ring goes through GEOSMakeValid
 *    (structure method, collapsed parts dropped), which keeps the area a winding rule gives them.
 * Every GEOS object made is destroyed before return (the WebAssembly heap is not garbage-collected).
 */
import type initGeosJs from 'geos-wasm';
import {
  OVERLAY_MERGE_DISTANCE,
  type OverlayFace,
  type OverlayFn,
  type OverlayInput,
  type OverlayLine,
  type OverlayResult,
  type PlanarPoint,
  pointInRing,
  ringArea,
} from '../shared/geometry/overlay-rings';

/** An initialised geos-wasm instance (the value `await initGeosJs()` gives). */
export type GeosInstance = Awaited<ReturnType<typeof initGeosJs>>;

/** GEOSGeomTypes of geos_c.h. */
const LINESTRING = 1;
const POLYGON = 3;
const MULTILINESTRING = 5;
const MULTIPOLYGON = 6;
const GEOMETRYCOLLECTION = 7;

/**
 * Snap-rounding grid of every GEOS operation [m] (measured, see DEVELOPERS.md 2026-12-02 "not adopted"): in floating
 * precision, neighbouring strip pieces whose shared sides differ by rounding leave a hairline gap that splits a band
 * into faces; on the overlay's merge distance (1e-5 m) band fractions move by up to 2e-6 relative; at 1e-7 m the
 * headland fixture's bands come out invalid; 1e-9 m gives the overlay's areas to 3e-10 relative on every fixture.
 */
const GRID = 1e-9;

/**
 * An overlay function backed by GEOS, with the contract of overlayRings.
 *
 * @param geos - an initialised geos-wasm instance; its error handler should keep the last message (see
 *   {@link geosErrorSink}) so failures can say what GEOS reported
 * @returns (input) => OverlayResult; brokenRings counts rings GEOS's polygonizer found invalid
 * @example
 * const overlay = geosOverlay(await initGeosJs());
 * overlay({ positive: [[[0, 0], [2, 0], [2, 2], [0, 2]], [[1, 1], [3, 1], [3, 3], [1, 3]]] }).faces[0].area; // => 7
 * Source: (c) derived: the overlay's contract, expressed with GEOS's overlay, noder and polygonizer.
 */
export function geosOverlay(geos: GeosInstance): OverlayFn {
  return (input: OverlayInput) => runOverlay(geos, input);
}

/** The last message GEOS reported, for an `initGeosJs({ errorHandler })` (its calls return null on an exception). */
export const geosErrorSink = {
  last: '',
  handler(message: string): void {
    geosErrorSink.last = message;
  },
};

/** Owns the GEOS objects made during one call and destroys them together. */
class Scope {
  private readonly geoms: number[] = [];
  private readonly prepared: number[] = [];
  readonly g: GeosInstance;
  constructor(g: GeosInstance) {
    this.g = g;
  }
  own(ptr: number, what: string): number {
    if (!ptr) throw new Error(`GEOS: ${what} failed: ${geosErrorSink.last}`);
    this.geoms.push(ptr);
    return ptr;
  }
  /** Hands a geometry to GEOS (it became part of a collection or polygon that owns it now). */
  release(ptr: number): void {
    const i = this.geoms.lastIndexOf(ptr);
    if (i >= 0) this.geoms.splice(i, 1);
  }
  prepare(ptr: number): number {
    const p = this.g.GEOSPrepare(ptr);
    if (!p) throw new Error(`GEOS: GEOSPrepare failed: ${geosErrorSink.last}`);
    this.prepared.push(p);
    return p;
  }
  destroy(): void {
    for (const p of this.prepared) this.g.GEOSPreparedGeom_destroy(p);
    for (const p of this.geoms) this.g.GEOSGeom_destroy(p);
    this.prepared.length = 0;
    this.geoms.length = 0;
  }
}

function coordSeq(g: GeosInstance, points: readonly PlanarPoint[], close: boolean): number {
  const n = points.length + (close ? 1 : 0);
  const buf = g.Module._malloc(n * 16);
  const heap = g.Module.HEAPF64; // read after malloc: the heap may have grown
  let k = buf / 8;
  for (const p of points) {
    heap[k++] = p[0];
    heap[k++] = p[1];
  }
  if (close) {
    heap[k++] = points[0][0];
    heap[k++] = points[0][1];
  }
  const seq = g.GEOSCoordSeq_copyFromBuffer(buf, n, 0, 0);
  g.Module._free(buf);
  if (!seq) throw new Error(`GEOS: GEOSCoordSeq_copyFromBuffer failed: ${geosErrorSink.last}`);
  return seq;
}

/** The vertices of a ring (open: the closing vertex dropped) or of a line string (all). */
function readCoords(g: GeosInstance, ptr: number, open: boolean): PlanarPoint[] {
  const seq = g.GEOSGeom_getCoordSeq(ptr); // owned by the geometry
  const sizePtr = g.Module._malloc(4);
  g.GEOSCoordSeq_getSize(seq, sizePtr);
  const n = g.Module.HEAPU32[sizePtr / 4];
  g.Module._free(sizePtr);
  const buf = g.Module._malloc(Math.max(1, n) * 16);
  g.GEOSCoordSeq_copyToBuffer(seq, buf, 0, 0);
  const heap = g.Module.HEAPF64;
  const out: PlanarPoint[] = [];
  for (let i = 0, k = buf / 8; i < (open ? n - 1 : n); i++, k += 2) out.push([heap[k], heap[k + 1]]);
  g.Module._free(buf);
  return out;
}

/** A collection of the given type that takes ownership of the parts. */
function collection(s: Scope, type: number, parts: number[]): number {
  const g = s.g;
  if (parts.length === 0) return s.own(g.GEOSGeom_createEmptyCollection(type), 'GEOSGeom_createEmptyCollection');
  const arr = g.Module._malloc(parts.length * 4);
  g.Module.HEAPU32.set(parts, arr / 4);
  const c = g.GEOSGeom_createCollection(type, arr, parts.length);
  g.Module._free(arr);
  for (const p of parts) s.release(p);
  return s.own(c, 'GEOSGeom_createCollection');
}

/** A polygon from an outer ring and holes (orientation left as given; GEOS does not care). */
function polygon(s: Scope, outer: readonly PlanarPoint[], holes: readonly (readonly PlanarPoint[])[]): number {
  const g = s.g;
  const shell = g.GEOSGeom_createLinearRing(coordSeq(g, outer, true));
  if (!shell) throw new Error(`GEOS: GEOSGeom_createLinearRing failed: ${geosErrorSink.last}`);
  let arr = 0;
  const holePtrs = holes.map((h) => {
    const r = g.GEOSGeom_createLinearRing(coordSeq(g, h, true));
    if (!r) throw new Error(`GEOS: GEOSGeom_createLinearRing failed: ${geosErrorSink.last}`);
    return r;
  });
  if (holePtrs.length) {
    arr = g.Module._malloc(holePtrs.length * 4);
    g.Module.HEAPU32.set(holePtrs, arr / 4);
  }
  const p = g.GEOSGeom_createPolygon(shell, arr, holePtrs.length);
  if (arr) g.Module._free(arr);
  return s.own(p, 'GEOSGeom_createPolygon');
}

function line(s: Scope, l: OverlayLine): number {
  return s.own(s.g.GEOSGeom_createLineString(coordSeq(s.g, l.points, l.closed === true)), 'GEOSGeom_createLineString');
}

let makeValidParams = 0;
/** A repaired copy of a polygon GEOS finds invalid (structure method, collapsed parts dropped), else the polygon. */
function repaired(s: Scope, p: number): number {
  const g = s.g;
  if (g.GEOSisValid(p) === 1) return p;
  if (!makeValidParams) {
    makeValidParams = g.GEOSMakeValidParams_create(); // kept for the process: one small object
    g.GEOSMakeValidParams_setMethod(makeValidParams, 1); // GEOS_MAKE_VALID_STRUCTURE
    g.GEOSMakeValidParams_setKeepCollapsed(makeValidParams, 0);
  }
  return s.own(g.GEOSMakeValidWithParams(p, makeValidParams), 'GEOSMakeValidWithParams');
}

/** Union of polygons given as [outer, holes]; first as they are, and when GEOS throws, each repaired first. */
function unionOf(s: Scope, polys: readonly { outer: readonly PlanarPoint[]; holes: readonly (readonly PlanarPoint[])[] }[]): number {
  const g = s.g;
  const build = (repair: boolean) => {
    const parts = polys.map((p) => {
      const poly = polygon(s, p.outer, p.holes);
      return repair ? repaired(s, poly) : poly;
    });
    // A multipolygon goes straight to the cascaded polygon union; a repaired part may be a multipolygon itself.
    return collection(s, repair ? GEOMETRYCOLLECTION : MULTIPOLYGON, parts);
  };
  const first = build(false);
  const u = g.GEOSUnaryUnionPrec(first, GRID);
  if (u) return s.own(u, 'GEOSUnaryUnionPrec');
  return s.own(g.GEOSUnaryUnionPrec(build(true), GRID), 'GEOSUnaryUnionPrec');
}

/** The parts of the given simple type in a geometry or collection (pointers owned by it). */
function partsOf(g: GeosInstance, geom: number, type: number): number[] {
  const t = g.GEOSGeomTypeId(geom);
  if (t === type) return g.GEOSisEmpty(geom) ? [] : [geom];
  if (t !== MULTIPOLYGON && t !== MULTILINESTRING && t !== GEOMETRYCOLLECTION) return [];
  const out: number[] = [];
  const n = g.GEOSGetNumGeometries(geom);
  for (let i = 0; i < n; i++) out.push(...partsOf(g, g.GEOSGetGeometryN(geom, i), type));
  return out;
}

/** Positive rings as polygons: each its own (orient) or outers with the holes that follow or lie in them. */
function positivePolygons(rings: readonly (readonly PlanarPoint[])[], orient: boolean) {
  const polys: { outer: readonly PlanarPoint[]; holes: (readonly PlanarPoint[])[]; area: number; box: number[] }[] = [];
  const holes: (readonly PlanarPoint[])[] = [];
  for (const ring of rings) {
    if (ring.length < 3) continue;
    const a = ringArea(ring);
    if (a === 0) continue;
    if (orient || a > 0) {
      polys.push({ outer: ring, holes: [], area: Math.abs(a), box: bbox(ring) });
      continue;
    }
    const last = polys[polys.length - 1];
    const probe = ring[0];
    if (last && inBox(last.box, probe) && pointInRing(last.outer, probe)) last.holes.push(ring);
    else holes.push(ring);
  }
  for (const hole of holes) {
    const probe = hole[0];
    let owner: (typeof polys)[number] | undefined;
    for (const p of polys) {
      if (inBox(p.box, probe) && pointInRing(p.outer, probe) && (!owner || p.area < owner.area)) owner = p;
    }
    owner?.holes.push(hole); // a hole in no outer adds no area under the winding rule
  }
  return polys;
}

/** A grid of the input's negative-ring and barrier segments, for the edge lookups. */
class SegmentGrid {
  private readonly cells = new Map<number, number[]>();
  private readonly long: number[] = [];
  readonly ax: number[] = [];
  readonly ay: number[] = [];
  readonly bx: number[] = [];
  readonly by: number[] = [];
  readonly mark: number[] = [];
  private cell = 1;
  private minX = 0;
  private minY = 0;

  constructor(lines: readonly OverlayLine[]) {
    for (const l of lines) {
      const n = l.points.length;
      const closed = l.closed === true;
      for (let i = 0; i < (closed ? n : n - 1); i++) {
        const a = l.points[i];
        const b = l.points[(i + 1) % n];
        if (a[0] === b[0] && a[1] === b[1]) continue;
        this.ax.push(a[0]);
        this.ay.push(a[1]);
        this.bx.push(b[0]);
        this.by.push(b[1]);
        this.mark.push(l.marks?.[i] ?? 0);
      }
    }
    const m = this.ax.length;
    if (m === 0) return;
    const lengths: number[] = [];
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    for (let e = 0; e < m; e++) {
      lengths.push(Math.hypot(this.bx[e] - this.ax[e], this.by[e] - this.ay[e]));
      minX = Math.min(minX, this.ax[e], this.bx[e]);
      minY = Math.min(minY, this.ay[e], this.by[e]);
      maxX = Math.max(maxX, this.ax[e], this.bx[e]);
      maxY = Math.max(maxY, this.ay[e], this.by[e]);
    }
    lengths.sort((p, q) => p - q);
    this.cell = Math.max(2 * lengths[Math.floor(m / 2)], Math.max(maxX - minX, maxY - minY) / 4096, 1e-6);
    this.minX = minX;
    this.minY = minY;
    const tol = OVERLAY_MERGE_DISTANCE;
    for (let e = 0; e < m; e++) {
      const c0 = Math.floor((Math.min(this.ax[e], this.bx[e]) - tol - minX) / this.cell);
      const c1 = Math.floor((Math.max(this.ax[e], this.bx[e]) + tol - minX) / this.cell);
      const r0 = Math.floor((Math.min(this.ay[e], this.by[e]) - tol - minY) / this.cell);
      const r1 = Math.floor((Math.max(this.ay[e], this.by[e]) + tol - minY) / this.cell);
      if ((c1 - c0 + 1) * (r1 - r0 + 1) > 64) {
        this.long.push(e); // the few long segments (a shoreline's ends carried past the box) are checked always
        continue;
      }
      for (let c = c0; c <= c1; c++) {
        for (let r = r0; r <= r1; r++) {
          const key = c * 1_048_583 + r;
          const list = this.cells.get(key);
          if (list) list.push(e);
          else this.cells.set(key, [e]);
        }
      }
    }
  }

  /**
   * The segments an edge p→q lies along (its midpoint within the merge distance, parallel to it): whether any does,
   * and whether one of them marks the side left of p→q.
   */
  along(p: PlanarPoint, q: PlanarPoint): { onLine: boolean; marksLeft: boolean; marked: boolean } {
    const result = { onLine: false, marksLeft: false, marked: false };
    if (this.ax.length === 0) return result;
    const mx = (p[0] + q[0]) / 2;
    const my = (p[1] + q[1]) / 2;
    const dx = q[0] - p[0];
    const dy = q[1] - p[1];
    const len = Math.hypot(dx, dy);
    const visit = (e: number) => {
      const sx = this.bx[e] - this.ax[e];
      const sy = this.by[e] - this.ay[e];
      const l2 = sx * sx + sy * sy;
      const t = Math.max(0, Math.min(1, ((mx - this.ax[e]) * sx + (my - this.ay[e]) * sy) / l2));
      if (Math.hypot(mx - this.ax[e] - t * sx, my - this.ay[e] - t * sy) > OVERLAY_MERGE_DISTANCE) return;
      // Parallel: the edge's ends are within the merge distance of the segment's line too.
      const sl = Math.sqrt(l2);
      if (Math.abs(dx * sy - dy * sx) / sl > 2 * OVERLAY_MERGE_DISTANCE + 1e-9 * len) return;
      result.onLine = true;
      const mk = this.mark[e];
      // An edge shorter than the merge distance (a snap-rounding step) has no direction to speak of: it marks nothing.
      if (mk !== 0 && len > OVERLAY_MERGE_DISTANCE) {
        result.marked = true;
        if (mk > 0 === dx * sx + dy * sy > 0) result.marksLeft = true;
      }
    };
    const c = Math.floor((mx - this.minX) / this.cell);
    const r = Math.floor((my - this.minY) / this.cell);
    for (const e of this.cells.get(c * 1_048_583 + r) ?? []) visit(e);
    for (const e of this.long) visit(e);
    return result;
  }
}

function runOverlay(g: GeosInstance, input: OverlayInput): OverlayResult {
  const minArea = input.minArea ?? 2;
  if (!(minArea >= 0)) throw new RangeError(`minArea must be ≥ 0 m² (got ${String(minArea)})`);
  const lines = [...(input.negative ?? []), ...(input.barriers ?? [])].map((l) => l.points);
  for (const ring of [...input.positive, ...lines]) {
    for (const p of ring) if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) throw new RangeError('overlay: coordinates must be finite numbers');
  }
  const polys = positivePolygons(input.positive, input.orientPositive ?? true);
  if (polys.length === 0) return { faces: [], brokenRings: 0 };
  const s = new Scope(g);
  try {
    let region = unionOf(s, polys);
    const negative = (input.negative ?? []).filter((l) => l.points.length >= 3);
    if (negative.length) {
      const outer = negative.filter((l) => ringArea(l.points) > 0).map((l) => ({ outer: l.points, holes: [] }));
      const lakes = negative.filter((l) => ringArea(l.points) < 0).map((l) => ({ outer: l.points, holes: [] }));
      if (outer.length) {
        let land = unionOf(s, outer);
        if (lakes.length) land = s.own(g.GEOSDifferencePrec(land, unionOf(s, lakes), GRID), 'GEOSDifferencePrec');
        region = s.own(g.GEOSDifferencePrec(region, land, GRID), 'GEOSDifferencePrec');
      }
    }
    const barriers = (input.barriers ?? []).filter((l) => l.points.length >= 2);
    const grid = new SegmentGrid([...negative.map((l) => ({ ...l, closed: true })), ...barriers]);
    let faces: number[];
    let broken = 0;
    const spikes: PlanarPoint[][] = [];
    if (barriers.length && !g.GEOSisEmpty(region)) {
      const edges = [s.own(g.GEOSBoundary(region), 'GEOSBoundary'), ...barriers.map((l) => line(s, l))];
      // Noded and dissolved on the same grid (a union of lines), so the polygonizer meets each edge once.
      const noded = s.own(g.GEOSUnaryUnionPrec(collection(s, GEOMETRYCOLLECTION, edges), GRID), 'GEOSUnaryUnionPrec');
      const out = g.Module._malloc(12);
      g.Module.HEAPU32.fill(0, out / 4, out / 4 + 3);
      const pieces = s.own(g.GEOSPolygonize_full(noded, out, out + 4, out + 8), 'GEOSPolygonize_full');
      const [cuts, dangles, invalid] = [0, 1, 2].map((i) => g.Module.HEAPU32[out / 4 + i]);
      g.Module._free(out);
      for (const p of [cuts, dangles, invalid]) if (p) s.own(p, 'GEOSPolygonize_full');
      if (invalid) broken += g.GEOSGetNumGeometries(invalid);
      for (const extra of [cuts, dangles]) {
        if (!extra) continue;
        for (const l of partsOf(g, extra, LINESTRING)) spikes.push(readCoords(g, l, false));
      }
      const inRegion = s.prepare(region);
      faces = partsOf(g, pieces, POLYGON).filter((f) => {
        const probe = s.own(g.GEOSPointOnSurface(f), 'GEOSPointOnSurface');
        return g.GEOSPreparedContains(inRegion, probe) === 1;
      });
    } else {
      faces = partsOf(g, region, POLYGON);
    }
    const result: (OverlayFace & { box: number[] })[] = [];
    for (const f of faces) {
      g.GEOSOrientPolygons(f, 0); // exteriors anticlockwise, holes clockwise: the face is left of every edge
      const outer = readCoords(g, g.GEOSGetExteriorRing(f), true);
      const outerArea = ringArea(outer);
      if (outerArea < minArea) continue;
      const holes: PlanarPoint[][] = [];
      for (let h = 0; h < g.GEOSGetNumInteriorRings(f); h++) {
        const hole = readCoords(g, g.GEOSGetInteriorRingN(f, h), true);
        if (-ringArea(hole) >= minArea) holes.push(hole);
      }
      const area = holes.reduce((n, h) => n + ringArea(h), outerArea);
      if (area < minArea) continue;
      let marked = false;
      const flags = (ring: PlanarPoint[]) =>
        ring.map((p, k) => {
          const hit = grid.along(p, ring[(k + 1) % ring.length]);
          if (hit.marksLeft) marked = true;
          return hit.onLine;
        });
      const outerOnLine = flags(outer);
      const holesOnLine = holes.map(flags);
      result.push({ outer, holes, area, marked, outerOnLine, holesOnLine, box: bbox(outer) });
    }
    // A marked edge the polygonizer dropped (a dangling barrier, a cut edge) marks the face it lies in.
    for (const spike of spikes) {
      for (let k = 0; k + 1 < spike.length; k++) {
        const p = spike[k];
        const q = spike[k + 1];
        if (!grid.along(p, q).marked) continue;
        const mid: PlanarPoint = [(p[0] + q[0]) / 2, (p[1] + q[1]) / 2];
        const face = result.find(
          (f) => inBox(f.box, mid) && pointInRing(f.outer, mid) && !f.holes.some((h) => pointInRing(h, mid)),
        );
        if (face) (face as { marked: boolean }).marked = true;
      }
    }
    return {
      faces: result.map(({ box: _box, ...face }) => face),
      brokenRings: broken,
    };
  } finally {
    s.destroy();
  }
}

function bbox(ring: readonly PlanarPoint[]): number[] {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const p of ring) {
    if (p[0] < minX) minX = p[0];
    if (p[0] > maxX) maxX = p[0];
    if (p[1] < minY) minY = p[1];
    if (p[1] > maxY) maxY = p[1];
  }
  return [minX, minY, maxX, maxY];
}

function inBox(box: number[], p: PlanarPoint): boolean {
  return p[0] >= box[0] && p[0] <= box[2] && p[1] >= box[1] && p[1] <= box[3];
}
