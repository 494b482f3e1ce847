/**
 * @module shared/geometry/read-upload
 * The entry point of the upload pipeline: bytes of an uploaded file → layers of features in the file's
 * own CRS, checked against the rules of the upload kind, with warnings. The format is told from the
 * content (zip signature, or JSON text), not from the name. Nothing here reprojects: the caller follows
 * with `reprojectLayer` (reproject.ts) once each layer's CRS is known, then `checkCoordinates`.
 *
 * Pure and isomorphic: Uint8Array in, plain JSON out; no I/O, clock or randomness.
 */
import type { Feature, Geometry } from 'geojson';
import { ALLOWED_GEOMETRY_TYPES, checkGeometries, geometryChecker, type KeptGeometry } from './check-geometries';
import type { CrsInfo, LayerSummary, ParsedLayer, ParsedUpload, UploadFormat, UploadKind } from './parsed-upload';
import { type OpenSqlite, readGeoPackage } from './read-geopackage';
import { readGeoJson } from './read-geojson';
import { readKmlOrGpx } from './read-kml-gpx';
import { readShapefileZip } from './read-shapefile-zip';
import { listZipEntries } from './unzip-entries';
import { isUploadError, UploadError } from './upload-error';
import { formatBytes, formatCount, resolveUploadLimits, type UploadLimits, UPLOAD_LIMIT_SETTINGS } from './upload-limits';

export type { CrsInfo, LayerSummary, ParsedLayer, ParsedUpload, StreamedFeatures, UploadFormat, UploadKind } from './parsed-upload';
export { layerChunks, layerFeatureCount, layerGeometryTypes } from './parsed-upload';
export type { OpenSqlite, SqliteDatabase } from './read-geopackage';
export { DEFAULT_UPLOAD_LIMITS, type UploadLimits } from './upload-limits';

/** Optional helpers for {@link readUpload}. */
export interface ReadUploadOptions {
  /**
   * Identifies the EPSG code of a .prj the reader could not (no AUTHORITY, uncommon name). The server
   * passes `(wkt) => identifyCrs(loadCrsCatalogue(), wkt)` from crs-catalogue.ts; the browser can omit it.
   */
  identifyEpsg?: (wkt: string) => number | undefined;
  /** Opens a SQLite database, for GeoPackage uploads (the server passes sql.js). Without it a GeoPackage is refused. */
  openSqlite?: OpenSqlite;
  /** Read only this layer (shapefile basename, KML folder path, GeoPackage table); absent = every usable layer. */
  layer?: string;
  /** GPX: the user confirmed that each track or route outlines an area (lease and zone uploads). */
  tracksAsPolygons?: boolean;
  /**
   * Shapefile and GeoJSON layers come back streamed (`features` empty, `stream` set): checked here chunk by chunk, then
   * built again chunk by chunk by whoever stages them, so all of a layer's features never exist at once. The verdicts
   * and messages are those of the whole read. Other formats are read whole either way.
   */
  stream?: boolean;
}

/** Features built at a time when a streamed layer is checked. */
const STREAM_CHUNK = 2_000;

/** @private A layer as a reader returned it: whole, or (a streamed shapefile or GeoJSON file) as chunks. */
interface RawLayer {
  name: string;
  crs: CrsInfo;
  fields: string[];
  features: Feature<Geometry | null>[];
  encoding?: string;
  count?: number;
  chunks?: (size: number) => Generator<Feature<Geometry | null>[]>;
}

/** @private */
function rawCount(l: RawLayer): number {
  return l.chunks ? (l.count ?? 0) : l.features.length;
}

/** @private Geometry types of a layer as read ('null' for features without geometry), sorted. */
function rawGeometryTypes(l: RawLayer): string[] {
  const types = new Set<string>();
  const add = (features: Feature<Geometry | null>[]) => {
    for (const f of features) types.add(f.geometry?.type ?? 'null');
  };
  if (l.chunks) for (const chunk of l.chunks(STREAM_CHUNK)) add(chunk);
  else add(l.features);
  return [...types].sort();
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
  const detected = detectFormat(bytes, fileName);
  const warnings: string[] = [];
  const raw: RawLayer[] = [];
  let format: UploadFormat;
  if (detected === 'zip' && isKmz(bytes, fileName)) {
    const xml = readKmlOrGpx(bytes, fileName, kind, lim, true, options);
    format = xml.format;
    warnings.push(...xml.warnings);
    raw.push(...xml.layers);
  } else if (detected === 'zip') {
    format = 'shapefile';
    const zip = readShapefileZip(bytes, lim, { lazy: options?.stream === true });
    warnings.push(...zip.warnings);
    raw.push(...zip.layers);
  } else if (detected === 'sqlite') {
    format = 'geopackage';
    if (!options?.openSqlite) {
      throw new UploadError('unsupported_format', `${fileName} is a GeoPackage, which this reader cannot open here. Upload it to the server, or export the layer as a zipped shapefile or GeoJSON.`, {
        fileName,
        detected: 'GeoPackage',
      });
    }
    const gpkg = await readGeoPackage(bytes, fileName, options.openSqlite, lim);
    warnings.push(...gpkg.warnings);
    raw.push(...gpkg.layers);
  } else {
    if (bytes.length > lim.maxUncompressedBytes) {
      throw new UploadError(
        'uncompressed_too_large',
        `The file is ${formatBytes(bytes.length)}; this server reads at most ${formatBytes(lim.maxUncompressedBytes)} of ${detected === 'xml' ? 'KML or GPX' : 'GeoJSON'} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxUncompressedBytes}). ` +
          'Split the file, or simplify the boundaries, and upload again.',
        { bytes: bytes.length, limitBytes: lim.maxUncompressedBytes },
      );
    }
    if (detected === 'xml') {
      const xml = readKmlOrGpx(bytes, fileName, kind, lim, false, options);
      format = xml.format;
      warnings.push(...xml.warnings);
      raw.push(...xml.layers);
    } else {
      format = 'geojson';
      const json = readGeoJson(bytes, fileName, lim, { lazy: options?.stream === true });
      warnings.push(...json.warnings);
      raw.push(json.layer);
      if (/\.zip$/i.test(fileName)) warnings.push(`${fileName} is named .zip but holds GeoJSON text; it was read as GeoJSON.`);
    }
  }

  // Shapefile and GeoJSON readers stop at the limit themselves; KML and GPX layers are counted here.
  const total = raw.reduce((n, l) => n + rawCount(l), 0);
  if (total > lim.maxFeatures) {
    throw new UploadError(
      'too_many_features',
      `The file has ${formatCount(total)} features; this server takes at most ${formatCount(lim.maxFeatures)} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxFeatures}). Split the file and upload the parts.`,
      { features: total, limit: lim.maxFeatures },
    );
  }
  // Only a file of several layers lists them (a streamed layer's types take a pass over its chunks).
  const layerSummaries: LayerSummary[] =
    raw.length > 1 ? raw.map((l) => ({ name: l.name, featureCount: rawCount(l), geometryTypes: rawGeometryTypes(l) })) : [];
  let candidates = raw;
  if (options?.layer !== undefined) {
    const picked = raw.find((l) => l.name === options.layer);
    if (!picked) {
      throw new UploadError(
        'layer_not_found',
        `${fileName} has no layer “${options.layer}”. Its layers are: ${raw.map((l) => `“${l.name}”`).join(', ')}. Pick one of them.`,
        { layer: options.layer, layers: raw.map((l) => l.name) },
      );
    }
    candidates = [picked];
  }
  // An empty layer beside non-empty ones is dropped; an upload with no features at all is refused by checkGeometries.
  const nonEmpty = candidates.filter((l) => rawCount(l) > 0);
  const used = nonEmpty.length > 0 ? nonEmpty : candidates.slice(0, 1);
  for (const l of candidates) {
    if (rawCount(l) === 0 && nonEmpty.length > 0) warnings.push(`Layer “${l.name}” holds no features and was left out.`);
  }
  const multiLayer = used.length > 1;
  const layers: ParsedLayer[] = [];
  let vertices = 0;
  let firstRefusal: unknown;
  for (const l of used) {
    let checked: { features: Feature<KeptGeometry>[]; vertexCount: number; warnings: string[]; geometryTypes?: string[] };
    try {
      const context = { layerName: l.name, multiLayer, verticesBefore: vertices, limits: lim };
      if (l.chunks) {
        // Streamed: each chunk is built, checked and dropped; the verdict on the whole layer comes after the last one.
        const checker = geometryChecker(kind, context);
        let at = 0;
        for (const chunk of l.chunks(STREAM_CHUNK)) {
          checker.add(chunk, at);
          at += chunk.length;
        }
        checked = { features: [], ...checker.finish() };
      } else {
        checked = checkGeometries(l.features, kind, context);
      }
    } catch (err) {
      // In a file of several layers (KML folders, GeoPackage tables), a layer of pins beside a layer of polygons is
      // left out with a warning rather than refusing the file; the user can still pick the layer in the preview.
      if (multiLayer && isUploadError(err) && err.code === 'wrong_geometry_type') {
        firstRefusal ??= err;
        warnings.push(`Layer “${l.name}” holds ${layerSummaries.find((s) => s.name === l.name)?.geometryTypes.join(', ')} features, which ${kind === 'coast' ? 'a coast' : kind === 'zone' ? 'a closure zone' : 'a lease'} cannot use; it was left out.`);
        continue;
      }
      throw withFormatHint(err, format, kind);
    }
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
      ...(l.chunks
        ? { stream: { featureCount: rawCount(l), geometryTypes: checked.geometryTypes ?? [], chunks: normalisedChunks(l.chunks, kind, l.name, multiLayer) } }
        : {}),
    });
  }
  if (layers.length === 0) throw withFormatHint(firstRefusal, format, kind);
  return { format, layers, warnings, ...(raw.length > 1 ? { layerSummaries } : {}), ...(options?.layer !== undefined ? { selectedLayer: options.layer } : {}) };
}

/**
 * @private The chunks of a streamed layer that passed its checks, normalised as checkGeometries does (2-D, rings
 * closed). A chunk that no longer normalises whole (the bytes cannot change between passes) throws the refusal.
 */
function normalisedChunks(
  source: (size: number) => Generator<Feature<Geometry | null>[]>,
  kind: UploadKind,
  layerName: string,
  multiLayer: boolean,
): (size: number) => Generator<Feature<Geometry>[]> {
  return function* (size: number) {
    const again = geometryChecker(kind, { layerName, multiLayer, verticesBefore: 0, limits: { maxVertices: Number.POSITIVE_INFINITY } });
    let at = 0;
    for (const chunk of source(size)) {
      const out = again.add(chunk, at);
      if (out.length !== chunk.length) {
        again.finish();
        throw new Error(`Layer ${layerName} changed between its check and its staging`);
      }
      at += chunk.length;
      yield out;
    }
  };
}

/** Adds what to do in a globe viewer or GPS app to a geometry-type refusal of a KML/KMZ/GPX upload. */
function withFormatHint(err: unknown, format: UploadFormat, kind: UploadKind): unknown {
  if (!isUploadError(err) || err.code !== 'wrong_geometry_type' || kind === 'coast') return err;
  const hint =
    format === 'kml' || format === 'kmz'
      ? ' In a globe viewer, draw each lease with the polygon tool (a pin is a point, a path is a line), then save the places as KML or KMZ again.'
      : format === 'gpx'
        ? ' GPX waypoints are points: walk or draw the outline as a track or route instead, and confirm that the tracks are areas.'
        : '';
  return hint ? new UploadError(err.code, err.message + hint, err.details) : err;
}

/**
 * A zip is a KMZ when it is named so, or when it holds a .kml and no .shp.
 *
 * @example
 * isKmz(zipBytes, 'leases.kmz') // true
 */
export function isKmz(bytes: Uint8Array, fileName: string): boolean {
  if (/\.kmz$/i.test(fileName)) return true;
  let paths: string[];
  try {
    paths = listZipEntries(bytes).map((e) => e.path.toLowerCase());
  } catch {
    return false; // the shapefile reader reports the damage
  }
  return paths.some((p) => p.endsWith('.kml')) && !paths.some((p) => p.endsWith('.shp'));
}

/**
 * Tells the format from the first bytes: a zip (local file header "PK\x03\x04", APPNOTE.TXT §4.3.7; a
 * shapefile zip or a KMZ), JSON (after an optional byte-order mark and whitespace, `{` or `[`), XML (`<`:
 * KML or GPX) or SQLite ("SQLite format 3", a GeoPackage). Anything else is refused with 415, naming what
 * the file looks like (an image, a PDF, a bare .shp…) and what to send instead.
 *
 * @param bytes - the file (non-empty).
 * @param fileName - for the message.
 * @returns 'zip', 'json', 'xml' or 'sqlite'.
 * @throws UploadError unsupported_format (415); empty_zip (422) for an empty zip archive.
 * @example
 * detectFormat(new TextEncoder().encode(' {"type":"FeatureCollection"}'), 'a.geojson') // 'json'
 */
export function detectFormat(bytes: Uint8Array, fileName: string): 'zip' | 'json' | 'xml' | 'sqlite' {
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
  // "SQLite format 3\0" (sqlite.org/fileformat.html §1.3): a GeoPackage is a SQLite database.
  if (starts(0x53, 0x51, 0x4c, 0x69, 0x74, 0x65, 0x20, 0x66, 0x6f, 0x72, 0x6d, 0x61, 0x74, 0x20, 0x33, 0x00)) return 'sqlite';
  if (bytes[i] === 0x3c) return 'xml';

  const accepted =
    'This server reads a zipped shapefile (a .zip holding the .shp, .shx, .dbf and .prj), GeoJSON (.geojson or .json), KML or KMZ, GPX, or a GeoPackage (.gpkg).';
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
  } else if (starts(0x53, 0x51, 0x4c, 0x69, 0x74, 0x65)) what = 'a damaged SQLite header (not a readable GeoPackage)';
  else if (starts(0xd0, 0xcf, 0x11, 0xe0) || starts(0x50, 0x4b, 0x07, 0x08)) what = 'an office document or a split archive';
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
