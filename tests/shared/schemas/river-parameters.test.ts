import { describe, expect, it } from 'vitest';
import { exposureParameters } from '../../../shared/physics/exposure-field';
import {
  IndicatorSpecSchema,
  RIVER_PARAMETER_DEFAULTS,
  type RiverParameters,
  RiverParametersSchema,
} from '../../../shared/schemas/river-parameters';

function messages(input: unknown): string[] {
  const result = RiverParametersSchema.safeParse(input);
  return result.success ? [] : result.error.issues.map((issue) => issue.message);
}

describe('RiverParametersSchema', () => {
  it('fills every default from RIVER_PARAMETER_DEFAULTS', () => {
    const parsed = RiverParametersSchema.parse({});
    // science.md §1.6 (b) 0.6; §5.2 (c) 6 h / 48 h; §5.3 (c) 1e4; entrainment coefficient 3e-5 (b, §1.11); daylight 0.5 (c)
    expect(parsed).toEqual({
      entrainmentCoefficient: 3e-5,
      t90DayHours: 6,
      t90NightHours: 48,
      daylightFraction: 0.5,
      indicator: { kind: 'constant', concentration: 1e4 },
      alongshoreShare: 0.6,
    });
    for (const [key, entry] of Object.entries(RIVER_PARAMETER_DEFAULTS)) {
      expect(parsed[key as keyof RiverParameters]).toEqual(entry.value);
      expect(['a', 'b', 'c']).toContain(entry.label);
      expect(entry.source.length).toBeGreaterThan(10);
    }
    expect(RIVER_PARAMETER_DEFAULTS.alongshoreShare.label).toBe('b');
  });

  it('accepts a power-law indicator', () => {
    const parsed = RiverParametersSchema.parse({ indicator: { kind: 'power-law', coefficient: 5, exponent: 1.2 } });
    expect(parsed.indicator).toEqual({ kind: 'power-law', coefficient: 5, exponent: 1.2 });
  });

  it.each([
    { body: { entrainmentCoefficient: 0 }, message: 'entrainmentCoefficient must be between 0.000001 and 0.001' },
    { body: { t90DayHours: -1 }, message: 't90DayHours must be greater than 0 and at most 10000 h' },
    { body: { t90NightHours: 0 }, message: 't90NightHours must be greater than 0 and at most 10000 h' },
    { body: { daylightFraction: 1.1 }, message: 'daylightFraction must be between 0 and 1' },
    { body: { alongshoreShare: 1.5 }, message: 'alongshoreShare must be between 0.3 and 1' },
    { body: { indicator: { kind: 'constant', concentration: -3 } }, message: 'indicator.concentration must be between 0 and 1000000000 per 100 mL' },
    { body: { indicator: { kind: 'power-law', coefficient: 1, exponent: 9 } }, message: 'indicator.exponent must be between -5 and 5' },
    { body: { indicator: { kind: 'table' } }, message: "indicator.kind must be 'constant' or 'power-law'" },
    { body: { colour: 'blue' }, message: 'river parameters has unknown field(s): colour' },
  ])('refuses $body', ({ body, message }) => {
    expect(messages(body)).toContain(message);
  });

  it('parsed parameters feed the exposure field', () => {
    const parsed = RiverParametersSchema.parse({ t90DayHours: 6, t90NightHours: 6 });
    const params = exposureParameters(parsed, { seaSalinity: 34, riverSalinity: 0 }, 900);
    // science.md §8 #31 (c): T90 = 6 h → k = 0.38376 h⁻¹
    expect(params.decayRate * 3600).toBeCloseTo(0.38376, 5);
    expect(IndicatorSpecSchema.safeParse({ kind: 'constant', concentration: 10 }).success).toBe(true);
  });
});
