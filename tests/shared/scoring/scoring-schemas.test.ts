import { describe, expect, it } from 'vitest';
import { getSpeciesTolerance } from '../../../shared/biology/species-tolerance';
import { indicatorBands } from '../../../shared/biology/water-standards';
import { resolveScoringSettings } from '../../../shared/scoring/score-lease';
import {
  indicatorThresholdsSchema,
  scoringCutPointsSchema,
  scoringOverridesSchema,
  scoringSettingsSchema,
  speciesToleranceOverridesSchema,
} from '../../../shared/schemas/scoring';

const firstMessage = (result: { success: boolean; error?: { issues: { message: string }[] } }) => result.error?.issues[0]?.message;

describe('speciesToleranceOverridesSchema', () => {
  it('accepts a partial override that the lookup then applies', () => {
    // science.md §4.1 (c): Pacific oyster chronic default 15, user sets 12
    const body = speciesToleranceOverridesSchema.parse({ chronicLowerSalinity: 12, optimumMin: null });
    expect(getSpeciesTolerance('pacific-oyster', body).chronicLowerSalinity).toBe(12);
  });

  it.each([
    [{ chronicLowerSalinity: 46 }, 'chronicLowerSalinity must be from 0 to 45 psu'],
    [{ acuteDurationDays: 0 }, 'acuteDurationDays must be more than 0 and at most 365 days'],
    [{ acuteLowerSalinity: 12, chronicLowerSalinity: 10 }, 'acuteLowerSalinity must be at or below chronicLowerSalinity (10 psu)'],
    [{ optimumMin: 30, optimumMax: 20 }, 'optimumMin must be below optimumMax (20 psu)'],
    [{ chronicLowerSalinity: '12' }, 'chronicLowerSalinity must be a number (psu)'],
  ])('rejects %o with a message naming the field', (body, message) => {
    expect(firstMessage(speciesToleranceOverridesSchema.safeParse(body))).toBe(message);
  });

  it('rejects unknown fields (strict)', () => {
    expect(speciesToleranceOverridesSchema.safeParse({ lethalSalinity: 3 }).success).toBe(false);
  });
});

describe('scoring settings schemas', () => {
  it('accepts partial cut points that resolve with the defaults', () => {
    // (c) default cut points 0.1 / 0.3 / 0.6
    const body = scoringSettingsSchema.parse({ cutPoints: { severe: 0.7 }, bandLayout: 'disjoint' });
    expect(resolveScoringSettings(body).cutPoints).toEqual({ moderate: 0.1, high: 0.3, severe: 0.7 });
  });

  it.each([
    [{ high: 0 }, 'cutPoints.high must be more than 0 and at most 1'],
    [{ moderate: 0.4, high: 0.3 }, 'cutPoints.high must be above cutPoints.moderate (0.4)'],
    [{ moderate: 0.2, severe: 0.2 }, 'cutPoints.severe must be above cutPoints.moderate (0.2)'],
  ])('rejects cut points %o', (body, message) => {
    expect(firstMessage(scoringCutPointsSchema.safeParse(body))).toBe(message);
  });

  it.each([
    [{ severityFloor: 2 }, 'severityFloor must be from 0 to 1'],
    [{ indicatorFullSeverityRatio: 1 }, 'indicatorFullSeverityRatio must be above 1 and at most 1e6'],
    [{ indicatorReferenceDays: 400 }, 'indicatorReferenceDays must be more than 0 and at most 365 days'],
    [{ bandLayout: 'rings' }, "bandLayout must be 'nested' or 'disjoint'"],
  ])('rejects settings %o', (body, message) => {
    expect(firstMessage(scoringSettingsSchema.safeParse(body))).toBe(message);
  });

  it('validates indicator thresholds and the combined request', () => {
    // science.md §6.1: approved 14 (a), restricted 88 (b); user override 20
    const thresholds = indicatorThresholdsSchema.parse({ approved: 20 });
    expect(indicatorBands(thresholds)[0].threshold).toBe(20);
    expect(firstMessage(indicatorThresholdsSchema.safeParse({ approved: 100, restricted: 88 }))).toBe(
      'approved must be below restricted (88 per 100 mL)',
    );
    expect(scoringOverridesSchema.parse({ speciesId: 'manila-clam', tolerance: { chronicDurationDays: 10 } }).speciesId).toBe(
      'manila-clam',
    );
    expect(firstMessage(scoringOverridesSchema.safeParse({ speciesId: 'giant-clam' }))).toMatch(
      /^speciesId must be one of pacific-oyster, /,
    );
  });
});
