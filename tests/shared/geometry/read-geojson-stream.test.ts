/**
 * The streamed GeoJSON read (readGeoJson's `lazy` option) against the whole read: the features its chunks build, the
 * fields, the CRS and the warnings must be the whole read's, and every refusal the whole read makes must come with the
 * same code, message and details. JSON lets the root's members come in any order and repeat (RFC 8259 §4: the last
 * one counts in JSON.parse), so the fixtures put `type`, `crs` and `features` in unusual places too.
 */
import type { Feature, Geometry } from 'geojson';
import { describe, expect, it, vi } from 'vitest';
import { type GeoJsonReading, readGeoJson } from '../../../shared/geometry/read-geojson';
import { isUploadError } from '../../../shared/geometry/upload-error';
import { squarePolygon } from './square-polygon';

const enc = (s: string) => new TextEncoder().encode(s);
const LIMITS = { maxFeatures: 50_000 };
const point = (x: number, y: number) => ({ type: 'Point', coordinates: [x, y] });
const square = (x: number, y: number, d = 0.001) => squarePolygon(x, y, d);

function gathered(reading: GeoJsonReading, size: number): Feature<Geometry | null>[][] {
  return [...reading.layer.chunks!(size)];
}

/**
 * A read in comparable form: its refusal, or its features (gathered from chunks of 2 when lazy), the rest of its layer
 * and its warnings; and whether it parsed the whole document with JSON.parse (the lazy read does only to word a syntax
 * or encoding error, and for the few files it leaves to the whole read).
 */
function outcome(bytes: Uint8Array, lazy: boolean, limits = LIMITS) {
  const parse = vi.spyOn(JSON, 'parse');
  try {
    const { layer, warnings } = readGeoJson(bytes, 'leases.geojson', limits, { lazy });
    const features = lazy ? [...layer.chunks!(2)].flat() : layer.features;
    return {
      read: { features, layer: { ...layer, features: undefined, chunks: undefined }, warnings },
      parsedWhole: parse.mock.calls.length > 0,
    };
  } catch (e) {
    if (!isUploadError(e)) throw e;
    return {
      refusal: { code: e.code, status: e.status, message: e.message, details: e.details },
      parsedWhole: parse.mock.calls.length > 0,
    };
  } finally {
    parse.mockRestore();
  }
}

/** Many features with text that is not ASCII, so that the 64 KiB slices the parser is fed cut through characters. */
function large(count: number): string {
  const features = Array.from({ length: count }, (_, i) => ({
    type: 'Feature',
    id: i,
    properties: { LEASE_ID: `GRÜN-${i}`, HOLDER: i % 2 ? 'Huîtres de la Vasière' : '牡蠣養殖場'.repeat(12), NOTE: '✓'.repeat(i % 5) },
    geometry: square(-2.9 + (i % 100) * 0.002, 47.5 + Math.floor(i / 100) * 0.002),
  }));
  return JSON.stringify({ type: 'FeatureCollection', name: 'grün', features });
}

const accepted: Record<string, string> = {
  'a crs member naming EPSG:27700 (honoured, with a warning)': JSON.stringify({
    type: 'FeatureCollection',
    crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::27700' } },
    features: [
      { type: 'Feature', properties: { LEASE_ID: 'FB-1' }, geometry: square(400000, 100000, 50) },
      { type: 'Feature', properties: { LEASE_ID: 'FB-2' }, geometry: square(400100, 100000, 50) },
      { type: 'Feature', properties: { LEASE_ID: 'FB-3' }, geometry: square(400200, 100000, 50) },
    ],
  }),
  'a crs member that names no EPSG code (ignored, with a warning)': JSON.stringify({
    type: 'FeatureCollection',
    features: [{ type: 'Feature', properties: {}, geometry: point(1, 2) }],
    crs: { type: 'link', properties: { href: 'http://example.org/crs' } },
  }),
  'properties null or absent, geometry null or absent': JSON.stringify({
    type: 'FeatureCollection',
    features: [
      { type: 'Feature', properties: null, geometry: point(1, 2) },
      { type: 'Feature', geometry: null },
      { type: 'Feature', properties: { a: 1 } },
    ],
  }),
  'string and number ids kept, other ids dropped': JSON.stringify({
    type: 'FeatureCollection',
    features: [
      { type: 'Feature', id: 'a-1', properties: {}, geometry: point(0, 0) },
      { type: 'Feature', id: 7, properties: {}, geometry: point(0, 1) },
      { type: 'Feature', id: { nested: true }, properties: {}, geometry: point(0, 2) },
      { type: 'Feature', id: null, properties: {}, geometry: point(0, 3) },
      { type: 'Feature', id: -0.5, properties: {}, geometry: point(0, 4) },
    ],
  }),
  'fields in mixed order, first appearance counting': `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"B":1,"A":2},"geometry":null},{"type":"Feature","properties":{"C":3,"A":4,"":5,"__proto__":6},"geometry":null},{"type":"Feature","properties":{"D":null,"B":[1,{"x":"y"}],"2":true,"1":false},"geometry":null}]}`,
  'features first, crs and type after them': `{"features":[{"geometry":{"coordinates":[1.5,2.5],"type":"Point"},"properties":{"k":"v"},"type":"Feature"}],"crs":{"type":"name","properties":{"name":"EPSG:3857"}},"type":"FeatureCollection"}`,
  'other root members around the features (bbox, name, a nested features key)': `{"bbox":[0,0,1,1],"name":{"features":[1,2,3]},"type":"FeatureCollection","features":[{"type":"Feature","properties":{"features":[4]},"geometry":null}],"extra":[{"type":"Feature"}]}`,
  'a features member given twice (the last one counts)': `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"old":1},"geometry":null},7],"features":[{"type":"Feature","properties":{"new":1},"geometry":{"type":"Point","coordinates":[3,4]}}]}`,
  'a type member given twice (the last one counts)': `{"type":"Feature","features":[],"type":"FeatureCollection"}`,
  'an empty features array': '{"type":"FeatureCollection","features":[]}',
  'a byte-order mark, whitespace and escapes': `\ufeff \n\t{ "type" : "FeatureCollection" ,\r\n "features" : [ { "type" : "Feature" , "properties" : { "n\\u00e9e" : "a\\"b\\\\c\\/d\\n\\u2713\\ud83d\\ude00" , "e" : 1E3 , "f" : -0 } , "geometry" : null } ] } \n`,
  'U+FEFF inside a property value and a key': `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"\ufeffLEASE_ID":"\ufeffFB-1","x":"é\ufeff"},"geometry":null}]}`,
  'several thousand features with text that is not ASCII, over many slices': large(6_000),
};

describe('streamed GeoJSON read: the same layer as the whole read', () => {
  it.each(Object.entries(accepted))('%s', (name, text) => {
    const bytes = enc(text);
    // Streamed, not handed to the whole read (except a file holding U+FEFF past its start: see readStreamed).
    expect(outcome(bytes, true).parsedWhole).toBe(name.startsWith('U+FEFF'));
    const whole = readGeoJson(bytes, 'leases.geojson', LIMITS);
    const lazy = readGeoJson(bytes, 'leases.geojson', LIMITS, { lazy: true });
    expect(lazy.layer.features).toEqual([]);
    expect(lazy.layer.count).toBe(whole.layer.features.length);
    expect(whole.layer.count).toBe(whole.layer.features.length);
    expect(lazy.layer.fields).toEqual(whole.layer.fields);
    expect(lazy.layer.crs).toEqual(whole.layer.crs);
    expect(lazy.layer.name).toBe(whole.layer.name);
    expect(lazy.warnings).toEqual(whole.warnings);
    for (const size of [1, 2, 1000]) {
      const chunks = gathered(lazy, size);
      expect(chunks.flat()).toEqual(whole.layer.features);
      // Consecutive chunks of `size`, the last one holding what is left.
      expect(chunks.map((c) => c.length)).toEqual(
        Array.from({ length: Math.ceil(whole.layer.features.length / size) }, (_, i) =>
          Math.min(size, whole.layer.features.length - i * size),
        ),
      );
    }
  });

  it('keeps ids, field order, a __proto__ key, the last features member, a late crs and U+FEFF', () => {
    const ids = readGeoJson(enc(accepted['string and number ids kept, other ids dropped']), 'a.geojson', LIMITS, { lazy: true });
    expect(gathered(ids, 10)[0].map((f) => f.id)).toEqual(['a-1', 7, undefined, undefined, -0.5]);
    const mixed = readGeoJson(enc(accepted['fields in mixed order, first appearance counting']), 'a.geojson', LIMITS, { lazy: true });
    expect(mixed.layer.fields).toEqual(['B', 'A', 'C', '', '__proto__', '1', '2', 'D']);
    const props = gathered(mixed, 10)[0][1].properties!;
    expect(Object.getPrototypeOf(props)).toBe(Object.prototype);
    expect(Object.getOwnPropertyDescriptor(props, '__proto__')?.value).toBe(6);
    const twice = readGeoJson(enc(accepted['a features member given twice (the last one counts)']), 'a.geojson', LIMITS, { lazy: true });
    expect(twice.layer.fields).toEqual(['new']);
    expect(gathered(twice, 10).flat()).toHaveLength(1);
    const late = readGeoJson(enc(accepted['features first, crs and type after them']), 'a.geojson', LIMITS, { lazy: true });
    expect(late.layer.crs).toEqual({ found: true, epsg: 3857, name: 'EPSG:3857' });
    expect(late.warnings).toHaveLength(1);
    const bom = readGeoJson(enc(accepted['U+FEFF inside a property value and a key']), 'a.geojson', LIMITS, { lazy: true });
    expect(gathered(bom, 1)[0][0].properties).toEqual({ '\ufeffLEASE_ID': '\ufeffFB-1', x: 'é\ufeff' });
  });

  it('has a large fixture whose 64 KiB slices (the reader’s) cut through characters', () => {
    const bytes = enc(accepted['several thousand features with text that is not ASCII, over many slices']);
    const cuts = Array.from({ length: Math.floor(bytes.length / 65_536) }, (_, k) => bytes[(k + 1) * 65_536]).filter(
      (b) => (b & 0xc0) === 0x80,
    );
    expect(cuts.length).toBeGreaterThan(0);
  });

  it('builds the features again on every pass, from the bytes', () => {
    const lazy = readGeoJson(enc(large(3)), 'a.geojson', LIMITS, { lazy: true });
    const first = gathered(lazy, 2).flat();
    const second = gathered(lazy, 2).flat();
    expect(second).toEqual(first);
    expect(second[0]).not.toBe(first[0]);
    expect(second[0].geometry).not.toBe(first[0].geometry);
  });
});

const refused: Record<string, string | Uint8Array> = {
  'an empty file': '',
  'only whitespace': ' \n\t ',
  'a syntax error (a missing comma)': '{"type":"FeatureCollection","features":[{"type":"Feature"} {"type":"Feature"}]}',
  'a trailing comma': '{"type":"FeatureCollection","features":[],}',
  'cut short': '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"a":',
  'text after the document': '{"type":"FeatureCollection","features":[]} {}',
  'NaN among the coordinates':
    '{"type":"FeatureCollection","features":[{"type":"Feature","geometry":{"type":"Point","coordinates":[NaN,1]}}]}',
  'a control character in a string': '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"a":"x\u0001y"}}]}',
  'a second byte-order mark': '\ufeff\ufeff{"type":"FeatureCollection","features":[]}',
  'not UTF-8 (Latin-1 é) near the end': Uint8Array.from([
    ...enc('{"type":"FeatureCollection","features":[],"name":"Vasi'),
    0xe9,
    ...enc('re"}'),
  ]),
  'not UTF-8 after a syntax error': Uint8Array.from([...enc('{"type":"FeatureCollection" "features":[],"name":"'), 0xff, ...enc('"}')]),
  'a UTF-8 sequence cut at the end': Uint8Array.from([...enc('{"type":"FeatureCollection","features":[]}'), 0xe2, 0x9c]),
  'a JSON array of features': JSON.stringify([{ type: 'Feature', properties: {}, geometry: point(0, 0) }]),
  'a bare Feature': JSON.stringify({ type: 'Feature', properties: {}, geometry: point(0, 0) }),
  'a bare Polygon': JSON.stringify(square(0, 0)),
  TopoJSON: '{"type":"Topology","objects":{},"arcs":[]}',
  'a string': '"FeatureCollection"',
  'a number': '42',
  null: 'null',
  'an object without a type': '{"features":[]}',
  'a type that is not a string': '{"type":{"name":"FeatureCollection"},"features":[]}',
  'a Feature type given after the features (whose items are wrong too)': '{"features":[1,2,3],"type":"Feature"}',
  'no features member': '{"type":"FeatureCollection"}',
  'features that are an object': '{"type":"FeatureCollection","features":{"0":{"type":"Feature"}}}',
  'features null': '{"type":"FeatureCollection","features":null}',
  'an array of features followed by features null': '{"type":"FeatureCollection","features":[{"type":"Feature"}],"features":null}',
  'an item that is a Polygon': JSON.stringify({
    type: 'FeatureCollection',
    features: [{ type: 'Feature' }, { type: 'Feature' }, square(0, 0)],
  }),
  'an item that is an array': '{"type":"FeatureCollection","features":[{"type":"Feature"},[1,2]]}',
  'an item that is a number': '{"type":"FeatureCollection","features":[3]}',
  'an item without a type': '{"type":"FeatureCollection","features":[{"properties":{}}]}',
  'properties that are an array': '{"type":"FeatureCollection","features":[{"type":"Feature","properties":[1]}]}',
  'properties that are a string, after a bad item':
    '{"type":"FeatureCollection","features":[{"type":"Feature","properties":"x"},{"type":"Point"}]}',
  'the first bad item in the last features member':
    '{"type":"FeatureCollection","features":[1],"features":[{"type":"Feature"},{"type":"Feature","properties":7}]}',
  'more features than the limit': JSON.stringify({
    type: 'FeatureCollection',
    features: Array.from({ length: 8 }, () => ({ type: 'Feature' })),
  }),
  'more features than the limit, one of them bad (the limit is told)': JSON.stringify({
    type: 'FeatureCollection',
    features: [{ type: 'Feature' }, 1, 2, 3, 4, 5, 6, 7],
  }),
  'more features than the limit, type after them': `{"features":[${Array(9).fill('{"type":"Feature"}').join(',')}],"type":"FeatureCollection"}`,
  'more features than the limit in a collection that is a Feature': `{"features":[${Array(9).fill('{"type":"Feature"}').join(',')}],"type":"Feature"}`,
  'more features than the limit, then a syntax error': `{"type":"FeatureCollection","features":[${Array(9).fill('{"type":"Feature"}').join(',')}],"x":tru}`,
};

describe('streamed GeoJSON read: the same refusals as the whole read', () => {
  it.each(Object.entries(refused))('%s', (name, content) => {
    const bytes = typeof content === 'string' ? enc(content) : content;
    const limits = { maxFeatures: 5 };
    const whole = outcome(bytes, false, limits);
    const lazy = outcome(bytes, true, limits);
    expect(whole.refusal).toBeDefined();
    expect(lazy.refusal).toEqual(whole.refusal);
    // Only a syntax error (or an encoding error, found before any parse), or a root that is a single value, is worded
    // by the whole read.
    const single = ['a string', 'a number', 'null'].includes(name);
    expect(lazy.parsedWhole).toBe(single || whole.refusal!.code === 'invalid_json');
  });

  it('keeps the line and column of a syntax error deep in a large file', () => {
    const text = large(6_000).replace('"GRÜN-5432"', '"GRÜN-5432" "x"');
    const lazy = outcome(enc(text), true);
    expect(lazy.refusal).toEqual(outcome(enc(text), false).refusal);
    expect(lazy.refusal?.code).toBe('invalid_json');
    expect(lazy.refusal?.message).toMatch(/^The file is not valid JSON: the error is at line 1, column \d+ \(character \d+\)/);
  });

  it('gives the whole read’s verdict on 2 000 damaged copies of a small collection', () => {
    // Deterministic damage (a linear congruential generator): characters deleted, JSON punctuation or words inserted,
    // the text cut short. Most copies are refused (syntax, structure, items); the rest are read.
    const base = JSON.stringify({
      type: 'FeatureCollection',
      crs: { type: 'name', properties: { name: 'EPSG:27700' } },
      features: [
        { type: 'Feature', id: 1, properties: { a: 1, b: null }, geometry: point(1, 2) },
        { type: 'Feature', properties: null, geometry: null },
        { properties: { c: 'xé' }, type: 'Feature', geometry: point(100, -0) },
      ],
    });
    const words = [
      '{',
      '}',
      '[',
      ']',
      ',',
      ':',
      '"',
      '\\',
      ' ',
      '0',
      '-',
      '.',
      'e',
      'null',
      'true',
      '"type"',
      '"features"',
      '"Feature"',
      '"crs"',
      'é',
    ];
    let seed = 12_345;
    const random = () => {
      seed = (seed * 1_103_515_245 + 12_345) % 2_147_483_648;
      return seed / 2_147_483_648;
    };
    const verdicts = new Map<string, number>();
    for (let n = 0; n < 2_000; n++) {
      let text = base;
      for (let k = 1 + Math.floor(random() * 3); k > 0; k--) {
        const at = Math.floor(random() * text.length);
        const what = random();
        if (what < 0.4) text = text.slice(0, at) + text.slice(at + 1 + Math.floor(random() * 3));
        else if (what < 0.85) text = text.slice(0, at) + words[Math.floor(random() * words.length)] + text.slice(at);
        else text = text.slice(0, at);
      }
      const whole = outcome(enc(text), false);
      const lazy = outcome(enc(text), true);
      expect(lazy.refusal ?? lazy.read, text).toEqual(whole.refusal ?? whole.read);
      const verdict = whole.refusal?.code ?? 'read';
      verdicts.set(verdict, (verdicts.get(verdict) ?? 0) + 1);
    }
    // The damage reaches every kind of verdict.
    expect([...verdicts.keys()].sort()).toEqual(['invalid_geojson', 'invalid_json', 'not_feature_collection', 'read']);
  });
});
