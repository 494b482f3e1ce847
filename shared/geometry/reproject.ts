/**
 * @module shared/geometry/reproject
 * Converts a layer's features from their source CRS to EPSG:4326 (WGS 84 longitude, latitude in degrees)
 * with proj4. Shapefile and GeoJSON coordinates are always stored easting/longitude first, so axis-order
 * declarations in a WKT are not applied. EPSG:4326 input comes back with exactly the same numbers.
 */
import type { Feature, Geometry, Position } from 'geojson';
import proj4 from 'proj4';
import { type CrsCatalogue, crsDefinition } from './crs-catalogue';
import type { ParsedLayer } from './parsed-upload';
import { UploadError } from './upload-error';

/** How the source CRS is given: a WKT (from the .prj), an EPSG code, or a proj4 string. */
export interface CrsSource {
  wkt?: string;
  epsg?: number;
  proj4?: string;
}

/** A converter from source coordinates to [lon, lat] in EPSG:4326. */
export type ToWgs84 = (xy: Position) => Position;

/**
 * Reprojects a layer's features to EPSG:4326 [lon, lat].
 *
 * The definition is chosen in this order: `source.proj4` (unless it needs a grid file, which proj4 cannot
 * load here), `source.wkt` (a .prj is used as written), then `source.epsg` — 4326 needs nothing; other
 * codes come from `catalogue` (epsg-index, see crs-catalogue.ts) or, without one, from the few codes proj4
 * knows itself (4269, 3857).
 *
 * @param layer - the layer (its features in the source CRS; only `features` and `name` are used).
 * @param source - the source CRS.
 * @param catalogue - optional EPSG catalogue, for `source.epsg` alone.
 * @returns new features (the input is not modified) with [lon, lat] positions in degrees.
 * @throws UploadError crs_required (no usable definition), coordinates_out_of_range (a position the CRS cannot convert).
 * @example
 * reprojectLayer(layer, { wkt: layer.crs.wkt })[0].geometry.coordinates[0][0] // [-2.9, 47.6]
 * reprojectLayer(layer, { epsg: 2193 }, loadCrsCatalogue())
 */
export function reprojectLayer(
  layer: Pick<ParsedLayer, 'features' | 'name'>,
  source: CrsSource,
  catalogue?: CrsCatalogue,
): Feature<Geometry>[] {
  return layerReprojector(layer.name, source, catalogue)(layer.features, 0);
}

/**
 * A reprojector for one layer's features taken a slice at a time, so that a large layer can be converted,
 * stored and dropped in bounded chunks instead of as a second whole copy. The CRS is resolved once.
 *
 * @param layerName - for messages.
 * @param source - the source CRS (see {@link reprojectLayer}).
 * @param catalogue - optional EPSG catalogue, for `source.epsg` alone.
 * @returns (features, firstIndex) → new features in EPSG:4326; `firstIndex` is the layer index of `features[0]`,
 *   so messages name the same feature as {@link reprojectLayer} on the whole layer.
 * @throws UploadError crs_required (when built), coordinates_out_of_range (when called).
 * @example
 * const convert = layerReprojector('leases', { wkt: layer.crs.wkt });
 * convert(layer.features.slice(2000, 4000), 2000)
 */
export function layerReprojector(
  layerName: string,
  source: CrsSource,
  catalogue?: CrsCatalogue,
): (features: readonly Feature<Geometry>[], firstIndex: number) => Feature<Geometry>[] {
  const convert = toWgs84(source, catalogue, layerName);
  return (features, firstIndex) =>
    features.map((f, k) => {
      try {
        return { ...f, geometry: mapGeometry(f.geometry, convert) };
      } catch (e) {
        if (e instanceof OutOfDomain) {
          const index = firstIndex + k;
          throw new UploadError(
            'coordinates_out_of_range',
            `Feature ${index} of layer “${layerName}” has the position (${e.xy.join(', ')}), which ${describeSource(source)} cannot convert to longitude and latitude: ` +
              'the coordinates do not belong to that coordinate system. Check the .prj (or the EPSG code you picked) and upload again.',
            { layer: layerName, index, position: e.xy },
          );
        }
        throw e;
      }
    });
}

/**
 * Builds the converter for a source CRS (see {@link reprojectLayer} for the order of preference).
 *
 * @param source - the source CRS.
 * @param catalogue - optional EPSG catalogue.
 * @param layerName - for the message when no definition can be found.
 * @returns a function [x, y] → [lon, lat]; the identity (same numbers) for EPSG:4326.
 * @throws UploadError crs_required.
 * @example
 * toWgs84({ epsg: 4326 })([-2.9, 47.6]) // [-2.9, 47.6]
 */
export function toWgs84(source: CrsSource, catalogue?: CrsCatalogue, layerName = 'the layer'): ToWgs84 {
  const candidates: string[] = [];
  if (source.proj4 && !needsGridFile(source.proj4)) candidates.push(source.proj4);
  if (source.wkt) candidates.push(source.wkt);
  if (source.epsg === 4326 && candidates.every(isWgs84LonLat)) return (xy) => [xy[0], xy[1]];
  if (source.epsg !== undefined) {
    const def = catalogue ? crsDefinition(catalogue, source.epsg) : null;
    if (def?.proj4 && !needsGridFile(def.proj4)) candidates.push(def.proj4);
    if (def?.wkt) candidates.push(def.wkt);
    if (!def && proj4.defs(`EPSG:${source.epsg}`)) candidates.push(`EPSG:${source.epsg}`);
  }
  if (source.proj4 && needsGridFile(source.proj4)) candidates.push(source.proj4);
  for (const definition of candidates) {
    let converter: { forward: (p: number[]) => number[] };
    try {
      converter = proj4(definition, 'EPSG:4326');
    } catch {
      continue;
    }
    if (isWgs84LonLat(definition)) return (xy) => [xy[0], xy[1]];
    return (xy) => {
      const out = converter.forward([xy[0], xy[1]]);
      return [out[0], out[1]];
    };
  }
  const what =
    source.epsg !== undefined
      ? `EPSG:${source.epsg} is not a coordinate system this server knows`
      : source.wkt
        ? 'its .prj does not describe a coordinate system this server can use'
        : 'its coordinate system is unknown';
  throw new UploadError(
    'crs_required',
    `The features of ${layerName} cannot be placed on the map: ${what}. Pick the coordinate system by its EPSG code and try again.`,
    {
      layer: layerName,
    },
  );
}

/** @private A position the CRS cannot convert. */
class OutOfDomain extends Error {
  readonly xy: number[];
  constructor(xy: number[]) {
    super('out of domain');
    this.xy = xy;
  }
}

/** @private */
function mapGeometry(g: Geometry, convert: ToWgs84): Geometry {
  const pos = (p: Position): Position => {
    let out: Position;
    try {
      out = convert(p);
    } catch {
      throw new OutOfDomain([p[0], p[1]]);
    }
    if (!Number.isFinite(out[0]) || !Number.isFinite(out[1])) throw new OutOfDomain([p[0], p[1]]);
    return out;
  };
  switch (g.type) {
    case 'Point':
      return { type: 'Point', coordinates: pos(g.coordinates) };
    case 'MultiPoint':
    case 'LineString':
      return { type: g.type, coordinates: g.coordinates.map(pos) } as Geometry;
    case 'MultiLineString':
    case 'Polygon':
      return { type: g.type, coordinates: g.coordinates.map((r) => r.map(pos)) } as Geometry;
    case 'MultiPolygon':
      return { type: 'MultiPolygon', coordinates: g.coordinates.map((p) => p.map((r) => r.map(pos))) };
    case 'GeometryCollection':
      return { type: 'GeometryCollection', geometries: g.geometries.map((c) => mapGeometry(c, convert)) };
  }
}

/** @private A proj4 string that needs a grid-shift file (not '@'-optional), which cannot be loaded here. */
function needsGridFile(def: string): boolean {
  return /\+nadgrids=(?!@)/.test(def);
}

/** @private True when the definition is WGS 84 longitude/latitude in degrees with the Greenwich meridian. */
function isWgs84LonLat(def: string): boolean {
  try {
    const p = proj4.Proj(def) as unknown as {
      projName?: string;
      datumCode?: string;
      from_greenwich?: number;
      a?: number;
      rf?: number;
      units?: string;
    };
    return (
      p.projName === 'longlat' &&
      (p.datumCode === 'WGS84' || p.datumCode === 'wgs84') &&
      !p.from_greenwich &&
      (p.units === undefined || /^deg/i.test(p.units))
    );
  } catch {
    return false;
  }
}

/** @private */
function describeSource(source: CrsSource): string {
  if (source.epsg !== undefined) return `EPSG:${source.epsg}`;
  return source.wkt ? 'the layer’s .prj' : 'the chosen coordinate system';
}
