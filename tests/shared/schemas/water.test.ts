import { describe, expect, it } from 'vitest';
import { WaterRequestSchema, WaterResponseSchema } from '../../../shared/schemas/water';

function messages(input: unknown): string[] {
  const result = WaterRequestSchema.safeParse(input);
  return result.success ? [] : result.error.issues.map((issue) => issue.message);
}

describe('WaterRequestSchema', () => {
  it('accepts a valid body with and without the optional fields', () => {
    expect(WaterRequestSchema.parse({ salinity: 34, temperature: 10 })).toEqual({ salinity: 34, temperature: 10 });
    expect(WaterRequestSchema.safeParse({ salinity: 0, temperature: -2, pressureDbar: 11000, latitude: -90 }).success).toBe(true);
  });

  it.each([
    // Ranges: EOS-80 validity, science.md §2.1 (a); pressure to 11 000 dbar by contract
    { body: { salinity: 43, temperature: 10 }, message: 'salinity must be between 0 and 42 (practical salinity, PSS-78)' },
    { body: { salinity: 34, temperature: 41 }, message: 'temperature must be between -2 and 40 °C (ITS-90)' },
    { body: { salinity: 34, temperature: 10, pressureDbar: -1 }, message: 'pressureDbar must be between 0 and 11000 dbar' },
    { body: { salinity: 34, temperature: 10, latitude: 91 }, message: 'latitude must be between -90 and 90 degrees' },
    { body: { temperature: 10 }, message: 'salinity is required (between 0 and 42 (practical salinity, PSS-78))' },
    { body: { salinity: '34', temperature: 10 }, message: 'salinity must be a number (between 0 and 42 (practical salinity, PSS-78))' },
    { body: { salinity: 34, temperature: 10, depth: 3 }, message: 'water request has unknown field(s): depth' },
    { body: 'salty', message: 'water request must be a JSON object' },
  ])('refuses $body', ({ body, message }) => {
    expect(messages(body)).toContain(message);
  });

  it('describes each field with its unit', () => {
    expect(WaterRequestSchema.shape.temperature.description).toMatch(/°C \(ITS-90\)/);
    expect(WaterRequestSchema.shape.pressureDbar.description).toMatch(/dbar/);
  });
});

describe('WaterResponseSchema', () => {
  it('requires density, coriolis optional', () => {
    expect(WaterResponseSchema.safeParse({ density: 1026.17 }).success).toBe(true);
    expect(WaterResponseSchema.safeParse({ density: 1026.17, coriolis: 1e-4 }).success).toBe(true);
    expect(WaterResponseSchema.safeParse({ coriolis: 1e-4 }).success).toBe(false);
  });
});
