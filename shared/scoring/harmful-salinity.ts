/**
 * @module shared/scoring/harmful-salinity
 * Whether one flood's low salinity on a lease is harmful to the lease's species: the event
 * counted by the yearly "chance a year of a harmful salinity event" (see annual-rating.ts).
 *
 * Rule, (c) derived from the species table (shared/biology/species-tolerance.ts, science.md
 * §4 and §4.5): a threshold applies once the lease water stays under it for more than the
 * stated number of days. The plume field is held for the flood's duration, so the water under
 * the acute salinity stays there as long as the water under the chronic one (the days of
 * {@link daysBelowTolerance} in score-lease.ts). An event is harmful when either
 *
 *   lowest salinity < S_acute   and days under it > the acute duration, or
 *   lowest salinity < S_chronic and days under it > the chronic duration.
 *
 * A short dip under the chronic line (a day or two of brackish water) is therefore not a
 * harmful event; it still lowers the per-flood rating through the duration term.
 */

import type { SpeciesTolerance } from '../biology/species-tolerance';

/** One flood on one lease, as stored with its screening. */
export interface SalinityEvent {
  /** Lowest salinity over the lease, psu (0–45), or null when the plume does not reach it. */
  readonly lowestSalinity: number | null;
  /** Days the lease water stays under the species' chronic threshold, ≥ 0 (0 when it never does). */
  readonly daysBelowTolerance: number;
}

/** Which limit makes the event harmful, or null when none does. */
export type SalinityHarm = 'acute' | 'chronic' | null;

/**
 * The limit an event breaks for long enough to harm the species (acute checked first), or null.
 *
 * @param event - lowest salinity and days under the chronic threshold
 * @param tolerance - the species' tolerance (acute and chronic salinity and durations)
 * @returns 'acute', 'chronic' or null
 * @example
 * // Pacific oyster: acute S < 10 for > 2 days, chronic S < 15 for > 7 days (science.md §4.1, (c))
 * salinityHarm({ lowestSalinity: 8, daysBelowTolerance: 3 }, getSpeciesTolerance('pacific-oyster')); // => 'acute'
 * salinityHarm({ lowestSalinity: 12, daysBelowTolerance: 3 }, getSpeciesTolerance('pacific-oyster')); // => null
 * salinityHarm({ lowestSalinity: 12, daysBelowTolerance: 8 }, getSpeciesTolerance('pacific-oyster')); // => 'chronic'
 */
export function salinityHarm(event: SalinityEvent, tolerance: SpeciesTolerance): SalinityHarm {
  const { lowestSalinity, daysBelowTolerance } = event;
  if (!(Number.isFinite(daysBelowTolerance) && daysBelowTolerance >= 0)) {
    throw new Error(`daysBelowTolerance must be 0 or more days; got ${daysBelowTolerance}`);
  }
  if (lowestSalinity === null) return null;
  if (!(lowestSalinity >= 0 && lowestSalinity <= 45)) {
    throw new Error(`lowestSalinity must be a salinity in psu from 0 to 45, or null; got ${lowestSalinity}`);
  }
  if (lowestSalinity < tolerance.acuteLowerSalinity && daysBelowTolerance > tolerance.acuteDurationDays) return 'acute';
  if (lowestSalinity < tolerance.chronicLowerSalinity && daysBelowTolerance > tolerance.chronicDurationDays) return 'chronic';
  return null;
}

/**
 * True when {@link salinityHarm} finds a harmful event.
 *
 * @example
 * isHarmfulSalinityEvent({ lowestSalinity: 8, daysBelowTolerance: 3 }, getSpeciesTolerance('pacific-oyster')); // => true
 */
export function isHarmfulSalinityEvent(event: SalinityEvent, tolerance: SpeciesTolerance): boolean {
  return salinityHarm(event, tolerance) !== null;
}
