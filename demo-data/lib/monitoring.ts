/**
 * @module demo-data/lib/monitoring
 * Invented monitoring stations and synthetic water samples (salinity, E. coli, temperature),
 * made from the generated flow records by a simple, documented rule with seeded noise:
 *
 *  1. Antecedent flow Q_a = the largest daily flow of the sample day and the two days before.
 *  2. Fresh-water fraction φ = φ_max × Q_a / (Q_a + Q_half), with φ_max per station (how exposed
 *     it is to its river) and Q_half per river (Amberlin 500 m³/s, Tolley 50 m³/s).
 *  3. Salinity S = 33.5 (1 − φ) + S_river φ + N(0, 0.3), rounded to 0.1, at least 0.
 *  4. E. coli per 100 mL = 3 e^N(0, 0.8) (marine background)
 *       + φ × C_river(Q_a) × 10^(−τ / T90_eff) × e^N(0, 0.5),
 *     with C_river = a Q_a^b (the river's power law), τ the station's travel time from the
 *     mouth [h] and T90_eff = 1 / (0.5/T90_day + 0.5/T90_night) ≈ 13.3 h.
 *  5. Reported values: below 2 → "<2", above 1600 → ">1600" (the counting range of the
 *     methods), otherwise MPN to two significant figures or an MF count (whole number).
 *  6. Temperature = (1 − φ) T_sea(day) + φ T_river(day) + N(0, 0.3), with seasonal cycles
 *     T_sea = 14 + 4 cos(2π(doy − 228)/365.25) and T_river = 11 + 7 cos(2π(doy − 200)/365.25).
 *
 * Each station is sampled every 40–55 days (seeded) from a seeded first day in October 2020
 * until 30 September 2025, between 10:00 and 15:45 UTC.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { dateOfDayNumber, dayNumber } from '../../shared/hydrology/calendar-days';
import type { FlowReading } from '../../shared/hydrology/parse-flow-record';
import { createUniformStream } from '../../shared/hydrology/seeded-uniform';
import { km, type Xy } from './local-frame';
import type { RiverSpec } from './rivers';

/** Seed of the sampling schedule and the sample noise. */
export const MONITORING_SEED = 4110;
/** Sampling period (inclusive). */
export const SAMPLING_FROM = '2020-10-01';
export const SAMPLING_TO = '2025-09-30';
/** Lower and upper reporting limits of E. coli per 100 mL. */
export const REPORTING_LIMITS = { lower: 2, upper: 1600 } as const;

/** A monitoring station. */
export interface StationSpec {
  STATION_ID: string;
  NAME: string;
  /** Position [km] in the local frame. */
  at: [number, number];
  river: RiverSpec['name'];
  /** Largest fresh-water fraction reached at the station in a great flood. */
  phiMax: number;
  /** Travel time of river water from the mouth [h]. */
  travelHours: number;
  method: 'MPN' | 'MF';
}

/** The stations. */
export const STATION_TABLE: readonly StationSpec[] = [
  { STATION_ID: 'FB-S01', NAME: 'Inner Bay buoy', at: [5.9, 0.1], river: 'Amberlin River', phiMax: 0.6, travelHours: 2, method: 'MPN' },
  { STATION_ID: 'FB-S02', NAME: 'Mid Bay', at: [3.6, 1.2], river: 'Amberlin River', phiMax: 0.42, travelHours: 5, method: 'MPN' },
  { STATION_ID: 'FB-S03', NAME: 'Bay mouth marker', at: [0.0, 1.5], river: 'Amberlin River', phiMax: 0.3, travelHours: 9, method: 'MPN' },
  { STATION_ID: 'FB-S04', NAME: 'North shore', at: [-1.5, 5.9], river: 'Amberlin River', phiMax: 0.25, travelHours: 13, method: 'MPN' },
  { STATION_ID: 'FB-S05', NAME: 'Gullstone south', at: [-2.4, 8.1], river: 'Amberlin River', phiMax: 0.2, travelHours: 18, method: 'MF' },
  {
    STATION_ID: 'FB-S06',
    NAME: 'Gullstone north',
    at: [-1.6, 13.9],
    river: 'Amberlin River',
    phiMax: 0.12,
    travelHours: 28,
    method: 'MPN',
  },
  { STATION_ID: 'FB-S07', NAME: 'Skerrow lee', at: [-4.0, 4.4], river: 'Amberlin River', phiMax: 0.1, travelHours: 20, method: 'MPN' },
  { STATION_ID: 'FB-S08', NAME: 'Tolley north', at: [-1.4, -10.2], river: 'Tolley Brook', phiMax: 0.3, travelHours: 4, method: 'MF' },
];

/** Q_half of the fresh-water fraction rule, per river [m³/s]. */
const Q_HALF: Record<RiverSpec['name'], number> = { 'Amberlin River': 500, 'Tolley Brook': 50 };
const SEA_SALINITY = 33.5;

/** One sample row, as written to samples.csv. */
export interface SampleRow {
  station_id: string;
  sampled_at: string;
  salinity: number;
  e_coli_per_100ml: string;
  method: 'MPN' | 'MF';
  temperature_c: number;
}

/** Station position in the local frame [m]. */
export function stationPoint(s: StationSpec): Xy {
  return km(s.at[0], s.at[1]);
}

/**
 * Makes the samples of every station, sorted by time then station.
 * @param rivers - the river settings
 * @param flows - each river's daily readings, by river name
 */
export function buildSamples(rivers: readonly RiverSpec[], flows: Record<string, FlowReading[]>): SampleRow[] {
  const next = createUniformStream(MONITORING_SEED);
  const normal = (sd: number) => normalQuantile(next(), 0, sd);
  const flowByDate = new Map<string, Map<string, number>>();
  for (const [name, readings] of Object.entries(flows)) flowByDate.set(name, new Map(readings.map((r) => [r.date, r.discharge])));
  const first = dayNumber(SAMPLING_FROM);
  const last = dayNumber(SAMPLING_TO);
  const rows: SampleRow[] = [];
  for (const station of STATION_TABLE) {
    const river = rivers.find((r) => r.name === station.river);
    const q = flowByDate.get(station.river);
    if (!river || !q) throw new Error(`no river or flow for ${station.STATION_ID}`);
    const t90 = 1 / (river.daylightFraction / river.t90DayHours + (1 - river.daylightFraction) / river.t90NightHours);
    for (let day = first + Math.floor(next() * 21); day <= last; day += 40 + Math.floor(next() * 16)) {
      const date = dateOfDayNumber(day);
      const qa = Math.max(...[0, 1, 2].map((k) => q.get(dateOfDayNumber(day - k)) ?? 0));
      const phi = (station.phiMax * qa) / (qa + Q_HALF[station.river]);
      const salinity = Math.max(0, round(SEA_SALINITY * (1 - phi) + river.riverSalinity * phi + normal(0.3), 1));
      const cRiver = river.indicator.coefficient * qa ** river.indicator.exponent;
      const eColi = 3 * Math.exp(normal(0.8)) + phi * cRiver * 10 ** (-station.travelHours / t90) * Math.exp(normal(0.5));
      const doy = day - dayNumber(`${date.slice(0, 4)}-01-01`) + 1;
      const tSea = 14 + 4 * Math.cos((2 * Math.PI * (doy - 228)) / 365.25);
      const tRiver = 11 + 7 * Math.cos((2 * Math.PI * (doy - 200)) / 365.25);
      const temperature = round((1 - phi) * tSea + phi * tRiver + normal(0.3), 1);
      const minutes = 600 + 15 * Math.floor(next() * 24);
      const time = `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}:00Z`;
      rows.push({
        station_id: station.STATION_ID,
        sampled_at: `${date}T${time}`,
        salinity,
        e_coli_per_100ml: reportEColi(eColi, station.method),
        method: station.method,
        temperature_c: temperature,
      });
    }
  }
  return rows.sort((a, b) => (a.sampled_at < b.sampled_at ? -1 : a.sampled_at > b.sampled_at ? 1 : a.station_id < b.station_id ? -1 : 1));
}

/** Writes an E. coli value as a laboratory would: censored outside the counting range. */
export function reportEColi(value: number, method: 'MPN' | 'MF'): string {
  if (value < REPORTING_LIMITS.lower) return `<${REPORTING_LIMITS.lower}`;
  if (value > REPORTING_LIMITS.upper) return `>${REPORTING_LIMITS.upper}`;
  if (method === 'MF') return String(Math.round(value));
  return String(Number(value.toPrecision(2)));
}

/** Samples as CSV text (header row, final newline). */
export function samplesCsv(rows: readonly SampleRow[]): string {
  const lines = ['station_id,sampled_at,salinity,e_coli_per_100ml,method,temperature_c'];
  for (const r of rows) lines.push([r.station_id, r.sampled_at, r.salinity, r.e_coli_per_100ml, r.method, r.temperature_c].join(','));
  return `${lines.join('\n')}\n`;
}

/** @private Rounds to a number of decimals. */
function round(v: number, decimals = 0): number {
  const f = 10 ** decimals;
  return Math.round(v * f) / f;
}
