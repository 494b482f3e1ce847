/**
 * @module demo-data/lib/monitoring
 * Invented monitoring stations and synthetic water samples (salinity, E. coli, temperature),
 * made from the engine's own plume with KNOWN river settings (rivers.json: the mixing settings,
 * the T90s, the alongshore share and the near-field freshwater fraction), so that a calibration
 * of the demo rivers against these samples can be checked against the values that made them:
 *
 *  1. Flow Q = the larger daily flow of the sample day and the day before, from the station's
 *     river record (what the server takes with its default one-day lag).
 *  2. The station's place relative to its river: s, the distance along the mainland shore from
 *     the mouth to the shore point nearest the station (down-coast positive), and x, the
 *     distance from that shore point.
 *  3. Model salinity S_m and indicator C_m = predictSample(settings, { flow: Q, along: s,
 *     offshore: x }) (shared/calibration/river-calibration: the plume of that flow without a
 *     flood-duration cut-off, then the exposure field).
 *  4. Salinity S = S_m + N(0, 0.3), rounded to 0.1, at least 0.
 *  5. E. coli per 100 mL = C_m × e^N(0, 0.5) (measurement and patchiness noise, log-normal).
 *  6. Reported values: below 2 → "<2", above 1600 → ">1600" (the counting range of the
 *     methods), otherwise MPN to two significant figures or an MF count (whole number).
 *  7. Temperature = (1 − φ) T_sea(day) + φ T_river(day) + N(0, 0.3), with φ the model's
 *     freshwater fraction and seasonal cycles T_sea = 14 + 4 cos(2π(doy − 228)/365.25) and
 *     T_river = 11 + 7 cos(2π(doy − 200)/365.25).
 *
 * Each station is sampled every 35–49 days (seeded) from a seeded first day in October 2020
 * until 30 September 2025, and also on the day after its river's flow rises through EVENT_FLOW
 * (about half the 2-year flood: 250 m³/s for the Amberlin, 30 m³/s for Tolley Brook), between
 * 10:00 and 15:45 UTC.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { dateOfDayNumber, dayNumber } from '../../shared/hydrology/calendar-days';
import type { FlowReading } from '../../shared/hydrology/parse-flow-record';
import { createUniformStream } from '../../shared/hydrology/seeded-uniform';
import { type CalibrationRiverSettings, predictSample } from '../../shared/calibration/river-calibration';
import { type Coast, cumulativeLength, shorePlace } from './coast';
import type { Xy } from './local-frame';
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
  river: RiverSpec['name'];
  /** Distance along the shore from the river's mouth [km], positive down-coast (north). */
  along: number;
  /** Distance seaward of the shore [m]. */
  off: number;
  method: 'MPN' | 'MF';
}

/** The stations: six down-coast of the Amberlin, three down-coast of Tolley Brook. */
export const STATION_TABLE: readonly StationSpec[] = [
  { STATION_ID: 'FB-S01', NAME: 'Amberlin north buoy', river: 'Amberlin River', along: 2.0, off: 800, method: 'MPN' },
  { STATION_ID: 'FB-S02', NAME: 'Hollin shore', river: 'Amberlin River', along: 5.5, off: 1500, method: 'MPN' },
  { STATION_ID: 'FB-S03', NAME: 'Fennick Bay south point', river: 'Amberlin River', along: 9.0, off: 600, method: 'MPN' },
  { STATION_ID: 'FB-S04', NAME: 'Fennick Bay head', river: 'Amberlin River', along: 15.0, off: 1800, method: 'MPN' },
  { STATION_ID: 'FB-S05', NAME: 'Gullstone south', river: 'Amberlin River', along: 24.0, off: 1000, method: 'MF' },
  { STATION_ID: 'FB-S06', NAME: 'Gullstone lee', river: 'Amberlin River', along: 48.0, off: 800, method: 'MPN' },
  { STATION_ID: 'FB-S07', NAME: 'Tolley mouth north', river: 'Tolley Brook', along: 2.0, off: 700, method: 'MF' },
  { STATION_ID: 'FB-S08', NAME: 'Tolley shore', river: 'Tolley Brook', along: 6.5, off: 1000, method: 'MF' },
  { STATION_ID: 'FB-S09', NAME: 'Tolley north', river: 'Tolley Brook', along: 12.0, off: 800, method: 'MPN' },
];

/** A station placed on the coast: its point and its place relative to its river's mouth. */
export interface PlacedStation extends StationSpec {
  point: Xy;
  /** s [m] along the shore from the mouth to the nearest shore point (down-coast positive). */
  s: number;
  /** x [m] from the nearest shore point. */
  x: number;
}

/**
 * Places every station on the coast and measures it back: s and x from the nearest point of the
 * mainland shore (which is what the server measures on the plume's walked coast).
 */
export function placeStations(coast: Coast): PlacedStation[] {
  const line = coast.mainland;
  const arc = cumulativeLength(line);
  return STATION_TABLE.map((st) => {
    const mouth = st.river === 'Amberlin River' ? coast.mouthIndex.amberlin : coast.mouthIndex.tolley;
    const { point } = shorePlace(coast, mouth, st.along, st.off);
    let best = { d: Number.POSITIVE_INFINITY, s: 0 };
    for (let i = 0; i < line.length - 1; i++) {
      const a = line[i];
      const b = line[i + 1];
      const dx = b[0] - a[0];
      const dy = b[1] - a[1];
      const f = Math.max(0, Math.min(1, ((point[0] - a[0]) * dx + (point[1] - a[1]) * dy) / (dx * dx + dy * dy)));
      const d = Math.hypot(point[0] - a[0] - f * dx, point[1] - a[1] - f * dy);
      if (d < best.d) best = { d, s: arc[i] + f * Math.hypot(dx, dy) };
    }
    return { ...st, point, s: best.s - arc[mouth], x: best.d };
  });
}

/** Flow [m³/s] whose rising crossing is followed by an event sample at each of the river's stations (about half the 2-year flood). */
export const EVENT_FLOW: Record<RiverSpec['name'], number> = { 'Amberlin River': 250, 'Tolley Brook': 30 };

/** One sample row, as written to samples.csv. */
export interface SampleRow {
  station_id: string;
  sampled_at: string;
  salinity: number;
  e_coli_per_100ml: string;
  method: 'MPN' | 'MF';
  temperature_c: number;
}

/**
 * Makes the samples of every station, sorted by time then station.
 * @param rivers - the river settings (the known values the samples are made with)
 * @param flows - each river's daily readings, by river name
 * @param stations - the placed stations
 * @param latitude - each river's mouth latitude, by river name
 */
export function buildSamples(
  rivers: readonly RiverSpec[],
  flows: Record<string, FlowReading[]>,
  stations: readonly PlacedStation[],
  latitude: Record<string, number>,
): SampleRow[] {
  const next = createUniformStream(MONITORING_SEED);
  const normal = (sd: number) => normalQuantile(next(), 0, sd);
  const flowByDate = new Map<string, Map<string, number>>();
  for (const [name, readings] of Object.entries(flows)) flowByDate.set(name, new Map(readings.map((r) => [r.date, r.discharge])));
  const first = dayNumber(SAMPLING_FROM);
  const last = dayNumber(SAMPLING_TO);
  const rows: SampleRow[] = [];
  for (const station of stations) {
    const river = rivers.find((r) => r.name === station.river);
    const q = flowByDate.get(station.river);
    if (!river || !q) throw new Error(`no river or flow for ${station.STATION_ID}`);
    const settings = knownSettings(river, latitude[river.name]);
    const routine: number[] = [];
    for (let day = first + Math.floor(next() * 21); day <= last; day += 35 + Math.floor(next() * 15)) routine.push(day);
    // Event samples: the day after the river's flow rises through EVENT_FLOW, as a conditionally
    // approved area is sampled after a closure.
    const events: number[] = [];
    for (let day = first + 1; day < last; day++) {
      const before = q.get(dateOfDayNumber(day - 1)) ?? 0;
      const now = q.get(dateOfDayNumber(day)) ?? 0;
      if (before < EVENT_FLOW[station.river] && now >= EVENT_FLOW[station.river]) events.push(day + 1);
    }
    const days = [...new Set([...routine, ...events])].sort((a, b) => a - b);
    for (const day of days) {
      const date = dateOfDayNumber(day);
      const qa = Math.max(...[0, 1].map((k) => q.get(dateOfDayNumber(day - k)) ?? 0));
      const model = predictSample(settings, { flow: qa, along: station.s, offshore: station.x });
      const phi = model.freshwaterFraction;
      const salinity = Math.max(0, round(model.salinity + normal(0.3), 1));
      const eColi = model.indicator * Math.exp(normal(0.5));
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

/**
 * The river settings the samples are made with: the known values of rivers.ts, in the shape the
 * engine's calibration code reads (the shape of a stored river's settings).
 */
export function knownSettings(river: RiverSpec, mouthLatitude: number): CalibrationRiverSettings {
  return {
    mouthLatitude,
    riverSalinity: river.riverSalinity,
    riverTemperature: river.riverTemperature,
    seaSalinity: river.seaSalinity,
    seaTemperature: river.seaTemperature,
    mouthWidth: river.mouthWidthM,
    mouthDepth: river.mouthDepthM,
    shelfSlope: river.shelfSlope,
    alongshoreShare: river.alongshoreShare,
    entrainmentCoefficient: river.entrainmentCoefficient,
    t90DayHours: river.t90DayHours,
    t90NightHours: river.t90NightHours,
    daylightFraction: river.daylightFraction,
    indicator: river.indicator,
    nearFieldFreshwaterFraction: river.nearFieldFreshwaterFraction,
  };
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
