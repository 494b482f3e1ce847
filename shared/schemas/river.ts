/**
 * A river's settings: the shape the river form, the API and the footprint builder share.
 * Optional fields left out get documented defaults and are listed in `defaultsUsed`, so the
 * screens can say which numbers are still defaults.
 */
import { z } from 'zod';
import { MAX_ENTRAINMENT_COEFFICIENT, MIN_ENTRAINMENT_COEFFICIENT } from '../physics/constants';
import { numberField, strictObjectError } from './physical-fields';
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

export const riverSchema = z.object({
  id: z.string(),
  name: z.string(),
  jurisdictionId: z.string().nullable(),
  ownerId: z.string().nullable(),
  settings: z.record(z.string(), z.unknown()),
  defaultsUsed: z.array(z.string()),
  version: z.number(),
  hasFlowRecord: z.boolean(),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type River = z.infer<typeof riverSchema>;

export const flowRecordUploadQuerySchema = z.strictObject({
  units: z.enum(['m3s', 'cfs'], { error: "units must be 'm3s' (cubic metres per second) or 'cfs' (cubic feet per second)" }),
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
  source: z.unknown().nullable(),
});
export type Scenario = z.infer<typeof scenarioSchema>;
