/**
 * @module demo-data/lib/rivers
 * The two invented rivers: their plume settings (rivers.json), their synthetic daily flow
 * records and an inland centreline for drawing.
 */
import { generateSyntheticFlow, type SyntheticFlowOptions } from '../../shared/hydrology/synthetic-flow';
import type { FlowReading } from '../../shared/hydrology/parse-flow-record';
import { km, type Xy } from './local-frame';

/** First day of both flow records (start of water year 1991). */
export const FLOW_START = '1990-10-01';
/** Length of both records in water years (1991 … 2025). */
export const FLOW_YEARS = 35;

/** Everything about one river except its mouth position, which comes from the coast. */
export interface RiverSpec {
  name: 'Amberlin River' | 'Tolley Brook';
  slug: string;
  /** Catchment area above the mouth [km²] (for the README and sanity; the engine does not use it). */
  catchmentAreaKm2: number;
  outflowAzimuthDeg: number;
  mouthWidthM: number;
  mouthDepthM: number;
  riverSalinity: number;
  riverTemperature: number;
  seaSalinity: number;
  seaTemperature: number;
  shelfSlope: number;
  /** E. coli per 100 mL in flood water: C = coefficient × Q^exponent, Q in m³/s. */
  indicator: { kind: 'power-law'; coefficient: number; exponent: number };
  t90DayHours: number;
  t90NightHours: number;
  daylightFraction: number;
  alongshoreShare: number;
  /** E, the entrainment coefficient of the coastal current (sets the dilution length L_e = (2/3)·H0/(φ0·E), science.md §1.11). */
  entrainmentCoefficient: number;
  /** φ0, the share of river water in the water leaving the near field (the samples are made with it). */
  nearFieldFreshwaterFraction: number;
  gauge: { name: string; code: string };
  flowRecordFile: string;
  /** Options of the flow generator (seeded). */
  flow: SyntheticFlowOptions;
  /** Inland centreline control points [km], from the mouth upstream (for drawing only). */
  inland: [number, number][];
}

/** One river as written to rivers/rivers.json (read by the loader and the tests). */
export type RiverJson = Omit<RiverSpec, 'name' | 'flow' | 'inland'> & { name: string; mouth: [number, number] };

/** The rivers; the larger first. */
export const RIVER_TABLE: readonly RiverSpec[] = [
  {
    name: 'Amberlin River',
    slug: 'amberlin-river',
    catchmentAreaKm2: 2100,
    outflowAzimuthDeg: 270,
    mouthWidthM: 250,
    mouthDepthM: 4,
    riverSalinity: 0.2,
    riverTemperature: 8,
    seaSalinity: 33.5,
    seaTemperature: 12,
    shelfSlope: 0.004,
    // 6 × Q^1.2: ~350 per 100 mL at a 30 m³/s base flow, ~9 000 at 480 m³/s, ~26 000 at 1 100 m³/s.
    indicator: { kind: 'power-law', coefficient: 6, exponent: 1.2 },
    // A turbid flood plume in daylight loses its E. coli in a few hours, in the dark in a day or so (science.md §5.2).
    t90DayHours: 2,
    t90NightHours: 24,
    daylightFraction: 0.5,
    alongshoreShare: 0.6,
    entrainmentCoefficient: 2.5e-5,
    nearFieldFreshwaterFraction: 0.5,
    gauge: { name: 'Amberlin River at Hollin Ford', code: 'FCSA-G01' },
    flowRecordFile: 'flows/amberlin-river-daily.csv',
    flow: {
      seed: 19901,
      startDate: FLOW_START,
      years: FLOW_YEARS,
      meanBaseFlow: 20,
      seasonalAmplitude: 0.5,
      peakMonth: 1,
      floodsPerYear: 4,
      floodSeasonality: 0.8,
      medianFloodPeak: 220,
      peakShapeK: -0.12,
      // A large lowland catchment: floods take a week or more to pass (8 days above half the peak).
      recessionDays: 8,
      riseDays: 2,
    },
    inland: [
      [0.0, 0.0],
      [1.0, 0.15],
      [2.1, -0.3],
      [3.3, 0.1],
      [4.6, 0.7],
      [6.0, 0.5],
      [7.4, 1.1],
      [8.8, 1.4],
      [10.2, 1.0],
      [11.5, 1.6],
    ],
  },
  {
    name: 'Tolley Brook',
    slug: 'tolley-brook',
    catchmentAreaKm2: 210,
    outflowAzimuthDeg: 265,
    mouthWidthM: 40,
    mouthDepthM: 1.5,
    riverSalinity: 0.15,
    riverTemperature: 9,
    seaSalinity: 33.5,
    seaTemperature: 12,
    shelfSlope: 0.006,
    // 50 × Q^1.2: ~190 per 100 mL at a 3 m³/s base flow, ~6 400 at 57 m³/s, ~20 000 at 150 m³/s.
    indicator: { kind: 'power-law', coefficient: 50, exponent: 1.2 },
    t90DayHours: 2,
    t90NightHours: 24,
    daylightFraction: 0.5,
    alongshoreShare: 0.6,
    entrainmentCoefficient: 4e-5,
    nearFieldFreshwaterFraction: 0.5,
    gauge: { name: 'Tolley Brook at Wenlow Weir', code: 'FCSA-G02' },
    flowRecordFile: 'flows/tolley-brook-daily.csv',
    flow: {
      seed: 19902,
      startDate: FLOW_START,
      years: FLOW_YEARS,
      meanBaseFlow: 3.2,
      seasonalAmplitude: 0.6,
      peakMonth: 1,
      floodsPerYear: 6,
      floodSeasonality: 0.7,
      medianFloodPeak: 27,
      peakShapeK: -0.18,
      recessionDays: 1.5,
      riseDays: 1,
    },
    inland: [
      [0.0, -30.0],
      [0.8, -29.9],
      [1.7, -29.6],
      [2.7, -29.8],
      [3.7, -29.4],
      [4.8, -29.1],
      [5.8, -28.6],
    ],
  },
];

/**
 * The river's daily flow record from the seeded generator.
 * @param spec - a row of {@link RIVER_TABLE}
 */
export function riverFlows(spec: RiverSpec): FlowReading[] {
  return generateSyntheticFlow(spec.flow);
}

/** The inland centreline in the local frame [m]. */
export function inlandLine(spec: RiverSpec): Xy[] {
  return spec.inland.map(([x, y]) => km(x, y));
}
