/**
 * @module demo-data/lib/leases
 * The ~40 invented shellfish leases of Fennick Bay: a hand-placed table (centre in km, size in m,
 * orientation) turned into polygons in the local frame. Shapes are rectangles, parallelograms
 * (rotated quadrilaterals) and a few irregular outlines whose vertex jitter is seeded.
 */
import type { SpeciesId } from '../../shared/biology/species-tolerance';
import { createUniformStream } from '../../shared/hydrology/seeded-uniform';
import type { GrowerName } from './growers';
import { km, type Xy } from './local-frame';
import { counterClockwise } from './planar';

/** Seed of the irregular lease outlines. */
export const LEASE_SEED = 4109;

/** How a lease outline is drawn. */
type Shape = 'rect' | 'skew' | 'irregular';

/** One row of the lease table. */
export interface LeaseSpec {
  id: string;
  holder: GrowerName;
  species: SpeciesId;
  status: 'held' | 'candidate';
  notes: string;
  /** Centre [km] in the local frame. */
  at: [number, number];
  /** Width across the long axis [m]. */
  width: number;
  /** Length along the long axis [m]. */
  length: number;
  /** Azimuth of the long axis [degrees clockwise from north]. */
  azimuth: number;
  shape: Shape;
}

const S: GrowerName = 'Saltreed Oysters';
const C: GrowerName = 'Carrick Mussel Lines';
const K: GrowerName = 'Skerrow Clam Company';
const G: GrowerName = 'Gullstone Shellfish';

/**
 * The lease table. Areas run 1–15 ha. Groups: inner Fennick Bay near the Amberlin mouth (most
 * exposed), the coast north of the bay up to Gullstone Head and beyond (downstream of the
 * Amberlin plume), around Skerrow Island, near Tolley Brook (north of its mouth = downstream,
 * south = upstream) and further offshore.
 */
export const LEASE_TABLE: readonly LeaseSpec[] = [
  // Inner and mid Fennick Bay.
  {
    id: 'FB-001',
    holder: S,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Intertidal trestles, north shore near the river mouth',
    at: [5.7, 0.9],
    width: 180,
    length: 320,
    azimuth: 20,
    shape: 'rect',
  },
  {
    id: 'FB-002',
    holder: S,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Trestles, south of the channel',
    at: [5.5, -0.85],
    width: 200,
    length: 300,
    azimuth: 160,
    shape: 'rect',
  },
  {
    id: 'FB-003',
    holder: S,
    species: 'eastern-oyster',
    status: 'held',
    notes: 'Bottom culture trial beds',
    at: [4.2, 2.2],
    width: 200,
    length: 420,
    azimuth: 60,
    shape: 'skew',
  },
  {
    id: 'FB-004',
    holder: S,
    species: 'pacific-oyster',
    status: 'candidate',
    notes: 'Candidate: sheltered south side of the bay',
    at: [4.6, -1.75],
    width: 220,
    length: 380,
    azimuth: 120,
    shape: 'rect',
  },
  {
    id: 'FB-005',
    holder: K,
    species: 'manila-clam',
    status: 'held',
    notes: 'Sand flat, hand-raked',
    at: [3.0, -2.5],
    width: 300,
    length: 360,
    azimuth: 110,
    shape: 'irregular',
  },
  {
    id: 'FB-006',
    holder: K,
    species: 'hard-clam',
    status: 'held',
    notes: 'Netted clam beds',
    at: [1.9, -2.95],
    width: 240,
    length: 360,
    azimuth: 95,
    shape: 'rect',
  },
  {
    id: 'FB-007',
    holder: C,
    species: 'blue-mussel',
    status: 'held',
    notes: 'Two longlines, east-west',
    at: [2.6, 2.75],
    width: 120,
    length: 700,
    azimuth: 75,
    shape: 'rect',
  },
  {
    id: 'FB-008',
    holder: S,
    species: 'flat-oyster',
    status: 'held',
    notes: 'Subtidal rack trial',
    at: [1.1, 3.15],
    width: 200,
    length: 300,
    azimuth: 80,
    shape: 'skew',
  },
  {
    id: 'FB-009',
    holder: G,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Floating bags, mid bay',
    at: [3.3, 0.2],
    width: 300,
    length: 300,
    azimuth: 0,
    shape: 'rect',
  },
  {
    id: 'FB-010',
    holder: C,
    species: 'mediterranean-mussel',
    status: 'candidate',
    notes: 'Candidate longline across the bay mouth',
    at: [0.9, -0.9],
    width: 110,
    length: 800,
    azimuth: 5,
    shape: 'rect',
  },
  // Coast north of the bay to Gullstone Head.
  {
    id: 'FB-011',
    holder: S,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Trestles below the north point',
    at: [-0.95, 5.5],
    width: 200,
    length: 400,
    azimuth: 5,
    shape: 'rect',
  },
  {
    id: 'FB-012',
    holder: S,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Trestles, inshore',
    at: [-1.05, 7.1],
    width: 240,
    length: 340,
    azimuth: 0,
    shape: 'skew',
  },
  {
    id: 'FB-013',
    holder: C,
    species: 'blue-mussel',
    status: 'held',
    notes: 'Three longlines parallel to the shore',
    at: [-2.1, 6.4],
    width: 110,
    length: 900,
    azimuth: 2,
    shape: 'rect',
  },
  {
    id: 'FB-014',
    holder: K,
    species: 'manila-clam',
    status: 'held',
    notes: 'Small sand pocket south of the head',
    at: [-1.15, 8.2],
    width: 200,
    length: 220,
    azimuth: 0,
    shape: 'irregular',
  },
  {
    id: 'FB-015',
    holder: G,
    species: 'great-scallop',
    status: 'held',
    notes: 'Seabed ranching, south of the head',
    at: [-3.3, 8.35],
    width: 340,
    length: 400,
    azimuth: 75,
    shape: 'rect',
  },
  // Beyond Gullstone Head.
  {
    id: 'FB-016',
    holder: S,
    species: 'pacific-oyster',
    status: 'candidate',
    notes: 'Candidate: north of the head',
    at: [-0.8, 13.2],
    width: 240,
    length: 400,
    azimuth: 15,
    shape: 'rect',
  },
  {
    id: 'FB-017',
    holder: C,
    species: 'blue-mussel',
    status: 'held',
    notes: 'Longlines, inner row',
    at: [-1.3, 14.8],
    width: 110,
    length: 900,
    azimuth: 8,
    shape: 'rect',
  },
  {
    id: 'FB-018',
    holder: C,
    species: 'blue-mussel',
    status: 'held',
    notes: 'Longlines, outer row',
    at: [-2.1, 15.0],
    width: 110,
    length: 900,
    azimuth: 8,
    shape: 'rect',
  },
  {
    id: 'FB-019',
    holder: C,
    species: 'mediterranean-mussel',
    status: 'held',
    notes: 'Longlines, trial of warm-water stock',
    at: [-1.1, 17.1],
    width: 120,
    length: 800,
    azimuth: 10,
    shape: 'skew',
  },
  {
    id: 'FB-020',
    holder: G,
    species: 'sea-scallop',
    status: 'held',
    notes: 'Suspended lantern nets',
    at: [-3.6, 16.5],
    width: 380,
    length: 380,
    azimuth: 30,
    shape: 'rect',
  },
  {
    id: 'FB-021',
    holder: K,
    species: 'hard-clam',
    status: 'held',
    notes: 'Inshore clam beds',
    at: [-0.55, 18.7],
    width: 200,
    length: 300,
    azimuth: 10,
    shape: 'irregular',
  },
  {
    id: 'FB-022',
    holder: G,
    species: 'bay-scallop',
    status: 'candidate',
    notes: 'Candidate: lee of the head',
    at: [-2.4, 12.5],
    width: 300,
    length: 300,
    azimuth: 20,
    shape: 'rect',
  },
  // Around Skerrow Island.
  {
    id: 'FB-023',
    holder: K,
    species: 'manila-clam',
    status: 'held',
    notes: 'East (lee) side of the island',
    at: [-4.45, 5.4],
    width: 200,
    length: 300,
    azimuth: 20,
    shape: 'rect',
  },
  {
    id: 'FB-024',
    holder: K,
    species: 'manila-clam',
    status: 'held',
    notes: 'South-east spit',
    at: [-4.8, 3.75],
    width: 250,
    length: 260,
    azimuth: 45,
    shape: 'irregular',
  },
  {
    id: 'FB-025',
    holder: K,
    species: 'hard-clam',
    status: 'held',
    notes: 'West side, exposed to swell',
    at: [-6.55, 4.6],
    width: 200,
    length: 320,
    azimuth: 20,
    shape: 'rect',
  },
  {
    id: 'FB-026',
    holder: K,
    species: 'hard-clam',
    status: 'candidate',
    notes: 'Candidate: north end of the island',
    at: [-4.95, 6.65],
    width: 250,
    length: 250,
    azimuth: 20,
    shape: 'skew',
  },
  {
    id: 'FB-027',
    holder: G,
    species: 'great-scallop',
    status: 'held',
    notes: 'Seabed ranching west of the island',
    at: [-7.7, 6.1],
    width: 350,
    length: 400,
    azimuth: 20,
    shape: 'rect',
  },
  {
    id: 'FB-028',
    holder: C,
    species: 'blue-mussel',
    status: 'held',
    notes: 'Longline between island and bay',
    at: [-3.2, 4.5],
    width: 110,
    length: 700,
    azimuth: 0,
    shape: 'rect',
  },
  // Near Tolley Brook: north of the mouth is downstream, south is upstream.
  {
    id: 'FB-029',
    holder: S,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Trestles just north of Tolley Brook',
    at: [-0.85, -12.7],
    width: 220,
    length: 340,
    azimuth: 355,
    shape: 'rect',
  },
  {
    id: 'FB-030',
    holder: G,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Floating bags',
    at: [-0.95, -10.8],
    width: 300,
    length: 300,
    azimuth: 0,
    shape: 'skew',
  },
  {
    id: 'FB-031',
    holder: K,
    species: 'manila-clam',
    status: 'held',
    notes: 'Sand flat north of the brook',
    at: [-0.75, -9.2],
    width: 200,
    length: 300,
    azimuth: 5,
    shape: 'irregular',
  },
  {
    id: 'FB-032',
    holder: C,
    species: 'blue-mussel',
    status: 'held',
    notes: 'Longlines off the Tolley shore',
    at: [-1.9, -11.6],
    width: 110,
    length: 800,
    azimuth: 0,
    shape: 'rect',
  },
  {
    id: 'FB-033',
    holder: S,
    species: 'flat-oyster',
    status: 'candidate',
    notes: 'Candidate: south of Tolley Brook',
    at: [-0.75, -16.4],
    width: 240,
    length: 360,
    azimuth: 5,
    shape: 'rect',
  },
  {
    id: 'FB-034',
    holder: G,
    species: 'pacific-oyster',
    status: 'held',
    notes: 'Trestles, far south',
    at: [-0.55, -18.4],
    width: 260,
    length: 300,
    azimuth: 10,
    shape: 'rect',
  },
  {
    id: 'FB-035',
    holder: K,
    species: 'hard-clam',
    status: 'held',
    notes: 'Clam beds south of the brook',
    at: [-1.6, -15.3],
    width: 250,
    length: 300,
    azimuth: 0,
    shape: 'rect',
  },
  {
    id: 'FB-036',
    holder: C,
    species: 'mediterranean-mussel',
    status: 'held',
    notes: 'Longlines between the bay and the brook',
    at: [-1.1, -6.6],
    width: 110,
    length: 700,
    azimuth: 0,
    shape: 'rect',
  },
  // Further offshore.
  {
    id: 'FB-037',
    holder: G,
    species: 'great-scallop',
    status: 'held',
    notes: 'Offshore seabed ranching',
    at: [-9.0, 0.5],
    width: 350,
    length: 400,
    azimuth: 0,
    shape: 'rect',
  },
  {
    id: 'FB-038',
    holder: G,
    species: 'sea-scallop',
    status: 'held',
    notes: 'Offshore lantern nets',
    at: [-11.0, 10.0],
    width: 350,
    length: 350,
    azimuth: 45,
    shape: 'rect',
  },
  {
    id: 'FB-039',
    holder: C,
    species: 'blue-mussel',
    status: 'candidate',
    notes: 'Candidate offshore longline block',
    at: [-7.0, -5.0],
    width: 150,
    length: 900,
    azimuth: 0,
    shape: 'rect',
  },
  {
    id: 'FB-040',
    holder: G,
    species: 'great-scallop',
    status: 'candidate',
    notes: 'Candidate offshore ranching ground',
    at: [-12.0, -8.0],
    width: 350,
    length: 400,
    azimuth: 30,
    shape: 'rect',
  },
];

/** A lease with its outline in the local frame (counter-clockwise, not closed). */
export interface LeaseShape extends LeaseSpec {
  ring: Xy[];
}

/**
 * Builds every lease outline.
 * @returns the table rows with their rings, in table order
 */
export function buildLeases(): LeaseShape[] {
  const next = createUniformStream(LEASE_SEED);
  return LEASE_TABLE.map((spec) => ({ ...spec, ring: counterClockwise(outline(spec, next)) }));
}

/** @private The outline of one lease; irregular ones draw from the seeded stream. */
function outline(spec: LeaseSpec, next: () => number): Xy[] {
  const centre = km(spec.at[0], spec.at[1]);
  const hw = spec.width / 2;
  const hl = spec.length / 2;
  // Corner offsets in (across, along) coordinates, clockwise from bottom-left.
  let local: [number, number][];
  if (spec.shape === 'rect') {
    local = [
      [-hw, -hl],
      [-hw, hl],
      [hw, hl],
      [hw, -hl],
    ];
  } else if (spec.shape === 'skew') {
    const shift = 0.25 * spec.width;
    local = [
      [-hw - shift, -hl],
      [-hw + shift, hl],
      [hw + shift, hl],
      [hw - shift, -hl],
    ];
  } else {
    // Irregular: a hexagon-like outline from the rectangle's corners and two side midpoints, each jittered.
    const base: [number, number][] = [
      [-hw, -hl],
      [-hw, 0],
      [-hw, hl],
      [0, hl],
      [hw, hl],
      [hw, -hl * 0.2],
      [hw * 0.3, -hl],
    ];
    local = base.map(([u, v]) => [u + (next() - 0.5) * 0.3 * spec.width, v + (next() - 0.5) * 0.2 * spec.length]);
  }
  const a = (spec.azimuth * Math.PI) / 180;
  // Long axis points to azimuth a: (sin a, cos a); across axis (cos a, −sin a).
  return local.map(([u, v]) => [
    Math.round((centre[0] + u * Math.cos(a) + v * Math.sin(a)) * 100) / 100,
    Math.round((centre[1] - u * Math.sin(a) + v * Math.cos(a)) * 100) / 100,
  ]);
}
