/**
 * @module shared/geometry/parsed-upload
 * The shapes {@link readUpload} returns. Features stay in the file's own (source) CRS until
 * `reprojectLayer` turns them into EPSG:4326; everything here is plain JSON (no Dates, no NaN), so a
 * parsed upload can be stored as jsonb while the user picks a CRS.
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
  /** Features in the SOURCE CRS, 2-D, rings closed, properties JSON-safe. */
  features: Feature<Geometry>[];
  /** Text encoding used for the .dbf (a WHATWG label such as 'utf-8' or 'windows-1252'); absent for GeoJSON. */
  encoding?: string;
  /** Number of positions in the layer (closing positions included). */
  vertexCount: number;
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
