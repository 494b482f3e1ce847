/**
 * @module shared/geometry/read-geojson
 * Reads a GeoJSON file (RFC 7946) into one layer. Only a FeatureCollection is accepted: a bare Feature,
 * a Geometry or an array is refused with the wrapping that would make it one. Coordinates are WGS 84
 * longitude/latitude by definition (RFC 7946 §4); an old-style `crs` member (2008 GeoJSON specification
 * §3) naming another EPSG code is honoured, with a warning.
 */
import type { Feature, Geometry } from 'geojson';
import type { CrsInfo } from './parsed-upload';
import { UploadError } from './upload-error';
import { featureLimitError, type UploadLimits } from './upload-limits';

/** One GeoJSON layer as read, before the geometry checks of the upload kind. */
export interface GeoJsonLayer {
  name: string;
  crs: CrsInfo;
  fields: string[];
  features: Feature<Geometry | null>[];
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
 * @returns the layer (features as in the file, properties null → {}) and warnings.
 * @throws UploadError invalid_text_encoding / invalid_json (400, with line and column), not_feature_collection,
 *   invalid_geojson, too_many_features (422).
 * @example
 * readGeoJson(new TextEncoder().encode('{"type":"FeatureCollection","features":[]}'), 'leases.geojson', DEFAULT_UPLOAD_LIMITS)
 *   .layer.crs // { found: true, epsg: 4326, name: 'WGS 84' }
 */
export function readGeoJson(bytes: Uint8Array, fileName: string, limits: Pick<UploadLimits, 'maxFeatures'>): GeoJsonReading {
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
  if (list === undefined || !Array.isArray(list)) {
    throw new UploadError(
      'invalid_geojson',
      'The FeatureCollection has no "features" array. A FeatureCollection lists its features as {"type":"FeatureCollection","features":[ … ]}: fix the file and upload again.',
    );
  }
  if (list.length > limits.maxFeatures) throw featureLimitError(list.length, limits);

  const fields: string[] = [];
  const seen = new Set<string>();
  const features: Feature<Geometry | null>[] = list.map((item: unknown, index: number) => {
    if (!isObject(item) || item.type !== 'Feature') {
      const what = Array.isArray(item)
        ? 'an array'
        : isObject(item)
          ? `of type ${JSON.stringify(item.type ?? null)}`
          : JSON.stringify(item);
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
    for (const key of Object.keys(properties)) {
      if (!seen.has(key)) {
        seen.add(key);
        fields.push(key);
      }
    }
    const geometry = (item.geometry ?? null) as Geometry | null;
    const feature: Feature<Geometry | null> = { type: 'Feature', properties, geometry };
    if (typeof item.id === 'string' || typeof item.id === 'number') feature.id = item.id;
    return feature;
  });

  const crs = crsOf(root.crs, warnings);
  const slash = Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\'));
  const base = fileName.slice(slash + 1);
  const name = base.replace(/\.(geo)?json$/i, '') || 'layer';
  return { layer: { name, crs, fields, features }, warnings };
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
