/**
 * Walks the upload corpus (tests/fixtures/uploads/<folder>/manifest.json, written by make-corpus.ts)
 * and checks each file's outcome through the whole pipeline (read, reproject, coordinate checks): the
 * status, the error code, the message (a regex from the manifest) and, for accepted files, the CRS,
 * counts, a decoded property and the warnings. Reference for every expectation: the manifest line's
 * `why`, which states the rule (RFC 7946, the ESRI shapefile technical description, dBASE, APPNOTE). Every file
 * goes through both reads: whole, and streamed (readUpload's `stream`, zipped shapefiles inflated range by range).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { runUploadPipeline } from './run-upload-pipeline';

interface ManifestEntry {
  file: string;
  kind: 'lease' | 'coast' | 'zone';
  limits?: Record<string, number>;
  options?: { layer?: string; tracksAsPolygons?: boolean };
  expectedBbox?: [number, number, number, number];
  expectStatus: number;
  expectCode: string | null;
  expectMessage: string | null;
  expectWarning?: string;
  expectNoWarning?: string;
  expectCrsFound?: boolean;
  expectEpsg?: number;
  expectLayers?: number;
  expectFeatureCount?: number;
  expectProperty?: { layer?: number; index: number; field: string; value: string | number };
  why: string;
}

const root = path.resolve(import.meta.dirname, '../../fixtures/uploads');
const load = (folder: string): ManifestEntry[] => JSON.parse(readFileSync(path.join(root, folder, 'manifest.json'), 'utf8'));

describe.each(['bad', 'needs-crs', 'repairable', 'warnings', 'good'])('upload corpus: %s/', (folder) => {
  const manifest = load(folder);

  it('has a manifest line for every file and a file for every line', async () => {
    const { readdirSync } = await import('node:fs');
    const files = readdirSync(path.join(root, folder)).filter((f) => f !== 'manifest.json');
    expect(manifest.map((m) => m.file).sort()).toEqual(files.sort());
  });

  it.each(manifest.flatMap((m) => (['whole', 'streamed'] as const).map((read) => [m.file, read, m] as const)))('%s (%s read)', async (_file, read, entry) => {
    const bytes = new Uint8Array(readFileSync(path.join(root, folder, entry.file)));
    const options = { ...entry.options, stream: read === 'streamed' };
    const result = await runUploadPipeline(bytes, entry.file, entry.kind, entry.limits, entry.expectedBbox, options);
    if (entry.expectStatus !== 200) {
      expect(result.error, `${entry.file} should fail: ${entry.why}`).toBeDefined();
      expect(result.error!.status).toBe(entry.expectStatus);
      expect(result.error!.code).toBe(entry.expectCode);
      expect(result.error!.message).toMatch(new RegExp(entry.expectMessage!));
      return;
    }
    expect(result.error?.message, `${entry.file} should be accepted: ${entry.why}`).toBeUndefined();
    const parsed = result.parsed!;
    if (entry.expectCrsFound !== undefined) expect(parsed.layers.every((l) => l.crs.found === entry.expectCrsFound)).toBe(true);
    if (entry.expectEpsg !== undefined) expect(parsed.layers[0].crs.epsg).toBe(entry.expectEpsg);
    if (entry.expectLayers !== undefined) expect(parsed.layers).toHaveLength(entry.expectLayers);
    if (entry.expectFeatureCount !== undefined)
      expect(parsed.layers.reduce((n, l) => n + l.features.length, 0)).toBe(entry.expectFeatureCount);
    if (entry.expectProperty) {
      const p = entry.expectProperty;
      expect(parsed.layers[p.layer ?? 0].features[p.index].properties?.[p.field]).toBe(p.value);
    }
    if (entry.expectWarning)
      expect(
        result.warnings.some((w) => new RegExp(entry.expectWarning!).test(w)),
        result.warnings.join('\n'),
      ).toBe(true);
    if (entry.expectNoWarning) expect(result.warnings.filter((w) => new RegExp(entry.expectNoWarning!).test(w))).toEqual([]);
  });
});

describe('upload corpus: size', () => {
  it('has at least 10 bad files of each open format (KML, KMZ, GPX, GeoPackage)', () => {
    const files = load('bad').map((m) => m.file);
    for (const ext of ['.kml', '.kmz', '.gpx', '.gpkg']) expect(files.filter((f) => f.endsWith(ext)).length, ext).toBeGreaterThanOrEqual(10);
  });

  it('has at least 25 bad files, and a needs-crs, repairable, warnings and good folder', () => {
    expect(load('bad').length).toBeGreaterThanOrEqual(25);
    for (const folder of ['needs-crs', 'repairable', 'warnings', 'good']) expect(load(folder).length).toBeGreaterThan(0);
  });
});
