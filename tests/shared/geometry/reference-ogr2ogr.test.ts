/**
 * Reference checks against GDAL: shapefiles written by ogr2ogr (GDAL 3.6.2, released 2023/01/02 — the
 * version recorded in tests/fixtures/uploads/reference/ogr2ogr-version.txt by make-reference.sh; PROJ
 * 9.1.1 chose "Inverse of RGF93 v1 to WGS 84 (1) + Lambert-93", "Inverse of NZGD2000 to WGS 84 (1) +
 * New Zealand Transverse Mercator 2000", "UTM zone 30N" and "UTM zone 59S", all null datum shifts) are
 * read with readUpload and reprojected back to EPSG:4326 with reprojectLayer. Every vertex must land
 * within 1e-6° of source.geojson / source-south.geojson, and every polygon's ellipsoidal area within
 * 0.1 % of the area of the source polygon (geographiclib-geodesic on WGS 84). ogr2ogr writes outer
 * rings clockwise (the shapefile rule), so rings are compared allowing reversal and a rotated start.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { Feature, FeatureCollection, MultiPolygon, Polygon, Position } from 'geojson';
import { describe, expect, it } from 'vitest';
import { ellipsoidalArea } from '../../../shared/geometry/polygon-area';
import { runUploadPipeline } from './run-upload-pipeline';

const dir = path.resolve(import.meta.dirname, '../../fixtures/uploads/reference');
const gdalVersion = readFileSync(path.join(dir, 'ogr2ogr-version.txt'), 'utf8').trim();
const source = (name: string): FeatureCollection<Polygon | MultiPolygon> => JSON.parse(readFileSync(path.join(dir, name), 'utf8'));

const CASES = [
  { zip: 'utm30n.zip', epsg: 32630, source: 'source.geojson', crs: 'WGS 84 / UTM zone 30N' },
  { zip: 'lambert93.zip', epsg: 2154, source: 'source.geojson', crs: 'RGF93 v1 / Lambert-93 (Lambert conformal conic)' },
  { zip: 'utm59s.zip', epsg: 32759, source: 'source-south.geojson', crs: 'WGS 84 / UTM zone 59S' },
  { zip: 'nztm2000.zip', epsg: 2193, source: 'source-south.geojson', crs: 'NZGD2000 / New Zealand Transverse Mercator 2000' },
];

/** Rings of a Polygon or MultiPolygon, grouped per polygon. */
const polygonsOf = (g: Polygon | MultiPolygon): Position[][][] => (g.type === 'Polygon' ? [g.coordinates] : g.coordinates);

/** Largest distance (degrees, per axis) between two closed rings, over the best rotation and direction of `b`. */
function ringDistance(a: Position[], b: Position[]): number {
  const ra = a.slice(0, -1);
  const rb = b.slice(0, -1);
  if (ra.length !== rb.length) return Number.POSITIVE_INFINITY;
  let best = Number.POSITIVE_INFINITY;
  for (const candidate of [rb, [...rb].reverse()]) {
    for (let shift = 0; shift < candidate.length; shift++) {
      let worst = 0;
      for (let i = 0; i < ra.length; i++) {
        const q = candidate[(i + shift) % candidate.length];
        worst = Math.max(worst, Math.abs(ra[i][0] - q[0]), Math.abs(ra[i][1] - q[1]));
      }
      best = Math.min(best, worst);
    }
  }
  return best;
}

describe.each(CASES)('shapefile written by GDAL ogr2ogr from $source, EPSG:$epsg ($crs)', ({ zip, epsg, source: sourceFile }) => {
  it(`reads, identifies EPSG:${epsg} and reprojects every vertex to within 1e-6° of ${sourceFile} (${gdalVersion})`, async () => {
    const bytes = new Uint8Array(readFileSync(path.join(dir, zip)));
    const result = await runUploadPipeline(bytes, zip, 'lease');
    expect(result.error).toBeUndefined();
    const layer = result.parsed!.layers[0];
    expect(layer.crs.found).toBe(true);
    // Reference: the EPSG code passed to ogr2ogr -t_srs in make-reference.sh (the .prj itself is ESRI WKT without AUTHORITY).
    expect(layer.crs.epsg).toBe(epsg);
    const reprojected = result.reprojected[0] as Feature<Polygon | MultiPolygon>[];
    const expected = source(sourceFile).features;
    expect(reprojected).toHaveLength(expected.length);
    for (const want of expected) {
      const got = reprojected.find((f) => f.properties?.LEASE_ID === want.properties?.LEASE_ID);
      expect(got, `lease ${want.properties?.LEASE_ID}`).toBeDefined();
      const wantPolys = polygonsOf(want.geometry);
      const gotPolys = polygonsOf(got!.geometry);
      expect(gotPolys).toHaveLength(wantPolys.length);
      for (const wantRings of wantPolys) {
        // Each source polygon matches one read polygon ring-for-ring (outer with outer, hole with hole).
        const match = gotPolys.find((rings) => rings.length === wantRings.length && ringDistance(wantRings[0], rings[0]) < 1e-6);
        expect(match, `outer ring of ${want.properties?.LEASE_ID}`).toBeDefined();
        for (const hole of wantRings.slice(1)) {
          const d = Math.min(...match!.slice(1).map((r) => ringDistance(hole, r)));
          expect(d).toBeLessThan(1e-6);
        }
      }
    }
  });

  it(`keeps every polygon's WGS 84 ellipsoidal area within 0.1 % of ${sourceFile}'s (geographiclib-geodesic)`, async () => {
    const bytes = new Uint8Array(readFileSync(path.join(dir, zip)));
    const result = await runUploadPipeline(bytes, zip, 'lease');
    const reprojected = result.reprojected[0] as Feature<Polygon | MultiPolygon>[];
    for (const want of source(sourceFile).features) {
      const got = reprojected.find((f) => f.properties?.LEASE_ID === want.properties?.LEASE_ID)!;
      const a = ellipsoidalArea(want.geometry);
      const b = ellipsoidalArea(got.geometry);
      expect(a).toBeGreaterThan(10_000); // sanity: the invented leases are 1–20 ha
      expect(Math.abs(b - a) / a).toBeLessThan(1e-3);
    }
  });

  it('keeps the attributes ogr2ogr wrote (UTF-8 .cpg)', async () => {
    const bytes = new Uint8Array(readFileSync(path.join(dir, zip)));
    const result = await runUploadPipeline(bytes, zip, 'lease');
    const layer = result.parsed!.layers[0];
    expect(layer.encoding).toBe('utf-8');
    expect(layer.fields).toEqual(['LEASE_ID', 'HOLDER', 'SPECIES', 'STATUS']);
    const names = layer.features.map((f) => f.properties?.HOLDER).sort();
    expect(names).toEqual(
      source(sourceFile)
        .features.map((f) => f.properties?.HOLDER)
        .sort(),
    );
  });
});
