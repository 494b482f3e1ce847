/**
 * @module shared/geometry/read-upload
 * The entry point of the upload pipeline: bytes of an uploaded file → layers of features in the file's
 * own CRS, checked against the rules of the upload kind, with warnings. The format is told from the
 * content (zip signature, or JSON text), not from the name. Nothing here reprojects: the caller follows
 * with `reprojectLayer` (reproject.ts) once each layer's CRS is known, then `checkCoordinates`.
 *
 * Pure and isomorphic: Uint8Array in, plain JSON out; no I/O, clock or randomness.
 */
import { ALLOWED_GEOMETRY_TYPES, checkGeometries } from './check-geometries';
import type { CrsInfo, ParsedLayer, ParsedUpload, UploadKind } from './parsed-upload';
import { readGeoJson } from './read-geojson';
import { readShapefileZip } from './read-shapefile-zip';
import { UploadError } from './upload-error';
import { formatBytes, resolveUploadLimits, type UploadLimits, UPLOAD_LIMIT_SETTINGS } from './upload-limits';

export type { CrsInfo, ParsedLayer, ParsedUpload, UploadKind } from './parsed-upload';
export { DEFAULT_UPLOAD_LIMITS, type UploadLimits } from './upload-limits';

/** Optional helpers for {@link readUpload}. */
export interface ReadUploadOptions {
  /**
   * Identifies the EPSG code of a .prj the reader could not (no AUTHORITY, uncommon name). The server
   * passes `(wkt) => identifyCrs(loadCrsCatalogue(), wkt)` from crs-catalogue.ts; the browser can omit it.
   */
  identifyEpsg?: (wkt: string) => number | undefined;
}

/**
 * Reads an uploaded lease, coast or closure-zone file.
 *
 * @param bytes - the file as uploaded.
 * @param fileName - the name it was uploaded under (used in messages and as the GeoJSON layer's name).
 * @param kind - 'lease' and 'zone' need Polygon/MultiPolygon; 'coast' takes lines or polygons.
 * @param limits - overrides of {@link DEFAULT_UPLOAD_LIMITS} (50 MB sent, 300 MB unpacked, 50 000 features, 5 000 000 vertices).
 * @param options - see {@link ReadUploadOptions}.
 * @returns the format, the layers (features in the SOURCE CRS, 2-D, rings closed) and warnings.
 * @throws UploadError — 400 empty or unreadable, 413 too big, 415 not a zip or JSON, 422 readable but
 *   unusable (see upload-error.ts for the codes).
 * @example
 * const parsed = await readUpload(bytes, 'fennick-leases.zip', 'lease');
 * parsed.layers[0].crs // { found: true, epsg: 32630, wkt: 'PROJCS[…]', name: 'WGS_1984_UTM_Zone_30N' }
 * parsed.layers[0].features[0].properties // { LEASE_ID: 'FB-014', HOLDER: 'Saltreed Oysters' }
 */
export async function readUpload(
  bytes: Uint8Array,
  fileName: string,
  kind: UploadKind,
  limits?: Partial<UploadLimits>,
  options?: ReadUploadOptions,
): Promise<ParsedUpload> {
  const lim = resolveUploadLimits(limits);
  if (!ALLOWED_GEOMETRY_TYPES[kind]) throw new RangeError(`Unknown upload kind ${String(kind)}: use 'lease', 'coast' or 'zone'`);
  if (bytes.length === 0) {
    throw new UploadError('empty_file', 'The file is empty (0 bytes). Check that the export finished, then upload the file again.');
  }
  if (bytes.length > lim.maxCompressedBytes) {
    throw new UploadError(
      'file_too_large',
      `The file is ${formatBytes(bytes.length)}; this server takes at most ${formatBytes(lim.maxCompressedBytes)} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxCompressedBytes}). ` +
        'Split the layer into parts, or simplify the boundaries, and upload again.',
      { bytes: bytes.length, limitBytes: lim.maxCompressedBytes },
    );
  }
  const format = detectFormat(bytes, fileName);
  const warnings: string[] = [];
  const raw: { name: string; crs: CrsInfo; fields: string[]; features: Parameters<typeof checkGeometries>[0]; encoding?: string }[] = [];
  if (format === 'zip') {
    const zip = readShapefileZip(bytes, lim);
    warnings.push(...zip.warnings);
    raw.push(...zip.layers);
  } else {
    if (bytes.length > lim.maxUncompressedBytes) {
      throw new UploadError(
        'uncompressed_too_large',
        `The file is ${formatBytes(bytes.length)}; this server reads at most ${formatBytes(lim.maxUncompressedBytes)} of GeoJSON per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxUncompressedBytes}). ` +
          'Split the file, or simplify the boundaries, and upload again.',
        { bytes: bytes.length, limitBytes: lim.maxUncompressedBytes },
      );
    }
    const json = readGeoJson(bytes, fileName, lim);
    warnings.push(...json.warnings);
    raw.push(json.layer);
    if (/\.zip$/i.test(fileName)) warnings.push(`${fileName} is named .zip but holds GeoJSON text; it was read as GeoJSON.`);
  }

  // An empty layer beside non-empty ones is dropped; an upload with no features at all is refused by checkGeometries.
  const nonEmpty = raw.filter((l) => l.features.length > 0);
  const used = nonEmpty.length > 0 ? nonEmpty : raw.slice(0, 1);
  for (const l of raw) {
    if (l.features.length === 0 && nonEmpty.length > 0) warnings.push(`Layer “${l.name}” holds no features and was left out.`);
  }
  const multiLayer = used.length > 1;
  const layers: ParsedLayer[] = [];
  let vertices = 0;
  for (const l of used) {
    const checked = checkGeometries(l.features, kind, { layerName: l.name, multiLayer, verticesBefore: vertices, limits: lim });
    vertices += checked.vertexCount;
    warnings.push(...checked.warnings);
    let crs = l.crs;
    if (crs.found && crs.epsg === undefined && crs.wkt && options?.identifyEpsg) {
      const epsg = options.identifyEpsg(crs.wkt);
      if (epsg !== undefined) crs = { ...crs, epsg };
    }
    layers.push({
      name: l.name,
      crs,
      fields: l.fields,
      features: checked.features,
      ...(l.encoding ? { encoding: l.encoding } : {}),
      vertexCount: checked.vertexCount,
    });
  }
  return { format: format === 'zip' ? 'shapefile' : 'geojson', layers, warnings };
}

/**
 * Tells the format from the first bytes: a zip (local file header "PK\x03\x04", APPNOTE.TXT §4.3.7) or
 * JSON (after an optional byte-order mark and whitespace, `{` or `[`). Anything else is refused with 415,
 * naming what the file looks like (an image, a PDF, KML/XML, a bare .shp…) and what to send instead.
 *
 * @param bytes - the file (non-empty).
 * @param fileName - for the message.
 * @returns 'zip' or 'json'.
 * @throws UploadError unsupported_format (415); empty_zip (422) for an empty zip archive.
 * @example
 * detectFormat(new TextEncoder().encode(' {"type":"FeatureCollection"}'), 'a.geojson') // 'json'
 */
export function detectFormat(bytes: Uint8Array, fileName: string): 'zip' | 'json' {
  const b = (i: number) => bytes[i] ?? -1;
  const starts = (...sig: number[]) => sig.every((v, i) => b(i) === v);
  if (starts(0x50, 0x4b, 0x03, 0x04)) return 'zip';
  if (starts(0x50, 0x4b, 0x05, 0x06)) {
    throw new UploadError(
      'empty_zip',
      'The zip file is empty: it holds no files. Zip the shapefile’s .shp, .shx, .dbf and .prj together and upload again.',
    );
  }
  let i = starts(0xef, 0xbb, 0xbf) ? 3 : 0;
  while (i < bytes.length && (bytes[i] === 0x20 || bytes[i] === 0x09 || bytes[i] === 0x0a || bytes[i] === 0x0d)) i++;
  if (bytes[i] === 0x7b || bytes[i] === 0x5b) return 'json';

  const accepted =
    'This server reads a zipped shapefile (a .zip holding the .shp, .shx, .dbf and .prj) or a GeoJSON file (.geojson or .json).';
  let what = 'a kind of file this server does not read';
  let fix = 'Export the layer as a zipped shapefile or as GeoJSON and upload that.';
  if (starts(0x00, 0x00, 0x27, 0x0a)) {
    what = 'a bare shapefile .shp';
    fix =
      'A .shp alone has no attributes or coordinate system: zip it together with its .shx, .dbf and .prj (same name) and upload the zip.';
  } else if (starts(0x89, 0x50, 0x4e, 0x47)) what = 'a PNG image';
  else if (starts(0xff, 0xd8, 0xff)) what = 'a JPEG image';
  else if (starts(0x47, 0x49, 0x46, 0x38)) what = 'a GIF image';
  else if (starts(0x25, 0x50, 0x44, 0x46)) what = 'a PDF document';
  else if (starts(0x1f, 0x8b)) {
    what = 'a gzip archive (.gz or .tar.gz)';
    fix = 'Pack the shapefile’s files in a .zip instead and upload that.';
  } else if (starts(0x52, 0x61, 0x72, 0x21)) {
    what = 'a RAR archive';
    fix = 'Pack the shapefile’s files in a .zip instead and upload that.';
  } else if (starts(0x37, 0x7a, 0xbc, 0xaf)) {
    what = 'a 7z archive';
    fix = 'Pack the shapefile’s files in a .zip instead and upload that.';
  } else if (starts(0x53, 0x51, 0x4c, 0x69, 0x74, 0x65)) what = 'a SQLite database (a GeoPackage?)';
  else if (starts(0xd0, 0xcf, 0x11, 0xe0) || starts(0x50, 0x4b, 0x07, 0x08)) what = 'an office document or a split archive';
  else if (bytes[i] === 0x3c) what = 'XML or HTML (KML, GPX and GML are not read)';
  else if (looksLikeText(bytes)) what = 'plain text that is not JSON (a CSV table?)';
  throw new UploadError('unsupported_format', `${fileName} is ${what}. ${accepted} ${fix}`, { fileName, detected: what });
}

/** @private True when the first 512 bytes are printable ASCII/UTF-8 text. */
function looksLikeText(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 512);
  for (let i = 0; i < n; i++) {
    const c = bytes[i];
    if (c < 0x09 || (c > 0x0d && c < 0x20) || c === 0x7f) return false;
  }
  return true;
}
