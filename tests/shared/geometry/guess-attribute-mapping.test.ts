import { describe, expect, it } from 'vitest';
import { guessAttributeMapping, normaliseStatus, rankAttributeCandidates } from '../../../shared/geometry/guess-attribute-mapping';

// Reference: the field and value lists of the brief (lease id: LEASE_ID, lease_no, parcel, id; holder: holder,
// owner, grower, lessee; species: species, crop; status: status, held, candidate), our own common practice (c).
describe('guessAttributeMapping', () => {
  it.each([
    [['FID', 'LEASE_ID', 'HOLDER', 'SPECIES', 'STATUS'], { leaseId: 'LEASE_ID', holder: 'HOLDER', species: 'SPECIES', status: 'STATUS' }],
    [['lease_no', 'Grower', 'Crop'], { leaseId: 'lease_no', holder: 'Grower', species: 'Crop' }],
    [['parcel', 'owner', 'held'], { leaseId: 'parcel', holder: 'owner', status: 'held' }],
    [['id', 'Lessee', 'candidate'], { leaseId: 'id', holder: 'Lessee', status: 'candidate' }],
    [['OBJECTID', 'Shape_Area'], { leaseId: 'OBJECTID' }],
    [['lease_status', 'lease_ref'], { leaseId: 'lease_ref', status: 'lease_status' }],
    [['Espèce', 'Lease Number'], { leaseId: 'Lease Number' }],
    [[], {}],
  ])('%j → %j', (fields, expected) => {
    expect(guessAttributeMapping(fields)).toEqual(expected);
  });

  it('never gives one field two roles', () => {
    const m = guessAttributeMapping(['lease']);
    expect(Object.values(m)).toEqual(['lease']);
  });

  it('ranks candidates best first', () => {
    expect(rankAttributeCandidates(['OBJECTID', 'Lease_No', 'Grower', 'Crop', 'STATUS']).leaseId).toEqual(['Lease_No', 'OBJECTID']);
    expect(rankAttributeCandidates(['owner', 'LEASEHOLDER']).holder).toEqual(['LEASEHOLDER', 'owner']);
  });
});

describe('normaliseStatus', () => {
  it.each([
    ['held', 'held'],
    ['Active', 'held'],
    [' GRANTED ', 'held'],
    ['current', 'held'],
    ['Active - renewed 2024', 'held'],
    ['candidate', 'candidate'],
    ['Proposed', 'candidate'],
    ['application', 'candidate'],
    ['prospective', 'candidate'],
    ['Proposed site', 'candidate'],
    ['expired', null],
    ['', null],
    [null, null],
    [1, null],
  ])('%j → %j', (value, expected) => {
    expect(normaliseStatus(value)).toBe(expected);
  });
});
