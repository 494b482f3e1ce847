/**
 * @module shared/geometry/export-layer
 * What an export holds, format-free: a named layer of EPSG:4326 features with readable field names in a
 * fixed order, and the notes (model version, cautions, sources) that travel with it. The GeoPackage
 * writer (server/lib/write-geopackage.ts) and the KML writer (write-kml.ts) both take this shape.
 */
import type { Feature, Geometry } from 'geojson';

/** A value an exported field can hold. */
export type ExportValue = string | number | boolean | null;

/** One layer to export (coordinates are WGS 84 longitude/latitude, EPSG:4326). */
export interface ExportLayer {
  /** Table / document name, e.g. 'leases'. */
  name: string;
  /** Human title, e.g. 'Leases with their latest yearly rating'. */
  title: string;
  /** Field names in order, as people read them ('Lease id', 'Yearly rating'…). */
  fields: string[];
  /** Features whose properties use exactly those field names. */
  features: Feature<Geometry, Record<string, ExportValue>>[];
  /** Readme lines: key → text (model version, cautions, what each field means, when it was made). */
  readme: [string, string][];
}

/**
 * A field's storage type from its values: INTEGER when every value is a whole number or a boolean, REAL when
 * every value is a number, TEXT otherwise (nulls do not count; an all-null field is TEXT).
 *
 * @example
 * fieldType([1, 2, null]) // 'INTEGER'
 * fieldType([1.5, 'a']) // 'TEXT'
 */
export function fieldType(values: readonly ExportValue[]): 'INTEGER' | 'REAL' | 'TEXT' {
  const present = values.filter((v) => v !== null && v !== undefined);
  if (present.length === 0) return 'TEXT';
  if (present.every((v) => typeof v === 'boolean' || (typeof v === 'number' && Number.isInteger(v)))) return 'INTEGER';
  if (present.every((v) => typeof v === 'number')) return 'REAL';
  return 'TEXT';
}
