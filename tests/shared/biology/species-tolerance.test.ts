import { describe, expect, it } from 'vitest';
import { formatSourceNote } from '../../../shared/biology/source-note';
import {
  getSpeciesTolerance,
  isSpeciesId,
  SPECIES_IDS,
  SPECIES_TOLERANCES,
  type SpeciesToleranceOverrides,
} from '../../../shared/biology/species-tolerance';

describe('SPECIES_TOLERANCES table', () => {
  it('has one row per id, in order', () => {
    expect(SPECIES_TOLERANCES.map((row) => row.id)).toEqual([...SPECIES_IDS]);
  });

  it.each(SPECIES_TOLERANCES.map((row) => [row.id, row] as const))('%s carries labelled sources', (_id, row) => {
    expect(['a', 'b', 'c']).toContain(row.source.label);
    expect(row.source.citation).toMatch(/science\.md §4\.\d/);
    expect(row.durationSource.label).toBe('c');
    expect(row.durationSource.citation).toContain('§4.5');
    expect(row.evidence.length).toBeGreaterThan(0);
    for (const note of row.evidence) {
      expect(['a', 'b', 'c']).toContain(note.label);
      expect(note.citation.length).toBeGreaterThan(10);
    }
    if (row.optimumMin !== null || row.optimumMax !== null) {
      expect(row.optimumSource).not.toBeNull();
    }
    expect(row.overridden).toEqual([]);
    expect(row.acuteLowerSalinity).toBeLessThanOrEqual(row.chronicLowerSalinity);
  });

  // Expected thresholds are science.md §4 "suggested screening thresholds" (c); where §4 gives a
  // range the row takes the end that flags stress sooner (higher salinity, shorter duration), (c).
  // Optimum ranges: Pacific 20–35 (a, Univ. Copenhagen), eastern 10–20 (a, Shumway 1996 as cited),
  // flat oyster best above about 25 (b, from memory).
  it.each([
    // id, acute psu, acute days, chronic psu, chronic days, optimum min, optimum max
    ['pacific-oyster', 10, 2, 15, 7, 20, 35], // §4.1 (c): chronic 15 >7 d; acute 5–10 for 2–5 d
    ['eastern-oyster', 3, 7, 8, 14, 10, 20], // §4.1 (c): chronic 5–8 >14 d; acute 2–3 >7 d (warm)
    ['flat-oyster', 15, 3, 20, 7, 25, null], // §4.1 (c): chronic 20 >7 d; acute 12–15 >3 d
    ['blue-mussel', 5, 5, 10, 14, null, null], // §4.2 (c): chronic 10 >14 d; acute 4–5 >5 d
    ['mediterranean-mussel', 10, 5, 15, 7, null, null], // §4.2 (c): chronic 15 >7 d; acute 8–10 >5 d
    ['hard-clam', 10, 3, 17, 7, null, null], // §4.3 (c): chronic 15–17 >7 d; acute 10 >3–5 d
    ['manila-clam', 10, 2, 18, 7, null, null], // §4.3 (c): chronic 15–18 >7 d; acute 10 >2–4 d
    ['bay-scallop', 20, 2, 25, 7, null, null], // §4.4 (c) scallop group: chronic 25 >7 d; acute 20 >2 d
    ['sea-scallop', 20, 2, 25, 7, null, null], // §4.4 (c) scallop group
    ['great-scallop', 20, 2, 25, 7, null, null], // §4.4 (c) scallop group
  ] as const)('%s thresholds', (id, acute, acuteDays, chronic, chronicDays, optMin, optMax) => {
    const row = getSpeciesTolerance(id);
    expect(row.acuteLowerSalinity).toBe(acute);
    expect(row.acuteDurationDays).toBe(acuteDays);
    expect(row.chronicLowerSalinity).toBe(chronic);
    expect(row.chronicDurationDays).toBe(chronicDays);
    expect(row.optimumMin).toBe(optMin);
    expect(row.optimumMax).toBe(optMax);
  });

  it('is frozen, so callers cannot change the defaults', () => {
    const row = SPECIES_TOLERANCES[0];
    expect(Object.isFrozen(row)).toBe(true);
    expect(Object.isFrozen(row.source)).toBe(true);
    expect(() => {
      (row as { chronicLowerSalinity: number }).chronicLowerSalinity = 1;
    }).toThrow();
  });

  it('formats source notes with the science.md label words', () => {
    expect(formatSourceNote({ label: 'a', citation: 'X' })).toBe('(a) published: X');
    expect(formatSourceNote({ label: 'b', citation: 'X' })).toBe('(b) from memory: X');
    expect(formatSourceNote({ label: 'c', citation: 'X' })).toBe('(c) common practice / derived: X');
  });
});

describe('getSpeciesTolerance overrides', () => {
  it.each([
    ['acuteLowerSalinity', 7],
    ['acuteDurationDays', 4],
    ['chronicLowerSalinity', 12],
    ['chronicDurationDays', 10],
    ['optimumMin', 18],
    ['optimumMax', 32],
  ] as const)('overrides %s', (field, value) => {
    const row = getSpeciesTolerance('pacific-oyster', { [field]: value } as SpeciesToleranceOverrides);
    expect(row[field]).toBe(value);
    expect(row.overridden).toEqual([field]);
    // The table itself is unchanged.
    expect(getSpeciesTolerance('pacific-oyster').overridden).toEqual([]);
  });

  it('overrides several fields at once and can clear the optimum', () => {
    const row = getSpeciesTolerance('eastern-oyster', { chronicLowerSalinity: 10, optimumMin: null, optimumMax: null });
    expect(row.chronicLowerSalinity).toBe(10);
    expect(row.optimumMin).toBeNull();
    expect(row.overridden).toEqual(['chronicLowerSalinity', 'optimumMin', 'optimumMax']);
  });

  it('ignores undefined override fields', () => {
    expect(getSpeciesTolerance('hard-clam', { chronicLowerSalinity: undefined }).overridden).toEqual([]);
  });

  it.each([
    [{ chronicLowerSalinity: 50 }, /chronicLowerSalinity must be a salinity in psu from 0 to 45/],
    [{ acuteLowerSalinity: -1 }, /acuteLowerSalinity must be a salinity in psu from 0 to 45/],
    [{ acuteDurationDays: 0 }, /acuteDurationDays must be a number of days in \(0, 365\]/],
    [{ chronicDurationDays: 400 }, /chronicDurationDays must be a number of days in \(0, 365\]/],
    [{ acuteLowerSalinity: 16 }, /acuteLowerSalinity must be at or below chronicLowerSalinity \(15 psu\)/],
    [{ optimumMin: 36 }, /optimumMin must be below optimumMax \(35 psu\)/],
  ])('rejects %o', (overrides, message) => {
    expect(() => getSpeciesTolerance('pacific-oyster', overrides)).toThrow(message);
  });

  it('rejects unknown ids, listing the known ones', () => {
    expect(() => getSpeciesTolerance('giant-clam')).toThrow(/id must be one of pacific-oyster, .*great-scallop; got "giant-clam"/);
    expect(isSpeciesId('manila-clam')).toBe(true);
    expect(isSpeciesId('giant-clam')).toBe(false);
  });
});
