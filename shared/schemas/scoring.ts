/**
 * @module shared/schemas/scoring
 * Request contracts for the user's changes to species tolerance and scoring settings
 * (product.md §4 item 5; science.md §4 thresholds are (c) screening defaults a user may
 * change). Ranges match the checks in shared/biology/species-tolerance.ts and
 * shared/scoring/score-lease.ts, which throw on the same limits.
 */

import { z } from 'zod';
import { SPECIES_IDS } from '../biology/species-tolerance';

const salinity = (field: string, meaning: string) =>
  z
    .number({ error: `${field} must be a number (psu)` })
    .min(0, { error: `${field} must be from 0 to 45 psu` })
    .max(45, { error: `${field} must be from 0 to 45 psu` })
    .describe(`${meaning}, practical salinity (psu), 0–45`);

const days = (field: string, meaning: string) =>
  z
    .number({ error: `${field} must be a number of days` })
    .gt(0, { error: `${field} must be more than 0 and at most 365 days` })
    .max(365, { error: `${field} must be more than 0 and at most 365 days` })
    .describe(`${meaning}, days, (0, 365]`);

/**
 * User overrides of a species' salinity thresholds; every field optional.
 * Checks: acute ≤ chronic salinity, optimum minimum < maximum (when both are given).
 *
 * @example
 * speciesToleranceOverridesSchema.parse({ chronicLowerSalinity: 12 });
 */
export const speciesToleranceOverridesSchema = z
  .strictObject({
    acuteLowerSalinity: salinity('acuteLowerSalinity', 'Acute (short-term lethal or stress) lower salinity').optional(),
    acuteDurationDays: days('acuteDurationDays', 'Days under the acute salinity after which harm is expected').optional(),
    chronicLowerSalinity: salinity('chronicLowerSalinity', 'Chronic (sustained stress) lower salinity').optional(),
    chronicDurationDays: days('chronicDurationDays', 'Days under the chronic salinity after which it applies').optional(),
    optimumMin: salinity('optimumMin', 'Lower end of the optimum range').nullable().optional(),
    optimumMax: salinity('optimumMax', 'Upper end of the optimum range').nullable().optional(),
  })
  .superRefine((value, ctx) => {
    if (
      value.acuteLowerSalinity !== undefined &&
      value.chronicLowerSalinity !== undefined &&
      value.acuteLowerSalinity > value.chronicLowerSalinity
    ) {
      ctx.addIssue({
        code: 'custom',
        path: ['acuteLowerSalinity'],
        message: `acuteLowerSalinity must be at or below chronicLowerSalinity (${value.chronicLowerSalinity} psu)`,
      });
    }
    if (
      value.optimumMin !== undefined &&
      value.optimumMin !== null &&
      value.optimumMax !== undefined &&
      value.optimumMax !== null &&
      value.optimumMin >= value.optimumMax
    ) {
      ctx.addIssue({
        code: 'custom',
        path: ['optimumMin'],
        message: `optimumMin must be below optimumMax (${value.optimumMax} psu)`,
      });
    }
  })
  .describe('Changes to a species’ salinity tolerance; unchanged fields keep the table’s screening defaults');

/** Inferred type of {@link speciesToleranceOverridesSchema}. */
export type SpeciesToleranceOverridesBody = z.infer<typeof speciesToleranceOverridesSchema>;

const cutPoint = (field: string, meaning: string) =>
  z
    .number({ error: `${field} must be a number` })
    .gt(0, { error: `${field} must be more than 0 and at most 1` })
    .max(1, { error: `${field} must be more than 0 and at most 1` })
    .describe(`${meaning}; score on 0..1`);

/**
 * Rating cut points on the 0..1 score; any subset may be given, and those given must rise
 * (moderate < high < severe). Defaults 0.10 / 0.30 / 0.60, (c) screening defaults.
 *
 * @example
 * scoringCutPointsSchema.parse({ high: 0.35 });
 */
export const scoringCutPointsSchema = z
  .strictObject({
    moderate: cutPoint('cutPoints.moderate', 'Lowest score rated Moderate').optional(),
    high: cutPoint('cutPoints.high', 'Lowest score rated High').optional(),
    severe: cutPoint('cutPoints.severe', 'Lowest score rated Severe').optional(),
  })
  .superRefine((value, ctx) => {
    const given = (['moderate', 'high', 'severe'] as const).filter((key) => value[key] !== undefined);
    for (let i = 1; i < given.length; i++) {
      const lower = given[i - 1];
      const upper = given[i];
      if ((value[lower] as number) >= (value[upper] as number)) {
        ctx.addIssue({
          code: 'custom',
          path: [upper],
          message: `cutPoints.${upper} must be above cutPoints.${lower} (${value[lower]})`,
        });
      }
    }
  })
  .describe('Score cut points between the ratings Low, Moderate, High and Severe');

/**
 * Scoring settings overrides; all fields optional (see shared/scoring/score-lease.ts).
 *
 * @example
 * scoringSettingsSchema.parse({ cutPoints: { severe: 0.7 }, indicatorReferenceDays: 14 });
 */
export const scoringSettingsSchema = z
  .strictObject({
    cutPoints: scoringCutPointsSchema.optional(),
    severityFloor: z
      .number({ error: 'severityFloor must be a number' })
      .min(0, { error: 'severityFloor must be from 0 to 1' })
      .max(1, { error: 'severityFloor must be from 0 to 1' })
      .describe('Severity just past a threshold, 0–1 (default 0.5)')
      .optional(),
    indicatorFullSeverityRatio: z
      .number({ error: 'indicatorFullSeverityRatio must be a number' })
      .gt(1, { error: 'indicatorFullSeverityRatio must be above 1 and at most 1e6' })
      .max(1e6, { error: 'indicatorFullSeverityRatio must be above 1 and at most 1e6' })
      .describe('Indicator-to-threshold ratio at which indicator severity reaches 1 (default 10)')
      .optional(),
    indicatorReferenceDays: days(
      'indicatorReferenceDays',
      'Flood days at which the indicator duration term reaches 1 (default 7)',
    ).optional(),
    bandLayout: z
      .enum(['nested', 'disjoint'], { error: "bandLayout must be 'nested' or 'disjoint'" })
      .describe('Whether plume bands nest (each from the coast out) or are disjoint rings (default nested)')
      .optional(),
  })
  .describe('Changes to how lease scores are computed');

/** Inferred type of {@link scoringSettingsSchema}. */
export type ScoringSettingsBody = z.infer<typeof scoringSettingsSchema>;

/**
 * Indicator screening thresholds per 100 mL: approved (default 14) and restricted (default
 * 88); each above 0 and at most 1e7, approved below restricted when both are given.
 *
 * @example
 * indicatorThresholdsSchema.parse({ approved: 20 });
 */
export const indicatorThresholdsSchema = z
  .strictObject({
    approved: z
      .number({ error: 'approved must be a number (per 100 mL)' })
      .gt(0, { error: 'approved must be above 0 and at most 1e7 per 100 mL' })
      .max(1e7, { error: 'approved must be above 0 and at most 1e7 per 100 mL' })
      .describe('Threshold of the band "indicator above the approved-area standard", per 100 mL (default 14)')
      .optional(),
    restricted: z
      .number({ error: 'restricted must be a number (per 100 mL)' })
      .gt(0, { error: 'restricted must be above 0 and at most 1e7 per 100 mL' })
      .max(1e7, { error: 'restricted must be above 0 and at most 1e7 per 100 mL' })
      .describe('Threshold of the band "indicator above the restricted-area standard", per 100 mL (default 88)')
      .optional(),
  })
  .superRefine((value, ctx) => {
    if (value.approved !== undefined && value.restricted !== undefined && value.approved >= value.restricted) {
      ctx.addIssue({
        code: 'custom',
        path: ['approved'],
        message: `approved must be below restricted (${value.restricted} per 100 mL)`,
      });
    }
  })
  .describe('Indicator screening thresholds for the map bands and the lease score');

/**
 * A request to rescore with the user's settings: species, tolerance overrides, scoring
 * settings and indicator thresholds.
 *
 * @example
 * scoringOverridesSchema.parse({ speciesId: 'pacific-oyster', tolerance: { chronicLowerSalinity: 12 } });
 */
export const scoringOverridesSchema = z
  .strictObject({
    speciesId: z
      .enum(SPECIES_IDS, { error: `speciesId must be one of ${SPECIES_IDS.join(', ')}` })
      .describe('Species whose tolerance applies')
      .optional(),
    tolerance: speciesToleranceOverridesSchema.optional(),
    settings: scoringSettingsSchema.optional(),
    indicatorThresholds: indicatorThresholdsSchema.optional(),
  })
  .describe('User changes to the screening defaults of the lease score');

/** Inferred type of {@link scoringOverridesSchema}. */
export type ScoringOverridesBody = z.infer<typeof scoringOverridesSchema>;
