/**
 * @module shared/schemas/river-parameters
 * Per-river settings of the exposure fields: entrainment coefficient of the coastal current, day/night T90 of the
 * faecal indicator, daylight fraction, indicator concentration in flood water (constant or a
 * power law of flow) and the share of the discharge carried alongshore. Each default has its
 * source in {@link RIVER_PARAMETER_DEFAULTS}.
 */

import { z } from 'zod';
import {
  DEFAULT_ALONGSHORE_SHARE,
  DEFAULT_DAYLIGHT_FRACTION,
  DEFAULT_FLOOD_INDICATOR_CONCENTRATION,
  DEFAULT_ENTRAINMENT_COEFFICIENT,
  DEFAULT_T90_DAY_HOURS,
  DEFAULT_T90_NIGHT_HOURS,
  MAX_ENTRAINMENT_COEFFICIENT,
  MIN_ENTRAINMENT_COEFFICIENT,
} from '../physics/constants';
import { numberField, strictObjectError } from './physical-fields';

/** A documented default: value, unit, science.md label and source. */
export interface DocumentedDefault<T> {
  /** The default value. */
  readonly value: T;
  /** Unit of the value ('' for dimensionless). */
  readonly unit: string;
  /** science.md label: 'a' published, 'b' from memory, 'c' common practice / derived. */
  readonly label: 'a' | 'b' | 'c';
  /** Where the default comes from. */
  readonly source: string;
}

/** Defaults of the river parameters, each with its source label. */
export const RIVER_PARAMETER_DEFAULTS = {
  entrainmentCoefficient: {
    value: DEFAULT_ENTRAINMENT_COEFFICIENT,
    unit: '',
    label: 'b',
    source:
      'from memory: entrainment into strongly stratified flow is of order 1e-5 to 1e-4 (after Ellison & Turner 1959); 3e-5 is the science.md §1.11 check value; sets the dilution length L_e = (2/3)·H0/(φ0·E), which grows with flow; fitted by calibration',
  },
  t90DayHours: {
    value: DEFAULT_T90_DAY_HOURS,
    unit: 'h',
    label: 'c',
    source: 'common practice: daytime E. coli / faecal coliform T90 in a turbid flood plume (science.md §5.2)',
  },
  t90NightHours: {
    value: DEFAULT_T90_NIGHT_HOURS,
    unit: 'h',
    label: 'c',
    source: 'common practice: night-time E. coli / faecal coliform T90 (science.md §5.2)',
  },
  daylightFraction: {
    value: DEFAULT_DAYLIGHT_FRACTION,
    unit: '',
    label: 'c',
    source: 'common practice: 12 h of daylight in 24 h',
  },
  indicator: {
    value: { kind: 'constant', concentration: DEFAULT_FLOOD_INDICATOR_CONCENTRATION },
    unit: 'E. coli per 100 mL',
    label: 'c',
    source: 'common practice: mixed rural catchment in flood, 10⁴ per 100 mL (science.md §5.3)',
  },
  alongshoreShare: {
    value: DEFAULT_ALONGSHORE_SHARE,
    unit: '',
    label: 'b',
    source:
      'from memory: Fong & Geyer 2002, Horner-Devine et al. 2006 (one third to two thirds of the discharge); 0.6 suggested in science.md §1.6',
  },
} as const satisfies Record<string, DocumentedDefault<unknown>>;

/** Indicator concentration in flood water: a constant or C = a·Q^b (Q in m³/s). */
export const IndicatorSpecSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject(
      {
        kind: z.literal('constant'),
        concentration: numberField('indicator.concentration', 'per 100 mL', 'Indicator concentration in flood water', {
          min: 0,
          max: 1e9,
        }),
      },
      strictObjectError('indicator'),
    ),
    z.strictObject(
      {
        kind: z.literal('power-law'),
        coefficient: numberField(
          'indicator.coefficient',
          'per 100 mL per (m³/s)^exponent',
          'Coefficient a of C = a·Q^b',
          { min: 0, max: 1e9 },
        ),
        exponent: numberField('indicator.exponent', '', 'Exponent b of C = a·Q^b', { min: -5, max: 5 }),
      },
      strictObjectError('indicator'),
    ),
  ],
  { error: "indicator.kind must be 'constant' or 'power-law'" },
);

/** An indicator specification. */
export type IndicatorSpecInput = z.infer<typeof IndicatorSpecSchema>;

/** River parameters for the exposure fields; missing fields take their documented defaults. */
export const RiverParametersSchema = z.strictObject(
  {
    entrainmentCoefficient: numberField(
      'entrainmentCoefficient',
      '',
      'Entrainment coefficient of the coastal current (dilution length = (2/3)·depth/(fraction at the mouth × coefficient))',
      { min: MIN_ENTRAINMENT_COEFFICIENT, max: MAX_ENTRAINMENT_COEFFICIENT },
    ).default(RIVER_PARAMETER_DEFAULTS.entrainmentCoefficient.value),
    t90DayHours: numberField('t90DayHours', 'h', 'Daytime T90 of the faecal indicator', {
      min: 0,
      exclusiveMin: true,
      max: 10000,
    }).default(RIVER_PARAMETER_DEFAULTS.t90DayHours.value),
    t90NightHours: numberField('t90NightHours', 'h', 'Night-time T90 of the faecal indicator', {
      min: 0,
      exclusiveMin: true,
      max: 10000,
    }).default(RIVER_PARAMETER_DEFAULTS.t90NightHours.value),
    daylightFraction: numberField('daylightFraction', '', 'Fraction of the day in daylight', {
      min: 0,
      max: 1,
    }).default(RIVER_PARAMETER_DEFAULTS.daylightFraction.value),
    indicator: IndicatorSpecSchema.default({ ...RIVER_PARAMETER_DEFAULTS.indicator.value }).describe(
      'Indicator concentration in flood water: constant, or a power law of discharge',
    ),
    alongshoreShare: numberField(
      'alongshoreShare',
      '',
      'Share of the discharge carried on into the coastal current',
      { min: 0.3, max: 1 },
    ).default(RIVER_PARAMETER_DEFAULTS.alongshoreShare.value),
  },
  strictObjectError('river parameters'),
);

/** Parsed river parameters (defaults filled in). */
export type RiverParameters = z.infer<typeof RiverParametersSchema>;
/** River parameters as typed by a user (fields with defaults may be left out). */
export type RiverParametersInput = z.input<typeof RiverParametersSchema>;
