/**
 * The regulator's workspace (issue #8): closure zones and their plan values, the model's trigger
 * sweep, closure checks, notices, sample results, the audit log and the public status page.
 * Contracts shared by the forms and the routes.
 */
import { z } from 'zod';
import { areaGeometrySchema, featureCollectionSchema, featureSchema } from './geojson';

export const ZONE_STATUSES = ['open', 'closed', 'reopening-pending'] as const;
export type ZoneStatus = (typeof ZONE_STATUSES)[number];
export const ZONE_STATUS_LABEL: Record<ZoneStatus, string> = { open: 'Open', closed: 'Closed', 'reopening-pending': 'Reopening pending' };

const uuid = (what: string) => z.uuid({ error: `${what} must be an id (UUID)` });
const flowValue = (name: string) =>
  z
    .number({ error: `${name} must be a number (m³/s)` })
    .positive({ error: `${name} must be greater than 0 m³/s` })
    .max(1e6, { error: `${name} must be at most 1 000 000 m³/s` });

/** The plan values a regulator sets on a zone; every field is optional on a change. */
export const zonePlanSchema = z.strictObject({
  name: z
    .string({ error: 'name must be text' })
    .trim()
    .min(1, { error: 'name must not be empty' })
    .max(200, { error: 'name must be at most 200 characters' }),
  riverId: uuid('riverId').nullable(),
  gaugeId: uuid('gaugeId').nullable(),
  triggerFlow: flowValue('triggerFlow').nullable(),
  minClosureDays: z
    .number({ error: 'minClosureDays must be a number of days' })
    .min(0, { error: 'minClosureDays must be 0 days or more' })
    .max(365, { error: 'minClosureDays must be at most 365 days' })
    .nullable(),
  indicatorStandard: z
    .number({ error: 'indicatorStandard must be a count per 100 mL' })
    .positive({ error: 'indicatorStandard must be greater than 0 per 100 mL' })
    .max(1e6, { error: 'indicatorStandard must be at most 1 000 000 per 100 mL' })
    .nullable(),
});
export const zoneUpdateSchema = zonePlanSchema
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'send at least one field to change' });
export type ZoneUpdate = z.infer<typeof zoneUpdateSchema>;

const polygonGeometry = z.object({
  type: z.enum(['Polygon', 'MultiPolygon'], { error: "geometry.type must be 'Polygon' or 'MultiPolygon' (longitude/latitude, EPSG:4326)" }),
  coordinates: z
    .array(z.any(), { error: 'geometry.coordinates must be a list of rings' })
    .min(1, { error: 'geometry.coordinates must not be empty' }),
});

/** A zone drawn on the map (uploads go through /imports with kind 'zone'). */
export const zoneCreateSchema = zonePlanSchema.partial().extend({
  name: zonePlanSchema.shape.name,
  geometry: polygonGeometry,
});
export type ZoneCreate = z.infer<typeof zoneCreateSchema>;

export const zoneSchema = z.object({
  id: z.string(),
  name: z.string(),
  riverId: z.string().nullable(),
  riverName: z.string().nullable(),
  gaugeId: z.string().nullable(),
  gaugeCode: z.string().nullable(),
  gaugeName: z.string().nullable(),
  triggerFlow: z.number().nullable(),
  minClosureDays: z.number().nullable(),
  indicatorStandard: z.number().nullable(),
  status: z.enum(ZONE_STATUSES),
  statusSince: z.string(),
  /** When a closed zone may reopen at the earliest (status_since + minimum closure), or null when open. */
  earliestReopening: z.string().nullable(),
  areaM2: z.number(),
  heldLeases: z.number().int().describe('Held leases that touch the zone'),
  geometry: areaGeometrySchema.optional().describe('GeoJSON MultiPolygon in EPSG:4326 (with withGeometry=true, and for one zone)'),
});
export type Zone = z.infer<typeof zoneSchema>;
export const zoneListSchema = z.object({ items: z.array(zoneSchema) });

export const sampleCreateSchema = z.strictObject({
  sampledAt: z.iso.datetime({ offset: true, error: 'sampledAt must be a date and time, e.g. 2026-12-01T09:30:00Z' }),
  indicator: z
    .number({ error: 'indicator must be a count per 100 mL' })
    .min(0, { error: 'indicator must be 0 or more per 100 mL' })
    .max(1e7),
  notes: z.string().max(2000, { error: 'notes must be at most 2000 characters' }).optional(),
});
export type SampleCreate = z.infer<typeof sampleCreateSchema>;
/** The form's version: a datetime-local value. */
export const sampleFormSchema = z.object({
  sampledAt: z.string().min(1, { error: 'give the date and time the sample was taken' }),
  indicator: z.number({ error: 'give the result as a count per 100 mL' }).min(0, { error: 'the result must be 0 or more' }),
  notes: z.string().max(2000).optional(),
});
export type SampleForm = z.infer<typeof sampleFormSchema>;

export const zoneSampleSchema = z.object({
  id: z.string(),
  zoneId: z.string(),
  sampledAt: z.string(),
  indicator: z.number(),
  standard: z.number(),
  passed: z.boolean(),
  notes: z.string().nullable(),
  enteredBy: z.string().nullable(),
  createdAt: z.string(),
});
export type ZoneSample = z.infer<typeof zoneSampleSchema>;

export const sweepQuerySchema = z.strictObject({
  share: z.coerce
    .number({ error: 'share must be a fraction from 0 to 1' })
    .min(0, { error: 'share must be 0 (any part) or more' })
    .max(1, { error: 'share must be at most 1 (the whole zone)' })
    .default(0),
  steps: z.coerce
    .number()
    .int()
    .min(10, { error: 'steps must be 10 or more' })
    .max(200, { error: 'steps must be at most 200' })
    .default(60),
});

export const triggerSweepSchema = z.object({
  zoneId: z.string(),
  zoneName: z.string(),
  riverId: z.string(),
  riverName: z.string(),
  indicatorStandard: z.number(),
  share: z.number(),
  durationHours: z.number(),
  samplePoints: z.number().int(),
  curve: z.array(z.object({ discharge: z.number(), fraction: z.number(), aep: z.number().nullable() })),
  suggestedTrigger: z.number().nullable(),
  suggestedAep: z.number().nullable(),
  planTrigger: z.number().nullable(),
  planAep: z.number().nullable(),
  /** Plan trigger minus suggested trigger, m³/s (positive: the plan closes later than the model suggests). */
  marginM3s: z.number().nullable(),
  marginPercent: z.number().nullable(),
  modelVersion: z.string(),
  note: z.string(),
});
export type TriggerSweep = z.infer<typeof triggerSweepSchema>;

export const closureCheckSchema = z
  .strictObject({
    riverId: uuid('riverId'),
    source: z.enum(['typed', 'latest-gauge-reading'], { error: "source must be 'typed' or 'latest-gauge-reading'" }).default('typed'),
    flow: flowValue('flow').optional(),
  })
  .refine((v) => v.source !== 'typed' || v.flow !== undefined, {
    message: "give flow (m³/s), or set source to 'latest-gauge-reading'",
    path: ['flow'],
  });
export type ClosureCheckRequest = z.infer<typeof closureCheckSchema>;

export const closureCheckResultSchema = z.object({
  riverId: z.string(),
  riverName: z.string(),
  flow: z.number(),
  flowSource: z.object({
    kind: z.enum(['typed', 'latest-gauge-reading']),
    gaugeCode: z.string().nullable(),
    gaugeName: z.string().nullable(),
    observedAt: z.string().nullable(),
  }),
  aep: z.number().nullable(),
  durationHours: z.number(),
  modelVersion: z.string(),
  footprintId: z.string(),
  computedAt: z.string(),
  bands: z.array(z.object({ bandId: z.string(), name: z.string() })),
  zones: z.array(
    z.object({
      id: z.string(),
      name: z.string(),
      status: z.enum(ZONE_STATUSES),
      triggerFlow: z.number().nullable(),
      atOrAboveTrigger: z.boolean().nullable(),
      bandFractions: z.record(z.string(), z.number()),
    }),
  ),
  leases: z.array(
    z.object({
      id: z.string(),
      leaseId: z.string(),
      holder: z.string().nullable(),
      species: z.string().nullable(),
      zones: z.array(z.string()),
      bandFractions: z.record(z.string(), z.number()),
    }),
  ),
  map: featureCollectionSchema(
    z.union([
      featureSchema(z.object({ layer: z.literal('band'), bandId: z.string(), name: z.string(), order: z.number().int() }), areaGeometrySchema),
      featureSchema(z.object({ layer: z.literal('zone'), id: z.string(), name: z.string(), status: z.enum(ZONE_STATUSES) }), areaGeometrySchema),
      featureSchema(z.object({ layer: z.literal('lease'), id: z.string(), name: z.string(), holder: z.string().nullable() }), areaGeometrySchema),
    ]),
  ).describe('The bands at this flow, the zones and the held leases touched, for the map'),
  note: z.string(),
});
export type ClosureCheckResult = z.infer<typeof closureCheckResultSchema>;

export const noticeCreateSchema = z.strictObject({
  kind: z.enum(['closure', 'reopening'], { error: "kind must be 'closure' or 'reopening'" }),
  zoneIds: z
    .array(uuid('each zone id'), { error: 'zoneIds must be a list of zone ids' })
    .min(1, { error: 'choose at least one zone' })
    .max(100, { error: 'choose at most 100 zones' }),
  message: z.string().trim().max(2000, { error: 'message must be at most 2000 characters' }).optional(),
  flow: flowValue('flow').optional(),
});
export type NoticeCreate = z.infer<typeof noticeCreateSchema>;

export const noticeSchema = z.object({
  id: z.string(),
  kind: z.enum(['closure', 'reopening']),
  message: z.string().nullable(),
  flow: z.number().nullable(),
  issuedAt: z.string(),
  issuedBy: z.string().nullable(),
  recipients: z.number().int(),
  emailsSent: z.number().int(),
  zones: z.array(z.object({ id: z.string(), name: z.string(), statusBefore: z.string(), statusAfter: z.string() })),
});
export type Notice = z.infer<typeof noticeSchema>;
export const noticeListSchema = z.object({ items: z.array(noticeSchema) });

export const auditQuerySchema = z.strictObject({
  subjectType: z.string().max(50).optional(),
  limit: z.coerce.number().int().min(1).max(500, { error: 'limit must be at most 500' }).default(200),
  offset: z.coerce.number().int().min(0).default(0),
});
export const auditEntrySchema = z.object({
  id: z.string(),
  at: z.string(),
  actorId: z.string().nullable(),
  actorName: z.string().nullable(),
  actorEmail: z.string().nullable(),
  action: z.string(),
  subjectType: z.string(),
  subjectId: z.string().nullable(),
  /** The zone's, river's or notice's name, or the user's e-mail, when it still exists. */
  subjectName: z.string().nullable(),
  before: z.unknown().describe('The changed values before, as recorded (a JSON snapshot; its shape depends on the action)'),
  after: z.unknown().describe('The changed values after, as recorded (a JSON snapshot; its shape depends on the action)'),
});
export type AuditEntry = z.infer<typeof auditEntrySchema>;
export const auditListSchema = z.object({ items: z.array(auditEntrySchema), total: z.number().int() });

export const publicStatusSchema = z.object({
  jurisdiction: z.object({ slug: z.string(), name: z.string() }),
  generatedAt: z.string(),
  zones: z.array(
    z.object({
      name: z.string(),
      status: z.enum(ZONE_STATUSES),
      statusSince: z.string(),
      riverName: z.string().nullable(),
      triggerFlow: z.number().nullable(),
    }),
  ),
  notices: z.array(
    z.object({ kind: z.enum(['closure', 'reopening']), issuedAt: z.string(), zones: z.array(z.string()), message: z.string().nullable() }),
  ),
});
export type PublicStatus = z.infer<typeof publicStatusSchema>;

/** GET /closure-checks/gauges: the jurisdiction's gauges and their latest reading. */
export const closureGaugeListSchema = z.object({
  items: z.array(
    z.object({
      id: z.string(),
      riverId: z.string(),
      code: z.string(),
      name: z.string(),
      latestDischarge: z.number().nullable().describe('m³/s'),
      latestAt: z.string().nullable().describe('ISO 8601'),
    }),
  ),
});
