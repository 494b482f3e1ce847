// Issue 14, science part: the answer depends on the side of the mouth, the distance and the
// flood size (science.md §1.11). A reproduction of the reported case, then property tests
// (fast-check, fixed seeds). The screening path is rebuilt here from the shared engine the
// server uses: footprint bands → band fractions of each lease → the lease's worst point in the
// plume's signed coordinates → scoreLease.
import { area as turfArea, featureCollection, intersect as turfIntersect } from '@turf/turf';
import fc from 'fast-check';
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { describe, expect, it } from 'vitest';
import { buildFootprint, type Footprint } from '../../../shared/geometry/build-footprint';
import { coastFrame, outlinePositions } from '../../../shared/geometry/coast-position';
import { localProjection } from '../../../shared/geometry/local-projection';
import { annualMaxima } from '../../../shared/hydrology/annual-maxima';
import { durationsForFlows, typicalDurationForPeak } from '../../../shared/hydrology/flood-duration';
import { fitFloodFrequency } from '../../../shared/hydrology/flood-frequency';
import { syntheticRecord } from '../../helpers/flood-record';
import type { PlumeResult } from '../../../shared/physics/compute-plume';
import { bulgeFraction, currentFraction, type ExposureParameters, fieldAt, worstField } from '../../../shared/physics/exposure-field';
import { type RiverPlumeSettings, riverPlume } from '../../../shared/physics/river-plume';
import { salinityBandId, screeningBandSpecs, strictestSpecies } from '../../../shared/scoring/lease-band-specs';
import { daysBelowTolerance, scoreLease } from '../../../shared/scoring/score-lease';

const INDICATOR_STANDARD = 14; // NSSP approved-area geometric mean (science.md §6.1, a), used as a screening threshold (c)
const SPECIES = strictestSpecies(); // the server's choice for a lease whose species is not set

/** An invented river at 41° S on a north–south coast with the sea to the west, mouth facing west. */
function southRiver(latitude = -41): RiverPlumeSettings & { mouthLongitude: number; outflowAzimuthDeg: number } {
  return {
    mouthLongitude: -38.6,
    mouthLatitude: latitude,
    outflowAzimuthDeg: 270,
    mouthWidth: 1000,
    mouthDepth: 3,
    shelfSlope: 0.005,
    riverSalinity: 0.1,
    riverTemperature: 10,
    seaSalinity: 34,
    seaTemperature: 10,
    alongshoreShare: 0.6,
    entrainmentCoefficient: 3e-5,
    t90DayHours: 6,
    t90NightHours: 48,
    daylightFraction: 0.5,
    indicator: { kind: 'constant', concentration: 1e4 },
    nearFieldFreshwaterFraction: 1,
  };
}

/** The coast: a straight north–south shoreline through the mouth, 3° of latitude either way. */
function coastThrough(lon: number, lat: number) {
  return { type: 'LineString' as const, coordinates: [[lon, lat - 3] as Position, [lon, lat + 3] as Position] };
}

/** A square lease `size` m across, its inner edge `offshore` m west of the coast, centred `north` m north of the mouth. */
function squareLease(mouth: [number, number], north: number, offshore: number, size = 300): Feature<Polygon> {
  const p = localProjection(mouth);
  const ring: Position[] = [
    [-offshore, north - size / 2],
    [-offshore - size, north - size / 2],
    [-offshore - size, north + size / 2],
    [-offshore, north + size / 2],
    [-offshore, north - size / 2],
  ].map((q) => p.inverse(q as [number, number]));
  return { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [ring] } };
}

/** Share of a lease inside a band (turf, geodesic areas). */
function fraction(lease: Feature<Polygon>, band: Feature<Polygon | MultiPolygon>): number {
  const g = band.geometry;
  if (g.type === 'MultiPolygon' ? g.coordinates.length === 0 : g.coordinates.length === 0) return 0;
  const cut = turfIntersect(featureCollection([lease, band as Feature<Polygon | MultiPolygon>]));
  return cut ? turfArea(cut) / turfArea(lease) : 0;
}

interface Screened {
  readonly lowestSalinity: number | null;
  readonly highestIndicator: number | null;
  readonly score: number;
  readonly rating: string;
}

/** The server's screening of one lease under one flow (server/services/screening.service.ts, screenFootprint). */
function screen(
  settings: ReturnType<typeof southRiver>,
  flow: { discharge: number; durationHours: number },
  lease: Feature<Polygon>,
  built?: { plume: PlumeResult; params: ExposureParameters; footprint: Footprint },
): Screened {
  const { plume, params, footprint } = built ?? buildFor(settings, flow);
  const band = (id: string) => footprint.bands.find((b) => b.properties.id === id) as Feature<Polygon | MultiPolygon>;
  const speciesBand = salinityBandId(SPECIES.chronicLowerSalinity);
  const fractions = {
    'plume-edge': fraction(lease, band('plume-edge')),
    [speciesBand]: fraction(lease, band(speciesBand)),
    'indicator-over-standard': fraction(lease, band('indicator-over-standard')),
  };
  const inPlume = fractions['plume-edge'] > 0;
  const days = flow.durationHours / 24;
  let lowestSalinity: number | null = null;
  let highestIndicator: number | null = null;
  if (inPlume) {
    const frame = coastFrame(footprint.path.geometry.coordinates, settings.outflowAzimuthDeg, plume.turnsTo, [
      settings.mouthLongitude,
      settings.mouthLatitude,
    ]);
    const points = outlinePositions(frame, lease.geometry.coordinates, 30);
    const worst = worstField(plume, params, points).field;
    lowestSalinity = fractions[speciesBand] > 0 ? Math.min(worst.salinity, SPECIES.chronicLowerSalinity - 0.1) : Math.max(worst.salinity, SPECIES.chronicLowerSalinity);
    highestIndicator = fractions['indicator-over-standard'] > 0 ? Math.max(worst.indicator, INDICATOR_STANDARD * 1.01) : Math.min(worst.indicator, INDICATOR_STANDARD);
  }
  const score = scoreLease({
    tolerance: SPECIES,
    scenario: { aep: null, discharge: flow.discharge, floodDurationDays: days },
    bandFractions: fractions,
    lowestSalinity,
    highestIndicator,
    daysBelowTolerance: daysBelowTolerance(lowestSalinity, days, SPECIES),
    indicatorThreshold: INDICATOR_STANDARD,
  });
  return { lowestSalinity, highestIndicator, score: score.score, rating: score.rating };
}

function buildFor(settings: ReturnType<typeof southRiver>, flow: { discharge: number; durationHours: number }) {
  const { plume, params } = riverPlume(settings, flow);
  const footprint = buildFootprint({
    coast: coastThrough(settings.mouthLongitude, settings.mouthLatitude),
    mouth: [settings.mouthLongitude, settings.mouthLatitude],
    outflowAzimuth: settings.outflowAzimuthDeg,
    plume,
    params,
    bands: screeningBandSpecs(settings.seaSalinity, INDICATOR_STANDARD),
    options: { alongSteps: 200 },
  });
  return { plume, params, footprint };
}

/** The design floods of the 30-year record (GEV by L-moments) with their own durations. */
function designFloods(aeps: readonly number[]) {
  const readings = syntheticRecord();
  const peaks = annualMaxima(readings, { waterYearStart: '04-01' }).filter((m) => m.complete);
  const fit = fitFloodFrequency({ annualPeaks: peaks.map((p) => p.discharge), waterYears: peaks.map((p) => p.waterYear), aep: [...aeps], bootstrapResamples: 0, seed: 1 });
  const flows = aeps.map((a) => (fit.gev.quantiles.find((q) => Math.abs(q.aep - a) < 1e-9) as { discharge: number }).discharge);
  const durations = durationsForFlows(typicalDurationForPeak(readings, { waterYearStart: '04-01' }).events, flows);
  return aeps.map((aep, i) => ({ aep, discharge: flows[i], durationHours: Math.max(24, Math.round(durations.hours[i])), exponent: durations.exponent }));
}

describe('reproduction: a southern-hemisphere coast at 41° S, sea to the west, mouth facing west', () => {
  const river = southRiver();
  const mouth: [number, number] = [river.mouthLongitude, river.mouthLatitude];
  // Three 300 m leases, 500 m offshore: 6 km south (down-coast: in the south the current turns left
  // of a westward outflow, science.md §1.1, a), 6 km north (up-coast) and 45 km south.
  const leases = { south6: squareLease(mouth, -6000, 500), north6: squareLease(mouth, 6000, 500), south45: squareLease(mouth, -45_000, 500) };
  const floods = designFloods([0.5, 0.2, 0.1, 0.04, 0.02, 0.01]);
  const results = floods.map((flood) => {
    const built = buildFor(river, flood);
    return {
      flood,
      radius: built.plume.bulgeOffshoreExtent / 2,
      south6: screen(river, flood, leases.south6, built),
      north6: screen(river, flood, leases.north6, built),
      south45: screen(river, flood, leases.south45, built),
    };
  });

  it('prints the table for the report', () => {
    for (const r of results) {
      const f = (x: Screened) => `S ${x.lowestSalinity === null ? '—' : x.lowestSalinity.toFixed(2)} / score ${x.score.toFixed(3)} ${x.rating}`;
      console.log(
        `AEP ${r.flood.aep}: Q ${r.flood.discharge.toFixed(0)} m³/s, ${r.flood.durationHours} h (duration ∝ peak^${r.flood.exponent.toFixed(2)}), bulge radius ${(r.radius / 1000).toFixed(2)} km | 6 km S ${f(r.south6)} | 6 km N ${f(r.north6)} | 45 km S ${f(r.south45)}`,
      );
    }
    expect(results).toHaveLength(6);
  });

  it('the up-coast lease outside the bulge gets nothing from the river', () => {
    // science.md §1.11 (c): up-coast only inside the bulge disc (radius R_b = y_s/2, centre R_b offshore of the mouth)
    for (const r of results) {
      // the lease's corner nearest the disc: 5 850 m up-coast, 800 m offshore; inside iff s² + x² < 2 x R_b
      expect(5850 ** 2 + 800 ** 2).toBeGreaterThan(2 * 800 * r.radius);
      expect(r.north6.lowestSalinity).toBeNull();
      expect(r.north6.highestIndicator).toBeNull();
      expect(r.north6.score).toBe(0);
    }
  });

  it("the down-coast lease's lowest salinity and score change with flood size (AEP 50 % → 1 %)", () => {
    const first = results[0].south6;
    const last = results[results.length - 1].south6;
    expect(first.lowestSalinity).not.toBeNull();
    expect(last.lowestSalinity as number).toBeLessThan(first.lowestSalinity as number);
    expect(last.score).toBeGreaterThan(first.score);
    for (let i = 1; i < results.length; i += 1) {
      expect(results[i].south6.score).toBeGreaterThanOrEqual(results[i - 1].south6.score);
    }
  });

  it('the 45 km lease is no worse than the 6 km one', () => {
    for (const r of results) {
      expect(r.south45.score).toBeLessThanOrEqual(r.south6.score);
      if (r.south45.lowestSalinity !== null) expect(r.south45.lowestSalinity).toBeGreaterThanOrEqual(r.south6.lowestSalinity as number);
    }
  });
});

describe('property tests (fast-check, fixed seeds)', () => {
  const river = southRiver();
  const plumeAt = (q: number, hours = 72, settings = river) => riverPlume(settings, { discharge: q, durationHours: hours });
  /** Score of a point-sized lease: band fractions 0/1 from the field at the point. */
  const pointScore = (q: number, hours: number, s: number, x: number) => {
    const { plume, params } = plumeAt(q, hours);
    const v = fieldAt(plume, params, s, x);
    const inPlume = v.freshwaterFraction > 0.01;
    const days = hours / 24;
    return scoreLease({
      tolerance: SPECIES,
      scenario: { aep: null, discharge: q, floodDurationDays: days },
      bandFractions: {
        'plume-edge': inPlume ? 1 : 0,
        [salinityBandId(SPECIES.chronicLowerSalinity)]: v.salinity < SPECIES.chronicLowerSalinity ? 1 : 0,
        'indicator-over-standard': v.indicator > INDICATOR_STANDARD ? 1 : 0,
      },
      lowestSalinity: inPlume ? v.salinity : null,
      highestIndicator: inPlume ? v.indicator : null,
      daysBelowTolerance: daysBelowTolerance(inPlume ? v.salinity : null, days, SPECIES),
      indicatorThreshold: INDICATOR_STANDARD,
    }).score;
  };
  const site = fc.record({ s: fc.double({ min: -30_000, max: 80_000, noNaN: true }), x: fc.double({ min: 0, max: 15_000, noNaN: true }) });
  const flows = fc.tuple(fc.double({ min: 5, max: 3000, noNaN: true }), fc.double({ min: 1, max: 4, noNaN: true }));

  it('mirrored across the equator (region and outflow mirrored): mirrored footprint, equal scores for mirrored leases', () => {
    // (a) science.md §1.1: the coast is on the right of the flow in the north, on the left in the south
    const north = { ...southRiver(41) };
    const south = southRiver(-41);
    fc.assert(
      fc.property(fc.double({ min: 20, max: 2000, noNaN: true }), fc.double({ min: -20_000, max: 40_000, noNaN: true }), fc.double({ min: 200, max: 4000, noNaN: true }), (q, along, off) => {
        const flow = { discharge: q, durationHours: 72 };
        const bn = buildFor(north, flow);
        const bs = buildFor(south, flow);
        for (const b of bn.footprint.bands) {
          const other = bs.footprint.bands.find((o) => o.properties.id === b.properties.id) as (typeof bs.footprint.bands)[number];
          const an = turfArea(b);
          const as = turfArea(other);
          if (an === 0) expect(as).toBe(0);
          else expect(Math.abs(as / an - 1)).toBeLessThan(1e-3);
          expect(other.properties.maxOffshoreM).toBeCloseTo(b.properties.maxOffshoreM, 6);
        }
        // Down-coast is north in the north, south in the south: the mirrored lease.
        const ln = squareLease([north.mouthLongitude, 41], along, off);
        const ls = squareLease([south.mouthLongitude, -41], -along, off);
        const sn = screen(north, flow, ln, bn);
        const ss = screen(south, flow, ls, bs);
        expect(Math.abs(sn.score - ss.score)).toBeLessThan(1e-6);
        expect(sn.rating).toBe(ss.rating);
      }),
      { seed: 1401, numRuns: 4 },
    );
  });

  it('scores, freshwater fraction and indicator never decrease with flow at a fixed site', () => {
    // science.md §1.11 (c): y_s grows with v_i = Q/(L h0), L_e ∝ Q^½, W0 ∝ Q^¼, speeds ∝ Q^¼;
    // durations of larger floods are never shorter (durationsForFlows)
    fc.assert(
      fc.property(site, flows, ({ s, x }, [q, ratio]) => {
        const q2 = q * ratio;
        const a = plumeAt(q);
        const b = plumeAt(q2);
        const va = fieldAt(a.plume, a.params, s, x);
        const vb = fieldAt(b.plume, b.params, s, x);
        expect(vb.freshwaterFraction).toBeGreaterThanOrEqual(va.freshwaterFraction - 1e-12);
        expect(vb.indicator).toBeGreaterThanOrEqual(va.indicator * (1 - 1e-12));
        expect(pointScore(q2, 96, s, x)).toBeGreaterThanOrEqual(pointScore(q, 72, s, x) - 1e-12);
        // …and increase where the coastal current sets the field and is not at its limit
        const ca = currentFraction(a.plume, a.params, s, x);
        if (s > 1 && ca > 0 && ca > bulgeFraction(a.plume, a.params, s, x) && ratio > 1.01) {
          expect(vb.freshwaterFraction).toBeGreaterThan(va.freshwaterFraction);
        }
      }),
      { seed: 1402, numRuns: 400 },
    );
  });

  it('an up-coast site outside the bulge gets nothing from that river', () => {
    // science.md §1.11 (c): points with s < 0 receive river water only inside the disc of radius R_b centred (0, R_b)
    fc.assert(
      fc.property(site, fc.double({ min: 5, max: 3000, noNaN: true }), ({ s, x }, q) => {
        const { plume, params } = plumeAt(q);
        const rb = plume.bulgeOffshoreExtent / 2;
        const up = -Math.abs(s) - 1;
        if (Math.hypot(up, x - rb) <= rb) return;
        expect(fieldAt(plume, params, up, x)).toEqual({ freshwaterFraction: 0, salinity: river.seaSalinity, indicator: 0 });
      }),
      { seed: 1403, numRuns: 500 },
    );
  });

  it('the field is continuous where the bulge meets the coastal current', () => {
    // (c) derived: φ = max(φ_b, φ_cc), both continuous for s > 0 (away from the reach)
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: Math.PI / 2 - 0.05, noNaN: true }), fc.double({ min: 5, max: 3000, noNaN: true }), (angle, q) => {
        const { plume, params } = plumeAt(q, 24 * 30);
        const rb = plume.bulgeOffshoreExtent / 2;
        // a point on the bulge's edge down-coast of the mouth, and its neighbours 1 cm either side
        const s = rb * Math.sin(angle);
        const x = rb - rb * Math.cos(angle);
        for (const [ds, dx] of [
          [0.01, 0],
          [-0.01, 0],
          [0, 0.01],
          [0, -0.01],
        ]) {
          const a = fieldAt(plume, params, s, x);
          const b = fieldAt(plume, params, s + ds, Math.max(0, x + dx));
          expect(Math.abs(a.freshwaterFraction - b.freshwaterFraction)).toBeLessThan(1e-5);
          expect(Math.abs(a.indicator - b.indicator)).toBeLessThan(1e-5 * params.riverIndicator);
        }
      }),
      { seed: 1404, numRuns: 300 },
    );
  });

  it('a site farther along the current is never worse than a nearer one at the same distance offshore (T90 and reach included)', () => {
    // (c) derived: φ_cc falls with s, decay e^(−ks/c) falls with s, the reach cuts the current off,
    // and the bulge never rises away from the mouth
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60_000, noNaN: true }),
        fc.double({ min: 0, max: 60_000, noNaN: true }),
        fc.double({ min: 0, max: 10_000, noNaN: true }),
        fc.double({ min: 5, max: 3000, noNaN: true }),
        fc.double({ min: 12, max: 240, noNaN: true }),
        (s1, ds, x, q, hours) => {
          const near = pointScore(q, hours, s1, x);
          const far = pointScore(q, hours, s1 + ds, x);
          expect(far).toBeLessThanOrEqual(near + 1e-12);
          const { plume, params } = plumeAt(q, hours);
          const a = fieldAt(plume, params, s1, x);
          const b = fieldAt(plume, params, s1 + ds, x);
          expect(b.freshwaterFraction).toBeLessThanOrEqual(a.freshwaterFraction + 1e-12);
          expect(b.indicator).toBeLessThanOrEqual(a.indicator * (1 + 1e-12));
        },
      ),
      { seed: 1405, numRuns: 400 },
    );
  });
});
