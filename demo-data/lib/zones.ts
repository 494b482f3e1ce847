/**
 * @module demo-data/lib/zones
 * The two conditionally approved areas (closure zones) of the demo region, cut out of simple
 * boxes by the land so that they follow the shoreline.
 */
import { difference, featureCollection, polygon, multiPolygon } from '@turf/turf';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { km, type Xy } from './local-frame';
import { closeRing } from './planar';

/** A closure zone's attributes (the GeoJSON property names). */
export interface ZoneSpec {
  ZONE_NAME: string;
  RIVER: 'Amberlin River' | 'Tolley Brook';
  /** Box [minX, minY, maxX, maxY] in km from which the land is removed. */
  box: [number, number, number, number];
  CLOSURE_DAYS: number;
}

/** The zones; their trigger flows are set from the generated flow records (see rivers.ts). */
export const ZONE_TABLE: readonly ZoneSpec[] = [
  // Fennick Bay inside a line 1.25 km west of the coast's general line: the growing area
  // 10–22 km north of (down-coast of) the Amberlin mouth.
  { ZONE_NAME: 'Fennick Bay inner zone', RIVER: 'Amberlin River', box: [-1.25, 10.2, 4, 21.5], CLOSURE_DAYS: 5 },
  // A 2.5-km strip of sea along the Tolley shore, from 5 to 11 km north of (down-coast of) the brook's mouth.
  { ZONE_NAME: 'Tolley shore zone', RIVER: 'Tolley Brook', box: [-2.5, -25, 1, -19], CLOSURE_DAYS: 3 },
];

/**
 * Builds each zone's outline in the local frame: its box minus the land.
 * @param landRings - the land polygon rings (local frame, not closed)
 * @returns one exterior ring per zone (counter-clockwise, closed), in table order
 */
export function buildZones(landRings: Xy[][]): { spec: ZoneSpec; ring: Xy[] }[] {
  const land = multiPolygon(landRings.map((r) => [closeRing(r)]));
  return ZONE_TABLE.map((spec) => {
    const [x0, y0, x1, y1] = spec.box;
    const box = polygon([[km(x0, y0), km(x1, y0), km(x1, y1), km(x0, y1), km(x0, y0)]]);
    const cut = difference(featureCollection<Polygon | MultiPolygon>([box, land])) as Feature<Polygon | MultiPolygon> | null;
    if (!cut) throw new Error(`zone ${spec.ZONE_NAME} is all land`);
    if (cut.geometry.type !== 'Polygon' || cut.geometry.coordinates.length !== 1) {
      throw new Error(`zone ${spec.ZONE_NAME} should be one polygon without holes (got ${cut.geometry.type})`);
    }
    return { spec, ring: cut.geometry.coordinates[0].map((p) => [Math.round(p[0] * 100) / 100, Math.round(p[1] * 100) / 100] as Xy) };
  });
}
