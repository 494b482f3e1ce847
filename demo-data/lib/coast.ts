/**
 * @module demo-data/lib/coast
 * The invented Fennick coast in the local frame (metres): a mainland shoreline running 110 km
 * south → north with Tolley Brook's mouth, the Amberlin River's mouth 30 km north of it, the
 * shallow Fennick Bay 10–21 km north of the Amberlin, Gullstone Head 28–35 km north of it;
 * Skerrow Island offshore beyond the head; the land polygon.
 *
 * Method: a centripetal Catmull–Rom spline through hand-placed control points (km), resampled
 * every ~120 m, then moved along its normal by a seeded sum of sinusoids (wavelengths 6 km down
 * to 280 m, amplitude falling with wavelength) for natural wiggles. The wiggles fade to zero at
 * the two river mouths (so each mouth is an exact vertex) and at the ends of the line, and shrink
 * where the coast bends sharply (so the line never loops).
 */
import { createUniformStream } from '../../shared/hydrology/seeded-uniform';
import { km, type Xy } from './local-frame';
import { clockwise, counterClockwise } from './planar';

/** Seed of the coast wiggles. */
export const COAST_SEED = 4107;
/** Seed of Skerrow Island's outline. */
export const ISLAND_SEED = 4108;

/** Extent of the region in the local frame [m]: 37 km west–east, 112 km south–north. */
export const REGION_BOUNDS = { minX: -25_000, maxX: 12_000, minY: -56_000, maxY: 56_000 } as const;

/** Mouth of the Amberlin River, on the open coast near the middle of the region. */
export const AMBERLIN_MOUTH: Xy = km(0.0, 0.0);
/** Mouth of Tolley Brook, on the open coast 30 km south of the Amberlin's. */
export const TOLLEY_MOUTH: Xy = km(0.0, -30.0);

/**
 * Control points of the mainland shoreline, south → north (land to the east, i.e. on the right
 * when walking the list). Index of each river mouth is marked by reference equality.
 */
const CONTROL: Xy[] = [
  km(1.0, -55.0),
  km(0.7, -48.0),
  km(0.3, -41.0),
  km(0.1, -35.0),
  TOLLEY_MOUTH,
  km(-0.2, -25.0),
  km(-0.5, -19.0),
  km(-0.3, -13.0),
  km(-0.1, -7.0),
  km(0.1, -3.5),
  AMBERLIN_MOUTH,
  km(-0.1, 3.5),
  km(-0.4, 7.5),
  // Fennick Bay: a shallow bay 11 km across and 3.5 km deep, 10–21 km north of the Amberlin.
  km(-0.8, 10.0),
  km(0.6, 11.6),
  km(2.0, 13.6),
  km(2.7, 16.0),
  km(2.4, 18.4),
  km(1.0, 20.3),
  km(-0.6, 21.6),
  // The straight coast north to Gullstone Head.
  km(-0.8, 24.5),
  km(-1.2, 27.5),
  // Gullstone Head: juts ~5 km west.
  km(-2.5, 28.6),
  km(-4.1, 29.3),
  km(-5.5, 30.0),
  km(-6.0, 30.9),
  km(-5.6, 31.8),
  km(-4.2, 32.5),
  km(-2.6, 33.3),
  km(-1.4, 34.6),
  km(-0.8, 36.8),
  km(-0.6, 40.5),
  km(-0.2, 45.0),
  km(0.2, 50.0),
  km(0.6, 55.0),
];

/** Target spacing of shoreline vertices [m]. */
const SPACING = 120;
/** Wiggle components: wavelength [m] and amplitude [m]. */
const WIGGLE_WAVELENGTHS = [6000, 3600, 2160, 1296, 778, 467, 280];
/** Amplitude of a component = WIGGLE_AMPLITUDE × (λ / 6000 m)^0.85. */
const WIGGLE_AMPLITUDE = 150;
/** No wiggle within this distance of a river mouth [m]; full wiggle beyond FADE_END. */
const FADE_START = 500;
const FADE_END = 1500;

/** The generated coast. */
export interface Coast {
  /** Mainland shoreline, south → north, land on the right (east). */
  mainland: Xy[];
  /** Index of each river mouth in `mainland`. */
  mouthIndex: { amberlin: number; tolley: number };
  /** Skerrow Island's outline, clockwise (land on the right when walking it), not closed. */
  islandLine: Xy[];
  /** Land polygon rings, counter-clockwise, not closed: mainland (coast + region's east edge) and island. */
  landRings: { mainland: Xy[]; island: Xy[] };
}

/**
 * Builds the coast deterministically from the fixed control points and seeds.
 * @returns the mainland shoreline, mouth indices, island outline and land rings
 */
export function buildCoast(): Coast {
  const dense = catmullRom(CONTROL, 40);
  const anchors = [0, dense.indexOf(TOLLEY_MOUTH), dense.indexOf(AMBERLIN_MOUTH), dense.length - 1];
  if (anchors.some((i) => i < 0)) throw new Error('river mouths must be control points');

  // Resample each section between anchors at ~SPACING, keeping the anchors exactly.
  const smooth: Xy[] = [];
  const mouthIndex = { amberlin: -1, tolley: -1 };
  for (let k = 0; k < anchors.length - 1; k++) {
    const section = dense.slice(anchors[k], anchors[k + 1] + 1);
    const points = resample(section, SPACING);
    if (k > 0) points.shift();
    smooth.push(...points);
    if (k === 0) mouthIndex.tolley = smooth.length - 1;
    if (k === 1) mouthIndex.amberlin = smooth.length - 1;
  }

  const mainland = wiggle(smooth, [mouthIndex.tolley, mouthIndex.amberlin]);
  const island = buildIsland();
  const east = REGION_BOUNDS.maxX;
  const mainlandRing = counterClockwise([...mainland, [east, mainland[mainland.length - 1][1]], [east, mainland[0][1]]]);
  return {
    mainland,
    mouthIndex,
    islandLine: clockwise(island),
    landRings: { mainland: mainlandRing, island: counterClockwise(island) },
  };
}

/**
 * Skerrow Island: an egg-shaped outline ~2 km × 1 km, long axis towards 20° (NNE), centred
 * 8.5 km west and 42 km north of the region centre (off the coast north of Gullstone Head),
 * with a seeded wobble of a few harmonics.
 */
function buildIsland(): Xy[] {
  const next = createUniformStream(ISLAND_SEED);
  const centre = km(-8.5, 42.0);
  const semiMajor = 1000;
  const semiMinor = 480;
  const axis = (20 * Math.PI) / 180;
  const harmonics = [
    { n: 2, a: 0.06 },
    { n: 3, a: 0.07 },
    { n: 5, a: 0.035 },
    { n: 8, a: 0.02 },
    { n: 13, a: 0.01 },
  ].map((h) => ({ ...h, phase: 2 * Math.PI * next() }));
  const count = 80;
  const ring: Xy[] = [];
  for (let i = 0; i < count; i++) {
    const t = (2 * Math.PI * i) / count;
    const scale = 1 + harmonics.reduce((s, h) => s + h.a * Math.sin(h.n * t + h.phase), 0);
    const u = semiMinor * Math.cos(t) * scale; // across the long axis
    const v = semiMajor * Math.sin(t) * scale; // along the long axis
    // Long axis direction (sin axis, cos axis); across-axis direction (cos axis, −sin axis).
    ring.push([round2(centre[0] + u * Math.cos(axis) + v * Math.sin(axis)), round2(centre[1] - u * Math.sin(axis) + v * Math.cos(axis))]);
  }
  return ring;
}

/**
 * Moves each vertex along the line's normal by the seeded sum of sinusoids, faded near the
 * given vertex indices and the ends, and scaled down where the radius of curvature is small.
 */
function wiggle(line: Xy[], fixed: number[]): Xy[] {
  const next = createUniformStream(COAST_SEED);
  const components = WIGGLE_WAVELENGTHS.map((lambda) => ({
    lambda,
    amplitude: WIGGLE_AMPLITUDE * (lambda / 6000) ** 0.85,
    phase: 2 * Math.PI * next(),
  }));
  const s = cumulativeLength(line);
  const total = s[s.length - 1];
  const radius = line.map((_, i) => localRadius(line, i));
  const out: Xy[] = [];
  for (let i = 0; i < line.length; i++) {
    if (i === 0 || i === line.length - 1 || fixed.includes(i)) {
      out.push([round2(line[i][0]), round2(line[i][1])]);
      continue;
    }
    const nearest = Math.min(s[i], total - s[i], ...fixed.map((j) => Math.abs(s[i] - s[j])));
    const fade = smoothstep(FADE_START, FADE_END, nearest);
    let minRadius = Number.POSITIVE_INFINITY;
    for (let j = Math.max(1, i - 6); j <= Math.min(line.length - 2, i + 6); j++) minRadius = Math.min(minRadius, radius[j]);
    const bendFactor = Math.min(1, Math.max(0.15, (minRadius - 150) / 1200));
    const d = fade * bendFactor * components.reduce((sum, c) => sum + c.amplitude * Math.sin((2 * Math.PI * s[i]) / c.lambda + c.phase), 0);
    const a = line[i - 1];
    const b = line[i + 1];
    const tx = b[0] - a[0];
    const ty = b[1] - a[1];
    const len = Math.hypot(tx, ty);
    out.push([round2(line[i][0] + (d * ty) / len), round2(line[i][1] - (d * tx) / len)]);
  }
  return out;
}

/** @private Radius of curvature at vertex i from its two neighbours [m]. */
function localRadius(line: Xy[], i: number): number {
  if (i === 0 || i === line.length - 1) return Number.POSITIVE_INFINITY;
  const a = line[i - 1];
  const b = line[i];
  const c = line[i + 1];
  const h1 = Math.atan2(b[1] - a[1], b[0] - a[0]);
  const h2 = Math.atan2(c[1] - b[1], c[0] - b[0]);
  let turn = Math.abs(h2 - h1);
  if (turn > Math.PI) turn = 2 * Math.PI - turn;
  const ds = (Math.hypot(b[0] - a[0], b[1] - a[1]) + Math.hypot(c[0] - b[0], c[1] - b[1])) / 2;
  return turn === 0 ? Number.POSITIVE_INFINITY : ds / turn;
}

/** Centripetal Catmull–Rom spline through the points, `steps` samples per span; control points are kept by reference. */
export function catmullRom(points: Xy[], steps: number): Xy[] {
  const out: Xy[] = [points[0]];
  const n = points.length;
  const at = (i: number): Xy => {
    if (i < 0) return [2 * points[0][0] - points[1][0], 2 * points[0][1] - points[1][1]];
    if (i >= n) return [2 * points[n - 1][0] - points[n - 2][0], 2 * points[n - 1][1] - points[n - 2][1]];
    return points[i];
  };
  for (let i = 0; i < n - 1; i++) {
    const p0 = at(i - 1);
    const p1 = at(i);
    const p2 = at(i + 1);
    const p3 = at(i + 2);
    const t0 = 0;
    const t1 = t0 + Math.sqrt(Math.hypot(p1[0] - p0[0], p1[1] - p0[1]));
    const t2 = t1 + Math.sqrt(Math.hypot(p2[0] - p1[0], p2[1] - p1[1]));
    const t3 = t2 + Math.sqrt(Math.hypot(p3[0] - p2[0], p3[1] - p2[1]));
    for (let k = 1; k < steps; k++) {
      const t = t1 + ((t2 - t1) * k) / steps;
      const lerp = (p: Xy, q: Xy, ta: number, tb: number): Xy => [
        ((tb - t) / (tb - ta)) * p[0] + ((t - ta) / (tb - ta)) * q[0],
        ((tb - t) / (tb - ta)) * p[1] + ((t - ta) / (tb - ta)) * q[1],
      ];
      const a1 = lerp(p0, p1, t0, t1);
      const a2 = lerp(p1, p2, t1, t2);
      const a3 = lerp(p2, p3, t2, t3);
      const b1 = lerp(a1, a2, t0, t2);
      const b2 = lerp(a2, a3, t1, t3);
      out.push(lerp(b1, b2, t1, t2));
    }
    out.push(p2);
  }
  return out;
}

/** Resamples a polyline at (about) equal arc-length steps, keeping both ends. */
export function resample(line: Xy[], spacing: number): Xy[] {
  const s = cumulativeLength(line);
  const total = s[s.length - 1];
  const count = Math.max(1, Math.round(total / spacing));
  const out: Xy[] = [line[0]];
  let j = 0;
  for (let k = 1; k < count; k++) {
    const target = (total * k) / count;
    while (s[j + 1] < target) j++;
    const f = (target - s[j]) / (s[j + 1] - s[j]);
    out.push([line[j][0] + f * (line[j + 1][0] - line[j][0]), line[j][1] + f * (line[j + 1][1] - line[j][1])]);
  }
  out.push(line[line.length - 1]);
  return out;
}

/** Cumulative arc length at each vertex [m]. */
export function cumulativeLength(line: readonly Xy[]): number[] {
  const s = [0];
  for (let i = 1; i < line.length; i++) s.push(s[i - 1] + Math.hypot(line[i][0] - line[i - 1][0], line[i][1] - line[i - 1][1]));
  return s;
}

/** @private Hermite smoothstep from 0 at e0 to 1 at e1. */
function smoothstep(e0: number, e1: number, x: number): number {
  const t = Math.min(1, Math.max(0, (x - e0) / (e1 - e0)));
  return t * t * (3 - 2 * t);
}

/** @private Rounds to centimetres. */
function round2(v: number): number {
  return Math.round(v * 100) / 100;
}

/** A place on the sea side of the mainland, found from a river mouth along the shore. */
export interface ShorePlace {
  /** The point [m] in the local frame. */
  point: Xy;
  /** Azimuth of the shoreline there, walking north (degrees clockwise from north). */
  shoreAzimuth: number;
}

/**
 * The point `offshoreM` metres seaward of the shoreline, `alongKm` km along the mainland shore
 * from a vertex (positive north, negative south). The shore direction is smoothed over ±600 m so
 * that the wiggles do not swing the normal.
 * @param coast - the built coast
 * @param fromIndex - vertex index of the start (a river mouth)
 * @param alongKm - arc length along the shore [km], signed
 * @param offshoreM - distance seaward of the shore [m]
 */
export function shorePlace(coast: Coast, fromIndex: number, alongKm: number, offshoreM: number): ShorePlace {
  const line = coast.mainland;
  const s = cumulativeLength(line);
  const target = s[fromIndex] + alongKm * 1000;
  if (target < 0 || target > s[s.length - 1]) throw new Error(`${alongKm} km from vertex ${fromIndex} is off the shoreline`);
  const at = (arc: number): Xy => {
    const a = Math.max(0, Math.min(s[s.length - 1], arc));
    let j = 0;
    while (j < s.length - 2 && s[j + 1] < a) j++;
    const f = (a - s[j]) / (s[j + 1] - s[j]);
    return [line[j][0] + f * (line[j + 1][0] - line[j][0]), line[j][1] + f * (line[j + 1][1] - line[j][1])];
  };
  const p = at(target);
  const a = at(target - 600);
  const b = at(target + 600);
  const tx = b[0] - a[0];
  const ty = b[1] - a[1];
  const len = Math.hypot(tx, ty);
  // Sea is on the left when walking north (land on the right): the left normal is (−ty, tx).
  return {
    point: [p[0] + (-ty / len) * offshoreM, p[1] + (tx / len) * offshoreM],
    shoreAzimuth: ((Math.atan2(tx, ty) * 180) / Math.PI + 360) % 360,
  };
}
