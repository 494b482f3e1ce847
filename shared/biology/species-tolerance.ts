/**
 * @module shared/biology/species-tolerance
 * Lower salinity tolerance of farmed bivalves (science.md §4), as screening defaults that a
 * user can change. Salinity is practical salinity (psu ≈ ppt ≈ g kg⁻¹ for screening, §4).
 *
 * How the single numbers were chosen, (c) common practice / derived: science.md §4 gives
 * most suggested thresholds as ranges ("S < 5–10 for more than 2–5 days"). Each row takes the
 * end of each range that flags stress sooner: the higher salinity and the shorter duration.
 * Durations follow §4.5 (c): a threshold applies once the lease water stays under it for more
 * than the stated number of days. None of these are regulatory values.
 */

import type { SourceNote } from './source-note';

/** Kebab-case ids of the species in the table. */
export const SPECIES_IDS = [
  'pacific-oyster',
  'eastern-oyster',
  'flat-oyster',
  'blue-mussel',
  'mediterranean-mussel',
  'hard-clam',
  'manila-clam',
  'bay-scallop',
  'sea-scallop',
  'great-scallop',
] as const;

/** One of {@link SPECIES_IDS}. */
export type SpeciesId = (typeof SPECIES_IDS)[number];

/** Broad group, as science.md §4 arranges the species. */
export type SpeciesGroup = 'oyster' | 'mussel' | 'clam' | 'scallop';

/** The thresholds a user may override (all of them). */
export interface SpeciesToleranceOverrides {
  /** Acute (short-term lethal / stress) lower salinity, psu, 0–45. */
  readonly acuteLowerSalinity?: number;
  /** Days under the acute salinity after which harm is expected, (0, 365]. */
  readonly acuteDurationDays?: number;
  /** Chronic (sustained) lower salinity, psu, 0–45; must be ≥ the acute salinity. */
  readonly chronicLowerSalinity?: number;
  /** Days under the chronic salinity after which harm is expected, (0, 365]. */
  readonly chronicDurationDays?: number;
  /** Lower end of the optimum range, psu, 0–45, or null for none. */
  readonly optimumMin?: number | null;
  /** Upper end of the optimum range, psu, 0–45, or null for none / open-ended. */
  readonly optimumMax?: number | null;
}

/** Names of the overridable thresholds. */
export type ToleranceField = keyof SpeciesToleranceOverrides;

/** A row of the species table. */
export interface SpeciesTolerance {
  /** Kebab-case id. */
  readonly id: SpeciesId;
  /** Common name, singular ("Pacific oyster"). */
  readonly commonName: string;
  /** Common name, plural, for sentences ("Pacific oysters"). */
  readonly commonNamePlural: string;
  /** Scientific name as science.md §4 writes it. */
  readonly scientificName: string;
  /** Group. */
  readonly group: SpeciesGroup;
  /** Acute lower salinity, psu: short-term lethal or severe stress below it. */
  readonly acuteLowerSalinity: number;
  /** Days under the acute salinity after which mortality risk rises, days. */
  readonly acuteDurationDays: number;
  /** Chronic lower salinity, psu: sustained stress (growth, condition) below it. */
  readonly chronicLowerSalinity: number;
  /** Days under the chronic salinity after which the chronic threshold applies, days. */
  readonly chronicDurationDays: number;
  /** Lower end of the optimum salinity range, psu, or null when science.md gives none. */
  readonly optimumMin: number | null;
  /** Upper end of the optimum range, psu, or null when none is given or it is open-ended. */
  readonly optimumMax: number | null;
  /** Source of the acute and chronic thresholds (their label and citation, science.md §4). */
  readonly source: SourceNote;
  /** Source of the optimum range, or null when there is none. */
  readonly optimumSource: SourceNote | null;
  /** Source of the duration rule (science.md §4.5). */
  readonly durationSource: SourceNote;
  /** The observations behind the thresholds, each with its own label. */
  readonly evidence: readonly SourceNote[];
  /** Caveats to show beside the numbers (temperature modifiers, life stages). */
  readonly notes: readonly string[];
  /** Fields changed by the user through overrides; empty for the table's defaults. */
  readonly overridden: readonly ToleranceField[];
}

/** The overridable fields, in display order. */
export const TOLERANCE_FIELDS: readonly ToleranceField[] = [
  'acuteLowerSalinity',
  'acuteDurationDays',
  'chronicLowerSalinity',
  'chronicDurationDays',
  'optimumMin',
  'optimumMax',
];

/** Salinity range accepted for any threshold, psu. */
export const SALINITY_RANGE = { min: 0, max: 45 } as const;
/** Duration range accepted for any threshold, days. */
export const DURATION_RANGE_DAYS = { minExclusive: 0, max: 365 } as const;

const DURATION_SOURCE: SourceNote = {
  label: 'c',
  citation:
    'science.md §4.5 duration and exposure metrics: consecutive days below an acute threshold (risk rises steeply once days exceed about 2–7) and cumulative salinity deficit-days below the chronic threshold',
};

const WARM_WATER_NOTE = 'Tolerance shortens sharply above about 25 °C (science.md §4.5, (c)); the durations here are for cool water.';
const LIFE_STAGE_NOTE = 'Gametes < embryos < larvae < spat < adults in tolerance (science.md §4, (a)); the thresholds are for adults.';

type TableRow = Omit<SpeciesTolerance, 'overridden' | 'durationSource'>;

const ROWS: readonly TableRow[] = [
  {
    id: 'pacific-oyster',
    commonName: 'Pacific oyster',
    commonNamePlural: 'Pacific oysters',
    scientificName: 'Crassostrea (Magallana) gigas',
    group: 'oyster',
    acuteLowerSalinity: 10,
    acuteDurationDays: 2,
    chronicLowerSalinity: 15,
    chronicDurationDays: 7,
    optimumMin: 20,
    optimumMax: 35,
    source: {
      label: 'c',
      citation:
        'science.md §4.1 suggested screening thresholds: chronic stress S < 15 for more than 7 days; acute S < 5–10 for more than 2–5 days, shorter when water is warm',
    },
    optimumSource: { label: 'a', citation: 'Univ. Copenhagen project description: optimal range 20–35 ppt; tolerates up to 38 ppt' },
    evidence: [
      {
        label: 'a',
        citation:
          'Seo, Kim, Jeong, Lee, Shin & Baek, Korean Society of Malacology journal, "Effects of the salinity and temperature on the mortality of C. gigas"',
        about: 'at 20 °C mortality only below 5 psu; at ≥ 25 °C 100 % mortality at 5 psu',
      },
      {
        label: 'b',
        citation: 'science.md §4.1 chronic threshold, from memory',
        about: 'growth reduced below about 15–20; adults survive about 10–12 for weeks when cool',
      },
    ],
    notes: [WARM_WATER_NOTE, LIFE_STAGE_NOTE],
  },
  {
    id: 'eastern-oyster',
    commonName: 'eastern oyster',
    commonNamePlural: 'eastern oysters',
    scientificName: 'Crassostrea virginica',
    group: 'oyster',
    acuteLowerSalinity: 3,
    acuteDurationDays: 7,
    chronicLowerSalinity: 8,
    chronicDurationDays: 14,
    optimumMin: 10,
    optimumMax: 20,
    source: {
      label: 'c',
      citation:
        'science.md §4.1 suggested screening thresholds: chronic S < 5–8 for more than 14 days; acute S < 2–3 for more than 7 days (warm) or more than 14–30 days (cold)',
    },
    optimumSource: {
      label: 'a',
      citation: 'Shumway 1996 as cited in the Barataria Bay/Breton Sound growth–mortality paper: tolerated 0–42.5, optimal 10–20',
    },
    evidence: [
      {
        label: 'a',
        citation: 'SEAFWA Proceedings 1992, "Effects of freshwater flooding on eastern oyster populations in a Texas estuary"',
        about: 'salinity below 5 ppt for 4 months: mortality near 100 %',
      },
      {
        label: 'a',
        citation: 'VIMS, Proc. Natl. Shellfish. Assoc. 49, 29–49, 1959 (James River 1958)',
        about: 'deaths up to 90 %; mortality followed the temperature rise above 23 °C while salinity stayed low',
      },
      { label: 'a', citation: 'virginiaplaces.org', about: 'need ≥ 8 ppt to grow; upstream boundary about 5 ppt' },
      {
        label: 'a',
        citation: 'La Peyre, Gossman & La Peyre 2009, Estuaries Coasts, doi 10.1007/s12237-009-9149-9',
        about: 'growth positively correlated with salinity',
      },
      { label: 'a', citation: 'USGS pub 70229486', about: 'most sensitive to warming at salinity 4' },
    ],
    notes: [
      'Acute duration is for warm water; in cold water oysters last 14–30 days (science.md §4.1, (c)).',
      WARM_WATER_NOTE,
      LIFE_STAGE_NOTE,
    ],
  },
  {
    id: 'flat-oyster',
    commonName: 'flat oyster',
    commonNamePlural: 'flat oysters',
    scientificName: 'Ostrea edulis',
    group: 'oyster',
    acuteLowerSalinity: 15,
    acuteDurationDays: 3,
    chronicLowerSalinity: 20,
    chronicDurationDays: 7,
    optimumMin: 25,
    optimumMax: null,
    source: {
      label: 'c',
      citation: 'science.md §4.1 suggested thresholds: chronic S < 20 for more than 7 days; acute S < 12–15 for more than 3 days',
    },
    optimumSource: { label: 'b', citation: 'science.md §4.1 adults, from memory: a stenohaline oyster best above about 25' },
    evidence: [
      {
        label: 'a',
        citation:
          'abstract, "Survival and growth of larvae of the European oyster O. edulis at lowered salinities" (authors from memory Davis & Ansell 1962, Biol. Bull. — (b))',
        about: 'larvae metamorphose down to 20 ppt; at 15 ppt all died within 16 days',
      },
      {
        label: 'b',
        citation: 'science.md §4.1 adults, from memory',
        about: 'tolerates about 16–20 for short periods; prolonged exposure below about 20 impairs growth and reproduction',
      },
    ],
    notes: [LIFE_STAGE_NOTE],
  },
  {
    id: 'blue-mussel',
    commonName: 'blue mussel',
    commonNamePlural: 'blue mussels',
    scientificName: 'Mytilus edulis',
    group: 'mussel',
    acuteLowerSalinity: 5,
    acuteDurationDays: 5,
    chronicLowerSalinity: 10,
    chronicDurationDays: 14,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation: 'science.md §4.2 suggested thresholds, M. edulis: chronic S < 10 for more than 14 days; acute S < 4–5 for more than 5 days',
    },
    optimumSource: null,
    evidence: [
      { label: 'a', citation: 'Gosling, Marine Mussels, Wiley, chapter on environment', about: 'euryhaline; 4–40 psu in nature' },
      {
        label: 'a',
        citation: 'Riisgård et al. 2013, Helgol. Mar. Res. 67',
        about: 'filtration nearly unchanged at 10–30 psu; significantly lower at 5 psu',
      },
      {
        label: 'a',
        citation: 'Riisgård et al. 2014, Open J. Mar. Sci. 4, 101–109',
        about: 'a drop from 20 to 6.5 psu caused immediate valve closure',
      },
      {
        label: 'a',
        citation: 'Riisgård, Bøttiger & Pleissner 2012, Open J. Mar. Sci. 2, 167–176',
        about: 'growth falls with decreasing salinity between 30 and 10 psu',
      },
      {
        label: 'a',
        citation: 'Frontiers in Marine Science 2020, 10.3389/fmars.2020.00371',
        about: 'experimental farms in a brackish sea at 7–17 psu',
      },
    ],
    notes: [LIFE_STAGE_NOTE],
  },
  {
    id: 'mediterranean-mussel',
    commonName: 'Mediterranean mussel',
    commonNamePlural: 'Mediterranean mussels',
    scientificName: 'Mytilus galloprovincialis',
    group: 'mussel',
    acuteLowerSalinity: 10,
    acuteDurationDays: 5,
    chronicLowerSalinity: 15,
    chronicDurationDays: 7,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation:
        'science.md §4.2 suggested thresholds, M. galloprovincialis: chronic S < 15 for more than 7 days; acute S < 8–10 for more than 5 days',
    },
    optimumSource: null,
    evidence: [
      {
        label: 'b',
        citation: 'science.md §4.2, M. galloprovincialis, from memory',
        about: 'less tolerant than M. edulis; stress below about 15–18, mortality with prolonged exposure below about 10',
      },
    ],
    notes: [LIFE_STAGE_NOTE],
  },
  {
    id: 'hard-clam',
    commonName: 'hard clam',
    commonNamePlural: 'hard clams',
    scientificName: 'Mercenaria mercenaria',
    group: 'clam',
    acuteLowerSalinity: 10,
    acuteDurationDays: 3,
    chronicLowerSalinity: 17,
    chronicDurationDays: 7,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation: 'science.md §4.3 suggested thresholds: chronic S < 15–17 for more than 7 days; acute S < 10 for more than 3–5 days',
    },
    optimumSource: null,
    evidence: [
      {
        label: 'a',
        citation:
          'Baker, Baker, Heuberger & Sturmer 2005, J. Shellfish Res. 24(1), 29, "Short-term effects of rapid salinity reduction on seed clams"',
        about: 'drops of 10–15 ppt: < 5 % mortality; drops of 24 ppt: 17–100 % mortality',
      },
      {
        label: 'a',
        citation: 'UF/IFAS EDIS FA128 text (Baker, Hoover & Sturmer)',
        about: 'no burrowing at 5 or 10 ppt; at 15 ppt fewer than 25 % buried within 24 h',
      },
    ],
    notes: [LIFE_STAGE_NOTE],
  },
  {
    id: 'manila-clam',
    commonName: 'Manila clam',
    commonNamePlural: 'Manila clams',
    scientificName: 'Ruditapes (Venerupis) philippinarum',
    group: 'clam',
    acuteLowerSalinity: 10,
    acuteDurationDays: 2,
    chronicLowerSalinity: 18,
    chronicDurationDays: 7,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation: 'science.md §4.3 suggested thresholds: chronic S < 15–18 for more than 7 days; acute S < 10 for more than 2–4 days',
    },
    optimumSource: null,
    evidence: [
      {
        label: 'a',
        citation: 'Matsuda et al. 2008, Aquaculture Sci. 56(1), 127–136',
        about: 'no deaths during 96 h at 15 psu, 25 °C; substantial mortality below 10 psu',
      },
      {
        label: 'a',
        citation: 'abstract, "Effects of salinity on sand burrowing activity, feeding and growth of the clams…"',
        about: 'adults died at 6.1 psu; at 10.8 psu neither burrowed nor filtered',
      },
      {
        label: 'a',
        citation: 'Bae et al. 2021, J. Mar. Sci. Eng. 9, 754',
        about: '24 °C with 18 psu significantly reduced survival within 8 days',
      },
    ],
    notes: [WARM_WATER_NOTE, LIFE_STAGE_NOTE],
  },
  {
    id: 'bay-scallop',
    commonName: 'bay scallop',
    commonNamePlural: 'bay scallops',
    scientificName: 'Argopecten irradians',
    group: 'scallop',
    acuteLowerSalinity: 20,
    acuteDurationDays: 2,
    chronicLowerSalinity: 25,
    chronicDurationDays: 7,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation:
        'science.md §4.4 suggested thresholds for scallops: chronic S < 25 for more than 7 days; acute S < 20 for more than 2 days (S < 26 if T < 6 °C)',
    },
    optimumSource: null,
    evidence: [
      {
        label: 'b',
        citation: 'science.md §4.4, Argopecten irradians, from memory',
        about: 'lower limit of about 15–20; the group threshold is the more cautious default',
      },
      {
        label: 'a',
        citation: 'Strand et al. 1993, Aquaculture 115, 169–179 (Pecten maximus juveniles, 30-day exposure)',
        about: 'group evidence: site farms where salinity seldom drops below 29 ppt',
      },
    ],
    notes: ['Scallop tolerance narrows below about 6 °C: acute S < 26 (science.md §4.4, (c)).', LIFE_STAGE_NOTE],
  },
  {
    id: 'sea-scallop',
    commonName: 'sea scallop',
    commonNamePlural: 'sea scallops',
    scientificName: 'Placopecten magellanicus',
    group: 'scallop',
    acuteLowerSalinity: 20,
    acuteDurationDays: 2,
    chronicLowerSalinity: 25,
    chronicDurationDays: 7,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation:
        'science.md §4.4 suggested thresholds for scallops: chronic S < 25 for more than 7 days; acute S < 20 for more than 2 days (S < 26 if T < 6 °C)',
    },
    optimumSource: null,
    evidence: [
      { label: 'b', citation: 'science.md §4.4, Placopecten magellanicus, from memory', about: 'lower limit of about 25' },
      {
        label: 'a',
        citation: 'Strand et al. 1993, Aquaculture 115, 169–179 (Pecten maximus juveniles, 30-day exposure)',
        about: 'group evidence: at 5 °C more than 50 % mortality below 26 ppt',
      },
    ],
    notes: ['Scallop tolerance narrows below about 6 °C: acute S < 26 (science.md §4.4, (c)).', LIFE_STAGE_NOTE],
  },
  {
    id: 'great-scallop',
    commonName: 'great scallop',
    commonNamePlural: 'great scallops',
    scientificName: 'Pecten maximus',
    group: 'scallop',
    acuteLowerSalinity: 20,
    acuteDurationDays: 2,
    chronicLowerSalinity: 25,
    chronicDurationDays: 7,
    optimumMin: null,
    optimumMax: null,
    source: {
      label: 'c',
      citation:
        'science.md §4.4 suggested thresholds for scallops: chronic S < 25 for more than 7 days; acute S < 20 for more than 2 days (S < 26 if T < 6 °C)',
    },
    optimumSource: null,
    evidence: [
      {
        label: 'a',
        citation: 'Strand et al. 1993, Aquaculture 115, 169–179',
        about: 'juveniles, 30 days: at 9 °C no mortality above 20 ppt; at 5 °C more than 50 % mortality below 26 ppt',
      },
      {
        label: 'a',
        citation:
          'abstract, "Effect of reduced salinity on the great scallop Pecten maximus spat at two rearing temperatures" (authors from memory Christophersen & Strand 2003, Aquaculture — (b))',
        about: 'over 25 days at S = 20, 59 % mortality at 15 °C; avoid sites below 25 for extended periods',
      },
    ],
    notes: ['Scallop tolerance narrows below about 6 °C: acute S < 26 (science.md §4.4, (c)).', LIFE_STAGE_NOTE],
  },
];

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object' && !Object.isFrozen(value)) {
    for (const key of Object.keys(value)) deepFreeze((value as Record<string, unknown>)[key]);
    Object.freeze(value);
  }
  return value;
}

/**
 * The species table with its default (screening) thresholds, frozen.
 * Each row's `source` carries the science.md label and citation of its thresholds;
 * `evidence` lists the observations behind them, each with its own label.
 *
 * @example
 * SPECIES_TOLERANCES.find((row) => row.id === 'blue-mussel')?.chronicLowerSalinity; // => 10
 */
export const SPECIES_TOLERANCES: readonly SpeciesTolerance[] = deepFreeze(
  ROWS.map((row) => ({ ...row, durationSource: DURATION_SOURCE, overridden: [] as ToleranceField[] })),
);

/**
 * True when `id` names a species in the table.
 *
 * @param id - any string
 * @returns whether it is a {@link SpeciesId}
 * @example
 * isSpeciesId('manila-clam'); // => true
 */
export function isSpeciesId(id: string): id is SpeciesId {
  return (SPECIES_IDS as readonly string[]).includes(id);
}

/**
 * Looks up a species' salinity tolerance, optionally with user overrides of any threshold.
 * Overridden fields are listed in `overridden`; the row's sources stay as they are, so a
 * report can show both the user's number and the default's provenance.
 *
 * Valid ranges: salinities 0–45 psu with acute ≤ chronic; durations (0, 365] days; the
 * optimum minimum below its maximum. Throws with the field name and range otherwise.
 * Source of defaults: see each row (science.md §4, §4.5; thresholds (c) screening defaults).
 *
 * @param id - a {@link SpeciesId}
 * @param overrides - thresholds to replace
 * @returns a frozen tolerance row
 * @example
 * getSpeciesTolerance('pacific-oyster').chronicLowerSalinity; // => 15
 * getSpeciesTolerance('pacific-oyster', { chronicLowerSalinity: 12 }).overridden; // => ['chronicLowerSalinity']
 */
export function getSpeciesTolerance(id: string, overrides: SpeciesToleranceOverrides = {}): SpeciesTolerance {
  const row = SPECIES_TOLERANCES.find((candidate) => candidate.id === id);
  if (!row) {
    throw new Error(`id must be one of ${SPECIES_IDS.join(', ')}; got "${id}"`);
  }
  const overridden: ToleranceField[] = [];
  const merged: Record<string, unknown> = { ...row };
  for (const field of TOLERANCE_FIELDS) {
    if (!(field in overrides)) continue;
    const value = overrides[field];
    if (value === undefined) continue;
    merged[field] = value;
    overridden.push(field);
  }
  const result = { ...merged, overridden } as unknown as SpeciesTolerance;
  validateTolerance(result);
  return deepFreeze(result);
}

/**
 * Checks a tolerance row's thresholds; throws naming the field and its allowed range.
 *
 * @param tolerance - the row to check
 * @example
 * validateTolerance(getSpeciesTolerance('hard-clam')); // no throw
 */
export function validateTolerance(tolerance: SpeciesTolerance): void {
  const salinityFields = ['acuteLowerSalinity', 'chronicLowerSalinity'] as const;
  for (const field of salinityFields) checkSalinity(field, tolerance[field]);
  for (const field of ['optimumMin', 'optimumMax'] as const) {
    const value = tolerance[field];
    if (value !== null) checkSalinity(field, value);
  }
  for (const field of ['acuteDurationDays', 'chronicDurationDays'] as const) {
    const value = tolerance[field];
    if (!Number.isFinite(value) || value <= DURATION_RANGE_DAYS.minExclusive || value > DURATION_RANGE_DAYS.max) {
      throw new Error(`${field} must be a number of days in (0, 365]; got ${value}`);
    }
  }
  if (tolerance.acuteLowerSalinity > tolerance.chronicLowerSalinity) {
    throw new Error(
      `acuteLowerSalinity must be at or below chronicLowerSalinity (${tolerance.chronicLowerSalinity} psu); got ${tolerance.acuteLowerSalinity}`,
    );
  }
  if (tolerance.optimumMin !== null && tolerance.optimumMax !== null && tolerance.optimumMin >= tolerance.optimumMax) {
    throw new Error(`optimumMin must be below optimumMax (${tolerance.optimumMax} psu); got ${tolerance.optimumMin}`);
  }
}

function checkSalinity(field: string, value: number): void {
  if (!Number.isFinite(value) || value < SALINITY_RANGE.min || value > SALINITY_RANGE.max) {
    throw new Error(`${field} must be a salinity in psu from 0 to 45; got ${value}`);
  }
}
