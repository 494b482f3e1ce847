/**
 * @module shared/geometry/read-geopackage
 * GeoPackage (OGC 12-128r18, version 1.0–1.4) → upload layers. Every feature table registered in
 * `gpkg_geometry_columns` is a layer; its CRS comes from `gpkg_spatial_ref_sys` (organization EPSG and
 * its code, else the WKT `definition`; srs_id −1 and 0 are the standard's "undefined" systems, so the user
 * picks one). Geometries are GeoPackage blobs (wkb.ts). The SQLite engine is passed in (`openSqlite`):
 * the server uses sql.js (SQLite compiled to WebAssembly, from the npm package), so this module stays free
 * of I/O and runs wherever an engine is given.
 */
import type { Feature, Geometry } from 'geojson';
import type { CrsInfo } from './parsed-upload';
import { readPrj } from './read-prj';
import { UploadError } from './upload-error';
import { formatCount, type UploadLimits, UPLOAD_LIMIT_SETTINGS } from './upload-limits';
import { readGeoPackageGeometry, WkbError } from './wkb';

/** The part of a SQLite engine this reader uses (sql.js's Database has it). */
export interface SqliteDatabase {
  exec(sql: string, params?: (string | number | null)[]): { columns: string[]; values: unknown[][] }[];
  close(): void;
}

/** Opens SQLite database bytes (read-only use). */
export type OpenSqlite = (bytes: Uint8Array) => Promise<SqliteDatabase>;

/** One GeoPackage feature table read as a layer. */
export interface GeoPackageLayer {
  name: string;
  crs: CrsInfo;
  fields: string[];
  features: Feature<Geometry | null>[];
}

/** What {@link readGeoPackage} returns. */
export interface GeoPackageReading {
  layers: GeoPackageLayer[];
  warnings: string[];
}

const quoteId = (name: string) => `"${name.replace(/"/g, '""')}"`;

/**
 * Reads every feature table of a GeoPackage.
 *
 * @param bytes - the .gpkg file.
 * @param fileName - for messages.
 * @param openSqlite - the SQLite engine.
 * @param limits - maxFeatures is checked from the row counts before any geometry is read.
 * @returns the layers in gpkg_contents order.
 * @throws UploadError invalid_geopackage (not SQLite, or SQLite without the GeoPackage tables, or a broken blob),
 *   no_geometry_columns (attribute tables only), too_many_features.
 * @example
 * const { layers } = await readGeoPackage(bytes, 'registry.gpkg', openSqlite, DEFAULT_UPLOAD_LIMITS);
 * layers[0].crs // { found: true, epsg: 2154, name: 'RGF93 v1 / Lambert-93' }
 */
export async function readGeoPackage(
  bytes: Uint8Array,
  fileName: string,
  openSqlite: OpenSqlite,
  limits: Pick<UploadLimits, 'maxFeatures'>,
): Promise<GeoPackageReading> {
  let db: SqliteDatabase;
  try {
    db = await openSqlite(bytes);
    db.exec('SELECT count(*) FROM sqlite_master');
  } catch (err) {
    throw new UploadError(
      'invalid_geopackage',
      `${fileName} starts like a SQLite database (a GeoPackage) but cannot be opened (${err instanceof Error ? err.message : String(err)}). It may be cut short: export it again and upload the whole file.`,
    );
  }
  try {
    const rows = (sql: string, params?: (string | number | null)[]) => {
      const r = db.exec(sql, params)[0];
      return r ? r.values.map((v) => Object.fromEntries(r.columns.map((c, i) => [c, v[i]]))) : [];
    };
    const tables = new Set(rows("SELECT name FROM sqlite_master WHERE type IN ('table','view')").map((r) => String(r.name)));
    for (const required of ['gpkg_contents', 'gpkg_spatial_ref_sys']) {
      if (!tables.has(required)) {
        throw new UploadError(
          'invalid_geopackage',
          `${fileName} is a SQLite database but not a GeoPackage: it has no ${required} table. Export the layer as a GeoPackage (.gpkg) from your GIS, or as a zipped shapefile, and upload that.`,
        );
      }
    }
    if (!tables.has('gpkg_geometry_columns')) {
      throw new UploadError(
        'no_geometry_columns',
        `${fileName} is a GeoPackage without geometry columns (no gpkg_geometry_columns table): it holds tables of attributes only. Export the layer with its geometry and upload again.`,
      );
    }
    const columns = rows(
      `SELECT g.table_name, g.column_name, g.srs_id FROM gpkg_geometry_columns g
         LEFT JOIN gpkg_contents c ON c.table_name = g.table_name ORDER BY c.rowid, g.table_name`,
    );
    if (columns.length === 0) {
      const attributes = rows('SELECT table_name FROM gpkg_contents').map((r) => String(r.table_name));
      throw new UploadError(
        'no_geometry_columns',
        `${fileName} is a GeoPackage without geometry columns: ${attributes.length ? `its table${attributes.length > 1 ? 's' : ''} ${attributes.slice(0, 5).join(', ')} hold${attributes.length > 1 ? '' : 's'} attributes only` : 'it holds no tables'}. Export the layer with its geometry and upload again.`,
        { tables: attributes },
      );
    }
    let total = 0;
    for (const c of columns) {
      if (!tables.has(String(c.table_name))) {
        throw new UploadError(
          'invalid_geopackage',
          `${fileName} registers the layer “${c.table_name}” in gpkg_geometry_columns, but the table does not exist. Export the GeoPackage again from your GIS and upload that.`,
        );
      }
      total += Number(rows(`SELECT count(*) AS n FROM ${quoteId(String(c.table_name))}`)[0].n);
    }
    if (total > limits.maxFeatures) {
      throw new UploadError(
        'too_many_features',
        `The file has ${formatCount(total)} features; this server takes at most ${formatCount(limits.maxFeatures)} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxFeatures}). Split the file and upload the parts.`,
        { features: total, limit: limits.maxFeatures },
      );
    }
    const layers: GeoPackageLayer[] = [];
    const warnings: string[] = [];
    for (const c of columns) {
      const table = String(c.table_name);
      const geomColumn = String(c.column_name);
      const srsId = Number(c.srs_id);
      const srs = rows('SELECT srs_name, organization, organization_coordsys_id, definition FROM gpkg_spatial_ref_sys WHERE srs_id = ?', [srsId])[0];
      if (!srs) {
        throw new UploadError(
          'invalid_geopackage',
          `The layer “${table}” of ${fileName} uses srs_id ${srsId}, which is not listed in its gpkg_spatial_ref_sys table, so its coordinate system is unknown. Export the GeoPackage again (your GIS writes the table) and upload that.`,
          { layer: table, srsId },
        );
      }
      const info = rows(`PRAGMA table_info(${quoteId(table)})`);
      const pk = info.filter((r) => Number(r.pk) > 0).map((r) => String(r.name));
      const fields = info.map((r) => String(r.name)).filter((n) => n !== geomColumn && !(pk.length === 1 && n === pk[0]));
      const features: Feature<Geometry | null>[] = [];
      const result = db.exec(`SELECT ${[geomColumn, ...fields].map(quoteId).join(', ')} FROM ${quoteId(table)} ORDER BY rowid`)[0];
      for (const [index, values] of (result?.values ?? []).entries()) {
        const blob = values[0];
        let geometry: Geometry | null = null;
        if (blob instanceof Uint8Array) {
          try {
            geometry = readGeoPackageGeometry(blob).geometry;
          } catch (err) {
            if (!(err instanceof WkbError)) throw err;
            throw new UploadError(
              'invalid_geopackage',
              `Feature ${index} of the layer “${table}” in ${fileName} has a geometry that cannot be read (${err.message}). Export the GeoPackage again and upload that.`,
              { layer: table, index },
            );
          }
        }
        const properties: Record<string, string | number | boolean | null> = {};
        fields.forEach((f, i) => {
          const v = values[i + 1];
          properties[f] = v instanceof Uint8Array ? null : typeof v === 'bigint' ? Number(v) : (v as string | number | null);
        });
        features.push({ type: 'Feature', properties, geometry });
      }
      layers.push({ name: table, crs: crsOf(srsId, srs, table, warnings), fields, features });
    }
    return { layers, warnings };
  } catch (err) {
    if (err instanceof UploadError) throw err;
    // SQLite errors past the header ("database disk image is malformed", a missing column…).
    throw new UploadError(
      'invalid_geopackage',
      `${fileName} is a damaged or incomplete GeoPackage (${err instanceof Error ? err.message : String(err)}). Export it again from your GIS and upload the whole file.`,
    );
  } finally {
    db.close();
  }
}

/** The CRS of a gpkg_spatial_ref_sys row. */
function crsOf(srsId: number, srs: Record<string, unknown>, table: string, warnings: string[]): CrsInfo {
  const name = srs.srs_name ? String(srs.srs_name) : undefined;
  const definition = typeof srs.definition === 'string' ? srs.definition.trim() : '';
  const org = String(srs.organization ?? '').toUpperCase();
  const code = Number(srs.organization_coordsys_id);
  // −1 and 0: "Undefined cartesian/geographic SRS" (GeoPackage 1.3 §1.1.2.1.2).
  if (srsId === -1 || srsId === 0 || definition === '' || definition.toLowerCase() === 'undefined') {
    return { found: false, ...(name ? { name } : {}), ...(definition && definition.toLowerCase() !== 'undefined' ? { wkt: definition } : {}) };
  }
  if (org === 'EPSG' && Number.isInteger(code) && code > 0) return { found: true, epsg: code, ...(name ? { name } : {}) };
  const read = readPrj(definition, `The coordinate system of “${table}” (gpkg_spatial_ref_sys, srs_id ${srsId})`);
  warnings.push(...read.warnings);
  return { ...read.crs, ...(name ? { name } : {}) };
}
