/**
 * The streamed shapefile and GeoJSON reads (readUpload's `stream` option): features built chunk by chunk from the
 * .shp records and .dbf rows, or parsed again from the GeoJSON text, must be the features the whole read returns, and
 * a refusal found in the last chunk must be the whole read's refusal, word for word. Byte layouts: ESRI Shapefile Technical Description (1998) —
 * a record header is 8 bytes (number, content length; big-endian), then the shape type (int32 LE), 0 for a
 * null shape; dBASE III table: 32-byte header, 32-byte field descriptors, 0x0D, then fixed-width rows.
 */
import { zipSync } from 'fflate';
import type { Feature, Geometry } from 'geojson';
import { describe, expect, it } from 'vitest';
import { checkGeometries, geometryChecker } from '../../../shared/geometry/check-geometries';
import { openDbf } from '../../../shared/geometry/read-dbf';
import { checkShp, parseCheckedShp, parseShpRange } from '../../../shared/geometry/read-shp';
import { layerChunks, layerFeatureCount, layerGeometryTypes, type ParsedUpload, readUpload } from '../../../shared/geometry/read-upload';
import { isUploadError } from '../../../shared/geometry/upload-error';
import { generatedShapefileLayer, WGS84_PRJ } from './generated-shapefile';

const enc = (s: string) => new TextEncoder().encode(s);

/** `count` small squares (see generated-shapefile.ts); `size` the side of each, degrees. */
const layerFiles = (count: number, size = 0.001) => generatedShapefileLayer(count, { size });

function zipOf(files: { shp: Uint8Array; shx: Uint8Array; dbf: Uint8Array }, cpg?: string) {
  return zipSync({ 'leases.shp': files.shp, 'leases.shx': files.shx, 'leases.dbf': files.dbf, 'leases.prj': enc(WGS84_PRJ), ...(cpg ? { 'leases.cpg': enc(cpg) } : {}) });
}

function everyFeature(parsed: ParsedUpload, size: number): Feature<Geometry>[] {
  return parsed.layers.flatMap((l) => [...layerChunks(l, size)].flat());
}

async function refusal(p: Promise<unknown>) {
  try {
    await p;
  } catch (e) {
    if (isUploadError(e)) return { code: e.code, message: e.message, details: e.details };
    throw e;
  }
  throw new Error('expected an UploadError');
}

describe('streamed shapefile read', () => {
  const files = layerFiles(4_500);
  const zip = zipOf(files, 'UTF-8');

  it('yields the same features, counts, types and warnings as the whole read, in chunks no larger than asked', async () => {
    const whole = await readUpload(zip, 'leases.zip', 'lease');
    const streamed = await readUpload(zip, 'leases.zip', 'lease', undefined, { stream: true });
    expect(streamed.layers[0].features).toEqual([]);
    const sizes = [...layerChunks(streamed.layers[0], 2_000)].map((c) => c.length);
    expect(sizes).toEqual([2_000, 2_000, 500]);
    expect(everyFeature(streamed, 2_000)).toEqual(whole.layers[0].features);
    // Any chunk size gives the same features (a chunk boundary inside the run of holes and multi-part shapes).
    expect(everyFeature(streamed, 333)).toEqual(whole.layers[0].features);
    expect(layerFeatureCount(streamed.layers[0])).toBe(4_500);
    expect(layerGeometryTypes(streamed.layers[0])).toEqual(layerGeometryTypes(whole.layers[0]));
    expect(layerGeometryTypes(whole.layers[0])).toEqual(['MultiPolygon', 'Polygon']);
    expect(streamed.layers[0].vertexCount).toBe(whole.layers[0].vertexCount);
    expect(streamed.warnings).toEqual(whole.warnings);
    expect({ ...streamed.layers[0], features: undefined, stream: undefined }).toEqual({ ...whole.layers[0], features: undefined });
    expect(whole.layers[0].features[4_499].properties).toEqual({ LEASE_ID: 'STR-4500', HOLDER: 'Cordmere Shellfish', AREA: 1124.75 });
  });

  it('decodes record and row ranges that join up to the whole file', () => {
    const check = checkShp(files.shp, 'leases.shp');
    expect(check.offsets).toHaveLength(4_501);
    expect(check.offsets[0]).toBe(100); // records start after the 100-byte header (technical description, p. 2)
    const all = parseCheckedShp(check, 'leases.shp');
    expect([...parseShpRange(check, 0, 1_234, 'leases.shp'), ...parseShpRange(check, 1_234, 4_500, 'leases.shp')]).toEqual(all);
    const table = openDbf(files.dbf, 'leases.dbf', 'UTF-8');
    expect(table.records).toBe(4_500);
    expect([...table.rows(0, 10), ...table.rows(10, 4_500)]).toEqual(table.rows(0, 4_500));
    expect(table.rows(4_499, 4_500)).toEqual([{ LEASE_ID: 'STR-4500', HOLDER: 'Cordmere Shellfish', AREA: 1124.75 }]);
  });

  it('refuses a null shape in the last chunk with the whole read’s message', async () => {
    const shp = files.shp.slice();
    const check = checkShp(shp, 'leases.shp');
    // The last record's shape type (content offset 0) set to 0: a null shape (technical description, table 1).
    new DataView(shp.buffer).setInt32(check.offsets[4_499] + 8, 0, true);
    const bad = zipOf({ ...files, shp });
    const whole = await refusal(readUpload(bad, 'leases.zip', 'lease'));
    const streamed = await refusal(readUpload(bad, 'leases.zip', 'lease', undefined, { stream: true }));
    expect(streamed).toEqual(whole);
    expect(streamed.code).toBe('null_geometry');
    expect(streamed.message).toBe(
      '1 of the 4 500 features have no geometry (null or empty): feature 4499 (counting from 0). Every feature needs a boundary: delete those features or draw their shapes in your GIS, then upload again.',
    );
  });

  it('refuses a ring too short in the last chunk with the message of the check over the whole list', () => {
    const check = checkShp(files.shp, 'leases.shp');
    const features: Feature<Geometry | null>[] = parseCheckedShp(check, 'leases.shp').map((geometry) => ({ type: 'Feature', properties: {}, geometry }));
    // A triangle not closed: 3 positions after closing (RFC 7946 §3.1.6 asks for 4 or more).
    features[4_321] = { type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: [[[0, 0], [1, 0], [0, 0]]] } };
    const ctx = { layerName: 'leases', multiLayer: false, verticesBefore: 0, limits: { maxVertices: 5_000_000 } };
    const expected =
      '1 feature cannot form a shape: feature 4321 has ring 0 with only 3 positions. A polygon ring needs at least 4 positions (3 corners and the closing one) and a line at least 2: fix or delete those features and upload again.';
    expect(() => checkGeometries(features, 'lease', ctx)).toThrow(expected);
    const checker = geometryChecker('lease', ctx);
    for (let at = 0; at < features.length; at += 2_000) checker.add(features.slice(at, at + 2_000), at);
    expect(() => checker.finish()).toThrow(expected);
    // The vertex limit reached in the last chunk wins over it, as over the whole list (the walk stops there).
    const tight = { ...ctx, limits: { maxVertices: 10 } };
    const limited = geometryChecker('lease', tight);
    for (let at = 0; at < features.length; at += 2_000) limited.add(features.slice(at, at + 2_000), at);
    let wholeError: unknown;
    try {
      checkGeometries(features, 'lease', tight);
    } catch (e) {
      wholeError = e;
    }
    expect(() => limited.finish()).toThrow((wholeError as Error).message);
  });
});

describe('streamed GeoJSON read', () => {
  const square = (x: number, y: number, d: number) => [
    [x, y],
    [x + d, y],
    [x + d, y + d],
    [x, y + d],
    [x, y],
  ];
  /** `count` squares in EPSG:3857 (an old-style crs member), every 9th one a MultiPolygon of two; feature `nullAt` has no geometry. */
  const collection = (count: number, nullAt?: number) => {
    const features = Array.from({ length: count }, (_, i) => {
      const x = -330_000 + i * 50;
      const geometry =
        i === nullAt
          ? null
          : i % 9
            ? { type: 'Polygon', coordinates: [square(x, 6_000_000, 40)] }
            : { type: 'MultiPolygon', coordinates: [[square(x, 6_000_000, 40)], [square(x, 6_000_100, 20)]] };
      return {
        type: 'Feature',
        id: `L-${i}`,
        properties: i % 4 ? { LEASE_ID: `STR-${i + 1}`, HOLDER: 'Huîtres Vasière' } : null,
        geometry,
      };
    });
    return enc(JSON.stringify({ type: 'FeatureCollection', features, crs: { type: 'name', properties: { name: 'EPSG:3857' } } }));
  };

  it('yields the same features, counts, types and warnings as the whole read, in chunks no larger than asked', async () => {
    const bytes = collection(4_500);
    const whole = await readUpload(bytes, 'leases.geojson', 'lease');
    const streamed = await readUpload(bytes, 'leases.geojson', 'lease', undefined, { stream: true });
    expect(streamed.format).toBe('geojson');
    expect(streamed.layers[0].features).toEqual([]);
    expect([...layerChunks(streamed.layers[0], 2_000)].map((c) => c.length)).toEqual([2_000, 2_000, 500]);
    expect(everyFeature(streamed, 2_000)).toEqual(whole.layers[0].features);
    expect(everyFeature(streamed, 333)).toEqual(whole.layers[0].features);
    expect(layerFeatureCount(streamed.layers[0])).toBe(4_500);
    expect(layerGeometryTypes(streamed.layers[0])).toEqual(['MultiPolygon', 'Polygon']);
    expect(streamed.layers[0].vertexCount).toBe(whole.layers[0].vertexCount);
    expect(streamed.warnings).toEqual(whole.warnings);
    expect(streamed.warnings[0]).toMatch(/"crs" member says its coordinates are in EPSG:3857/);
    expect({ ...streamed.layers[0], features: undefined, stream: undefined }).toEqual({ ...whole.layers[0], features: undefined });
  });

  it('refuses a null geometry in the last chunk with the whole read’s message', async () => {
    const bytes = collection(4_500, 4_499);
    const whole = await refusal(readUpload(bytes, 'leases.geojson', 'lease'));
    const streamed = await refusal(readUpload(bytes, 'leases.geojson', 'lease', undefined, { stream: true }));
    expect(streamed).toEqual(whole);
    expect(streamed.code).toBe('null_geometry');
  });

  it('reads GeoJSON whole without the option', async () => {
    const parsed = await readUpload(collection(3), 'leases.geojson', 'lease');
    expect(parsed.layers[0].stream).toBeUndefined();
    expect(parsed.layers[0].features).toHaveLength(3);
  });
});
