/**
 * @module shared/geometry/check-coordinates
 * Sanity checks on features AFTER reprojection to EPSG:4326: every longitude within ±180° and latitude
 * within ±90° (else the file is most likely projected with a missing or wrong .prj), and signs that
 * latitude and longitude were swapped. Also {@link bboxOf}.
 */
import type { Feature, Geometry, Position } from 'geojson';
import { UploadError } from './upload-error';
import { formatCount } from './upload-limits';

/** [minLon, minLat, maxLon, maxLat] in degrees (RFC 7946 §5 order). */
export type Bbox = [number, number, number, number];

/** Options of {@link checkCoordinates}. */
export interface CheckCoordinatesOptions {
  /** The region the data should fall in (e.g. the jurisdiction's bbox); enables the softer swap and placement warnings. */
  expectedBbox?: Bbox;
  /** Layer name for messages. */
  layerName?: string;
}

/**
 * Checks reprojected features. Hard errors (422): a position outside ±180°/±90° (coordinates_out_of_range,
 * naming the feature and the value), or first values all within ±90° while some second values pass ±90°
 * (coordinates_swapped). Warnings, when `expectedBbox` is given and everything is in range: most features
 * fall in the expected region only when swapped, or none falls in it at all.
 *
 * @param features - features in EPSG:4326 [lon, lat].
 * @param options - optional expected region and layer name.
 * @returns warnings (possibly none).
 * @throws UploadError coordinates_out_of_range, coordinates_swapped.
 * @example
 * checkCoordinates(features, { expectedBbox: [-3.2, 47.4, -2.6, 47.8] }) // []
 */
export function checkCoordinates(features: readonly Feature<Geometry | null>[], options: CheckCoordinatesOptions = {}): string[] {
  const check = coordinateCheck(options);
  check.add(features, 0);
  return check.finish();
}

/** An incremental {@link checkCoordinates}: see {@link coordinateCheck}. */
export interface CoordinateCheck {
  /** Scans `features`, whose first is feature `firstIndex` of the layer; call in layer order. Never throws. */
  add(features: readonly Feature<Geometry | null>[], firstIndex: number): void;
  /** The verdict on everything added: the same warnings and errors as {@link checkCoordinates} on the whole layer. */
  finish(): string[];
  /** True once a position out of range has been seen: {@link CoordinateCheck.finish} will throw. */
  readonly failing: boolean;
}

/**
 * {@link checkCoordinates} over a layer given a chunk at a time, so that a large layer never has to be held
 * reprojected all at once. The layer-wide judgements (the first bad position, the largest absolute values
 * that tell a swap, the share of features inside the expected region) are accumulated across chunks, and
 * nothing is decided before {@link CoordinateCheck.finish}.
 *
 * @param options - optional expected region and layer name.
 * @example
 * const check = coordinateCheck({ layerName: 'leases' });
 * check.add(features.slice(0, 2000), 0);
 * check.add(features.slice(2000), 2000);
 * check.finish() // [] or warnings; throws coordinates_out_of_range / coordinates_swapped
 */
export function coordinateCheck(options: CheckCoordinatesOptions = {}): CoordinateCheck {
  const inLayer = options.layerName ? ` of layer “${options.layerName}”` : '';
  const box = options.expectedBbox;
  let firstBad: { index: number; p: Position } | undefined;
  let badFeatures = 0;
  let firstAbsMax = 0;
  let secondAbsMax = 0;
  let firstBeyond90: { index: number; p: Position } | undefined;
  let total = 0;
  let asIs = 0;
  let swapped = 0;
  let counted = 0;

  function add(features: readonly Feature<Geometry | null>[], firstIndex: number): void {
    total += features.length;
    features.forEach((f, k) => {
      const index = firstIndex + k;
      let bad = false;
      eachPosition(f.geometry, (p) => {
        const [x, y] = p;
        const ax = Math.abs(x);
        const ay = Math.abs(y);
        if (!(ax <= 180 && ay <= 90)) {
          bad = true;
          if (!firstBad) firstBad = { index, p: [x, y] };
        }
        if (ax > firstAbsMax || Number.isNaN(x)) firstAbsMax = Number.isNaN(x) ? Infinity : ax;
        if (ay > secondAbsMax || Number.isNaN(y)) secondAbsMax = Number.isNaN(y) ? Infinity : ay;
        if (ay > 90 && !firstBeyond90) firstBeyond90 = { index, p: [x, y] };
      });
      if (bad) badFeatures += 1;
      if (box) {
        const first = firstPosition(f.geometry);
        if (first) {
          counted += 1;
          if (inside(box, first[0], first[1])) asIs += 1;
          if (inside(box, first[1], first[0])) swapped += 1;
        }
      }
    });
  }

  function finish(): string[] {
    if (firstBad) {
      // Swapped: every first value is a valid latitude, and the second values are valid longitudes that pass 90.
      if (firstAbsMax <= 90 && secondAbsMax <= 180 && firstBeyond90) {
        const { index, p } = firstBeyond90;
        throw new UploadError(
          'coordinates_swapped',
          `The coordinates look like latitude and longitude are swapped: feature ${index}${inLayer} has (${fmt(p[0])}, ${fmt(p[1])}), and a latitude cannot be ${fmt(p[1])}. ` +
            'Coordinates must be written longitude first, then latitude (x, y). Swap the columns or axes in your GIS, export again and upload.',
          { index, position: [p[0], p[1]] },
        );
      }
      const { index, p } = firstBad;
      const metres = Math.abs(p[0]) > 1000 || Math.abs(p[1]) > 1000;
      throw new UploadError(
        'coordinates_out_of_range',
        `Feature ${index}${inLayer} has the coordinate (${fmt(p[0])}, ${fmt(p[1])}), outside longitude −180…180 and latitude −90…90 (${formatCount(badFeatures)} feature${badFeatures > 1 ? 's' : ''} in all). ` +
          (metres
            ? 'The numbers look like metres of a projected coordinate system, so the file is probably projected and its .prj is missing or wrong (GeoJSON must be in WGS 84 degrees). '
            : '') +
          'Pick the right coordinate system by its EPSG code, or export the file again in WGS 84 (EPSG:4326), and upload again.',
        { index, position: [p[0], p[1]], features: badFeatures },
      );
    }

    const warnings: string[] = [];
    if (box && total > 0) {
      if (counted > 0 && asIs * 2 < counted && swapped * 2 >= counted) {
        warnings.push(
          `The coordinates${inLayer} may have latitude and longitude swapped: as written, ${formatCount(counted - asIs)} of ${formatCount(counted)} features lie outside the expected region, ` +
            'but with the two swapped they fall inside it. If the features appear in the wrong place on the map, swap the axes in your GIS (longitude first), export again and upload.',
        );
      } else if (counted > 0 && asIs === 0) {
        warnings.push(
          `None of the ${formatCount(counted)} features${inLayer} lie within the expected region (longitude ${fmt(box[0])} to ${fmt(box[2])}, latitude ${fmt(box[1])} to ${fmt(box[3])}). ` +
            'If they should, the coordinate system is probably wrong: check the .prj or the EPSG code you picked.',
        );
      }
    }
    return warnings;
  }

  return {
    add,
    finish,
    get failing() {
      return firstBad !== undefined;
    },
  };
}

/**
 * The bounding box of features' positions, [minLon, minLat, maxLon, maxLat]; null when there are none.
 * Works in any CRS (x, y); does not handle boxes crossing the antimeridian.
 *
 * @example
 * bboxOf([{ type: 'Feature', properties: {}, geometry: { type: 'LineString', coordinates: [[1, 2], [3, -4]] } }]) // [1, -4, 3, 2]
 */
export function bboxOf(features: readonly Feature<Geometry | null>[] | Feature<Geometry | null>): Bbox | null {
  const list = Array.isArray(features) ? features : [features as Feature<Geometry | null>];
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const f of list) {
    eachPosition(f.geometry, (p) => {
      if (p[0] < minX) minX = p[0];
      if (p[0] > maxX) maxX = p[0];
      if (p[1] < minY) minY = p[1];
      if (p[1] > maxY) maxY = p[1];
    });
  }
  return minX === Infinity ? null : [minX, minY, maxX, maxY];
}

/** @private Calls `fn` on every position of a geometry. */
function eachPosition(g: Geometry | null | undefined, fn: (p: Position) => void): void {
  if (!g) return;
  switch (g.type) {
    case 'Point':
      fn(g.coordinates);
      return;
    case 'MultiPoint':
    case 'LineString':
      for (const p of g.coordinates) fn(p);
      return;
    case 'MultiLineString':
    case 'Polygon':
      for (const r of g.coordinates) for (const p of r) fn(p);
      return;
    case 'MultiPolygon':
      for (const poly of g.coordinates) for (const r of poly) for (const p of r) fn(p);
      return;
    case 'GeometryCollection':
      for (const c of g.geometries) eachPosition(c, fn);
  }
}

/** @private */
function firstPosition(g: Geometry | null | undefined): Position | undefined {
  let first: Position | undefined;
  eachPosition(g, (p) => {
    if (!first) first = p;
  });
  return first;
}

/** @private */
function inside(b: Bbox, lon: number, lat: number): boolean {
  return lon >= b[0] && lon <= b[2] && lat >= b[1] && lat <= b[3];
}

/** @private Up to 6 decimals, no trailing zeros. */
function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  return String(Math.round(v * 1e6) / 1e6);
}
