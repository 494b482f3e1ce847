/**
 * A shapefile layer generated for the reader tests: `count` small squares (lon/lat) on a grid near the demo bay; every
 * 7th has a hole, every 11th is two parts (a MultiPolygon); attributes LEASE_ID, HOLDER and AREA. Written by
 * @mapbox/shp-write, so the bytes come from a writer other than the reader under test.
 */
import { write } from '@mapbox/shp-write';

export const WGS84_PRJ =
  'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]';

export interface GeneratedLayerOptions {
  /** Squares a grid row holds before the next row starts. */
  perRow?: number;
  /** Side of a square, degrees. */
  size?: number;
  /** LEASE_ID is `${idPrefix}-${n}`. */
  idPrefix?: string;
  /** HOLDER of the even and the odd features. */
  holders?: [string, string];
}

export function generatedShapefileLayer(
  count: number,
  { perRow = 100, size = 0.001, idPrefix = 'STR', holders = ['Huîtres Vasière', 'Cordmere Shellfish'] }: GeneratedLayerOptions = {},
): { shp: Uint8Array; shx: Uint8Array; dbf: Uint8Array } {
  const square = (x: number, y: number, d: number) => [
    [x, y],
    [x, y + d],
    [x + d, y + d],
    [x + d, y],
    [x, y],
  ];
  const geometries = Array.from({ length: count }, (_, i) => {
    const x = -38.9 + (i % perRow) * 0.003;
    const y = 41 + Math.floor(i / perRow) * 0.003;
    if (i % 11 === 0) return [[square(x, y, size)], [square(x + 0.0015, y, size / 2)]];
    if (i % 7 === 0) return [square(x, y, size), square(x + size / 4, y + size / 4, size / 4).reverse()];
    return [square(x, y, size)];
  });
  const rows = Array.from({ length: count }, (_, i) => ({ LEASE_ID: `${idPrefix}-${i + 1}`, HOLDER: holders[i % 2], AREA: i / 4 }));
  let out: { shp: Uint8Array; shx: Uint8Array; dbf: Uint8Array } | undefined;
  write(rows, 'POLYGON', geometries as object[], (_err, files) => {
    const bytes = (v: DataView) => new Uint8Array(v.buffer.slice(v.byteOffset, v.byteOffset + v.byteLength));
    out = { shp: bytes(files.shp as DataView), shx: bytes(files.shx as DataView), dbf: bytes(files.dbf as DataView) };
  });
  return out!;
}
