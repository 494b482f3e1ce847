/** Monitoring stations and samples, the comparison of a river's plume with them, and calibrations: contracts for the forms and the API. */
import { z } from 'zod';

export const rowProblemSchema = z.object({ row: z.number().int(), column: z.string().optional(), message: z.string() });
export type RowProblemDto = z.infer<typeof rowProblemSchema>;

export const stationSchema = z.object({
  id: z.string(),
  code: z.string(),
  name: z.string().nullable(),
  longitude: z.number(),
  latitude: z.number(),
  samples: z.number().int(),
  firstSample: z.string().nullable(),
  lastSample: z.string().nullable(),
  mine: z.boolean().describe('True when you uploaded it'),
});
export type Station = z.infer<typeof stationSchema>;
export const stationListSchema = z.object({ items: z.array(stationSchema) });

export const stationUploadResultSchema = z.object({
  created: z.number().int(),
  updated: z.number().int(),
  format: z.enum(['shapefile', 'geojson', 'csv', 'kml', 'kmz', 'gpx', 'geopackage']),
  warnings: z.array(z.string()),
  items: z.array(stationSchema),
});
export type StationUploadResult = z.infer<typeof stationUploadResultSchema>;

export const sampleUploadResultSchema = z.object({
  created: z.number().int(),
  updated: z.number().int(),
  censored: z.number().int().describe('Indicator results kept as detection limits'),
  stations: z.number().int(),
  firstSample: z.string().nullable(),
  lastSample: z.string().nullable(),
  warnings: z.array(z.string()),
  columns: z.record(z.string(), z.string()),
});
export type SampleUploadResult = z.infer<typeof sampleUploadResultSchema>;

export const sampleSchema = z.object({
  id: z.string(),
  stationCode: z.string(),
  sampledAt: z.string(),
  salinity: z.number().nullable(),
  indicator: z.number().nullable(),
  indicatorCensored: z.enum(['below', 'above']).nullable(),
  indicatorName: z.string(),
  indicatorUnit: z.string(),
  method: z.string().nullable(),
  temperature: z.number().nullable(),
});
export type Sample = z.infer<typeof sampleSchema>;
export const sampleListSchema = z.object({ items: z.array(sampleSchema), total: z.number().int() });

export const sampleListQuerySchema = z.strictObject({
  stationId: z.uuid({ error: 'stationId must be a station id (UUID)' }).optional(),
  limit: z.coerce.number().int().min(1).max(5000).default(500),
});

export const comparisonQuerySchema = z.strictObject({
  lagDays: z.coerce
    .number({ error: 'lagDays must be a whole number of days, 0 to 10' })
    .int({ error: 'lagDays must be a whole number of days, 0 to 10' })
    .min(0, { error: 'lagDays must be 0 to 10 days' })
    .max(10, { error: 'lagDays must be 0 to 10 days' })
    .default(1),
});

const variableSkillSchema = z.object({
  n: z.number().int(),
  censored: z.number().int(),
  censoredMet: z.number().int(),
  bias: z.number().nullable(),
  rmse: z.number().nullable(),
  skill: z.number().nullable().describe('Nash–Sutcliffe skill score (1 perfect, 0 no better than the mean of the observations)'),
  indexOfAgreement: z.number().nullable(),
});
export const skillSchema = z.object({
  salinity: variableSkillSchema,
  indicator: variableSkillSchema.describe('In log10 units'),
  n: z.number().int(),
  censored: z.number().int(),
});
export type Skill = z.infer<typeof skillSchema>;

export const comparisonPointSchema = z.object({
  sampleId: z.string(),
  stationCode: z.string(),
  stationName: z.string().nullable(),
  sampledAt: z.string(),
  flow: z.number().describe('River flow on the date (m³/s): the largest daily flow over the lag window'),
  along: z.number().describe('Signed alongshore distance from the mouth, m: positive down-coast (the way the coastal current turns), negative up-coast'),
  offshore: z.number().describe('Distance from the walked coast, m'),
  distanceFromMouth: z.number().describe('Straight-line distance from the mouth, m'),
  observedSalinity: z.number().nullable(),
  observedIndicator: z.number().nullable(),
  indicatorCensored: z.enum(['below', 'above']).nullable(),
  predictedSalinity: z.number(),
  predictedIndicator: z.number(),
  freshwaterFraction: z.number(),
  salinityResidual: z.number().nullable().describe('Predicted − observed, psu (null when not measured)'),
  indicatorResidual: z.number().nullable().describe('log10(predicted) − log10(observed); 0 when a detection limit is respected'),
});
export type ComparisonPoint = z.infer<typeof comparisonPointSchema>;

export const outsideSampleSchema = z.object({
  sampleId: z.string(),
  stationCode: z.string(),
  stationName: z.string().nullable(),
  sampledAt: z.string(),
  flow: z.number().nullable(),
  observedSalinity: z.number().nullable(),
  observedIndicator: z.number().nullable(),
  indicatorCensored: z.enum(['below', 'above']).nullable(),
  reason: z.string(),
});

export const calibratedValuesSchema = z.object({
  /** Entrainment coefficient E (model 2 on). */
  entrainmentCoefficient: z.number().optional(),
  /** Fixed alongshore mixing length, m (calibrations saved by model 1 only). */
  mixingLength: z.number().optional(),
  t90Hours: z.number(),
  alongshoreShare: z.number(),
  nearFieldFreshwaterFraction: z.number(),
});

export const comparisonSchema = z.object({
  riverId: z.string(),
  riverName: z.string(),
  lagDays: z.number().int(),
  values: calibratedValuesSchema,
  points: z.array(comparisonPointSchema),
  outside: z.array(outsideSampleSchema).describe('Samples outside every river plume (or without a flow on their date)'),
  otherRivers: z.number().int().describe('Samples in another river’s plume'),
  stats: skillSchema,
  flowRange: z.object({ min: z.number(), max: z.number() }).nullable(),
  years: z.number().int(),
  cautions: z.array(z.string()),
});
export type Comparison = z.infer<typeof comparisonSchema>;

export const calibrationCreateSchema = z.strictObject({
  lagDays: z
    .number({ error: 'lagDays must be a whole number of days, 0 to 10' })
    .int({ error: 'lagDays must be a whole number of days, 0 to 10' })
    .min(0, { error: 'lagDays must be 0 to 10 days' })
    .max(10, { error: 'lagDays must be 0 to 10 days' })
    .default(1),
  fitAlongshoreShare: z.boolean({ error: 'fitAlongshoreShare must be true or false' }).default(false),
  fitNearFieldFraction: z.boolean({ error: 'fitNearFieldFraction must be true or false' }).default(false),
});
export type CalibrationCreate = z.infer<typeof calibrationCreateSchema>;
export type CalibrationCreateInput = z.input<typeof calibrationCreateSchema>;

export const calibrationSchema = z.object({
  id: z.string(),
  riverId: z.string(),
  createdAt: z.string(),
  createdBy: z.string().nullable(),
  status: z.enum(['fitted', 'applied', 'rolled-back']),
  options: z.object({ lagDays: z.number(), fitAlongshoreShare: z.boolean(), fitNearFieldFraction: z.boolean() }),
  fittedNames: z.array(z.string()),
  start: calibratedValuesSchema,
  fitted: calibratedValuesSchema,
  settingsPatch: z.record(z.string(), z.number()).describe('The river settings applying this calibration writes'),
  previous: z.record(z.string(), z.number()).nullable().describe('The river settings it replaced, when applied'),
  before: skillSchema,
  after: skillSchema,
  samples: z.number().int(),
  years: z.number().int(),
  flowRange: z.object({ min: z.number(), max: z.number() }),
  converged: z.boolean(),
  cautions: z.array(z.string()),
  appliedAt: z.string().nullable(),
  rolledBackAt: z.string().nullable(),
  canApply: z.boolean().describe('True when you may apply or roll back this calibration'),
});
export type Calibration = z.infer<typeof calibrationSchema>;
export const calibrationListSchema = z.object({ items: z.array(calibrationSchema) });
