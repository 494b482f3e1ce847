/**
 * @module shared/geometry/crs-catalogue
 * Look-ups in the EPSG catalogue (the epsg-index package's all.json: code, kind, name, proj4, wkt, bbox,
 * area): a code's definition, a name/code search for the CRS picker, and identifying the EPSG code of a
 * .prj. The catalogue is ~8 MB, so it is passed in (the server loads it once with `loadCrsCatalogue()`
 * from load-crs-catalogue.ts); nothing here imports it, and the browser never has to bundle it.
 */
import proj4 from 'proj4';
import { wktAuthorityCode, wktName } from './read-prj';

/** One catalogue entry, as epsg-index stores it. */
export interface CrsCatalogueEntry {
  /** The EPSG (or ESRI, ≥ 100000) code as text, e.g. '2193'. */
  code: string;
  /** 'CRS-PROJCRS', 'CRS-GEOGCRS', 'CRS-GEOG3DCRS', 'CRS-VERTCRS', … */
  kind: string;
  name: string;
  wkt: string | null;
  proj4: string | null;
  /** Area of use: [north, west, south, east] in degrees. */
  bbox: number[] | null;
  unit?: string | null;
  area?: string | null;
  accuracy?: number | null;
}

/** The whole catalogue: code → entry. */
export type CrsCatalogue = Readonly<Record<string, CrsCatalogueEntry>>;

/** A CRS's definition for reprojection. */
export interface CrsDefinition {
  code: number;
  name: string;
  /** proj4 string, or null when the catalogue has none. */
  proj4: string | null;
  /** OGC WKT 1, or null when the catalogue has none. */
  wkt: string | null;
}

/** One search hit, for the CRS picker. */
export interface CrsSearchResult {
  code: number;
  name: string;
  kind: 'projected' | 'geographic';
  /** Where the CRS is meant to be used, e.g. 'New Zealand - North Island, South Island…'. */
  area?: string;
  /** Area of use as [minLon, minLat, maxLon, maxLat] degrees (GeoJSON order). */
  bbox?: [number, number, number, number];
}

/** @private A catalogue entry prepared for searching and matching. */
interface IndexedEntry {
  entry: CrsCatalogueEntry;
  code: number;
  kind: 'projected' | 'geographic';
  key: string;
  tokens: string[];
  x0: number;
  y0: number;
}

const indexes = new WeakMap<object, IndexedEntry[]>();

/**
 * The definition of an EPSG code from the catalogue.
 *
 * @param catalogue - the epsg-index catalogue.
 * @param epsg - e.g. 2193.
 * @returns { code, name, proj4, wkt } or null for an unknown code or one with neither proj4 nor WKT.
 * @example
 * crsDefinition(catalogue, 2193)
 * // { code: 2193, name: 'NZGD2000 / New Zealand Transverse Mercator 2000', proj4: '+proj=tmerc +lat_0=0 +lon_0=173 …', wkt: 'PROJCS[…' }
 */
export function crsDefinition(catalogue: CrsCatalogue, epsg: number): CrsDefinition | null {
  if (!Number.isInteger(epsg)) return null;
  const entry = catalogue[String(epsg)];
  if (!entry || (!entry.proj4 && !entry.wkt)) return null;
  return { code: epsg, name: entry.name, proj4: entry.proj4, wkt: entry.wkt };
}

/**
 * Searches projected and geographic (2-D) CRSs by code or name. Every word of the query must start a word
 * of the name (or be the code); accents and punctuation are ignored. Ranked: exact code, then names whose
 * words match whole, WGS 84 first among equals, then shorter names, then lower codes.
 *
 * @param catalogue - the epsg-index catalogue.
 * @param query - e.g. 'utm 33', 'lambert', '2193', 'nzgd2000 transverse'.
 * @param limit - most results (default 20, 1–200).
 * @returns the best matches first.
 * @example
 * searchCrs(catalogue, '2193')[0] // { code: 2193, name: 'NZGD2000 / New Zealand Transverse Mercator 2000', kind: 'projected', … }
 * searchCrs(catalogue, 'wgs 84 utm 33').map((r) => r.code) // [32633, 32733, …]
 */
export function searchCrs(catalogue: CrsCatalogue, query: string, limit = 20): CrsSearchResult[] {
  const words = normaliseWords(query);
  if (words.length === 0) return [];
  const max = Math.max(1, Math.min(200, Math.floor(limit)));
  const scored: { item: IndexedEntry; score: number }[] = [];
  for (const item of indexOf(catalogue)) {
    let score = 0;
    let ok = true;
    for (const w of words) {
      if (String(item.code) === w) {
        score += 100;
        continue;
      }
      if (item.tokens.includes(w)) score += 3;
      else if (item.tokens.some((t) => t.startsWith(w))) score += 1;
      else if (/^\d+$/.test(w) && String(item.code).startsWith(w)) score += 0.5;
      else {
        ok = false;
        break;
      }
    }
    // Ties go to WGS 84 definitions, the commonest choice (common practice, (c)).
    if (ok) scored.push({ item, score: score + (item.entry.name.startsWith('WGS 84') ? 0.25 : 0) });
  }
  scored.sort((a, b) => b.score - a.score || a.item.entry.name.length - b.item.entry.name.length || a.item.code - b.item.code);
  return scored.slice(0, max).map(({ item }) => toResult(item));
}

/**
 * Identifies the EPSG code of a WKT (.prj): its own AUTHORITY/ID; else an exact match of its name with a
 * catalogue name (ignoring case, punctuation, and ESRI spellings such as 'WGS_1984' for 'WGS 84');
 * else the one projected CRS whose projection gives the same eastings and northings (within 1 mm at
 * three points of its area of use) on the same ellipsoid, units and false origin — when several fit
 * (datum realisations such as RGF93 v1/v2 share a projection), the one sharing most name words with the
 * .prj, then the lowest code. Returns undefined when nothing fits, or several fit and no name word is shared.
 *
 * @param catalogue - the epsg-index catalogue.
 * @param wkt - the .prj text.
 * @returns the EPSG code, or undefined.
 * @example
 * identifyCrs(catalogue, 'PROJCS["NZGD_2000_New_Zealand_Transverse_Mercator",GEOGCS["GCS_NZGD_2000",…]…]') // 2193
 */
export function identifyCrs(catalogue: CrsCatalogue, wkt: string): number | undefined {
  const own = wktAuthorityCode(wkt);
  if (own !== undefined) return own;
  const name = wktName(wkt);
  const outer = /^\s*([A-Z_0-9]+)/i.exec(wkt)?.[1]?.toUpperCase() ?? '';
  const kind: 'projected' | 'geographic' = outer.startsWith('PROJ') ? 'projected' : 'geographic';
  const index = indexOf(catalogue);
  let target: ProjParams;
  try {
    target = proj4.Proj(wkt) as unknown as ProjParams;
  } catch {
    target = undefined as unknown as ProjParams;
  }
  if (name) {
    const key = nameKey(name);
    const byName = index.filter((e) => e.kind === kind && e.key === key);
    if (byName.length === 1) return byName[0].code;
    if (byName.length > 1 && target) {
      const fitting = byName.filter((e) => sameProjection(target, e));
      if (fitting.length === 1) return fitting[0].code;
    }
  }
  if (!target || kind !== 'projected') return undefined;
  const candidates = index.filter(
    (e) => e.kind === 'projected' && Math.abs(e.x0 - (target.x0 ?? 0)) < 0.01 && Math.abs(e.y0 - (target.y0 ?? 0)) < 0.01,
  );
  const fitting = candidates.filter((e) => sameProjection(target, e));
  if (fitting.length <= 1) return fitting[0]?.code;
  // Several CRSs share a projection (datum realisations such as RGF93 v1/v2, ESRI duplicates): take the one
  // whose name shares most words with the .prj's name, then the lowest code; none if no name word is shared.
  const words = new Set(normaliseWords(shortenYears(name ?? '')));
  const ranked = fitting
    .map((e) => ({ e, shared: normaliseWords(shortenYears(e.entry.name)).filter((w) => words.has(w)).length }))
    .sort((a, b) => b.shared - a.shared || a.e.code - b.e.code);
  return ranked[0].shared > 0 ? ranked[0].e.code : undefined;
}

/** @private The proj4 parameters compared. */
interface ProjParams {
  a: number;
  es: number;
  x0?: number;
  y0?: number;
  to_meter?: number;
  from_greenwich?: number;
  projName?: string;
  forward: (p: { x: number; y: number }) => { x: number; y: number };
}

const parsedProjs = new Map<string, ProjParams | null>();

/** @private Same ellipsoid, units, meridian and the same projected coordinates at three points of the candidate's area. */
function sameProjection(target: ProjParams, e: IndexedEntry): boolean {
  const def = e.entry.proj4 && !/\+nadgrids=(?!@)/.test(e.entry.proj4) ? e.entry.proj4 : e.entry.wkt;
  if (!def) return false;
  let other = parsedProjs.get(def);
  if (other === undefined) {
    try {
      other = proj4.Proj(def) as unknown as ProjParams;
    } catch {
      other = null;
    }
    parsedProjs.set(def, other);
  }
  if (!other) return false;
  if (Math.abs(other.a - target.a) > 1e-3 || Math.abs(other.es - target.es) > 1e-10) return false;
  if (Math.abs((other.to_meter ?? 1) - (target.to_meter ?? 1)) > 1e-9 * (target.to_meter ?? 1)) return false;
  if (Math.abs((other.from_greenwich ?? 0) - (target.from_greenwich ?? 0)) > 1e-12) return false;
  if ((other.projName === 'longlat') !== (target.projName === 'longlat')) return false;
  const b = e.entry.bbox;
  const [n, w, s, east] = b && b.length === 4 ? b : [10, -10, -10, 10];
  const lat = (n + s) / 2;
  const lon = w <= east ? (w + east) / 2 : (w + east + 360) / 2;
  const radians = Math.PI / 180;
  for (const [dLon, dLat] of [
    [0, 0],
    [0.5, 0.3],
    [-0.4, -0.5],
  ]) {
    const p = { x: (lon + dLon) * radians, y: Math.max(-89, Math.min(89, lat + dLat)) * radians };
    let u: { x: number; y: number };
    let v: { x: number; y: number };
    try {
      u = target.forward({ ...p });
      v = other.forward({ ...p });
    } catch {
      return false;
    }
    if (!u || !v || !Number.isFinite(u.x) || !Number.isFinite(v.x) || Math.abs(u.x - v.x) > 1e-3 || Math.abs(u.y - v.y) > 1e-3)
      return false;
  }
  return true;
}

/** @private Builds (once per catalogue object) the search index of projected and geographic 2-D CRSs. */
function indexOf(catalogue: CrsCatalogue): IndexedEntry[] {
  const cached = indexes.get(catalogue);
  if (cached) return cached;
  const out: IndexedEntry[] = [];
  for (const entry of Object.values(catalogue)) {
    if (entry.kind !== 'CRS-PROJCRS' && entry.kind !== 'CRS-GEOGCRS') continue;
    if (!entry.proj4 && !entry.wkt) continue;
    const code = Number(entry.code);
    if (!Number.isInteger(code)) continue;
    const p = entry.proj4 ?? '';
    const utm = /\+proj=utm\b/.test(p);
    const x0 = utm ? 500_000 : Number(/\+x_0=(\S+)/.exec(p)?.[1] ?? 0);
    const y0 = utm ? (/\+south\b/.test(p) ? 10_000_000 : 0) : Number(/\+y_0=(\S+)/.exec(p)?.[1] ?? 0);
    out.push({
      entry,
      code,
      kind: entry.kind === 'CRS-PROJCRS' ? 'projected' : 'geographic',
      key: nameKey(entry.name),
      tokens: normaliseWords(entry.name),
      x0,
      y0,
    });
  }
  indexes.set(catalogue, out);
  return out;
}

/** @private */
function toResult(item: IndexedEntry): CrsSearchResult {
  const out: CrsSearchResult = { code: item.code, name: item.entry.name, kind: item.kind };
  if (item.entry.area) out.area = item.entry.area;
  const b = item.entry.bbox;
  if (b && b.length === 4) out.bbox = [b[1], b[2], b[3], b[0]];
  return out;
}

/** @private Lower-case words without accents. */
function normaliseWords(text: string): string[] {
  return text
    .toLowerCase()
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .split(/[^a-z0-9]+/)
    .filter((w) => w.length > 0);
}

/**
 * @private A name key for exact matching across spellings: lower case, no punctuation, ESRI prefixes
 * ('GCS_', 'D_') dropped and 19xx years shortened after letters ('WGS_1984' → 'wgs84', 'ETRS_1989' → 'etrs89').
 */
function nameKey(name: string): string {
  return name
    .toLowerCase()
    .normalize('NFD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/^(gcs|d)_/, '')
    .replace(/([a-z])[_\s]*19(\d\d)(?!\d)/g, '$1$2')
    .replace(/[^a-z0-9]+/g, '');
}

/** @private 'RGF_1993_Lambert_93' → 'RGF93_Lambert_93' (ESRI writes datum years in full). */
function shortenYears(name: string): string {
  return name.replace(/([A-Za-z])[_\s]*19(\d\d)(?!\d)/g, '$1$2');
}
