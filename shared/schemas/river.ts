/**
 * A river's settings: the shape the river form, the API and the footprint builder share.
 * Optional fields left out get documented defaults and are listed in `defaultsUsed`, so the
 * screens can say which numbers are still defaults.
 */
import { z } from 'zod';

import { floodFrequencyResultSchema } from './flood-frequency';
import { MAX_ENTRAINMENT_COEFFICIENT, MIN_ENTRAINMENT_COEFFICIENT } from '../physics/constants';
import { numberField, strictObjectError } from './physical-fields';
import { plumeResultSchema } from './plume';
import { IndicatorSpecSchema, RIVER_PARAMETER_DEFAULTS } from './river-parameters';
import { latitudeField, salinityField, temperatureField } from './water';

/** Defaults for the water properties when a user does not know them yet. */
export const RIVER_WATER_DEFAULTS = {
  riverSalinity: { value: 0.1, unit: 'psu', label: 'c', source: 'common practice: river water in flood is nearly fresh' },
  riverTemperature: { value: 10, unit: '°C', label: 'c', source: 'common practice: a temperate winter flood' },
  seaSalinity: { value: 34, unit: 'psu', label: 'c', source: 'common practice: open coastal water (science.md §2.4 uses 34)' },
  seaTemperature: { value: 10, unit: '°C', label: 'c', source: 'common practice: a temperate winter coast' },
} as const;

/** The freshwater fraction of the water leaving the mouth region, before alongshore mixing. */
export const NEAR_FIELD_DEFAULT = {
  nearFieldFreshwaterFraction: {
    value: 1,
    unit: '',
    label: 'c',
    source:
      'common practice: undiluted river water at the mouth, the cautious bound; near-field mixing usually lowers it (Horner-Devine, Hetland & MacDonald 2015, a), and calibration can fit it',
  },
} as const;

export const RIVER_DEFAULTS = { ...RIVER_WATER_DEFAULTS, ...RIVER_PARAMETER_DEFAULTS, ...NEAR_FIELD_DEFAULT } as const;
export type DefaultableField = keyof typeof RIVER_DEFAULTS;
export const DEFAULTABLE_FIELDS = Object.keys(RIVER_DEFAULTS) as DefaultableField[];

const settingsShape = {
  name: z
    .string({ error: 'name is required' })
    .trim()
    .min(1, { error: 'name is required' })
    .max(120, { error: 'name must be at most 120 characters' })
    .describe('River name'),
  mouthLongitude: numberField('mouthLongitude', 'degrees', 'Longitude of the river mouth, east positive', { min: -180, max: 180 }),
  mouthLatitude: latitudeField().describe('Latitude of the river mouth, north positive (degrees)'),
  outflowAzimuthDeg: numberField('outflowAzimuthDeg', 'degrees', 'Direction the river water leaves the mouth, clockwise from north (seaward)', {
    min: 0,
    max: 360,
  }),
  mouthWidth: numberField('mouthWidth', 'm', 'Width of the river mouth', { min: 0, exclusiveMin: true, max: 100_000 }),
  mouthDepth: numberField('mouthDepth', 'm', 'Depth of the river mouth', { min: 0, exclusiveMin: true, max: 500 }),
  shelfSlope: numberField('shelfSlope', 'm/m', 'Bottom slope off the mouth (depth change per distance)', { min: 0, max: 0.5 }).optional(),
  riverSalinity: salinityField('riverSalinity').optional(),
  riverTemperature: temperatureField('riverTemperature').optional(),
  seaSalinity: salinityField('seaSalinity').optional(),
  seaTemperature: temperatureField('seaTemperature').optional(),
  entrainmentCoefficient: numberField(
    'entrainmentCoefficient',
    '',
    'Entrainment coefficient of the coastal current (dilution length = (2/3)·depth/(fraction at the mouth × coefficient)); 1e-6 to 1e-3, typically 1e-5 to 1e-4',
    { min: MIN_ENTRAINMENT_COEFFICIENT, max: MAX_ENTRAINMENT_COEFFICIENT },
  ).optional(),
  t90DayHours: numberField('t90DayHours', 'h', 'Daytime T90 of the faecal indicator', { min: 0, exclusiveMin: true, max: 10_000 }).optional(),
  t90NightHours: numberField('t90NightHours', 'h', 'Night-time T90 of the faecal indicator', { min: 0, exclusiveMin: true, max: 10_000 }).optional(),
  daylightFraction: numberField('daylightFraction', '', 'Fraction of the day in daylight', { min: 0, max: 1 }).optional(),
  indicator: IndicatorSpecSchema.optional(),
  alongshoreShare: numberField('alongshoreShare', '', 'Share of the discharge carried on into the coastal current', { min: 0.3, max: 1 }).optional(),
  nearFieldFreshwaterFraction: numberField('nearFieldFreshwaterFraction', '', 'Freshwater fraction of the water leaving the mouth region (1 = undiluted river water)', {
    min: 0.05,
    max: 1,
  }).optional(),
  gaugeName: z.string().trim().max(120, { error: 'gaugeName must be at most 120 characters' }).optional(),
  gaugeCode: z.string().trim().max(60, { error: 'gaugeCode must be at most 60 characters' }).optional(),
  coastId: z.uuid({ error: 'coastId must be a coast id (UUID)' }).optional(),
  designDistribution: z
    .enum(['gev', 'lp3', 'gumbel'], { error: "designDistribution must be 'gev', 'lp3' or 'gumbel'" })
    .optional()
    .describe('Which flood-frequency fit gives the design flows of the scenarios (default gev)'),
};

/** Body of POST /rivers: required geometry of the mouth, optional physics with defaults. */
export const riverCreateSchema = z.strictObject(settingsShape, strictObjectError('river'));
export type RiverCreate = z.infer<typeof riverCreateSchema>;

/** Body of PATCH /rivers/:id: any subset; null clears an optional value back to its default. */
export const riverUpdateSchema = riverCreateSchema.partial();
export type RiverUpdate = z.infer<typeof riverUpdateSchema>;

/** Settings with every default filled in. */
export type RiverSettings = Required<Omit<RiverCreate, 'shelfSlope' | 'gaugeName' | 'gaugeCode' | 'coastId' | 'designDistribution'>> &
  Pick<RiverCreate, 'shelfSlope' | 'gaugeName' | 'gaugeCode' | 'coastId' | 'designDistribution'>;

/** Fills in documented defaults and lists which fields use them. */
export function applyRiverDefaults(input: RiverCreate): { settings: RiverSettings; defaultsUsed: DefaultableField[] } {
  const defaultsUsed: DefaultableField[] = [];
  const filled: Record<string, unknown> = { ...input };
  for (const field of DEFAULTABLE_FIELDS) {
    if (filled[field] === undefined) {
      const value = RIVER_DEFAULTS[field].value;
      filled[field] = typeof value === 'object' ? { ...value } : value;
      defaultsUsed.push(field);
    }
  }
  return { settings: filled as RiverSettings, defaultsUsed };
}

/** A river's stored settings: what was given, with every defaultable field filled in (see defaultsUsed). */
export const riverSettingsSchema = z
  .object(settingsShape)
  .required(Object.fromEntries(DEFAULTABLE_FIELDS.map((f) => [f, true])) as { [K in DefaultableField]: true })
  .describe('The river settings with every default filled in');

export const riverSchema = z.object({
  id: z.string(),
  name: z.string(),
  jurisdictionId: z.string().nullable(),
  ownerId: z.string().nullable(),
  settings: riverSettingsSchema,
  defaultsUsed: z.array(z.string()),
  version: z.number(),
  hasFlowRecord: z.boolean(),
  /** Where the river's chosen coast comes from ('builtin': the open world coastline; null: the usual choice of uploaded coasts). */
  coastSource: z.enum(['upload', 'traced', 'builtin']).nullable().optional(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type River = z.infer<typeof riverSchema>;

export const flowRecordUploadQuerySchema = z.strictObject({
  units: z
    .enum(['m3s', 'cfs', 'auto'], {
      error: "units must be 'm3s' (cubic metres per second), 'cfs' (cubic feet per second) or 'auto' (read from the file)",
    })
    .default('auto')
    .describe("Units of the flows: 'm3s', 'cfs' (converted to m³/s) or 'auto' (WaterML unit of measure, or the CSV column name)"),
  dateColumn: z.string().min(1).max(200).optional().describe('CSV: the date (or date-time) column; guessed when absent'),
  dischargeColumn: z.string().min(1).max(200).optional().describe('CSV: the flow column; guessed when absent'),
  qualityColumn: z.string().max(200).optional().describe("CSV: the quality or approval code column; guessed when absent; '' for none"),
  dropProvisional: z
    .enum(['true', 'false'], { error: 'dropProvisional must be true or false' })
    .default('false')
    .transform((v) => v === 'true')
    .describe('Leave out readings whose code says provisional (P, provisional, unchecked)'),
  daily: z
    .enum(['max', 'mean'], { error: "daily must be 'max' or 'mean'" })
    .optional()
    .describe('Turn a sub-daily record into daily maxima or daily means (per calendar day as written in the file)'),
  waterYearStart: z
    .string()
    .regex(/^(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/, { error: 'waterYearStart must be a day of the year written MM-DD, e.g. 10-01' })
    .default('10-01'),
  acceptProblems: z
    .enum(['true', 'false'], { error: 'acceptProblems must be true or false' })
    .default('false')
    .transform((v) => v === 'true')
    .describe('Store the record without the rows that have problems'),
});

export const scenarioUpdateSchema = z.strictObject(
  {
    name: z.string().trim().min(1, { error: 'name cannot be empty' }).max(120, { error: 'name must be at most 120 characters' }).optional(),
    durationHours: numberField('durationHours', 'h', 'How long the flow lasts', { min: 0, exclusiveMin: true, max: 24 * 365 }).optional(),
  },
  strictObjectError('scenario'),
);

export const scenarioCreateSchema = z.strictObject(
  {
    name: z.string().trim().min(1, { error: 'name is required' }).max(120, { error: 'name must be at most 120 characters' }),
    discharge: numberField('discharge', 'm³/s', 'Flow of the scenario', { min: 0, exclusiveMin: true, max: 1e6 }),
    durationHours: numberField('durationHours', 'h', 'How long the flow lasts', { min: 0, exclusiveMin: true, max: 24 * 365 }),
  },
  strictObjectError('scenario'),
);
export type ScenarioCreate = z.infer<typeof scenarioCreateSchema>;

export const scenarioSchema = z.object({
  id: z.string(),
  riverId: z.string(),
  name: z.string(),
  kind: z.enum(['aep', 'seasonal', 'manual']),
  aep: z.number().nullable(),
  discharge: z.number(),
  durationHours: z.number(),
  source: z
    .union([
      z
        .object({
          distribution: z.enum(['gev', 'lp3', 'gumbel']),
          lower: z.number().nullable(),
          upper: z.number().nullable(),
          durationRule: z.string(),
          recordId: z.string(),
        })
        .describe('A design flood of the flood-frequency fit (kind aep), with its confidence limits'),
      z.object({ season: z.string(), percentile: z.number(), recordId: z.string() }).describe('A seasonal high flow of the record (kind seasonal)'),
      z.object({ typedBy: z.string() }).describe('Typed by a user (kind manual)'),
    ])
    .nullable()
    .describe('Where the scenario comes from'),
});
export type Scenario = z.infer<typeof scenarioSchema>;

/** A data row of a gauge record that could not be used. */
export const flowRecordProblemSchema = z.object({
  row: z.number().int().describe('1-based line number in the file'),
  value: z.string().describe('The raw text at fault'),
  reason: z.string().describe('What is wrong and how to fix it'),
});

/** A run of calendar days with no reading. */
export const flowRecordGapSchema = z.object({ from: z.string().describe('YYYY-MM-DD'), to: z.string().describe('YYYY-MM-DD'), missingDays: z.number().int() });

/** The annual maximum of one water year (shared/hydrology/annual-maxima.ts). */
export const annualPeakSchema = z.object({
  waterYear: z.number().int().describe('Named for the calendar year in which it ends'),
  discharge: z.number().describe('m³/s'),
  date: z.string().describe('YYYY-MM-DD of the largest reading'),
  time: z.string().describe('ISO 8601 instant of the largest reading'),
  daysOfData: z.number().int(),
  daysInYear: z.number().int(),
  complete: z.boolean(),
});

const percentileGroupSchema = z.object({
  label: z.string(),
  months: z.array(z.number().int()),
  days: z.number().int(),
  percentiles: z.array(z.object({ p: z.number(), discharge: z.number().nullable() })),
});

/** GET /rivers/:id/flow-records: the active record as stored (column names as in the database). */
export const flowRecordSchema = z.object({
  id: z.string(),
  file_name: z.string(),
  units: z.enum(['m3s', 'cfs']),
  water_year_start: z.string().describe('MM-DD'),
  uploaded_at: z.string().describe('ISO 8601'),
  reading_count: z.number().int(),
  first_time: z.string().describe('ISO 8601'),
  last_time: z.string().describe('ISO 8601'),
  interval: z.enum(['daily', 'sub-daily']),
  problems: z.array(flowRecordProblemSchema),
  gaps: z.array(flowRecordGapSchema),
  annual_peaks: z.array(annualPeakSchema),
  fit: floodFrequencyResultSchema,
  durations: z.object({
    medianHours: z.number().nullable().describe('Median time a flood stays above half its annual peak (h)'),
    meanHours: z.number().nullable(),
    fraction: z.number().optional(),
  }),
  percentiles: z.object({
    method: z.enum(['hazen', 'type7']),
    monthly: z.array(percentileGroupSchema),
    seasonal: z.array(percentileGroupSchema),
    all: percentileGroupSchema,
  }),
});
export type FlowRecordRow = z.infer<typeof flowRecordSchema>;

/** POST /rivers/:id/flow-records: what was stored. */
export const flowRecordUploadResultSchema = z.object({
  recordId: z.string(),
  rows: z.number().int(),
  readings: z.number().int(),
  problems: z.array(flowRecordProblemSchema).describe('Rows left out (at most 1000 listed)'),
  gaps: z.array(flowRecordGapSchema),
  annualPeaks: z.array(annualPeakSchema),
  fit: floodFrequencyResultSchema,
  typicalDurationHours: z.number().describe('Flood duration given to the scenarios (h)'),
  warnings: z.array(z.string()),
  format: z.enum(['csv', 'waterml2']).describe('How the file was read'),
  units: z.enum(['m3s', 'cfs']).describe('The units the flows were read in (stored in m³/s)'),
  unitsNote: z.string().describe('Where the units came from and the conversion, in words'),
  columns: z
    .object({ names: z.array(z.string()), date: z.string(), discharge: z.string(), quality: z.string().nullable(), guessed: z.boolean() })
    .nullable(),
  qualityCodes: z.array(z.object({ code: z.string(), count: z.number().int(), provisional: z.boolean() })),
  droppedProvisional: z.number().int(),
  aggregated: z.enum(['max', 'mean']).nullable().describe('How a sub-daily record was turned into daily readings, if it was'),
});

/** GET /rivers/:id/flow-records/readings: the thinned hydrograph. */
export const hydrographSchema = z.object({
  points: z.array(z.object({ t: z.string().describe('ISO 8601 instant'), q: z.number().describe('Discharge (m³/s)') })),
});

/** GET /scenarios/:id/plume: the plume numbers and profiles of one scenario. */
export const scenarioPlumeSchema = z.object({
  scenario: scenarioSchema,
  riverVersion: z.number().int(),
  plume: plumeResultSchema,
  profiles: z.object({
    sectionAlongKm: z.number().describe('Where along the coast the cross-shore section is taken (km)'),
    crossShore: z.array(z.object({ offshoreKm: z.number(), thickness: z.number().nullable().describe('m'), salinity: z.number() })),
    alongshore: z.array(z.object({ alongKm: z.number(), salinity: z.number(), indicator: z.number().describe('per 100 mL') })),
  }),
});

/** POST /rivers/:id/screening-runs: the queued run. */
export const screeningRunStartedSchema = z.object({ runId: z.string() });
