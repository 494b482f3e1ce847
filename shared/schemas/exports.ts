/**
 * @module shared/schemas/exports
 * The download formats of leases, a footprint's bands, closure zones and monitoring stations, and the
 * schema that documents a file response in the API description.
 */
import { z } from 'zod';
import { featureCollectionSchema, featureSchema } from './geojson';

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

/** A value of an exported field (text, number, yes/no, or empty). */
const exportValueSchema = z.union([z.string(), z.number(), z.boolean(), z.null()]);

/**
 * format=geojson of a layer export (bands, zones, stations): the features with their readable field names as
 * properties, and the readme (model version, cautions, CRS, what each field means) as the `metadata` member.
 */
export const layerExportGeoJsonSchema = featureCollectionSchema(featureSchema(z.record(z.string(), exportValueSchema))).extend({
  metadata: z.record(z.string(), z.string()).describe('The readme: title, model version, CRS, export time, cautions and what each field means'),
});

/** format=csv of a layer export: a header row of the field names, then one row per feature. */
export const layerExportCsvSchema = z
  .string()
  .describe('CSV (RFC 4180) with a header row of the readable field names; point layers end with Longitude (WGS 84) and Latitude (WGS 84)');
