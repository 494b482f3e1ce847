/**
 * @module shared/geometry/check-geometries
 * Applies the geometry rules of an upload kind to one layer's features and normalises what is kept:
 * leases and closure zones need Polygon/MultiPolygon; a coast takes LineString/MultiLineString/Polygon/
 * MultiPolygon. Null or empty geometries, other types, mixed allowed and not-allowed types, coordinates
 * that are not finite numbers, rings with fewer than 4 positions and lines with fewer than 2 are refused
 * (422) with the feature indexes (counting from 0, like shapefile FIDs). Heights (a third value, allowed by
 * RFC 7946 §3.1.1) are dropped with a warning; rings whose last position does not repeat the first are
 * closed, with a warning (RFC 7946 §3.1.6 requires closed rings). Validity (self-intersections…) is not
 * checked here: the database repairs it.
 */
import type { Feature, Geometry, LineString, MultiLineString, MultiPolygon, Polygon, Position } from 'geojson';
import type { UploadKind } from './parsed-upload';
import { UploadError } from './upload-error';
import { formatCount, listSome, type UploadLimits, vertexLimitError } from './upload-limits';

/** Geometry types each kind takes. */
export const ALLOWED_GEOMETRY_TYPES: Readonly<Record<UploadKind, readonly string[]>> = Object.freeze({
  lease: ['Polygon', 'MultiPolygon'],
  zone: ['Polygon', 'MultiPolygon'],
  coast: ['LineString', 'MultiLineString', 'Polygon', 'MultiPolygon'],
});

/** Geometries a kind keeps. */
export type KeptGeometry = Polygon | MultiPolygon | LineString | MultiLineString;

/** Context of {@link checkGeometries}. */
export interface CheckGeometriesContext {
  /** The layer's name, used in messages when the upload has several layers. */
  layerName: string;
  /** True when the upload has several layers (messages then name the layer). */
  multiLayer: boolean;
  /** Vertices already counted in earlier layers of the same upload. */
  verticesBefore: number;
  /** maxVertices applies to the running total. */
  limits: Pick<UploadLimits, 'maxVertices'>;
}

/** The result of {@link checkGeometries}. */
export interface CheckedGeometries {
  /** New features (the input is not modified): 2-D positions, closed rings, same properties and ids. */
  features: Feature<KeptGeometry>[];
  /** Positions in the layer after normalisation (closing positions included). */
  vertexCount: number;
  warnings: string[];
}

const KIND_LABEL: Record<UploadKind, string> = { lease: 'a lease upload', zone: 'a closure-zone upload', coast: 'a coast upload' };

/**
 * Checks and normalises one layer's geometries for an upload kind.
 *
 * @param features - the layer's features, in any CRS.
 * @param kind - 'lease' | 'zone' (polygons) or 'coast' (lines or polygons).
 * @param context - the layer's name and the running vertex count.
 * @returns normalised features, the vertex count and warnings.
 * @throws UploadError no_features, null_geometry, wrong_geometry_type, mixed_geometry_types, invalid_coordinates,
 *   invalid_geometry, too_many_vertices.
 * @example
 * checkGeometries([{ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [[[0,0],[1,0],[1,1],[0,0]]] } }],
 *   'lease', { layerName: 'leases', multiLayer: false, verticesBefore: 0, limits: DEFAULT_UPLOAD_LIMITS }).vertexCount // 4
 */
export function checkGeometries(
  features: readonly Feature<Geometry | null>[],
  kind: UploadKind,
  context: CheckGeometriesContext,
): CheckedGeometries {
  const checker = geometryChecker(kind, context);
  const out = checker.add(features, 0);
  const verdict = checker.finish();
  return { features: out, vertexCount: verdict.vertexCount, warnings: verdict.warnings };
}

/** The verdict of a {@link geometryChecker} on a whole layer. */
export interface GeometryVerdict {
  /** Positions in the layer after normalisation (closing positions included). */
  vertexCount: number;
  /** The layer's geometry types, sorted (all allowed for the kind once the verdict passed). */
  geometryTypes: string[];
  warnings: string[];
}

/** Judges a layer fed in consecutive chunks; see {@link geometryChecker}. */
export interface GeometryChecker {
  /**
   * Takes the next chunk (features `offset`… of the layer, in order) and returns its normalised features
   * while the layer can still pass (after a refusal is certain, fewer or none: the verdict throws anyway).
   */
  add(features: readonly Feature<Geometry | null>[], offset: number): Feature<KeptGeometry>[];
  /** After the last chunk: throws the refusal {@link checkGeometries} gives for the whole layer, or returns the figures. */
  finish(): GeometryVerdict;
}

/**
 * The rules of {@link checkGeometries} applied to a layer read in chunks: the figures its messages need
 * (features without geometry, the tally of types in order of first appearance, the running vertex count,
 * the first bad coordinates and shapes, heights and closed rings) accumulate across chunks and the verdict
 * comes after the last one, with the same precedence and the same messages as over the whole layer at once.
 *
 * @param kind - the upload kind.
 * @param context - the layer's name and the running vertex count, as for checkGeometries.
 * @example
 * const c = geometryChecker('lease', ctx); c.add(chunk1, 0); c.add(chunk2, chunk1.length); c.finish().vertexCount
 */
export function geometryChecker(kind: UploadKind, context: CheckGeometriesContext): GeometryChecker {
  const inLayer = context.multiLayer ? ` in layer “${context.layerName}”` : '';
  const theFile = context.multiLayer ? `Layer “${context.layerName}”` : 'The file';
  const allowed = ALLOWED_GEOMETRY_TYPES[kind];
  let total = 0;
  const empty: number[] = [];
  const byType = new Map<string, number[]>();
  // Once a feature without geometry or of a type the kind does not take is seen, the verdict is that refusal: stop walking.
  let refusedByType = false;
  let vertexLimitAt: number | undefined;
  const state: WalkState = { vertices: context.verticesBefore, threeD: false, closed: 0, limit: context.limits.maxVertices };
  const badCoordinates: string[] = [];
  const badCoordinateIndexes: number[] = [];
  const badShapes: string[] = [];
  const badShapeIndexes: number[] = [];
  let threeDFeatures = 0;

  function add(features: readonly Feature<Geometry | null>[], offset: number): Feature<KeptGeometry>[] {
    total += features.length;
    const out: Feature<KeptGeometry>[] = [];
    features.forEach((f, k) => {
      const i = offset + k;
      if (isEmptyGeometry(f.geometry)) {
        empty.push(i);
        refusedByType = true;
        return;
      }
      const t = typeof f.geometry?.type === 'string' ? f.geometry.type : 'unknown';
      const list = byType.get(t) ?? [];
      list.push(i);
      byType.set(t, list);
      if (!allowed.includes(t)) refusedByType = true;
      if (refusedByType || vertexLimitAt !== undefined) return;
      state.threeD = false;
      try {
        const geometry = normalise(f.geometry as KeptGeometry, state);
        if (state.threeD) threeDFeatures += 1;
        const feature: Feature<KeptGeometry> = { type: 'Feature', properties: f.properties ?? {}, geometry };
        if (f.id !== undefined) feature.id = f.id;
        out.push(feature);
      } catch (e) {
        if (e instanceof BadCoordinate) {
          badCoordinateIndexes.push(i);
          if (badCoordinates.length < 5) badCoordinates.push(`feature ${i} has ${e.what}`);
        } else if (e instanceof BadShape) {
          badShapeIndexes.push(i);
          if (badShapes.length < 5) badShapes.push(`feature ${i} has ${e.what}`);
        } else if (e instanceof VertexLimit) {
          vertexLimitAt = state.vertices;
        } else throw e;
      }
    });
    return out;
  }

  function finish(): GeometryVerdict {
    if (total === 0) {
      throw new UploadError(
        'no_features',
        `${theFile} holds no features. Check that you exported the right layer (and not an empty selection), then upload again.`,
        {
          layer: context.layerName,
        },
      );
    }
    if (empty.length > 0) {
      throw new UploadError(
        'null_geometry',
        `${formatCount(empty.length)} of the ${formatCount(total)} features${inLayer} have no geometry (null or empty): feature${empty.length > 1 ? 's' : ''} ${listSome(empty, 12)} (counting from 0). ` +
          'Every feature needs a boundary: delete those features or draw their shapes in your GIS, then upload again.',
        { layer: context.layerName, indexes: empty.slice(0, 1000) },
      );
    }

    const bad = [...byType.entries()].filter(([t]) => !allowed.includes(t));
    if (bad.length > 0) {
      const counts = Object.fromEntries([...byType.entries()].map(([t, list]) => [t, list.length]));
      const want = allowed.join(', ').replace(/, ([^,]*)$/, ' or $1');
      const advice = adviceFor(
        bad.map(([t]) => t),
        kind,
      );
      if (bad.length === byType.size) {
        const [type, list] = bad[0];
        const also =
          bad.length > 1
            ? ` (the others: ${bad
                .slice(1)
                .map(([t, l]) => `${formatCount(l.length)} ${t}`)
                .join(', ')})`
            : '';
        const share =
          total === 1
            ? 'it is the only feature'
            : list.length === total
              ? `all ${formatCount(total)} features are ${type}`
              : `${formatCount(list.length)} of the ${formatCount(total)} features are ${type}${also}`;
        throw new UploadError(
          'wrong_geometry_type',
          `Feature ${list[0]}${inLayer} is a ${type}, but ${KIND_LABEL[kind]} needs ${want} features; ${share}. ${advice}`,
          { layer: context.layerName, counts, firstIndex: list[0] },
        );
      }
      const tally = [...byType.entries()].map(([t, list]) => `${formatCount(list.length)} ${t}`).join(', ');
      const badIndexes = bad.flatMap(([, list]) => list).sort((a, b) => a - b);
      throw new UploadError(
        'mixed_geometry_types',
        `${theFile} mixes geometry types: ${tally}. ${capitalise(KIND_LABEL[kind])} takes only ${want}: remove the ${bad.map(([t]) => t).join(' and ')} features ` +
          `(${listSome(badIndexes, 10)}, counting from 0) or upload them separately, then upload again.`,
        { layer: context.layerName, counts, indexes: badIndexes.slice(0, 1000) },
      );
    }

    if (vertexLimitAt !== undefined) throw vertexLimitError(vertexLimitAt, context.limits, false);
    if (badCoordinateIndexes.length > 0) {
      throw new UploadError(
        'invalid_coordinates',
        `${formatCount(badCoordinateIndexes.length)} feature${badCoordinateIndexes.length > 1 ? 's' : ''}${inLayer} ${badCoordinateIndexes.length > 1 ? 'have' : 'has'} coordinates that are not plain finite numbers: ${badCoordinates.join('; ')}` +
          `${badCoordinateIndexes.length > badCoordinates.length ? ' …' : ''}. Every coordinate must be a number (not text, null or NaN): fix those features in your GIS or editor and upload again.`,
        { layer: context.layerName, indexes: badCoordinateIndexes.slice(0, 1000) },
      );
    }
    if (badShapeIndexes.length > 0) {
      throw new UploadError(
        'invalid_geometry',
        `${formatCount(badShapeIndexes.length)} feature${badShapeIndexes.length > 1 ? 's' : ''}${inLayer} cannot form a shape: ${badShapes.join('; ')}` +
          `${badShapeIndexes.length > badShapes.length ? ' …' : ''}. A polygon ring needs at least 4 positions (3 corners and the closing one) and a line at least 2: ` +
          'fix or delete those features and upload again.',
        { layer: context.layerName, indexes: badShapeIndexes.slice(0, 1000) },
      );
    }

    const warnings: string[] = [];
    if (threeDFeatures > 0) {
      warnings.push(
        `${formatCount(threeDFeatures)} feature${threeDFeatures > 1 ? 's' : ''}${inLayer} had a third coordinate (height); heights are not used here, so they were dropped.`,
      );
    }
    if (state.closed > 0) {
      warnings.push(
        `${formatCount(state.closed)} polygon ring${state.closed > 1 ? 's' : ''}${inLayer} did not end where ${state.closed > 1 ? 'they' : 'it'} started; ${state.closed > 1 ? 'they were' : 'it was'} closed by repeating the first position.`,
      );
    }
    return { vertexCount: state.vertices - context.verticesBefore, geometryTypes: [...byType.keys()].sort(), warnings };
  }

  return { add, finish };
}

/** @private */
interface WalkState {
  vertices: number;
  threeD: boolean;
  closed: number;
  limit: number;
}

/** @private A coordinate that is not a finite number. */
class BadCoordinate extends Error {
  readonly what: string;
  constructor(what: string) {
    super(what);
    this.what = what;
  }
}
/** @private A ring or line too short to be a shape, or coordinates not nested as the type requires. */
class BadShape extends Error {
  readonly what: string;
  constructor(what: string) {
    super(what);
    this.what = what;
  }
}
/** @private The running vertex count passed the limit. */
class VertexLimit extends Error {}

/** @private */
function isEmptyGeometry(g: Geometry | null | undefined): boolean {
  if (g === null || g === undefined || typeof g !== 'object') return true;
  if (g.type === 'GeometryCollection') return !Array.isArray(g.geometries) || g.geometries.length === 0;
  const c = (g as { coordinates?: unknown }).coordinates;
  return c === undefined || c === null || (Array.isArray(c) && c.length === 0);
}

/** @private */
function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** @private What to do about types a kind does not take. */
function adviceFor(types: string[], kind: UploadKind): string {
  const points = types.some((t) => t.includes('Point'));
  const lines = types.some((t) => t.includes('Line'));
  if (kind === 'coast') {
    return 'A coast is a shoreline (lines) or land polygons: export the coastline layer itself and upload again.';
  }
  if (points)
    return 'Upload the boundaries as polygons: if you only have points (corners or centres), draw the boundaries as polygons in your GIS first.';
  if (lines)
    return 'Upload the boundaries as polygons: if the lines trace the edges, turn them into polygons in your GIS (lines to polygons) first.';
  return 'Upload the boundaries as polygons and upload again.';
}

/** @private Rebuilds a kept geometry with 2-D positions and closed rings. */
function normalise(g: KeptGeometry, state: WalkState): KeptGeometry {
  switch (g.type) {
    case 'LineString':
      return { type: 'LineString', coordinates: line(g.coordinates, state, 'its line') };
    case 'MultiLineString':
      return { type: 'MultiLineString', coordinates: array(g.coordinates, 'its lines').map((l, k) => line(l, state, `line ${k}`)) };
    case 'Polygon':
      return { type: 'Polygon', coordinates: polygon(g.coordinates, state, '') };
    case 'MultiPolygon':
      return { type: 'MultiPolygon', coordinates: array(g.coordinates, 'its polygons').map((p, k) => polygon(p, state, `polygon ${k}, `)) };
  }
}

/** @private */
function array<T>(value: T[] | unknown, what: string): T[] {
  if (!Array.isArray(value)) throw new BadShape(`${what} not written as a list of coordinates`);
  return value as T[];
}

/** @private */
function polygon(rings: Position[][] | unknown, state: WalkState, prefix: string): Position[][] {
  const list = array<Position[]>(rings, `${prefix}its rings`);
  if (list.length === 0) throw new BadShape(`${prefix}no rings`);
  return list.map((ring, k) => {
    const positions = array<Position>(ring, `${prefix}ring ${k}`).map((p) => position(p, state));
    if (positions.length > 0) {
      const first = positions[0];
      const last = positions[positions.length - 1];
      if (first[0] !== last[0] || first[1] !== last[1]) {
        positions.push([first[0], first[1]]);
        state.closed += 1;
        count(state, 1);
      }
    }
    if (positions.length < 4) throw new BadShape(`${prefix}ring ${k} with only ${positions.length} positions`);
    return positions;
  });
}

/** @private */
function line(coords: Position[] | unknown, state: WalkState, what: string): Position[] {
  const positions = array<Position>(coords, what).map((p) => position(p, state));
  if (positions.length < 2) throw new BadShape(`${what} with only ${positions.length} position${positions.length === 1 ? '' : 's'}`);
  return positions;
}

/** @private */
function position(p: Position | unknown, state: WalkState): Position {
  if (!Array.isArray(p)) throw new BadCoordinate(`a position written as ${describe(p)} instead of [x, y]`);
  if (p.length < 2) throw new BadCoordinate(`a position with ${p.length} value${p.length === 1 ? '' : 's'} instead of [x, y]`);
  const x = p[0];
  const y = p[1];
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new BadCoordinate(`the coordinate value ${describe(x)}`);
  if (typeof y !== 'number' || !Number.isFinite(y)) throw new BadCoordinate(`the coordinate value ${describe(y)}`);
  if (p.length > 2) state.threeD = true;
  count(state, 1);
  return [x, y];
}

/** @private */
function count(state: WalkState, n: number): void {
  state.vertices += n;
  if (state.vertices > state.limit) throw new VertexLimit();
}

/** @private A short description of a bad value: '"12.5" (text)', 'null', 'NaN'. */
function describe(v: unknown): string {
  if (typeof v === 'string') return `${JSON.stringify(v.length > 20 ? `${v.slice(0, 20)}…` : v)} (text)`;
  if (typeof v === 'number') return String(v);
  if (v === undefined) return 'missing';
  const s = JSON.stringify(v);
  return s === undefined ? String(v) : s.length > 30 ? `${s.slice(0, 30)}…` : s;
}
