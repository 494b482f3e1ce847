/**
 * @module shared/geometry/read-shapefile-zip
 * Reads every shapefile layer in a zip. A layer is a `.shp` with its siblings of the same basename in the
 * same folder (any folder depth; extensions in any case): `.dbf` required, `.shx` expected (the reader
 * does not need it, so a missing one is only reported), `.prj` and `.cpg` optional. `__MACOSX/` and other
 * system clutter are ignored. Only the files of the layers are inflated, under the upload limits. Read `lazy`, no
 * inflated .shp or .dbf is kept: each is checked in one forward pass as it inflates, and inflated again, range by
 * range, whenever its features are asked for.
 */
import type { Feature, Geometry } from 'geojson';
import type { ByteSource } from './byte-source';
import type { CrsInfo } from './parsed-upload';
import { checkDbf, type DbfTable, openCheckedDbf, openDbf } from './read-dbf';
import { readPrj } from './read-prj';
import { checkShp, parseShpRange, type ShpCheck } from './read-shp';
import {
  checkDeclaredSizes,
  type EntryReader,
  inflateEntries,
  isIgnorableEntry,
  listZipEntries,
  openEntryReader,
  type ZipEntryInfo,
} from './unzip-entries';
import { UploadError } from './upload-error';
import { featureLimitError, formatCount, listSome, type UploadLimits, vertexLimitError } from './upload-limits';

/** One shapefile layer as read, before the geometry checks of the upload kind. */
export interface ShapefileLayer {
  name: string;
  crs: CrsInfo;
  fields: string[];
  /** Every feature; empty when read with `lazy` (then use `chunks`). */
  features: Feature<Geometry | null>[];
  encoding: string;
  /** ESRI shape type code of the .shp header. */
  shapeType: number;
  /** Number of features (records). */
  count: number;
  /**
   * With `lazy`: the features in consecutive chunks of at most `size`, each built from its .shp records and
   * .dbf rows when asked for, so only one chunk's GeoJSON exists at a time. Can be iterated more than once; each
   * iteration inflates the .shp and .dbf again, forward, holding only the current chunk's bytes.
   */
  chunks?: (size: number) => Generator<Feature<Geometry | null>[]>;
}

/** The result of {@link readShapefileZip}. */
export interface ShapefileZipReading {
  layers: ShapefileLayer[];
  warnings: string[];
}

/** @private The files of one layer, by lower-case extension. */
interface LayerFiles {
  stem: string;
  entries: Partial<Record<'shp' | 'shx' | 'dbf' | 'prj' | 'cpg', ZipEntryInfo>>;
}

const SIBLINGS = ['shp', 'shx', 'dbf', 'prj', 'cpg'] as const;

/**
 * @private A layer's files, opened whole or streamed: its checks (each throws the file's refusal), its small text
 * files, and where one pass over its records reads the .shp and .dbf bytes.
 */
interface OpenedLayer {
  checkShp: () => ShpCheck;
  openDbf: (cpg: string | undefined) => DbfTable;
  text: (entry: ZipEntryInfo | undefined) => string | undefined;
  /** Sources for one pass over the records; none when the checked bytes are kept (whole read). */
  sources: () => { shp?: ByteSource; dbf?: ByteSource };
  /** Lets the inflated .shp and .dbf go (whole read). */
  release: () => void;
}

/**
 * Reads all shapefile layers of a zip.
 *
 * @param zip - the zip file's bytes (starts with PK\x03\x04).
 * @param limits - all four limits apply (sizes while unzipping, counts before geometries are built).
 * @param options - `lazy`: build no features now and keep no inflated .shp or .dbf; each layer offers `chunks`.
 *   The refusals, their messages and their order are the whole read's.
 * @returns the layers, features in the source CRS (null geometries kept for the kind checks), and warnings.
 * @throws UploadError for a damaged zip, no .shp, a .shp without its .dbf, corrupt or truncated files,
 *   record counts that differ between .shp and .dbf, and the limits.
 * @example
 * const { layers } = readShapefileZip(zipBytes, DEFAULT_UPLOAD_LIMITS);
 * layers[0].name // 'leases'
 */
export function readShapefileZip(zip: Uint8Array, limits: UploadLimits, options?: { lazy?: boolean }): ShapefileZipReading {
  const all = listZipEntries(zip);
  const files = all.filter((e) => !isIgnorableEntry(e.path));
  const groups = new Map<string, LayerFiles>();
  for (const entry of files) {
    const slash = entry.path.lastIndexOf('/');
    const dot = entry.path.lastIndexOf('.');
    if (dot <= slash + 1) continue;
    const ext = entry.path.slice(dot + 1).toLowerCase();
    if (!(SIBLINGS as readonly string[]).includes(ext)) continue;
    const stem = entry.path.slice(0, dot);
    const key = stem.toLowerCase();
    const group = groups.get(key) ?? { stem, entries: {} };
    group.entries[ext as (typeof SIBLINGS)[number]] = entry;
    if (ext === 'shp') group.stem = stem;
    groups.set(key, group);
  }
  const layersFiles = [...groups.values()].filter((g) => g.entries.shp);
  if (layersFiles.length === 0) throw noShapefile(files);

  const missingDbf = layersFiles.filter((g) => !g.entries.dbf);
  if (missingDbf.length > 0) {
    const list = missingDbf.map((g) => `${g.entries.shp!.path} but no ${baseName(g.stem)}.dbf`);
    throw new UploadError(
      'missing_dbf',
      `The zip holds ${listSome(list, 5)}. A shapefile needs its .shp, .shx and .dbf together: zip all three (and the .prj) and upload again.`,
      { layers: missingDbf.map((g) => g.stem) },
    );
  }

  const warnings: string[] = [];
  const names = layerNames(layersFiles);
  const wanted = layersFiles.flatMap((g) =>
    SIBLINGS.filter((ext) => ext !== 'shx').flatMap((ext) => (g.entries[ext] ? [g.entries[ext]!] : [])),
  );
  const openedLayers = options?.lazy ? openStreamed(zip, layersFiles, wanted, limits) : openWhole(zip, layersFiles, wanted, limits);

  // Structure first, for every layer: counts are known before any geometry is built.
  const checked: { files: LayerFiles; name: string; shp: ShpCheck; opened: OpenedLayer }[] = [];
  let featureTotal = 0;
  let vertexTotal = 0;
  for (let i = 0; i < layersFiles.length; i++) {
    const shp = openedLayers[i].checkShp();
    warnings.push(...shp.warnings);
    featureTotal += shp.records;
    vertexTotal += shp.vertices;
    checked.push({ files: layersFiles[i], name: names[i], shp, opened: openedLayers[i] });
  }
  if (featureTotal > limits.maxFeatures) throw featureLimitError(featureTotal, limits);
  if (vertexTotal > limits.maxVertices) throw vertexLimitError(vertexTotal, limits, true);

  const layers: ShapefileLayer[] = [];
  for (const { files: g, name, shp, opened } of checked) {
    const shpLabel = g.entries.shp!.path;
    if (!g.entries.shx) {
      warnings.push(
        `The zip holds ${shpLabel} without its ${baseName(g.stem)}.shx (the shape index). It was read without it; include the .shx next time, as other programs need it.`,
      );
    }
    let crs: CrsInfo;
    if (g.entries.prj) {
      const reading = readPrj(opened.text(g.entries.prj)!, g.entries.prj.path);
      crs = reading.crs;
      warnings.push(...reading.warnings);
    } else {
      crs = { found: false };
      warnings.push(
        `${shpLabel} has no .prj file, so its coordinate system is unknown. Pick it by its EPSG code (your GIS shows it in the layer’s properties), ` +
          'or zip the .prj with the other files and upload again.',
      );
    }
    const dbf = opened.openDbf(opened.text(g.entries.cpg));
    warnings.push(...dbf.warnings);
    if (dbf.records !== shp.records) {
      throw new UploadError(
        'record_count_mismatch',
        `${shpLabel} holds ${formatCount(shp.records)} shapes but ${g.entries.dbf!.path} holds ${formatCount(dbf.records)} rows, so shapes and attributes cannot be paired. ` +
          'The files come from different exports, or one was cut short: export the layer again and zip its files together.',
        { layer: name, shapes: shp.records, rows: dbf.records },
      );
    }
    const chunks = function* (size: number): Generator<Feature<Geometry | null>[]> {
      const sources = opened.sources();
      for (let at = 0; at < shp.records; at += size) {
        const to = Math.min(shp.records, at + size);
        const rows = dbf.rows(at, to, sources.dbf);
        const geometries = parseShpRange(shp, at, to, shpLabel, sources.shp);
        yield geometries.map((geometry, k) => ({ type: 'Feature', properties: rows[k], geometry }));
      }
    };
    const layer = { name, crs, fields: dbf.fields, encoding: dbf.encoding, shapeType: shp.shapeType, count: shp.records };
    if (options?.lazy) {
      layers.push({ ...layer, features: [], chunks });
      continue;
    }
    // Whole: the inflated table can be tens of MB (writers pad text columns to their full width); let the files go once read.
    const features = [...chunks(Math.max(1, shp.records))].flat();
    opened.release();
    layers.push({ ...layer, features });
  }
  return { layers, warnings };
}

/** @private The whole read: every file of every layer inflated first (inflateEntries), then checked in place. */
function openWhole(zip: Uint8Array, layers: LayerFiles[], wanted: ZipEntryInfo[], limits: UploadLimits): OpenedLayer[] {
  const bytes = inflateEntries(zip, wanted, limits);
  const text = (entry: ZipEntryInfo | undefined) => (entry ? new TextDecoder('utf-8').decode(bytes.get(entry.path)) : undefined);
  return layers.map((g) => {
    const shpPath = g.entries.shp!.path;
    const dbfPath = g.entries.dbf!.path;
    return {
      checkShp: () => checkShp(bytes.get(shpPath)!, shpPath),
      openDbf: (cpg) => openDbf(bytes.get(dbfPath)!, dbfPath, cpg),
      text,
      sources: () => ({}),
      release: () => {
        bytes.delete(dbfPath);
        bytes.delete(shpPath);
      },
    };
  });
}

/**
 * @private The lazy read. Every file is inflated once, in the whole read's order, through a reader that checks its
 * size and CRC-32 at its end: the .shp and .dbf structure checks run on the bytes as they pass (their refusals are
 * held back, since the whole read refuses a damaged zip before any damaged .shp or .dbf), the .prj and .cpg are
 * kept as text. Only the checks' results are kept; each pass over the records opens new readers.
 */
function openStreamed(zip: Uint8Array, layers: LayerFiles[], wanted: ZipEntryInfo[], limits: UploadLimits): OpenedLayer[] {
  checkDeclaredSizes(wanted, limits);
  let inflated = 0;
  const before = new Map<ZipEntryInfo, number>();
  const texts = new Map<ZipEntryInfo, string>();
  const pass = <T>(entry: ZipEntryInfo | undefined, check: (reader: EntryReader) => T): (() => T) | undefined => {
    if (!entry) return undefined;
    const reader = openEntryReader(zip, entry, limits, { inflatedBefore: inflated, verify: true });
    let outcome: () => T;
    try {
      const value = check(reader);
      outcome = () => value;
    } catch (e) {
      if (reader.failed) throw e;
      outcome = () => {
        throw e;
      };
    }
    before.set(entry, inflated);
    inflated += reader.finish();
    return outcome;
  };
  const keepText = (reader: EntryReader) => new TextDecoder('utf-8').decode(reader.subarray(0, reader.length));
  return layers.map((g): OpenedLayer => {
    const shpEntry = g.entries.shp!;
    const dbfEntry = g.entries.dbf!;
    const shp = pass(shpEntry, (reader) => checkShp(reader, shpEntry.path))!;
    const dbf = pass(dbfEntry, (reader) => checkDbf(reader, dbfEntry.path))!;
    for (const entry of [g.entries.prj, g.entries.cpg]) {
      const text = pass(entry, keepText);
      if (entry && text) texts.set(entry, text());
    }
    const reopen = (entry: ZipEntryInfo) => openEntryReader(zip, entry, limits, { inflatedBefore: before.get(entry) });
    return {
      checkShp: shp,
      openDbf: (cpg) => openCheckedDbf(dbf(), dbfEntry.path, cpg),
      text: (entry) => (entry ? texts.get(entry) : undefined),
      sources: () => ({ shp: reopen(shpEntry), dbf: reopen(dbfEntry) }),
      release: () => {},
    };
  });
}

/** @private */
function baseName(path: string): string {
  return path.slice(path.lastIndexOf('/') + 1);
}

/** @private Layer names: the basename, or the whole path inside the zip when two layers share a basename. */
function layerNames(groups: LayerFiles[]): string[] {
  const counts = new Map<string, number>();
  for (const g of groups) counts.set(baseName(g.stem).toLowerCase(), (counts.get(baseName(g.stem).toLowerCase()) ?? 0) + 1);
  return groups.map((g) => ((counts.get(baseName(g.stem).toLowerCase()) ?? 0) > 1 ? g.stem : baseName(g.stem)));
}

/** @private The 422 for a zip without any .shp, naming what it does hold and what to do instead. */
function noShapefile(files: ZipEntryInfo[]): UploadError {
  const paths = files.map((f) => f.path);
  if (paths.length === 0) {
    return new UploadError(
      'no_shapefile',
      'The zip holds no .shp file, only folders or system files. Zip the shapefile’s .shp, .shx, .dbf and .prj together and upload again.',
      { contents: [] },
    );
  }
  const lower = paths.map((p) => p.toLowerCase());
  let hint = 'Zip the shapefile’s .shp, .shx, .dbf and .prj together and upload again.';
  const json = paths.find((p) => /\.(geo)?json$/i.test(p));
  if (json) hint = `To upload ${baseName(json)}, send it on its own (not zipped): GeoJSON is read directly.`;
  else if (lower.some((p) => /\.gdb\//.test(p)))
    hint = 'It looks like a file geodatabase: export the layer as a shapefile (or GeoJSON) and upload that.';
  else if (lower.some((p) => /\.(kml|kmz|gpkg|gml|gpx|tab|mif|csv|xlsx?)$/.test(p))) {
    hint =
      'This server reads shapefiles and GeoJSON only: export the layer to one of those (a zipped shapefile, or a .geojson file) and upload that.';
  }
  return new UploadError('no_shapefile', `The zip holds no .shp file; it contains ${listSome(paths, 8)}. ${hint}`, {
    contents: paths.slice(0, 50),
  });
}
