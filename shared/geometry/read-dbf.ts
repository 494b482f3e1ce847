/**
 * @module shared/geometry/read-dbf
 * Reads a shapefile's attribute table (.dbf, dBASE III/IV level 5) into plain JSON rows. The header is
 * checked first (so a truncated or corrupt table is refused with its file named, instead of yielding
 * garbage), the text encoding is chosen (.cpg if present, otherwise UTF-8, falling back to windows-1252
 * when the bytes are not UTF-8), and the rows are decoded by the shapefile library's parseDbf. The checks read the
 * table once, forward, from a {@link ByteSource}: the inflated file, or a zip entry read range by range.
 *
 * Layout (dBASE file header, ESRI Shapefile Technical Description 1998 + dBASE III PLUS format, (a)):
 * byte 0 version, 4–7 record count (uint32 LE), 8–9 header length, 10–11 record length, then 32-byte
 * field descriptors (name 0–10, type 11, length 16, decimals 17) ended by 0x0D; each record starts with
 * a deletion flag byte.
 */
import { parseDbf } from 'shpjs';
import type { ByteSource } from './byte-source';
import { UploadError } from './upload-error';
import { formatCount } from './upload-limits';

/** The result of {@link readDbf}. */
export interface DbfReading {
  /** Column names in file order. */
  fields: string[];
  /** One JSON-safe object per record (dates as 'YYYY-MM-DD', empty numbers as null). */
  rows: Record<string, string | number | boolean | null>[];
  /** WHATWG encoding label used to decode the text, e.g. 'utf-8', 'windows-1252'. */
  encoding: string;
  warnings: string[];
}

/** One field descriptor. */
export interface DbfField {
  /** The name as stored (NULs cut off), not yet decoded. */
  nameBytes: Uint8Array;
  /** dBASE type letter, upper case: C character, N numeric, D date, L logical… */
  type: string;
  /** Width in the record [bytes]. */
  length: number;
}

/** The result of {@link checkDbf}: what one pass over a .dbf keeps to choose its encoding and decode its rows. */
export interface DbfCheck {
  /** Rows the header declares (all present: checked). */
  records: number;
  /** Header length [bytes] (offset of the first row). */
  headerLength: number;
  /** Row length [bytes], the deletion flag included. */
  recordLength: number;
  /** The header's bytes (a copy): the 32-byte file header, the field descriptors and their 0x0D end. */
  header: Uint8Array;
  fields: DbfField[];
  /** The text (column names and character columns): all ASCII, valid UTF-8 with other characters, or not UTF-8. */
  text: 'ascii' | 'utf8' | 'invalid';
}

/** Rows are classified in blocks of about this many bytes [bytes] (at least one row). */
const TEXT_BLOCK_BYTES = 65_536;
const FIX_ADVICE = 'Export the layer again from your GIS and zip all of its files (.shp, .shx, .dbf, .prj, .cpg) together.';

/**
 * Reads a .dbf.
 *
 * @param bytes - the .dbf file.
 * @param fileLabel - how to name the file in messages, e.g. 'export/leases.dbf'.
 * @param cpg - the .cpg text (a code page name such as 'UTF-8', 'ISO-8859-1', '1252'), when the zip has one.
 * @returns fields, rows, the encoding used and warnings (encoding assumed, .cpg not usable).
 * @throws UploadError corrupt_dbf when the header or the table is truncated or inconsistent.
 * @example
 * readDbf(dbfBytes, 'leases.dbf', 'UTF-8').rows[0] // { LEASE_ID: 'FB-014', HOLDER: 'Saltreed Oysters' }
 */
export function readDbf(bytes: ByteSource, fileLabel: string, cpg?: string): DbfReading {
  const table = openDbf(bytes, fileLabel, cpg);
  return { fields: table.fields, rows: table.rows(0, table.records), encoding: table.encoding, warnings: table.warnings };
}

/** The result of {@link openDbf}: the checked header, and the rows decoded on demand. */
export interface DbfTable {
  fields: string[];
  encoding: string;
  warnings: string[];
  /** Number of rows the header declares (all present: checked). */
  records: number;
  /**
   * Decodes rows [from, to) (counting from 0), JSON-safe as in {@link DbfReading}, read from `source` (by default
   * the bytes the table was opened on; required when it was opened from a check alone).
   */
  rows: (from: number, to: number, source?: ByteSource) => Record<string, string | number | boolean | null>[];
}

/**
 * Checks a .dbf's header, chooses its text encoding over the whole table, and returns a reader of row
 * ranges, so a caller can hold the decoded rows of one range at a time (the streaming shapefile reader).
 *
 * @param bytes - the .dbf file, or a source of its bytes (kept by the returned reader).
 * @param fileLabel - how to name the file in messages.
 * @param cpg - the .cpg text, when the zip has one.
 * @throws UploadError corrupt_dbf as {@link readDbf}; the row reader throws it when rows do not decode.
 * @example
 * openDbf(dbfBytes, 'leases.dbf').rows(0, 2).length // 2
 */
export function openDbf(bytes: ByteSource, fileLabel: string, cpg?: string): DbfTable {
  return openCheckedDbf(checkDbf(bytes, fileLabel), fileLabel, cpg, bytes);
}

/**
 * Checks a .dbf's header and classifies its text as UTF-8 or not, in one forward pass over the file (the header,
 * then the rows in blocks), keeping only the header and the classification.
 *
 * @param bytes - the .dbf file, or a source of its bytes (read once, in increasing order).
 * @param fileLabel - how to name the file in messages.
 * @returns what {@link openCheckedDbf} needs to choose the encoding and decode rows.
 * @throws UploadError corrupt_dbf when the header or the table is truncated or inconsistent.
 * @example
 * checkDbf(dbfBytes, 'leases.dbf') // { records: 4, headerLength: 129, recordLength: 201, text: 'ascii', … }
 */
export function checkDbf(bytes: ByteSource, fileLabel: string): DbfCheck {
  const length = bytes.length;
  if (length < 32) {
    throw new UploadError(
      'corrupt_dbf',
      `${fileLabel} is only ${formatCount(length)} bytes long, shorter than the 32-byte header every .dbf starts with: the file is truncated or damaged. ${FIX_ADVICE}`,
      { file: fileLabel, bytes: length },
    );
  }
  const top = bytes.subarray(0, 32);
  const view = new DataView(top.buffer, top.byteOffset, top.byteLength);
  const records = view.getUint32(4, true);
  const headerLength = view.getUint16(8, true);
  const recordLength = view.getUint16(10, true);
  const limit = Math.min(headerLength, length);
  const header = bytes.subarray(0, Math.max(32, limit)).slice();
  const fields = readDescriptors(header, limit, fileLabel);
  const widthSum = fields.reduce((s, f) => s + f.length, 1);
  if (headerLength > length || recordLength !== widthSum) {
    throw new UploadError(
      'corrupt_dbf',
      `${fileLabel} has a damaged header (its record length, ${recordLength} bytes, does not match its ${fields.length} columns, or the header is longer than the file). ${FIX_ADVICE}`,
      { file: fileLabel },
    );
  }
  const needed = headerLength + records * recordLength;
  if (needed > length) {
    const whole = Math.max(0, Math.floor((length - headerLength) / recordLength));
    throw new UploadError(
      'corrupt_dbf',
      `${fileLabel} is truncated: its header declares ${formatCount(records)} rows of ${recordLength} bytes, but the file holds only ${formatCount(whole)} whole rows ` +
        `(${formatCount(length)} of ${formatCount(needed)} bytes). The copy or the export was cut short. ${FIX_ADVICE}`,
      { file: fileLabel, declaredRows: records, wholeRows: whole },
    );
  }
  const text = textIsUtf8(bytes, fields, headerLength, recordLength, records);
  return { records, headerLength, recordLength, header, fields, text };
}

/**
 * Chooses a checked .dbf's encoding (the .cpg when it can be followed, otherwise by its text) and returns a reader
 * of row ranges.
 *
 * @param check - the result of {@link checkDbf}.
 * @param fileLabel - how to name the file in messages.
 * @param cpg - the .cpg text, when the zip has one.
 * @param source - the bytes rows are read from by default; without it, each `rows` call is given its source.
 * @returns the table: column names, encoding, warnings (encoding assumed, .cpg not usable) and the row reader.
 * @example
 * const check = checkDbf(reader, 'leases.dbf');
 * openCheckedDbf(check, 'leases.dbf', 'UTF-8').rows(0, 2, openEntryReader(zip, dbfEntry, limits)).length // 2
 */
export function openCheckedDbf(check: DbfCheck, fileLabel: string, cpg?: string, source?: ByteSource): DbfTable {
  const { records, headerLength, recordLength, header, fields } = check;
  const warnings: string[] = [];
  const encoding = chooseEncoding(check.text, fileLabel, cpg, warnings);
  const decoder = new TextDecoder(encoding);
  const names = fields.map((f) => decodeName(f.nameBytes, decoder));
  // The library assumes the standard header length (32 × (fields + 1) + 1): each range is given a rebuilt header of that length.
  const standard = 32 * (fields.length + 1) + 1;

  const rows = (from: number, to: number, rowSource = source): Record<string, string | number | boolean | null>[] => {
    const n = Math.max(0, Math.min(to, records) - from);
    if (n === 0) return [];
    if (!rowSource) throw new RangeError(`rows: ${fileLabel} was opened from its check alone; pass a source of its bytes`);
    const table = new Uint8Array(standard + n * recordLength);
    table.set(header.subarray(0, standard - 1), 0);
    table[standard - 1] = 0x0d;
    const first = headerLength + from * recordLength;
    table.set(rowSource.subarray(first, first + n * recordLength), standard);
    const view = new DataView(table.buffer);
    view.setUint16(8, standard, true);
    view.setUint32(4, n, true);
    let raw: Record<string, unknown>[];
    try {
      raw = parseDbf(view as never, encoding as never) as Record<string, unknown>[];
    } catch {
      throw new UploadError('corrupt_dbf', `${fileLabel} cannot be read: its rows do not match its header. ${FIX_ADVICE}`, {
        file: fileLabel,
      });
    }
    return raw.map((row) => {
      const out: Record<string, string | number | boolean | null> = {};
      for (const [key, value] of Object.entries(row)) out[key] = jsonSafe(value);
      return out;
    });
  };
  return { fields: names, encoding, warnings, records, rows };
}

/**
 * Maps a .cpg text to a WHATWG encoding label TextDecoder accepts, or null when it names an encoding
 * browsers and Node do not decode (e.g. DOS code page 437). Numeric code pages follow the Windows
 * numbering (65001 = UTF-8, 1250–1258 = windows-125x, 2859n = ISO-8859-n). Note that, per the WHATWG
 * Encoding Standard, the labels 'iso-8859-1' and 'latin1' decode as windows-1252 (a superset).
 *
 * @example
 * encodingFromCpg('UTF-8') // 'utf-8'
 * encodingFromCpg('ANSI 1252') // 'windows-1252'
 * encodingFromCpg('ISO-8859-1') // 'windows-1252'
 * encodingFromCpg('437') // null
 */
export function encodingFromCpg(cpg: string): string | null {
  const text = cpg.replace(/^\uFEFF/, '').trim();
  const t = text.toUpperCase();
  const windows = /^(?:CP|WINDOWS-?|ANSI\s*|WIN)?(125\d|874)$/.exec(t);
  const iso = /^(?:ISO[-_ ]?)?8859[-_ ]?(\d{1,2})$/.exec(t) ?? /^2859(\d)$/.exec(t);
  let label: string = text;
  if (/^(UTF-?8|65001|CP65001)$/.test(t)) label = 'utf-8';
  else if (windows) label = `windows-${windows[1]}`;
  else if (iso) label = `iso-8859-${iso[1]}`;
  else if (/^(LATIN-?1|L1)$/.test(t)) label = 'iso-8859-1';
  else if (/^(?:CP)?866$/.test(t)) label = 'ibm866';
  else if (/^(?:CP)?932$/.test(t)) label = 'shift_jis';
  else if (/^(?:CP)?936$/.test(t)) label = 'gbk';
  else if (/^(?:CP)?949$/.test(t)) label = 'euc-kr';
  else if (/^(?:CP)?950$/.test(t)) label = 'big5';
  else if (/^20866$/.test(t)) label = 'koi8-r';
  try {
    return new TextDecoder(label).encoding;
  } catch {
    return null;
  }
}

/** @private Reads the field descriptors up to the 0x0D terminator, within the header's first `limit` bytes. */
function readDescriptors(bytes: Uint8Array, limit: number, fileLabel: string): DbfField[] {
  const fields: DbfField[] = [];
  let p = 32;
  while (p < limit && bytes[p] !== 0x0d) {
    if (p + 32 > limit) break;
    const type = String.fromCharCode(bytes[p + 11]);
    if (!/^[A-Z@+0-9]$/i.test(type)) {
      throw new UploadError(
        'corrupt_dbf',
        `${fileLabel} has a damaged header: column ${fields.length + 1} has an unknown type code. ${FIX_ADVICE}`,
        { file: fileLabel },
      );
    }
    let end = 0;
    while (end < 11 && bytes[p + end] !== 0) end++;
    fields.push({ nameBytes: bytes.subarray(p, p + end), type: type.toUpperCase(), length: bytes[p + 16] });
    p += 32;
  }
  if (p >= limit || bytes[p] !== 0x0d) {
    throw new UploadError('corrupt_dbf', `${fileLabel} has a damaged or truncated header (the list of columns never ends). ${FIX_ADVICE}`, {
      file: fileLabel,
    });
  }
  return fields;
}

/** @private Picks the text encoding, adding a warning whenever it was assumed or the .cpg could not be followed. */
function chooseEncoding(utf8: DbfCheck['text'], fileLabel: string, cpg: string | undefined, warnings: string[]): string {
  const cpgFile = fileLabel.replace(/\.dbf$/i, '.cpg');
  if (cpg !== undefined) {
    const declared = encodingFromCpg(cpg);
    if (declared && !(declared === 'utf-8' && utf8 === 'invalid')) return declared;
    const fallback = utf8 === 'invalid' ? 'windows-1252' : 'utf-8';
    if (declared === 'utf-8') {
      warnings.push(
        `${cpgFile} says the table is UTF-8, but ${fileLabel} holds text that is not valid UTF-8; it was read as windows-1252 (Western European). ` +
          'Check accented names; if they look wrong, set the right code page in the .cpg (e.g. ISO-8859-1 or 1252) and upload again.',
      );
    } else if (utf8 !== 'ascii') {
      warnings.push(
        `${cpgFile} names an encoding this server cannot decode ("${cpg.trim().slice(0, 40)}"), so ${fileLabel} was read as ${fallback}. ` +
          'Check accented names; if they look wrong, save the table as UTF-8 (or write UTF-8 in the .cpg if it already is) and upload again.',
      );
    }
    return fallback;
  }
  if (utf8 === 'ascii') return 'utf-8';
  if (utf8 === 'utf8') {
    warnings.push(
      `${fileLabel} has no .cpg saying how its text is encoded; it was read as UTF-8, which all of its text is valid in. ` +
        `If accented names look wrong, add a ${cpgFile} holding the encoding (e.g. UTF-8 or 1252) and upload again.`,
    );
    return 'utf-8';
  }
  warnings.push(
    `${fileLabel} has no .cpg saying how its text is encoded, and its text is not UTF-8; it was read as windows-1252 (Western European, a superset of ISO-8859-1). ` +
      `If accented names look wrong, add a ${cpgFile} holding the right code page (e.g. ISO-8859-1, 1252 or UTF-8) and upload again.`,
  );
  return 'windows-1252';
}

/**
 * @private Classifies the table's text bytes (column names and character columns): 'ascii', 'utf8' (valid,
 * with non-ASCII), or 'invalid'. A multi-byte sequence cut off at the end of a field counts as valid, since
 * writers truncate UTF-8 text to the column width. The rows are read in blocks of about {@link TEXT_BLOCK_BYTES}.
 */
function textIsUtf8(
  bytes: ByteSource,
  fields: DbfField[],
  headerLength: number,
  recordLength: number,
  records: number,
): 'ascii' | 'utf8' | 'invalid' {
  let nonAscii = false;
  for (const f of fields) {
    const r = utf8Status(f.nameBytes, 0, f.nameBytes.length);
    if (r === 'invalid') return 'invalid';
    if (r === 'utf8') nonAscii = true;
  }
  const offsets: { start: number; length: number }[] = [];
  let o = 1;
  for (const f of fields) {
    if (f.type === 'C' || f.type === 'M' || f.type === 'V') offsets.push({ start: o, length: f.length });
    o += f.length;
  }
  if (offsets.length === 0) return nonAscii ? 'utf8' : 'ascii';
  const perBlock = Math.max(1, Math.floor(TEXT_BLOCK_BYTES / recordLength));
  for (let r = 0; r < records; r += perBlock) {
    const n = Math.min(perBlock, records - r);
    const block = bytes.subarray(headerLength + r * recordLength, headerLength + (r + n) * recordLength);
    for (let k = 0; k < n; k++) {
      const base = k * recordLength;
      for (const { start, length } of offsets) {
        const s = utf8Status(block, base + start, base + start + length);
        if (s === 'invalid') return 'invalid';
        if (s === 'utf8') nonAscii = true;
      }
    }
  }
  return nonAscii ? 'utf8' : 'ascii';
}

/** @private UTF-8 well-formedness (RFC 3629 §4 byte ranges) of bytes[start, end), tolerating a truncated final sequence. */
function utf8Status(bytes: Uint8Array, start: number, end: number): 'ascii' | 'utf8' | 'invalid' {
  let nonAscii = false;
  let i = start;
  while (i < end) {
    const b = bytes[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    nonAscii = true;
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) need = 1;
    else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      if (b === 0xe0) lo = 0xa0;
      if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      if (b === 0xf0) lo = 0x90;
      if (b === 0xf4) hi = 0x8f;
    } else return 'invalid';
    for (let k = 1; k <= need; k++) {
      if (i + k >= end) return 'utf8'; // cut off at the field's end: written truncated
      const c = bytes[i + k];
      if (k === 1 ? c < lo || c > hi : c < 0x80 || c > 0xbf) return 'invalid';
    }
    i += need + 1;
  }
  return nonAscii ? 'utf8' : 'ascii';
}

/** @private Decodes a column name the way the row decoder does (NULs removed, trimmed). */
function decodeName(bytes: Uint8Array, decoder: TextDecoder): string {
  return decoder.decode(bytes).replace(/\0/g, '').trim();
}

/** @private Dates become 'YYYY-MM-DD' (built from the local calendar fields the library set), NaN becomes null. */
function jsonSafe(value: unknown): string | number | boolean | null {
  if (value instanceof Date) {
    if (Number.isNaN(value.getTime())) return null;
    const y = String(value.getFullYear()).padStart(4, '0');
    const m = String(value.getMonth() + 1).padStart(2, '0');
    const d = String(value.getDate()).padStart(2, '0');
    return `${y}-${m}-${d}`;
  }
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (typeof value === 'string' || typeof value === 'boolean') return value;
  return value === null || value === undefined ? null : String(value);
}
