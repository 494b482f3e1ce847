// offsetStrip: quads, fans at convex bends, mitres at concave bends, bow-tie split beyond a
// bay's centre of curvature. Expected values (c) by hand (rectangles, sectors, circles).
import { describe, expect, it } from 'vitest';
import { offsetStrip } from '../../../shared/geometry/offset-strip';
import { type PlanarPoint, ringArea } from '../../../shared/geometry/overlay-rings';
import { unionRings } from '../../../shared/geometry/union-rings';

const area = (rings: PlanarPoint[][]) => unionRings(rings).rings.reduce((s, r) => s + ringArea(r), 0);

describe('offsetStrip', () => {
  it('makes one quad per segment, sea on the left of a northward path = west', () => {
    expect(
      offsetStrip({
        points: [
          [0, 0],
          [0, 10],
        ],
        widthStart: [4],
        widthEnd: [2],
        seaSide: 1,
        landward: 1,
        arcTolerance: 0.1,
      }),
    ).toEqual([
      [
        [1, 0],
        [1, 10],
        [-2, 10],
        [-4, 0],
      ],
    ]);
  });

  it('adds a quarter-disc fan outside a convex right-angle bend (area 10·3 + 10·3 + π·3²/4 + landward)', () => {
    // North then east, sea on the left (north-west side): the bend is convex to the sea.
    const rings = offsetStrip({
      points: [
        [0, 0],
        [0, 10],
        [10, 10],
      ],
      widthStart: [3, 3],
      widthEnd: [3, 3],
      seaSide: 1,
      landward: 0,
      arcTolerance: 1e-4,
    });
    expect(area(rings)).toBeCloseTo(60 + (Math.PI * 9) / 4, 2);
  });

  it('mitres a concave right-angle bend: two 10 × 3 strips overlapping in a 3 × 3 square', () => {
    // North then west, sea on the left (inside the bend).
    const rings = offsetStrip({
      points: [
        [0, 0],
        [0, 10],
        [-10, 10],
      ],
      widthStart: [3, 3],
      widthEnd: [3, 3],
      seaSide: 1,
      landward: 0,
      arcTolerance: 1e-3,
    });
    expect(area(rings)).toBeCloseTo(60 - 9, 6);
  });

  it('fills a semicircular bay twice as wide as its radius as one disc (no sawtooth)', () => {
    const points: PlanarPoint[] = [];
    for (let k = 0; k <= 180; k += 1) {
      const a = -Math.PI / 2 + (Math.PI * k) / 180;
      points.push([1000 * Math.cos(a), 1000 * Math.sin(a)]);
    }
    const widths = new Array(180).fill(2000);
    const rings = offsetStrip({ points, widthStart: widths, widthEnd: widths, seaSide: 1, landward: 0, arcTolerance: 0.1 });
    const union = unionRings(rings).rings;
    expect(union).toHaveLength(1);
    // The bay's half-disc plus its mirror image beyond the centre: a disc of radius 1000 m
    // (less two 0.5° slivers at the ends of the diameter, where the end normals tilt: −0.3 %).
    const ratio = ringArea(union[0]) / (Math.PI * 1000 ** 2);
    expect(ratio).toBeGreaterThan(0.995);
    expect(ratio).toBeLessThan(1.0001);
  });

  it('leaves out segments with zero width and rejects bad arguments', () => {
    expect(
      offsetStrip({
        points: [
          [0, 0],
          [0, 10],
        ],
        widthStart: [0],
        widthEnd: [0],
        seaSide: 1,
        landward: 1,
        arcTolerance: 1,
      }),
    ).toEqual([]);
    expect(() =>
      offsetStrip({
        points: [
          [0, 0],
          [0, 10],
        ],
        widthStart: [-1],
        widthEnd: [0],
        seaSide: 1,
        landward: 1,
        arcTolerance: 1,
      }),
    ).toThrow(RangeError);
    expect(() =>
      offsetStrip({
        points: [
          [0, 0],
          [0, 10],
        ],
        widthStart: [1],
        widthEnd: [1],
        seaSide: 1,
        landward: 1,
        arcTolerance: 0,
      }),
    ).toThrow(RangeError);
  });
});
