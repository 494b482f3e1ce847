/**
 * @module shared/geometry/bearing
 * The direction from one point to another, for the outflow arrow dragged on the river form's map.
 */

/**
 * Initial bearing of the great circle from a to b on a sphere.
 *
 * @param a - [longitude, latitude] in degrees
 * @param b - [longitude, latitude] in degrees (not antipodal to a)
 * @returns degrees clockwise from north, 0 ≤ bearing < 360
 * @example
 * initialBearingDeg([0, 0], [1, 0]); // => 90
 * Source: (c) common practice: the spherical forward-azimuth formula; within about 0.2° of the ellipsoidal
 * azimuth over a few kilometres at mid-latitudes, far finer than a drag on a map.
 */
export function initialBearingDeg(a: readonly [number, number], b: readonly [number, number]): number {
  const rad = Math.PI / 180;
  const [lon1, lat1] = [a[0] * rad, a[1] * rad];
  const [lon2, lat2] = [b[0] * rad, b[1] * rad];
  const y = Math.sin(lon2 - lon1) * Math.cos(lat2);
  const x = Math.cos(lat1) * Math.sin(lat2) - Math.sin(lat1) * Math.cos(lat2) * Math.cos(lon2 - lon1);
  const deg = Math.atan2(y, x) / rad;
  return ((deg % 360) + 360) % 360;
}
