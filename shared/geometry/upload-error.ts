/**
 * @module shared/geometry/upload-error
 * The one error type of the upload pipeline (read-upload, reproject, check-coordinates). The server's
 * error handler maps it to `{ error: { code, message, details? } }` with `status` as the HTTP status.
 * Every message says what is wrong AND how to fix it, in plain words a grower can act on.
 */

/** HTTP statuses an upload problem maps to: 400 unreadable, 413 too big, 415 not a format we read, 422 readable but unusable. */
export type UploadErrorStatus = 400 | 413 | 415 | 422;

/**
 * Machine-readable codes (snake_case, stable: the client and the tests match on them).
 *
 * | code | status | meaning |
 * |---|---|---|
 * | empty_file | 400 | zero bytes |
 * | invalid_json | 400 | JSON syntax error (details: position, line, column) |
 * | invalid_text_encoding | 400 | a GeoJSON file that is not UTF-8 |
 * | file_too_large | 413 | the upload is over maxCompressedBytes |
 * | uncompressed_too_large | 413 | the zip expands (declared or actual) past maxUncompressedBytes |
 * | unsupported_format | 415 | neither a zip nor JSON (PNG, PDF, KML, a bare .shp…) |
 * | corrupt_zip | 422 | damaged zip structure, bad CRC, entry larger than declared |
 * | encrypted_zip | 422 | password-protected entries |
 * | unsupported_zip_compression | 422 | an entry compressed with something other than store/deflate |
 * | empty_zip | 422 | a zip with no files |
 * | no_shapefile | 422 | a zip without any .shp |
 * | missing_dbf | 422 | a .shp without its .dbf |
 * | corrupt_shp | 422 | a .shp header or record that cannot be read |
 * | shp_length_mismatch | 422 | the .shp header declares more bytes than the file holds |
 * | unsupported_shape_type | 422 | a multipatch .shp |
 * | corrupt_dbf | 422 | a .dbf header or table that cannot be read, or truncated |
 * | record_count_mismatch | 422 | the .shp and .dbf hold different numbers of records |
 * | not_feature_collection | 422 | GeoJSON that is a Feature, a Geometry, an array… |
 * | invalid_geojson | 422 | a FeatureCollection whose members are malformed |
 * | no_features | 422 | zero features |
 * | null_geometry | 422 | features with a null or empty geometry |
 * | wrong_geometry_type | 422 | only geometry types the kind does not take (points for leases…) |
 * | mixed_geometry_types | 422 | allowed and not-allowed geometry types together |
 * | invalid_coordinates | 422 | a coordinate that is not a finite number |
 * | invalid_geometry | 422 | a ring with fewer than 4 positions, a line with fewer than 2 |
 * | too_many_features | 422 | over maxFeatures |
 * | too_many_vertices | 422 | over maxVertices |
 * | crs_required | 422 | reprojection asked for without a usable CRS |
 * | coordinates_out_of_range | 422 | after reprojection, |lon| > 180 or |lat| > 90 |
 * | coordinates_swapped | 422 | latitude and longitude look swapped |
 * | invalid_xml | 400 | a KML or GPX file that is not well-formed XML |
 * | no_kml_in_kmz | 422 | a KMZ without doc.kml or any .kml |
 * | tracks_need_confirmation | 422 | GPX tracks for a lease/zone, not yet confirmed as areas |
 * | invalid_geopackage | 422 | SQLite that is not a GeoPackage, a missing table or srs, an unreadable geometry |
 * | no_geometry_columns | 422 | a GeoPackage of attribute tables only |
 * | layer_not_found | 422 | the picked layer is not in the file |
 */
export type UploadErrorCode =
  | 'empty_file'
  | 'invalid_json'
  | 'invalid_text_encoding'
  | 'file_too_large'
  | 'uncompressed_too_large'
  | 'unsupported_format'
  | 'corrupt_zip'
  | 'encrypted_zip'
  | 'unsupported_zip_compression'
  | 'empty_zip'
  | 'no_shapefile'
  | 'missing_dbf'
  | 'corrupt_shp'
  | 'shp_length_mismatch'
  | 'unsupported_shape_type'
  | 'corrupt_dbf'
  | 'record_count_mismatch'
  | 'not_feature_collection'
  | 'invalid_geojson'
  | 'no_features'
  | 'null_geometry'
  | 'wrong_geometry_type'
  | 'mixed_geometry_types'
  | 'invalid_coordinates'
  | 'invalid_geometry'
  | 'too_many_features'
  | 'too_many_vertices'
  | 'crs_required'
  | 'coordinates_out_of_range'
  | 'coordinates_swapped'
  | 'invalid_xml'
  | 'no_kml_in_kmz'
  | 'tracks_need_confirmation'
  | 'invalid_geopackage'
  | 'no_geometry_columns'
  | 'layer_not_found';

/** Status of each code, so a code is never paired with two statuses. */
const STATUS_OF: Record<UploadErrorCode, UploadErrorStatus> = {
  empty_file: 400,
  invalid_json: 400,
  invalid_text_encoding: 400,
  file_too_large: 413,
  uncompressed_too_large: 413,
  unsupported_format: 415,
  corrupt_zip: 422,
  encrypted_zip: 422,
  unsupported_zip_compression: 422,
  empty_zip: 422,
  no_shapefile: 422,
  missing_dbf: 422,
  corrupt_shp: 422,
  shp_length_mismatch: 422,
  unsupported_shape_type: 422,
  corrupt_dbf: 422,
  record_count_mismatch: 422,
  not_feature_collection: 422,
  invalid_geojson: 422,
  no_features: 422,
  null_geometry: 422,
  wrong_geometry_type: 422,
  mixed_geometry_types: 422,
  invalid_coordinates: 422,
  invalid_geometry: 422,
  too_many_features: 422,
  too_many_vertices: 422,
  crs_required: 422,
  coordinates_out_of_range: 422,
  coordinates_swapped: 422,
  invalid_xml: 400,
  no_kml_in_kmz: 422,
  tracks_need_confirmation: 422,
  invalid_geopackage: 422,
  no_geometry_columns: 422,
  layer_not_found: 422,
};

/**
 * A problem with an uploaded file that the user can fix. `status` is the HTTP status to answer with.
 *
 * @example
 * throw new UploadError('missing_dbf',
 *   'The zip holds roads.shp but no roads.dbf. A shapefile needs its .shp, .shx and .dbf together: zip all three (and the .prj) and upload again.',
 *   { layer: 'roads' });
 */
export class UploadError extends Error {
  /** Stable machine-readable code, e.g. 'missing_dbf'. */
  readonly code: UploadErrorCode;
  /** HTTP status: 400, 413, 415 or 422 (fixed per code). */
  readonly status: UploadErrorStatus;
  /** Structured facts behind the message (file names, feature indexes, counts), JSON-serialisable. */
  readonly details?: Record<string, unknown>;

  /**
   * @param code - the problem's code; the status follows from it.
   * @param message - what is wrong and how to fix it.
   * @param details - optional structured facts (JSON-serialisable).
   */
  constructor(code: UploadErrorCode, message: string, details?: Record<string, unknown>) {
    super(message);
    this.name = 'UploadError';
    this.code = code;
    this.status = STATUS_OF[code];
    if (details !== undefined) this.details = details;
  }
}

/**
 * True for an {@link UploadError} (also across bundles, by name and shape).
 *
 * @example
 * try { await readUpload(bytes, name, 'lease'); } catch (e) { if (isUploadError(e)) reply(e.status, e); else throw e; }
 */
export function isUploadError(value: unknown): value is UploadError {
  return (
    value instanceof UploadError ||
    (value instanceof Error && value.name === 'UploadError' && typeof (value as { code?: unknown }).code === 'string')
  );
}
