/**
 * @module shared/geometry/default-band-specs
 * The default set of exposure bands drawn on the map (ui.md: bands are named for what they
 * mean, with the threshold in the name).
 */

import type { FieldThreshold } from '../physics/exposure-field';

/** One band to draw: water between the coast and where the threshold stops being met. */
export interface BandSpec {
  /** Stable id (kebab-case), e.g. 'fresh-core'. */
  readonly id: string;
  /** Plain-English name with its threshold, e.g. "Fresh core (salinity under 12)". */
  readonly name: string;
  /** { salinityBelow } | { indicatorAbove } | { presenceAbove }. */
  readonly threshold: FieldThreshold;
}

/** Options of {@link defaultBandSpecs}. */
export interface DefaultBandOptions {
  /** The species' lower salinity limit N (practical salinity), 0…42: the fresh core is water under N. */
  readonly speciesSalinityThreshold: number;
  /** Indicator standard [per 100 mL], > 0, e.g. 14 (NSSP approved-area geometric mean). */
  readonly indicatorStandard: number;
  /** Sea salinity, N…42; default 34. Used only for the brackish-margin default. */
  readonly seaSalinity?: number;
  /** Brackish-margin salinity M, N…42; default midway between N and the sea salinity. */
  readonly brackishSalinity?: number;
}

/** Freshwater fraction that marks the plume edge (1 %) [–]. */
export const PLUME_EDGE_FRACTION = 0.01;

/** Default sea salinity for the brackish-margin midpoint (science.md §2.4 uses 34). */
export const DEFAULT_SEA_SALINITY = 34;

/**
 * The four default bands, innermost first:
 * - 'fresh-core': salinity under the species threshold N;
 * - 'brackish-margin': salinity under M, by default midway between N and the sea salinity
 *   (half-way to sea water: water that is still clearly diluted; a screening choice);
 * - 'indicator-over-standard': faecal indicator above the approved-area standard;
 * - 'plume-edge': any river water, freshwater fraction above 1 %.
 *
 * @param options - species salinity threshold N, indicator standard [per 100 mL], optional sea salinity (default 34) and M
 * @returns band specs (id, name, threshold), in the order above
 * @example
 * defaultBandSpecs({ speciesSalinityThreshold: 12, indicatorStandard: 14 }).map((b) => b.name);
 * // => ['Fresh core (salinity under 12)', 'Brackish margin (salinity under 23)',
 * //     'Indicator above the approved-area standard (14 per 100 mL)',
 * //     'Plume edge (any river water, freshwater fraction above 1 %)']
 * Source: (c) common practice: the midpoint M and the 1 % edge are screening choices of ours;
 * N comes from the species tolerance table (science.md §4) and the standard from §6 (NSSP
 * approved area, geometric mean 14 per 100 mL, (a)); users may change all of them.
 */
export function defaultBandSpecs(options: DefaultBandOptions): BandSpec[] {
  const n = options.speciesSalinityThreshold;
  const sea = options.seaSalinity ?? DEFAULT_SEA_SALINITY;
  if (!Number.isFinite(n) || n < 0 || n > 42) throw new RangeError(`speciesSalinityThreshold must be 0…42 (got ${String(n)})`);
  if (!Number.isFinite(sea) || sea < n || sea > 42) throw new RangeError(`seaSalinity must be ${fmt(n)}…42 (got ${String(sea)})`);
  const m = options.brackishSalinity ?? (n + sea) / 2;
  if (!Number.isFinite(m) || m < n || m > 42) throw new RangeError(`brackishSalinity must be ${fmt(n)}…42 (got ${String(m)})`);
  const c = options.indicatorStandard;
  if (!Number.isFinite(c) || c <= 0) throw new RangeError(`indicatorStandard must be > 0 per 100 mL (got ${String(c)})`);
  return [
    { id: 'fresh-core', name: `Fresh core (salinity under ${fmt(n)})`, threshold: { salinityBelow: n } },
    { id: 'brackish-margin', name: `Brackish margin (salinity under ${fmt(m)})`, threshold: { salinityBelow: m } },
    {
      id: 'indicator-over-standard',
      name: `Indicator above the approved-area standard (${fmt(c)} per 100 mL)`,
      threshold: { indicatorAbove: c },
    },
    {
      id: 'plume-edge',
      name: `Plume edge (any river water, freshwater fraction above ${fmt(PLUME_EDGE_FRACTION * 100)} %)`,
      threshold: { presenceAbove: PLUME_EDGE_FRACTION },
    },
  ];
}

/** @private Up to one decimal, no trailing zero. */
function fmt(x: number): string {
  return String(Math.round(x * 10) / 10);
}
