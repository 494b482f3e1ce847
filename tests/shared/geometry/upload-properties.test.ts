/**
 * Property tests (fast-check, fixed seeds so a run is repeatable): round trips and invariants of the
 * upload pipeline that must hold for any input, not only the corpus.
 */
import * as fc from 'fast-check';
import type { Feature, Polygon } from 'geojson';
import proj4 from 'proj4';
import { zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { ellipsoidalArea } from '../../../shared/geometry/polygon-area';
import { readUpload } from '../../../shared/geometry/read-upload';
import { reprojectLayer } from '../../../shared/geometry/reproject';
import { inflateEntries, listZipEntries } from '../../../shared/geometry/unzip-entries';
import { isUploadError } from '../../../shared/geometry/upload-error';
import { formatCount } from '../../../shared/geometry/upload-limits';

const SEED = 20241202;
const enc = (s: string) => new TextEncoder().encode(s);

const rectangle = fc
  .record({
    lon: fc.double({ min: -179, max: 178, noNaN: true }),
    lat: fc.double({ min: -89, max: 88, noNaN: true }),
    w: fc.double({ min: 1e-5, max: 1, noNaN: true }),
    h: fc.double({ min: 1e-5, max: 1, noNaN: true }),
  })
  .map(
    ({ lon, lat, w, h }): Polygon => ({
      type: 'Polygon',
      coordinates: [
        [
          [lon, lat],
          [lon + w, lat],
          [lon + w, lat + h],
          [lon, lat + h],
          [lon, lat],
        ],
      ],
    }),
  );

describe('upload properties', () => {
  it('reads any FeatureCollection of polygons back unchanged (geometry and properties)', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.array(
          fc.tuple(
            rectangle,
            fc.dictionary(fc.string({ minLength: 1, maxLength: 8 }), fc.oneof(fc.string(), fc.integer(), fc.boolean(), fc.constant(null))),
          ),
          { minLength: 1, maxLength: 20 },
        ),
        async (items) => {
          const features = items.map(([geometry, properties]) => ({ type: 'Feature', properties, geometry }));
          const parsed = await readUpload(enc(JSON.stringify({ type: 'FeatureCollection', features })), 'p.geojson', 'lease');
          const back = parsed.layers[0].features;
          // Compared with the input after a JSON round trip (JSON has no -0: RFC 8259 §6 numbers).
          const sent = JSON.parse(JSON.stringify(features));
          expect(back.map((f) => f.geometry)).toEqual(sent.map((f: Feature) => f.geometry));
          expect(back.map((f) => f.properties)).toEqual(sent.map((f: Feature) => f.properties));
        },
      ),
      { seed: SEED, numRuns: 60 },
    );
  });

  it('reports the same JSON error position as the engine whenever the engine gives one (RFC 8259 grammar)', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.json(),
        fc.nat(),
        fc.constantFrom('delete', 'insert'),
        fc.constantFrom(',', '}', ']', '"', ':', 'x', '0', '-', '\\'),
        async (json, at, op, ch) => {
          const i = json.length === 0 ? 0 : at % json.length;
          const text = op === 'delete' ? json.slice(0, i) + json.slice(i + 1) : json.slice(0, i) + ch + json.slice(i);
          let engine: number | undefined;
          try {
            JSON.parse(text);
            return; // still valid JSON
          } catch (e) {
            const m = /position (\d+)/.exec((e as Error).message);
            engine = m ? Number(m[1]) : undefined;
          }
          try {
            await readUpload(enc(text), 'p.geojson', 'lease');
          } catch (e) {
            if (!isUploadError(e)) throw e;
            if (e.code !== 'invalid_json') return; // e.g. text that is empty or not JSON-looking at all
            const position = (e.details as { position?: number }).position;
            expect(position).toBeDefined();
            if (engine !== undefined) expect(position).toBe(engine);
          }
        },
      ),
      { seed: SEED, numRuns: 300 },
    );
  });

  it('unzips any set of files to the same bytes (fflate zipSync as the writer)', () => {
    fc.assert(
      fc.property(
        fc.dictionary(fc.stringMatching(/^[a-z]{1,8}\.(shp|dbf|prj|txt)$/), fc.uint8Array({ maxLength: 2000 }), { minKeys: 1, maxKeys: 6 }),
        fc.integer({ min: 0, max: 9 }),
        (files, level) => {
          const zip = zipSync(Object.fromEntries(Object.entries(files).map(([k, v]) => [k, [v, { level: level as 0 }]])));
          const out = inflateEntries(zip, listZipEntries(zip), { maxUncompressedBytes: 1e6 });
          for (const [name, bytes] of Object.entries(files)) expect(out.get(name)).toEqual(bytes);
        },
      ),
      { seed: SEED, numRuns: 60 },
    );
  });

  it('reprojects UTM 30N points back to where proj4’s forward transform put them (within 1e-9°)', () => {
    const def = '+proj=utm +zone=30 +datum=WGS84 +units=m +no_defs';
    const forward = proj4('EPSG:4326', def);
    fc.assert(
      fc.property(fc.double({ min: -8, max: 2, noNaN: true }), fc.double({ min: 1, max: 80, noNaN: true }), (lon, lat) => {
        const [x, y] = forward.forward([lon, lat]);
        const f: Feature = { type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [x, y] } };
        const [back] = reprojectLayer({ name: 'p', features: [f] }, { proj4: def });
        const [blon, blat] = (back.geometry as { coordinates: number[] }).coordinates;
        expect(Math.abs(blon - lon)).toBeLessThan(1e-9);
        expect(Math.abs(blat - lat)).toBeLessThan(1e-9);
      }),
      { seed: SEED, numRuns: 200 },
    );
  });

  it('gives areas that do not depend on ring start or direction, and that add up over the two triangles of a diagonal', () => {
    fc.assert(
      fc.property(rectangle, fc.integer({ min: 0, max: 3 }), (poly, shift) => {
        const ring = poly.coordinates[0].slice(0, 4);
        const rotated = [...ring.slice(shift), ...ring.slice(0, shift)];
        const a = ellipsoidalArea(poly);
        const b = ellipsoidalArea({ type: 'Polygon', coordinates: [[...rotated, rotated[0]].reverse()] });
        // Tolerance: double rounding of the per-edge area terms (≤ ~1e10 m² each at these sizes, relative 1e-16 → ~1e-6 m²), with margin.
        expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-9 * a + 1e-3);
        // The diagonal A–C is one geodesic shared by both triangles, so they tile the quadrilateral exactly (Karney 2013, §6: polygon area as a sum over geodesic edges).
        const [A, B, C, D] = ring;
        const t1 = ellipsoidalArea({ type: 'Polygon', coordinates: [[A, B, C, A]] });
        const t2 = ellipsoidalArea({ type: 'Polygon', coordinates: [[A, C, D, A]] });
        expect(Math.abs(t1 + t2 - a)).toBeLessThanOrEqual(1e-9 * a + 1e-3);
      }),
      { seed: SEED, numRuns: 200 },
    );
  });

  it('formats any count so that removing the spaces gives the digits back', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1e12, max: 1e12 }), (n) => {
        const s = formatCount(n);
        expect(s.replace(/ /g, '')).toBe(String(n));
        expect(/^-?\d{1,3}( \d{3})*$/.test(s)).toBe(true);
      }),
      { seed: SEED, numRuns: 200 },
    );
  });
});
