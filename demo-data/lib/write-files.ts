/**
 * @module demo-data/lib/write-files
 * Writers for the demo files: GeoJSON (one feature per line), JSON, text, and the shell step that
 * turns a GeoJSON layer into a zipped ESRI shapefile in UTM zone 24N with ogr2ogr and zip.
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Feature } from 'geojson';

/** Date written into every .dbf header and every zip entry, so reruns give identical bytes. */
const FIXED_DATE = new Date('2025-10-01T00:00:00Z');

/** Writes a text file, creating its folder. */
export function writeText(file: string, text: string): void {
  mkdirSync(path.dirname(file), { recursive: true });
  writeFileSync(file, text);
}

/** Writes pretty JSON with a final newline. */
export function writeJson(file: string, value: unknown): void {
  writeText(file, `${JSON.stringify(value, null, 2)}\n`);
}

/** Writes a GeoJSON FeatureCollection with one feature per line (EPSG:4326, RFC 7946). */
export function writeGeoJson(file: string, name: string, features: Feature[]): void {
  const lines = features.map((f) => JSON.stringify(f));
  writeText(file, `{\n"type": "FeatureCollection",\n"name": "${name}",\n"features": [\n${lines.join(',\n')}\n]\n}\n`);
}

/** Options of {@link writeZippedShapefile}. */
export interface ShapefileOptions {
  /** GeoJSON source file. */
  source: string;
  /** Output zip file; the shapefile inside is named after it (without .zip). */
  zipFile: string;
  /** Target CRS for ogr2ogr -t_srs, e.g. 'EPSG:32624'. */
  targetSrs: string;
  /** Optional OGR SQL attribute filter (-where). */
  where?: string;
  /** Geometry type for -nlt, e.g. 'POLYGON', 'MULTILINESTRING'. */
  geometryType: string;
}

/**
 * Shell step: ogr2ogr writes the shapefile (.shp/.shx/.dbf/.prj/.cpg, UTF-8 attributes) from the
 * GeoJSON reprojected to the target CRS; the .dbf header date and every file time are set to a
 * fixed date; `zip -X -j` packs the five files.
 */
export function writeZippedShapefile(o: ShapefileOptions): void {
  const base = path.basename(o.zipFile, '.zip');
  const dir = mkdtempSync(path.join(tmpdir(), 'fennick-shp-'));
  try {
    const args = ['-f', 'ESRI Shapefile', '-t_srs', o.targetSrs, '-lco', 'ENCODING=UTF-8', '-nlt', o.geometryType, '-nln', base];
    if (o.where) args.push('-where', o.where);
    args.push(path.join(dir, `${base}.shp`), o.source);
    execFileSync('ogr2ogr', args, { stdio: ['ignore', 'ignore', 'pipe'] });
    const files = readdirSync(dir).sort();
    for (const ext of ['.shp', '.shx', '.dbf', '.prj', '.cpg']) {
      if (!files.includes(`${base}${ext}`)) throw new Error(`ogr2ogr did not write ${base}${ext}`);
    }
    fixDbfDate(path.join(dir, `${base}.dbf`));
    for (const f of files) utimesSync(path.join(dir, f), FIXED_DATE, FIXED_DATE);
    rmSync(o.zipFile, { force: true });
    mkdirSync(path.dirname(o.zipFile), { recursive: true });
    execFileSync('zip', ['-X', '-j', '-q', path.resolve(o.zipFile), ...files.map((f) => path.join(dir, f))], {
      env: { ...process.env, TZ: 'UTC' },
    });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** @private Sets the "last update" date in a .dbf header (bytes 1–3: year − 1900, month, day). */
function fixDbfDate(file: string): void {
  const bytes = readFileSync(file);
  bytes[1] = FIXED_DATE.getUTCFullYear() - 1900;
  bytes[2] = FIXED_DATE.getUTCMonth() + 1;
  bytes[3] = FIXED_DATE.getUTCDate();
  writeFileSync(file, bytes);
}
