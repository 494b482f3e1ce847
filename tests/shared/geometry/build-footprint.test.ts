// Fixture-driven tests of buildFootprint (style.md habit 2): every `in/<case>.json` is run and
// compared, after rounding coordinates to 1e-6°, with `out/<case>.geojson`.
// `REGEN=1 npx vitest run tests/shared/geometry/build-footprint.test.ts` rewrites the outputs;
// `npx tsx tests/fixtures/geometry/build-footprint/render.ts` draws them for review.
// Expected outputs are (c): produced by this code and checked by eye on the rendered pictures
// and by the geometric assertions below (no land, nothing upcoast, nesting, mirror symmetry).
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { booleanValid, difference, featureCollection, intersect, kinks } from '@turf/turf';
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { describe, expect, it } from 'vitest';
import { type BandProperties, buildFootprint, EQUATOR_WARNING, type Footprint } from '../../../shared/geometry/build-footprint';
import { defaultBandSpecs } from '../../../shared/geometry/default-band-specs';
import { localProjection } from '../../../shared/geometry/local-projection';
import {
  caseLand,
  FOOTPRINT_FIXTURES,
  footprintCaseNames,
  footprintCollection,
  footprintInput,
  polygonPositions,
  readFootprintCase,
  roundNumbers,
} from '../../helpers/footprint-fixture';

const REGEN = process.env.REGEN === '1' || process.env.REGEN === 'true';
const NAMES = footprintCaseNames();
const RESULTS = new Map<string, Footprint>();

function result(name: string): Footprint {
  let fp = RESULTS.get(name);
  if (!fp) {
    fp = buildFootprint(deepFreeze(footprintInput(readFootprintCase(name))));
    RESULTS.set(name, fp);
  }
  return fp;
}

function band(fp: Footprint, id: string): Feature<Polygon | MultiPolygon, BandProperties> {
  const found = fp.bands.find((b) => b.properties.id === id);
  if (!found) throw new Error(`no band ${id}`);
  return found;
}

function isEmpty(f: Feature<Polygon | MultiPolygon>): boolean {
  return f.geometry.coordinates.length === 0;
}

// Areas are measured "after projection": the overlay is done in EPSG:4326, as the database
// will do it, and the result is projected to metres around its own centre and measured with
// the shoelace formula (a geodesic area of a sliver a micrometre wide is all rounding noise).

/** Planar area [m²] of a (Multi)Polygon in EPSG:4326 after projecting it (AEQD on its first vertex). */
function projectedArea(f: Feature<Polygon | MultiPolygon> | null): number {
  if (!f || f.geometry.coordinates.length === 0) return 0;
  const polygons = f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates;
  const first = polygons[0][0][0];
  const projection = localProjection([first[0], first[1]]);
  let total = 0;
  for (const rings of polygons) {
    rings.forEach((ring, i) => {
      // Edges are straight in lon/lat: divide them (≤ 20 m) before projecting.
      const xy: [number, number][] = [];
      for (let k = 0; k + 1 < ring.length; k += 1) {
        const [a, b] = [ring[k], ring[k + 1]];
        const metres = Math.hypot((b[0] - a[0]) * 111_320 * Math.cos((a[1] * Math.PI) / 180), (b[1] - a[1]) * 110_574);
        const pieces = Math.max(1, Math.ceil(metres / 20));
        for (let j = 0; j < pieces; j += 1)
          xy.push(projection.forward([a[0] + ((b[0] - a[0]) * j) / pieces, a[1] + ((b[1] - a[1]) * j) / pieces]));
      }
      xy.push(xy[0]);
      let sum = 0;
      for (let k = 0; k + 1 < xy.length; k += 1) sum += xy[k][0] * xy[k + 1][1] - xy[k + 1][0] * xy[k][1];
      total += (i === 0 ? 1 : -1) * Math.abs(sum / 2);
    });
  }
  return total;
}

/** Area [m²] of a ∩ b (0 when either is empty). */
function overlapArea(a: Feature<Polygon | MultiPolygon>, b: Feature<Polygon | MultiPolygon>): number {
  if (isEmpty(a) || isEmpty(b)) return 0;
  return projectedArea(intersect(featureCollection([a, b])));
}

/** Area [m²] of a − b. */
function outsideArea(a: Feature<Polygon | MultiPolygon>, b: Feature<Polygon | MultiPolygon>): number {
  if (isEmpty(a)) return 0;
  if (isEmpty(b)) return projectedArea(a);
  return projectedArea(difference(featureCollection([a, b])));
}

function deepFreeze<T>(value: T): T {
  if (value && typeof value === 'object') {
    for (const v of Object.values(value)) deepFreeze(v);
    Object.freeze(value);
  }
  return value;
}

describe('buildFootprint fixtures', () => {
  it.each(NAMES)('%s matches its out file', (name) => {
    const c = readFootprintCase(name);
    const actual = footprintCollection(c, result(name));
    const file = path.join(FOOTPRINT_FIXTURES, 'out', `${name}.geojson`);
    if (REGEN) writeFileSync(file, `${JSON.stringify(actual, null, 1)}\n`);
    const expected = roundNumbers(JSON.parse(readFileSync(file, 'utf8')));
    expect(actual).toEqual(expected);
  });

  it.each(NAMES)('%s: valid polygons, never over land or islands', (name) => {
    const fp = result(name);
    const land = caseLand(readFootprintCase(name));
    for (const b of [...fp.bands, ...(fp.bulge ? [fp.bulge] : [])]) {
      if (isEmpty(b)) continue;
      expect(booleanValid(b), `${b.properties.id} valid`).toBe(true);
      expect(kinks(b).features, `${b.properties.id} self-intersections`).toHaveLength(0);
      for (const l of land) expect(overlapArea(b, l), `${b.properties.id} over land`).toBeLessThan(1);
    }
  });

  it.each(NAMES.filter((n) => !n.startsWith('equator')))(
    '%s: nothing upcoast beyond the bulge, nothing beyond reach + bulge radius',
    (name) => {
      const c = readFootprintCase(name);
      const input = footprintInput(c);
      const fp = result(name);
      const projection = localProjection(c.mouth);
      const coastLine = mainCoastLine(c.coast).map((p) => projection.forward(p));
      const arcOf = arcPosition(coastLine);
      const path = fp.path.geometry.coordinates.map((p) => projection.forward(p));
      const mouth = path[0];
      const s0 = arcOf(mouth).arc;
      const sign = Math.sign(arcOf(path[Math.min(5, path.length - 1)]).arc - s0) || 1;
      // Downstream direction at the mouth: along the walked coast.
      const ahead = path[Math.min(3, path.length - 1)];
      const length = Math.hypot(ahead[0] - mouth[0], ahead[1] - mouth[1]);
      const downstream = [(ahead[0] - mouth[0]) / length, (ahead[1] - mouth[1]) / length];
      const radius = input.plume.bulgeOffshoreExtent / 2;
      const reach = input.plume.reach ?? Number.POSITIVE_INFINITY;
      const tolerance = 50;
      for (const b of fp.bands) {
        for (const p of polygonPositions(b.geometry)) {
          const xy = projection.forward(p);
          // Every vertex on the downstream side of the mouth, give or take the bulge radius.
          const along = (xy[0] - mouth[0]) * downstream[0] + (xy[1] - mouth[1]) * downstream[1];
          expect(along, `${b.properties.id} vertex ${p.join(',')}`).toBeGreaterThanOrEqual(-radius - tolerance);
          // Near the coast, measured along it: not upcoast of the bulge, not past reach + bulge radius.
          const near = arcOf(xy);
          if (near.distance > 200) continue;
          const s = (near.arc - s0) * sign;
          // Up-coast only inside the bulge disc (science.md §1.11): in a bay the disc reaches side
          // shores whose arc from the mouth is longer than the radius, so check the disc itself.
          const a = (input.outflowAzimuth * Math.PI) / 180;
          const centre = [mouth[0] + radius * Math.sin(a), mouth[1] + radius * Math.cos(a)];
          if (s < -radius - tolerance) {
            expect(Math.hypot(xy[0] - centre[0], xy[1] - centre[1]), `${b.properties.id} up-coast vertex ${p.join(',')} outside the bulge`).toBeLessThanOrEqual(
              radius + tolerance,
            );
          }
          expect(s).toBeLessThanOrEqual(reach + radius + tolerance);
        }
        expect(b.properties.alongReachM).toBeLessThanOrEqual(reach + 1e-6);
      }
    },
  );

  it.each(NAMES)('%s: salinity bands nest (fresh core ⊆ brackish margin ⊆ plume edge)', (name) => {
    const fp = result(name);
    const fresh = band(fp, 'fresh-core');
    const brackish = band(fp, 'brackish-margin');
    const edge = band(fp, 'plume-edge');
    expect(outsideArea(fresh, brackish)).toBeLessThan(1);
    expect(outsideArea(brackish, edge)).toBeLessThan(1);
    expect(projectedArea(fresh)).toBeGreaterThan(0);
  });
});

describe('buildFootprint geometry rules', () => {
  it('turns right (north) at 41° N and left (south) at 41° S, as mirror images', () => {
    const north = result('straight-coast-north');
    const south = result('straight-coast-south');
    for (const b of north.bands) {
      const positions = polygonPositions(b.geometry);
      // North of the mouth, apart from the bulge's upcoast half (radius 4 km ≈ 0.036°).
      expect(Math.max(...positions.map((p) => p[1]))).toBeGreaterThan(41.037);
      expect(Math.min(...positions.map((p) => p[1]))).toBeGreaterThan(41 - 0.04);
      // West of the coast (the sea).
      expect(Math.max(...positions.map((p) => p[0]))).toBeLessThanOrEqual(-70 + 1e-6);
      const mirrored = positions.map((p) => [p[0], -p[1]]);
      const other = polygonPositions(band(south, b.properties.id).geometry);
      expect(other.length).toBe(mirrored.length);
      for (const p of mirrored) {
        const nearest = Math.min(...other.map((q) => Math.hypot(q[0] - p[0], q[1] - p[1])));
        expect(nearest, `${b.properties.id} mirror of ${p.join(',')}`).toBeLessThan(2e-6);
      }
      // (c) the bulge lobe's rays are taken in the opposite order in the mirror; its vertices agree to 2e-6°, areas to 5e-6.
      expect(Math.abs(projectedArea(band(south, b.properties.id)) / projectedArea(b) - 1)).toBeLessThan(5e-6);
    }
  });

  it('gives the same bands for a land polygon as for the same coast drawn as a line', () => {
    const line = result('straight-coast-north');
    const polygon = result('land-polygon');
    for (const b of line.bands) {
      const other = band(polygon, b.properties.id);
      expect(Math.abs(projectedArea(other) - projectedArea(b)) / projectedArea(b)).toBeLessThan(0.001);
      expect(overlapArea(b, other) / projectedArea(b)).toBeGreaterThan(0.999);
    }
    expect(polygon.mouthSnapDistanceM).toBeCloseTo(line.mouthSnapDistanceM, 3);
  });

  it('stops the bands at the reach of a short flood', () => {
    const c = readFootprintCase('short-reach');
    const reach = footprintInput(c).plume.reach as number;
    const fp = result('short-reach');
    const projection = localProjection(c.mouth);
    for (const b of fp.bands) {
      expect(b.properties.alongReachM).toBeLessThanOrEqual(reach + 1e-6);
      for (const p of polygonPositions(b.geometry)) expect(projection.forward(p)[1]).toBeLessThanOrEqual(reach + 1);
    }
    expect(band(fp, 'plume-edge').properties.alongReachM).toBeCloseTo(reach, 3);
    expect(fp.path.properties.lengthM).toBeCloseTo(reach, 3);
    expect(fp.warnings).toEqual([]);
  });

  it('follows the coast round Gullstone Head', () => {
    const fp = result('headland');
    const edge = band(fp, 'plume-edge');
    // Just off the tip (5.3 km west of the main coast, 9.4 km north of the mouth), and in the lee north of it.
    expect(containsKm(edge, [-5.5, 9.4], 'headland')).toBe(true);
    expect(containsKm(edge, [-3.0, 11.6], 'headland')).toBe(true);
    expect(fp.path.properties.lengthM).toBeGreaterThan(20_000);
  });

  it('follows the bay shore north from a mouth at the head of the bay', () => {
    const fp = result('bay');
    const edge = band(fp, 'plume-edge');
    // The bay's open coast is 10 km west of the mouth; its north shore runs 4–4.5 km north of it.
    expect(containsKm(edge, [-7, 3], 'bay')).toBe(true); // along the north shore of the bay
    expect(containsKm(edge, [-10.5, 10], 'bay')).toBe(true); // out on the open coast, north
    expect(containsKm(edge, [-10.5, -10], 'bay')).toBe(false); // never south (upcoast)
    expect(containsKm(edge, [-7, -3], 'bay')).toBe(false); // nor along the bay's south shore
  });

  it('keeps Skerrow Island out of every band but keeps the channel inside it', () => {
    const fp = result('island');
    const edge = band(fp, 'plume-edge');
    expect(containsKm(edge, [-2.0, 9], 'island')).toBe(false); // island centre
    expect(containsKm(edge, [-0.6, 9], 'island')).toBe(true); // channel between island and coast
  });

  it('falls back to half-discs near the equator, flagged', () => {
    const c = readFootprintCase('equator-2deg');
    const input = footprintInput(c);
    const fp = result('equator-2deg');
    expect(input.plume.turnsTo).toBe('none');
    expect(fp.warnings[0]).toBe(EQUATOR_WARNING);
    expect(fp.bulge).toBeNull();
    const edge = band(fp, 'plume-edge');
    const r = edge.properties.maxOffshoreM;
    expect(r).toBeGreaterThan(0);
    expect(projectedArea(edge)).toBeGreaterThan(0.97 * ((Math.PI * r * r) / 2));
    expect(projectedArea(edge)).toBeLessThan(1.01 * ((Math.PI * r * r) / 2));
    // The coast is the meridian 50° W, east of the mouth as given; the half-discs are centred on it.
    const projection = localProjection(c.mouth);
    const coastX = projection.forward([-50, 2])[0];
    expect(fp.mouthSnapDistanceM).toBeCloseTo(coastX, 0);
    for (const p of polygonPositions(edge.geometry)) {
      const [x, y] = projection.forward(p);
      expect(Math.hypot(x - coastX, y)).toBeLessThan(r + 1);
      expect(x).toBeLessThan(coastX + 0.05); // the meridian bends by millimetres in this projection
    }
  });

  it('default bands: names with thresholds, midway brackish margin', () => {
    expect(defaultBandSpecs({ speciesSalinityThreshold: 12, indicatorStandard: 14 })).toEqual([
      { id: 'fresh-core', name: 'Fresh core (salinity under 12)', threshold: { salinityBelow: 12 } },
      { id: 'brackish-margin', name: 'Brackish margin (salinity under 23)', threshold: { salinityBelow: 23 } },
      {
        id: 'indicator-over-standard',
        name: 'Indicator above the approved-area standard (14 per 100 mL)',
        threshold: { indicatorAbove: 14 },
      },
      { id: 'plume-edge', name: 'Plume edge (any river water, freshwater fraction above 1 %)', threshold: { presenceAbove: 0.01 } },
    ]);
    expect(() => defaultBandSpecs({ speciesSalinityThreshold: 12, indicatorStandard: 0 })).toThrow(RangeError);
  });

  it('rejects bad input with messages that name the argument', () => {
    const input = footprintInput(readFootprintCase('straight-coast-north'));
    expect(() => buildFootprint({ ...input, mouth: [200, 41] })).toThrow(/mouth/);
    expect(() => buildFootprint({ ...input, outflowAzimuth: Number.NaN })).toThrow(/outflowAzimuth/);
    expect(() => buildFootprint({ ...input, options: { alongSteps: 1 } })).toThrow(/alongSteps/);
    expect(() => buildFootprint({ ...input, coast: { type: 'FeatureCollection', features: [] } })).toThrow(/coast/);
    expect(() => buildFootprint({ ...input, bands: [...input.bands, input.bands[0]] })).toThrow(/unique/);
  });

  it('warns when the coast ends before the reach', () => {
    const input = footprintInput(readFootprintCase('straight-coast-north'));
    const fp = buildFootprint({
      ...input,
      coast: {
        type: 'LineString',
        coordinates: [
          [-70, 40.6],
          [-70, 41.1],
        ],
      },
    });
    expect(fp.warnings.some((w) => w.startsWith('The coast ends before the reach'))).toBe(true);
    expect(fp.path.properties.lengthM).toBeLessThan(11_200);
  });

  it('caps vertices when asked, still off the land', () => {
    const c = readFootprintCase('bay');
    const input = footprintInput(c);
    const fp = buildFootprint({ ...input, options: { maxVertices: 60 } });
    const land = caseLand(c);
    for (const b of fp.bands) {
      if (isEmpty(b)) continue;
      for (const l of land) expect(overlapArea(b, l)).toBeLessThan(1);
      expect(booleanValid(b)).toBe(true);
    }
  });
});

/** The shoreline the mouth is on (the first line, or the first polygon's exterior). */
function mainCoastLine(coast: ReturnType<typeof readFootprintCase>['coast']): Position[] {
  const g = coast.type === 'Feature' ? coast.geometry : coast.type === 'FeatureCollection' ? coast.features[0].geometry : coast;
  if (!g) throw new Error('no coast');
  if (g.type === 'LineString') return g.coordinates;
  if (g.type === 'MultiLineString') return g.coordinates[0];
  if (g.type === 'Polygon') return g.coordinates[0];
  if (g.type === 'MultiPolygon') return g.coordinates[0][0];
  throw new Error(`unexpected coast ${g.type}`);
}

/** Arc length along a polyline of the nearest point to p, and the distance to it. */
function arcPosition(line: [number, number][]): (p: [number, number]) => { arc: number; distance: number } {
  return (p) => {
    let best = Number.POSITIVE_INFINITY;
    let bestArc = 0;
    let arc = 0;
    for (let i = 0; i + 1 < line.length; i += 1) {
      const [ax, ay] = line[i];
      const [bx, by] = line[i + 1];
      const dx = bx - ax;
      const dy = by - ay;
      const len = Math.hypot(dx, dy);
      const t = len > 0 ? Math.max(0, Math.min(1, ((p[0] - ax) * dx + (p[1] - ay) * dy) / (len * len))) : 0;
      const d = Math.hypot(p[0] - ax - t * dx, p[1] - ay - t * dy);
      if (d < best) {
        best = d;
        bestArc = arc + t * len;
      }
      arc += len;
    }
    return { arc: bestArc, distance: best };
  };
}

/** True when the point [x km east, y km north] of the case's mouth lies in the band. */
function containsKm(f: Feature<Polygon | MultiPolygon>, km: [number, number], name: string): boolean {
  const c = readFootprintCase(name);
  const projection = localProjection(c.mouth);
  const [lon, lat] = projection.inverse([km[0] * 1000, km[1] * 1000]);
  const tiny: Feature<Polygon> = {
    type: 'Feature',
    properties: {},
    geometry: {
      type: 'Polygon',
      coordinates: [
        [
          [lon - 1e-5, lat - 1e-5],
          [lon + 1e-5, lat - 1e-5],
          [lon + 1e-5, lat + 1e-5],
          [lon - 1e-5, lat + 1e-5],
          [lon - 1e-5, lat - 1e-5],
        ],
      ],
    },
  };
  return overlapArea(f, tiny) > 0.5 * projectedArea(tiny);
}
