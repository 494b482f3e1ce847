/**
 * @module shared/schemas/exports
 * The download formats of leases, a footprint's bands, closure zones and monitoring stations, and the
 * schema that documents a file response in the API description.
 */
import { z } from 'zod';

/** Every layer can be downloaded in these formats. */
export const EXPORT_FORMATS = ['csv', 'geojson', 'gpkg', 'kml'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

/** `format` of an export query. */
export const exportFormatSchema = z
  .enum(EXPORT_FORMATS, { error: 'format must be csv, geojson, gpkg (GeoPackage) or kml' })
  .describe('csv (attributes, with longitude/latitude for points), geojson, gpkg (GeoPackage with a readme table) or kml (with a document description)');

/** Media types of the export formats. */
export const EXPORT_CONTENT_TYPES: Record<ExportFormat, string> = {
  csv: 'text/csv; charset=utf-8',
  geojson: 'application/geo+json',
  gpkg: 'application/geopackage+sqlite3',
  kml: 'application/vnd.google-earth.kml+xml',
};

/** The body of an export response: the file itself (documented, not validated). */
export const exportFileSchema = z
  .string()
  .describe('The file: CSV or GeoJSON text, a GeoPackage (EPSG:4326, with a readme table) or KML (WGS 84, with a document description)');
