/**
 * Unit checks of the reading steps that the corpus does not pin down one by one. Byte layouts follow the
 * ESRI Shapefile Technical Description (1998) and the dBASE III table format; each check names its rule.
 */
import { write } from '@mapbox/shp-write';
import { zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { readDbf, encodingFromCpg } from '../../../shared/geometry/read-dbf';
import { readPrj, wktAuthorityCode, wktName } from '../../../shared/geometry/read-prj';
import { checkShp, parseCheckedShp } from '../../../shared/geometry/read-shp';
import {
  DEFAULT_UPLOAD_LIMITS,
  detectFormat,
  layerChunks,
  type ParsedUpload,
  readUpload,
} from '../../../shared/geometry/read-upload';
import {
  checkDeclaredSizes,
  crc32,
  inflateEntries,
  isIgnorableEntry,
  listZipEntries,
  openEntryReader,
  type ZipEntryInfo,
} from '../../../shared/geometry/unzip-entries';
import { isUploadError, UploadError } from '../../../shared/geometry/upload-error';
import { formatBytes, formatCount, listSome, resolveUploadLimits } from '../../../shared/geometry/upload-limits';
import { squarePolygon } from './square-polygon';

const enc = (s: string) => new TextEncoder().encode(s);
const fc = (features: unknown[], extra: Record<string, unknown> = {}) =>
  enc(JSON.stringify({ type: 'FeatureCollection', ...extra, features }));
const square = (x = -2.95, y = 47.58, d = 0.01) => squarePolygon(x, y, d);
const feature = (geometry: unknown, properties: Record<string, unknown> | null = {}, id?: string | number) => ({
  type: 'Feature',
  ...(id !== undefined ? { id } : {}),
  properties,
  geometry,
});
async function failure(p: Promise<unknown>): Promise<UploadError> {
  try {
    await p;
  } catch (e) {
    if (isUploadError(e)) return e;
    throw e;
  }
  throw new Error('expected an UploadError');
}

function shpOf(type: 'POLYGON' | 'POINT' | 'POLYLINE', geometries: unknown[]): { shp: Uint8Array; shx: Uint8Array } {
  let out: { shp: Uint8Array; shx: Uint8Array } | undefined;
  write([], type, geometries as object[], (_err, files) => {
    const bytes = (v: DataView) => new Uint8Array(v.buffer.slice(v.byteOffset, v.byteOffset + v.byteLength));
    out = { shp: bytes(files.shp as DataView), shx: bytes(files.shx as DataView) };
  });
  return out!;
}

/** A dBASE III table: fields [name, type, width]; `pad` extra header bytes before the records (as some writers add). */
function dbfOf(fields: [string, string, number][], rows: string[][], pad = 0, encode = enc): Uint8Array {
  const standard = 32 * (fields.length + 1) + 1;
  const headerLength = standard + pad;
  const recordLength = 1 + fields.reduce((s, f) => s + f[2], 0);
  const out = new Uint8Array(headerLength + rows.length * recordLength);
  const v = new DataView(out.buffer);
  out[0] = 3;
  v.setUint32(4, rows.length, true);
  v.setUint16(8, headerLength, true);
  v.setUint16(10, recordLength, true);
  fields.forEach(([name, type, width], i) => {
    out.set(enc(name), 32 + 32 * i);
    out[32 + 32 * i + 11] = type.charCodeAt(0);
    out[32 + 32 * i + 16] = width;
  });
  out[standard - 1] = 0x0d;
  rows.forEach((row, r) => {
    let p = headerLength + r * recordLength;
    out[p++] = 0x20;
    row.forEach((cell, c) => {
      out.fill(0x20, p, p + fields[c][2]);
      out.set(encode(cell).subarray(0, fields[c][2]), p);
      p += fields[c][2];
    });
  });
  return out;
}

describe('limits and number formats', () => {
  it('formats counts with plain spaces, sizes in SI units, lists with "and N more"', () => {
    expect(formatCount(61204)).toBe('61 204');
    expect(formatCount(5_000_000)).toBe('5 000 000');
    expect(formatCount(999)).toBe('999');
    expect(formatBytes(50_000_000)).toBe('50 MB');
    expect(formatBytes(300_000_000)).toBe('300 MB');
    expect(formatBytes(1_234_567)).toBe('1.2 MB');
    expect(formatBytes(812)).toBe('812 bytes');
    expect(listSome(['a', 'b', 'c', 'd'], 2)).toBe('a, b and 2 more');
    expect(listSome([1, 3])).toBe('1 and 3');
  });
  it('has the documented defaults and refuses nonsense limits', () => {
    expect(DEFAULT_UPLOAD_LIMITS).toEqual({
      maxCompressedBytes: 50_000_000,
      maxUncompressedBytes: 300_000_000,
      maxFeatures: 50_000,
      maxVertices: 5_000_000,
    });
    expect(resolveUploadLimits({ maxFeatures: 10 }).maxVertices).toBe(5_000_000);
    expect(() => resolveUploadLimits({ maxFeatures: 0 })).toThrow(RangeError);
    expect(() => resolveUploadLimits({ maxVertices: Number.NaN })).toThrow(RangeError);
  });
  it.each([false, true])('states the example message of the brief for 61 204 features (streamed: %s)', async (stream) => {
    const e = await failure(
      readUpload(fc(Array.from({ length: 61_204 }, () => feature(null))), 'big.geojson', 'lease', undefined, { stream }),
    );
    expect(e.message).toBe(
      'The file has 61 204 features; this server takes at most 50 000 per upload (setting UPLOAD_MAX_FEATURES). Split the file and upload the parts.',
    );
  });
});

describe('UploadError', () => {
  it('fixes the status by code', () => {
    expect(new UploadError('empty_file', 'x').status).toBe(400);
    expect(new UploadError('uncompressed_too_large', 'x').status).toBe(413);
    expect(new UploadError('unsupported_format', 'x').status).toBe(415);
    expect(new UploadError('missing_dbf', 'x', { layer: 'a' })).toMatchObject({
      status: 422,
      details: { layer: 'a' },
      name: 'UploadError',
    });
    expect(isUploadError(new Error('x'))).toBe(false);
  });
});

describe('detectFormat (zip local header "PK\\x03\\x04", APPNOTE 4.3.7; JSON text RFC 8259)', () => {
  it('reads JSON after a byte-order mark and whitespace, and arrays as JSON', () => {
    expect(detectFormat(Uint8Array.from([0xef, 0xbb, 0xbf, 0x0a, 0x20, 0x7b]), 'a.geojson')).toBe('json');
    expect(detectFormat(enc('  ['), 'a.json')).toBe('json');
    expect(detectFormat(Uint8Array.from([0x50, 0x4b, 0x03, 0x04]), 'a.bin')).toBe('zip');
  });
  it('tells XML (KML, GPX) and SQLite (GeoPackage, "SQLite format 3\\0" per sqlite.org/fileformat.html) apart, and names gzip', () => {
    expect(detectFormat(enc('<?xml version="1.0"?><kml/>'), 'bay.kml')).toBe('xml');
    expect(detectFormat(enc('SQLite format 3\0'), 'leases.gpkg')).toBe('sqlite');
    expect(() => detectFormat(Uint8Array.from([0x1f, 0x8b, 8, 0]), 'leases.tar.gz')).toThrow(/gzip archive/);
    expect(() => detectFormat(enc('SQLite form'), 'leases.gpkg')).toThrow(/damaged SQLite header/);
  });
});

// Every case read whole, and streamed as the server reads it (the features gathered from the layer's chunks).
describe.each([
  { mode: 'whole', stream: false },
  { mode: 'streamed', stream: true },
])('readUpload: GeoJSON details ($mode)', ({ stream }) => {
  async function read(...[bytes, fileName, kind, limits, options]: Parameters<typeof readUpload>): Promise<ParsedUpload> {
    const parsed = await readUpload(bytes, fileName, kind, limits, { ...options, stream });
    for (const l of parsed.layers) expect(l.stream !== undefined).toBe(stream);
    return { ...parsed, layers: parsed.layers.map((l) => ({ ...l, features: [...layerChunks(l, 2)].flat() })) };
  }

  it('keeps ids, turns null properties into {}, lists fields in order of first appearance', async () => {
    const parsed = await read(
      fc([
        feature(square(), { LEASE_ID: 'FB-014', HOLDER: 'Saltreed Oysters' }, 'a'),
        feature(square(-2.9), null, 7),
        feature(square(-2.8), { SPECIES: 'Cockle', LEASE_ID: 'FB-021' }),
      ]),
      'fennick.geojson',
      'lease',
    );
    const layer = parsed.layers[0];
    expect(parsed.format).toBe('geojson');
    expect(layer.name).toBe('fennick');
    expect(layer.crs).toEqual({ found: true, epsg: 4326, name: 'WGS 84' });
    expect(layer.fields).toEqual(['LEASE_ID', 'HOLDER', 'SPECIES']);
    expect(layer.features.map((f) => f.id)).toEqual(['a', 7, undefined]);
    expect(layer.features[1].properties).toEqual({});
    expect(layer.vertexCount).toBe(15); // 3 squares × 5 positions, closing ones included
    expect(layer.encoding).toBeUndefined();
  });
  it('accepts OGC CRS84 silently, warns about an unrecognised crs member', async () => {
    const crs84 = await read(
      fc([feature(square())], { crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:OGC:1.3:CRS84' } } }),
      'a.geojson',
      'lease',
    );
    expect(crs84.warnings).toEqual([]);
    const odd = await read(fc([feature(square())], { crs: { type: 'link', properties: { href: 'x' } } }), 'a.geojson', 'lease');
    expect(odd.warnings[0]).toMatch(/old-style "crs" member that does not name an EPSG code/);
    expect(odd.layers[0].crs.epsg).toBe(4326);
  });
  it('refuses items that are not Features and a collection without features', async () => {
    expect((await failure(read(fc([square()]), 'a.geojson', 'lease'))).message).toMatch(
      /^Item 0 of "features" \(counting from 0\) is not a GeoJSON Feature: it is of type "Polygon"/,
    );
    expect((await failure(read(enc('{"type":"FeatureCollection"}'), 'a.geojson', 'lease'))).code).toBe('invalid_geojson');
    expect((await failure(read(fc([feature(square(), 'x' as never)]), 'a.geojson', 'lease'))).message).toMatch(
      /"properties" that are not an object/,
    );
  });
  it('refuses GeometryCollections for every kind', async () => {
    const gc = { type: 'GeometryCollection', geometries: [square()] };
    expect((await failure(read(fc([feature(gc)]), 'a.geojson', 'coast'))).code).toBe('wrong_geometry_type');
  });
  it('lets a coast mix lines and polygons, and checks line lengths', async () => {
    const ok = await read(
      fc([
        feature(square()),
        feature({
          type: 'MultiLineString',
          coordinates: [
            [
              [0, 0],
              [1, 1],
            ],
          ],
        }),
      ]),
      'a.geojson',
      'coast',
    );
    expect(ok.layers[0].features).toHaveLength(2);
    const e = await failure(read(fc([feature({ type: 'LineString', coordinates: [[0, 0]] })]), 'a.geojson', 'coast'));
    expect(e.code).toBe('invalid_geometry');
    expect(e.message).toMatch(/its line with only 1 position/);
  });
  it('warns when GeoJSON arrives under a .zip name', async () => {
    const parsed = await read(fc([feature(square())]), 'leases.zip', 'lease');
    expect(parsed.warnings).toContain('leases.zip is named .zip but holds GeoJSON text; it was read as GeoJSON.');
  });
  it('refuses an unknown kind as a programming error', async () => {
    await expect(read(fc([feature(square())]), 'a.geojson', 'river' as never)).rejects.toThrow(RangeError);
  });
  it('does not change the caller’s bytes', async () => {
    const bytes = fc([feature(square())]);
    const copy = bytes.slice();
    await read(bytes, 'a.geojson', 'lease');
    expect(bytes).toEqual(copy);
  });
});

describe('readUpload: shapefile details', () => {
  const leases = shpOf('POLYGON', [square().coordinates, square(-2.9).coordinates]);
  const table = dbfOf(
    [
      ['LEASE_ID', 'C', 10],
      ['AREA_HA', 'N', 8],
      ['GRANTED', 'D', 8],
      ['ACTIVE', 'L', 1],
    ],
    [
      ['FB-014', '12.5', '20190401', 'T'],
      ['FB-015', '', '', 'F'],
    ],
  );

  it('reads numbers, empty numbers, dates and logicals as JSON values (dBASE types N, D, L)', async () => {
    const parsed = await readUpload(zipSync({ 'leases.shp': leases.shp, 'leases.shx': leases.shx, 'leases.dbf': table }), 'l.zip', 'lease');
    const [a, b] = parsed.layers[0].features.map((f) => f.properties);
    expect(a).toEqual({ LEASE_ID: 'FB-014', AREA_HA: 12.5, GRANTED: '2019-04-01', ACTIVE: true });
    expect(b).toEqual({ LEASE_ID: 'FB-015', AREA_HA: null, GRANTED: null, ACTIVE: false });
    expect(JSON.parse(JSON.stringify(parsed))).toEqual(parsed);
  });

  it('reads a table whose writer padded the header', async () => {
    const padded = dbfOf([['LEASE_ID', 'C', 10]], [['FB-014'], ['FB-015']], 263);
    const parsed = await readUpload(zipSync({ 'leases.shp': leases.shp, 'leases.dbf': padded }), 'l.zip', 'lease');
    expect(parsed.layers[0].features.map((f) => f.properties?.LEASE_ID)).toEqual(['FB-014', 'FB-015']);
  });

  it('names layers by basename, with the folder when two share one, and drops an empty layer with a warning', async () => {
    const one = shpOf('POLYGON', [square().coordinates]);
    const empty = new Uint8Array(100);
    const v = new DataView(empty.buffer);
    v.setInt32(0, 9994);
    v.setInt32(24, 50);
    v.setInt32(28, 1000, true);
    v.setInt32(32, 5, true);
    const row = dbfOf([['LEASE_ID', 'C', 10]], [['FB-014']]);
    const parsed = await readUpload(
      zipSync({
        'north/leases.shp': one.shp,
        'north/leases.dbf': row,
        'south/leases.shp': one.shp,
        'south/leases.dbf': row,
        'old/empty.shp': empty,
        'old/empty.dbf': dbfOf([['LEASE_ID', 'C', 10]], []),
      }),
      'l.zip',
      'lease',
    );
    expect(parsed.layers.map((l) => l.name)).toEqual(['north/leases', 'south/leases']);
    expect(parsed.warnings).toContain('Layer “empty” holds no features and was left out.');
  });

  it('follows a .cpg, and warns when it cannot (unsupported code page; UTF-8 declared but not UTF-8)', async () => {
    const latin = dbfOf([['HOLDER', 'C', 30]], [['Huîtres Crève-cœur']], 0, (s) =>
      Uint8Array.from([...s].map((c) => (c === 'œ' ? 0x9c : c.charCodeAt(0)))),
    );
    const one = shpOf('POLYGON', [square().coordinates]);
    const read = (cpg: string) => readUpload(zipSync({ 'a.shp': one.shp, 'a.dbf': latin, 'a.cpg': enc(cpg) }), 'a.zip', 'lease');
    const iso = await read('ISO-8859-1');
    expect(iso.layers[0].features[0].properties?.HOLDER).toBe('Huîtres Crève-cœur');
    expect(iso.layers[0].encoding).toBe('windows-1252');
    const dos = await read('437');
    expect(dos.warnings.join('\n')).toMatch(
      /a\.cpg names an encoding this server cannot decode \("437"\), so a\.dbf was read as windows-1252/,
    );
    const lying = await read('UTF-8');
    expect(lying.warnings.join('\n')).toMatch(
      /a\.cpg says the table is UTF-8, but a\.dbf holds text that is not valid UTF-8; it was read as windows-1252/,
    );
    expect(lying.layers[0].features[0].properties?.HOLDER).toBe('Huîtres Crève-cœur');
  });
});

describe('encodingFromCpg (WHATWG Encoding Standard labels; Windows code page numbers)', () => {
  it.each([
    ['UTF-8', 'utf-8'],
    ['utf8', 'utf-8'],
    ['65001', 'utf-8'],
    ['ANSI 1252', 'windows-1252'],
    ['1252', 'windows-1252'],
    ['CP1250', 'windows-1250'],
    ['ISO-8859-1', 'windows-1252'],
    ['ISO88591', 'windows-1252'],
    ['8859_15', 'iso-8859-15'],
    ['28592', 'iso-8859-2'],
    ['LATIN1', 'windows-1252'],
    ['866', 'ibm866'],
    ['932', 'shift_jis'],
    ['Big5', 'big5'],
    ['437', null],
    ['OEM', null],
  ])('%s → %s', (cpg, label) => {
    expect(encodingFromCpg(cpg)).toBe(label);
  });
});

describe('readDbf', () => {
  it('refuses a record length that does not match the columns', () => {
    const bad = dbfOf([['A', 'C', 5]], [['x']]);
    new DataView(bad.buffer).setUint16(10, 99, true);
    expect(() => readDbf(bad, 'a.dbf')).toThrow(/a\.dbf has a damaged header \(its record length, 99 bytes, does not match its 1 columns/);
  });
  it('reads UTF-8 text cut in the middle of a character at the column width as UTF-8', () => {
    // 'é' is 2 bytes in UTF-8; a 6-byte column holding 'ééé' + 'é' keeps 3 whole characters.
    const t = dbfOf([['HOLDER', 'C', 7]], [['éééé']]);
    const r = readDbf(t, 'a.dbf');
    expect(r.encoding).toBe('utf-8');
    expect(String(r.rows[0].HOLDER).startsWith('ééé')).toBe(true);
  });
});

describe('checkShp (header: file code 9994, version 1000, length in 16-bit words)', () => {
  const { shp } = shpOf('POLYGON', [square().coordinates, square(-2.9).coordinates]);
  it('counts records and vertices before any geometry is built', () => {
    const c = checkShp(shp, 'a.shp');
    expect(c).toMatchObject({ shapeType: 5, records: 2, vertices: 10 });
    expect(parseCheckedShp(c, 'a.shp')).toHaveLength(2);
  });
  it('refuses multipatch (type 31) and unknown shape types', () => {
    const mp = shp.slice();
    new DataView(mp.buffer).setInt32(32, 31, true);
    expect(() => checkShp(mp, 'a.shp')).toThrow(/multipatch/);
    const odd = shp.slice();
    new DataView(odd.buffer).setInt32(32, 42, true);
    expect(() => checkShp(odd, 'a.shp')).toThrow(/shape type 42 does not exist/);
  });
  it('refuses a record whose type differs from the file’s, and inconsistent parts', () => {
    const mixed = shp.slice();
    new DataView(mixed.buffer).setInt32(108, 3, true);
    expect(() => checkShp(mixed, 'a.shp')).toThrow(/damaged at shape 0 .*its shape type \(3\) differs from the file’s \(5\)/);
    const parts = shp.slice();
    new DataView(parts.buffer).setInt32(108 + 44, 3, true); // first part must start at point 0
    expect(() => checkShp(parts, 'a.shp')).toThrow(/its list of parts is inconsistent/);
  });
  it('ignores bytes after the declared end, with a warning', () => {
    const longer = new Uint8Array(shp.length + 8);
    longer.set(shp);
    expect(checkShp(longer, 'a.shp').warnings[0]).toMatch(/8 bytes after the end its header declares/);
  });
});

describe('readPrj', () => {
  const utm =
    'PROJCS["WGS 84 / UTM zone 30N",GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433],AUTHORITY["EPSG","4326"]],PROJECTION["Transverse_Mercator"],PARAMETER["latitude_of_origin",0],PARAMETER["central_meridian",-3],PARAMETER["scale_factor",0.9996],PARAMETER["false_easting",500000],PARAMETER["false_northing",0],UNIT["metre",1,AUTHORITY["EPSG","9001"]],AUTHORITY["EPSG","32630"]]';
  it('takes the outermost AUTHORITY, not the datum’s or the units’', () => {
    expect(wktAuthorityCode(utm)).toBe(32630);
    expect(wktAuthorityCode(utm.replace(',AUTHORITY["EPSG","32630"]]', ']'))).toBeUndefined();
    expect(wktName(utm)).toBe('WGS 84 / UTM zone 30N');
  });
  it('identifies WGS 84 UTM zones and web mercator from ESRI names', () => {
    const esri = (name: string) => utm.replace('WGS 84 / UTM zone 30N', name).replace(/,AUTHORITY\["EPSG","\d+"\]/g, '');
    expect(readPrj(esri('WGS_1984_UTM_Zone_59S'), 'a.prj').crs.epsg).toBe(32759);
    expect(readPrj(esri('WGS_1984_UTM_Zone_61N'), 'a.prj').crs.epsg).toBeUndefined();
  });
  it('warns when a datum has no shift to WGS 84 and a different ellipsoid', () => {
    const wkt =
      'PROJCS["Fennick_Old_Grid",GEOGCS["GCS_Fennick_1950",DATUM["D_Fennick_1950",SPHEROID["International_1924",6378388.0,297.0]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",-3.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]';
    const r = readPrj(wkt, 'old.prj');
    expect(r.crs.found).toBe(true);
    expect(r.warnings[0]).toMatch(/old\.prj names a datum \(fennick_1950\) without its shift to WGS 84/);
  });
});

/**
 * The two ways entries are inflated: whole (inflateEntries), and range by range through a checking reader, as the
 * lazy shapefile read does (declared sizes refused first, then each entry read and finished in turn).
 */
const inflateWays: [string, (zip: Uint8Array, entries: ZipEntryInfo[], limits: typeof DEFAULT_UPLOAD_LIMITS) => Map<string, Uint8Array>][] = [
  ['inflateEntries', inflateEntries],
  [
    'openEntryReader',
    (zip, entries, limits) => {
      checkDeclaredSizes(entries, limits);
      const out = new Map<string, Uint8Array>();
      let inflated = 0;
      for (const entry of entries) {
        const reader = openEntryReader(zip, entry, limits, { inflatedBefore: inflated, verify: true });
        out.set(entry.path, reader.subarray(0, reader.length).slice());
        inflated += reader.finish();
      }
      return out;
    },
  ],
];

describe('unzip-entries', () => {
  it('computes CRC-32 check value 0xCBF43926 for "123456789" (CRC-32/ISO-HDLC catalogue), in one go or in parts', () => {
    expect(crc32(enc('123456789'))).toBe(0xcbf43926);
    expect(crc32(enc('6789'), crc32(enc('12345')))).toBe(0xcbf43926);
    expect(crc32(enc(''), crc32(enc('123456789')))).toBe(0xcbf43926);
  });
  it.each(inflateWays)('%s reads stored and deflated entries, and detects a damaged stored entry by its checksum', (_way, inflate) => {
    const zip = zipSync({ 'a.txt': [enc('Fennick Bay'), { level: 0 }], 'b.txt': [enc('Saltreed Oysters'.repeat(50)), { level: 9 }] });
    const entries = listZipEntries(zip);
    expect(entries.map((e) => [e.path, e.method])).toEqual([
      ['a.txt', 0],
      ['b.txt', 8],
    ]);
    const out = inflate(zip, entries, DEFAULT_UPLOAD_LIMITS);
    expect(new TextDecoder().decode(out.get('a.txt'))).toBe('Fennick Bay');
    expect(out.get('b.txt')).toEqual(enc('Saltreed Oysters'.repeat(50)));
    const damaged = zip.slice();
    damaged[30 + 'a.txt'.length] ^= 0xff; // first data byte of the stored entry
    expect(() => inflate(damaged, listZipEntries(damaged), DEFAULT_UPLOAD_LIMITS)).toThrow(/a\.txt fails its checksum/);
  });
  it.each(inflateWays)('%s refuses a deflated entry that unpacks to more or fewer bytes than its table of contents declares', (_way, inflate) => {
    // The declared size (APPNOTE.TXT §4.4.9, uncompressed size) must match what inflates: larger and smaller both mean damage.
    const zip = zipSync({ 'b.txt': [enc('Saltreed Oysters'.repeat(50)), { level: 9 }] });
    const [entry] = listZipEntries(zip);
    for (const declaredSize of [500, 1200]) {
      const e = (() => {
        try {
          inflate(zip, [{ ...entry, declaredSize }], DEFAULT_UPLOAD_LIMITS);
        } catch (err) {
          return err as UploadError;
        }
        throw new Error('expected an UploadError');
      })();
      expect(e.code).toBe('corrupt_zip');
      expect(e.message).toContain(`b.txt unpacks to ${formatBytes(800)}, not the ${formatBytes(declaredSize)} its table of contents declares`);
      expect(e.details).toEqual({ entry: 'b.txt', declaredBytes: declaredSize, inflatedBytes: 800 });
    }
  });
  it.each(inflateWays)('%s stops an entry that passes the budget while inflating, counting what earlier entries took', (_way, inflate) => {
    const text = enc('Saltreed Oysters'.repeat(50));
    const zip = zipSync({ 'a.txt': [text, { level: 9 }], 'b.txt': [text, { level: 9 }] });
    const entries = listZipEntries(zip);
    // b.txt declares 100 bytes, so the declared 900 pass the check; its real 800 after a.txt's 800 pass 1 000.
    const lying = [entries[0], { ...entries[1], declaredSize: 100 }];
    expect(() => inflate(zip, lying, { ...DEFAULT_UPLOAD_LIMITS, maxUncompressedBytes: 1_000 })).toThrow(
      /^The zip expands to more than 1 kB \(unpacking stopped inside b\.txt\)/,
    );
    expect(() => inflate(zip, entries, { ...DEFAULT_UPLOAD_LIMITS, maxUncompressedBytes: 1_000 })).toThrow(/The zip’s files expand to 1\.6 kB/);
  });
  it('hands out an entry’s bytes range by range from a bounded window, and restarts for a range before it', () => {
    // 3 MB of text that deflates about 3:1 (a number per line): far more than one window.
    const lines = Array.from({ length: 200_000 }, (_, i) => `${(i * 7919) % 100_003}`.padStart(14, ' ')).join('\n');
    const text = enc(lines);
    const zip = zipSync({ 'big.txt': [text, { level: 6 }] });
    const [entry] = listZipEntries(zip);
    const reader = openEntryReader(zip, entry, DEFAULT_UPLOAD_LIMITS, { verify: true });
    expect(reader.length).toBe(text.length);
    let largestWindow = 0;
    const again = new Uint8Array(text.length);
    for (let at = 0; at < text.length; at += 4_096) {
      const range = reader.subarray(at, Math.min(text.length, at + 4_096));
      again.set(range, at);
      largestWindow = Math.max(largestWindow, range.buffer.byteLength);
    }
    expect(Buffer.compare(again, text)).toBe(0);
    expect(largestWindow).toBeLessThan(text.length / 10); // about 76 kB: the 4 kB range and one push’s output
    expect(reader.subarray(10, 30)).toEqual(text.subarray(10, 30)); // before the window: inflated again from the start
    expect(reader.finish()).toBe(text.length);
  });
  it('ignores folders, macOS resource forks and desktop files', () => {
    expect(['x/', '__MACOSX/a/._b.shp', 'a/._b.shp', 'a/.DS_Store', 'Thumbs.db', 'a/b.shp'].map(isIgnorableEntry)).toEqual([
      true,
      true,
      true,
      true,
      true,
      false,
    ]);
  });
});
