/**
 * The overlay of shared/geometry/overlay-rings.ts expressed with GEOS (geos-wasm, the WebAssembly build of GEOS on
 * npm), for the overlay bench only:
 *  - region = union of the positive rings (GEOSUnaryUnion; the union of the rings' interiors is the non-zero rule for
 *    rings that do not cross themselves) minus the land (anticlockwise negative rings less clockwise ones, GEOSDifference);
 *  - barriers: the region's boundary and the barrier lines are noded (GEOSNode) and polygonized (GEOSPolygonize); the
 *    faces whose interior point lies in the region are kept (dangling lines are dropped by the polygonizer, so no spike);
 *  - marks: each marked segment is intersected with each face (GEOSIntersection); a face is marked when a piece of
 *    positive length has a point just off it on the marked side inside the face (the same side test the overlay makes);
 *  - minArea: holes and faces under it are dropped like the overlay does;
 *  - edges along a negative ring or barrier (the overlay's outerOnLine/holesOnLine, which the footprint needs to
 *    tell coast from open-sea edges): an edge whose midpoint lies within the overlay's merge distance of one.
 * Every GEOS object made here is destroyed before return (the WebAssembly heap is not garbage-collected).
 */
import initGeosJs from 'geos-wasm';
import { type OverlayLine, type PlanarPoint, ringArea } from '../shared/geometry/overlay-rings';

type Geos = Awaited<ReturnType<typeof initGeosJs>>;
type Ring = PlanarPoint[];

/** One face of the GEOS result, in the overlay's form (rings open, outer anticlockwise, holes clockwise). */
export interface GeosFace {
  outer: Ring;
  holes: Ring[];
  area: number;
  marked: boolean;
  /** For each exterior edge (the closing edge last): true when it lies along a negative ring or barrier, as the overlay's. */
  outerOnLine: boolean[];
  holesOnLine: boolean[][];
}

export interface GeosOverlayInput {
  positive: readonly Ring[];
  negative?: readonly OverlayLine[];
  barriers?: readonly OverlayLine[];
  minArea?: number;
}

/** GEOSGeomTypes of geos_c.h (the package's typings declare these constants as functions). */
const LINESTRING = 1;
const POLYGON = 3;
const MULTILINESTRING = 5;
const MULTIPOLYGON = 6;
const GEOMETRYCOLLECTION = 7;

/** The overlay's OVERLAY_MERGE_DISTANCE [m]: an edge this close to a negative ring or barrier lies along it. */
const ON_LINE = 1e-5;

/** The offset of the side probe from a marked piece [m]; the overlay's own SIDE_OFFSET. */
const SIDE_OFFSET = 1e-4;

let geosPromise: Promise<Geos> | null = null;
/** The last message GEOS reported (its calls return a null pointer on an exception). */
let lastError = '';
/** Loads GEOS once (the .wasm is inlined in the package's JavaScript; nothing is fetched). */
export function loadGeos(): Promise<Geos> {
  if (!geosPromise) {
    geosPromise = initGeosJs({
      errorHandler: (message) => {
        lastError = message;
      },
      noticeHandler: () => {}, // GEOSisValid reports each invalid ring; validPolygon repairs them
    });
  }
  return geosPromise;
}

/** Owns the GEOS objects made during one call and destroys them together. */
class Scope {
  private readonly geoms: number[] = [];
  private readonly prepared: number[] = [];
  readonly g: Geos;
  constructor(g: Geos) {
    this.g = g;
  }
  /** Registers a geometry this scope must destroy (throws on a null result, i.e. a GEOS exception). */
  own(ptr: number, what: string): number {
    if (!ptr) throw new Error(`GEOS: ${what} failed: ${lastError}`);
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
    if (!p) throw new Error('GEOS: GEOSPrepare failed');
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

function coordSeq(g: Geos, points: readonly PlanarPoint[], close: boolean): number {
  const n = points.length + (close ? 1 : 0);
  const buf = g.Module._malloc(n * 16);
  const heap = g.Module.HEAPF64; // read after malloc: the heap may have grown
  let k = buf / 8;
  for (const [x, y] of points) {
    heap[k++] = x;
    heap[k++] = y;
  }
  if (close) {
    heap[k++] = points[0][0];
    heap[k++] = points[0][1];
  }
  const seq = g.GEOSCoordSeq_copyFromBuffer(buf, n, 0, 0);
  g.Module._free(buf);
  if (!seq) throw new Error('GEOS: GEOSCoordSeq_copyFromBuffer failed');
  return seq;
}

/** The vertices of a ring (open: the closing vertex dropped) or of a line string (all). */
function readCoords(g: Geos, ringPtr: number, open: boolean): Ring {
  const seq = g.GEOSGeom_getCoordSeq(ringPtr); // owned by the ring
  const sizePtr = g.Module._malloc(4);
  g.GEOSCoordSeq_getSize(seq, sizePtr);
  const n = g.Module.HEAPU32[sizePtr / 4];
  g.Module._free(sizePtr);
  const buf = g.Module._malloc(n * 16);
  g.GEOSCoordSeq_copyToBuffer(seq, buf, 0, 0);
  const heap = g.Module.HEAPF64;
  const out: Ring = [];
  for (let i = 0, k = buf / 8; i < (open ? n - 1 : n); i++, k += 2) out.push([heap[k], heap[k + 1]]);
  g.Module._free(buf);
  return out;
}

/** A collection of the given type that takes ownership of the parts. */
function collection(s: Scope, type: number, parts: number[]): number {
  const g = s.g;
  if (parts.length === 0) return s.own(g.GEOSGeom_createEmptyCollection(type), 'empty collection');
  const arr = g.Module._malloc(parts.length * 4);
  g.Module.HEAPU32.set(parts, arr / 4);
  const c = g.GEOSGeom_createCollection(type, arr, parts.length);
  g.Module._free(arr);
  for (const p of parts) s.release(p);
  return s.own(c, 'GEOSGeom_createCollection');
}

function polygon(s: Scope, ring: readonly PlanarPoint[]): number {
  const shell = s.g.GEOSGeom_createLinearRing(coordSeq(s.g, ring, true));
  if (!shell) throw new Error('GEOS: GEOSGeom_createLinearRing failed');
  return s.own(s.g.GEOSGeom_createPolygon(shell, 0, 0), 'GEOSGeom_createPolygon');
}

function line(s: Scope, l: OverlayLine): number {
  return s.own(s.g.GEOSGeom_createLineString(coordSeq(s.g, l.points, l.closed === true)), 'GEOSGeom_createLineString');
}

function area(g: Geos, geom: number): number {
  const p = g.Module._malloc(8);
  g.GEOSArea(geom, p);
  const a = g.Module.HEAPF64[p / 8];
  g.Module._free(p);
  return a;
}

let makeValidParams = 0;
/**
 * The polygon of a ring, repaired when GEOS finds it invalid (a spike or a repeated vertex, e.g. after snapping): GEOS
 * overlay operations throw on invalid input, where the overlay's winding rule simply gives a spike no area.
 * GEOSMakeValid by its "structure" method without collapsed parts keeps the ring's area and drops the spike.
 */
function validPolygon(s: Scope, ring: readonly PlanarPoint[]): number {
  const g = s.g;
  const p = polygon(s, ring);
  if (g.GEOSisValid(p) === 1) return p;
  if (!makeValidParams) {
    makeValidParams = g.GEOSMakeValidParams_create(); // kept for the process: one small object
    g.GEOSMakeValidParams_setMethod(makeValidParams, 1); // GEOS_MAKE_VALID_STRUCTURE
    g.GEOSMakeValidParams_setKeepCollapsed(makeValidParams, 0);
  }
  return s.own(g.GEOSMakeValidWithParams(p, makeValidParams), 'GEOSMakeValidWithParams');
}

function unionOf(s: Scope, rings: readonly (readonly PlanarPoint[])[]): number {
  const parts = rings.map((r) => validPolygon(s, r));
  const c = collection(s, GEOMETRYCOLLECTION, parts); // a repaired ring may be a multipolygon
  return s.own(s.g.GEOSUnaryUnion(c), 'GEOSUnaryUnion');
}

/** The parts of the given simple type in a geometry or collection (pointers owned by it). */
function partsOf(g: Geos, geom: number, type: number): number[] {
  const t = g.GEOSGeomTypeId(geom);
  if (t === type) return g.GEOSisEmpty(geom) ? [] : [geom];
  if (t !== MULTIPOLYGON && t !== MULTILINESTRING && t !== GEOMETRYCOLLECTION) return [];
  const out: number[] = [];
  const n = g.GEOSGetNumGeometries(geom);
  for (let i = 0; i < n; i++) out.push(...partsOf(g, g.GEOSGetGeometryN(geom, i), type));
  return out;
}

/** Segments of a line (the closing one last for a ring), with their marks. */
function markedSegments(l: OverlayLine): { a: PlanarPoint; b: PlanarPoint; mark: number }[] {
  const out: { a: PlanarPoint; b: PlanarPoint; mark: number }[] = [];
  const n = l.points.length;
  const closed = l.closed === true;
  for (let i = 0; i < (closed ? n : n - 1); i++) {
    const mark = l.marks?.[i] ?? 0;
    if (mark !== 0) out.push({ a: l.points[i], b: l.points[(i + 1) % n], mark });
  }
  return out;
}

/** Runs the overlay with GEOS (see the module comment). Needs {@link loadGeos} to have resolved. */
export function geosOverlay(g: Geos, input: GeosOverlayInput): GeosFace[] {
  const s = new Scope(g);
  try {
    const minArea = input.minArea ?? 2;
    let region = unionOf(s, input.positive);
    const negative = input.negative ?? [];
    if (negative.length) {
      // Land: anticlockwise rings are land, clockwise rings holes in it (lakes), as the overlay reads them.
      const landOuter = negative.filter((l) => ringArea(l.points) > 0).map((l) => l.points);
      const landHoles = negative.filter((l) => ringArea(l.points) < 0).map((l) => l.points);
      let land = unionOf(s, landOuter);
      if (landHoles.length) land = s.own(g.GEOSDifference(land, unionOf(s, landHoles)), 'GEOSDifference');
      region = s.own(g.GEOSDifference(region, land), 'GEOSDifference');
    }
    const barriers = input.barriers ?? [];
    let faces: number[];
    if (barriers.length) {
      const edges = [s.own(g.GEOSBoundary(region), 'GEOSBoundary'), ...barriers.map((l) => line(s, l))];
      const noded = s.own(g.GEOSNode(collection(s, GEOMETRYCOLLECTION, edges)), 'GEOSNode');
      const arr = g.Module._malloc(4);
      g.Module.HEAPU32[arr / 4] = noded;
      const pieces = s.own(g.GEOSPolygonize(arr, 1), 'GEOSPolygonize');
      g.Module._free(arr);
      const inRegion = s.prepare(region);
      faces = partsOf(g, pieces, POLYGON).filter((f) => {
        const probe = s.own(g.GEOSPointOnSurface(f), 'GEOSPointOnSurface');
        return g.GEOSPreparedContains(inRegion, probe) === 1;
      });
    } else {
      faces = partsOf(g, region, POLYGON);
    }
    const marked = new Set<number>();
    const marks = [...negative, ...barriers].flatMap(markedSegments);
    if (marks.length) {
      const preparedFaces = faces.map((f) => s.prepare(f));
      for (const { a, b, mark } of marks) {
        const seg = line(s, { points: [a, b] });
        faces.forEach((f, i) => {
          if (marked.has(i)) return;
          const cut = s.own(g.GEOSIntersection(seg, f), 'GEOSIntersection');
          for (const piece of partsOf(g, cut, LINESTRING)) {
            const [p, q] = readCoords(g, piece, false); // the piece's first sub-segment
            const dx = q[0] - p[0];
            const dy = q[1] - p[1];
            const len = Math.hypot(dx, dy);
            if (len === 0) continue;
            const off = (Math.min(SIDE_OFFSET, len / 4) / len) * mark; // +1: left of the segment's direction
            if (g.GEOSPreparedContainsXY(preparedFaces[i], (p[0] + q[0]) / 2 - dy * off, (p[1] + q[1]) / 2 + dx * off) === 1) marked.add(i);
          }
        });
      }
    }
    const cutLines = [...negative.map((l) => ({ ...l, closed: true })), ...barriers];
    const along = cutLines.length
      ? s.prepare(
          collection(
            s,
            MULTILINESTRING,
            cutLines.map((l) => line(s, l)),
          ),
        )
      : 0;
    const onLine = (ring: Ring): boolean[] =>
      ring.map((p, k) => {
        if (!along) return false;
        const q = ring[(k + 1) % ring.length];
        const mid = g.GEOSGeom_createPointFromXY((p[0] + q[0]) / 2, (p[1] + q[1]) / 2);
        const near = g.GEOSPreparedDistanceWithin(along, mid, ON_LINE) === 1;
        g.GEOSGeom_destroy(mid);
        return near;
      });
    const out: GeosFace[] = [];
    faces.forEach((f, i) => {
      g.GEOSOrientPolygons(f, 0); // exteriors anticlockwise, holes clockwise
      const outer = readCoords(g, g.GEOSGetExteriorRing(f), true);
      const outerArea = ringArea(outer);
      if (outerArea < minArea) return;
      const holes: Ring[] = [];
      for (let h = 0; h < g.GEOSGetNumInteriorRings(f); h++) {
        const hole = readCoords(g, g.GEOSGetInteriorRingN(f, h), true);
        if (-ringArea(hole) >= minArea) holes.push(hole);
      }
      const faceArea = holes.reduce((n, h) => n + ringArea(h), outerArea);
      if (faceArea >= minArea) {
        out.push({ outer, holes, area: faceArea, marked: marked.has(i), outerOnLine: onLine(outer), holesOnLine: holes.map(onLine) });
      }
    });
    return out;
  } finally {
    s.destroy();
  }
}

/** True when GEOS finds face `b` valid (no spike, no self-touching) and it covers the same ground as `a` (symmetric difference under 1e-9 of its area). */
export function sameFace(g: Geos, a: { outer: Ring; holes: Ring[] }, b: { outer: Ring; holes: Ring[] }): boolean {
  const s = new Scope(g);
  try {
    const toPolygon = (f: { outer: Ring; holes: Ring[] }) => {
      const shell = g.GEOSGeom_createLinearRing(coordSeq(g, f.outer, true));
      const holes = f.holes.map((h) => g.GEOSGeom_createLinearRing(coordSeq(g, h, true)));
      const arr = g.Module._malloc(Math.max(1, holes.length) * 4);
      g.Module.HEAPU32.set(holes, arr / 4);
      const p = g.GEOSGeom_createPolygon(shell, holes.length ? arr : 0, holes.length);
      g.Module._free(arr);
      return s.own(p, 'GEOSGeom_createPolygon');
    };
    const pa = toPolygon(a);
    const pb = toPolygon(b);
    if (g.GEOSisValid(pb) !== 1) return false;
    const diff = s.own(g.GEOSSymDifference(pa, pb), 'GEOSSymDifference');
    return area(g, diff) <= 1e-9 * Math.max(1, area(g, pa));
  } finally {
    s.destroy();
  }
}
