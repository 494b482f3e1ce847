/**
 * @module shared/geometry/read-kml-gpx
 * KML 2.2 (OGC 07-147r2), KMZ (a zip holding the KML) and GPX 1.1 files → upload layers in WGS 84.
 * The XML is parsed with @xmldom/xmldom (the same in Node and the browser) and converted with
 * @tmcw/togeojson. KML folders become layers (named by their folder path); placemarks outside any
 * folder form one layer named after the document. MultiGeometry of one kind becomes a Multi* geometry;
 * ExtendedData (Data and SchemaData) become attributes beside the placemark's name and description;
 * style properties are left out. GPX tracks and routes are lines: a lease or zone upload turns them into
 * polygons only when the user confirms (`tracksAsPolygons`), closing a track whose ends do not meet.
 *
 * Pure: bytes in, features out; no I/O.
 */
import { DOMParser } from '@xmldom/xmldom';
import { gpx as gpxToGeoJson, kmlWithFolders } from '@tmcw/togeojson';
import type { Feature, Geometry, Position } from 'geojson';
import type { CrsInfo, UploadKind } from './parsed-upload';
import { inflateEntries, isIgnorableEntry, listZipEntries } from './unzip-entries';
import { UploadError } from './upload-error';
import type { UploadLimits } from './upload-limits';

/** One layer as read from a KML, KMZ or GPX file (features in WGS 84 lon/lat, heights kept for checkGeometries to drop). */
export interface XmlLayer {
  name: string;
  crs: CrsInfo;
  fields: string[];
  features: Feature<Geometry | null>[];
}

/** What {@link readKmlOrGpx} returns. */
export interface XmlReading {
  format: 'kml' | 'kmz' | 'gpx';
  layers: XmlLayer[];
  warnings: string[];
}

/** Options for the GPX track step. */
export interface XmlReadOptions {
  /** The user confirmed that each GPX track or route outlines an area: turn them into polygons. */
  tracksAsPolygons?: boolean;
}

/** KML and GPX coordinates are WGS 84 longitude/latitude by definition (KML 2.2 §6.2, GPX 1.1 schema). */
export const WGS84_CRS: CrsInfo = { found: true, epsg: 4326, name: 'WGS 84' };

/** Ends of a track closer than this count as closed [m] (common practice: a phone GPS fix is good to 5–20 m). */
export const CLOSED_TRACK_TOLERANCE_M = 25;

/** Properties togeojson adds from styles, timestamps and links: not attributes of a lease. */
const STYLE_PROPERTIES = new Set([
  'styleUrl',
  'styleHash',
  'styleMapHash',
  'stroke',
  'stroke-opacity',
  'stroke-width',
  'fill',
  'fill-opacity',
  'icon',
  'icon-opacity',
  'icon-color',
  'icon-scale',
  'icon-heading',
  'icon-offset',
  'icon-offset-units',
  'label-color',
  'label-opacity',
  'label-scale',
  'visibility',
  'timespan',
  'timestamp',
  'coordinateProperties',
  'link',
  '_gpxType',
  'type',
  '@geometry-type',
]);

/**
 * Parses XML text, refusing a document the parser cannot read with the line and column of the fault.
 *
 * @param text - the XML.
 * @param fileName - for the message.
 * @returns the DOM document.
 * @throws UploadError invalid_xml (400).
 * @example
 * parseXml('<kml/>', 'a.kml').documentElement.localName // 'kml'
 */
export function parseXml(text: string, fileName: string): ReturnType<DOMParser['parseFromString']> {
  try {
    const doc = new DOMParser({
      onError: (level, message) => {
        if (level !== 'warning') throw new Error(message);
      },
    }).parseFromString(text, 'text/xml');
    if (!doc.documentElement) throw new Error('no root element');
    return doc;
  } catch (err) {
    const raw = err instanceof Error ? err.message : String(err);
    const where = /line:?\s*(\d+)[^\d]+(?:col(?:umn)?:?\s*)?(\d+)/i.exec(raw);
    throw new UploadError(
      'invalid_xml',
      `${fileName} is not well-formed XML${where ? ` (the error is at line ${where[1]}, column ${where[2]})` : ''}: ${raw.split('\n')[0].replace(/^\[xmldom [a-zA-Z]+\]\s*/, '')}. ` +
        'The file may be cut short or edited by hand; export it again from the program that made it and upload that.',
      where ? { line: Number(where[1]), column: Number(where[2]) } : undefined,
    );
  }
}

/**
 * Reads a KML, KMZ or GPX upload.
 *
 * @param bytes - the file.
 * @param fileName - its name (messages; the default layer name).
 * @param kind - the upload kind (GPX tracks become polygons only for lease/zone, when confirmed).
 * @param limits - zip limits for a KMZ.
 * @param isZip - true for a KMZ (zip) upload.
 * @param options - see {@link XmlReadOptions}.
 * @returns the layers (WGS 84) and warnings.
 * @throws UploadError invalid_xml, invalid_text_encoding, unsupported_format (XML that is neither KML nor GPX),
 *   no_kml_in_kmz, no_features (no placemarks / empty GPX), tracks_need_confirmation.
 * @example
 * readKmlOrGpx(bytes, 'leases.kmz', 'lease', DEFAULT_UPLOAD_LIMITS, true).layers[0].features.length // 4
 */
export function readKmlOrGpx(
  bytes: Uint8Array,
  fileName: string,
  kind: UploadKind,
  limits: Pick<UploadLimits, 'maxUncompressedBytes'>,
  isZip: boolean,
  options: XmlReadOptions = {},
): XmlReading {
  let text: string;
  let format: XmlReading['format'];
  let label = fileName;
  let linked: ((href: string) => { text: string; label: string } | undefined) | undefined;
  if (isZip) {
    format = 'kmz';
    const entries = listZipEntries(bytes).filter((e) => !e.isDirectory && !isIgnorableEntry(e.path));
    // KML 2.2 §C.2 (KMZ): the first .kml at the archive's root is the document, conventionally doc.kml.
    const kmls = entries.filter((e) => /\.kml$/i.test(e.path));
    const chosen = kmls.find((e) => e.path.toLowerCase() === 'doc.kml') ?? kmls.find((e) => !e.path.includes('/')) ?? kmls[0];
    if (!chosen) {
      throw new UploadError(
        'no_kml_in_kmz',
        `${fileName} is a KMZ (zip) without a doc.kml or any other .kml file inside; it holds ${entries.length ? entries.slice(0, 5).map((e) => e.path).join(', ') : 'nothing'}. ` +
          'Save the places again as KMZ or KML from your globe viewer and upload that file.',
        { entries: entries.map((e) => e.path) },
      );
    }
    label = `${fileName} (${chosen.path})`;
    const inflated = inflateEntries(bytes, kmls, limits);
    text = decodeUtf8(inflated.get(chosen.path)!, label);
    linked = (href) => {
      const target = kmls.find((e) => e.path === href.replace(/^\.\//, ''));
      return target && target !== chosen ? { text: decodeUtf8(inflated.get(target.path)!, `${fileName} (${target.path})`), label: `${fileName} (${target.path})` } : undefined;
    };
  } else {
    text = decodeUtf8(bytes, fileName);
    format = 'kml';
  }
  const doc = parseXml(text, label);
  const root = doc.documentElement!;
  const rootName = (root.localName ?? root.nodeName).toLowerCase();
  if (rootName === 'gpx' && !isZip) return readGpx(doc, fileName, kind, options);
  if (rootName !== 'kml') {
    throw new UploadError(
      'unsupported_format',
      `${label} is XML whose root element is <${root.nodeName}>, not KML (<kml>) or GPX (<gpx>); GML and other XML formats are not read. ` +
        'Export the layer as KML, KMZ, GPX, GeoPackage, a zipped shapefile or GeoJSON and upload that.',
      { fileName, detected: root.nodeName },
    );
  }
  return { format, ...readKml(doc, fileName, linked) };
}

function decodeUtf8(bytes: Uint8Array, label: string): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    // An XML declaration may name another encoding; KML must be UTF-8 (KML 2.2 §6.1), GPX files are in practice.
    const head = new TextDecoder('latin1').decode(bytes.subarray(0, 200));
    const declared = /encoding=["']([A-Za-z0-9_-]+)["']/.exec(head)?.[1];
    if (declared && !/^utf-?8$/i.test(declared)) {
      try {
        return new TextDecoder(declared.toLowerCase()).decode(bytes);
      } catch {
        /* unknown label: fall through to the refusal */
      }
    }
    throw new UploadError(
      'invalid_text_encoding',
      `${label} is not UTF-8 text, which KML must be. Save it again as UTF-8 (most programs do by default) and upload again.`,
    );
  }
}

type Tree = ReturnType<typeof kmlWithFolders>;
type Node = Tree['children'][number];

function readKml(
  doc: ReturnType<typeof parseXml>,
  fileName: string,
  linked?: (href: string) => { text: string; label: string } | undefined,
): Omit<XmlReading, 'format'> {
  const warnings: string[] = [];
  const groups = new Map<string, Feature<Geometry | null>[]>();
  // NetworkLinks are not placemarks: a KMZ may link the KML files it holds (GDAL writes one per layer); links to
  // the web are not followed (the server fetches nothing).
  const links = Array.from(doc.getElementsByTagName('NetworkLink'));
  for (const link of links) {
    const href = link.getElementsByTagName('href')[0]?.textContent?.trim() ?? '';
    const inside = href && linked ? linked(href) : undefined;
    if (inside) {
      const sub = readKml(parseXml(inside.text, inside.label), fileName);
      for (const l of sub.layers) groups.set(groups.has(l.name) ? `${l.name} (${href})` : l.name, l.features);
      warnings.push(...sub.warnings);
    } else if (href) {
      warnings.push(`The network link to ${href} was not followed: save the linked places into the file itself if you need them.`);
    }
    link.parentNode?.removeChild(link);
  }
  const tree = kmlWithFolders(doc as unknown as Parameters<typeof kmlWithFolders>[0]);
  const docName = textOf(doc.getElementsByTagName('Document')[0], 'name') ?? fileName.replace(/\.(kml|kmz)$/i, '');
  const walk = (nodes: Node[], path: string) => {
    for (const node of nodes) {
      if (node.type === 'folder') {
        const name = String(node.meta.name ?? 'Folder').trim() || 'Folder';
        walk(node.children as Node[], path ? `${path}/${name}` : name);
      } else {
        const key = path || docName;
        if (!groups.has(key)) groups.set(key, []);
        groups.get(key)!.push(node as Feature<Geometry | null>);
      }
    }
  };
  walk(tree.children, '');
  const layers: XmlLayer[] = [];
  for (const [name, raw] of groups) {
    const features = raw.map((f) => ({ type: 'Feature' as const, properties: cleanProperties(f.properties), geometry: dropZeroAltitude(flattenCollection(f.geometry)) }));
    layers.push({ name, crs: WGS84_CRS, fields: fieldsOf(features), features });
  }
  if (layers.length === 0 || layers.every((l) => l.features.length === 0)) {
    throw new UploadError(
      'no_features',
      `${fileName} holds no placemarks. Draw the leases as polygons (not only folders or overlays), save the places again as KML or KMZ, and upload that.`,
    );
  }
  return { layers, warnings };
}

function readGpx(doc: ReturnType<typeof parseXml>, fileName: string, kind: UploadKind, options: XmlReadOptions): XmlReading {
  const fc = gpxToGeoJson(doc as unknown as Parameters<typeof gpxToGeoJson>[0]);
  const warnings: string[] = [];
  const points: Feature<Geometry | null>[] = [];
  const tracks: Feature<Geometry | null>[] = [];
  for (const f of fc.features as Feature<Geometry | null>[]) {
    const feature = { type: 'Feature' as const, properties: cleanProperties(f.properties), geometry: f.geometry };
    if (feature.geometry?.type === 'Point') points.push(feature);
    else tracks.push(feature);
  }
  if (points.length === 0 && tracks.length === 0) {
    throw new UploadError(
      'no_features',
      `${fileName} holds no waypoints, routes or tracks. Record or draw the outline in your GPS app, export it as GPX again and upload that.`,
    );
  }
  const layers: XmlLayer[] = [];
  const wantsAreas = kind === 'lease' || kind === 'zone';
  if (tracks.length) {
    let features = tracks;
    if (wantsAreas) {
      const gaps = tracks.map((t) => endGapMetres(t.geometry));
      const open = gaps.map((g, i) => [i, g] as const).filter(([, g]) => g > CLOSED_TRACK_TOLERANCE_M);
      if (!options.tracksAsPolygons) {
        throw new UploadError(
          'tracks_need_confirmation',
          `${fileName} holds ${tracks.length} track${tracks.length > 1 ? 's or routes' : ' or route'} (lines), but ${kind === 'lease' ? 'a lease' : 'a closure zone'} is an area. ` +
            (open.length
              ? `${open.length} of them ${open.length > 1 ? 'do' : 'does'} not end where ${open.length > 1 ? 'they start' : 'it starts'} (${open
                  .slice(0, 5)
                  .map(([i, g]) => `track ${i + 1}: ${Math.round(g)} m apart`)
                  .join('; ')}). `
              : 'Every track ends where it starts. ') +
            'If each track walks round one area, confirm “Turn tracks into areas” (field tracksAsPolygons=true) and upload again; a track that does not meet its start is closed with a straight line.',
          { tracks: tracks.length, unclosed: open.map(([i, g]) => ({ track: i + 1, gapMetres: Math.round(g) })) },
        );
      }
      features = tracks.map((t) => ({ ...t, geometry: toPolygon(t.geometry) }));
      for (const [i, g] of open) warnings.push(`Track ${i + 1} ended ${Math.round(g)} m from its start; it was closed with a straight line. Check the outline in the preview.`);
    }
    layers.push({ name: 'Tracks and routes', crs: WGS84_CRS, fields: fieldsOf(features), features });
  }
  if (points.length) layers.push({ name: 'Waypoints', crs: WGS84_CRS, fields: fieldsOf(points), features: points });
  return { format: 'gpx', layers, warnings };
}

/** Keeps name, description and ExtendedData values; drops style and timing properties; values JSON-safe. */
function cleanProperties(props: Record<string, unknown> | null | undefined): Record<string, string | number | boolean | null> {
  const out: Record<string, string | number | boolean | null> = {};
  for (const [k, v] of Object.entries(props ?? {})) {
    if (STYLE_PROPERTIES.has(k)) continue;
    if (v === null || typeof v === 'string' || typeof v === 'boolean') out[k] = v;
    else if (typeof v === 'number') out[k] = Number.isFinite(v) ? v : null;
    else if (typeof v === 'object' && v && '@type' in v && 'value' in v) out[k] = String((v as { value: unknown }).value);
  }
  return out;
}

/** A GeometryCollection of one kind → its Multi* form (KML MultiGeometry); mixed kinds are kept for the checks to refuse. */
function flattenCollection(g: Geometry | null): Geometry | null {
  if (g?.type !== 'GeometryCollection') return g;
  const parts = g.geometries.map(flattenCollection).filter((p): p is Geometry => p !== null);
  const types = new Set(parts.map((p) => p.type.replace(/^Multi/, '')));
  if (parts.length === 0) return null;
  if (types.size > 1) return { type: 'GeometryCollection', geometries: parts };
  const t = [...types][0];
  const coords = parts.flatMap((p) => (p.type.startsWith('Multi') ? (p as { coordinates: unknown[] }).coordinates : [(p as { coordinates: unknown }).coordinates]));
  if (t === 'Polygon') return { type: 'MultiPolygon', coordinates: coords as Position[][][] };
  if (t === 'LineString') return { type: 'MultiLineString', coordinates: coords as Position[][] };
  if (t === 'Point') return { type: 'MultiPoint', coordinates: coords as Position[] };
  return { type: 'GeometryCollection', geometries: parts };
}

function fieldsOf(features: Feature<Geometry | null>[]): string[] {
  const seen = new Set<string>();
  for (const f of features) for (const k of Object.keys(f.properties ?? {})) seen.add(k);
  return [...seen];
}

function textOf(el: { getElementsByTagName(n: string): ArrayLike<{ textContent: string | null; parentNode: unknown }> } | undefined, tag: string): string | undefined {
  if (!el) return undefined;
  const list = el.getElementsByTagName(tag);
  for (let i = 0; i < list.length; i++) if (list[i].parentNode === el) return list[i].textContent?.trim() || undefined;
  return undefined;
}

/** Distance between a line's first and last positions on a sphere of radius 6 371 008.8 m (IUGG mean radius); for a multi-line, the largest. */
function endGapMetres(g: Geometry | null): number {
  const lines = g?.type === 'LineString' ? [g.coordinates] : g?.type === 'MultiLineString' ? g.coordinates : [];
  let gap = 0;
  for (const line of lines) {
    if (line.length < 2) continue;
    const [a, b] = [line[0], line[line.length - 1]];
    const rad = Math.PI / 180;
    const dLat = (b[1] - a[1]) * rad;
    const dLon = (b[0] - a[0]) * rad;
    const h = Math.sin(dLat / 2) ** 2 + Math.cos(a[1] * rad) * Math.cos(b[1] * rad) * Math.sin(dLon / 2) ** 2;
    gap = Math.max(gap, 2 * 6_371_008.8 * Math.asin(Math.min(1, Math.sqrt(h))));
  }
  return gap;
}

/** A track or route (line or multi-line) → a polygon per line, closed by repeating the first position. */
function toPolygon(g: Geometry | null): Geometry | null {
  const close = (line: Position[]): Position[] => {
    const [a, b] = [line[0], line[line.length - 1]];
    return a && b && (a[0] !== b[0] || a[1] !== b[1]) ? [...line, a] : line;
  };
  if (g?.type === 'LineString') return { type: 'Polygon', coordinates: [close(g.coordinates)] };
  if (g?.type === 'MultiLineString') {
    const polys = g.coordinates.filter((l) => l.length > 0).map((l) => [close(l)]);
    return polys.length === 1 ? { type: 'Polygon', coordinates: polys[0] } : { type: 'MultiPolygon', coordinates: polys };
  }
  return g;
}

/**
 * Globe viewers write every KML position as lon,lat,0 (altitude clamped to the ground, KML 2.2 §16.9.1): a zero
 * third value carries nothing, so it is removed here rather than warned about. Real heights stay for the checks.
 */
function dropZeroAltitude(g: Geometry | null): Geometry | null {
  if (!g) return g;
  if (g.type === 'GeometryCollection') return { ...g, geometries: g.geometries.map((p) => dropZeroAltitude(p) as Geometry) };
  const strip = (c: unknown): unknown =>
    Array.isArray(c) && typeof c[0] === 'number' ? (c.length === 3 && c[2] === 0 ? c.slice(0, 2) : c) : Array.isArray(c) ? c.map(strip) : c;
  return { ...g, coordinates: strip(g.coordinates) } as Geometry;
}
