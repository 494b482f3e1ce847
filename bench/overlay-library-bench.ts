/**
 * Issue "Jurisdiction-scale speed": the hand-written overlay (shared/geometry/overlay-rings.ts) against maintained
 * clipping libraries from the npm registry (clipper2-ts, a TypeScript port of Clipper2; clipper-lib, the JavaScript
 * port of Clipper 1; geos-wasm, the WebAssembly build of GEOS, see bench/geos-overlay.ts), on
 *  - the overlay fixtures of tests/shared/geometry/overlay-rings.test.ts: union, difference and minArea compared by
 *    area and ring count; the fixtures with barriers and marks (the faces the footprint needs: the sea cut by the
 *    shoreline, the side beside the walked coast flagged) have no counterpart in the Clippers' union/difference API
 *    and are counted as not passed for them; GEOS expresses them (node + polygonize, marks by a side probe) and is
 *    compared face by face with the overlay (same ground, same mark, valid — no spike);
 *  - the footprint's workload on the 10 000-vertex coast of bench/screening-bench.ts: one quad per coast segment
 *    reaching 2 km out to sea (thousands of heavily overlapping rings), minus the land.
 * The adoption rule: every fixture passed and no slower than 1.5× on the coast.
 */
import ClipperLib from 'clipper-lib';
import { Clipper, ClipType, FillRule, type PathsD } from 'clipper2-ts';
import fc from 'fast-check';
import { type OverlayLine, overlayRings, type PlanarPoint, ringArea } from '../shared/geometry/overlay-rings';
import { geosOverlay, loadGeos, sameFace } from './geos-overlay';
import { type BenchResult, bench } from './harness';

type Ring = PlanarPoint[];
const square = (x: number, y: number, s: number): Ring => [
  [x, y],
  [x + s, y],
  [x + s, y + s],
  [x, y + s],
];

interface Case {
  name: string;
  positive: Ring[];
  negative?: Ring[];
  minArea?: number;
  /** Barriers with marks: not expressible as union/difference. */
  barriers?: OverlayLine[];
  /** The overlay's shortcut for shared sides (same result; the libraries need no such option). */
  dissolveShared?: boolean;
}

const CASES: Case[] = [
  { name: 'overlapping squares unioned (area 7)', positive: [square(0, 0, 2), square(1, 1, 2)] },
  { name: 'negative ring as a hole (area 96)', positive: [square(0, 0, 10)], negative: [square(3, 3, 2)] },
  { name: 'squares touching at a corner (two faces)', positive: [square(0, 0, 1), square(1, 1, 1)], minArea: 0 },
  { name: 'identical and collinear-overlapping rings', positive: [square(0, 0, 1), square(0, 0, 1), square(0, 0.5, 1)], minArea: 0 },
  {
    name: 'shared sides of neighbouring pieces cancelled (dissolveShared, area 3.5)',
    positive: [square(0, 0, 1), square(1, 0, 1), square(2, 0, 1), square(0.5, 0.5, 1)],
    minArea: 0,
    dissolveShared: true,
  },
  { name: 'faces under minArea dropped', positive: [square(0, 0, 1)], minArea: 2 },
  {
    name: '1000 overlapping strips along a line',
    positive: Array.from(
      { length: 1000 },
      (_, i) =>
        [
          [i * 0.1, 0],
          [i * 0.1 + 0.5, 0],
          [i * 0.1 + 0.5, 1],
          [i * 0.1, 1],
        ] as Ring,
    ),
  },
  {
    name: 'barrier splits the region and flags the marked side',
    positive: [square(0, 0, 4)],
    barriers: [
      {
        points: [
          [2, -1],
          [2, 5],
        ],
        marks: [1],
      },
    ],
  },
  {
    name: 'dangling barrier keeps one face and takes its mark',
    positive: [square(0, 0, 4)],
    barriers: [
      {
        points: [
          [2, -1],
          [2, 2],
        ],
        marks: [1],
      },
    ],
  },
];

const toD = (rings: Ring[]): PathsD => rings.map((r) => r.map(([x, y]) => ({ x, y })));
const SCALE = 1e5; // clipper-lib works in integers: 10 µm, the overlay's own merge distance.
const toInt = (rings: Ring[]) => rings.map((r) => r.map(([x, y]) => ({ X: Math.round(x * SCALE), Y: Math.round(y * SCALE) })));

function clipper2(positive: Ring[], negative: Ring[], minArea: number): { area: number; rings: number } {
  const union = Clipper.booleanOpD(ClipType.Union, toD(positive), null, FillRule.NonZero, 5);
  const out = negative.length ? Clipper.differenceD(union, toD(negative), FillRule.NonZero, 5) : union;
  // Faces under minArea are dropped like the overlay does (outer rings positive, holes negative).
  const kept = out.filter((p) => Math.abs(Clipper.areaD(p)) >= minArea);
  return { area: kept.reduce((n, p) => n + Clipper.areaD(p), 0), rings: kept.length };
}

function clipper1(positive: Ring[], negative: Ring[], minArea: number): { area: number; rings: number } {
  const c = new ClipperLib.Clipper();
  c.AddPaths(toInt(positive), ClipperLib.PolyType.ptSubject, true);
  if (negative.length) c.AddPaths(toInt(negative), ClipperLib.PolyType.ptClip, true);
  const solution: { X: number; Y: number }[][] = [];
  c.Execute(
    negative.length ? ClipperLib.ClipType.ctDifference : ClipperLib.ClipType.ctUnion,
    solution,
    ClipperLib.PolyFillType.pftNonZero,
    ClipperLib.PolyFillType.pftNonZero,
  );
  const kept = solution.filter((p) => Math.abs(ClipperLib.Clipper.Area(p)) / SCALE ** 2 >= minArea);
  return { area: kept.reduce((n, p) => n + ClipperLib.Clipper.Area(p) / SCALE ** 2, 0), rings: kept.length };
}

function overlay(positive: Ring[], negative: Ring[], minArea: number, dissolveShared = false) {
  const r = overlayRings({ positive, negative: negative.map((points) => ({ points })), minArea, dissolveShared });
  return { area: r.faces.reduce((n, f) => n + f.area, 0), rings: r.faces.reduce((n, f) => n + 1 + f.holes.length, 0) };
}

/** The 10 000-vertex coast of the footprint bench, in local metres, with 2 km quads to sea and the land behind it. */
export function coastWorkload(): { positive: Ring[]; negative: Ring[] } {
  const VERTICES = 10_000;
  const coast: Ring = [];
  for (let i = 0; i < VERTICES; i += 1) {
    const y = -50_000 + (100_000 * i) / (VERTICES - 1);
    const x = 300 * Math.sin(y / 950) + 120 * Math.sin(y / 260 + 1) + 40 * Math.sin(y / 47) + 20 * Math.sin(y / 23 + 2);
    coast.push([x, y]);
  }
  const positive: Ring[] = [];
  for (let i = 0; i + 1 < coast.length; i++) {
    const [ax, ay] = coast[i];
    const [bx, by] = coast[i + 1];
    const w = 2_000;
    // Sea to the west (−x): the quad from the segment out to a parallel line 2 km offshore, a little wider so neighbours overlap.
    positive.push([
      [ax + 1, ay - 5],
      [bx + 1, by + 5],
      [bx - w, by + 5],
      [ax - w, ay - 5],
    ]);
  }
  const land: Ring = [...coast, [20_000, 50_000], [20_000, -50_000]];
  return { positive, negative: [ringArea(land) > 0 ? land : land.reverse()] };
}

function geosRings(g: Awaited<ReturnType<typeof loadGeos>>, positive: Ring[], negative: Ring[], minArea: number) {
  const faces = geosOverlay(g, { positive, negative: negative.map((points) => ({ points })), minArea });
  return { area: faces.reduce((n, f) => n + f.area, 0), rings: faces.reduce((n, f) => n + 1 + f.holes.length, 0) };
}

type Edged = { outer: Ring; holes: Ring[]; outerOnLine: boolean[]; holesOnLine: boolean[][] };
/** The length of a face's edges that lie along a negative ring or barrier [m]. */
function onLineLength(f: Edged): number {
  const along = (ring: Ring, flags: boolean[]) =>
    ring.reduce((n, p, k) => {
      const q = ring[(k + 1) % ring.length];
      return flags[k] ? n + Math.hypot(q[0] - p[0], q[1] - p[1]) : n;
    }, 0);
  return f.holes.reduce((n, h, k) => n + along(h, f.holesOnLine[k]), along(f.outer, f.outerOnLine));
}

/**
 * A fixture for GEOS: it passes when its faces match the overlay's one to one — the same ground (symmetric difference
 * nil), the same mark, the same length of edges along land or barriers, and valid (no spike).
 */
function geosFaces(g: Awaited<ReturnType<typeof loadGeos>>, c: Case): { ok: boolean; text: string } {
  const input = {
    positive: c.positive,
    negative: (c.negative ?? []).map((points) => ({ points })),
    barriers: c.barriers,
    minArea: c.minArea ?? 2,
  };
  const ref = overlayRings({ ...input, dissolveShared: c.dissolveShared }).faces;
  const got = geosOverlay(g, input);
  const unmatched = [...got];
  const ok =
    ref.length === got.length &&
    ref.every((f) => {
      const k = unmatched.findIndex(
        (h) => h.marked === f.marked && Math.abs(onLineLength(h) - onLineLength(f)) < 1e-6 && sameFace(g, f, h),
      );
      if (k < 0) return false;
      unmatched.splice(k, 1);
      return true;
    });
  const show = (fs: (Edged & { area: number; marked: boolean })[]) =>
    fs
      .map(
        (f) =>
          `${f.area.toFixed(3)}${f.marked ? ' marked' : ''}${onLineLength(f) > 0 ? ` (${onLineLength(f).toFixed(1)} m on land/barrier)` : ''}`,
      )
      .join(', ');
  return { ok, text: `geos-wasm faces [${show(got)}] against the overlay's [${show(ref)}] ${ok ? 'same' : 'DIFFERENT'}` };
}

/**
 * The property fixture of the overlay's tests ("matches the sweep-line clipper on random overlays"): its generator's
 * star-shaped rings (some snapped to whole metres), 200 samples from its seed; a library passes when its total area
 * is within 1e-3 m² of the overlay's on every sample (the tolerance the property allows). A library that throws on a
 * sample fails it.
 */
function propertyFixture(g: Awaited<ReturnType<typeof loadGeos>>): string[] {
  const ring = fc
    .record({
      cx: fc.double({ min: 0, max: 10, noNaN: true }),
      cy: fc.double({ min: 0, max: 10, noNaN: true }),
      radii: fc.array(fc.double({ min: 0.5, max: 4, noNaN: true }), { minLength: 3, maxLength: 8 }),
      twist: fc.double({ min: 0, max: 0.5, noNaN: true }),
      snap: fc.boolean(),
    })
    .map(({ cx, cy, radii, twist, snap }) =>
      radii.map((r, j): PlanarPoint => {
        const a = (2 * Math.PI * j) / radii.length + twist;
        const x = cx + r * Math.cos(a);
        const y = cy + r * Math.sin(a);
        return snap ? [Math.round(x), Math.round(y)] : [x, y];
      }),
    )
    .filter((r) => Math.abs(ringArea(r)) > 1e-3);
  const samples = fc.sample(fc.tuple(fc.array(ring, { minLength: 1, maxLength: 6 }), fc.array(ring, { maxLength: 2 })), {
    seed: 20260601,
    numRuns: 200,
  });
  const ccw = (r: Ring) => (ringArea(r) > 0 ? r : [...r].reverse());
  const libraries: [string, (p: Ring[], n: Ring[]) => number][] = [
    ['clipper2-ts', (p, n) => clipper2(p, n, 0).area],
    ['clipper-lib', (p, n) => clipper1(p, n, 0).area],
    [
      'geos-wasm',
      (p, n) => geosOverlay(g, { positive: p, negative: n.map((points) => ({ points })), minArea: 0 }).reduce((a, f) => a + f.area, 0),
    ],
  ];
  const failed = libraries.map(() => 0);
  for (const [positive, negative] of samples) {
    const land = negative.map(ccw);
    const ref = overlay(positive, land, 0).area;
    libraries.forEach(([, run], k) => {
      let got = Number.NaN;
      try {
        got = run(positive, land);
      } catch {
        // counted as a failed sample
      }
      if (!(Math.abs(got - ref) < 1e-3)) failed[k] += 1;
    });
  }
  return libraries.map(([name], k) => `${name} ${samples.length - failed[k]}/${samples.length}`);
}

export async function overlayLibraryBenchmarks(): Promise<BenchResult[]> {
  const g = await loadGeos();
  const lines: string[] = [];
  let passed2 = 0;
  let passed1 = 0;
  let passedG = 0;
  for (const c of CASES) {
    const r = geosFaces(g, c);
    passedG += r.ok ? 1 : 0;
    if (c.barriers) {
      lines.push(`  ${c.name}: clipper2-ts and clipper-lib: no face splitting by a barrier or marked sides — not passed; ${r.text}`);
      continue;
    }
    const ref = overlay(c.positive, c.negative ?? [], c.minArea ?? 2, c.dissolveShared);
    const a2 = clipper2(c.positive, c.negative ?? [], c.minArea ?? 2);
    const a1 = clipper1(c.positive, c.negative ?? [], c.minArea ?? 2);
    const ok2 = Math.abs(a2.area - ref.area) < 1e-3 && a2.rings === ref.rings;
    const ok1 = Math.abs(a1.area - ref.area) < 1e-3 && a1.rings === ref.rings;
    passed2 += ok2 ? 1 : 0;
    passed1 += ok1 ? 1 : 0;
    lines.push(
      `  ${c.name}: overlay ${ref.area.toFixed(3)} m² in ${ref.rings} ring(s); clipper2-ts ${a2.area.toFixed(3)}/${a2.rings} ${ok2 ? 'same' : 'DIFFERENT'}; clipper-lib ${a1.area.toFixed(3)}/${a1.rings} ${ok1 ? 'same' : 'DIFFERENT'}; ${r.text}`,
    );
  }
  const property = propertyFixture(g);
  const propertyOk = property.map((t) => /(\d+)\/\1$/.test(t));
  passed2 += propertyOk[0] ? 1 : 0;
  passed1 += propertyOk[1] ? 1 : 0;
  passedG += propertyOk[2] ? 1 : 0;
  lines.push(`  random overlays of the property test (200 seeded samples, total area within 1e-3 m²): ${property.join('; ')}`);
  const fixtures = CASES.length + 1;
  const { positive, negative } = coastWorkload();
  const own = await bench('overlay-rings.ts: 10 000-vertex coast, 9 999 quads to sea minus land', () => overlay(positive, negative, 2), {
    runs: 5,
    warmup: 1,
  });
  const c2 = await bench('clipper2-ts: the same union then difference', () => clipper2(positive, negative, 2), { runs: 5, warmup: 1 });
  const c1 = await bench('clipper-lib: the same difference (union by the non-zero rule)', () => clipper1(positive, negative, 2), {
    runs: 5,
    warmup: 1,
  });
  const cG = await bench(
    'geos-wasm: the same union then difference, faces and their land edges read back',
    () => geosRings(g, positive, negative, 2),
    {
      runs: 5,
      warmup: 1,
    },
  );
  const areas = [
    overlay(positive, negative, 2).area,
    clipper2(positive, negative, 2).area,
    clipper1(positive, negative, 2).area,
    geosRings(g, positive, negative, 2).area,
  ];
  // The face path at scale (not part of the rule, which is the union/difference above): the same quads cut by the
  // coastline given as a barrier line reaching past both ends, no land; no marks (see DEVELOPERS.md).
  const coastLine = negative[0].filter((p) => p[0] < 20_000);
  coastLine.sort((p, q) => p[1] - q[1]);
  const cut = {
    positive,
    barriers: [
      {
        points: [
          [coastLine[0][0], coastLine[0][1] - 100],
          ...coastLine,
          [coastLine[coastLine.length - 1][0], coastLine[coastLine.length - 1][1] + 100],
        ] as Ring,
      },
    ],
  };
  const ownCut = await bench('overlay-rings.ts: the same quads cut into faces by the coastline as a barrier', () => overlayRings(cut), {
    runs: 3,
    warmup: 1,
  });
  const geosCut = await bench('geos-wasm: the same cut (union, node, polygonize)', () => geosOverlay(g, cut), { runs: 3, warmup: 1 });
  const faceAreas = (fs: { area: number }[]) =>
    fs
      .map((f) => f.area)
      .sort((a, b) => a - b)
      .map((a) => (a / 1e6).toFixed(4))
      .join(' + ');
  ownCut.note = `faces ${faceAreas(overlayRings(cut).faces)} km²`;
  geosCut.note = `${(geosCut.medianMs / ownCut.medianMs).toFixed(2)}× the overlay; faces ${faceAreas(geosOverlay(g, cut))} km²`;
  own.note = `area ${(areas[0] / 1e6).toFixed(4)} km²`;
  c2.note = `${(c2.medianMs / own.medianMs).toFixed(2)}× the overlay (adopt if ≤ 1.5× and every fixture passes); area ${(areas[1] / 1e6).toFixed(4)} km²; fixtures ${passed2}/${fixtures}`;
  c1.note = `${(c1.medianMs / own.medianMs).toFixed(2)}× the overlay; area ${(areas[2] / 1e6).toFixed(4)} km²; fixtures ${passed1}/${fixtures}`;
  cG.note = `${(cG.medianMs / own.medianMs).toFixed(2)}× the overlay; area ${(areas[3] / 1e6).toFixed(4)} km²; fixtures ${passedG}/${fixtures}`;
  console.log(`\noverlay fixtures against the libraries:\n${lines.join('\n')}`);
  return [own, c2, c1, cG, ownCut, geosCut];
}
