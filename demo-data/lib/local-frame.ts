/**
 * @module demo-data/lib/local-frame
 * The planar frame the demo region is drawn in: metres east (x) and north (y) of the region's
 * centre, laid on UTM zone 24N (EPSG:32624), and the conversions to UTM and to longitude/latitude.
 */
import proj4 from 'proj4';

/** A point in the local frame: [x east, y north] in metres from the region centre. */
export type Xy = [number, number];
/** A longitude/latitude pair in degrees (EPSG:4326, GeoJSON order). */
export type LonLat = [number, number];

/** The invented region's centre, in open ocean (mid North Atlantic), so no real coast is depicted. */
export const REGION_CENTRE = { lon: -38.6, lat: 41.2 } as const;

/** UTM zone 24N on WGS 84 (EPSG:32624); its central meridian is 39° W. */
export const UTM_24N = '+proj=utm +zone=24 +datum=WGS84 +units=m +no_defs';

const [E0, N0] = proj4('EPSG:4326', UTM_24N, [REGION_CENTRE.lon, REGION_CENTRE.lat]) as [number, number];

/** Decimal places kept in written longitudes/latitudes (1e-7° ≈ 1 cm). */
const DEGREE_DECIMALS = 7;

/**
 * Local frame → UTM 24N easting/northing [m].
 * @param p - local [x, y] in metres
 */
export function toUtm(p: Xy): Xy {
  return [E0 + p[0], N0 + p[1]];
}

/**
 * Local frame → [lon, lat] in degrees, rounded to 7 decimals.
 * @param p - local [x, y] in metres
 */
export function toLonLat(p: Xy): LonLat {
  const [lon, lat] = proj4(UTM_24N, 'EPSG:4326', toUtm(p)) as [number, number];
  return [roundTo(lon, DEGREE_DECIMALS), roundTo(lat, DEGREE_DECIMALS)];
}

/**
 * [lon, lat] → local frame [x, y] in metres.
 * @param q - longitude and latitude in degrees
 */
export function fromLonLat(q: LonLat): Xy {
  const [e, n] = proj4('EPSG:4326', UTM_24N, q) as [number, number];
  return [e - E0, n - N0];
}

/** Kilometres → metres for a point written in km. */
export function km(x: number, y: number): Xy {
  return [x * 1000, y * 1000];
}

/** Rounds to a number of decimals. */
export function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(value * f) / f;
}
