/**
 * readShapefileZip read whole and `lazy` (no inflated .shp or .dbf kept: each zip entry is checked in one pass as it
 * inflates, then inflated again range by range for each pass over the features) must give the same layers, and the
 * same refusals word for word, the zip's own before any file's. Zip layout: PKWARE APPNOTE.TXT 6.3 — central
 * directory header 0x02014b50 with the CRC-32 at offset 16 and the uncompressed size at 24, end of central
 * directory 0x06054b50 with the directory's offset at 16; method 0 is "stored". Shapefile layout: ESRI Shapefile
 * Technical Description (1998) — file code 9994 (int32 BE) at byte 0.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { unzipSync, zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { readShapefileZip } from '../../../shared/geometry/read-shapefile-zip';
import { listZipEntries } from '../../../shared/geometry/unzip-entries';
import { isUploadError } from '../../../shared/geometry/upload-error';
import { DEFAULT_UPLOAD_LIMITS } from '../../../shared/geometry/upload-limits';
import { generatedShapefileLayer, WGS84_PRJ } from './generated-shapefile';

const enc = (s: string) => new TextEncoder().encode(s);
const root = path.resolve(import.meta.dirname, '../../fixtures/uploads');

/** `count` squares (see generated-shapefile.ts) as the files of a layer named "leases", with its .prj. */
function layerFiles(count: number) {
  const files = generatedShapefileLayer(count, { perRow: 20, idPrefix: 'GEN', holders: ['Saltreed Oysters', 'Cordmere Shellfish'] });
  return { 'leases.shp': files.shp, 'leases.shx': files.shx, 'leases.dbf': files.dbf, 'leases.prj': enc(WGS84_PRJ) };
}

/** The same files as a zip of stored (method 0) entries. */
function stored(zip: Uint8Array): Uint8Array {
  return zipSync(Object.fromEntries(Object.entries(unzipSync(zip)).map(([name, bytes]) => [name, [bytes, { level: 0 }]])));
}

/** The offset of `entryPath`'s central directory header (found from the end-of-directory record). */
function centralHeader(zip: Uint8Array, entryPath: string): number {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  let end = zip.length - 22;
  while (view.getUint32(end, true) !== 0x06054b50) end--;
  let p = view.getUint32(end + 16, true);
  for (let i = 0; i < view.getUint16(end + 10, true); i++) {
    const nameLength = view.getUint16(p + 28, true);
    if (new TextDecoder().decode(zip.subarray(p + 46, p + 46 + nameLength)) === entryPath) return p;
    p += 46 + nameLength + view.getUint16(p + 30, true) + view.getUint16(p + 32, true);
  }
  throw new Error(`no ${entryPath} in the zip`);
}

/** A copy of `zip` with a 32-bit field of `entryPath`'s central directory header changed. */
function patched(zip: Uint8Array, entryPath: string, field: 'crc32' | 'declaredSize', change: (value: number) => number): Uint8Array {
  const out = zip.slice();
  const view = new DataView(out.buffer);
  const at = centralHeader(out, entryPath) + (field === 'crc32' ? 16 : 24);
  view.setUint32(at, change(view.getUint32(at, true)) >>> 0, true);
  return out;
}

/**
 * What a read gives: its layers with every feature (a lazy read's gathered from `chunks(size)`) and its warnings, or
 * its refusal. A lazy read's refusal may come while its chunks are built.
 */
function outcome(zip: Uint8Array, lazy: boolean, size = 2_000) {
  try {
    const { layers, warnings } = readShapefileZip(zip, DEFAULT_UPLOAD_LIMITS, { lazy });
    return {
      warnings,
      layers: layers.map(({ chunks, features, ...layer }) => {
        if (lazy) expect(features).toEqual([]);
        return { ...layer, features: chunks ? [...chunks(size)].flat() : features };
      }),
    };
  } catch (e) {
    if (isUploadError(e)) return { refusal: { code: e.code, status: e.status, message: e.message, details: e.details } };
    throw e;
  }
}

const generated = zipSync(layerFiles(300));
/** The .dbf of 300 rows of 300 bytes, one byte not UTF-8 late in the table (row 280: past the first 64 kB block the check reads). */
const latinLate = (() => {
  const files = layerFiles(300);
  const dbf = files['leases.dbf'].slice();
  const view = new DataView(dbf.buffer);
  const headerLength = view.getUint16(8, true);
  const recordLength = view.getUint16(10, true);
  // Fields in order LEASE_ID, HOLDER, AREA; HOLDER's first byte set to 0xE9 ('é' in windows-1252, a lone lead byte in UTF-8).
  const leaseIdWidth = dbf[32 + 16];
  dbf[headerLength + 280 * recordLength + 1 + leaseIdWidth] = 0xe9;
  return zipSync({ ...files, 'leases.dbf': dbf });
})();

const fixtures: [string, Uint8Array][] = ['bad', 'good', 'needs-crs', 'repairable', 'warnings', 'reference'].flatMap((folder) =>
  readdirSync(path.join(root, folder))
    .filter((f) => f.endsWith('.zip'))
    .map((f): [string, Uint8Array] => [`${folder}/${f}`, new Uint8Array(readFileSync(path.join(root, folder, f)))]),
);
const originals: [string, Uint8Array][] = [...fixtures, ['generated/multi-part.zip', generated], ['generated/latin1-late.zip', latinLate]];
/** Every zip fflate can unpack, again with stored entries. */
const storedCopies = originals.flatMap(([name, zip]): [string, Uint8Array][] => {
  try {
    return [[`${name} (stored)`, stored(zip)]];
  } catch {
    return [];
  }
});
const cases = new Map([...originals, ...storedCopies]);

describe('readShapefileZip: lazy and whole reads agree', () => {
  it('has cases with multi-part polygons, tables that are not UTF-8, stored entries and refusals', () => {
    const whole = (name: string) => outcome(cases.get(name)!, false);
    const types = whole('generated/multi-part.zip (stored)').layers![0].features.map((f) => f.geometry?.type);
    expect(new Set(types)).toEqual(new Set(['MultiPolygon', 'Polygon']));
    expect(listZipEntries(cases.get('generated/multi-part.zip (stored)')!).map((e) => e.method)).toEqual([0, 0, 0, 0]);
    expect(whole('warnings/latin1-without-cpg.zip').layers![0].encoding).toBe('windows-1252');
    const late = whole('generated/latin1-late.zip');
    expect(late.layers![0].encoding).toBe('windows-1252');
    expect(late.layers![0].features[280].properties?.HOLDER).toBe('éaltreed Oysters');
    expect(storedCopies.length).toBeGreaterThan(30);
    const refused = fixtures.filter(([, zip]) => 'refusal' in outcome(zip, false)).map(([name]) => name);
    expect(refused).toEqual(
      expect.arrayContaining(
        [
          'corrupted-shp-garbage',
          'corrupted-shp-record',
          'encrypted',
          'record-count-mismatch',
          'shp-length-mismatch',
          'truncated-dbf-header',
          'truncated-dbf',
          'truncated-shp-header',
          'truncated-zip',
          'unsupported-compression',
          'zip-bomb-declared',
          'zip-bomb-forged',
        ].map((f) => `bad/${f}.zip`),
      ),
    );
  });

  it.each([...cases])('%s', (_name, zip) => {
    const whole = outcome(zip, false);
    for (const size of [1, 7, 2_000]) expect(outcome(zip, true, size), `chunks of ${size}`).toEqual(whole);
  });
});

describe('readShapefileZip: the zip’s refusals in the lazy read', () => {
  const zip = generated;
  const files = unzipSync(zip);
  const damagedShp = files['leases.shp'].slice();
  damagedShp[0] ^= 0xff; // the file code: not a .shp any more
  it.each([
    [
      'a .dbf that declares more bytes than it holds',
      patched(zip, 'leases.dbf', 'declaredSize', (n) => n + 1_000),
      /^The zip file is damaged: leases\.dbf unpacks to .*, not the .* its table of contents declares\./,
    ],
    [
      'a .dbf that declares fewer bytes than it holds',
      patched(zip, 'leases.dbf', 'declaredSize', (n) => n - 1_000),
      /^The zip file is damaged: leases\.dbf unpacks to .*, not the .* its table of contents declares\./,
    ],
    ['a stored .shp that declares fewer bytes than it holds', patched(stored(zip), 'leases.shp', 'declaredSize', (n) => n - 8), /leases\.shp is not the size its table of contents says/],
    ['a .shp whose CRC-32 is wrong', patched(zip, 'leases.shp', 'crc32', (n) => n ^ 1), /^The zip file is damaged: leases\.shp fails its checksum\./],
    ['a stored .dbf whose CRC-32 is wrong', patched(stored(zip), 'leases.dbf', 'crc32', (n) => n ^ 1), /leases\.dbf fails its checksum/],
    [
      'a stored .shp whose bytes were damaged (its checksum is refused, not its header)',
      (() => {
        const out = stored(zip);
        const h = listZipEntries(out).find((e) => e.path === 'leases.shp')!.localHeaderOffset;
        const view = new DataView(out.buffer);
        out[h + 30 + view.getUint16(h + 26, true) + view.getUint16(h + 28, true)] ^= 0xff; // the data's first byte: the file code
        return out;
      })(),
      /^The zip file is damaged: leases\.shp fails its checksum\./,
    ],
    [
      'a damaged .shp header in a zip whose .prj fails its checksum (the zip is refused first)',
      patched(zipSync({ ...files, 'leases.shp': damagedShp }), 'leases.prj', 'crc32', (n) => n ^ 1),
      /^The zip file is damaged: leases\.prj fails its checksum\./,
    ],
    [
      'an entry that inflates past the upload’s budget while declaring little',
      new Uint8Array(readFileSync(path.join(root, 'bad/zip-bomb-forged.zip'))),
      /^The zip file is damaged: leases\.shp unpacks to|^The zip expands to more than/,
    ],
  ])('%s', (_name, bad, message) => {
    const lazy = outcome(bad, true);
    expect(lazy).toEqual(outcome(bad, false));
    expect(lazy.refusal?.code).toMatch(/^(corrupt_zip|uncompressed_too_large)$/);
    expect(lazy.refusal?.message).toMatch(message);
  });

  it('refuses a damaged .shp with the whole read’s message once the zip itself is sound', () => {
    const bad = zipSync({ ...files, 'leases.shp': damagedShp });
    const lazy = outcome(bad, true);
    expect(lazy).toEqual(outcome(bad, false));
    expect(lazy.refusal?.code).toBe('corrupt_shp');
    expect(lazy.refusal?.message).toMatch(/^leases\.shp is not a readable shapefile/);
  });
});
