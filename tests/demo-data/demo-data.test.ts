/**
 * Checks the generated Fennick coast demo files (demo-data/): they exist and parse, the flow records
 * are complete, every lease lies in the sea, attributes and river settings are sensible, and the
 * zipped shapefiles hold what the GeoJSON holds.
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { area, booleanDisjoint, booleanPointInPolygon, destination, distance, featureCollection, intersect, length, lineString } from '@turf/turf';
import { unzipSync } from 'fflate';
import type { FeatureCollection, MultiLineString, MultiPolygon, Point, Polygon } from 'geojson';
import { describe, expect, it } from 'vitest';
import { SPECIES_IDS } from '../../shared/biology/species-tolerance';
import { annualMaxima } from '../../shared/hydrology/annual-maxima';
import { parseFlowRecord } from '../../shared/hydrology/parse-flow-record';
import { PlumeRequestSchema } from '../../shared/schemas/plume';
import { RiverParametersSchema } from '../../shared/schemas/river-parameters';
import type { RiverJson } from '../../demo-data/lib/rivers';

const DIR = path.resolve(import.meta.dirname, '../../demo-data');
const file = (p: string) => path.join(DIR, p);
const readJson = <T>(p: string): T => JSON.parse(readFileSync(file(p), 'utf8')) as T;

const GROWER_NAMES = ['Saltreed Oysters', 'Carrick Mussel Lines', 'Skerrow Clam Company', 'Gullstone Shellfish'];


const land = readJson<FeatureCollection<MultiPolygon>>('coast/fennick-land.geojson');
const shore = readJson<FeatureCollection<MultiLineString>>('coast/fennick-shoreline.geojson');
const leases = readJson<FeatureCollection<Polygon>>('leases/fennick-leases.geojson');
const zones = readJson<FeatureCollection<Polygon>>('zones/fennick-zones.geojson');
const stations = readJson<FeatureCollection<Point>>('monitoring/stations.geojson');
const { rivers } = readJson<{ rivers: RiverJson[] }>('rivers/rivers.json');
const landFeature = land.features[0];
const props = (f: { properties: unknown }) => f.properties as Record<string, string | number>;

describe('demo-data files', () => {
  it('all exist', () => {
    const region = readJson<{ files: Record<string, unknown>; growers: { name: string; email: string }[] }>('region.json');
    const paths = Object.values(region.files).flatMap((v) => (typeof v === 'string' ? [v] : Object.values(v as Record<string, string>)));
    expect(paths.length).toBeGreaterThanOrEqual(14);
    for (const p of paths) expect(existsSync(file(p)), p).toBe(true);
    expect(region.growers.map((g) => g.name)).toEqual(GROWER_NAMES);
    expect(region.growers[0].email).toBe('grower@brackline.test');
  });

  it('land is one MultiPolygon of mainland and island; the shoreline is a MultiLineString', () => {
    expect(land.features).toHaveLength(1);
    expect(landFeature.geometry.type).toBe('MultiPolygon');
    expect(landFeature.geometry.coordinates).toHaveLength(2);
    expect(shore.features[0].geometry.type).toBe('MultiLineString');
    expect(shore.features[0].geometry.coordinates[0].length).toBeGreaterThan(300);
  });

  it('has a mainland shore of at least 80 km (haversine length by @turf/turf)', () => {
    expect(length(lineString(shore.features[0].geometry.coordinates[0]))).toBeGreaterThanOrEqual(80);
  });

  it('places the region in open ocean near 41.2° N, 38.6° W', () => {
    for (const [lon, lat] of shore.features[0].geometry.coordinates[0]) {
      expect(lon).toBeGreaterThan(-39);
      expect(lon).toBeLessThan(-38.3);
      expect(lat).toBeGreaterThan(40.6);
      expect(lat).toBeLessThan(41.8);
    }
  });
});

describe('flow records', () => {
  for (const r of rivers) {
    it(`${r.name}: 35 complete water years of daily flow from 1990-10-01`, () => {
      const parsed = parseFlowRecord(readFileSync(file(r.flowRecordFile), 'utf8'), { units: 'm3s' });
      expect(parsed.header).toEqual(['date', 'discharge']);
      expect(parsed.problems).toEqual([]);
      expect(parsed.gaps).toEqual([]);
      expect(parsed.interval).toBe('daily');
      expect(parsed.readings[0].date).toBe('1990-10-01');
      expect(parsed.readings.at(-1)?.date).toBe('2025-09-30');
      const maxima = annualMaxima(parsed.readings);
      expect(maxima).toHaveLength(35);
      expect(maxima.every((m) => m.complete)).toBe(true);
    });
  }

  it('the Amberlin is the larger river', () => {
    const mean = (p: string) => {
      const rs = parseFlowRecord(readFileSync(file(p), 'utf8'), { units: 'm3s' }).readings;
      return rs.reduce((s, x) => s + x.discharge, 0) / rs.length;
    };
    const [amberlin, tolley] = rivers;
    expect(amberlin.name).toBe('Amberlin River');
    expect(mean(amberlin.flowRecordFile)).toBeGreaterThan(5 * mean(tolley.flowRecordFile));
  });

  it('each river’s flows fit its catchment: mean runoff 300–1500 mm a year, median annual flood 0.1–0.6 m³/s per km²', () => {
    // From memory (b), humid temperate catchments of 100–5 000 km²: mean annual runoff of a few hundred mm to
    // about 1.5 m, and a median annual flood of roughly 0.1–0.6 m³/s per km² (higher for the smaller, flashier ones).
    for (const r of rivers) {
      const readings = parseFlowRecord(readFileSync(file(r.flowRecordFile), 'utf8'), { units: 'm3s' }).readings;
      const mean = readings.reduce((s, x) => s + x.discharge, 0) / readings.length;
      const runoffMm = (mean * 365.25 * 86_400) / (r.catchmentAreaKm2 * 1e6) * 1000;
      expect(runoffMm, r.name).toBeGreaterThan(300);
      expect(runoffMm, r.name).toBeLessThan(1500);
      const peaks = annualMaxima(readings).map((m) => m.discharge).sort((a, b) => a - b);
      const median = (peaks[(peaks.length - 1) >> 1] + peaks[peaks.length >> 1]) / 2;
      expect(median / r.catchmentAreaKm2, r.name).toBeGreaterThan(0.1);
      expect(median / r.catchmentAreaKm2, r.name).toBeLessThan(0.6);
    }
    expect(rivers[0].catchmentAreaKm2).toBeGreaterThanOrEqual(1500);
    expect(rivers[1].catchmentAreaKm2).toBeLessThanOrEqual(300);
  });
});

describe('leases', () => {
  it('has about 40 leases with unique ids', () => {
    const ids = leases.features.map((f) => props(f).LEASE_ID);
    expect(ids.length).toBeGreaterThanOrEqual(35);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('every lease lies in the sea (no intersection with the land polygon)', () => {
    const onLand = leases.features.filter((f) => !booleanDisjoint(f, landFeature)).map((f) => props(f).LEASE_ID);
    expect(onLand).toEqual([]);
  });

  it('every lease is a polygon of 1–15 ha with valid attributes', () => {
    for (const f of leases.features) {
      const p = props(f);
      expect(f.geometry.type).toBe('Polygon');
      const ha = area(f) / 10_000;
      expect(ha, String(p.LEASE_ID)).toBeGreaterThanOrEqual(1);
      expect(ha, String(p.LEASE_ID)).toBeLessThanOrEqual(15);
      expect(GROWER_NAMES).toContain(p.HOLDER);
      expect(SPECIES_IDS as readonly unknown[]).toContain(p.SPECIES);
      expect(['held', 'candidate']).toContain(p.STATUS);
      expect(String(p.NOTES).length).toBeGreaterThan(0);
    }
  });

  it('each grower has leases; Saltreed Oysters has held and candidate ones', () => {
    for (const g of GROWER_NAMES)
      expect(
        leases.features.some((f) => props(f).HOLDER === g),
        g,
      ).toBe(true);
    const saltreed = leases.features.filter((f) => props(f).HOLDER === 'Saltreed Oysters').map((f) => props(f).STATUS);
    expect(saltreed.length).toBeGreaterThanOrEqual(8);
    expect(saltreed).toContain('held');
    expect(saltreed).toContain('candidate');
  });

  it('each grower zip holds a UTM 24N shapefile with that grower’s leases', () => {
    for (const g of GROWER_NAMES) {
      const slug = g.toLowerCase().replace(/ /g, '-');
      const entries = unzipSync(readFileSync(file(`leases/${slug}-leases.zip`)));
      const names = Object.keys(entries).sort();
      expect(names).toEqual(['.cpg', '.dbf', '.prj', '.shp', '.shx'].map((e) => `${slug}-leases${e}`).sort());
      expect(new TextDecoder().decode(entries[`${slug}-leases.prj`])).toContain('UTM_Zone_24N');
      const dbf = entries[`${slug}-leases.dbf`];
      const records = new DataView(dbf.buffer, dbf.byteOffset, dbf.byteLength).getUint32(4, true);
      expect(records).toBe(leases.features.filter((f) => props(f).HOLDER === g).length);
    }
  });
});

describe('closure zones', () => {
  it('are two polygons with a river, trigger flow and closure period', () => {
    expect(zones.features).toHaveLength(2);
    for (const z of zones.features) {
      const p = props(z);
      expect(z.geometry.type).toBe('Polygon');
      expect(['Amberlin River', 'Tolley Brook']).toContain(p.RIVER);
      expect(p.TRIGGER_M3S).toBeGreaterThan(0);
      expect(p.CLOSURE_DAYS).toBeGreaterThanOrEqual(1);
      expect(area(z)).toBeGreaterThan(1e6);
    }
    expect(zones.features.map((z) => props(z).ZONE_NAME)).toEqual(['Fennick Bay inner zone', 'Tolley shore zone']);
    expect(existsSync(file('zones/fennick-zones.zip'))).toBe(true);
  });

  it('each zone is a growing area down-coast of its river, not against the mouth', () => {
    const [amberlin, tolley] = rivers;
    const inner = zones.features[0];
    const tolleyZone = zones.features[1];
    // Nothing within 5 km of either mouth (@turf/turf distance, haversine on the WGS 84 sphere).
    for (const [zone, river] of [
      [inner, amberlin],
      [tolleyZone, tolley],
    ] as const) {
      const nearest = Math.min(...zone.geometry.coordinates[0].map((p) => distance(river.mouth, p)));
      expect(nearest, String(props(zone).ZONE_NAME)).toBeGreaterThan(5);
    }
    // Fennick Bay lies 10–22 km north of (down-coast of) the Amberlin; the Tolley zone 5–11 km north of the brook.
    expect(booleanPointInPolygon(destination(destination(amberlin.mouth, 16, 0), 1, 90).geometry.coordinates, inner)).toBe(true);
    expect(booleanPointInPolygon(destination(destination(tolley.mouth, 8, 0), 1, -90).geometry.coordinates, tolleyZone)).toBe(true);
    expect(booleanPointInPolygon(destination(destination(tolley.mouth, 8, 180), 1, -90).geometry.coordinates, tolleyZone)).toBe(false);
  });

  it('zones do not overlap the land', () => {
    for (const z of zones.features) {
      const overlap = intersect(featureCollection<Polygon | MultiPolygon>([z, landFeature]));
      expect(overlap ? area(overlap) : 0).toBeLessThan(1);
    }
  });
});

describe('rivers.json', () => {
  it('describes the two rivers with values in sensible ranges', () => {
    expect(rivers.map((r) => r.name)).toEqual(['Amberlin River', 'Tolley Brook']);
    for (const r of rivers) {
      expect(r.outflowAzimuthDeg).toBeGreaterThanOrEqual(255);
      expect(r.outflowAzimuthDeg).toBeLessThanOrEqual(285);
      expect(r.mouthWidthM).toBeGreaterThan(10);
      expect(r.mouthDepthM).toBeGreaterThan(0.5);
      expect(r.riverSalinity).toBeLessThanOrEqual(0.5);
      expect(r.seaSalinity).toBeGreaterThan(30);
      expect(r.shelfSlope).toBeGreaterThan(0);
      expect(r.t90NightHours).toBeGreaterThan(r.t90DayHours);
      expect(r.gauge.name.length).toBeGreaterThan(0);
      expect(r.gauge.code.length).toBeGreaterThan(0);
    }
    expect(rivers[0].mouthWidthM).toBeGreaterThan(rivers[1].mouthWidthM);
  });

  it('each mouth is a vertex of the mainland shoreline', () => {
    const line = shore.features[0].geometry.coordinates[0];
    for (const r of rivers)
      expect(
        line.some(([lon, lat]) => lon === r.mouth[0] && lat === r.mouth[1]),
        r.name,
      ).toBe(true);
  });

  it('passes the engine’s own schemas (river parameters and a plume request at a flood flow)', () => {
    for (const r of rivers) {
      const params = RiverParametersSchema.safeParse({
        entrainmentCoefficient: r.entrainmentCoefficient,
        t90DayHours: r.t90DayHours,
        t90NightHours: r.t90NightHours,
        daylightFraction: r.daylightFraction,
        indicator: r.indicator,
        alongshoreShare: r.alongshoreShare,
      });
      expect(params.success, JSON.stringify(params.error?.issues)).toBe(true);
      const plume = PlumeRequestSchema.safeParse({
        latitude: r.mouth[1],
        discharge: 100,
        riverSalinity: r.riverSalinity,
        riverTemperature: r.riverTemperature,
        seaSalinity: r.seaSalinity,
        seaTemperature: r.seaTemperature,
        mouthWidth: r.mouthWidthM,
        mouthDepth: r.mouthDepthM,
        shelfSlope: r.shelfSlope,
        alongshoreShare: r.alongshoreShare,
      });
      expect(plume.success, JSON.stringify(plume.error?.issues)).toBe(true);
    }
  });

  it('flood water carries thousands to tens of thousands of E. coli per 100 mL', () => {
    const [amberlin, tolley] = rivers;
    const c = (r: RiverJson, q: number) => r.indicator.coefficient * q ** r.indicator.exponent;
    expect(c(amberlin, 450)).toBeGreaterThan(3_000);
    expect(c(amberlin, 1000)).toBeLessThan(100_000);
    expect(c(tolley, 45)).toBeGreaterThan(3_000);
    expect(c(tolley, 100)).toBeLessThan(100_000);
  });
});

describe('monitoring', () => {
  const csv = readFileSync(file('monitoring/samples.csv'), 'utf8').trim().split('\n');
  const rows = csv.slice(1).map((l) => l.split(','));

  it('stations are points in the sea', () => {
    expect(stations.features.length).toBeGreaterThanOrEqual(6);
    for (const s of stations.features) {
      expect(s.geometry.type).toBe('Point');
      expect(String(props(s).STATION_ID)).toMatch(/^FB-S\d\d$/);
      expect(booleanPointInPolygon(s.geometry.coordinates, landFeature)).toBe(false);
    }
  });

  it('samples.csv has ~300 well-formed rows at known stations, some censored', () => {
    expect(csv[0]).toBe('station_id,sampled_at,salinity,e_coli_per_100ml,method,temperature_c');
    expect(rows.length).toBeGreaterThanOrEqual(250);
    const ids = new Set(stations.features.map((s) => props(s).STATION_ID));
    for (const [id, at, sal, ecoli, method, temp] of rows) {
      expect(ids.has(id)).toBe(true);
      expect(at).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z$/);
      expect(Number(sal)).toBeGreaterThanOrEqual(0);
      expect(Number(sal)).toBeLessThanOrEqual(36);
      expect(ecoli).toMatch(/^(<2|>1600|\d+(\.\d+)?)$/);
      expect(['MPN', 'MF']).toContain(method);
      expect(Number.isFinite(Number(temp))).toBe(true);
    }
    expect(rows.some((r) => r[3] === '<2')).toBe(true);
    expect(rows.some((r) => r[3] === '>1600')).toBe(true);
  });

  it('inner-bay salinity is lower when E. coli is high (both follow river flow)', () => {
    const inner = rows.filter((r) => r[0] === 'FB-S01');
    const value = (e: string) => (e.startsWith('>') ? 1e9 : e.startsWith('<') ? 0 : Number(e));
    const sorted = [...inner].sort((a, b) => value(a[3]) - value(b[3]));
    const q = Math.floor(sorted.length / 4);
    const mean = (rs: string[][]) => rs.reduce((s, r) => s + Number(r[2]), 0) / rs.length;
    expect(mean(sorted.slice(-q))).toBeLessThan(mean(sorted.slice(0, q)) - 1);
  });
});
