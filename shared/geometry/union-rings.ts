/**
 * @module shared/geometry/union-rings
 * Union of many overlapping planar rings by cascading: neighbours in the list are merged in
 * small groups, then the groups pairwise, level by level. Each overlay then only meets the
 * overlaps between neighbours, and interior edges disappear early, so heavily overlapping
 * pieces (a band in a bay narrower than itself) stay cheap.
 */

import { type OverlayFn, overlayRings, type PlanarPoint } from './overlay-rings';

/** Pieces merged together at the first level. */
const FIRST_GROUP = 16;

/**
 * Union of rings (non-zero rule), cascaded.
 *
 * @param rings - rings [x, y] in metres (open, any orientation); list neighbours should be map neighbours
 * @param overlay - the overlay implementation; default {@link overlayRings}
 * @returns the union as rings (outer rings anticlockwise, holes clockwise, open) and the number
 *   of outline traces that could not be closed (0 for a sound result)
 * @example
 * unionRings([[[0, 0], [2, 0], [2, 2], [0, 2]], [[1, 0], [3, 0], [3, 2], [1, 2]]]).rings;
 * // => [[[0, 0], [1, 0], [2, 0], [3, 0], [3, 2], …]] (one ring, area 6)
 * Source: (c) common practice: cascaded (divide-and-conquer) union, as in the cascaded
 * polygon union of topology suites; each step is {@link overlayRings}.
 */
export function unionRings(
  rings: readonly (readonly PlanarPoint[])[],
  overlay: OverlayFn = overlayRings,
): { rings: PlanarPoint[][]; brokenRings: number } {
  if (rings.length === 0) return { rings: [], brokenRings: 0 };
  let broken = 0;
  const merge = (group: readonly (readonly PlanarPoint[])[], first: boolean): PlanarPoint[][] => {
    // First level: raw pieces, made anticlockwise, their shared sides cancelled; later levels:
    // faces of earlier merges, taken as they are.
    const result = overlay({ positive: group, minArea: 1e-6, orientPositive: first, dissolveShared: first });
    broken += result.brokenRings;
    return result.faces.flatMap((f) => [f.outer, ...f.holes]);
  };
  let groups: PlanarPoint[][][] = [];
  for (let i = 0; i < rings.length; i += FIRST_GROUP) groups.push(merge(rings.slice(i, i + FIRST_GROUP), true));
  while (groups.length > 1) {
    const next: PlanarPoint[][][] = [];
    for (let i = 0; i < groups.length; i += 2) {
      next.push(i + 1 < groups.length ? merge([...groups[i], ...groups[i + 1]], false) : groups[i]);
    }
    groups = next;
  }
  return { rings: groups[0], brokenRings: broken };
}
