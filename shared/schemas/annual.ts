/**
 * @module shared/schemas/annual
 * The contract of GET /api/v1/screenings/annual: each lease's yearly figures per river and the
 * yearly rating set from them (shared/scoring/annual-rating.ts), read by the Overview.
 */
import { z } from 'zod';

const rating = z.enum(['low', 'moderate', 'high', 'severe']);

export const annualQuerySchema = z.strictObject({
  leaseId: z.uuid({ error: 'leaseId must be a lease id (UUID)' }).optional(),
  riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }).optional(),
});

export const annualItemSchema = z.object({
  leaseId: z.string(),
  leaseCode: z.string(),
  riverId: z.string(),
  riverName: z.string(),
  expectedDaysPerYear: z.number().describe('Expected days a year below the species salinity tolerance'),
  probabilityAnyExposure: z.number().describe('Chance a year of any day below the salinity tolerance (a lower bound)'),
  indicatorDaysPerYear: z
    .number()
    .nullable()
    .describe('Expected days a year the faecal indicator is above the standard (as closureDaysPerYear)'),
  probabilityIndicatorAboveStandard: z.number().nullable().describe('Chance a year of the indicator above the standard'),
  worstRating: rating.nullable().describe('Worst per-flood rating over the river’s flood-frequency scenarios'),
  closureDaysPerYear: z
    .number()
    .nullable()
    .describe(
      'Expected closure days a year: sum over the scenarios’ AEP bands of probability mass × days the indicator on the lease is above 14 per 100 mL',
    ),
  harmfulSalinityChancePerYear: z
    .number()
    .nullable()
    .describe(
      'Chance a year of a salinity event harmful to the lease’s species (under its acute or chronic limit for longer than its duration)',
    ),
  annualRating: rating
    .nullable()
    .describe(
      'Yearly rating from the two figures beside it: severe ≥ 30 closure days or ≥ 0.5 a year, high ≥ 10 or ≥ 0.2, moderate ≥ 2 or ≥ 0.05, else low; null until re-screened',
    ),
  details: z.unknown().describe('The integrals behind the figures (segments per AEP band)'),
});
export type AnnualItem = z.infer<typeof annualItemSchema>;

export const annualListSchema = z.object({
  items: z.array(annualItemSchema).describe('Worst yearly rating first, then more closure days a year, then the higher chance a year'),
});
