import { describe, expect, it } from 'vitest';
import { computePlume } from '../../../shared/physics/compute-plume';
import { type PlumeRequest, PlumeRequestSchema, PlumeResponseSchema } from '../../../shared/schemas/plume';

const GEOMETRY = { latitude: 43.5, discharge: 900, mouthWidth: 1500, mouthDepth: 6 };
const WATER = { riverSalinity: 0, riverTemperature: 12, seaSalinity: 34, seaTemperature: 10 };

function messages(input: unknown): string[] {
  const result = PlumeRequestSchema.safeParse(input);
  return result.success ? [] : result.error.issues.map((issue) => issue.message);
}

describe('PlumeRequestSchema', () => {
  it.each([
    { body: { ...GEOMETRY, ...WATER } },
    { body: { ...GEOMETRY, reducedGravity: 0.19 } },
    { body: { ...GEOMETRY, ...WATER, shelfSlope: 0, alongshoreShare: 0.3, floodDurationHours: 48 } },
    { body: { ...GEOMETRY, reducedGravity: 0.19, shelfSlope: 0.5, alongshoreShare: 1 } },
  ])('accepts $body', ({ body }) => {
    expect(PlumeRequestSchema.safeParse(body).success).toBe(true);
  });

  it.each([
    {
      body: { ...GEOMETRY },
      message:
        'give either the four water properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) or reducedGravity (missing: riverSalinity, riverTemperature, seaSalinity, seaTemperature)',
    },
    {
      body: { ...GEOMETRY, riverSalinity: 0, seaSalinity: 34, seaTemperature: 10 },
      message:
        'give either the four water properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) or reducedGravity (missing: riverTemperature)',
    },
    {
      body: { ...GEOMETRY, ...WATER, reducedGravity: 0.19 },
      message:
        'give either the four water properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) or reducedGravity, not both (got reducedGravity and riverSalinity, riverTemperature, seaSalinity, seaTemperature)',
    },
    { body: { ...GEOMETRY, ...WATER, discharge: 0 }, message: 'discharge must be greater than 0 m³/s' },
    { body: { ...GEOMETRY, ...WATER, mouthWidth: -5 }, message: 'mouthWidth must be greater than 0 m' },
    { body: { ...GEOMETRY, ...WATER, mouthDepth: 0 }, message: 'mouthDepth must be greater than 0 m' },
    { body: { ...GEOMETRY, ...WATER, latitude: -91 }, message: 'latitude must be between -90 and 90 degrees' },
    { body: { ...GEOMETRY, ...WATER, shelfSlope: 0.6 }, message: 'shelfSlope must be between 0 and 0.5' },
    // science.md §1.6 (c): 0.3 ≤ F_cc ≤ 1
    { body: { ...GEOMETRY, ...WATER, alongshoreShare: 0.2 }, message: 'alongshoreShare must be between 0.3 and 1' },
    { body: { ...GEOMETRY, ...WATER, floodDurationHours: 0 }, message: 'floodDurationHours must be greater than 0 h' },
    { body: { ...GEOMETRY, reducedGravity: 0 }, message: 'reducedGravity must be greater than 0 m/s²' },
    { body: { ...GEOMETRY, ...WATER, seaSalinity: 50 }, message: 'seaSalinity must be between 0 and 42 (practical salinity, PSS-78)' },
    { body: { ...GEOMETRY, ...WATER, riverTemperature: -3 }, message: 'riverTemperature must be between -2 and 40 °C (ITS-90)' },
    { body: { ...GEOMETRY, ...WATER, wind: 5 }, message: 'plume request has unknown field(s): wind' },
  ])('refuses with "$message"', ({ body, message }) => {
    expect(messages(body)).toContain(message);
  });

  it('a parsed body runs through computePlume and the result satisfies the response schema', () => {
    const body: PlumeRequest = PlumeRequestSchema.parse({ ...GEOMETRY, ...WATER, shelfSlope: 2e-3, floodDurationHours: 24 });
    const result = computePlume(body);
    const parsed = PlumeResponseSchema.parse(result);
    expect(parsed.regime).toBe('surface-advected');
    expect(parsed.turnsTo).toBe('right');
    // extra fields are allowed and kept; science.md §1.6 (b/c): Q_cc = 0.6 × 900 = 540 m³/s by default
    expect((parsed as Record<string, unknown>).alongshoreDischarge).toBeCloseTo(540, 9);
  });

  it('the response schema requires the contract names', () => {
    const result = computePlume({ ...GEOMETRY, reducedGravity: 0.19 });
    for (const key of ['coriolis', 'reducedGravity', 'regime', 'depth', 'width', 'meanSpeed', 'noseSpeed', 'bulgeOffshoreExtent', 'bottomAttachmentDepth', 'turnsTo', 'warnings'] as const) {
      const { [key]: _dropped, ...rest } = result;
      expect(PlumeResponseSchema.safeParse(rest).success, key).toBe(false);
    }
    expect(PlumeResponseSchema.safeParse({ ...result, turnsTo: 'up' }).success).toBe(false);
  });
});

describe('descriptions', () => {
  it('every request field carries a description with its unit', () => {
    for (const [key, field] of Object.entries(PlumeRequestSchema.shape)) {
      expect(field.description, key).toBeTruthy();
    }
    expect(PlumeRequestSchema.shape.discharge.description).toMatch(/m³\/s/);
    expect(PlumeRequestSchema.shape.floodDurationHours.description).toMatch(/\(h\)/);
  });
});
