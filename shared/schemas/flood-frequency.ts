/**
 * @module shared/schemas/flood-frequency
 * Request body of a flood-frequency fit (shared/hydrology/flood-frequency.ts): the annual
 * peaks and what to compute from them.
 */
import { z } from 'zod';

/** Most annual peaks accepted in one request. */
export const MAX_ANNUAL_PEAKS = 10_000;

const peakSchema = z
  .number({ error: 'annualPeaks must hold numbers only' })
  .refine(Number.isFinite, { error: 'annualPeaks must hold finite numbers only' })
  .refine((q) => q > 0, {
    error: 'annualPeaks must all be greater than 0 (log-Pearson III takes logarithms; remove zero-flow years)',
  });

const aepSchema = z
  .number({ error: 'aep must hold numbers only' })
  .gt(0, { error: 'aep values must be between 0 and 1, both excluded (e.g. 0.01 for the 100-year flood)' })
  .lt(1, { error: 'aep values must be between 0 and 1, both excluded (e.g. 0.01 for the 100-year flood)' });

export const floodFrequencyRequestSchema = z.strictObject({
  annualPeaks: z
    .array(peakSchema, { error: 'annualPeaks must be an array of numbers' })
    .min(3, { error: 'annualPeaks must hold at least 3 peaks' })
    .max(MAX_ANNUAL_PEAKS, { error: `annualPeaks must hold at most ${MAX_ANNUAL_PEAKS} peaks` })
    .describe('Annual maximum discharges, one per water year, all > 0; results come back in the same units'),
  aep: z
    .array(aepSchema, { error: 'aep must be an array of numbers' })
    .min(1, { error: 'aep must hold at least one probability when given' })
    .max(100, { error: 'aep must hold at most 100 probabilities' })
    .optional()
    .describe('Annual exceedance probabilities wanted, each 0 < aep < 1; default 0.5, 0.2, 0.1, 0.04, 0.02, 0.01, 0.005'),
  regionalSkew: z
    .number({ error: 'regionalSkew must be a number' })
    .min(-3, { error: 'regionalSkew must be between -3 and 3' })
    .max(3, { error: 'regionalSkew must be between -3 and 3' })
    .optional()
    .describe('Regional (generalized) skew of log10 peaks, -3…3, weighted with the station skew as in Bulletin 17B'),
  regionalSkewMse: z
    .number({ error: 'regionalSkewMse must be a number' })
    .gt(0, { error: 'regionalSkewMse must be greater than 0' })
    .refine(Number.isFinite, { error: 'regionalSkewMse must be a finite number' })
    .optional()
    .describe('Mean-square error of the regional skew, > 0 (0.302 for the Bulletin 17B national map)'),
});

export type FloodFrequencyRequest = z.infer<typeof floodFrequencyRequestSchema>;

/** A flow at an annual exceedance probability, with its confidence limits when computed. */
export const floodQuantileSchema = z.object({
  aep: z.number().describe('Annual exceedance probability (0–1)'),
  returnPeriod: z.number().describe('1 / aep (years)'),
  discharge: z.number().describe('Flow at this AEP, in the units of the peaks'),
  lower: z.number().optional().describe('Lower confidence limit'),
  upper: z.number().optional().describe('Upper confidence limit'),
});

const lowOutlierSchema = z.object({ index: z.number().int(), value: z.number() });

/** Result of a flood-frequency fit (shared/hydrology/flood-frequency.ts FloodFrequencyResult). */
export const floodFrequencyResultSchema = z.object({
  n: z.number().int().describe('Number of annual peaks'),
  gev: z.object({
    location: z.number(),
    scale: z.number(),
    shape: z.number().describe("Hosking's k"),
    shapeMethod: z.enum(['approximation', 'exact']),
    lMoments: z.object({
      n: z.number(),
      b0: z.number(),
      b1: z.number(),
      b2: z.number(),
      l1: z.number(),
      l2: z.number(),
      l3: z.number(),
      t3: z.number(),
    }),
    quantiles: z.array(floodQuantileSchema),
  }),
  lp3: z.object({
    mean: z.number().describe('Mean of log10 peaks'),
    stdDev: z.number().describe('Standard deviation of log10 peaks'),
    skew: z.number().describe('Station skew of log10 peaks'),
    weightedSkew: z.number().optional().describe('Station skew weighted with the regional skew'),
    skewUsed: z.number(),
    quantiles: z.array(floodQuantileSchema),
  }),
  gumbel: z.object({ method: z.enum(['moments', 'l-moments']), location: z.number(), scale: z.number(), quantiles: z.array(floodQuantileSchema) }),
  plottingPositions: z.array(
    z.object({
      rank: z.number().int(),
      value: z.number(),
      index: z.number().int(),
      aep: z.number(),
      nonExceedance: z.number(),
      returnPeriod: z.number(),
      waterYear: z.number().int().optional(),
    }),
  ),
  lowOutliers: z.object({
    grubbsBeck: z.object({
      n: z.number().int(),
      applicable: z.boolean(),
      criticalValue: z.number().nullable(),
      threshold: z.number().nullable(),
      lowOutliers: z.array(lowOutlierSchema),
    }),
    multipleGrubbsBeck: z.object({
      n: z.number().int(),
      applicable: z.boolean(),
      numberOfLowOutliers: z.number().int(),
      threshold: z.number().nullable(),
      lowOutliers: z.array(lowOutlierSchema),
      pValues: z.array(z.number()),
    }),
  }),
  confidence: z.object({
    level: z.number(),
    lp3: z.literal('bulletin-17b'),
    gevAndGumbel: z.enum(['parametric-bootstrap', 'none']),
    resamples: z.number().int(),
    seed: z.number(),
  }),
  warnings: z.array(z.string()),
});
