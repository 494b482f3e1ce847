/**
 * @module shared/geometry/read-geojson
 * Reads a GeoJSON file (RFC 7946) into one layer. Only a FeatureCollection is accepted: a bare Feature,
 * a Geometry or an array is refused with the wrapping that would make it one. Coordinates are WGS 84
 * longitude/latitude by definition (RFC 7946 §4); an old-style `crs` member (2008 GeoJSON specification
 * §3) naming another EPSG code is honoured, with a warning.
 *
 * Read whole, the document is parsed at once. Read `lazy`, it is parsed as a stream (@streamparser/json) that
 * hands over one feature at a time and keeps none: one pass checks what the whole read checks, and `chunks`
 * parses the bytes again to build the features a chunk at a time, so all of them never exist at once.
 */
import { JSONParser } from '@streamparser/json';
import type { Feature, Geometry } from 'geojson';
import type { CrsInfo } from './parsed-upload';
import { UploadError } from './upload-error';
import { featureLimitError, type UploadLimits } from './upload-limits';

/** One GeoJSON layer as read, before the geometry checks of the upload kind. */
export interface GeoJsonLayer {
  name: string;
  crs: CrsInfo;
  fields: string[];
  /** Every feature; empty when read with `lazy` (then use `chunks`). */
  features: Feature<Geometry | null>[];
  /** Number of features. */
  count: number;
  /**
   * With `lazy`: the features in consecutive chunks of at most `size`, parsed again from the bytes each time it
   * is iterated, so only one chunk's features exist at a time. Can be iterated more than once.
   */
  chunks?: (size: number) => Generator<Feature<Geometry | null>[]>;
}

/** The result of {@link readGeoJson}. */
export interface GeoJsonReading {
  layer: GeoJsonLayer;
  warnings: string[];
}

const WGS84: CrsInfo = { found: true, epsg: 4326, name: 'WGS 84' };

/**
 * Reads a GeoJSON FeatureCollection.
 *
 * @param bytes - the file, UTF-8 (RFC 8259 §8.1; a byte-order mark is ignored).
 * @param fileName - the uploaded file's name; its basename names the layer.
 * @param limits - maxFeatures is checked as soon as the features are counted.
 * @param options - `lazy`: keep no features (`features` empty); the layer offers `count` and `chunks`. The checks,
 *   verdicts and messages are the whole read's.
 * @returns the layer (features as in the file, properties null → {}) and warnings.
 * @throws UploadError invalid_text_encoding / invalid_json (400, with line and column), not_feature_collection,
 *   invalid_geojson, too_many_features (422).
 * @example
 * readGeoJson(new TextEncoder().encode('{"type":"FeatureCollection","features":[]}'), 'leases.geojson', DEFAULT_UPLOAD_LIMITS)
 *   .layer.crs // { found: true, epsg: 4326, name: 'WGS 84' }
 */
export function readGeoJson(
  bytes: Uint8Array,
  fileName: string,
  limits: Pick<UploadLimits, 'maxFeatures'>,
  options?: { lazy?: boolean },
): GeoJsonReading {
  if (options?.lazy) return readStreamed(bytes, fileName, limits);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(bytes);
  } catch {
    throw new UploadError(
      'invalid_text_encoding',
      'The file is not UTF-8 text, which GeoJSON must be (RFC 8259). Save or export it again as UTF-8 GeoJSON and upload it.',
    );
  }
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    throw jsonError(text, error);
  }
  const warnings: string[] = [];
  const root = checkRoot(doc);
  const list = root.features;
  if (list === undefined || !Array.isArray(list)) throw noFeaturesArray();
  if (list.length > limits.maxFeatures) throw featureLimitError(list.length, limits);

  const fields = new FieldList();
  const features = list.map((item: unknown, index: number) => {
    const feature = toFeature(item, index);
    fields.add(feature.properties);
    return feature;
  });
  const crs = crsOf(root.crs, warnings);
  return { layer: { name: layerName(fileName), crs, fields: fields.names, features, count: features.length }, warnings };
}

/** Bytes handed to the streaming parser at a time (64 KiB: a slice of features at a time, and a slice of text to check). */
const SLICE = 1 << 16;

/** What the streaming parser hands over: the root's `type`, `crs` and `features` members, and each item of `features`. */
const PATHS = ['$.type', '$.crs', '$.features', '$.features.*'];

/** @private One `features` member of the root, as the checking pass saw it (JSON allows a member twice: the last counts). */
interface FeaturesMember {
  isArray: boolean;
  count: number;
  /** The refusal of the first item that is not a Feature, or has properties that are not an object. */
  refusal?: UploadError;
  fields: FieldList;
}

/**
 * @private The lazy read: one streaming pass over the bytes checks the encoding, the syntax and the GeoJSON
 * structure (as the whole read does, in its order of verdicts), keeping only counts, field names and the small root
 * members. A syntax or encoding error is worded by the whole read, which finds its line and column.
 */
function readStreamed(bytes: Uint8Array, fileName: string, limits: Pick<UploadLimits, 'maxFeatures'>): GeoJsonReading {
  const root = rootKind(bytes);
  // A single value (a string, a number…) holds no features: the whole read refuses it as it would. The streaming
  // parser drops a U+FEFF that begins a run of non-ASCII characters in a string (its decoder strips it as a BOM), so
  // a file that holds one past its start is read whole too, for its strings to stay as written.
  if ((root !== 'object' && root !== 'array') || hasInnerBom(bytes)) return asLazy(readGeoJson(bytes, fileName, limits));
  let type: unknown;
  let crsMember: unknown;
  let members = 0;
  let last: FeaturesMember | undefined;
  let current: FeaturesMember = { isArray: false, count: 0, fields: new FieldList() };
  const parser = new JSONParser({ paths: PATHS, keepStack: false });
  parser.onValue = ({ value, key, parent, stack }) => {
    if (stack.length === 1) {
      if (key === 'type') type = value;
      else if (key === 'crs') crsMember = value;
      else {
        // The end of a `features` member: its items were seen one by one before it.
        last = { ...current, isArray: Array.isArray(value) };
        current = { isArray: false, count: 0, fields: new FieldList() };
        members++;
      }
      return;
    }
    drop(parent, key);
    current.count++;
    // Past the first bad item or the limit, items are only counted: the limit's message tells the file's count, and
    // the rest of the file must still be read for a later syntax error, which the whole read would report first.
    if (current.refusal || current.count > limits.maxFeatures) return;
    try {
      current.fields.add(toFeature(value, key as number).properties);
    } catch (error) {
      if (!(error instanceof UploadError)) throw error;
      current.refusal = error;
    }
  };
  try {
    const decoder = new TextDecoder('utf-8', { fatal: true, ignoreBOM: false });
    for (let at = 0; at < bytes.length; at += SLICE) {
      const slice = bytes.subarray(at, at + SLICE);
      decoder.decode(slice, { stream: true });
      parser.write(slice);
    }
    decoder.decode();
    if (!parser.isEnded) parser.end();
  } catch {
    // Not UTF-8 or not JSON: the whole read tells which, and where.
    return asLazy(readGeoJson(bytes, fileName, limits));
  }
  // The whole read's verdicts in its order: the root (checkRoot reads only its `type`), the features array, the limit,
  // the first bad item.
  if (root === 'array') checkRoot([]);
  checkRoot({ type });
  const features = last;
  if (!features?.isArray) throw noFeaturesArray();
  if (features.count > limits.maxFeatures) throw featureLimitError(features.count, limits);
  if (features.refusal) throw features.refusal;
  const warnings: string[] = [];
  const crs = crsOf(crsMember, warnings);
  const lastMember = members;
  const chunks = function* (size: number): Generator<Feature<Geometry | null>[]> {
    let seen = 0;
    let chunk: Feature<Geometry | null>[] = [];
    const ready: Feature<Geometry | null>[][] = [];
    const again = new JSONParser({ paths: PATHS, keepStack: false });
    again.onValue = ({ value, key, parent, stack }) => {
      if (stack.length === 1) {
        if (key === 'features') seen++;
        return;
      }
      drop(parent, key);
      // Items of an earlier `features` member are parsed and dropped: JSON.parse keeps only the last one.
      if (seen !== lastMember - 1) return;
      chunk.push(toFeature(value, key as number));
      if (chunk.length === size) {
        ready.push(chunk);
        chunk = [];
      }
    };
    for (let at = 0; at < bytes.length; at += SLICE) {
      again.write(bytes.subarray(at, at + SLICE));
      yield* ready.splice(0);
    }
    if (!again.isEnded) again.end();
    yield* ready.splice(0);
    if (chunk.length > 0) yield chunk;
  };
  return {
    layer: { name: layerName(fileName), crs, fields: features.fields.names, features: [], count: features.count, chunks },
    warnings,
  };
}

/** @private Whether the document is an object, an array or another value, from its first character after a BOM and whitespace. */
function rootKind(bytes: Uint8Array): 'object' | 'array' | 'value' {
  let i = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  while (bytes[i] === 0x20 || bytes[i] === 0x09 || bytes[i] === 0x0a || bytes[i] === 0x0d) i++;
  return bytes[i] === 0x7b ? 'object' : bytes[i] === 0x5b ? 'array' : 'value';
}

/** @private True when the bytes of U+FEFF (EF BB BF) occur after the first byte. */
function hasInnerBom(bytes: Uint8Array): boolean {
  for (let i = bytes.indexOf(0xef, 1); i !== -1; i = bytes.indexOf(0xef, i + 1)) {
    if (bytes[i + 1] === 0xbb && bytes[i + 2] === 0xbf) return true;
  }
  return false;
}

/**
 * @private Removes an item of `features` from the array (or object) the parser is filling, once handed over: with the
 * `features` member itself among the paths, the parser keeps its items (keepStack drops only what no path asks for).
 */
function drop(parent: unknown, key: unknown): void {
  if (Array.isArray(parent)) parent.length = 0;
  else if (parent && typeof parent === 'object') delete (parent as Record<string, unknown>)[key as string];
}

/**
 * @private A whole reading as a lazy one (features handed out in slices): for the files the streaming parser does not
 * read (see readStreamed), and should it ever refuse bytes that JSON.parse accepts (both follow RFC 8259).
 */
function asLazy(reading: GeoJsonReading): GeoJsonReading {
  const { features } = reading.layer;
  const chunks = function* (size: number): Generator<Feature<Geometry | null>[]> {
    for (let at = 0; at < features.length; at += size) yield features.slice(at, at + size);
  };
  return { ...reading, layer: { ...reading.layer, features: [], chunks } };
}

/** @private Property names in order of first appearance. */
class FieldList {
  readonly names: string[] = [];
  private readonly seen = new Set<string>();
  add(properties: Record<string, unknown> | null): void {
    for (const key of Object.keys(properties ?? {})) {
      if (!this.seen.has(key)) {
        this.seen.add(key);
        this.names.push(key);
      }
    }
  }
}

/** @private An item of `features` as a Feature (properties null → {}, geometry absent → null, id kept when a string or number). */
function toFeature(item: unknown, index: number): Feature<Geometry | null> {
  if (!isObject(item) || item.type !== 'Feature') {
    const what = Array.isArray(item) ? 'an array' : isObject(item) ? `of type ${JSON.stringify(item.type ?? null)}` : JSON.stringify(item);
    throw new UploadError(
      'invalid_geojson',
      `Item ${index} of "features" (counting from 0) is not a GeoJSON Feature: it is ${what}. Every item must be {"type":"Feature","geometry":{…},"properties":{…}}: fix it and upload again.`,
      { index },
    );
  }
  const props = item.properties;
  if (props !== undefined && props !== null && !isObject(props)) {
    throw new UploadError(
      'invalid_geojson',
      `Feature ${index} (counting from 0) has "properties" that are not an object. Properties must be an object such as {"lease_id":"FB-014"} or null: fix it and upload again.`,
      { index },
    );
  }
  const properties = (props ?? {}) as Record<string, unknown>;
  const geometry = (item.geometry ?? null) as Geometry | null;
  const feature: Feature<Geometry | null> = { type: 'Feature', properties, geometry };
  if (typeof item.id === 'string' || typeof item.id === 'number') feature.id = item.id;
  return feature;
}

/** @private The layer's name: the file's basename without .geojson or .json. */
function layerName(fileName: string): string {
  const slash = Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\'));
  return fileName.slice(slash + 1).replace(/\.(geo)?json$/i, '') || 'layer';
}

/** @private */
function noFeaturesArray(): UploadError {
  return new UploadError(
    'invalid_geojson',
    'The FeatureCollection has no "features" array. A FeatureCollection lists its features as {"type":"FeatureCollection","features":[ … ]}: fix the file and upload again.',
  );
}

/** @private */
function isObject(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

const GEOMETRY_TYPES = new Set(['Point', 'MultiPoint', 'LineString', 'MultiLineString', 'Polygon', 'MultiPolygon', 'GeometryCollection']);

/** @private Accepts only a FeatureCollection; explains how to wrap anything else. */
function checkRoot(doc: unknown): Record<string, unknown> {
  if (Array.isArray(doc)) {
    throw new UploadError(
      'not_feature_collection',
      'The file holds a JSON array, not a GeoJSON FeatureCollection. If it is a list of features, wrap it as {"type":"FeatureCollection","features":[ …your list… ]} and upload again.',
      { found: 'array' },
    );
  }
  if (!isObject(doc)) {
    throw new UploadError(
      'not_feature_collection',
      'The file holds a single JSON value, not a GeoJSON FeatureCollection. Upload a FeatureCollection: {"type":"FeatureCollection","features":[ … ]}.',
      { found: typeof doc },
    );
  }
  const type = doc.type;
  if (type === 'FeatureCollection') return doc;
  if (type === 'Feature') {
    throw new UploadError(
      'not_feature_collection',
      'The file holds a single GeoJSON Feature, not a FeatureCollection. Wrap it as {"type":"FeatureCollection","features":[ …your feature… ]} and upload again.',
      { found: 'Feature' },
    );
  }
  if (typeof type === 'string' && GEOMETRY_TYPES.has(type)) {
    throw new UploadError(
      'not_feature_collection',
      `The file holds a bare ${type} geometry, not a FeatureCollection. Wrap it as {"type":"FeatureCollection","features":[{"type":"Feature","properties":{},"geometry": …your ${type}… }]} and upload again.`,
      { found: type },
    );
  }
  if (type === 'Topology') {
    throw new UploadError(
      'not_feature_collection',
      'The file is TopoJSON, not GeoJSON. Convert it to a GeoJSON FeatureCollection (or export a zipped shapefile) and upload that.',
      { found: 'Topology' },
    );
  }
  throw new UploadError(
    'not_feature_collection',
    `The file is JSON but not a GeoJSON FeatureCollection (its "type" is ${JSON.stringify(type ?? null)}). Upload a FeatureCollection: {"type":"FeatureCollection","features":[ … ]}.`,
    { found: typeof type === 'string' ? type : null },
  );
}

/** @private RFC 7946 GeoJSON is WGS 84; an old-style named crs is honoured when it names an EPSG code. */
function crsOf(member: unknown, warnings: string[]): CrsInfo {
  if (member === undefined || member === null) return { ...WGS84 };
  const name =
    isObject(member) && isObject(member.properties) && typeof member.properties.name === 'string'
      ? member.properties.name.trim()
      : undefined;
  if (name && /(^|:)CRS84$/i.test(name)) return { ...WGS84 };
  const m = name
    ? /^(?:urn:ogc:def:crs:EPSG:[\d.]*:|EPSG:+|https?:\/\/www\.opengis\.net\/def\/crs\/EPSG\/[\d.]+\/)(\d+)$/i.exec(name)
    : null;
  if (!m) {
    warnings.push(
      `The file has an old-style "crs" member that does not name an EPSG code (${JSON.stringify(member).slice(0, 80)}); it was ignored and the coordinates read as WGS 84 longitude/latitude, as GeoJSON requires.`,
    );
    return { ...WGS84 };
  }
  const epsg = Number(m[1]);
  if (epsg === 4326 || epsg === 4979) return { ...WGS84 };
  warnings.push(
    `The file’s "crs" member says its coordinates are in EPSG:${epsg}. GeoJSON today is always WGS 84 longitude/latitude (RFC 7946), ` +
      `but this older declaration was honoured: the features will be converted from EPSG:${epsg}. If that is wrong, export the file again as plain WGS 84 GeoJSON.`,
  );
  return { found: true, epsg, name: `EPSG:${epsg}` };
}

/** @private 400 with the error's position as line and column (found by our own scan, the same in every engine). */
function jsonError(text: string, error: unknown): UploadError {
  const raw = error instanceof Error ? error.message : String(error);
  let position = jsonErrorOffset(text);
  if (position === undefined) {
    const pos = /position (\d+)/i.exec(raw);
    if (pos) position = Number(pos[1]);
    else if (/unexpected end/i.test(raw)) position = text.length;
  }
  let line: number | undefined;
  let column: number | undefined;
  if (position !== undefined) {
    const before = text.slice(0, position);
    line = before.split('\n').length;
    column = position - before.lastIndexOf('\n');
  }
  const where =
    position !== undefined && position >= text.length
      ? `it ends too early, at line ${line}, column ${column} (a closing bracket, brace or quote is missing)`
      : position !== undefined
        ? `the error is at line ${line}, column ${column} (character ${position})`
        : 'the position of the error could not be determined';
  // Engines echo the source in the message ('… "[NaN]" is not valid JSON'): keep only the reason.
  const reason = raw
    .replace(/, [\s\S]* is not valid JSON$/, '')
    .replace(/\s*\(line \d+ column \d+\)/i, '')
    .replace(/^JSON\.parse: /, '')
    .slice(0, 120);
  return new UploadError(
    'invalid_json',
    `The file is not valid JSON: ${where}. The parser said: "${reason}". Look for a missing comma, quote or bracket there (NaN and Infinity are not allowed either), fix it and upload again.`,
    { ...(position !== undefined ? { position, line, column } : {}) },
  );
}

/**
 * @private Offset of the first JSON syntax error (RFC 8259 grammar), or undefined when the text is valid
 * JSON or nesting is too deep to scan.
 */
function jsonErrorOffset(text: string): number | undefined {
  const n = text.length;
  let i = 0;
  const fail = (): never => {
    throw i;
  };
  const ws = () => {
    while (i < n && (text[i] === ' ' || text[i] === '\t' || text[i] === '\n' || text[i] === '\r')) i++;
  };
  const string = () => {
    i++; // opening quote
    for (;;) {
      if (i >= n) fail();
      const ch = text.charCodeAt(i);
      if (ch === 0x22) {
        i++;
        return;
      }
      if (ch < 0x20) fail();
      if (ch === 0x5c) {
        const e = text[i + 1];
        if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else if (e === 'u') {
          for (let k = 2; k < 6; k++) {
            if (!/[0-9a-fA-F]/.test(text[i + k] ?? '')) {
              i += k;
              fail();
            }
          }
          i += 6;
        } else {
          i += 1;
          fail();
        }
        continue;
      }
      i++;
    }
  };
  const digit = () => i < n && text.charCodeAt(i) >= 0x30 && text.charCodeAt(i) <= 0x39;
  const number = () => {
    if (text[i] === '-') i++;
    if (text[i] === '0') i++;
    else if (digit()) while (digit()) i++;
    else fail();
    if (text[i] === '.') {
      i++;
      if (!digit()) fail();
      while (digit()) i++;
    }
    if (text[i] === 'e' || text[i] === 'E') {
      i++;
      if (text[i] === '+' || text[i] === '-') i++;
      if (!digit()) fail();
      while (digit()) i++;
    }
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') fail();
        string();
        ws();
        if (text[i] !== ':') fail();
        i++;
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === '}') {
          i++;
          return;
        }
        fail();
      }
    }
    if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (;;) {
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === ']') {
          i++;
          return;
        }
        fail();
      }
    }
    if (c === '"') {
      string();
      return;
    }
    if (c === '-' || digit()) {
      number();
      return;
    }
    for (const literal of ['true', 'false', 'null']) {
      if (c !== literal[0]) continue;
      for (let k = 0; k < literal.length; k++, i++) if (text[i] !== literal[k]) fail();
      return;
    }
    fail();
  };
  try {
    value();
    ws();
    if (i < n) fail();
    return undefined;
  } catch (e) {
    return typeof e === 'number' ? Math.min(e, n) : undefined;
  }
}
