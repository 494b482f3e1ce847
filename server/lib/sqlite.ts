/**
 * SQLite for GeoPackage uploads and exports: sql.js (SQLite compiled to WebAssembly, shipped inside the
 * npm package: its .wasm is read from node_modules, nothing is fetched). One module instance per process.
 */
import initSqlJs, { type Database, type SqlJsStatic } from 'sql.js';
import type { OpenSqlite } from '#shared/geometry/read-upload';

let engine: Promise<SqlJsStatic> | null = null;

/** The sql.js engine, loaded once. */
export function sqlite(): Promise<SqlJsStatic> {
  engine ??= initSqlJs();
  return engine;
}

/** Opens database bytes in memory (for readUpload's GeoPackage reader). */
export const openSqlite: OpenSqlite = async (bytes) => {
  const SQL = await sqlite();
  return new SQL.Database(bytes) as Database;
};

/** A new empty database in memory (for GeoPackage exports). */
export async function newSqliteDatabase(): Promise<Database> {
  const SQL = await sqlite();
  return new SQL.Database();
}
