/**
 * An export layer → a GeoPackage 1.3 file (OGC 12-128r18) written with sql.js: the required
 * gpkg_spatial_ref_sys (with the −1/0 undefined systems and EPSG:4326), gpkg_contents and
 * gpkg_geometry_columns tables, the feature table, and a `readme` attributes table (key, value) naming
 * the model version and the cautions. Geometries are GeoPackage blobs (shared/geometry/wkb.ts).
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { type ExportLayer, fieldType } from '#shared/geometry/export-layer';
import { writeGeoPackageGeometry } from '#shared/geometry/wkb';
import { newSqliteDatabase } from './sqlite';

const require = createRequire(import.meta.url);
let wgs84Wkt: string | null = null;
/** EPSG:4326's WKT from epsg-index (the same catalogue the uploads use). */
function wgs84(): string {
  wgs84Wkt ??= (JSON.parse(readFileSync(require.resolve('epsg-index/s/4326.json'), 'utf8')) as { wkt: string }).wkt;
  return wgs84Wkt;
}

const q = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** The GeoPackage geometry type name for a layer (one type, or the generic GEOMETRY for mixed layers). */
function geometryTypeName(layer: ExportLayer): string {
  const types = new Set(layer.features.map((f) => f.geometry.type.toUpperCase()));
  if (types.size === 1) return [...types][0];
  if ([...types].every((t) => t.endsWith('POLYGON'))) return 'MULTIPOLYGON';
  return 'GEOMETRY';
}

/**
 * Writes the GeoPackage.
 *
 * @param layer - features in EPSG:4326 with readable field names.
 * @param options - lastChange: the gpkg_contents time stamp (default now; fixed for reproducible test files).
 * @returns the .gpkg bytes.
 * @example
 * const bytes = await writeGeoPackage({ name: 'leases', title: 'Leases', fields: ['Lease id'], features, readme: [['Model version', 'brackline-model-1.0.0']] });
 */
export async function writeGeoPackage(layer: ExportLayer, options: { lastChange?: Date } = {}): Promise<Uint8Array> {
  const lastChange = (options.lastChange ?? new Date()).toISOString();
  const db = await newSqliteDatabase();
  try {
    db.run('PRAGMA application_id = 1196444487'); // 'GPKG' (GeoPackage 1.3 §1.1.1.1.1)
    db.run('PRAGMA user_version = 10300');
    db.run(`CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER NOT NULL PRIMARY KEY, organization TEXT NOT NULL,
      organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT)`);
    db.run(`CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE,
      description TEXT DEFAULT '', last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
      min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER,
      CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id))`);
    db.run(`CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL,
      srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL, CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name),
      CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
      CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id))`);
    const srs = db.prepare('INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)');
    srs.run(['Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system']);
    srs.run(['Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system']);
    srs.run(['WGS 84 geodetic', 4326, 'EPSG', 4326, wgs84(), 'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid']);
    srs.free();

    const types = layer.fields.map((f) => fieldType(layer.features.map((x) => x.properties[f] ?? null)));
    db.run(
      `CREATE TABLE ${q(layer.name)} (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, geom ${geometryTypeName(layer)}, ${layer.fields.map((f, i) => `${q(f)} ${types[i]}`).join(', ')})`,
    );
    const insert = db.prepare(`INSERT INTO ${q(layer.name)} (geom, ${layer.fields.map(q).join(', ')}) VALUES (?, ${layer.fields.map(() => '?').join(', ')})`);
    let [minX, minY, maxX, maxY] = [Infinity, Infinity, -Infinity, -Infinity];
    for (const f of layer.features) {
      const blob = writeGeoPackageGeometry(f.geometry, 4326);
      const env = new DataView(blob.buffer, blob.byteOffset + 8, 32);
      minX = Math.min(minX, env.getFloat64(0, true));
      maxX = Math.max(maxX, env.getFloat64(8, true));
      minY = Math.min(minY, env.getFloat64(16, true));
      maxY = Math.max(maxY, env.getFloat64(24, true));
      insert.run([blob, ...layer.fields.map((k) => {
        const v = f.properties[k];
        return typeof v === 'boolean' ? (v ? 1 : 0) : (v ?? null);
      })]);
    }
    insert.free();
    const bounds = layer.features.length ? [minX, minY, maxX, maxY] : [null, null, null, null];
    db.run('INSERT INTO gpkg_contents (table_name, data_type, identifier, description, min_x, min_y, max_x, max_y, srs_id, last_change) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)', [
      layer.name,
      'features',
      layer.title,
      layer.readme.map(([k, v]) => `${k}: ${v}`).join(' '),
      ...bounds,
      4326,
      lastChange,
    ]);
    db.run('INSERT INTO gpkg_geometry_columns VALUES (?, ?, ?, ?, 0, 0)', [layer.name, 'geom', geometryTypeName(layer), 4326]);

    db.run('CREATE TABLE readme (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, "key" TEXT NOT NULL, "value" TEXT NOT NULL)');
    const note = db.prepare('INSERT INTO readme ("key", "value") VALUES (?, ?)');
    for (const [k, v] of layer.readme) note.run([k, v]);
    note.free();
    db.run("INSERT INTO gpkg_contents (table_name, data_type, identifier, description, last_change) VALUES ('readme', 'attributes', 'readme', ?, ?)", [
      `About the layer ${layer.name}: model version, cautions and what each field means.`,
      lastChange,
    ]);
    return db.export();
  } finally {
    db.close();
  }
}
