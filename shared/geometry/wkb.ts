/**
 * @module shared/geometry/wkb
 * Well-known binary (OGC 06-103r4 Simple Features §8.2, ISO 19125) and the GeoPackage geometry blob
 * (OGC 12-128r18 GeoPackage 1.3 §2.1.3) ↔ GeoJSON geometries. Written here rather than taken from a
 * package because the maintained WKB parsers need Node's Buffer and shared/ runs in the browser too;
 * the tests check both directions against files GDAL's ogr2ogr writes and reads.
 *
 * Reads ISO type codes (1–7, +1000 Z, +2000 M, +3000 ZM) and the extended codes (0x80000000 Z,
 * 0x40000000 M, 0x20000000 SRID); keeps x, y and z (m is dropped). Writes 2-D little-endian ISO WKB.
 */
import type { Geometry, Position } from 'geojson';

const BASE_NAMES = ['', 'Point', 'LineString', 'Polygon', 'MultiPoint', 'MultiLineString', 'MultiPolygon', 'GeometryCollection'] as const;

/** A WKB or GeoPackage blob that cannot be read (the caller turns it into an UploadError). */
export class WkbError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'WkbError';
  }
}

/**
 * Reads one WKB geometry.
 *
 * @param bytes - the WKB.
 * @returns the GeoJSON geometry (an empty point → null) and the number of bytes read.
 * @throws WkbError on an unknown type or bytes that run out.
 * @example
 * readWkb(Uint8Array.from([1, 1,0,0,0, 0,0,0,0,0,0,0xf0,0x3f, 0,0,0,0,0,0,0,0x40])).geometry // { type: 'Point', coordinates: [1, 2] }
 */
export function readWkb(bytes: Uint8Array): { geometry: Geometry | null; length: number } {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let p = 0;
  const need = (n: number) => {
    if (p + n > bytes.length) throw new WkbError(`the geometry ends early (needs ${p + n} bytes, has ${bytes.length})`);
  };
  const read = (): Geometry | null => {
    need(5);
    const le = view.getUint8(p) === 1;
    let code = view.getUint32(p + 1, le);
    p += 5;
    let hasZ = false;
    let hasM = false;
    if (code & 0x20000000) {
      need(4);
      p += 4; // EWKB SRID: the layer's CRS is used instead.
    }
    if (code & 0x80000000) hasZ = true;
    if (code & 0x40000000) hasM = true;
    code &= 0x0fffffff;
    const dim = Math.floor(code / 1000);
    if (dim === 1 || dim === 3) hasZ = true;
    if (dim === 2 || dim === 3) hasM = true;
    const base = code % 1000;
    const stride = 2 + (hasZ ? 1 : 0) + (hasM ? 1 : 0);
    const u32 = () => {
      need(4);
      const v = view.getUint32(p, le);
      p += 4;
      return v;
    };
    const pos = (): Position => {
      need(8 * stride);
      const out: Position = [view.getFloat64(p, le), view.getFloat64(p + 8, le)];
      if (hasZ) out.push(view.getFloat64(p + 16, le));
      p += 8 * stride;
      return out;
    };
    const line = () => {
      const n = u32();
      if (n > bytes.length) throw new WkbError(`a line claims ${n} points, more than the blob can hold`);
      return Array.from({ length: n }, pos);
    };
    const rings = () => {
      const n = u32();
      if (n > bytes.length) throw new WkbError(`a polygon claims ${n} rings, more than the blob can hold`);
      return Array.from({ length: n }, line);
    };
    const parts = <T>(expect: number, of: (g: Geometry | null) => T) => {
      const n = u32();
      if (n > bytes.length) throw new WkbError(`a collection claims ${n} parts, more than the blob can hold`);
      const out: T[] = [];
      for (let i = 0; i < n; i++) {
        const at = p;
        const g = read();
        const partCode = view.getUint32(at + 1, view.getUint8(at) === 1) & 0x0fffffff;
        if (expect && partCode % 1000 !== expect) throw new WkbError(`a ${BASE_NAMES[base]} holds a part of type ${partCode}`);
        out.push(of(g));
      }
      return out;
    };
    switch (base) {
      case 1: {
        const c = pos();
        return Number.isNaN(c[0]) && Number.isNaN(c[1]) ? null : { type: 'Point', coordinates: c };
      }
      case 2:
        return { type: 'LineString', coordinates: line() };
      case 3:
        return { type: 'Polygon', coordinates: rings() };
      case 4:
        return { type: 'MultiPoint', coordinates: parts(1, (g) => (g as { coordinates: Position } | null)?.coordinates ?? []) };
      case 5:
        return { type: 'MultiLineString', coordinates: parts(2, (g) => (g as { coordinates: Position[] }).coordinates) };
      case 6:
        return { type: 'MultiPolygon', coordinates: parts(3, (g) => (g as { coordinates: Position[][] }).coordinates) };
      case 7:
        return { type: 'GeometryCollection', geometries: parts(0, (g) => g).filter((g): g is Geometry => g !== null) };
      default:
        throw new WkbError(`unknown geometry type code ${code} (curves, surfaces and TINs are not read)`);
    }
  };
  const geometry = read();
  return { geometry, length: p };
}

/**
 * Reads a GeoPackage geometry blob: the 'GP' header (version, flags, srs_id, optional envelope) then WKB.
 *
 * @param blob - the column value.
 * @returns the geometry (null for the empty flag) and the blob's srs_id.
 * @throws WkbError when the magic bytes or the envelope code are wrong, or the WKB cannot be read.
 * @example
 * readGeoPackageGeometry(blob) // { geometry: { type: 'Polygon', … }, srsId: 32630 }
 */
export function readGeoPackageGeometry(blob: Uint8Array): { geometry: Geometry | null; srsId: number } {
  if (blob.length < 8 || blob[0] !== 0x47 || blob[1] !== 0x50) throw new WkbError('the geometry is not a GeoPackage blob (it does not start with "GP")');
  const flags = blob[3];
  const le = (flags & 1) === 1;
  const envelope = (flags >> 1) & 7;
  const empty = (flags >> 4) & 1;
  const envelopeBytes = [0, 32, 48, 48, 64][envelope];
  if (envelopeBytes === undefined) throw new WkbError(`the geometry header has an invalid envelope code ${envelope}`);
  const srsId = new DataView(blob.buffer, blob.byteOffset, blob.byteLength).getInt32(4, le);
  if (empty) return { geometry: null, srsId };
  const { geometry } = readWkb(blob.subarray(8 + envelopeBytes));
  return { geometry, srsId };
}

/**
 * Writes a 2-D geometry as little-endian ISO WKB.
 *
 * @param g - Point … GeometryCollection (heights dropped).
 * @returns the WKB bytes.
 * @example
 * writeWkb({ type: 'Point', coordinates: [1, 2] }).length // 21
 */
export function writeWkb(g: Geometry): Uint8Array {
  const chunks: number[] = [];
  const buf = new ArrayBuffer(8);
  const dv = new DataView(buf);
  const u32 = (v: number) => {
    dv.setUint32(0, v, true);
    for (let i = 0; i < 4; i++) chunks.push(dv.getUint8(i));
  };
  const f64 = (v: number) => {
    dv.setFloat64(0, v, true);
    for (let i = 0; i < 8; i++) chunks.push(dv.getUint8(i));
  };
  const pos = (c: Position) => {
    f64(c[0]);
    f64(c[1]);
  };
  const line = (l: Position[]) => {
    u32(l.length);
    l.forEach(pos);
  };
  const poly = (r: Position[][]) => {
    u32(r.length);
    r.forEach(line);
  };
  const write = (geom: Geometry) => {
    chunks.push(1);
    u32(BASE_NAMES.indexOf(geom.type));
    switch (geom.type) {
      case 'Point':
        pos(geom.coordinates);
        break;
      case 'LineString':
        line(geom.coordinates);
        break;
      case 'Polygon':
        poly(geom.coordinates);
        break;
      case 'MultiPoint':
        u32(geom.coordinates.length);
        for (const c of geom.coordinates) write({ type: 'Point', coordinates: c });
        break;
      case 'MultiLineString':
        u32(geom.coordinates.length);
        for (const c of geom.coordinates) write({ type: 'LineString', coordinates: c });
        break;
      case 'MultiPolygon':
        u32(geom.coordinates.length);
        for (const c of geom.coordinates) write({ type: 'Polygon', coordinates: c });
        break;
      case 'GeometryCollection':
        u32(geom.geometries.length);
        geom.geometries.forEach(write);
        break;
    }
  };
  write(g);
  return Uint8Array.from(chunks);
}

/**
 * Writes a GeoPackage geometry blob (version 0, little-endian, with an xy envelope) for a 2-D geometry.
 *
 * @param g - the geometry.
 * @param srsId - the srs_id of the layer (e.g. 4326).
 * @returns the blob.
 * @example
 * writeGeoPackageGeometry({ type: 'Point', coordinates: [1, 2] }, 4326).subarray(0, 2) // 'GP'
 */
export function writeGeoPackageGeometry(g: Geometry, srsId: number): Uint8Array {
  const wkb = writeWkb(g);
  const xs: number[] = [];
  const ys: number[] = [];
  const visit = (c: unknown): void => {
    if (Array.isArray(c) && typeof c[0] === 'number') {
      xs.push(c[0]);
      ys.push(c[1] as number);
    } else if (Array.isArray(c)) c.forEach(visit);
  };
  const all = (geom: Geometry): void => (geom.type === 'GeometryCollection' ? geom.geometries.forEach(all) : visit(geom.coordinates));
  all(g);
  const out = new Uint8Array(8 + 32 + wkb.length);
  const dv = new DataView(out.buffer);
  out[0] = 0x47;
  out[1] = 0x50;
  out[2] = 0;
  out[3] = 0b0000_0011; // little-endian, envelope [minx, maxx, miny, maxy]
  dv.setInt32(4, srsId, true);
  const env = [Infinity, -Infinity, Infinity, -Infinity];
  for (let i = 0; i < xs.length; i++) {
    env[0] = Math.min(env[0], xs[i]);
    env[1] = Math.max(env[1], xs[i]);
    env[2] = Math.min(env[2], ys[i]);
    env[3] = Math.max(env[3], ys[i]);
  }
  if (!xs.length) env.fill(0);
  env.forEach((v, i) => {
    dv.setFloat64(8 + 8 * i, v, true);
  });
  out.set(wkb, 40);
  return out;
}
