/**
 * @module shared/schemas/upload
 * Contracts of the lease / coast / closure-zone upload (shared/geometry/read-upload.ts and friends):
 * the upload kind, the import preview the server answers with, the CRS a user picks when the file has
 * none, and the confirmation that maps attributes to lease fields.
 */
import { z } from 'zod';
import { featureCollectionSchema, featureSchema, geometrySchema } from './geojson';

/** What an upload is for. */
export const uploadKindSchema = z
  .enum(['lease', 'coast', 'zone'], { error: "kind must be 'lease', 'coast' or 'zone'" })
  .describe("What the file holds: 'lease' boundaries, a 'coast' (shoreline or land polygons) or closure 'zone's");

/** 'lease' | 'coast' | 'zone'. */
export type UploadKindInput = z.infer<typeof uploadKindSchema>;

const bboxSchema = z
  .tuple([z.number(), z.number(), z.number(), z.number()])
  .describe('[minLon, minLat, maxLon, maxLat] in degrees (EPSG:4326)');

/** One feature of the import preview. */
export const importFeatureSchema = z.object({
  index: z.number().int().min(0).describe('Position of the feature in the upload (0-based, across layers)'),
  properties: z.record(z.string(), z.unknown()).describe('The feature’s attributes as uploaded'),
  areaM2: z.number().min(0).nullable().describe('Area on the WGS 84 ellipsoid, m²; null for lines'),
  bbox: bboxSchema,
  repaired: z.boolean().describe('True when the geometry was invalid (e.g. a self-intersecting ring) and the database repaired it'),
  onLand: z.boolean().optional().describe('True when it lies wholly on land according to the coastline'),
});

const indexListSchema = (what: string) =>
  z.object({
    count: z.number().int().min(0).describe(`How many features ${what}`),
    indexes: z.array(z.number().int().min(0)).describe(`Which (0-based positions in the upload), the first 100 of them`),
  });

/** Figures over every staged feature of an upload (the preview lists only the first features). */
export const importOverviewSchema = z.object({
  bbox: bboxSchema.nullable().describe('Extent of all the staged features; null before the coordinate system is known'),
  areaM2: z
    .object({ min: z.number(), max: z.number(), total: z.number() })
    .nullable()
    .describe('Smallest, largest and summed area on the WGS 84 ellipsoid, m²; null for lines'),
  repaired: indexListSchema('were invalid and repaired by the database'),
  onLand: indexListSchema('lie wholly on land according to the coastline'),
});

/** A page of an upload's staged features: GET /imports/:id/features. */
export const importFeaturePageSchema = z.object({
  offset: z.number().int().min(0).describe('Position of the first feature of this page'),
  limit: z.number().int().min(1),
  total: z.number().int().min(0).describe('Features in the upload'),
  items: z.array(importFeatureSchema),
});

/** One layer of a multi-layer file, for the preview's layer picker. */
export const layerSummarySchema = z.object({
  name: z.string().describe('Shapefile basename, KML folder path, GPX part or GeoPackage table'),
  featureCount: z.number().int().min(0),
  geometryTypes: z.array(z.string()).describe("GeoJSON geometry types in the layer ('null' for features without geometry)"),
});

/**
 * The layer a user picks in a file holding several.
 *
 * @example
 * importLayerBodySchema.parse({ layer: 'Leases/Held' })
 */
export const importLayerBodySchema = z.strictObject({
  layer: z
    .string({ error: 'layer must be the name of one of the file’s layers, or null for all of them' })
    .min(1, { error: 'layer must not be empty: send null for all layers' })
    .max(500)
    .nullable()
    .describe('The layer to read, as listed in the preview; null = every usable layer'),
});

/**
 * The server's answer to an upload: what was read, in EPSG:4326, before the user confirms it.
 *
 * @example
 * importResponseSchema.parse({ id: '1f0c…', kind: 'lease', crs: { found: true, epsg: 32630 }, featureCount: 1,
 *   geometryTypes: ['Polygon'], fields: ['LEASE_ID'], warnings: [],
 *   features: [{ index: 0, properties: { LEASE_ID: 'FB-014' }, areaM2: 41000, bbox: [-2.91, 47.6, -2.9, 47.61], repaired: false }] });
 */
export const importResponseSchema = z.object({
  id: z.uuid().describe('The staged import’s id'),
  kind: uploadKindSchema,
  crs: z
    .object({
      found: z.boolean().describe('True when the file defined a usable coordinate system; false → ask the user for an EPSG code'),
      epsg: z.number().int().optional().describe('EPSG code, when identified'),
      wkt: z.string().optional().describe('The .prj text as uploaded'),
    })
    .describe('The coordinate system of the uploaded file'),
  fileName: z.string().optional().describe('The uploaded file’s name'),
  format: z.enum(['shapefile', 'geojson', 'kml', 'kmz', 'gpx', 'geopackage']).optional().describe('The format read from the content'),
  layers: z
    .array(layerSummarySchema)
    .optional()
    .describe('Every layer of a file holding several (shapefiles in a zip, KML folders, GPX tracks and waypoints, GeoPackage tables); empty for one'),
  selectedLayer: z.string().nullable().optional().describe('The layer picked by the user; null = every usable layer'),
  tracksAsPolygons: z.boolean().optional().describe('GPX tracks and routes were turned into areas at the user’s request'),
  featureCount: z.number().int().min(0),
  geometryTypes: z.array(z.string()).describe("GeoJSON geometry types found, e.g. ['Polygon', 'MultiPolygon']"),
  fields: z.array(z.string()).describe('Attribute names, in file order'),
  warnings: z.array(z.string()).describe('Things the user should know that did not stop the upload'),
  overview: importOverviewSchema,
  featurePage: z
    .object({ offset: z.number().int(), limit: z.number().int(), total: z.number().int() })
    .describe('Which features `features` holds: the first `limit` of `total`; page through the rest with GET /imports/:id/features'),
  features: z.array(importFeatureSchema).describe('The first features of the upload (see featurePage)'),
});

/** The import preview, as sent to the client. */
export type ImportResponse = z.infer<typeof importResponseSchema>;

/**
 * The coordinate system a user picks for a file without a usable .prj.
 *
 * @example
 * importCrsBodySchema.parse({ epsg: 2193 })
 */
export const importCrsBodySchema = z.strictObject({
  epsg: z
    .number({ error: 'epsg must be a number: the EPSG code of the coordinate system, e.g. 2193' })
    .int({ error: 'epsg must be a whole number, e.g. 32630' })
    .min(1024, { error: 'epsg must be an EPSG code from 1024 to 999999, e.g. 4326' })
    .max(999_999, { error: 'epsg must be an EPSG code from 1024 to 999999, e.g. 4326' })
    .describe('EPSG code of the coordinate system the file’s coordinates are in'),
});

/** `{ epsg }` chosen by the user. */
export type ImportCrsBody = z.infer<typeof importCrsBodySchema>;

const fieldName = (role: string) =>
  z
    .string({ error: `mapping.${role} must be the name of one of the file’s attributes` })
    .min(1, { error: `mapping.${role} must not be empty: leave it out instead` })
    .max(255, { error: `mapping.${role} must be at most 255 characters` })
    .optional();

/**
 * The user's confirmation of an import: which attribute holds which lease field, and what to do with
 * leases whose id already exists.
 *
 * @example
 * importConfirmBodySchema.parse({ mapping: { leaseId: 'LEASE_ID', holder: 'HOLDER' }, onDuplicate: 'replace' })
 */
export const importConfirmBodySchema = z.strictObject({
  mapping: z
    .strictObject(
      {
        leaseId: fieldName('leaseId').describe('Attribute holding the lease id'),
        holder: fieldName('holder').describe('Attribute holding the holder'),
        species: fieldName('species').describe('Attribute holding the species'),
        status: fieldName('status').describe("Attribute holding the status (read as 'held' or 'candidate')"),
      },
      { error: 'mapping must be an object such as {"leaseId": "LEASE_ID"}' },
    )
    .describe('Which uploaded attribute fills each lease field'),
  onDuplicate: z
    .enum(['replace', 'keep'], {
      error: "onDuplicate must be 'replace' (update the existing lease) or 'keep' (leave it and skip the upload's copy)",
    })
    .optional()
    .describe("What to do when a lease id already exists: 'replace' or 'keep'"),
});

/** `{ mapping, onDuplicate? }` confirming an import. */
export type ImportConfirmBody = z.infer<typeof importConfirmBodySchema>;

/** GET /imports/:id/preview: the staged features (simplified), with their index and what PostGIS found. */
export const importPreviewSchema = featureCollectionSchema(
  featureSchema(
    z
      .looseObject({
        _index: z.number().int().describe('Position of the feature in the upload'),
        _repaired: z.boolean().describe('PostGIS repaired its geometry (ST_MakeValid)'),
        _onLand: z.boolean().describe('It lies on land polygons'),
      })
      .describe("The feature's own attributes as uploaded, plus _index, _repaired and _onLand"),
    geometrySchema,
  ),
);

/** GET /coasts: coastlines (lines or land polygons) as GeoJSON, simplified to about 10 m. */
export const coastCollectionSchema = featureCollectionSchema(
  featureSchema(
    z.object({
      id: z.string(),
      name: z.string(),
      form: z.enum(['line', 'land']),
      shared: z.boolean(),
      source: z.string().describe('Where the coast came from: an upload, a trace on the map, or the built-in world coastline'),
    }),
    geometrySchema,
  ),
);
