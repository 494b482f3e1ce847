import { describe, expect, it } from 'vitest';
import { decayRate, dielDecayRate, manciniDarkDecayRate, survivingFraction, t90FromRate } from '../../../shared/physics/decay';
import { expectWithin } from './tolerance';

const HOUR = 3600;
const DAY = 86400;

describe('first-order decay', () => {
  it('T90 = 6 h → k = 0.38376 h⁻¹; C/C0 after 12 h = 0.01', () => {
    // science.md §8 #31 (c): k = ln10/T90, tolerance 1e-5
    expectWithin(decayRate(6 * HOUR) * HOUR, 0.38376, 1e-5);
    expectWithin(survivingFraction(decayRate(6 * HOUR), 12 * HOUR), 0.01, 1e-5);
  });

  it.each([
    // (c) definition: after one T90 the surviving fraction is 0.1
    { t90: 1 * HOUR },
    { t90: 48 * HOUR },
    { t90: 39.5 * HOUR },
  ])('C/C0 after one T90 = 0.1 and T90 round-trips (T90 = $t90 s)', ({ t90 }) => {
    expectWithin(survivingFraction(decayRate(t90), t90), 0.1, 1e-12);
    expectWithin(t90FromRate(decayRate(t90)), t90, 1e-9);
  });

  it('no decay at k = 0 or t = 0', () => {
    // (c) definition
    expect(survivingFraction(0, 1e6)).toBe(1);
    expect(survivingFraction(1e-3, 0)).toBe(1);
  });
});

describe('dielDecayRate', () => {
  it.each([
    // (c) derived: d · ln10/T90_day + (1 − d) · ln10/T90_night with the science.md §5.2 defaults 6 h / 48 h
    { d: 0.5, expected: 0.5 * (Math.LN10 / 6) + 0.5 * (Math.LN10 / 48) },
    { d: 0, expected: Math.LN10 / 48 },
    { d: 1, expected: Math.LN10 / 6 },
    { d: 14 / 24, expected: (14 / 24) * (Math.LN10 / 6) + (10 / 24) * (Math.LN10 / 48) },
  ])('daylight fraction $d', ({ d, expected }) => {
    const k = dielDecayRate({ t90Day: 6 * HOUR, t90Night: 48 * HOUR, daylightFraction: d }) * HOUR;
    expectWithin(k, expected, 1e-12);
  });

  it('over a whole day equals 12 h of day decay then 12 h of night decay', () => {
    // (c) derived: exp(−k_eff · 24 h) = exp(−k_day · 12 h) · exp(−k_night · 12 h)
    const k = dielDecayRate({ t90Day: 6 * HOUR, t90Night: 48 * HOUR, daylightFraction: 0.5 });
    const stepwise =
      survivingFraction(decayRate(6 * HOUR), 12 * HOUR) * survivingFraction(decayRate(48 * HOUR), 12 * HOUR);
    expectWithin(survivingFraction(k, 24 * HOUR), stepwise, 1e-15);
  });

  it('rejects a daylight fraction above 1', () => {
    expect(() => dielDecayRate({ t90Day: 1, t90Night: 2, daylightFraction: 1.5 })).toThrow(
      /daylightFraction must be between 0 and 1/,
    );
  });
});

describe('manciniDarkDecayRate', () => {
  it.each([
    // science.md §8 #32 (b, formula from memory): full seawater at 20 °C, k = 1.4 d⁻¹, T90 = 39.5 h (0.1 h)
    { percent: 100, kPerDay: 1.4, t90Hours: 39.5 },
    // science.md §8 #32 (b): fresh water at 20 °C, k = 0.8 d⁻¹, T90 = 69.1 h (0.1 h)
    { percent: 0, kPerDay: 0.8, t90Hours: 69.1 },
  ])('$percent % seawater at 20 °C', ({ percent, kPerDay, t90Hours }) => {
    const k = manciniDarkDecayRate(percent, 20);
    expectWithin(k * DAY, kPerDay, 1e-12);
    expectWithin(t90FromRate(k) / HOUR, t90Hours, 0.1);
  });

  it('rises by 7 % per °C', () => {
    // science.md §5.1 (b): factor 1.07^(T − 20)
    expectWithin(manciniDarkDecayRate(50, 21) / manciniDarkDecayRate(50, 20), 1.07, 1e-12);
  });
});
