import { describe, expect, it } from 'vitest';
import { coastFrame, coastPosition, coastPositionWithin, outlinePositions } from '../../../shared/geometry/coast-position';
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

describe('coastPositionWithin', () => {
  // A bay: the walked coast goes 20 km south, 2 km west and back north, so a point between its arms is near two
  // stretches of the path far apart in arc; which one is nearest depends on the search window.
  const BAY = [
    [0, 0],
    [0, -20_000],
    [-2000, -20_000],
    [-2000, -1000],
  ].map((q) => P.inverse(q as [number, number]));
  const bay = coastFrame(BAY, 270, 'left', MOUTH);
  const pointAt = (q: [number, number]) => bay.projection.forward(P.inverse(q));

  it('gives what coastPosition gives with every window between its bounds when they agree on the nearest segment', () => {
    // (c) derived: the answer is coastPositionOf's own search with the exact window, so compare with that function.
    const p = pointAt([-700, -3000]);
    const at = coastPositionWithin(bay, p, 3000, 3000, 2000, 2600);
    expect(at).not.toBeNull();
    for (const w of [2000, 2200, 2600]) expect(coastPosition(bay, P.inverse([-700, -3000]), { s: 3000, window: w })).toEqual(at);
  });

  it('is null when the window bounds let different stretches of the path win', () => {
    // 1.3 km from the east arm (arc 3 km) and 0.7 km from the west arm (arc ≈ 41 km): only a window reaching the
    // west arm finds it. The bounds below straddle that.
    const p = pointAt([-1300, -3000]);
    const narrow = coastPosition(bay, P.inverse([-1300, -3000]), { s: 3000, window: 2000 });
    const wide = coastPosition(bay, P.inverse([-1300, -3000]), { s: 3000, window: 40_000 });
    expect(narrow.x).toBeCloseTo(1300, 3);
    expect(wide.x).toBeCloseTo(700, 3);
    expect(coastPositionWithin(bay, p, 3000, 3000, 2000, 40_000)).toBeNull();
    expect(coastPositionWithin(bay, p, 3000, 3000, 39_000, 40_000)).toEqual(wide);
  });
});
