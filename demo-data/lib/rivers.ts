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
  mixingLengthM: number;
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
    outflowAzimuthDeg: 270,
    mouthWidthM: 450,
    mouthDepthM: 5,
    riverSalinity: 0.2,
    riverTemperature: 8,
    seaSalinity: 33.5,
    seaTemperature: 12,
    shelfSlope: 0.004,
    // 13 × Q^1.2: ~1 800 per 100 mL at a 60 m³/s base flow, ~20 000 at 450 m³/s, ~52 000 at 1 000 m³/s.
    indicator: { kind: 'power-law', coefficient: 13, exponent: 1.2 },
    t90DayHours: 8,
    t90NightHours: 40,
    daylightFraction: 0.5,
    alongshoreShare: 0.6,
    mixingLengthM: 25_000,
    gauge: { name: 'Amberlin River at Hollin Ford', code: 'FCSA-G01' },
    flowRecordFile: 'flows/amberlin-river-daily.csv',
    flow: {
      seed: 19901,
      startDate: FLOW_START,
      years: FLOW_YEARS,
      meanBaseFlow: 60,
      seasonalAmplitude: 0.5,
      peakMonth: 1,
      floodsPerYear: 4,
      floodSeasonality: 0.8,
      medianFloodPeak: 450,
      peakShapeK: -0.12,
      recessionDays: 5,
      riseDays: 2,
    },
    inland: [
      [7.0, 0.0],
      [7.7, 0.1],
      [8.4, -0.25],
      [9.1, 0.05],
      [9.8, 0.6],
      [10.6, 0.45],
      [11.3, 0.95],
      [12.0, 1.2],
    ],
  },
  {
    name: 'Tolley Brook',
    slug: 'tolley-brook',
    outflowAzimuthDeg: 265,
    mouthWidthM: 60,
    mouthDepthM: 2,
    riverSalinity: 0.15,
    riverTemperature: 9,
    seaSalinity: 33.5,
    seaTemperature: 12,
    shelfSlope: 0.006,
    // 100 × Q^1.2: ~530 per 100 mL at a 4 m³/s base flow, ~9 600 at 45 m³/s, ~25 000 at 100 m³/s.
    indicator: { kind: 'power-law', coefficient: 100, exponent: 1.2 },
    t90DayHours: 8,
    t90NightHours: 40,
    daylightFraction: 0.5,
    alongshoreShare: 0.6,
    mixingLengthM: 12_000,
    gauge: { name: 'Tolley Brook at Wenlow Weir', code: 'FCSA-G02' },
    flowRecordFile: 'flows/tolley-brook-daily.csv',
    flow: {
      seed: 19902,
      startDate: FLOW_START,
      years: FLOW_YEARS,
      meanBaseFlow: 4,
      seasonalAmplitude: 0.6,
      peakMonth: 1,
      floodsPerYear: 6,
      floodSeasonality: 0.7,
      medianFloodPeak: 45,
      peakShapeK: -0.18,
      recessionDays: 1.5,
      riseDays: 1,
    },
    inland: [
      [0.0, -14.0],
      [0.7, -13.9],
      [1.5, -13.6],
      [2.4, -13.8],
      [3.3, -13.4],
      [4.2, -13.1],
      [5.0, -12.6],
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
