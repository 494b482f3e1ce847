/**
 * @module demo-data/lib/leases
 * The 40 invented shellfish leases of the Fennick coast: a hand-placed table (place along the
 * shore from a river mouth and distance offshore, or a fixed centre; size in m; orientation)
 * turned into polygons in the local frame. Shapes are rectangles, parallelograms
 * (rotated quadrilaterals) and a few irregular outlines whose vertex jitter is seeded.
 */
import type { SpeciesId } from '../../shared/biology/species-tolerance';
import { createUniformStream } from '../../shared/hydrology/seeded-uniform';
import type { GrowerName } from './growers';
import { km, type Xy } from './local-frame';
import { counterClockwise } from './planar';
import { type Coast, shorePlace } from './coast';

/** Seed of the irregular lease outlines. */
export const LEASE_SEED = 4109;

/** How a lease outline is drawn. */
type Shape = 'rect' | 'skew' | 'irregular';

/** Where a lease lies: along the shore from a river mouth, or at a fixed point (around the island). */
export type LeasePlace =
  | {
      /** The river mouth the distance is measured from. */
      from: 'amberlin' | 'tolley';
      /** Distance along the shore from that mouth [km]: positive north (down-coast, the way both plumes turn), negative south. */
      along: number;
      /** Distance of the lease centre seaward of the shore [m]. */
      off: number;
    }
  | {
      from: 'point';
      /** Centre [km] in the local frame. */
      at: [number, number];
    };

/** One row of the lease table. */
export interface LeaseSpec {
  id: string;
  holder: GrowerName;
  species: SpeciesId;
  status: 'held' | 'candidate';
  notes: string;
  place: LeasePlace;
  /** Width across the long axis [m]. */
  width: number;
  /** Length along the long axis [m]. */
  length: number;
  /** Azimuth of the long axis [degrees clockwise from north]; default: along the shore. */
  azimuth?: number;
  shape: Shape;
}

const S: GrowerName = 'Saltreed Oysters';
const C: GrowerName = 'Carrick Mussel Lines';
const K: GrowerName = 'Skerrow Clam Company';
const G: GrowerName = 'Gullstone Shellfish';

type Row = [string, GrowerName, SpeciesId, 'held' | 'candidate', string, LeasePlace, number, number, Shape, number?];
const A = (along: number, off: number): LeasePlace => ({ from: 'amberlin', along, off });
const T = (along: number, off: number): LeasePlace => ({ from: 'tolley', along, off });
const P = (x: number, y: number): LeasePlace => ({ from: 'point', at: [x, y] });

/**
 * The lease table: id, holder, species, status, notes, place, width [m], length [m], shape and
 * (optionally) azimuth. Areas run 1–15 ha. Places run from 1 to 60 km along the shore on both
 * sides of each mouth, from 250 m to 9 km offshore: Fennick Bay (10–21 km north of the
 * Amberlin, the Amberlin's conditionally approved area), the coast north of the bay, the lee of
 * Gullstone Head, Skerrow Island, the Tolley shore north of the brook (its conditionally approved
 * area), the coast between the rivers and south of Tolley Brook.
 */
const ROWS: readonly Row[] = [
  // Fennick Bay (down-coast of the Amberlin).
  ['FB-001', S, 'pacific-oyster', 'held', 'Trestles on the south shore of Fennick Bay', A(12.4, 450), 180, 320, 'rect'],
  ['FB-002', S, 'pacific-oyster', 'held', 'Trestles at the head of Fennick Bay', A(15.6, 500), 200, 300, 'rect'],
  ['FB-003', S, 'eastern-oyster', 'held', 'Bottom culture trial beds, north side of the bay', A(19.0, 700), 200, 420, 'skew'],
  ['FB-004', S, 'pacific-oyster', 'candidate', 'Candidate: the bay mouth, astride the zone line', A(15.2, 3950), 220, 380, 'rect', 0],
  ['FB-005', K, 'manila-clam', 'held', 'Sand flat, hand-raked', A(14.0, 1200), 300, 360, 'irregular'],
  ['FB-006', K, 'hard-clam', 'held', 'Netted clam beds north of the Amberlin', A(7.5, 500), 240, 360, 'rect'],
  ['FB-007', C, 'blue-mussel', 'held', 'Two longlines across the bay', A(16.8, 2000), 120, 700, 'rect'],
  ['FB-008', S, 'flat-oyster', 'held', 'Subtidal rack trial 4 km north of the Amberlin', A(4.0, 600), 200, 300, 'rect'],
  ['FB-009', G, 'pacific-oyster', 'held', 'Floating bags, inner bay', A(18.0, 1500), 300, 300, 'rect'],
  ['FB-010', C, 'mediterranean-mussel', 'candidate', 'Candidate longline 2 km north of the Amberlin', A(2.0, 2500), 110, 800, 'rect'],
  // Up-coast of the Amberlin, close to its mouth.
  ['FB-011', S, 'pacific-oyster', 'held', 'Trestles just south of the Amberlin mouth', A(-1.5, 350), 200, 400, 'rect'],
  // North of the bay and the lee of Gullstone Head.
  ['FB-012', S, 'pacific-oyster', 'held', 'Trestles in the lee of Gullstone Head', A(50.0, 400), 240, 340, 'rect'],
  ['FB-013', C, 'blue-mussel', 'held', 'Three longlines parallel to the shore', A(25.5, 1500), 110, 900, 'rect'],
  ['FB-014', K, 'manila-clam', 'held', 'Small sand pocket south of the head', A(27.5, 300), 200, 220, 'rect'],
  ['FB-015', G, 'great-scallop', 'held', 'Seabed ranching off the south side of the head', A(29.5, 1800), 340, 400, 'rect'],
  ['FB-016', S, 'flat-oyster', 'candidate', 'Candidate: flat oysters 6.5 km north of the Amberlin', A(6.5, 800), 240, 400, 'rect'],
  ['FB-017', C, 'blue-mussel', 'held', 'Longlines behind the head, inner row', A(47.0, 900), 110, 900, 'rect'],
  ['FB-018', C, 'blue-mussel', 'held', 'Longlines behind the head, outer row', A(47.0, 2200), 110, 900, 'rect'],
  ['FB-019', C, 'mediterranean-mussel', 'held', 'Longlines, trial of warm-water stock', A(58.0, 1200), 120, 800, 'rect'],
  ['FB-020', G, 'sea-scallop', 'held', 'Suspended lantern nets', A(54.0, 4000), 380, 380, 'rect'],
  ['FB-021', K, 'hard-clam', 'held', 'Inshore clam beds, far north', A(60.0, 300), 200, 300, 'rect'],
  ['FB-022', G, 'bay-scallop', 'candidate', 'Candidate: lee of the head', A(43.0, 1200), 300, 300, 'rect'],
  // Around Skerrow Island (centre 8.5 km west, 42 km north).
  ['FB-023', K, 'manila-clam', 'held', 'East (lee) side of the island', P(-7.55, 42.2), 200, 300, 'rect', 20],
  ['FB-024', K, 'manila-clam', 'held', 'South-east spit', P(-8.0, 40.75), 250, 260, 'rect', 20],
  ['FB-025', K, 'hard-clam', 'held', 'West side, exposed to swell', P(-9.55, 41.7), 200, 320, 'rect', 20],
  ['FB-026', K, 'hard-clam', 'candidate', 'Candidate: north end of the island', P(-7.95, 43.4), 250, 250, 'rect', 20],
  ['FB-027', G, 'great-scallop', 'held', 'Seabed ranching west of the island', P(-10.8, 42.8), 350, 400, 'rect', 20],
  ['FB-028', C, 'blue-mussel', 'held', 'Longline between the island and the shore', P(-5.0, 41.0), 110, 700, 'rect', 0],
  // The Tolley shore (down-coast of Tolley Brook).
  ['FB-029', S, 'pacific-oyster', 'held', 'Trestles on the Tolley shore', T(6.0, 450), 220, 340, 'rect'],
  ['FB-030', G, 'pacific-oyster', 'held', 'Floating bags', T(8.2, 600), 300, 300, 'rect'],
  ['FB-031', K, 'manila-clam', 'held', 'Sand flat north of the brook', T(10.0, 350), 200, 300, 'rect'],
  ['FB-032', C, 'blue-mussel', 'held', 'Longlines off the Tolley shore', T(7.4, 1500), 110, 800, 'rect'],
  // South of Tolley Brook (up-coast of both rivers).
  ['FB-033', S, 'flat-oyster', 'candidate', 'Candidate: 9 km south of Tolley Brook', T(-9.0, 400), 240, 360, 'rect'],
  ['FB-034', G, 'pacific-oyster', 'held', 'Trestles, far south', T(-22.0, 350), 260, 300, 'rect'],
  ['FB-035', K, 'hard-clam', 'held', 'Clam beds south of the brook', T(-3.0, 450), 250, 300, 'irregular'],
  // Between the rivers and offshore.
  ['FB-036', C, 'mediterranean-mussel', 'held', 'Longlines just north of the Tolley mouth', T(2.5, 700), 110, 700, 'rect'],
  ['FB-037', G, 'great-scallop', 'held', 'Offshore seabed ranching off the Amberlin', A(1.0, 8000), 350, 400, 'rect'],
  ['FB-038', G, 'sea-scallop', 'held', 'Offshore lantern nets north of the bay', A(25.0, 7000), 350, 350, 'rect'],
  ['FB-039', C, 'blue-mussel', 'candidate', 'Candidate offshore longline block', A(-15.0, 6000), 150, 900, 'rect'],
  ['FB-040', G, 'great-scallop', 'candidate', 'Candidate offshore ranching ground', T(-12.0, 9000), 350, 400, 'rect'],
];

/** The lease table as specs. */
export const LEASE_TABLE: readonly LeaseSpec[] = ROWS.map(([id, holder, species, status, notes, place, width, length, shape, azimuth]) => ({
  id,
  holder,
  species,
  status,
  notes,
  place,
  width,
  length,
  shape,
  ...(azimuth === undefined ? {} : { azimuth }),
}));

/** A lease with its outline in the local frame (counter-clockwise, not closed). */
export interface LeaseShape extends LeaseSpec {
  /** Centre [m] in the local frame. */
  centre: Xy;
  ring: Xy[];
}

/**
 * Builds every lease outline.
 * @returns the table rows with their rings, in table order
 */
export function buildLeases(coast: Coast): LeaseShape[] {
  const next = createUniformStream(LEASE_SEED);
  return LEASE_TABLE.map((spec) => {
    let centre: Xy;
    let azimuth = spec.azimuth ?? 0;
    if (spec.place.from === 'point') centre = km(spec.place.at[0], spec.place.at[1]);
    else {
      const at = shorePlace(coast, coast.mouthIndex[spec.place.from], spec.place.along, spec.place.off);
      centre = at.point;
      azimuth = spec.azimuth ?? at.shoreAzimuth;
    }
    return { ...spec, centre, ring: counterClockwise(outline(spec, centre, azimuth, next)) };
  });
}

/** @private The outline of one lease; irregular ones draw from the seeded stream. */
function outline(spec: LeaseSpec, centre: Xy, azimuth: number, next: () => number): Xy[] {
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
  const a = (azimuth * Math.PI) / 180;
  // Long axis points to azimuth a: (sin a, cos a); across axis (cos a, −sin a).
  return local.map(([u, v]) => [
    Math.round((centre[0] + u * Math.cos(a) + v * Math.sin(a)) * 100) / 100,
    Math.round((centre[1] - u * Math.sin(a) + v * Math.cos(a)) * 100) / 100,
  ]);
}
