/**
 * @module shared/geometry/prepare-coast
 * Turns a coast given as GeoJSON in EPSG:4326 (shoreline lines and/or land polygons) into
 * planar lines in the local projection, ready to snap to, walk along and clip against.
 *
 * - LineString / MultiLineString: shorelines. Pieces whose ends meet (within
 *   {@link COAST_JOIN_DISTANCE}) are joined; a line that ends where it starts is a ring (an
 *   island, or a mainland drawn as a closed line).
 * - Polygon / MultiPolygon: land, the sea being outside. Each boundary ring becomes a coast
 *   line too, exterior rings anticlockwise and holes clockwise, so the land is always on the
 *   left of a land ring and the sea on its right.
 * Lines and rings wholly outside the working window (a lon/lat box around the mouth) are
 * skipped before projecting, so a large coast file costs little.
 */

import type { Feature, FeatureCollection, Geometry, Position } from 'geojson';
import type { LocalProjection } from './local-projection';
import { type PlanarPoint, ringArea } from './overlay-rings';

/** Coast input: a GeoJSON geometry, feature or feature collection in EPSG:4326. */
export type CoastGeoJson = Geometry | Feature | FeatureCollection;

/** One planar coast line. */
export interface CoastLine {
  /** Vertices [x, y] in metres; rings do not repeat the first vertex. */
  readonly points: PlanarPoint[];
  /** True for a ring. */
  readonly closed: boolean;
  /** 'shoreline' for a line of the input; 'land-ring' for a boundary ring of a land polygon. */
  readonly source: 'shoreline' | 'land-ring';
}

/** The planar coast. */
export interface PreparedCoast {
  /** All coast lines: shorelines and land-polygon rings. */
  readonly lines: CoastLine[];
  /** Number of land polygons found. */
  readonly landPolygons: number;
}

/**
 * Longest coast segment kept as one [m]: longer segments (straight in lon/lat, RFC 7946) get
 * extra vertices before projecting, so they keep their shape in metres within about 1 mm (c).
 */
export const COAST_MAX_SEGMENT = 250;

/** Line ends closer than this are joined [m] (c: digitising slack, far below mapped detail). */
export const COAST_JOIN_DISTANCE = 1;

/** A box around the mouth outside which coast pieces are skipped. */
export interface CoastWindow {
  /** [lon, lat] of the centre, degrees. */
  readonly centre: readonly [number, number];
  /** Half-size of the window [m], > 0. */
  readonly radius: number;
}

/**
 * Projects and tidies a coast (see the module comment).
 *
 * @param coast - GeoJSON geometry, feature or feature collection in EPSG:4326 with
 *   LineString, MultiLineString, Polygon, MultiPolygon (or a GeometryCollection of them)
 * @param projection - the local projection (metres)
 * @param window - optional lon/lat window: pieces wholly outside it are skipped
 * @returns planar coast lines [m] and the number of land polygons
 * @example
 * prepareCoast({ type: 'LineString', coordinates: [[-70, 40.9], [-70, 41.2]] }, localProjection([-70, 41]))
 *   .lines[0].points.length; // => 2
 * Source: (c) common practice: GeoJSON (RFC 7946) geometry types; joining and ring
 * orientation as described in the module comment.
 */
export function prepareCoast(coast: CoastGeoJson, projection: LocalProjection, window?: CoastWindow): PreparedCoast {
  const shorelines: PlanarPoint[][] = [];
  const lines: CoastLine[] = [];
  let landPolygons = 0;
  const keep = windowFilter(window);
  const project = (coords: Position[]): PlanarPoint[] => dedupe(densify(coords).map((c) => checkPosition(c, projection)));
  const addPolygon = (rings: Position[][]) => {
    if (rings.length === 0 || !keep(rings[0])) return;
    landPolygons += 1;
    rings.forEach((ring, index) => {
      let points = project(ring);
      if (points.length > 1 && samePoint(points[0], points[points.length - 1], 1e-6)) points = points.slice(0, -1);
      if (points.length < 3) return;
      const area = ringArea(points);
      if ((index === 0 && area < 0) || (index > 0 && area > 0)) points = points.reverse();
      lines.push({ points, closed: true, source: 'land-ring' });
    });
  };
  const visit = (geometry: Geometry | null): void => {
    if (!geometry) return;
    switch (geometry.type) {
      case 'LineString':
        if (keep(geometry.coordinates)) shorelines.push(project(geometry.coordinates));
        return;
      case 'MultiLineString':
        for (const part of geometry.coordinates) if (keep(part)) shorelines.push(project(part));
        return;
      case 'Polygon':
        addPolygon(geometry.coordinates);
        return;
      case 'MultiPolygon':
        for (const polygon of geometry.coordinates) addPolygon(polygon);
        return;
      case 'GeometryCollection':
        for (const g of geometry.geometries) visit(g);
        return;
      default:
        return;
    }
  };
  if (coast.type === 'FeatureCollection') for (const f of coast.features) visit(f.geometry);
  else if (coast.type === 'Feature') visit(coast.geometry);
  else visit(coast);
  for (const line of joinLines(shorelines.filter((l) => l.length >= 2))) lines.push(line);
  return { lines, landPolygons };
}

/** @private Validates and projects one position. */
function checkPosition(c: Position, projection: LocalProjection): [number, number] {
  const lon = c[0];
  const lat = c[1];
  if (!Number.isFinite(lon) || !Number.isFinite(lat) || lon < -180 || lon > 180 || lat < -90 || lat > 90) {
    throw new RangeError(`coast coordinates must be [lon, lat] in degrees (EPSG:4326); got [${String(lon)}, ${String(lat)}]`);
  }
  return projection.forward([lon, lat]);
}

/** @private A filter keeping coordinate lists whose lon/lat box meets the window. */
function windowFilter(window: CoastWindow | undefined): (coords: Position[]) => boolean {
  if (!window) return () => true;
  const [lon0, lat0] = window.centre;
  const dLat = (1.2 * window.radius) / 110_574 + 0.05;
  const latMax = Math.min(89.9, Math.abs(lat0) + dLat);
  const dLon = (1.2 * window.radius) / (111_320 * Math.cos((latMax * Math.PI) / 180)) + 0.05;
  if (Math.abs(lat0) + dLat >= 89.9 || Math.abs(lon0) + dLon >= 180 || dLon >= 90) return () => true;
  return (coords) => {
    let minLon = Infinity;
    let maxLon = -Infinity;
    let minLat = Infinity;
    let maxLat = -Infinity;
    for (const c of coords) {
      minLon = Math.min(minLon, c[0]);
      maxLon = Math.max(maxLon, c[0]);
      minLat = Math.min(minLat, c[1]);
      maxLat = Math.max(maxLat, c[1]);
    }
    return !(maxLon < lon0 - dLon || minLon > lon0 + dLon || maxLat < lat0 - dLat || minLat > lat0 + dLat);
  };
}

/** @private Extra vertices on segments longer than COAST_MAX_SEGMENT, linear in lon/lat. */
function densify(coords: Position[]): Position[] {
  const out: Position[] = [];
  for (let i = 0; i < coords.length; i += 1) {
    const a = coords[i];
    out.push(a);
    if (i + 1 === coords.length) break;
    const b = coords[i + 1];
    const kx = 111_320 * Math.cos((((a[1] + b[1]) / 2) * Math.PI) / 180);
    const length = Math.hypot((b[0] - a[0]) * kx, (b[1] - a[1]) * 110_574);
    const pieces = Number.isFinite(length) ? Math.min(100_000, Math.ceil(length / COAST_MAX_SEGMENT)) : 1;
    for (let k = 1; k < pieces; k += 1) out.push([a[0] + ((b[0] - a[0]) * k) / pieces, a[1] + ((b[1] - a[1]) * k) / pieces]);
  }
  return out;
}

/** @private Drops consecutive repeated points (within 1 µm). */
function dedupe(points: PlanarPoint[]): PlanarPoint[] {
  const out: PlanarPoint[] = [];
  for (const p of points) if (out.length === 0 || !samePoint(out[out.length - 1], p, 1e-6)) out.push(p);
  return out;
}

/** @private True when two points are within d metres. */
function samePoint(a: PlanarPoint, b: PlanarPoint, d: number): boolean {
  return Math.hypot(a[0] - b[0], a[1] - b[1]) <= d;
}

/** @private Joins shoreline pieces end to end; closes lines that end where they start. */
function joinLines(pieces: PlanarPoint[][]): CoastLine[] {
  const used = new Uint8Array(pieces.length);
  const cell = 2 * COAST_JOIN_DISTANCE;
  const ends = new Map<string, { piece: number; atStart: boolean }[]>();
  const keyOf = (p: PlanarPoint, dx = 0, dy = 0) => `${Math.floor(p[0] / cell) + dx},${Math.floor(p[1] / cell) + dy}`;
  pieces.forEach((piece, i) => {
    for (const atStart of [true, false]) {
      const p = atStart ? piece[0] : piece[piece.length - 1];
      const key = keyOf(p);
      const list = ends.get(key);
      if (list) list.push({ piece: i, atStart });
      else ends.set(key, [{ piece: i, atStart }]);
    }
  });
  const findNear = (p: PlanarPoint, self: number): { piece: number; atStart: boolean } | undefined => {
    for (let dx = -1; dx <= 1; dx += 1) {
      for (let dy = -1; dy <= 1; dy += 1) {
        for (const end of ends.get(keyOf(p, dx, dy)) ?? []) {
          if (end.piece === self || used[end.piece]) continue;
          const piece = pieces[end.piece];
          const q = end.atStart ? piece[0] : piece[piece.length - 1];
          if (samePoint(p, q, COAST_JOIN_DISTANCE)) return end;
        }
      }
    }
    return undefined;
  };
  const out: CoastLine[] = [];
  for (let i = 0; i < pieces.length; i += 1) {
    if (used[i]) continue;
    used[i] = 1;
    let line = [...pieces[i]];
    const isRing = () => line.length >= 4 && samePoint(line[0], line[line.length - 1], COAST_JOIN_DISTANCE);
    // Extend at the tail, then at the head.
    for (let guard = 0; guard < pieces.length && !isRing(); guard += 1) {
      const next = findNear(line[line.length - 1], i);
      if (!next) break;
      used[next.piece] = 1;
      const add = next.atStart ? pieces[next.piece] : [...pieces[next.piece]].reverse();
      line = line.concat(add.slice(1));
    }
    for (let guard = 0; guard < pieces.length && !isRing(); guard += 1) {
      const prev = findNear(line[0], i);
      if (!prev) break;
      used[prev.piece] = 1;
      const add = prev.atStart ? [...pieces[prev.piece]].reverse() : pieces[prev.piece];
      line = add.slice(0, -1).concat(line);
    }
    if (isRing()) out.push({ points: line.slice(0, -1), closed: true, source: 'shoreline' });
    else out.push({ points: line, closed: false, source: 'shoreline' });
  }
  return out;
}
