/**
 * Response contracts of the screening routes: a river's plume footprint (GeoJSON), screenings per lease
 * and scenario, annualised exposure, background screening runs and a lease's flow sweep. Field names
 * are the routes' own (camelCase, from the SQL aliases); numbers in SI units unless the description says.
 */
import { z } from 'zod';
import { featureCollectionSchema, featureSchema } from './geojson';
import { plumeResultSchema } from './plume';

export const RATINGS = ['low', 'moderate', 'high', 'severe'] as const;
export const ratingSchema = z.enum(RATINGS).describe('Screening rating (never "safe")');

const bandFeatureSchema = featureSchema(
  z.object({
    bandId: z.string().describe('e.g. plume-edge, indicator-over-standard, salinity-under-20'),
    name: z.string(),
    kind: z.string().describe('What the band bounds: bulge, freshwater, salinity, indicator…'),
    threshold: z.number().nullable(),
    order: z.number().int(),
  }),
);
const pathFeatureSchema = featureSchema(
  z.object({ bandId: z.literal('path'), name: z.string(), kind: z.literal('path') }).describe('The coast the plume follows'),
);

/** GET /footprints: the bands (and the coast followed) of one river at one flow. */
export const footprintSchema = featureCollectionSchema(z.union([bandFeatureSchema, pathFeatureSchema])).extend({
  properties: z.object({
    footprintId: z.string(),
    riverId: z.string(),
    riverName: z.string(),
    scenarioId: z.string().nullable(),
    scenarioName: z.string().nullable(),
    discharge: z.number().describe('m³/s'),
    durationHours: z.number(),
    modelVersion: z.string(),
    plume: plumeResultSchema,
    warnings: z.array(z.string()),
    computedAt: z.string().describe('ISO 8601'),
  }),
});

const pathwayTermsSchema = z.object({ severity: z.number(), duration: z.number(), score: z.number() });

/** The numbers behind one lease's rating at one scenario (shared/scoring ScoreNumbers, plus where the lease lies). */
export const screeningNumbersSchema = z.object({
  exposureFraction: z.number(),
  reachesLease: z.boolean(),
  lowestSalinity: z.number().nullable(),
  acuteLowerSalinity: z.number(),
  chronicLowerSalinity: z.number(),
  chronicDurationDays: z.number(),
  daysBelowTolerance: z.number(),
  highestIndicator: z.number().nullable(),
  indicatorThreshold: z.number(),
  floodDurationDays: z.number(),
  aep: z.number().nullable(),
  discharge: z.number(),
  salinity: pathwayTermsSchema,
  indicator: pathwayTermsSchema,
  drivingPathway: z.enum(['salinity', 'indicator', 'none']),
  settings: z.object({
    cutPoints: z.object({ moderate: z.number(), high: z.number(), severe: z.number() }),
    severityFloor: z.number(),
    indicatorFullSeverityRatio: z.number(),
    indicatorReferenceDays: z.number(),
    bandLayout: z.enum(['nested', 'disjoint']),
  }),
  species: z.string().optional(),
  speciesKnown: z.boolean().optional(),
  alongM: z.number().nullable().optional().describe('Distance along the walked coast (m)'),
  offshoreM: z.number().nullable().optional().describe('Distance off the walked coast (m)'),
});

/** One lease at one scenario. */
export const screeningSchema = z.object({
  leaseId: z.string(),
  leaseCode: z.string(),
  species: z.string().nullable(),
  status: z.string(),
  riverId: z.string(),
  riverName: z.string(),
  scenarioId: z.string(),
  scenarioName: z.string(),
  scenarioKind: z.enum(['aep', 'seasonal', 'manual']),
  aep: z.number().nullable(),
  discharge: z.number(),
  durationHours: z.number(),
  footprintId: z.string(),
  bandFractions: z.record(z.string(), z.number()).describe('Share of the lease in each band (0–1), by band id'),
  lowestSalinity: z.number().nullable(),
  highestIndicator: z.number().nullable(),
  daysBelowTolerance: z.number(),
  rating: ratingSchema,
  score: z.number(),
  reasons: z.array(z.string()),
  numbers: screeningNumbersSchema,
  modelVersion: z.string(),
  computedAt: z.string().describe('ISO 8601'),
});

/** GET /screenings. */
export const screeningListSchema = z.object({ items: z.array(screeningSchema), total: z.number().int() });

/** Annualised exposure of one lease to one river (shared/scoring/annualise.ts, plus the indicator). */
export const annualExposureSchema = z.object({
  leaseId: z.string(),
  leaseCode: z.string(),
  riverId: z.string(),
  riverName: z.string(),
  expectedDaysPerYear: z.number().describe('Expected days a year below the salinity tolerance'),
  probabilityAnyExposure: z.number().describe('Chance a year of any day below it'),
  worstRating: ratingSchema,
  indicatorDaysPerYear: z.number().nullable().describe('Expected days a year above the indicator standard'),
  probabilityIndicatorAboveStandard: z.number().nullable(),
  details: z
    .object({
      expectedDaysPerYear: z.number(),
      probabilityOfAnyExposure: z.number(),
      returnPeriodOfAnyExposureYears: z.number().nullable(),
      segments: z.array(z.object({ fromAep: z.number(), toAep: z.number(), daysPerYear: z.number() })),
      frequentTail: z.enum(['linear-to-zero', 'zero']),
      indicator: z.object({ standard: z.number(), expectedDaysPerYear: z.number(), probabilityOfAnyExposure: z.number() }),
    })
    .nullable(),
});

/** GET /screenings/annual. */
export const annualExposureListSchema = z.object({ items: z.array(annualExposureSchema) });

/** A background screening run of a river (GET /screenings/runs). */
export const screeningRunSchema = z.object({
  id: z.string(),
  status: z.enum(['queued', 'running', 'done', 'failed']),
  total: z.number().int(),
  done: z.number().int(),
  message: z.string().nullable(),
  error: z.string().nullable(),
  queuedAt: z.string().describe('ISO 8601'),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
});
export const screeningRunListSchema = z.object({ items: z.array(screeningRunSchema) });

/** GET /leases/:id/sweep: where a lease enters each band as the river's flow rises. */
export const leaseSweepSchema = z.object({
  leaseId: z.string(),
  leaseCode: z.string(),
  riverId: z.string(),
  riverName: z.string(),
  species: z.string(),
  alongCoastM: z.number(),
  offshoreM: z.number(),
  durationHours: z.number(),
  bands: z.array(
    z.object({
      bandId: z.string(),
      name: z.string(),
      entersAtDischarge: z.number().nullable().describe('m³/s; null when it never enters within the sweep'),
      entersAtAep: z.number().nullable(),
    }),
  ),
  curve: z.array(
    z.object({
      discharge: z.number(),
      salinity: z.number(),
      indicator: z.number(),
      freshwaterFraction: z.number(),
      aep: z.number().nullable(),
    }),
  ),
  note: z.string(),
});
