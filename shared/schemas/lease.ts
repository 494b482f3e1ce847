/** Lease contracts shared by the leases table, the lease page and the API. */
import { z } from 'zod';
import { areaGeometrySchema, featureCollectionSchema, featureSchema } from './geojson';

export const leaseStatusSchema = z.enum(['held', 'candidate'], { error: 'status must be "held" or "candidate"' });
export type LeaseStatus = z.infer<typeof leaseStatusSchema>;

export const LEASE_SORT_FIELDS = [
  'leaseId',
  'holder',
  'species',
  'status',
  'areaM2',
  'createdAt',
  'worstRating',
  'expectedDaysPerYear',
  'annualRating',
] as const;

export const leaseListQuerySchema = z.strictObject({
  q: z.string().trim().max(120, { error: 'q must be at most 120 characters' }).optional().describe('Search in lease id and holder'),
  status: leaseStatusSchema.optional(),
  species: z.string().trim().max(80).optional(),
  ownerId: z.string().max(64).optional().describe('Only leases of this owner (advisers and regulators)'),
  sort: z.enum(LEASE_SORT_FIELDS, { error: `sort must be one of ${LEASE_SORT_FIELDS.join(', ')}` }).default('leaseId'),
  order: z.enum(['asc', 'desc'], { error: 'order must be asc or desc' }).default('asc'),
  limit: z.coerce
    .number()
    .int()
    .min(1, { error: 'limit must be between 1 and 5000' })
    .max(5000, { error: 'limit must be between 1 and 5000' })
    .default(100),
  offset: z.coerce.number().int().min(0, { error: 'offset must be 0 or more' }).default(0),
  withGeometry: z
    .enum(['true', 'false'], { error: 'withGeometry must be true or false' })
    .default('true')
    .transform((v) => v === 'true'),
  ratingsRiverId: z
    .uuid({ error: 'ratingsRiverId must be a river id (UUID)' })
    .optional()
    .describe("Add each lease's rating at every scenario of this river (scenarioRatings)"),
});
export type LeaseListQuery = z.infer<typeof leaseListQuerySchema>;

export const leaseSchema = z.object({
  id: z.string(),
  leaseId: z.string().describe("The holder's own lease identifier"),
  holder: z.string().nullable(),
  species: z.string().nullable(),
  status: leaseStatusSchema,
  notes: z.string().nullable(),
  ownerId: z.string(),
  ownerName: z.string().nullable(),
  areaM2: z.number().describe('Area on the WGS84 ellipsoid (m²)'),
  onLand: z.boolean().describe('True when the lease lies wholly on land of a known coast'),
  importId: z.string().nullable(),
  worstRating: z
    .enum(['low', 'moderate', 'high', 'severe'])
    .nullable()
    .describe('Worst rating over every scenario of every river that screens the lease; null before screening'),
  expectedDaysPerYear: z.number().nullable().describe('Expected days a year below the species salinity tolerance (largest over rivers)'),
  probabilityAnyExposure: z.number().nullable().describe('Annual chance of any days below tolerance (largest over rivers)'),
  annualRating: z
    .enum(['low', 'moderate', 'high', 'severe'])
    .nullable()
    .describe(
      'Yearly rating from closureDaysPerYear and harmfulSalinityChancePerYear (shared/scoring/annual-rating.ts); null before screening. sort=annualRating orders by it, then closure days, then chance',
    ),
  closureDaysPerYear: z
    .number()
    .nullable()
    .describe('Expected days a year the faecal indicator on the lease is above the standard, added over rivers (at most 365)'),
  harmfulSalinityChancePerYear: z
    .number()
    .nullable()
    .describe("Chance a year of a salinity event harmful to the lease's species, over every river (rivers taken as independent)"),
  createdAt: z.string(),
  updatedAt: z.string(),
  geometry: areaGeometrySchema.optional().describe('GeoJSON MultiPolygon in EPSG:4326'),
  scenarioRatings: z
    .record(z.string(), z.enum(['low', 'moderate', 'high', 'severe']))
    .optional()
    .describe('With ratingsRiverId: the rating at each screened scenario of that river, by scenario id'),
});
export type Lease = z.infer<typeof leaseSchema>;

export const leaseListSchema = z.object({ items: z.array(leaseSchema), total: z.number() });

export const leaseUpdateSchema = z.strictObject({
  leaseId: z
    .string()
    .trim()
    .min(1, { error: 'leaseId cannot be empty' })
    .max(80, { error: 'leaseId must be at most 80 characters' })
    .optional(),
  holder: z.string().trim().max(160, { error: 'holder must be at most 160 characters' }).nullable().optional(),
  species: z.string().trim().max(80, { error: 'species must be at most 80 characters' }).nullable().optional(),
  status: leaseStatusSchema.optional(),
  notes: z.string().max(4000, { error: 'notes must be at most 4000 characters' }).nullable().optional(),
});
export type LeaseUpdate = z.infer<typeof leaseUpdateSchema>;

export const leaseExportQuerySchema = z.strictObject({
  format: z.enum(['csv', 'geojson', 'gpkg', 'kml'], { error: 'format must be csv, geojson, gpkg (GeoPackage) or kml' }),
  status: leaseStatusSchema.optional(),
});

/** GET /leases/export?format=geojson: the leases as a GeoJSON download (properties as in leaseSchema). */
export const leaseExportGeoJsonSchema = featureCollectionSchema(featureSchema(leaseSchema.omit({ geometry: true }), areaGeometrySchema));

/**
 * GET /leases/export?format=csv: RFC 4180 text with these columns. The yearly rating and its two figures come last
 * (empty before screening), so readers of the earlier columns are unaffected.
 */
export const LEASE_EXPORT_CSV_COLUMNS = [
  'id',
  'lease_id',
  'holder',
  'species',
  'status',
  'area_m2',
  'area_ha',
  'on_land',
  'owner',
  'created_at',
  'annual_rating',
  'closure_days_per_year',
  'harmful_salinity_chance_per_year',
] as const;
export const leaseExportCsvSchema = z.string().describe(`CSV (RFC 4180) with a header row: ${LEASE_EXPORT_CSV_COLUMNS.join(', ')}`);
