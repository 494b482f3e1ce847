import { describe, expect, it } from 'vitest';
import { getSpeciesTolerance } from '../../../shared/biology/species-tolerance';
import { isHarmfulSalinityEvent, salinityHarm } from '../../../shared/scoring/harmful-salinity';

// Pacific oyster: acute S < 10 for more than 2 days, chronic S < 15 for more than 7 days
// (science.md §4.1 suggested screening thresholds, (c)).
const oyster = getSpeciesTolerance('pacific-oyster');

describe('salinityHarm', () => {
  it.each([
    [null, 0, null], // plume does not reach the lease
    [20, 0, null], // above the chronic line
    [12, 3, null], // under the chronic line for 3 days: not more than 7
    [12, 7, null], // exactly 7 days is not "more than 7" (science.md §4.5 duration rule, (c))
    [12, 7.5, 'chronic'],
    [8, 2, null], // under the acute line for exactly 2 days: not more than 2
    [8, 2.5, 'acute'],
    [9.99, 3, 'acute'],
    [10, 3, null], // at the acute line, not under it; 3 days < 7 under the chronic line
  ])('lowest %s psu for %s days → %s', (lowestSalinity, daysBelowTolerance, expected) => {
    expect(salinityHarm({ lowestSalinity, daysBelowTolerance }, oyster)).toBe(expected);
    expect(isHarmfulSalinityEvent({ lowestSalinity, daysBelowTolerance }, oyster)).toBe(expected !== null);
  });

  it("follows the species' own limits (the table of shared/biology)", () => {
    // The same 4-day flood at 18 psu: above every oyster limit, under a scallop's chronic 25 but
    // not for more than its 7 days, and under its acute 20 for more than 2 days (science.md §4.4, (c)).
    const scallop = getSpeciesTolerance('great-scallop');
    expect(salinityHarm({ lowestSalinity: 18, daysBelowTolerance: 4 }, oyster)).toBeNull();
    // Great scallop: acute S < 20 for more than 2 days, chronic S < 25 for more than 7 days (science.md §4.4, (c)).
    expect(salinityHarm({ lowestSalinity: 18, daysBelowTolerance: 4 }, scallop)).toBe('acute');
    expect(salinityHarm({ lowestSalinity: 22, daysBelowTolerance: 4 }, scallop)).toBeNull();
    expect(salinityHarm({ lowestSalinity: 22, daysBelowTolerance: 8 }, scallop)).toBe('chronic');
  });

  it.each([
    [{ lowestSalinity: 50, daysBelowTolerance: 1 }, /lowestSalinity must be a salinity in psu from 0 to 45/],
    [{ lowestSalinity: 5, daysBelowTolerance: -1 }, /daysBelowTolerance must be 0 or more days; got -1/],
  ])('refuses %o', (event, message) => {
    expect(() => salinityHarm(event, oyster)).toThrow(message);
  });
});
