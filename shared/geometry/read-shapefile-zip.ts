/**
 * @module shared/geometry/read-shapefile-zip
 * Reads every shapefile layer in a zip. A layer is a `.shp` with its siblings of the same basename in the
 * same folder (any folder depth; extensions in any case): `.dbf` required, `.shx` expected (the reader
 * does not need it, so a missing one is only reported), `.prj` and `.cpg` optional. `__MACOSX/` and other
 * system clutter are ignored. Only the files of the layers are inflated, under the upload limits.
 */
import type { Feature, Geometry } from 'geojson';
import type { CrsInfo } from './parsed-upload';
import { openDbf } from './read-dbf';
import { readPrj } from './read-prj';
import { checkShp, parseShpRange, type ShpCheck } from './read-shp';
import { inflateEntries, isIgnorableEntry, listZipEntries, type ZipEntryInfo } from './unzip-entries';
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
   * .dbf rows when asked for, so only one chunk's GeoJSON exists at a time. Can be iterated more than once.
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
 * Reads all shapefile layers of a zip.
 *
 * @param zip - the zip file's bytes (starts with PK\x03\x04).
 * @param limits - all four limits apply (sizes while unzipping, counts before geometries are built).
 * @param options - `lazy`: build no features now; each layer keeps its inflated .shp and .dbf and offers `chunks`.
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
  const bytes = inflateEntries(zip, wanted, limits);
  const text = (entry: ZipEntryInfo | undefined) => (entry ? new TextDecoder('utf-8').decode(bytes.get(entry.path)) : undefined);

  // Structure first, for every layer: counts are known before any geometry is built.
  const checked: { files: LayerFiles; name: string; shp: ShpCheck }[] = [];
  let featureTotal = 0;
  let vertexTotal = 0;
  for (let i = 0; i < layersFiles.length; i++) {
    const g = layersFiles[i];
    const shp = checkShp(bytes.get(g.entries.shp!.path)!, g.entries.shp!.path);
    warnings.push(...shp.warnings);
    featureTotal += shp.records;
    vertexTotal += shp.vertices;
    checked.push({ files: g, name: names[i], shp });
  }
  if (featureTotal > limits.maxFeatures) throw featureLimitError(featureTotal, limits);
  if (vertexTotal > limits.maxVertices) throw vertexLimitError(vertexTotal, limits, true);

  const layers: ShapefileLayer[] = [];
  for (const { files: g, name, shp } of checked) {
    const shpLabel = g.entries.shp!.path;
    if (!g.entries.shx) {
      warnings.push(
        `The zip holds ${shpLabel} without its ${baseName(g.stem)}.shx (the shape index). It was read without it; include the .shx next time, as other programs need it.`,
      );
    }
    let crs: CrsInfo;
    if (g.entries.prj) {
      const reading = readPrj(text(g.entries.prj)!, g.entries.prj.path);
      crs = reading.crs;
      warnings.push(...reading.warnings);
    } else {
      crs = { found: false };
      warnings.push(
        `${shpLabel} has no .prj file, so its coordinate system is unknown. Pick it by its EPSG code (your GIS shows it in the layer’s properties), ` +
          'or zip the .prj with the other files and upload again.',
      );
    }
    const dbf = openDbf(bytes.get(g.entries.dbf!.path)!, g.entries.dbf!.path, text(g.entries.cpg));
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
      for (let at = 0; at < shp.records; at += size) {
        const to = Math.min(shp.records, at + size);
        const rows = dbf.rows(at, to);
        const geometries = parseShpRange(shp, at, to, shpLabel);
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
    bytes.delete(g.entries.dbf!.path);
    bytes.delete(g.entries.shp!.path);
    layers.push({ ...layer, features });
  }
  return { layers, warnings };
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
