import { describe, expect, it } from 'vitest';
import { coastFrame, coastPosition, outlinePositions } from '../../../shared/geometry/coast-position';
import { localProjection } from '../../../shared/geometry/local-projection';

// A north–south coast at 41° S with the sea to the west, mouth facing west (azimuth 270°): in the
// southern hemisphere the current turns left of the outflow (science.md §1.1, a), i.e. south.
const MOUTH: [number, number] = [-38.6, -41];
const P = localProjection(MOUTH);
const PATH = [0, -10_000, -20_000, -60_000].map((y) => P.inverse([0, y]));
const FRAME = coastFrame(PATH, 270, 'left', MOUTH);

describe('coastPosition', () => {
  // Lon/lat round trips of the path leave micrometres: compare to the millimetre.
  it('down-coast (south here) along the walked coast, up-coast (north) in the mouth frame with a negative s', () => {
    // (c) derived: distances from the centre of an azimuthal equidistant projection are geodesic distances
    const south = coastPosition(FRAME, P.inverse([-500, -6000]));
    expect(south.s).toBeCloseTo(6000, 3);
    expect(south.x).toBeCloseTo(500, 3);
    const north = coastPosition(FRAME, P.inverse([-500, 6000]));
    expect(north.s).toBeCloseTo(-6000, 3);
    expect(north.x).toBeCloseTo(500, 3);
    // the arc hint only narrows the search: same answer
    expect(coastPosition(FRAME, P.inverse([-800, -45_000]), { s: 45_000, window: 3000 }).s).toBeCloseTo(45_000, 3);
  });

  it('mirrors in the northern hemisphere: down-coast is north there', () => {
    const mouth: [number, number] = [-38.6, 41];
    const p = localProjection(mouth);
    const frame = coastFrame([0, 10_000, 60_000].map((y) => p.inverse([0, y])), 270, 'right', mouth);
    expect(coastPosition(frame, p.inverse([-500, 6000])).s).toBeCloseTo(6000, 3);
    expect(coastPosition(frame, p.inverse([-500, -6000])).s).toBeCloseTo(-6000, 3);
  });

  it("a polygon's outline every 30 m and its centroid", () => {
    const ring = [
      [-500, -5850],
      [-800, -5850],
      [-800, -6150],
      [-500, -6150],
      [-500, -5850],
    ].map((q) => P.inverse(q as [number, number]));
    const pos = outlinePositions(FRAME, [ring], 30, 5850);
    // 4 sides of 300 m in 10 pieces each, plus the centroid (c)
    expect(pos).toHaveLength(41);
    expect(Math.min(...pos.map((q) => q.x))).toBeCloseTo(500, 3);
    expect(Math.min(...pos.map((q) => q.s))).toBeCloseTo(5850, 3);
    expect(pos[40].s).toBeCloseTo(6000, 3);
    expect(pos[40].x).toBeCloseTo(650, 3);
  });
});
