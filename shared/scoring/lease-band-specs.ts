/**
 * The bands a footprint is built with: the four standard bands plus one "salinity under N"
 * band for each distinct chronic lower salinity of the species table, so a lease of any
 * species can be scored against its own limit.
 */
import { SPECIES_TOLERANCES, type SpeciesTolerance } from '../biology/species-tolerance';
import { type BandSpec, defaultBandSpecs } from '../geometry/default-band-specs';

/** Id of the band "salinity under N" for a species' chronic limit N. */
export function salinityBandId(limit: number): string {
  return `salinity-under-${String(limit).replace('.', '-')}`;
}

/**
 * @param seaSalinity - the river's sea salinity (psu), for the brackish margin
 * @param indicatorStandard - indicator standard (per 100 mL), default 14: NSSP approved-area
 *   geometric mean (a, science.md §6.1), used here as a screening threshold (c)
 * @example
 * screeningBandSpecs(33.5).map((b) => b.id); // ['fresh-core', 'brackish-margin', 'indicator-over-standard', 'plume-edge', 'salinity-under-8', …]
 */
export function screeningBandSpecs(seaSalinity: number, indicatorStandard = 14): BandSpec[] {
  const limits = [...new Set(SPECIES_TOLERANCES.map((s) => s.chronicLowerSalinity))].sort((a, b) => a - b);
  const lowest = limits[0];
  const base = defaultBandSpecs({ speciesSalinityThreshold: lowest, indicatorStandard, seaSalinity: Math.max(seaSalinity, lowest) });
  const perSpecies = limits.map((limit) => {
    const names = SPECIES_TOLERANCES.filter((s) => s.chronicLowerSalinity === limit).map((s) => s.commonNamePlural);
    return { id: salinityBandId(limit), name: `Salinity under ${limit} (the sustained limit for ${names.join(', ')})`, threshold: { salinityBelow: limit } };
  });
  return [...base, ...perSpecies];
}

/** The strictest species (highest chronic limit): used when a lease's species is not known. */
export function strictestSpecies(): SpeciesTolerance {
  return [...SPECIES_TOLERANCES].sort((a, b) => b.chronicLowerSalinity - a.chronicLowerSalinity)[0];
}
