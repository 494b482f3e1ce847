/**
 * Fixtures of shared/geometry/build-footprint: reading `in/<case>.json`, turning it into a
 * buildFootprint input, and writing the coloured, rounded `out/<case>.geojson` collection
 * (style.md habit 2). Used by the test, the render script and the bench.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { Feature, FeatureCollection, Geometry, Polygon, Position } from 'geojson';
import { type FootprintInput, type Footprint, buildFootprint } from '../../shared/geometry/build-footprint';
import { defaultBandSpecs } from '../../shared/geometry/default-band-specs';
import type { CoastGeoJson } from '../../shared/geometry/prepare-coast';
import { computePlume, type PlumeInput } from '../../shared/physics/compute-plume';
import { exposureParameters, type RiverExposureSettings } from '../../shared/physics/exposure-field';

export const FOOTPRINT_FIXTURES = path.resolve(import.meta.dirname, '../fixtures/geometry/build-footprint');

/** The JSON stored in `in/<case>.json`. */
export interface FootprintCase {
  readonly description: string;
  readonly coast: CoastGeoJson;
  readonly mouth: [number, number];
  readonly outflowAzimuth: number;
  /** computePlume input without the latitude (taken from the mouth). */
  readonly river: Omit<PlumeInput, 'latitude'>;
  readonly exposure: RiverExposureSettings & { readonly seaSalinity: number; readonly riverSalinity: number };
  readonly bandOptions: { readonly speciesSalinityThreshold: number; readonly indicatorStandard: number };
  readonly options?: FootprintInput['options'];
}

/** Names of the fixture cases (files in `in/`), sorted. */
export function footprintCaseNames(): string[] {
  return readdirSync(path.join(FOOTPRINT_FIXTURES, 'in'))
    .filter((f) => f.endsWith('.json'))
    .map((f) => f.replace(/\.json$/, ''))
    .sort();
}

/** Reads one case. */
export function readFootprintCase(name: string): FootprintCase {
  return JSON.parse(readFileSync(path.join(FOOTPRINT_FIXTURES, 'in', `${name}.json`), 'utf8')) as FootprintCase;
}

/** The buildFootprint input of a case (plume from computePlume at the mouth's latitude). */
export function footprintInput(c: FootprintCase): FootprintInput {
  const plume = computePlume({ ...c.river, latitude: c.mouth[1] });
  const { seaSalinity, riverSalinity, ...settings } = c.exposure;
  const params = exposureParameters(settings, { seaSalinity, riverSalinity }, c.river.discharge);
  return {
    coast: c.coast,
    mouth: c.mouth,
    outflowAzimuth: c.outflowAzimuth,
    plume,
    params,
    bands: defaultBandSpecs(c.bandOptions),
    ...(c.options ? { options: c.options } : {}),
  };
}

/** Runs a case. */
export function runFootprintCase(name: string): { input: FootprintInput; footprint: Footprint } {
  const input = footprintInput(readFootprintCase(name));
  return { input, footprint: buildFootprint(input) };
}

/** Map colours (simplestyle properties): one colour-blind-safe blue scale for salinity/presence, orange for the indicator. */
export const FOOTPRINT_STYLE: Record<string, Record<string, string | number>> = {
  coast: { stroke: '#555555', 'stroke-width': 2, fill: '#bdbdbd', 'fill-opacity': 1 },
  mouth: { 'marker-color': '#000000' },
  path: { stroke: '#000000', 'stroke-width': 3 },
  bulge: { stroke: '#6a51a3', 'stroke-width': 2, fill: '#6a51a3', 'fill-opacity': 0 },
  'plume-edge': { stroke: '#6baed6', 'stroke-width': 1, fill: '#deebf7', 'fill-opacity': 0.9 },
  'brackish-margin': { stroke: '#2171b5', 'stroke-width': 1, fill: '#9ecae1', 'fill-opacity': 0.9 },
  'fresh-core': { stroke: '#08306b', 'stroke-width': 1, fill: '#2171b5', 'fill-opacity': 0.9 },
  'indicator-over-standard': { stroke: '#d94801', 'stroke-width': 2, fill: '#fd8d3c', 'fill-opacity': 0.12 },
};

/** The expected-output collection of a case: inputs and results, coloured, coordinates rounded to 1e-6. */
export function footprintCollection(c: FootprintCase, footprint: Footprint): FeatureCollection {
  const features: Feature[] = [];
  features.push({ type: 'Feature', properties: { role: 'coast', ...FOOTPRINT_STYLE.coast }, geometry: coastGeometry(c.coast) });
  features.push({
    type: 'Feature',
    properties: { role: 'mouth', ...FOOTPRINT_STYLE.mouth },
    geometry: { type: 'Point', coordinates: c.mouth },
  });
  for (const band of footprint.bands) {
    features.push({ ...band, properties: { role: 'band', ...band.properties, ...FOOTPRINT_STYLE[band.properties.id] } });
  }
  if (footprint.bulge)
    features.push({ ...footprint.bulge, properties: { role: 'bulge', ...footprint.bulge.properties, ...FOOTPRINT_STYLE.bulge } });
  features.push({
    ...footprint.path,
    properties: {
      role: 'path',
      ...footprint.path.properties,
      warnings: footprint.warnings,
      mouthSnapDistanceM: footprint.mouthSnapDistanceM,
      ...FOOTPRINT_STYLE.path,
    },
  });
  return roundNumbers({ type: 'FeatureCollection', features }) as FeatureCollection;
}

/** @private The coast as one geometry. */
function coastGeometry(coast: CoastGeoJson): Geometry {
  if (coast.type === 'FeatureCollection') {
    return { type: 'GeometryCollection', geometries: coast.features.map((f) => f.geometry).filter((g): g is Geometry => g !== null) };
  }
  if (coast.type === 'Feature') return coast.geometry as Geometry;
  return coast;
}

/** Rounds coordinates to 1e-6 and other numbers to 1e-3 (stable across platforms). */
export function roundNumbers(value: unknown, key = ''): unknown {
  if (typeof value === 'number') {
    const scale = key === 'coordinates' || key === 'centre' ? 1e6 : 1e3;
    const r = Math.round(value * scale) / scale;
    return Object.is(r, -0) ? 0 : r;
  }
  if (Array.isArray(value)) return value.map((v) => roundNumbers(v, key));
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.entries(value).map(([k, v]) => [k, roundNumbers(v, k === 'coordinates' || key === 'coordinates' ? 'coordinates' : k)]),
    );
  }
  return value;
}

/** All positions of a (Multi)Polygon. */
export function polygonPositions(geometry: Geometry): Position[] {
  if (geometry.type === 'Polygon') return geometry.coordinates.flat();
  if (geometry.type === 'MultiPolygon') return geometry.coordinates.flat(2);
  return [];
}

/**
 * Land polygons of a case in EPSG:4326 for the "never over land" checks: land polygons as
 * given; a closed shoreline ring as an island; an open shoreline closed on its land side
 * (away from the outflow) by two far corners half a degree away.
 */
export function caseLand(c: FootprintCase): Feature<Polygon>[] {
  const out: Feature<Polygon>[] = [];
  const seaward = [Math.sin((c.outflowAzimuth * Math.PI) / 180), Math.cos((c.outflowAzimuth * Math.PI) / 180)];
  const add = (g: Geometry) => {
    if (g.type === 'Polygon') out.push({ type: 'Feature', properties: {}, geometry: g });
    else if (g.type === 'MultiPolygon')
      for (const p of g.coordinates) out.push({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: p } });
    else if (g.type === 'LineString' || g.type === 'MultiLineString') {
      for (const line of g.type === 'LineString' ? [g.coordinates] : g.coordinates) {
        const first = line[0];
        const last = line[line.length - 1];
        if (line.length > 3 && first[0] === last[0] && first[1] === last[1]) {
          out.push({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [line] } });
          continue;
        }
        const ux = last[0] - first[0];
        const uy = last[1] - first[1];
        const len = Math.hypot(ux, uy);
        const [dx, dy] = [ux / len, uy / len];
        const seaLeft = dx * seaward[1] - dy * seaward[0] > 0;
        const [nx, ny] = seaLeft ? [dy, -dx] : [-dy, dx];
        const far = 0.5;
        const start = [first[0] - dx * far, first[1] - dy * far];
        const end = [last[0] + dx * far, last[1] + dy * far];
        let ring = [start, ...line, end, [end[0] + nx * far, end[1] + ny * far], [start[0] + nx * far, start[1] + ny * far], start];
        // Anticlockwise exterior (RFC 7946).
        let sum = 0;
        for (let i = 0; i + 1 < ring.length; i += 1) sum += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
        if (sum < 0) ring = ring.reverse();
        out.push({ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [ring] } });
      }
    } else if (g.type === 'GeometryCollection') for (const h of g.geometries) add(h);
  };
  const coast = c.coast;
  if (coast.type === 'FeatureCollection') for (const f of coast.features) add(f.geometry);
  else if (coast.type === 'Feature') add(coast.geometry as Geometry);
  else add(coast);
  return out;
}
