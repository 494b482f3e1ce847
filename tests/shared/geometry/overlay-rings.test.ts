// overlayRings / unionRings: hand-checkable cases (unit squares, holes, barriers), then a
// property test against an independent oracle, the sweep-line clipper of the installed
// geometry package (union of the positive rings minus the negative ones), on small random
// inputs. Expected values are (c): computed by hand from the shoelace formula.
import { booleanValid, difference, featureCollection, polygon, union } from '@turf/turf';
import fc from 'fast-check';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { describe, expect, it } from 'vitest';
import { type OverlayFace, overlayRings, type PlanarPoint, pointInRing, ringArea } from '../../../shared/geometry/overlay-rings';
import { geosErrorSink, geosOverlay } from '../../../bench/geos-overlay-contract';
import { unionRings } from '../../../shared/geometry/union-rings';
import initGeosJs from 'geos-wasm';

const square = (x: number, y: number, s: number): PlanarPoint[] => [
  [x, y],
  [x + s, y],
  [x + s, y + s],
  [x, y + s],
];

const totalArea = (faces: OverlayFace[]) => faces.reduce((sum, f) => sum + f.area, 0);

// The same cases against both implementations of the overlay's contract: the hand-written one (the product's) and
// the GEOS-backed one the overlay bench measures (geos-wasm, GEOS compiled to WebAssembly; not adopted, see
// DEVELOPERS.md 2026-12-02), so the bench compares two implementations that both meet it.
const geos = geosOverlay(await initGeosJs({ errorHandler: geosErrorSink.handler, noticeHandler: () => {} }));
const IMPLEMENTATIONS = [
  { name: 'overlay-rings.ts', overlay: overlayRings, union: (rings: PlanarPoint[][]) => unionRings(rings) },
  { name: 'GEOS', overlay: geos, union: (rings: PlanarPoint[][]) => unionRings(rings, geos) },
];

describe.each(IMPLEMENTATIONS)('$name', (impl) => {
  describe('overlayRings', () => {
    it('unions overlapping squares (area 4 + 4 − 1 = 7), one anticlockwise ring', () => {
      const { faces, brokenRings } = impl.overlay({ positive: [square(0, 0, 2), square(1, 1, 2)] });
      expect(brokenRings).toBe(0);
      expect(faces).toHaveLength(1);
      expect(faces[0].area).toBeCloseTo(7, 12);
      expect(ringArea(faces[0].outer)).toBeGreaterThan(0);
      expect(faces[0].outer).toHaveLength(8);
    });

    it('subtracts a negative ring as a hole (100 − 4 = 96), hole clockwise', () => {
      const { faces } = impl.overlay({ positive: [square(0, 0, 10)], negative: [{ points: square(3, 3, 2) }] });
      expect(faces).toHaveLength(1);
      expect(faces[0].area).toBeCloseTo(96, 12);
      expect(faces[0].holes).toHaveLength(1);
      expect(ringArea(faces[0].holes[0])).toBeCloseTo(-4, 12);
      expect(faces[0].holesOnLine[0].every(Boolean)).toBe(true);
      expect(faces[0].outerOnLine.some(Boolean)).toBe(false);
    });

    it('splits by a barrier and flags the marked side', () => {
      const { faces } = impl.overlay({
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
      });
      expect(faces.map((f) => f.area)).toEqual([8, 8]);
      const marked = faces.filter((f) => f.marked);
      expect(marked).toHaveLength(1);
      expect(pointInRing(marked[0].outer, [1, 2])).toBe(true); // the face left of the northward barrier
    });

    it('keeps one face round a dangling barrier, with no spike, and takes its mark', () => {
      const { faces, brokenRings } = impl.overlay({
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
      });
      expect(brokenRings).toBe(0);
      expect(faces).toHaveLength(1);
      expect(faces[0].area).toBeCloseTo(16, 12);
      expect(faces[0].marked).toBe(true);
      expect(faces[0].outer.some((p) => p[0] === 2 && p[1] === 2)).toBe(false);
    });

    it('separates squares that touch at a corner into two faces', () => {
      const { faces } = impl.overlay({ positive: [square(0, 0, 1), square(1, 1, 1)], minArea: 0 });
      expect(faces.map((f) => f.area)).toEqual([1, 1]);
    });

    it('merges identical and collinear-overlapping rings', () => {
      const { faces } = impl.overlay({ positive: [square(0, 0, 1), square(0, 0, 1), square(0, 0.5, 1)], minArea: 0 });
      expect(faces).toHaveLength(1);
      expect(faces[0].area).toBeCloseTo(1.5, 12);
    });

    it('cancels sides shared by neighbouring pieces (dissolveShared) without changing the result', () => {
      const pieces = [square(0, 0, 1), square(1, 0, 1), square(2, 0, 1), square(0.5, 0.5, 1)];
      const plain = impl.overlay({ positive: pieces, minArea: 0 });
      const dissolved = impl.overlay({ positive: pieces, minArea: 0, dissolveShared: true });
      expect(totalArea(dissolved.faces)).toBeCloseTo(totalArea(plain.faces), 12);
      expect(totalArea(dissolved.faces)).toBeCloseTo(3.5, 12);
      expect(dissolved.faces).toHaveLength(1);
    });

    it('drops faces smaller than minArea', () => {
      expect(impl.overlay({ positive: [square(0, 0, 1)] }).faces).toEqual([]);
      expect(impl.overlay({ positive: [square(0, 0, 1)], minArea: 0.5 }).faces).toHaveLength(1);
      expect(() => impl.overlay({ positive: [], minArea: -1 })).toThrow(RangeError);
    });

    it('matches the sweep-line clipper on random overlays (property)', () => {
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
      fc.assert(
        fc.property(fc.array(ring, { minLength: 1, maxLength: 6 }), fc.array(ring, { maxLength: 2 }), (positive, negative) => {
          const result = impl.overlay({ positive, negative: negative.map((points) => ({ points: ccw(points) })), minArea: 0 });
          expect(result.brokenRings).toBe(0);
          for (const face of result.faces) {
            expect(ringArea(face.outer)).toBeGreaterThan(0);
            for (const hole of face.holes) expect(ringArea(hole)).toBeLessThan(0);
            // (booleanValid, not kinks: kinks reports disjoint collinear edges as crossings.)
            expect(booleanValid(toFeature([face]))).toBe(true);
          }
          const expected = oracleArea(positive, negative);
          if (expected === null) return; // the oracle itself failed on this input
          // Agreement to 1e-3 m²: the overlay merges points within 10 µm and bridges gaps under 1 mm.
          expect(Math.abs(totalArea(result.faces) - expected)).toBeLessThan(1e-3);
        }),
        { seed: 20260601, numRuns: 200 },
      );
    });
  });

  describe('unionRings', () => {
    it('unions neighbours by cascading, as one ring (area 6)', () => {
      const { rings, brokenRings } = impl.union([
        square(0, 0, 2),
        [
          [1, 0],
          [3, 0],
          [3, 2],
          [1, 2],
        ],
      ]);
      expect(brokenRings).toBe(0);
      expect(rings).toHaveLength(1);
      expect(ringArea(rings[0])).toBeCloseTo(6, 12);
    });

    it('unions 1000 overlapping strips along a line into one rectangle', () => {
      const strips: PlanarPoint[][] = [];
      for (let i = 0; i < 1000; i += 1)
        strips.push([
          [i, 0],
          [i + 1.5, 0],
          [i + 1.5, 5],
          [i, 5],
        ]);
      const { rings } = impl.union(strips);
      expect(rings).toHaveLength(1);
      expect(ringArea(rings[0])).toBeCloseTo(1000.5 * 5, 6);
    });

    it('returns nothing for nothing', () => {
      expect(impl.union([])).toEqual({ rings: [], brokenRings: 0 });
    });
  });
});

/** @private Anticlockwise copy of a ring. */
function ccw(ring: PlanarPoint[]): PlanarPoint[] {
  return ringArea(ring) < 0 ? [...ring].reverse() : ring;
}

/** @private Faces as a GeoJSON (Multi)Polygon feature (planar coordinates). */
function toFeature(faces: OverlayFace[]): Feature<Polygon | MultiPolygon> {
  const close = (r: PlanarPoint[]) => [...r, r[0]].map((p) => [p[0], p[1]]);
  return {
    type: 'Feature',
    properties: {},
    geometry: { type: 'MultiPolygon', coordinates: faces.map((f) => [close(f.outer), ...f.holes.map(close)]) },
  };
}

/** @private Area of (∪ positive) − (∪ negative) by the installed sweep-line clipper, or null if it fails. */
function oracleArea(positive: PlanarPoint[][], negative: PlanarPoint[][]): number | null {
  const asPolygon = (r: PlanarPoint[]) => polygon([[...ccw(r), ccw(r)[0]].map((p) => [p[0], p[1]])]);
  try {
    let region: Feature<Polygon | MultiPolygon> | null =
      positive.length === 1 ? asPolygon(positive[0]) : union(featureCollection(positive.map(asPolygon)));
    for (const n of negative) {
      if (!region) break;
      region = difference(featureCollection([region, asPolygon(n)]));
    }
    if (!region) return 0;
    const polygons = region.geometry.type === 'Polygon' ? [region.geometry.coordinates] : region.geometry.coordinates;
    let area = 0;
    for (const rings of polygons) {
      rings.forEach((r, i) => {
        const open = r.slice(0, -1).map((p): PlanarPoint => [p[0], p[1]]);
        area += (i === 0 ? 1 : -1) * Math.abs(ringArea(open));
      });
    }
    return area;
  } catch {
    return null;
  }
}
