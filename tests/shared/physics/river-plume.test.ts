/** The river plume and its profiles, shared by the server and the browser preview. */
import { describe, expect, it } from 'vitest';
import { computePlume } from '#shared/physics/compute-plume';
import { plumeProfiles, riverPlume } from '#shared/physics/river-plume';
import { applyRiverDefaults } from '#shared/schemas/river';

const { settings } = applyRiverDefaults({ name: 'Test', mouthLongitude: -38.6, mouthLatitude: 41.1, outflowAzimuthDeg: 270, mouthWidth: 450, mouthDepth: 5, shelfSlope: 0.004 });

describe('riverPlume', () => {
  it('runs the same chain as computePlume with the river’s settings', () => {
    const { plume } = riverPlume(settings, { discharge: 650, durationHours: 72 });
    const direct = computePlume({
      latitude: 41.1,
      discharge: 650,
      riverSalinity: settings.riverSalinity,
      riverTemperature: settings.riverTemperature,
      seaSalinity: settings.seaSalinity,
      seaTemperature: settings.seaTemperature,
      mouthWidth: 450,
      mouthDepth: 5,
      shelfSlope: 0.004,
      alongshoreShare: settings.alongshoreShare,
      floodDurationHours: 72,
    });
    expect(plume).toEqual(direct);
  });
});

describe('plumeProfiles', () => {
  const { plume, params } = riverPlume(settings, { discharge: 650, durationHours: 72 });
  const p = plumeProfiles(plume, params, 41);

  it('thickness is H0 at the coast and 0 at the front (zero-PV current, science.md §1.4, derived)', () => {
    expect(p.crossShore).toHaveLength(41);
    expect(p.crossShore[0].thickness).toBeCloseTo(plume.depth, 9);
    // h = H0 (1 − (x/W0)²): at x = W0/2 it is 3/4 of H0.
    // 41 points over 1.25 W0: point 16 is at W0/2.
    expect(p.crossShore[16].offshoreKm * 1000).toBeCloseTo(plume.width / 2, 6);
    expect(p.crossShore[16].thickness).toBeCloseTo(0.75 * plume.depth, 6);
    expect(p.crossShore.at(-1)!.thickness).toBe(0);
    expect(p.crossShore.at(-1)!.salinity).toBeCloseTo(settings.seaSalinity, 9);
  });

  it('salinity rises and the indicator falls away from the mouth along the coast', () => {
    expect(p.alongshore[0]).toMatchObject({ alongKm: 0 });
    // Undiluted river water at the mouth by default (near-field freshwater fraction 1).
    expect(p.alongshore[0].salinity).toBeCloseTo(settings.riverSalinity, 9);
    for (let i = 1; i < p.alongshore.length; i++) {
      expect(p.alongshore[i].salinity).toBeGreaterThanOrEqual(p.alongshore[i - 1].salinity);
      expect(p.alongshore[i].indicator).toBeLessThanOrEqual(p.alongshore[i - 1].indicator);
    }
    // The profile runs to the reach (nose speed × duration).
    expect(p.alongshore.at(-1)!.alongKm).toBeCloseTo(plume.reach! / 1000, 6);
  });
});
