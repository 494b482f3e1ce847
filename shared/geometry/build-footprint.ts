/**
 * @module shared/geometry/build-footprint
 * Turns the plume's exposure fields into polygons on a real coastline (product.md §4 item 4):
 * the bulge and one band per threshold, in EPSG:4326, ready to store and intersect with leases.
 *
 * Method (c, derived; the fields themselves are those of shared/physics/exposure-field):
 * 1. Work in an azimuthal equidistant projection centred on the mouth (metres).
 * 2. Snap the mouth to the nearest coast point. Decide the sea side of that coast line: for
 *    a land polygon the sea is outside it; for a shoreline given as a line, the sea is the
 *    side the outflow points to.
 * 3. Walk the coast downstream: the plume turns right of the outflow in the northern
 *    hemisphere (the coast on the right of the flow, science.md §1.1) and left in the
 *    southern, so the walk goes the way that keeps the sea on the left (north) or right
 *    (south). It goes for the reach (or the field's default extent when there is no reach),
 *    or until the coast line ends. Up-coast the coastal current draws nothing (science.md
 *    §1.11); the walk goes up-coast for one bulge radius only so the coast there is known.
 * 4. Each band is the union of two parts (the field is the larger of the two, exposure-field):
 *    the coastal current's strip and the bulge's lobe. Strip: at arc length s ≥ 0 along the
 *    real coast the band reaches offshore to offshoreDistanceWhere(plume, params, s, threshold),
 *    measured along the coast normal as the field defines it. Lobe: the region seen from the
 *    mouth out to bulgeEdgeDistance(…, θ, …) along rays θ from the outflow axis towards
 *    down-coast (96 rays), in the frame of the bulge disc. The walked coast is simplified (Douglas–Peucker, tolerance τ, by
 *    default 1 % of the narrowest band's widest point, 0.5…20 m) and sampled (every kept
 *    vertex, `alongSteps` even steps, the bulge circle, and the field's jumps: mouth, bulge
 *    edge, reach, each band's end); each segment gives a quad from τ + 1 m inside the land out
 *    to the band width (see offset-strip: fans at convex bends, mitres at concave ones). The
 *    band is the union of these pieces and the lobe (cascaded, see union-rings) minus the land: land
 *    polygons are subtracted; shoreline lines (and island rings) cut the union into faces,
 *    and only the faces that touch the walked coast from the sea side (or hold a point of the lobe's axis) are kept — so pieces
 *    that crossed a shoreline onto land, island interiors, and water reached only across land
 *    are dropped. Slivers under 2 m² go. With the same path and samples for every band, a
 *    band with a stricter threshold is never wider, so salinity bands nest exactly.
 * 5. The bulge is the disc of diameter y_s touching the coast at the mouth, centred y_s/2
 *    seaward along the outflow (science.md §1.6; no downstream shift, matching the exposure
 *    field), minus land, keeping the part that touches the walked coast or holds the centre.
 * 6. Near the equator (turnsTo 'none' or regime 'equatorial-jet') there is no walk: each band
 *    is a half-disc seaward of the mouth of radius offshoreDistanceWhere(…, s = 0, …), with
 *    the same land handling, and a warning.
 * 7. Back to EPSG:4326: edges along the coast keep the coast's own vertices (long input
 *    segments are first divided every 250 m in lon/lat, so they keep their shape in metres),
 *    and other edges are divided every 100 m, so the lon/lat polygons match the planar ones
 *    to well under a millimetre and never overlap the coast's lon/lat segments.
 * Limits: straight-line offsets can reach across a peninsula narrower than the band into
 * water the walk reaches later; in a bay narrower than the band the normals cross beyond the
 * bay's centre of curvature, so the band pinches there and spreads out again beyond it (the
 * field's "offshore distance" is ambiguous there); a shoreline that ends inside a band cannot
 * separate land from sea there (a warning says when the coast ends before the reach).
 */

import type { Feature, LineString, MultiPolygon, Polygon, Position } from 'geojson';
import type { TurningSide } from '../physics/coriolis';
import {
  bulgeEdgeDistance,
  defaultAlongExtent,
  type ExposureParameters,
  type FieldPlume,
  type FieldThreshold,
  offshoreDistanceWhere,
  plumeOffshoreExtent,
} from '../physics/exposure-field';
import { clipRingToBox } from './clip-ring-to-box';
import type { BandSpec } from './default-band-specs';
import { type LocalProjection, localProjection } from './local-projection';
import { offsetStrip } from './offset-strip';
import { type OverlayFace, type OverlayFn, type OverlayLine, overlayRings, type PlanarPoint, pointInRing } from './overlay-rings';
import { type CoastGeoJson, type CoastLine, prepareCoast } from './prepare-coast';
import { simplifyPath } from './simplify-path';
import { snapToCoast } from './snap-to-coast';
import { unionRings } from './union-rings';
import { type WalkedPath, walkCoast } from './walk-coast';

/** The plume scales the footprint needs: the exposure-field subset plus the turning side. */
export interface FootprintPlume extends FieldPlume {
  /** Side of the outflow (looking seaward) to which the plume turns. */
  readonly turnsTo: TurningSide;
}

/** Options of {@link buildFootprint}. */
export interface FootprintOptions {
  /** Even sampling steps along the walked coast, integer 2…100 000; default 200. */
  readonly alongSteps?: number;
  /**
   * Largest number of vertices of one band (all its rings), integer ≥ 8; default unlimited.
   * A band with more is simplified (tolerance doubled until it fits) and clipped to the sea
   * again, so the cap is approximate (the coast vertices clipped back in count too).
   */
  readonly maxVertices?: number;
  /** Douglas–Peucker tolerance for the walked coast [m], ≥ 0; default 1 % of the narrowest band's widest point, 0.5…20 m. */
  readonly simplifyTolerance?: number;
}

/** Input of {@link buildFootprint}. */
export interface FootprintInput {
  /** Coast in EPSG:4326: shoreline lines (closed rings are islands) and/or land polygons (sea outside). */
  readonly coast: CoastGeoJson;
  /** River mouth [lon, lat] in degrees; snapped to the nearest coast point. */
  readonly mouth: readonly [number, number];
  /** Direction river water leaves the mouth, seaward [degrees clockwise from north], finite. */
  readonly outflowAzimuth: number;
  /** Plume scales, e.g. a PlumeResult of computePlume. */
  readonly plume: FootprintPlume;
  /** Field parameters, e.g. from exposureParameters. */
  readonly params: ExposureParameters;
  /** Bands to build, e.g. defaultBandSpecs(…). */
  readonly bands: readonly BandSpec[];
  /** Sampling and simplification options. */
  readonly options?: FootprintOptions;
}

/** Properties of a band feature. */
export interface BandProperties {
  /** Band id from its spec. */
  readonly id: string;
  /** Band name from its spec. */
  readonly name: string;
  /** Which field the threshold applies to. */
  readonly kind: 'salinity' | 'indicator' | 'presence';
  /** The threshold. */
  readonly threshold: FieldThreshold;
  /** Widest offshore distance of the band from the coast [m] (the field's value, before clipping). */
  readonly maxOffshoreM: number;
  /** Arc length along the coast from the mouth to where the coastal-current part of the band ends [m] (the bulge part's down-coast extent when only the bulge meets the threshold; radius at the equator). */
  readonly alongReachM: number;
}

/** Properties of the bulge feature. */
export interface BulgeProperties {
  /** 'bulge'. */
  readonly id: 'bulge';
  /** Bulge diameter y_s [m]. */
  readonly diameterM: number;
  /** Disc centre [lon, lat]. */
  readonly centre: [number, number];
}

/** Properties of the walked-coast feature. */
export interface PathProperties {
  /** 'downstream-coast' (or 'equatorial-coast': both ways from the mouth). */
  readonly id: 'downstream-coast' | 'equatorial-coast';
  /** Arc length walked [m]. */
  readonly lengthM: number;
  /** Side the plume turns to. */
  readonly turnsTo: TurningSide;
}

/** Result of {@link buildFootprint}; all geometry in EPSG:4326. */
export interface Footprint {
  /** The bulge near the mouth, clipped to the sea; null at the equator. */
  readonly bulge: Feature<Polygon | MultiPolygon, BulgeProperties> | null;
  /** One feature per band spec, in the order given (an empty MultiPolygon when the threshold is never met). */
  readonly bands: Feature<Polygon | MultiPolygon, BandProperties>[];
  /** The coast walked, for display. */
  readonly path: Feature<LineString, PathProperties>;
  /** Plain-English warnings. */
  readonly warnings: string[];
  /** Distance from the mouth given to the coast point used [m]. */
  readonly mouthSnapDistanceM: number;
}

/** Warning given near the equator. */
export const EQUATOR_WARNING = 'Near the equator the rotating-plume model does not apply; radial jet estimate.';

const DEFAULT_ALONG_STEPS = 200;
const BULGE_CIRCLE_STEPS = 32;
const LANDWARD_MARGIN = 1;

/**
 * Builds the bulge and band polygons of a plume on a real coastline (see the module comment).
 *
 * @param input - coast (GeoJSON, EPSG:4326), mouth [lon, lat], outflow azimuth [° from north],
 *   plume scales [m, m s⁻¹], field parameters, band specs, options
 * @param overlay - the polygon overlay used to clip to the sea; default {@link overlayRings} (the server may pass
 *   another implementation of the same contract; the overlay bench passes a GEOS-backed one)
 * @returns bulge, bands (properties: id, name, kind, threshold, maxOffshoreM, alongReachM),
 *   the walked coast, warnings and the mouth snap distance [m]; EPSG:4326
 * @example
 * const plume = computePlume({ latitude: 41, discharge: 150, reducedGravity: 0.02, mouthWidth: 800, mouthDepth: 1.5, floodDurationHours: 48 });
 * const params = exposureParameters({ entrainmentCoefficient: 3e-5, t90DayHours: 6, t90NightHours: 48, indicator: { kind: 'constant', concentration: 1e4 } },
 *   { seaSalinity: 34, riverSalinity: 0 }, 150);
 * buildFootprint({ coast: { type: 'LineString', coordinates: [[-70, 40.5], [-70, 41.6]] }, mouth: [-70, 41], outflowAzimuth: 270,
 *   plume, params, bands: defaultBandSpecs({ speciesSalinityThreshold: 12, indicatorStandard: 14 }) });
 * // => { bands: [4 features west of the coast, running north from the mouth; plume edge 23.5 km along,
 * //     8.0 km wide at the bulge], bulge: { diameterM: 8028.6, … }, warnings: [], mouthSnapDistanceM: 0 }
 * Source: (c) derived: see the module comment; turning side (a) science.md §1.1; bulge disc
 * (a) Yankovsky & Chapman 1997 via science.md §1.6; fields (c) exposure-field.
 */
export function buildFootprint(input: FootprintInput, overlay: OverlayFn = overlayRings): Footprint {
  const { plume, params } = input;
  const options = checkOptions(input.options);
  checkInput(input);
  const warnings: string[] = [];
  const equatorial = plume.turnsTo === 'none' || plume.regime === 'equatorial-jet';
  const bulgeRadius = plume.bulgeOffshoreExtent / 2;
  const walkLength = equatorial ? plume.width : plume.reach !== undefined ? plume.reach : defaultAlongExtent(plume, params);
  const widest = plumeOffshoreExtent(plume, 0);

  const projection = localProjection(input.mouth);
  const coast = prepareCoast(input.coast, projection, {
    centre: input.mouth,
    radius: Math.max(walkLength, bulgeRadius) + widest + bulgeRadius + 5000,
  });
  if (coast.lines.length === 0) throw new RangeError('the coast has no lines or polygons near the mouth');
  const snap = snapToCoast(coast.lines, [0, 0]);
  if (!snap) throw new RangeError('the coast has no segments near the mouth');
  if (snap.distance > 2000) {
    warnings.push(`The mouth is ${fmtKm(snap.distance)} from the nearest coast; it was moved onto the coast there.`);
  }
  const line = coast.lines[snap.line];
  const outflow: PlanarPoint = [Math.sin(rad(input.outflowAzimuth)), Math.cos(rad(input.outflowAzimuth))];
  const side = seaSideAtMouth(line, snap.segment, snap.t, outflow, warnings);
  const context: Context = {
    coast: coast.lines,
    projection,
    seaSide: side.seaSide,
    marks: coast.lines.map((l) => new Array(l.points.length).fill(0)),
    overlay,
  };

  if (equatorial) return equatorialFootprint(input, context, snap, side.seaward, warnings, options);

  // Downstream: keep the sea on the left (turning right, north) or on the right (left, south).
  const seaOnLeftOfWalk = plume.turnsTo === 'right';
  const direction: 1 | -1 = side.seaSide > 0 === seaOnLeftOfWalk ? 1 : -1;
  const down = walkCoast(line, snap, direction, walkLength);
  if (down.stop === 'line-end' && down.length < walkLength - 1) {
    warnings.push(
      `The coast ends before the reach: the coast line stops ${fmtKm(down.length)} along the coast from the mouth, ` +
        `short of the ${fmtKm(walkLength)} the plume would follow; bands stop there.`,
    );
  } else if (down.stop === 'ring-complete') {
    warnings.push(
      `The coast outline the mouth is on is only ${fmtKm(down.length)} round, less than the ${fmtKm(walkLength)} the plume ` +
        'would follow: the bands go once round it.',
    );
  }
  if (down.length === 0) warnings.push('The coast line ends at the mouth on the downstream side: no bands can follow it.');
  const up = walkCoast(line, snap, direction === 1 ? -1 : 1, bulgeRadius);
  markWalk(context, snap.line, down);
  markWalk(context, snap.line, up);

  const sampled = samplePath(plume, params, input.bands, up, down, options, bulgeRadius);
  const stripSide: 1 | -1 = seaOnLeftOfWalk ? 1 : -1;
  // Down-coast unit vector at the mouth: right of the outflow when the plume turns right.
  const downCoast: PlanarPoint =
    plume.turnsTo === 'right' ? [side.seaward[1], -side.seaward[0]] : [-side.seaward[1], side.seaward[0]];
  const bands = input.bands.map((spec) => {
    const widths = sampled.widths(spec.threshold);
    const rings = offsetStrip({
      points: sampled.points,
      widthStart: widths.start,
      widthEnd: widths.end,
      seaSide: stripSide,
      landward: sampled.tolerance + LANDWARD_MARGIN,
      arcTolerance: Math.max(sampled.tolerance / 2, 0.25),
    });
    const lobe = bulgeLobe(plume, params, spec.threshold, snap.point, side.seaward, downCoast, sampled.tolerance);
    const allRings = lobe ? [...rings, lobe.ring] : rings;
    const faces = clipToSea(context, allRings, options.maxVertices, sampled.tolerance, warnings, spec.id, lobe?.seed);
    const currentAlong = widths.max > 0 ? bandEnd(plume, params, spec.threshold, down.length) : 0;
    const along = currentAlong > 0 ? currentAlong : lobe ? lobe.maxAlong : 0;
    const maxOffshore = Math.max(widths.max, lobe ? lobe.maxOffshore : 0);
    if (maxOffshore === 0) warnings.push(`${spec.name}: the threshold is not met anywhere in the plume.`);
    return bandFeature(spec, faces, projection, maxOffshore, along);
  });

  const bulge = bulgeFeature(context, snap.point, side.seaward, bulgeRadius, sampled.tolerance, plume.bulgeOffshoreExtent, warnings);
  const path: Feature<LineString, PathProperties> = {
    type: 'Feature',
    properties: { id: 'downstream-coast', lengthM: down.length, turnsTo: plume.turnsTo },
    geometry: { type: 'LineString', coordinates: lineCoordinates(down.points, projection) },
  };
  return { bulge, bands, path, warnings, mouthSnapDistanceM: snap.distance };
}

// ---------------------------------------------------------------------------------------------
// Checks
// ---------------------------------------------------------------------------------------------

/** @private Options with defaults. */
interface CheckedOptions {
  readonly alongSteps: number;
  readonly maxVertices: number | undefined;
  readonly simplifyTolerance: number | undefined;
}

/** @private Validates the options. */
function checkOptions(options: FootprintOptions | undefined): CheckedOptions {
  const alongSteps = options?.alongSteps ?? DEFAULT_ALONG_STEPS;
  if (!Number.isInteger(alongSteps) || alongSteps < 2 || alongSteps > 100_000) {
    throw new RangeError(`alongSteps must be an integer 2…100000 (got ${String(alongSteps)})`);
  }
  const maxVertices = options?.maxVertices;
  if (maxVertices !== undefined && (!Number.isInteger(maxVertices) || maxVertices < 8)) {
    throw new RangeError(`maxVertices must be an integer ≥ 8 (got ${String(maxVertices)})`);
  }
  const simplifyTolerance = options?.simplifyTolerance;
  if (simplifyTolerance !== undefined && !(simplifyTolerance >= 0 && Number.isFinite(simplifyTolerance))) {
    throw new RangeError(`simplifyTolerance must be ≥ 0 m (got ${String(simplifyTolerance)})`);
  }
  return { alongSteps, maxVertices, simplifyTolerance };
}

/** @private Validates the mouth, azimuth, plume sizes and band ids. */
function checkInput(input: FootprintInput): void {
  const [lon, lat] = input.mouth;
  if (!Number.isFinite(lon) || !Number.isFinite(lat) || lon < -180 || lon > 180 || lat < -90 || lat > 90) {
    throw new RangeError(`mouth must be [lon, lat] in degrees (got [${String(lon)}, ${String(lat)}])`);
  }
  if (!Number.isFinite(input.outflowAzimuth))
    throw new RangeError(`outflowAzimuth must be a finite number of degrees (got ${String(input.outflowAzimuth)})`);
  const p = input.plume;
  for (const [name, value] of [
    ['plume.width', p.width],
    ['plume.bulgeOffshoreExtent', p.bulgeOffshoreExtent],
  ] as const) {
    if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`${name} must be > 0 m (got ${String(value)})`);
  }
  if (p.reach !== undefined && !(p.reach >= 0 && Number.isFinite(p.reach)))
    throw new RangeError(`plume.reach must be ≥ 0 m (got ${String(p.reach)})`);
  const ids = new Set<string>();
  for (const band of input.bands) {
    if (ids.has(band.id)) throw new RangeError(`band ids must be unique (repeated: ${band.id})`);
    ids.add(band.id);
  }
}

// ---------------------------------------------------------------------------------------------
// Sea side and marks
// ---------------------------------------------------------------------------------------------

/** @private Shared state: the coast, the projection, and per-segment marks of the walked coast. */
interface Context {
  readonly coast: CoastLine[];
  readonly projection: LocalProjection;
  /** +1 when the sea is on the left of the mouth line's digitised direction. */
  readonly seaSide: 1 | -1;
  readonly marks: number[][];
  /** The overlay implementation clipping to the sea. */
  readonly overlay: OverlayFn;
}

/** @private The sea side of the mouth's coast line and the seaward direction used for the bulge. */
function seaSideAtMouth(
  line: CoastLine,
  segment: number,
  t: number,
  outflow: PlanarPoint,
  warnings: string[],
): { seaSide: 1 | -1; seaward: PlanarPoint } {
  const tangent = tangentAt(line, segment, t);
  const cross = tangent[0] * outflow[1] - tangent[1] * outflow[0];
  if (line.source === 'land-ring') {
    // Land on the left of a land ring: the sea is on its right.
    const seaNormal: PlanarPoint = [tangent[1], -tangent[0]];
    if (cross > 0) {
      warnings.push('The outflow direction points onto land at the mouth; the seaward normal of the coast was used for the bulge.');
      return { seaSide: -1, seaward: seaNormal };
    }
    return { seaSide: -1, seaward: outflow };
  }
  if (Math.abs(cross) < Math.sin(rad(10))) {
    warnings.push(
      'The outflow direction runs almost along the coast at the mouth, so which side is sea is uncertain; check the outflow direction.',
    );
  }
  return { seaSide: cross >= 0 ? 1 : -1, seaward: outflow };
}

/** @private Unit tangent of a line at a position (the mean of both segments at a vertex). */
function tangentAt(line: CoastLine, segment: number, t: number): PlanarPoint {
  const pts = line.points;
  const n = pts.length;
  const count = line.closed ? n : n - 1;
  const dir = (i: number): PlanarPoint => {
    const k = ((i % count) + count) % count;
    const a = pts[k];
    const b = pts[(k + 1) % n];
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    return [(b[0] - a[0]) / len, (b[1] - a[1]) / len];
  };
  let d = dir(segment);
  const atStart = t <= 1e-9 && (line.closed || segment > 0);
  const atEnd = t >= 1 - 1e-9 && (line.closed || segment < count - 1);
  if (atStart || atEnd) {
    const other = dir(atStart ? segment - 1 : segment + 1);
    const sum: PlanarPoint = [d[0] + other[0], d[1] + other[1]];
    const len = Math.hypot(sum[0], sum[1]);
    if (len > 1e-9) d = [sum[0] / len, sum[1] / len];
  }
  return d;
}

/** @private Marks the walked coast segments with the sea side (+1 = sea on the left of the digitised direction). */
function markWalk(context: Context, line: number, walk: WalkedPath): void {
  for (const segment of walk.segments) context.marks[line][segment] = context.seaSide;
}

// ---------------------------------------------------------------------------------------------
// Sampling the walked coast
// ---------------------------------------------------------------------------------------------

/** @private The sampled, simplified path and the band widths on it. */
interface SampledPath {
  readonly points: PlanarPoint[];
  readonly tolerance: number;
  widths(threshold: FieldThreshold): { start: number[]; end: number[]; max: number };
}

/** @private Builds the simplified, sampled path from the upcoast and downstream walks. */
function samplePath(
  plume: FootprintPlume,
  params: ExposureParameters,
  bands: readonly BandSpec[],
  up: WalkedPath,
  down: WalkedPath,
  options: CheckedOptions,
  bulgeRadius: number,
): SampledPath {
  // Combined path: upcoast reversed (negative arc length), then downstream.
  const points: PlanarPoint[] = [];
  const arc: number[] = [];
  for (let i = up.points.length - 1; i >= 1; i -= 1) {
    points.push(up.points[i]);
    arc.push(-up.along[i]);
  }
  const mouthIndex = points.length;
  for (let i = 0; i < down.points.length; i += 1) {
    points.push(down.points[i]);
    arc.push(down.along[i]);
  }
  const widthAt = (threshold: FieldThreshold, s: number) => bandWidth(plume, params, threshold, s, bulgeRadius);
  const widest = bands.map((b) => widthAt(b.threshold, 0)).filter((w) => w > 0);
  const tolerance = options.simplifyTolerance ?? clamp(0.01 * (widest.length ? Math.min(...widest) : 1000), 0.5, 20);
  const kept = simplifyPath(points, tolerance, [mouthIndex]);
  const keptArc = kept.map((i) => arc[i]);
  const keptPoints = kept.map((i) => points[i]);

  // Sample positions (signed arc length).
  const lo = -up.length;
  const hi = down.length;
  const samples: number[] = [...keptArc];
  const step = hi > 0 ? hi / (options.alongSteps - 1) : bulgeRadius / 10;
  for (let i = 0; i < options.alongSteps; i += 1) samples.push((hi * i) / (options.alongSteps - 1));
  for (let s = -step; s > lo; s -= step) samples.push(s);
  samples.push(0, bulgeRadius, -bulgeRadius);
  for (let k = 1; k <= BULGE_CIRCLE_STEPS; k += 1) {
    const s = bulgeRadius * Math.sin((k * Math.PI) / (2 * BULGE_CIRCLE_STEPS));
    samples.push(s, -s);
  }
  for (const band of bands) {
    for (const [end, sign] of [
      [bandEnd(plume, params, band.threshold, hi), 1],
      [upcoastEnd(plume, params, band.threshold, up.length, bulgeRadius), -1],
    ] as const) {
      if (end <= 0) continue;
      samples.push(sign * end);
      for (let k = 0; k < 8; k += 1) samples.push(sign * (end - step * 2 ** -k));
    }
  }
  const sorted = samples.filter((s) => s >= lo && s <= hi).sort((a, b) => a - b);
  const sArc: number[] = [];
  for (const s of sorted) if (sArc.length === 0 || s - sArc[sArc.length - 1] > 1e-3) sArc.push(s);

  // Samples where the field may jump: the mouth, ± the bulge radius, the ends of the walk.
  const jumpAt = [0, bulgeRadius, -bulgeRadius, lo, hi];
  const jumps = new Set<number>();
  sArc.forEach((s, i) => {
    if (jumpAt.some((j) => Math.abs(s - j) <= 1e-3)) jumps.add(i);
  });

  // Place each sample on the simplified path, interpolating by arc length.
  const sPoints: PlanarPoint[] = [];
  let k = 0;
  for (const s of sArc) {
    while (k < keptArc.length - 2 && s > keptArc[k + 1]) k += 1;
    const a = keptPoints[k];
    const b = keptPoints[Math.min(k + 1, keptPoints.length - 1)];
    const span = keptArc[Math.min(k + 1, keptArc.length - 1)] - keptArc[k];
    const f = span > 0 ? clamp((s - keptArc[k]) / span, 0, 1) : 0;
    sPoints.push([a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1])]);
  }
  return {
    points: sPoints,
    tolerance,
    widths(threshold) {
      // The width at each sample, taken once (so neighbouring quads share their corner
      // exactly); at the field's jumps — the mouth, the bulge edge, the reach, the upcoast end
      // of the bulge — each side takes its own one-sided limit.
      const at = sArc.map((s) => widthAt(threshold, s));
      const start: number[] = [];
      const end: number[] = [];
      let max = 0;
      for (let i = 0; i + 1 < sArc.length; i += 1) {
        const eta = Math.min(1e-3, (sArc[i + 1] - sArc[i]) / 4);
        const ws = jumps.has(i) ? widthAt(threshold, sArc[i] + eta) : at[i];
        const we = jumps.has(i + 1) ? widthAt(threshold, sArc[i + 1] - eta) : at[i + 1];
        start.push(ws);
        end.push(we);
        max = Math.max(max, ws, we);
      }
      return { start, end, max };
    },
  };
}

/** @private Band width at signed arc length s: the coastal current's edge (0 up-coast; the bulge is drawn as its own lobe). */
function bandWidth(plume: FootprintPlume, params: ExposureParameters, threshold: FieldThreshold, s: number, _bulgeRadius: number): number {
  if (s < 0) return 0;
  return offshoreDistanceWhere(plume, params, s, threshold);
}

/** Rays of a band's bulge lobe (its outline seen from the mouth). */
const BULGE_LOBE_RAYS = 96;

/**
 * @private The bulge part of a band: the region {d ≤ D(θ)} seen from the mouth (bulgeEdgeDistance),
 * θ from the outflow axis towards down-coast, as a ring with a strip `landward` behind the mouth;
 * null when the bulge does not meet the threshold.
 */
function bulgeLobe(
  plume: FootprintPlume,
  params: ExposureParameters,
  threshold: FieldThreshold,
  mouth: PlanarPoint,
  seaward: PlanarPoint,
  downCoast: PlanarPoint,
  tolerance: number,
): { ring: PlanarPoint[]; seed: PlanarPoint; maxOffshore: number; maxAlong: number } | null {
  const arc: PlanarPoint[] = [];
  let maxOffshore = 0;
  let maxAlong = 0;
  let axis = 0;
  for (let i = 1; i < BULGE_LOBE_RAYS; i += 1) {
    const theta = -Math.PI / 2 + (Math.PI * i) / BULGE_LOBE_RAYS;
    const d = bulgeEdgeDistance(plume, params, theta, threshold);
    const a = d * Math.sin(theta);
    const x = d * Math.cos(theta);
    if (i * 2 === BULGE_LOBE_RAYS) axis = d;
    maxOffshore = Math.max(maxOffshore, x);
    maxAlong = Math.max(maxAlong, a);
    arc.push([mouth[0] + a * downCoast[0] + x * seaward[0], mouth[1] + a * downCoast[1] + x * seaward[1]]);
  }
  if (maxOffshore <= 0 || axis <= 0) return null;
  const back = tolerance + LANDWARD_MARGIN;
  // As the equatorial half-disc: the arc from the up-coast side to the down-coast side, then
  // back behind the mouth.
  const ring: PlanarPoint[] = [
    ...arc,
    [mouth[0] + back * (downCoast[0] - seaward[0]), mouth[1] + back * (downCoast[1] - seaward[1])],
    [mouth[0] - back * (downCoast[0] + seaward[0]), mouth[1] - back * (downCoast[1] + seaward[1])],
  ];
  return { ring, seed: offsetPoint(mouth, seaward, axis / 2), maxOffshore, maxAlong };
}

/** @private Arc length where a band ends downstream (last s with a positive width), within [0, limit]. */
function bandEnd(plume: FootprintPlume, params: ExposureParameters, threshold: FieldThreshold, limit: number): number {
  const w = (s: number) => offshoreDistanceWhere(plume, params, s, threshold);
  return lastPositive(w, limit);
}

/** @private Upcoast arc length where the bulge part of a band ends, within [0, min(limit, bulge radius)]. */
function upcoastEnd(
  plume: FootprintPlume,
  params: ExposureParameters,
  threshold: FieldThreshold,
  limit: number,
  bulgeRadius: number,
): number {
  return lastPositive((s) => bandWidth(plume, params, threshold, -s, bulgeRadius), Math.min(limit, bulgeRadius));
}

/** @private Largest s in [0, limit] with f(s) > 0, assuming f is positive then zero (bisection). */
function lastPositive(f: (s: number) => number, limit: number): number {
  if (limit <= 0 || !(f(0) > 0)) return 0;
  if (f(limit) > 0) return limit;
  let lo = 0;
  let hi = limit;
  for (let i = 0; i < 60 && hi - lo > 1e-6; i += 1) {
    const mid = (lo + hi) / 2;
    if (f(mid) > 0) lo = mid;
    else hi = mid;
  }
  return lo;
}

// ---------------------------------------------------------------------------------------------
// Clipping to the sea
// ---------------------------------------------------------------------------------------------

/** @private Union of the rings minus land, cut by shorelines; keeps the faces beside the walked coast (or holding a seed point). */
function clipToSea(
  context: Context,
  rings: PlanarPoint[][],
  maxVertices: number | undefined,
  tolerance: number,
  warnings: string[],
  label: string,
  seed?: PlanarPoint,
): OverlayFace[] {
  if (rings.length === 0) return [];
  const box = ringsBox(rings, 10);
  const { negative, barriers } = coastInBox(context, box);
  let broken = 0;
  const run = (positive: PlanarPoint[][], extraNegative: OverlayLine[], asFaces: boolean) => {
    const result = context.overlay({ positive, orientPositive: !asFaces, negative: [...negative, ...extraNegative], barriers });
    broken += result.brokenRings;
    return result.faces.filter((f) => f.marked || (seed !== undefined && faceContains(f, seed)));
  };
  const union = unionRings(rings, context.overlay);
  broken += union.brokenRings;
  let faces = run(union.rings, [], true);
  if (maxVertices !== undefined) {
    let step = Math.max(tolerance, 0.5);
    for (let round = 0; round < 12 && vertexCount(faces) > maxVertices; round += 1) {
      const outers = faces.map((f) => simplifyRing(f.outer, step));
      const holes = faces.flatMap((f) => f.holes.map((h) => ({ points: simplifyRing(h, step).reverse() })));
      faces = run(unionRings(outers, context.overlay).rings, holes, true);
      step *= 2;
    }
    if (vertexCount(faces) > maxVertices) {
      warnings.push(`${label} still has ${vertexCount(faces)} vertices after simplification (cap ${maxVertices}).`);
    }
  }
  if (broken > 0) warnings.push(`Geometry of ${label}: ${broken} outline piece(s) could not be closed and were left out.`);
  return faces;
}

/** @private The coast near a box, as overlay lines: land rings clipped to it, shoreline runs meeting it. */
function coastInBox(context: Context, box: number[]): { negative: OverlayLine[]; barriers: OverlayLine[] } {
  const negative: OverlayLine[] = [];
  const barriers: OverlayLine[] = [];
  context.coast.forEach((line, li) => {
    const marks = context.marks[li];
    if (line.source === 'land-ring') {
      const clipped = clipRingToBox(line.points, marks, box);
      if (clipped.points.length >= 3) negative.push({ points: clipped.points, closed: true, marks: clipped.marks });
      return;
    }
    const pts = line.points;
    const n = pts.length;
    const count = line.closed ? n : n - 1;
    // An open shoreline that ends inside the box cannot part land from sea there, so its ends
    // are carried on straight, in the direction of their last segment, past the box (c).
    const reachOut = 2 * Math.hypot(box[2] - box[0], box[3] - box[1]);
    const extend = (end: PlanarPoint, before: PlanarPoint): PlanarPoint => {
      const dx = end[0] - before[0];
      const dy = end[1] - before[1];
      const len = Math.hypot(dx, dy) || 1;
      return [end[0] + (dx / len) * reachOut, end[1] + (dy / len) * reachOut];
    };
    let run: PlanarPoint[] = [];
    let runMarks: number[] = [];
    const flush = () => {
      if (run.length >= 2) barriers.push({ points: run, closed: false, marks: runMarks });
      run = [];
      runMarks = [];
    };
    for (let i = 0; i < count; i += 1) {
      const a = pts[i];
      const b = pts[(i + 1) % n];
      const meets = !(
        Math.max(a[0], b[0]) < box[0] ||
        Math.min(a[0], b[0]) > box[2] ||
        Math.max(a[1], b[1]) < box[1] ||
        Math.min(a[1], b[1]) > box[3]
      );
      if (!meets) {
        flush();
        continue;
      }
      if (run.length === 0) {
        if (!line.closed && i === 0 && n >= 2) {
          run.push(extend(a, b));
          runMarks.push(0);
        }
        run.push(a);
      }
      run.push(b);
      runMarks.push(marks[i]);
      if (!line.closed && i === count - 1 && n >= 2) {
        run.push(extend(b, a));
        runMarks.push(0);
      }
    }
    flush();
  });
  return { negative, barriers };
}

/** @private Bounding box of rings, grown by a margin [m]. */
function ringsBox(rings: PlanarPoint[][], margin: number): number[] {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const ring of rings) {
    for (const p of ring) {
      minX = Math.min(minX, p[0]);
      minY = Math.min(minY, p[1]);
      maxX = Math.max(maxX, p[0]);
      maxY = Math.max(maxY, p[1]);
    }
  }
  return [minX - margin, minY - margin, maxX + margin, maxY + margin];
}

/** @private True when a point is inside a face (outer ring, not in a hole). */
function faceContains(face: OverlayFace, point: PlanarPoint): boolean {
  return pointInRing(face.outer, point) && !face.holes.some((h) => pointInRing(h, point));
}

/** @private Total vertices of faces. */
function vertexCount(faces: OverlayFace[]): number {
  return faces.reduce((sum, f) => sum + f.outer.length + f.holes.reduce((s, h) => s + h.length, 0), 0);
}

/** @private Douglas–Peucker on a ring (its first vertex kept). */
function simplifyRing(ring: PlanarPoint[], tolerance: number): PlanarPoint[] {
  const closed = [...ring, ring[0]];
  const far = ring.reduce(
    (best, p, i) =>
      Math.hypot(p[0] - ring[0][0], p[1] - ring[0][1]) > Math.hypot(ring[best][0] - ring[0][0], ring[best][1] - ring[0][1]) ? i : best,
    0,
  );
  const kept = simplifyPath(closed, tolerance, [far]);
  return kept.slice(0, -1).map((i) => closed[i]);
}

// ---------------------------------------------------------------------------------------------
// Bulge and equator
// ---------------------------------------------------------------------------------------------

/** @private The bulge disc clipped to the sea. */
function bulgeFeature(
  context: Context,
  mouth: PlanarPoint,
  seaward: PlanarPoint,
  radius: number,
  tolerance: number,
  diameter: number,
  warnings: string[],
): Feature<Polygon | MultiPolygon, BulgeProperties> | null {
  const centre: PlanarPoint = [mouth[0] + radius * seaward[0], mouth[1] + radius * seaward[1]];
  const ring = circle(centre, radius, Math.max(tolerance / 2, 0.25));
  const faces = clipToSea(context, [ring], undefined, tolerance, warnings, 'bulge', centre);
  if (faces.length === 0) return null;
  return {
    type: 'Feature',
    properties: { id: 'bulge', diameterM: diameter, centre: context.projection.inverse(centre) },
    geometry: facesGeometry(faces, context.projection),
  };
}

/** @private A circle ring with chords within `tolerance` of the arc (8…256 vertices). */
function circle(centre: PlanarPoint, radius: number, tolerance: number): PlanarPoint[] {
  const step = tolerance >= radius ? Math.PI / 4 : 2 * Math.acos(1 - tolerance / radius);
  const n = clamp(Math.ceil((2 * Math.PI) / step), 8, 256);
  const ring: PlanarPoint[] = [];
  for (let i = 0; i < n; i += 1) {
    const a = (2 * Math.PI * i) / n;
    ring.push([centre[0] + radius * Math.cos(a), centre[1] + radius * Math.sin(a)]);
  }
  return ring;
}

/** @private Half-disc bands seaward of the mouth near the equator. */
function equatorialFootprint(
  input: FootprintInput,
  context: Context,
  snap: { line: number; segment: number; t: number; point: PlanarPoint; distance: number },
  seaward: PlanarPoint,
  warnings: string[],
  options: CheckedOptions,
): Footprint {
  const { plume, params } = input;
  warnings.unshift(EQUATOR_WARNING);
  const radius = plume.width;
  const line = context.coast[snap.line];
  const forward = walkCoast(line, snap, 1, radius);
  const backward = walkCoast(line, snap, -1, radius);
  markWalk(context, snap.line, forward);
  markWalk(context, snap.line, backward);
  const across: PlanarPoint = [-seaward[1], seaward[0]];
  const radii = input.bands.map((b) => offshoreDistanceWhere(plume, params, 0, b.threshold));
  const positive = radii.filter((r) => r > 0);
  const tolerance = options.simplifyTolerance ?? clamp(0.01 * (positive.length ? Math.min(...positive) : 1000), 0.5, 20);
  const bands = input.bands.map((spec, i) => {
    const r = radii[i];
    if (r <= 0) {
      warnings.push(`${spec.name}: the threshold is not met anywhere in the plume.`);
      return bandFeature(spec, [], context.projection, 0, 0);
    }
    const ring = halfDisc(snap.point, seaward, across, r, tolerance + LANDWARD_MARGIN, Math.max(tolerance / 2, 0.25));
    const faces = clipToSea(
      context,
      [ring],
      options.maxVertices,
      tolerance,
      warnings,
      spec.id,
      offsetPoint(snap.point, seaward, Math.min(1, r / 2)),
    );
    return bandFeature(spec, faces, context.projection, r, r);
  });
  const coastPoints = [...backward.points].reverse().concat(forward.points.slice(1));
  return {
    bulge: null,
    bands,
    path: {
      type: 'Feature',
      properties: { id: 'equatorial-coast', lengthM: backward.length + forward.length, turnsTo: plume.turnsTo },
      geometry: { type: 'LineString', coordinates: lineCoordinates(coastPoints, context.projection) },
    },
    warnings,
    mouthSnapDistanceM: snap.distance,
  };
}

/** @private Half-disc of radius r seaward of a point, with a strip `landward` deep behind its diameter. */
function halfDisc(
  centre: PlanarPoint,
  seaward: PlanarPoint,
  across: PlanarPoint,
  radius: number,
  landward: number,
  tolerance: number,
): PlanarPoint[] {
  const step = tolerance >= radius ? Math.PI / 4 : 2 * Math.acos(1 - tolerance / radius);
  const n = clamp(Math.ceil(Math.PI / step), 4, 128);
  const ring: PlanarPoint[] = [];
  for (let i = 0; i <= n; i += 1) {
    const a = -Math.PI / 2 + (Math.PI * i) / n;
    ring.push([
      centre[0] + radius * (Math.cos(a) * seaward[0] + Math.sin(a) * across[0]),
      centre[1] + radius * (Math.cos(a) * seaward[1] + Math.sin(a) * across[1]),
    ]);
  }
  ring.push([centre[0] + radius * across[0] - landward * seaward[0], centre[1] + radius * across[1] - landward * seaward[1]]);
  ring.push([centre[0] - radius * across[0] - landward * seaward[0], centre[1] - radius * across[1] - landward * seaward[1]]);
  return ring;
}

// ---------------------------------------------------------------------------------------------
// GeoJSON output
// ---------------------------------------------------------------------------------------------

/** @private A band feature from its faces. */
function bandFeature(
  spec: BandSpec,
  faces: OverlayFace[],
  projection: LocalProjection,
  maxOffshore: number,
  along: number,
): Feature<Polygon | MultiPolygon, BandProperties> {
  return {
    type: 'Feature',
    properties: {
      id: spec.id,
      name: spec.name,
      kind: thresholdKind(spec.threshold),
      threshold: spec.threshold,
      maxOffshoreM: maxOffshore,
      alongReachM: along,
    },
    geometry: facesGeometry(faces, projection),
  };
}

/** @private Which field a threshold applies to. */
function thresholdKind(threshold: FieldThreshold): BandProperties['kind'] {
  if ('salinityBelow' in threshold) return 'salinity';
  if ('indicatorAbove' in threshold) return 'indicator';
  return 'presence';
}

/** @private Faces (metres) as a Polygon (one face) or MultiPolygon, in EPSG:4326. */
function facesGeometry(faces: OverlayFace[], projection: LocalProjection): Polygon | MultiPolygon {
  const polygons = faces.map((f) => [
    closedRing(f.outer, f.outerOnLine, projection),
    ...f.holes.map((h, i) => closedRing(h, f.holesOnLine[i], projection)),
  ]);
  if (polygons.length === 1) return { type: 'Polygon', coordinates: polygons[0] };
  return { type: 'MultiPolygon', coordinates: polygons };
}

/**
 * Longest output edge away from the coast [m]: longer edges get extra vertices before leaving
 * the projection, so that a straight edge in EPSG:4326 stays within about 0.2 mm of the
 * straight edge computed in metres (c: a lon/lat chord of length L strays about
 * L²·tan(latitude)/(8R) from it). Edges along the coast are left as they are: their ends are
 * coast vertices, so they map back onto the coast's own lon/lat segments.
 */
export const OUTPUT_MAX_EDGE = 100;

/** @private A ring in EPSG:4326, closed, long edges away from the coast divided. */
function closedRing(ring: PlanarPoint[], onCoast: boolean[], projection: LocalProjection): Position[] {
  const out: Position[] = [];
  for (let i = 0; i < ring.length; i += 1) {
    const a = ring[i];
    const b = ring[(i + 1) % ring.length];
    const pieces = onCoast[i] ? 1 : Math.ceil(Math.hypot(b[0] - a[0], b[1] - a[1]) / OUTPUT_MAX_EDGE);
    for (let k = 0; k < Math.max(1, pieces); k += 1) {
      const f = k / Math.max(1, pieces);
      out.push(projection.inverse([a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1])]));
    }
  }
  out.push([out[0][0], out[0][1]]);
  return out;
}

/** @private A line in EPSG:4326. */
function lineCoordinates(points: PlanarPoint[], projection: LocalProjection): Position[] {
  const out = points.map((p) => projection.inverse(p));
  if (out.length === 1) out.push([out[0][0], out[0][1]]);
  return out;
}

/** @private point + distance · direction. */
function offsetPoint(p: PlanarPoint, dir: PlanarPoint, distance: number): PlanarPoint {
  return [p[0] + distance * dir[0], p[1] + distance * dir[1]];
}

/** @private Degrees to radians. */
function rad(degrees: number): number {
  return (degrees * Math.PI) / 180;
}

/** @private Clamp x to [lo, hi]. */
function clamp(x: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, x));
}

/** @private Metres as km text. */
function fmtKm(m: number): string {
  return m >= 10_000 ? `${Math.round(m / 1000)} km` : `${(m / 1000).toFixed(1)} km`;
}
