import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { describe, expect, it } from 'vitest';
import {
  calibratePlume,
  type PlumeFieldSettings,
  type PlumeObservation,
  predictPlumeObservation,
} from '../../../shared/calibration/calibrate-plume';
import type { FieldPlume } from '../../../shared/physics/exposure-field';

const SETTINGS: PlumeFieldSettings = { seaSalinity: 34, riverSalinity: 0, sourceFreshwaterFraction: 0.8 };
const TRUTH = { entrainmentCoefficient: 3e-5, t90Hours: 20 };

/** Invented plume scales that grow with flow, (c) synthetic stand-ins for computed plumes. */
function plumeFor(flow: number): FieldPlume {
  return {
    regime: 'surface-advected',
    depth: 0.3 + flow / 2000,
    width: 3000 + 2 * flow,
    meanSpeed: 0.12 + flow / 10_000,
    noseSpeed: 0.18 + flow / 8000,
    bulgeOffshoreExtent: 8000 + 4 * flow,
  };
}

function makeObservations(seed: number, count: number): PlumeObservation[] {
  const rng = xoroshiro128plus(seed);
  const uniform = () => uniformFloat64(rng);
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  const out: PlumeObservation[] = [];
  for (let i = 0; i < count; i++) {
    const flow = 200 + 1800 * uniform();
    const plume = plumeFor(flow);
    const place = { along: -8000 + 68_000 * uniform(), offshore: 1.2 * plume.width * uniform(), plume, riverIndicator: 2e4 };
    const truth = predictPlumeObservation(TRUTH, SETTINGS, { ...place, salinity: { value: 0 } });
    const salinity = Math.min(45, Math.max(0, (truth.salinity as number) + 0.5 * normal()));
    const c = truth.indicator as number;
    const noisy = c > 0 ? 10 ** (Math.log10(c) + 0.15 * normal()) : 0;
    const indicator = noisy < 2 ? { value: 2, censored: 'below' as const } : { value: noisy };
    out.push({ ...place, salinity: { value: salinity }, indicator });
  }
  return out;
}

describe('calibratePlume (adapter over shared/physics/exposure-field fieldAt)', () => {
  it('predicts the mixing line at the mouth', () => {
    // (c) science.md §2.4 mixing line: φ = 0.8 at s = 0, x = 0 → S = 0.2 × 34 = 6.8; C = 0.8 × 2e4
    const plume = plumeFor(1000);
    const p = predictPlumeObservation(TRUTH, SETTINGS, { along: 0, offshore: 0, plume, riverIndicator: 2e4, salinity: { value: 1 } });
    expect(p.salinity).toBeCloseTo(6.8, 10);
    expect(p.indicator).toBeCloseTo(16_000, 6);
  });

  it('recovers E and T90 within 5 % from a poor start, with better skill', () => {
    // (c) synthetic truth E = 3e-5, T90 = 20 h; start E = 1.5e-4, T90 = 60 h; 150 observations on both sides of the mouth
    const observations = makeObservations(99, 150);
    const fit = calibratePlume({
      observations,
      settings: SETTINGS,
      entrainmentCoefficient: { initial: 1.5e-4, min: 1e-6, max: 1e-3 },
      t90Hours: { initial: 60, min: 0.5, max: 200 },
      seed: 11,
    });
    expect(Math.abs(fit.fitted.entrainmentCoefficient / TRUTH.entrainmentCoefficient - 1)).toBeLessThan(0.05);
    expect(Math.abs(fit.fitted.t90Hours / TRUTH.t90Hours - 1)).toBeLessThan(0.05);
    // Nash–Sutcliffe skill, (a) Nash & Sutcliffe 1970
    expect(fit.after.salinity.skill as number).toBeGreaterThan(fit.before.salinity.skill as number);
    expect(fit.after.indicator.skill as number).toBeGreaterThan(fit.before.indicator.skill as number);
    expect(fit.converged).toBe(true);
  });

  it('rejects bad settings and places', () => {
    const observations = makeObservations(1, 3);
    const base = {
      observations,
      settings: SETTINGS,
      entrainmentCoefficient: { initial: 1.5e-4, min: 1e-6, max: 1e-3 },
      t90Hours: { initial: 60, min: 0.5, max: 200 },
    };
    expect(() => calibratePlume({ ...base, settings: { seaSalinity: 0, riverSalinity: 5 } })).toThrow(
      /settings.seaSalinity must be above settings.riverSalinity/,
    );
    expect(() => calibratePlume({ ...base, observations: [{ ...observations[0], along: Number.NaN }] })).toThrow(
      /observations\[0\].along must be a signed distance in m; got NaN/,
    );
  });
});
