/**
 * Issue "Jurisdiction-scale speed": the hand-written overlay (shared/geometry/overlay-rings.ts) against a
 * maintained clipping library from the npm registry (clipper2-ts, a TypeScript port of Clipper2; clipper-lib,
 * the JavaScript port of Clipper 1), on
 *  - the overlay fixtures of tests/shared/geometry/overlay-rings.test.ts that a boolean-operation library can
 *    express (union, difference, minArea), compared by area; the fixtures with barriers and marks (the faces the
 *    footprint needs: the sea cut by the shoreline, the side beside the walked coast flagged) have no counterpart
 *    in a union/difference API and are counted as not passed;
 *  - the footprint's workload on the 10 000-vertex coast of bench/screening-bench.ts: one quad per coast segment
 *    reaching 2 km out to sea (thousands of heavily overlapping rings), minus the land.
 * The adoption rule: every fixture passed and no slower than 1.5× on the coast.
 */
import ClipperLib from 'clipper-lib';
import { Clipper, ClipType, FillRule, type PathsD } from 'clipper2-ts';
import { overlayRings, type PlanarPoint, ringArea } from '../shared/geometry/overlay-rings';
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
  /** Needs barriers or marks: not expressible as union/difference. */
  needsFaces?: boolean;
}

const CASES: Case[] = [
  { name: 'overlapping squares unioned (area 7)', positive: [square(0, 0, 2), square(1, 1, 2)] },
  { name: 'negative ring as a hole (area 96)', positive: [square(0, 0, 10)], negative: [square(3, 3, 2)] },
  { name: 'squares touching at a corner (two faces)', positive: [square(0, 0, 1), square(1, 1, 1)], minArea: 0 },
  { name: 'identical and collinear-overlapping rings', positive: [square(0, 0, 2), square(0, 0, 2), square(0, 0, 1)] },
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
  { name: 'barrier splits the region and flags the marked side', positive: [square(0, 0, 4)], needsFaces: true },
  { name: 'dangling barrier keeps one face and takes its mark', positive: [square(0, 0, 4)], needsFaces: true },
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

function overlay(positive: Ring[], negative: Ring[], minArea: number) {
  const r = overlayRings({ positive, negative: negative.map((points) => ({ points })), minArea });
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

export async function overlayLibraryBenchmarks(): Promise<BenchResult[]> {
  const lines: string[] = [];
  let passed2 = 0;
  let passed1 = 0;
  for (const c of CASES) {
    if (c.needsFaces) {
      lines.push(`  ${c.name}: overlay ok; clipper2-ts and clipper-lib: no face splitting by a barrier or marked sides — not passed`);
      continue;
    }
    const ref = overlay(c.positive, c.negative ?? [], c.minArea ?? 2);
    const a2 = clipper2(c.positive, c.negative ?? [], c.minArea ?? 2);
    const a1 = clipper1(c.positive, c.negative ?? [], c.minArea ?? 2);
    const ok2 = Math.abs(a2.area - ref.area) < 1e-3 && a2.rings === ref.rings;
    const ok1 = Math.abs(a1.area - ref.area) < 1e-3 && a1.rings === ref.rings;
    passed2 += ok2 ? 1 : 0;
    passed1 += ok1 ? 1 : 0;
    lines.push(
      `  ${c.name}: overlay ${ref.area.toFixed(3)} m² in ${ref.rings} ring(s); clipper2-ts ${a2.area.toFixed(3)}/${a2.rings} ${ok2 ? 'same' : 'DIFFERENT'}; clipper-lib ${a1.area.toFixed(3)}/${a1.rings} ${ok1 ? 'same' : 'DIFFERENT'}`,
    );
  }
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
  const areas = [overlay(positive, negative, 2).area, clipper2(positive, negative, 2).area, clipper1(positive, negative, 2).area];
  own.note = `area ${(areas[0] / 1e6).toFixed(4)} km²`;
  c2.note = `${(c2.medianMs / own.medianMs).toFixed(2)}× the overlay (adopt if ≤ 1.5× and every fixture passes); area ${(areas[1] / 1e6).toFixed(4)} km²; fixtures ${passed2}/${CASES.length}`;
  c1.note = `${(c1.medianMs / own.medianMs).toFixed(2)}× the overlay; area ${(areas[2] / 1e6).toFixed(4)} km²; fixtures ${passed1}/${CASES.length}`;
  console.log(`\noverlay fixtures against the libraries:\n${lines.join('\n')}`);
  return [own, c2, c1];
}
