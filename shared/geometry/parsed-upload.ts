/**
 * @module shared/geometry/parsed-upload
 * The shapes {@link readUpload} returns. Features stay in the file's own (source) CRS until
 * `reprojectLayer` turns them into EPSG:4326. Features and properties are plain JSON (no Dates, no NaN): they
 * go to PostGIS as JSON text when staged.
 */
import type { Feature, Geometry } from 'geojson';

/** The uploaded file's format, told from its content. */
export type UploadFormat = 'shapefile' | 'geojson' | 'kml' | 'kmz' | 'gpx' | 'geopackage';

/** What an upload is for: lease boundaries, a coast (line or land polygons), or closure zones. */
export type UploadKind = 'lease' | 'coast' | 'zone';

/** The coordinate reference system of a layer, as far as the file tells it. */
export interface CrsInfo {
  /** True when the file defines a CRS we can use (a .prj that parses, GeoJSON's WGS 84). False → the user picks one. */
  found: boolean;
  /** EPSG code when identified (from an AUTHORITY clause, a well-known name, or the catalogue), e.g. 32630. */
  epsg?: number;
  /** The .prj text (WKT) as found in the file, when there was one (kept even when it does not parse). */
  wkt?: string;
  /** Human-readable CRS name, e.g. 'WGS_1984_UTM_Zone_30N' or 'WGS 84'. */
  name?: string;
}

/** One layer: a shapefile in the zip (by basename), or the GeoJSON file. */
export interface ParsedLayer {
  /** Layer name: the shapefile's basename (with its folder when two layers share a name) or the GeoJSON file's name. */
  name: string;
  /** The layer's CRS as read. */
  crs: CrsInfo;
  /** Attribute names in file order (.dbf columns; GeoJSON property keys in order of first appearance). */
  fields: string[];
  /** Features in the SOURCE CRS, 2-D, rings closed, properties JSON-safe. Empty when the layer is streamed (see `stream`). */
  features: Feature<Geometry>[];
  /**
   * A shapefile or GeoJSON layer read with `stream` (readUpload's option): its features are not held but built again,
   * checked and normalised, one chunk at a time. Not JSON.
   */
  stream?: StreamedFeatures;
  /** Text encoding used for the .dbf (a WHATWG label such as 'utf-8' or 'windows-1252'); absent for GeoJSON. */
  encoding?: string;
  /** Number of positions in the layer (closing positions included). */
  vertexCount: number;
}

/** The features of a streamed layer: their count and types, and the features themselves chunk by chunk. */
export interface StreamedFeatures {
  featureCount: number;
  /** GeoJSON geometry types, sorted. */
  geometryTypes: string[];
  /** The features (as in `features`) in consecutive chunks of at most `size`; can be iterated more than once. */
  chunks: (size: number) => Generator<Feature<Geometry>[]>;
}

/**
 * Number of features of a layer, streamed or not.
 *
 * @example
 * layerFeatureCount({ ...layer, features: [], stream: { featureCount: 3, … } }) // 3
 */
export function layerFeatureCount(layer: Pick<ParsedLayer, 'features' | 'stream'>): number {
  return layer.stream ? layer.stream.featureCount : layer.features.length;
}

/**
 * Sorted geometry types of a layer, streamed or not.
 *
 * @example
 * layerGeometryTypes({ features: [polygonFeature] }) // ['Polygon']
 */
export function layerGeometryTypes(layer: Pick<ParsedLayer, 'features' | 'stream'>): string[] {
  if (layer.stream) return layer.stream.geometryTypes;
  return [...new Set(layer.features.map((f) => f.geometry?.type ?? 'null'))].sort();
}

/**
 * A layer's features in consecutive chunks of at most `size` (slices of `features`, or the stream's chunks).
 *
 * @example
 * for (const chunk of layerChunks(layer, 2000)) stageChunk(chunk)
 */
export function* layerChunks(layer: Pick<ParsedLayer, 'features' | 'stream'>, size: number): Generator<Feature<Geometry>[]> {
  if (layer.stream) {
    yield* layer.stream.chunks(size);
    return;
  }
  for (let at = 0; at < layer.features.length; at += size) yield layer.features.slice(at, at + size);
}

/** The result of reading one uploaded file. */
export interface ParsedUpload {
  format: UploadFormat;
  /** One or more layers; a GeoJSON file is always one layer. */
  layers: ParsedLayer[];
  /** Things the user should know that did not stop the upload (assumed encodings, dropped heights…), one sentence each. */
  warnings: string[];
  /** Every layer the file holds (shapefiles in a zip, KML folders, GPX tracks and waypoints, GeoPackage tables), when it holds more than one. */
  layerSummaries?: LayerSummary[];
  /** The layer the user picked, when one was. */
  selectedLayer?: string;
}

/** A layer of a file with several, as listed in the preview for the user to pick one. */
export interface LayerSummary {
  name: string;
  featureCount: number;
  /** GeoJSON geometry types in the layer ('null' for features without geometry). */
  geometryTypes: string[];
}
