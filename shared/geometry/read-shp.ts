/**
 * @module shared/geometry/read-shp
 * Reads a shapefile's main file (.shp) into GeoJSON geometries in the file's own coordinates. The header
 * and every record header are checked first — file code, version, the declared file length against the
 * real one, record lengths, part and point counts — so a truncated or corrupt file is refused with its
 * name and the place it breaks, rather than silently losing its last shapes. The check also counts
 * records and vertices, so the limits are applied before any geometry is built. The geometry itself is
 * decoded by the shapefile library's parseShp (no .prj passed: reprojection happens later). Both read from a
 * {@link ByteSource}: the inflated file, or a zip entry read range by range in one forward pass.
 *
 * Layout: ESRI Shapefile Technical Description, July 1998 (a) — header 100 bytes: file code 9994
 * (int32 BE at 0), file length in 16-bit words (int32 BE at 24), version 1000 (int32 LE at 28), shape
 * type (int32 LE at 32); records: number and content length in 16-bit words (int32 BE), then content
 * starting with the shape type (int32 LE). Poly content: box 4–35, NumParts 36, NumPoints 40, Parts 44.
 */
import type { Geometry } from 'geojson';
import { parseShp } from 'shpjs';
import { type ByteSource, int32BE, int32LE } from './byte-source';
import { UploadError } from './upload-error';
import { formatCount } from './upload-limits';

/** The result of {@link checkShp}. */
export interface ShpCheck {
  /** Shape type from the header (ESRI codes: 0 null, 1 point, 3 polyline, 5 polygon, 8 multipoint; +10 Z; +20 M; 31 multipatch). */
  shapeType: number;
  /** Number of records. */
  records: number;
  /** Number of points over all records (what parseShp will allocate). */
  vertices: number;
  /** The file's 100-byte header (a copy). */
  header: Uint8Array;
  /**
   * The bytes to parse, the file cut to its declared length, when it was checked as a plain `Uint8Array`; absent
   * when checked from another source (pass one to {@link parseShpRange}).
   */
  body?: Uint8Array;
  /** Notes for the user (extra bytes after the declared end). */
  warnings: string[];
  /** Byte offset in `body` of each record's header, then the declared end (records + 1 entries): lets a range be decoded alone. */
  offsets: Uint32Array;
}

const FILE_CODE = 9994;
const VERSION = 1000;
/** Shape types the format defines (technical description, table 1), MultiPatch (31) excluded here. */
const KNOWN_TYPES = new Set([0, 1, 3, 5, 8, 11, 13, 15, 18, 21, 23, 25, 28]);
const FIX_ADVICE = 'Export the layer again from your GIS and zip all of its files (.shp, .shx, .dbf, .prj) together.';

/** Human names of shape types, for messages. */
const TYPE_NAMES: Record<number, string> = {
  0: 'null',
  1: 'point',
  3: 'line',
  5: 'polygon',
  8: 'multipoint',
  11: 'point (with heights)',
  13: 'line (with heights)',
  15: 'polygon (with heights)',
  18: 'multipoint (with heights)',
  21: 'point (with measures)',
  23: 'line (with measures)',
  25: 'polygon (with measures)',
  28: 'multipoint (with measures)',
  31: 'multipatch',
};

/**
 * Checks a .shp's header and record structure without building geometries, in one forward pass over the file
 * (the header, then each record's header, shape header and list of parts; never the points themselves).
 *
 * @param bytes - the .shp file, or a source of its bytes (read once, in increasing order).
 * @param fileLabel - how to name the file in messages, e.g. 'export/leases.shp'.
 * @returns shape type, record and vertex counts, and the bytes to parse.
 * @throws UploadError corrupt_shp (too short, not a .shp, broken record), shp_length_mismatch (header declares
 *   more bytes than the file holds), unsupported_shape_type (multipatch).
 * @example
 * checkShp(shpBytes, 'leases.shp') // { shapeType: 5, records: 4, vertices: 46, … }
 */
export function checkShp(bytes: ByteSource, fileLabel: string): ShpCheck {
  const length = bytes.length;
  if (length < 100) {
    throw new UploadError(
      'corrupt_shp',
      `${fileLabel} is only ${formatCount(length)} bytes long, shorter than the 100-byte header every .shp starts with: the file is truncated or damaged. ${FIX_ADVICE}`,
      { file: fileLabel, bytes: length },
    );
  }
  const header = bytes.subarray(0, 100).slice();
  const fileCode = int32BE(header, 0);
  const version = int32LE(header, 28);
  if (fileCode !== FILE_CODE || version !== VERSION) {
    throw new UploadError(
      'corrupt_shp',
      `${fileLabel} is not a readable shapefile: its header does not start with the shapefile signature (the file is damaged, or is another kind of file renamed .shp). ${FIX_ADVICE}`,
      { file: fileLabel },
    );
  }
  const declared = int32BE(header, 24) * 2;
  if (declared > length) {
    throw new UploadError(
      'shp_length_mismatch',
      `${fileLabel} is incomplete: its header declares ${formatCount(declared)} bytes but the file holds ${formatCount(length)}. ` +
        `The copy or export was cut short. ${FIX_ADVICE}`,
      { file: fileLabel, declaredBytes: declared, actualBytes: length },
    );
  }
  if (declared < 100) {
    throw new UploadError('corrupt_shp', `${fileLabel} has a damaged header (it declares a length of ${declared} bytes). ${FIX_ADVICE}`, {
      file: fileLabel,
    });
  }
  const warnings: string[] = [];
  if (declared < length) {
    warnings.push(`${fileLabel} has ${formatCount(length - declared)} bytes after the end its header declares; they were ignored.`);
  }
  const shapeType = int32LE(header, 32);
  if (shapeType === 31) {
    throw new UploadError(
      'unsupported_shape_type',
      `${fileLabel} holds multipatch (3-D surface) shapes, which this server does not read. Export the layer as polygons (2-D footprints) and upload again.`,
      { file: fileLabel, shapeType },
    );
  }
  if (!KNOWN_TYPES.has(shapeType)) {
    throw new UploadError('corrupt_shp', `${fileLabel} has a damaged header: shape type ${shapeType} does not exist. ${FIX_ADVICE}`, {
      file: fileLabel,
      shapeType,
    });
  }

  let p = 100;
  let records = 0;
  let vertices = 0;
  const starts: number[] = [];
  const base = shapeType % 10; // 1 point, 3 polyline, 5 polygon, 8 multipoint (Z and M variants share the layout start)
  while (p < declared) {
    const n = records; // 0-based record index for messages
    if (p + 8 > declared) throw brokenRecord(fileLabel, n, 'its record header is cut off');
    const contentLength = int32BE(bytes.subarray(p, p + 8), 4) * 2;
    const start = p + 8;
    const end = start + contentLength;
    if (contentLength < 4 || end > declared) throw brokenRecord(fileLabel, n, 'it runs past the end of the file');
    // The shape's own header: type, box, then NumParts and NumPoints (or NumPoints alone for a multipoint).
    const shape = bytes.subarray(start, start + Math.min(contentLength, 44));
    const recordType = int32LE(shape, 0);
    if (recordType !== 0) {
      if (recordType !== shapeType)
        throw brokenRecord(fileLabel, n, `its shape type (${recordType}) differs from the file’s (${shapeType})`);
      if (base === 1) {
        if (contentLength < 20) throw brokenRecord(fileLabel, n, 'it is shorter than a point');
        vertices += 1;
      } else if (base === 8) {
        if (contentLength < 40) throw brokenRecord(fileLabel, n, 'it is shorter than its header');
        const points = int32LE(shape, 36);
        if (points < 0 || 40 + 16 * points > contentLength) throw brokenRecord(fileLabel, n, 'it declares more points than it holds');
        vertices += points;
      } else {
        if (contentLength < 44) throw brokenRecord(fileLabel, n, 'it is shorter than its header');
        const parts = int32LE(shape, 36);
        const points = int32LE(shape, 40);
        if (parts < 0 || points < 0 || 44 + 4 * parts + 16 * points > contentLength) {
          throw brokenRecord(fileLabel, n, 'it declares more parts or points than it holds');
        }
        const firsts = parts > 0 ? bytes.subarray(start + 44, start + 44 + 4 * parts) : shape.subarray(0, 0);
        let previous = -1;
        for (let k = 0; k < parts; k++) {
          const first = int32LE(firsts, 4 * k);
          if (first < 0 || first >= points || first <= previous || (k === 0 && first !== 0)) {
            throw brokenRecord(fileLabel, n, 'its list of parts is inconsistent');
          }
          previous = first;
        }
        if (parts === 0 && points > 0) throw brokenRecord(fileLabel, n, 'it has points but no parts');
        vertices += points;
      }
    }
    starts.push(p);
    records += 1;
    p = end;
  }
  starts.push(declared);
  return {
    shapeType,
    records,
    vertices,
    header,
    ...(bytes instanceof Uint8Array ? { body: bytes.subarray(0, declared) } : {}),
    warnings,
    offsets: Uint32Array.from(starts),
  };
}

/**
 * Decodes the geometries of a checked .shp, one per record (null for null shapes), in the file's coordinates.
 *
 * @param check - the result of {@link checkShp}.
 * @param fileLabel - how to name the file in messages.
 * @returns one geometry (or null) per record; polygons' rings grouped into Polygon/MultiPolygon by the library.
 * @throws UploadError corrupt_shp when decoding fails.
 * @example
 * parseCheckedShp(checkShp(bytes, 'leases.shp'), 'leases.shp')[0].type // 'Polygon'
 */
export function parseCheckedShp(check: ShpCheck, fileLabel: string): (Geometry | null)[] {
  return parseShpRange(check, 0, check.records, fileLabel);
}

/**
 * Decodes the geometries of records [from, to) of a checked .shp: the 100-byte header and those records are
 * copied into a small file of their own, so only that range's geometries exist at once (the streaming reader).
 *
 * @param check - the result of {@link checkShp}.
 * @param from - first record (counting from 0).
 * @param to - one past the last record (at most check.records).
 * @param fileLabel - how to name the file in messages.
 * @param source - where to read the records: by default the bytes checked (`check.body`); required when the
 *   check was made from another source (e.g. a new reader of the same zip entry).
 * @returns one geometry (or null) per record of the range.
 * @throws UploadError corrupt_shp when decoding fails; RangeError when there is nothing to read from.
 * @example
 * parseShpRange(checkShp(bytes, 'leases.shp'), 2, 4, 'leases.shp').length // 2
 */
export function parseShpRange(
  check: ShpCheck,
  from: number,
  to: number,
  fileLabel: string,
  source: ByteSource | undefined = check.body,
): (Geometry | null)[] {
  if (!source) throw new RangeError(`parseShpRange: ${fileLabel} was checked from a reader; pass a source of its bytes`);
  let geometries: (Geometry | null)[];
  const wanted = Math.max(0, to - from);
  let body: Uint8Array;
  if (from <= 0 && to >= check.records && source instanceof Uint8Array) body = source.subarray(0, check.offsets[check.records]);
  else {
    const a = check.offsets[from];
    const b = check.offsets[to];
    body = new Uint8Array(100 + (b - a));
    body.set(check.header, 0);
    body.set(source.subarray(a, b), 100);
    new DataView(body.buffer).setInt32(24, body.length / 2, false);
  }
  try {
    geometries = parseShp(new DataView(body.buffer, body.byteOffset, body.byteLength) as never) as (Geometry | null)[];
  } catch {
    throw new UploadError('corrupt_shp', `${fileLabel} cannot be read: its shapes are damaged. ${FIX_ADVICE}`, { file: fileLabel });
  }
  if (geometries.length !== wanted) {
    throw new UploadError(
      'corrupt_shp',
      `${fileLabel} cannot be read completely: ${formatCount(from + geometries.length)} of its ${formatCount(check.records)} shapes decoded. ${FIX_ADVICE}`,
      {
        file: fileLabel,
      },
    );
  }
  return geometries.map((g) => (g ? stripBbox(g) : null));
}

/**
 * The human name of a shape type code, e.g. 5 → 'polygon'.
 *
 * @example
 * shapeTypeName(13) // 'line (with heights)'
 */
export function shapeTypeName(code: number): string {
  return TYPE_NAMES[code] ?? `type ${code}`;
}

/** @private */
function brokenRecord(fileLabel: string, index: number, why: string): UploadError {
  return new UploadError(
    'corrupt_shp',
    `${fileLabel} is damaged at shape ${formatCount(index)} (counting from 0): ${why}. The file was probably truncated or altered. ${FIX_ADVICE}`,
    { file: fileLabel, record: index },
  );
}

/** @private The library attaches a source-CRS bbox; it is dropped (it would be wrong after reprojection). */
function stripBbox(g: Geometry): Geometry {
  const { bbox: _bbox, ...rest } = g as Geometry & { bbox?: unknown };
  return rest as Geometry;
}
