/**
 * @module shared/geometry/read-prj
 * Reads a shapefile's .prj (a WKT coordinate system) into a {@link CrsInfo}: whether proj4 can use it,
 * its name, and its EPSG code when the WKT says so (an AUTHORITY["EPSG","nnnn"] or ID["EPSG",nnnn] on the
 * outermost node) or its name follows a pattern that fixes the code (WGS 84 and its UTM zones, the web
 * mercator). Names of other CRSs are matched against the EPSG catalogue by `identifyCrs` in
 * crs-catalogue.ts, which the server can pass in. Reprojection always uses the WKT itself.
 */
import proj4 from 'proj4';
import type { CrsInfo } from './parsed-upload';

/** The result of {@link readPrj}. */
export interface PrjReading {
  crs: CrsInfo;
  warnings: string[];
}

/** Semi-major axis of WGS 84 and GRS 1980 [m] (EPSG:7030 and EPSG:7019, both 6 378 137 m). */
const WGS84_A = 6_378_137;
/** Inverse flattening of WGS 84 (EPSG:7030) and GRS 1980 (EPSG:7019); they differ by 1.5e-6, which moves positions by < 0.1 mm. */
const WGS84_RF = 298.257223563;

/** proj4's datum type for "no datum shift known" (proj4 lib/constants/values.js PJD_NODATUM). */
const PJD_NODATUM = 5;

/**
 * Reads a .prj text.
 *
 * @param text - the .prj content (WKT 1, the ESRI flavour or OGC; WKT 2 where proj4 reads it).
 * @param fileLabel - how to name the file in warnings, e.g. 'leases.prj'.
 * @returns the CRS (found = proj4 parsed it) and warnings (unreadable WKT, a datum with no shift to WGS 84).
 * @example
 * readPrj('PROJCS["WGS_1984_UTM_Zone_30N",GEOGCS[…]…]', 'leases.prj').crs
 * // { found: true, epsg: 32630, name: 'WGS_1984_UTM_Zone_30N', wkt: 'PROJCS[…' }
 */
export function readPrj(text: string, fileLabel: string): PrjReading {
  const wkt = text.replace(/^\uFEFF/, '').trim();
  const warnings: string[] = [];
  if (wkt === '') {
    warnings.push(
      `${fileLabel} is empty, so the coordinate system is unknown. Pick it by its EPSG code (your GIS shows it in the layer’s properties).`,
    );
    return { crs: { found: false }, warnings };
  }
  const name = wktName(wkt);
  let projection: ProjLike;
  try {
    projection = proj4.Proj(wkt) as unknown as ProjLike;
    if (!projection || typeof projection.a !== 'number' || !Number.isFinite(projection.a)) throw new Error('no ellipsoid');
    // A projection missing from proj4 only fails when it is used: try one transform.
    proj4(wkt, 'EPSG:4326');
  } catch {
    const shown = wkt.length > 80 ? `${wkt.slice(0, 77)}…` : wkt;
    warnings.push(
      `${fileLabel} does not describe a coordinate system this server can use (it reads: ${shown}). ` +
        'Pick the coordinate system by its EPSG code (your GIS shows it in the layer’s properties), or export the layer again with a standard .prj.',
    );
    return { crs: { found: false, wkt, ...(name ? { name } : {}) }, warnings };
  }
  const datum = projection.datum;
  if (datum && datum.datum_type === PJD_NODATUM && !isWgs84LikeEllipsoid(projection.a, projection.rf)) {
    warnings.push(
      `${fileLabel} names a datum (${projection.datumCode ?? 'unnamed'}) without its shift to WGS 84, so positions may be off by up to a few hundred metres. ` +
        'If you know the layer’s EPSG code, choose it instead: its definition includes the shift.',
    );
  }
  const epsg = wktAuthorityCode(wkt) ?? epsgFromWellKnownName(name, wkt);
  return { crs: { found: true, wkt, ...(epsg !== undefined ? { epsg } : {}), ...(name ? { name } : {}) }, warnings };
}

/**
 * The name of the outermost WKT node, e.g. 'WGS_1984_UTM_Zone_30N' for `PROJCS["WGS_1984_UTM_Zone_30N",…]`.
 *
 * @example
 * wktName('GEOGCS["GCS_WGS_1984",DATUM[…]]') // 'GCS_WGS_1984'
 */
export function wktName(wkt: string): string | undefined {
  const m = /^\s*[A-Z_0-9]+\s*[[(]\s*"([^"]*)"/i.exec(wkt);
  return m ? m[1] : undefined;
}

/**
 * The EPSG code on the outermost node of a WKT: the AUTHORITY["EPSG","nnnn"] (WKT 1) or ID["EPSG",nnnn]
 * (WKT 2) written directly inside it, not those of its datum, ellipsoid or units.
 *
 * @example
 * wktAuthorityCode('PROJCS["x",GEOGCS[…,AUTHORITY["EPSG","4326"]],…,AUTHORITY["EPSG","32630"]]') // 32630
 */
export function wktAuthorityCode(wkt: string): number | undefined {
  let depth = 0;
  let inString = false;
  let found: number | undefined;
  for (let i = 0; i < wkt.length; i++) {
    const ch = wkt[i];
    if (ch === '"') {
      inString = !inString;
      continue;
    }
    if (inString) continue;
    if (ch === '[' || ch === '(') depth += 1;
    else if (ch === ']' || ch === ')') depth -= 1;
    else if (depth === 1 && (ch === 'A' || ch === 'a' || ch === 'I' || ch === 'i')) {
      const m = /^(?:AUTHORITY|ID)\s*[[(]\s*"EPSG"\s*,\s*"?(\d+)"?/i.exec(wkt.slice(i, i + 40));
      if (m && (i === 0 || /[\s,]/.test(wkt[i - 1]))) found = Number(m[1]);
    }
  }
  return found;
}

/** @private */
interface ProjLike {
  a: number;
  rf?: number;
  es?: number;
  datumCode?: string;
  datum?: { datum_type?: number };
}

/** @private */
function isWgs84LikeEllipsoid(a: number, rf: number | undefined): boolean {
  return Math.abs(a - WGS84_A) < 0.5 && (rf === undefined || Math.abs(rf - WGS84_RF) < 1e-3);
}

/**
 * @private Codes fixed by the name for the commonest CRSs, computed rather than listed: EPSG numbers
 * WGS 84 / UTM zone n N = 32600 + n and S = 32700 + n (EPSG registry, codes 32601–32660 / 32701–32760),
 * WGS 84 geographic = 4326, WGS 84 / Pseudo-Mercator = 3857.
 */
function epsgFromWellKnownName(name: string | undefined, wkt: string): number | undefined {
  if (!name) return undefined;
  const n = name
    .replace(/[_\s]+/g, ' ')
    .trim()
    .toLowerCase();
  const utm = /^wgs (?:19)?84 \/? ?utm zone (\d{1,2}) ?([ns])$/.exec(n);
  if (utm) {
    const zone = Number(utm[1]);
    if (zone >= 1 && zone <= 60) return (utm[2] === 'n' ? 32600 : 32700) + zone;
  }
  const outer = /^\s*([A-Z_0-9]+)/i.exec(wkt)?.[1]?.toUpperCase();
  if ((outer === 'GEOGCS' || outer === 'GEOGCRS') && (n === 'gcs wgs 1984' || n === 'wgs 84' || n === 'wgs84')) return 4326;
  if (n === 'wgs 1984 web mercator auxiliary sphere' || n === 'wgs 84 / pseudo-mercator') return 3857;
  return undefined;
}
