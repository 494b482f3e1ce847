/**
 * @module shared/geometry/guess-attribute-mapping
 * Guesses which uploaded attribute holds the lease id, the holder, the species and the status, from the
 * field names alone (case, spaces, underscores and accents ignored), and reads a status value as
 * 'held' or 'candidate'. The user confirms or changes the guess in the import wizard. The name lists
 * are our own common-practice choices (c), not a standard.
 */

/** Lease roles an attribute can fill. */
export type AttributeRole = 'leaseId' | 'holder' | 'species' | 'status';

/** The guessed field for each role (absent when nothing fits). */
export type AttributeMapping = Partial<Record<AttributeRole, string>>;

/** Candidate fields per role, best first. */
export type AttributeCandidates = Record<AttributeRole, string[]>;

/** Lease status values the app stores. */
export type LeaseStatus = 'held' | 'candidate';

/** Exact names (normalised) and their scores per role; higher is better. @private */
const EXACT: Record<AttributeRole, Record<string, number>> = {
  leaseId: {
    leaseid: 100,
    leaseno: 98,
    leasenum: 98,
    leasenumber: 98,
    leasecode: 97,
    leaseref: 96,
    leasename: 80,
    lease: 90,
    licenceid: 88,
    licenseid: 88,
    licenceno: 87,
    licenseno: 87,
    licence: 84,
    license: 84,
    permitid: 84,
    permitno: 84,
    permit: 80,
    tenureid: 85,
    tenure: 78,
    siteid: 82,
    sitecode: 82,
    siteno: 81,
    site: 70,
    parcelid: 86,
    parcelno: 85,
    parcel: 83,
    plotid: 80,
    plot: 74,
    farmid: 78,
    ref: 60,
    reference: 60,
    code: 55,
    name: 40,
    id: 50,
    fid: 20,
    gid: 20,
    objectid: 15,
  },
  holder: {
    holder: 100,
    leaseholder: 100,
    holdername: 99,
    lessee: 97,
    licensee: 96,
    licencee: 96,
    grower: 95,
    growername: 95,
    owner: 92,
    ownername: 92,
    operator: 85,
    company: 80,
    business: 78,
    farmer: 85,
    farm: 60,
    tenant: 80,
    permittee: 88,
    applicant: 75,
  },
  species: {
    species: 100,
    speciesname: 98,
    sp: 50,
    crop: 95,
    culture: 80,
    cultivated: 70,
    product: 70,
    shellfish: 85,
    stock: 60,
    taxon: 80,
    commonname: 70,
    organism: 75,
    farmedspecies: 99,
  },
  status: {
    status: 100,
    leasestatus: 100,
    tenurestatus: 95,
    sitestatus: 95,
    state: 80,
    held: 85,
    candidate: 85,
    stage: 70,
    phase: 60,
    condition: 40,
    type: 20,
  },
};

/** Words that, inside a longer name, point at a role (e.g. 'LEASE_IDENT', 'Main_Species'). @private */
const CONTAINS: Record<AttributeRole, [RegExp, number][]> = {
  leaseId: [
    [/^lease.*(id|no|num|code|ref)/, 75],
    [/(licen[cs]e|permit|tenure|parcel|site).*(id|no|num|code|ref)/, 65],
    [/lease/, 45],
  ],
  holder: [
    [/holder|lessee|licens?cee|grower/, 70],
    [/owner|operator|company|farmer/, 55],
  ],
  species: [
    [/species|crop/, 70],
    [/shellfish|taxon|culture/, 55],
  ],
  status: [
    [/status/, 70],
    [/state$|held|candidate/, 45],
  ],
};

const ROLES: AttributeRole[] = ['leaseId', 'holder', 'species', 'status'];

/**
 * Candidate fields for every role, best first (a field may appear under several roles).
 *
 * @param fields - the upload's attribute names.
 * @returns per role, the fields that fit, best first.
 * @example
 * rankAttributeCandidates(['OBJECTID', 'Lease_No', 'Grower', 'Crop', 'STATUS']).leaseId // ['Lease_No', 'OBJECTID']
 */
export function rankAttributeCandidates(fields: readonly string[]): AttributeCandidates {
  const out = { leaseId: [], holder: [], species: [], status: [] } as AttributeCandidates;
  for (const role of ROLES) {
    out[role] = fields
      .map((f, order) => ({ f, order, score: scoreField(f, role) }))
      .filter((x) => x.score > 0)
      .sort((a, b) => b.score - a.score || a.order - b.order)
      .map((x) => x.f);
  }
  return out;
}

/**
 * Guesses the mapping: each role gets its best-scoring field, and no field fills two roles (the
 * strongest fit is assigned first).
 *
 * @param fields - the upload's attribute names.
 * @returns the guessed mapping.
 * @example
 * guessAttributeMapping(['FID', 'LEASE_ID', 'HOLDER', 'SPECIES', 'STATUS'])
 * // { leaseId: 'LEASE_ID', holder: 'HOLDER', species: 'SPECIES', status: 'STATUS' }
 * guessAttributeMapping(['parcel', 'owner', 'crop']) // { leaseId: 'parcel', holder: 'owner', species: 'crop' }
 */
export function guessAttributeMapping(fields: readonly string[]): AttributeMapping {
  const pairs: { role: AttributeRole; field: string; score: number; order: number }[] = [];
  fields.forEach((field, order) => {
    for (const role of ROLES) {
      const score = scoreField(field, role);
      if (score > 0) pairs.push({ role, field, score, order });
    }
  });
  pairs.sort((a, b) => b.score - a.score || a.order - b.order);
  const mapping: AttributeMapping = {};
  const used = new Set<string>();
  for (const p of pairs) {
    if (mapping[p.role] !== undefined || used.has(p.field)) continue;
    mapping[p.role] = p.field;
    used.add(p.field);
  }
  return mapping;
}

const HELD = new Set([
  'held',
  'active',
  'granted',
  'current',
  'approved',
  'issued',
  'existing',
  'leased',
  'operational',
  'in use',
  'occupied',
]);
const CANDIDATE = new Set([
  'candidate',
  'proposed',
  'application',
  'applied',
  'applying',
  'prospective',
  'pending',
  'planned',
  'potential',
  'under application',
  'new site',
]);

/**
 * Reads a status value: 'held' for held, active, granted, current (and approved, issued, existing,
 * leased, operational, in use, occupied); 'candidate' for candidate, proposed, application, prospective
 * (and applied, pending, planned, potential); null for anything else, empty or not text. Case, accents,
 * surrounding spaces and a trailing qualifier after the first word ('Active - renewed 2024') are ignored.
 *
 * @example
 * normaliseStatus(' Granted ') // 'held'
 * normaliseStatus('Proposed site') // 'candidate'
 * normaliseStatus('expired') // null
 */
export function normaliseStatus(value: unknown): LeaseStatus | null {
  if (typeof value !== 'string') return null;
  const text = value
    .toLowerCase()
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[_-]+/g, ' ')
    .replace(/\s+/g, ' ')
    .trim();
  if (text === '') return null;
  if (HELD.has(text)) return 'held';
  if (CANDIDATE.has(text)) return 'candidate';
  const first = text.split(/[^a-z]+/)[0];
  if (HELD.has(first)) return 'held';
  if (CANDIDATE.has(first)) return 'candidate';
  return null;
}

/** @private Score of a field name for a role: exact names first, then names containing a telling word. */
function scoreField(field: string, role: AttributeRole): number {
  const key = field
    .toLowerCase()
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^a-z0-9]+/g, '');
  if (key === '') return 0;
  const exact = EXACT[role][key];
  if (exact !== undefined) return exact;
  for (const [re, score] of CONTAINS[role]) if (re.test(key)) return score;
  return 0;
}
