import { describe, expect, it } from 'vitest';
import {
  densityEos80,
  its90ToIpts68,
  seawaterDensity,
  secantBulkModulus,
  sigmaEos80,
  specificVolumeAnomaly,
  surfaceDensityEos80,
} from '../../../shared/physics/eos80';
import { expectWithin } from './tolerance';

describe('densityEos80: UNESCO 44 p. 19 check table', () => {
  // Rows: S, t68 [°C], p [dbar], ρ [kg m⁻³], K [bar].
  // Every row: UNESCO 1983 Tech. Paper 44 p. 19 check value (a), science.md §2.1 table and §8 #1–#7.
  it.each([
    // science.md §8 #1 (a): ρ(0, 5, 0) and §8 #7 (a): K(0, 5, 0)
    { s: 0, t: 5, p: 0, rho: 999.96675, k: 20337.80375 },
    // science.md §8 #6 (a): ρ(0, 5, 10000); K from the §2.1 table (a)
    { s: 0, t: 5, p: 10000, rho: 1044.12802, k: 23643.52599 },
    // science.md §8 #4 (a): ρ(0, 25, 0); K from the §2.1 table (a)
    { s: 0, t: 25, p: 0, rho: 997.04796, k: 22100.72106 },
    // science.md §8 #6 (a): ρ(0, 25, 10000); K from the §2.1 table (a)
    { s: 0, t: 25, p: 10000, rho: 1037.90204, k: 25405.09717 },
    // science.md §8 #2 (a): ρ(35, 5, 0); K from the §2.1 table (a)
    { s: 35, t: 5, p: 0, rho: 1027.67547, k: 22185.93358 },
    // science.md §8 #6 (a): ρ(35, 5, 10000); K from the §2.1 table (a)
    { s: 35, t: 5, p: 10000, rho: 1069.48914, k: 25577.49819 },
    // science.md §8 #3 (a): ρ(35, 25, 0); K from the §2.1 table (a)
    { s: 35, t: 25, p: 0, rho: 1023.34306, k: 23726.34949 },
    // science.md §8 #5 (a): ρ(35, 25, 10000) and §8 #7 (a): K(35, 25, 1000 bar)
    { s: 35, t: 25, p: 10000, rho: 1062.53817, k: 27108.94504 },
  ])('S=$s t68=$t p=$p dbar → ρ=$rho, K=$k', ({ s, t, p, rho, k }) => {
    // Tolerances from science.md §8 #1–#6 (1e-5 kg m⁻³) and #7 (1e-4 bar).
    expectWithin(densityEos80(s, t, p), rho, 1e-5);
    expectWithin(secantBulkModulus(s, t, p), k, 1e-4);
  });

  it('surface density equals the p = 0 in-situ density', () => {
    // UNESCO 1983 Tech. Paper 44 check value (a), science.md §8 #3: ρ(35, 25, 0) = 1023.34306
    expectWithin(surfaceDensityEos80(35, 25), 1023.34306, 1e-5);
    expect(surfaceDensityEos80(20, 12)).toBe(densityEos80(20, 12, 0));
  });
});

describe('sigmaEos80 and specificVolumeAnomaly', () => {
  it('σ(40, 40, 10000) = 59.82037 kg m⁻³', () => {
    // science.md §8 #8 (a): UNESCO 44 σ check value, tolerance 2e-5
    expectWithin(sigmaEos80(40, 40, 10000), 59.82037, 2e-5);
  });

  it.each([
    // science.md §8 #9 (a): SVAN(40, 40, 10000) = 981.30210e-8 m³ kg⁻¹ (most sources), tolerance 3e-12
    { expected: 981.3021e-8, tolerance: 3e-12 },
    // science.md §2.1 (a): one Fortran source lists 981.30190e-8; (c) computed value equals it
    { expected: 981.3019e-8, tolerance: 3e-12 },
  ])('SVAN(40, 40, 10000) ≈ $expected', ({ expected, tolerance }) => {
    expectWithin(specificVolumeAnomaly(40, 40, 10000), expected, tolerance);
  });

  it('SVAN of the reference water (35, 0, p) is zero', () => {
    // (c) derived: definition SVAN = v(S,t,p) − v(35,0,p)
    expect(specificVolumeAnomaly(35, 0, 5000)).toBe(0);
  });
});

describe('its90ToIpts68 and seawaterDensity (ITS-90 input)', () => {
  it.each([
    // science.md §8 #10 (a): t68 = 1.00024 t90, exact
    { t90: 0, t68: 0 },
    { t90: 10, t68: 10.0024 },
    { t90: -2, t68: -2.00048 },
    { t90: 40, t68: 40.0096 },
  ])('t90=$t90 → t68=$t68', ({ t90, t68 }) => {
    expect(its90ToIpts68(t90)).toBe(1.00024 * t90);
    expectWithin(its90ToIpts68(t90), t68, 1e-12);
  });

  it('ρ(S = 34, T90 = 10, 0) = 1026.1711 kg m⁻³', () => {
    // science.md §8 #11 (c): computed with t90 converted to t68, tolerance 1e-3
    expectWithin(seawaterDensity(34, 10), 1026.1711, 1e-3);
  });

  it.each([
    // science.md §2.1 surface density table (c, computed), tolerance 1e-4 on printed 4 decimals
    { s: 0, t: 5, rho: 999.9667 },
    { s: 0, t: 20, rho: 998.2053 },
    { s: 10, t: 15, rho: 1006.7833 },
    { s: 20, t: 10, rho: 1015.269 },
    { s: 30, t: 5, rho: 1023.7137 },
    { s: 32, t: 15, rho: 1023.6602 },
    { s: 35, t: 20, rho: 1024.7617 },
  ])('surface table: S=$s T90=$t → $rho', ({ s, t, rho }) => {
    expectWithin(seawaterDensity(s, t), rho, 1e-4);
  });
});

describe('range checks', () => {
  it.each([
    { call: () => densityEos80(-0.1, 10, 0), message: /salinity must be between 0 and 42/ },
    { call: () => densityEos80(42.5, 10, 0), message: /salinity must be between 0 and 42/ },
    { call: () => densityEos80(35, 41, 0), message: /temperature68 must be between/ },
    { call: () => densityEos80(35, 10, -1), message: /pressureDbar must be between 0 and 11000 dbar/ },
    { call: () => densityEos80(35, 10, 12000), message: /pressureDbar must be between 0 and 11000 dbar/ },
    { call: () => seawaterDensity(35, 40.5), message: /temperature must be between -2 and 40 °C \(ITS-90\)/ },
    { call: () => seawaterDensity(Number.NaN, 10), message: /salinity must be between 0 and 42/ },
    { call: () => its90ToIpts68(Number.POSITIVE_INFINITY), message: /t90 must be a finite temperature/ },
  ])('throws $message', ({ call, message }) => {
    expect(call).toThrow(message);
  });

  it('accepts the ITS-90 range ends and the 11 000 dbar extension', () => {
    // (c) common practice: the API accepts −2…40 °C ITS-90 and up to 11 000 dbar
    expect(Number.isFinite(seawaterDensity(0, -2))).toBe(true);
    expect(Number.isFinite(seawaterDensity(42, 40, 11000))).toBe(true);
  });
});
