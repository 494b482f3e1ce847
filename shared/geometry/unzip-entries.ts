/**
 * @module shared/geometry/unzip-entries
 * Reads a zip's table of contents (central directory) and inflates only the entries asked for, refusing
 * zip bombs twice: by the sizes the entries declare, before inflating anything, and by the bytes actually
 * inflated, counted while streaming (an entry that lies about its size is stopped as soon as it passes
 * the limit). CRC-32 is checked on every inflated entry. An entry can also be read in bounded memory, range by
 * range ({@link openEntryReader}), under the same refusals.
 *
 * Format: PKWARE APPNOTE.TXT 6.3.x (a) — local file header 0x04034b50, central directory header
 * 0x02014b50, end of central directory 0x06054b50, ZIP64 records 0x06064b50 / locator 0x07064b50,
 * ZIP64 extra field 0x0001, general-purpose flag bit 0 = encrypted, bit 11 = UTF-8 names.
 */
import { Inflate } from 'fflate';
import type { ByteSource } from './byte-source';
import { UploadError } from './upload-error';
import { formatBytes, type UploadLimits, UPLOAD_LIMIT_SETTINGS } from './upload-limits';

/** One entry of a zip's central directory. */
export interface ZipEntryInfo {
  /** Full path inside the zip, '/'-separated, e.g. 'export/leases.shp'. */
  path: string;
  /** True for folder entries (path ends in '/'). */
  isDirectory: boolean;
  /** Compression method: 0 stored, 8 deflate (others are refused when inflated). */
  method: number;
  /** General-purpose bit flags. */
  flags: number;
  /** CRC-32 of the uncompressed bytes, as declared. */
  crc32: number;
  /** Compressed size [bytes], as declared. */
  compressedSize: number;
  /** Uncompressed size [bytes], as declared (may be a lie: inflation is capped independently). */
  declaredSize: number;
  /** Offset of the entry's local header from the start of the zip [bytes]. */
  localHeaderOffset: number;
}

const SIG_LOCAL = 0x04034b50;
const SIG_CENTRAL = 0x02014b50;
const SIG_END = 0x06054b50;
const SIG_ZIP64_END = 0x06064b50;
const SIG_ZIP64_LOCATOR = 0x07064b50;
/** Compressed bytes pushed into the inflater at a time: bounds the output of one push to ~1032× this (deflate's maximum ratio). */
const PUSH_BYTES = 16_384;
/** Entries beyond this are refused: no shapefile upload needs thousands of files. */
const MAX_ENTRIES = 10_000;

const CORRUPT_ADVICE = 'Make the zip again from the original files (all of a shapefile’s .shp, .shx, .dbf and .prj) and upload it.';

/**
 * Lists a zip's entries from its central directory, without inflating anything.
 *
 * @param zip - the whole zip file.
 * @returns the entries in directory order.
 * @throws UploadError corrupt_zip (no end-of-directory record, entries outside the file), empty_zip (no entries).
 * @example
 * listZipEntries(bytes).map((e) => e.path) // ['leases.shp', 'leases.shx', 'leases.dbf', 'leases.prj']
 */
export function listZipEntries(zip: Uint8Array): ZipEntryInfo[] {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  const end = findEndOfCentralDirectory(view);
  let count = view.getUint16(end + 10, true);
  let dirOffset = view.getUint32(end + 16, true);
  if (count === 0xffff || dirOffset === 0xffffffff) {
    const locator = end - 20;
    if (locator >= 0 && view.getUint32(locator, true) === SIG_ZIP64_LOCATOR) {
      const z64 = readUint64(view, locator + 8);
      if (z64 + 56 <= view.byteLength && view.getUint32(z64, true) === SIG_ZIP64_END) {
        count = readUint64(view, z64 + 32);
        dirOffset = readUint64(view, z64 + 48);
      }
    }
  }
  if (count === 0) {
    throw new UploadError(
      'empty_zip',
      'The zip file is empty: it holds no files. Zip the shapefile’s .shp, .shx, .dbf and .prj together and upload again.',
    );
  }
  if (count > MAX_ENTRIES) {
    throw new UploadError(
      'corrupt_zip',
      `The zip lists ${count} files; an upload takes at most ${MAX_ENTRIES}. Zip only the layer you want to upload (its .shp, .shx, .dbf and .prj).`,
      { entries: count },
    );
  }
  const entries: ZipEntryInfo[] = [];
  let p = dirOffset;
  for (let i = 0; i < count; i++) {
    if (p + 46 > view.byteLength || view.getUint32(p, true) !== SIG_CENTRAL) {
      throw new UploadError(
        'corrupt_zip',
        `The zip file is damaged: its table of contents breaks off at entry ${i + 1} of ${count}. ${CORRUPT_ADVICE}`,
      );
    }
    const flags = view.getUint16(p + 8, true);
    const method = view.getUint16(p + 10, true);
    const crc32 = view.getUint32(p + 16, true);
    let compressedSize = view.getUint32(p + 20, true);
    let declaredSize = view.getUint32(p + 24, true);
    const nameLength = view.getUint16(p + 28, true);
    const extraLength = view.getUint16(p + 30, true);
    const commentLength = view.getUint16(p + 32, true);
    let localHeaderOffset = view.getUint32(p + 42, true);
    const nameStart = p + 46;
    if (nameStart + nameLength + extraLength > view.byteLength) {
      throw new UploadError('corrupt_zip', `The zip file is damaged: entry ${i + 1} runs past the end of the file. ${CORRUPT_ADVICE}`);
    }
    const path = decodeName(zip.subarray(nameStart, nameStart + nameLength), (flags & 0x800) !== 0);
    // ZIP64 extra field: only the fields that are 0xFFFFFFFF in the header are present, in this order.
    let e = nameStart + nameLength;
    const extraEnd = e + extraLength;
    while (e + 4 <= extraEnd) {
      const id = view.getUint16(e, true);
      const size = view.getUint16(e + 2, true);
      if (id === 0x0001) {
        let q = e + 4;
        if (declaredSize === 0xffffffff && q + 8 <= e + 4 + size) {
          declaredSize = readUint64(view, q);
          q += 8;
        }
        if (compressedSize === 0xffffffff && q + 8 <= e + 4 + size) {
          compressedSize = readUint64(view, q);
          q += 8;
        }
        if (localHeaderOffset === 0xffffffff && q + 8 <= e + 4 + size) localHeaderOffset = readUint64(view, q);
      }
      e += 4 + size;
    }
    entries.push({ path, isDirectory: path.endsWith('/'), method, flags, crc32, compressedSize, declaredSize, localHeaderOffset });
    p = extraEnd + commentLength;
  }
  return entries;
}

/**
 * True for entries an upload never needs: folders, macOS resource forks (`__MACOSX/`, `._name`) and
 * desktop clutter (`.DS_Store`, `Thumbs.db`, `desktop.ini`).
 *
 * @example
 * isIgnorableEntry('__MACOSX/export/._leases.shp') // true
 */
export function isIgnorableEntry(path: string): boolean {
  if (path.endsWith('/')) return true;
  const parts = path.split('/');
  if (parts.some((s) => s === '__MACOSX')) return true;
  const base = parts[parts.length - 1];
  return base.startsWith('._') || base === '.DS_Store' || base.toLowerCase() === 'thumbs.db' || base.toLowerCase() === 'desktop.ini';
}

/**
 * Inflates the given entries, refusing the lot first if their declared sizes add up to more than
 * `limits.maxUncompressedBytes`, then stopping any entry as soon as the bytes actually inflated pass that
 * limit (in total) or its own declared size.
 *
 * @param zip - the whole zip file.
 * @param entries - the entries to inflate (from {@link listZipEntries}).
 * @param limits - uses maxUncompressedBytes.
 * @returns path → bytes.
 * @throws UploadError uncompressed_too_large (413), encrypted_zip, unsupported_zip_compression, corrupt_zip.
 * @example
 * const wanted = listZipEntries(zip).filter((e) => e.path.endsWith('.shp'));
 * inflateEntries(zip, wanted, DEFAULT_UPLOAD_LIMITS).get('leases.shp')
 */
export function inflateEntries(
  zip: Uint8Array,
  entries: readonly ZipEntryInfo[],
  limits: Pick<UploadLimits, 'maxUncompressedBytes'>,
): Map<string, Uint8Array> {
  checkDeclaredSizes(entries, limits);
  const max = limits.maxUncompressedBytes;
  const out = new Map<string, Uint8Array>();
  let inflatedTotal = 0;
  for (const entry of entries) {
    const data = entryData(zip, entry);
    const budget = max - inflatedTotal;
    const bytes = entry.method === 0 ? storedEntry(data, entry, budget, max) : inflateCapped(data, entry, budget, max);
    inflatedTotal += bytes.length;
    if (crc32(bytes) !== entry.crc32 >>> 0) throw badChecksum(entry);
    out.set(entry.path, bytes);
  }
  return out;
}

/**
 * Refuses entries whose declared sizes add up to more than `limits.maxUncompressedBytes`, before anything is
 * inflated (the first of {@link inflateEntries}' refusals, for callers that read entries with {@link openEntryReader}).
 *
 * @param entries - every entry the caller will inflate.
 * @param limits - uses maxUncompressedBytes.
 * @throws UploadError uncompressed_too_large (413).
 * @example
 * checkDeclaredSizes(listZipEntries(zip), DEFAULT_UPLOAD_LIMITS) // throws for a declared zip bomb
 */
export function checkDeclaredSizes(entries: readonly ZipEntryInfo[], limits: Pick<UploadLimits, 'maxUncompressedBytes'>): void {
  const max = limits.maxUncompressedBytes;
  const declaredTotal = entries.reduce((sum, e) => sum + e.declaredSize, 0);
  if (declaredTotal > max) {
    const biggest = [...entries].sort((a, b) => b.declaredSize - a.declaredSize)[0];
    throw new UploadError(
      'uncompressed_too_large',
      `The zip’s files expand to ${formatBytes(declaredTotal)} (${biggest.path} alone to ${formatBytes(biggest.declaredSize)}); ` +
        `this server unpacks at most ${formatBytes(max)} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxUncompressedBytes}). ` +
        'Upload fewer or smaller layers, or simplify the boundaries.',
      { declaredBytes: declaredTotal, limitBytes: max, largestEntry: biggest.path },
    );
  }
}

/** A zip entry read range by range: see {@link openEntryReader}. */
export interface EntryReader extends ByteSource {
  /** The entry's declared size [bytes] (a different real size is refused when reached, or by `finish`). */
  readonly length: number;
  /** True once the reader has thrown one of the zip's refusals (it throws the same one again on any later call). */
  readonly failed: boolean;
  /**
   * Inflates on to the entry's end, keeping nothing, and refuses it if its real size is not its declared one or
   * (when verifying) its CRC-32 is wrong; then lets its buffer go.
   *
   * @returns the entry's real size [bytes].
   */
  finish(): number;
}

/**
 * Opens one entry for reading in bounded memory: `subarray(begin, end)` inflates (fflate's streaming `Inflate`,
 * {@link PUSH_BYTES} compressed bytes at a time) only up to `end`, and keeps only the bytes from `begin` on, so the
 * reader holds what the current range needs plus one push's output. Ranges are meant to be asked for in
 * increasing order; a range that starts before the kept window restarts the inflation from the entry's first byte.
 * A stored entry is handed out as views of the zip itself. The refusals are {@link inflateEntries}' for this entry,
 * in the same order (the declared sizes of all entries are refused beforehand with {@link checkDeclaredSizes}):
 * encrypted, unsupported method, damaged local header and cut-short data on opening; the budget
 * (maxUncompressedBytes less what was inflated before) and damaged DEFLATE data while inflating; a real size that is
 * not the declared one when the data ends; and, with `verify`, the CRC-32 in `finish`.
 *
 * @param zip - the whole zip file (kept by the reader).
 * @param entry - the entry (from {@link listZipEntries}).
 * @param limits - uses maxUncompressedBytes.
 * @param options - `inflatedBefore`: bytes the upload's earlier entries inflated to [bytes, default 0];
 *   `verify`: compute the CRC-32 as the bytes pass, for `finish` to check (the first pass over an entry).
 * @throws UploadError encrypted_zip, unsupported_zip_compression, corrupt_zip, uncompressed_too_large (413).
 * @example
 * const reader = openEntryReader(zip, shpEntry, DEFAULT_UPLOAD_LIMITS, { verify: true });
 * reader.subarray(0, 100); // the .shp header, having inflated little more than that
 * reader.finish(); // the .shp's size, once its CRC-32 is checked
 */
export function openEntryReader(
  zip: Uint8Array,
  entry: ZipEntryInfo,
  limits: Pick<UploadLimits, 'maxUncompressedBytes'>,
  options: { inflatedBefore?: number; verify?: boolean } = {},
): EntryReader {
  const data = entryData(zip, entry);
  const max = limits.maxUncompressedBytes;
  const budget = max - (options.inflatedBefore ?? 0);
  if (entry.method === 0) {
    checkStoredSize(data, entry, budget, max);
    return new StoredEntryReader(data, entry, options.verify === true);
  }
  return new InflatingEntryReader(data, entry, budget, max, options.verify === true);
}

/** @private A stored entry: its bytes are the zip's own, handed out as views. */
class StoredEntryReader implements EntryReader {
  readonly length: number;
  readonly failed = false;
  private readonly data: Uint8Array;
  private readonly entry: ZipEntryInfo;
  private readonly verify: boolean;

  constructor(data: Uint8Array, entry: ZipEntryInfo, verify: boolean) {
    this.data = data;
    this.entry = entry;
    this.verify = verify;
    this.length = data.length;
  }

  subarray(begin: number, end: number): Uint8Array {
    return this.data.subarray(begin, end);
  }

  finish(): number {
    if (this.verify && crc32(this.data) !== this.entry.crc32 >>> 0) throw badChecksum(this.entry);
    return this.data.length;
  }
}

/** @private A deflated entry, inflated on demand into a window that keeps only the bytes from the last range's start. */
class InflatingEntryReader implements EntryReader {
  readonly length: number;
  private inflater!: Inflate;
  /** Compressed bytes pushed so far. */
  private pushed = 0;
  /** True once the last compressed piece is pushed. */
  private ended = false;
  /** Bytes inflated since the (re)start. */
  private produced = 0;
  /** Inflated bytes before this entry offset are not kept. */
  private keepFrom = 0;
  /** Kept bytes: buffer[bufferStart, bufferEnd) is the entry from offset windowStart. */
  private buffer = new Uint8Array(0);
  private bufferStart = 0;
  private bufferEnd = 0;
  private windowStart = 0;
  /** CRC-32 of the entry's bytes [0, crcEnd), when verifying. */
  private crc = 0;
  private crcEnd = 0;
  private overBudget = false;
  private failure: UploadError | null = null;
  private readonly data: Uint8Array;
  private readonly entry: ZipEntryInfo;
  /** Bytes this entry may inflate to: maxUncompressedBytes less what the upload's earlier entries took. */
  private readonly budget: number;
  private readonly max: number;
  private readonly verify: boolean;

  constructor(data: Uint8Array, entry: ZipEntryInfo, budget: number, max: number, verify: boolean) {
    this.data = data;
    this.entry = entry;
    this.budget = budget;
    this.max = max;
    this.verify = verify;
    this.length = entry.declaredSize;
    this.restart();
  }

  get failed(): boolean {
    return this.failure !== null;
  }

  subarray(begin: number, end: number): Uint8Array {
    if (this.failure) throw this.failure;
    if (begin < this.windowStart) this.restart();
    this.forget(begin);
    while (this.windowStart + (this.bufferEnd - this.bufferStart) < end && !this.ended) this.pump();
    if (this.windowStart + (this.bufferEnd - this.bufferStart) < end) throw this.fail(sizeMismatch(this.entry, this.produced));
    const at = this.bufferStart - this.windowStart;
    return this.buffer.subarray(at + begin, at + end);
  }

  finish(): number {
    if (this.failure) throw this.failure;
    this.forget(Number.POSITIVE_INFINITY);
    while (!this.ended) this.pump();
    if (this.produced !== this.entry.declaredSize) throw this.fail(sizeMismatch(this.entry, this.produced));
    if (this.verify && this.crc !== this.entry.crc32 >>> 0) throw this.fail(badChecksum(this.entry));
    this.buffer = new Uint8Array(0);
    this.bufferStart = 0;
    this.bufferEnd = 0;
    return this.produced;
  }

  /** @private Back to the entry's first byte (the CRC already computed is kept: bytes are counted once). */
  private restart(): void {
    this.inflater = new Inflate((chunk) => this.append(chunk));
    this.pushed = 0;
    this.ended = false;
    this.produced = 0;
    this.keepFrom = 0;
    this.bufferStart = 0;
    this.bufferEnd = 0;
    this.windowStart = 0;
  }

  /** @private Drops the kept bytes before entry offset `begin`, and keeps none inflated later before it. */
  private forget(begin: number): void {
    this.keepFrom = begin;
    const windowEnd = this.windowStart + (this.bufferEnd - this.bufferStart);
    if (begin >= windowEnd) {
      this.bufferStart = 0;
      this.bufferEnd = 0;
      this.windowStart = begin;
    } else if (begin > this.windowStart) {
      this.bufferStart += begin - this.windowStart;
      this.windowStart = begin;
    }
  }

  /** @private Pushes the next compressed piece, as inflateCapped does, turning the inflater's failures into refusals. */
  private pump(): void {
    const data = this.data;
    try {
      if (data.length === 0) {
        this.ended = true;
        this.inflater.push(new Uint8Array(0), true);
        return;
      }
      const next = Math.min(this.pushed + PUSH_BYTES, data.length);
      const last = next >= data.length;
      const piece = data.subarray(this.pushed, next);
      this.pushed = next;
      this.ended = last;
      this.inflater.push(piece, last);
    } catch {
      if (this.overBudget) throw this.fail(tooLargeWhileInflating(this.entry, this.max));
      throw this.fail(cannotUnpack(this.entry));
    }
  }

  /** @private The inflater's output: counted against the budget, added to the CRC, and kept from `keepFrom` on. */
  private append(chunk: Uint8Array): void {
    const start = this.produced;
    if (start + chunk.length > this.budget) {
      this.overBudget = true;
      throw new Error('inflate stopped: over budget');
    }
    this.produced += chunk.length;
    if (this.verify && this.produced > this.crcEnd) {
      this.crc = crc32(chunk.subarray(this.crcEnd - start), this.crc);
      this.crcEnd = this.produced;
    }
    const skip = this.keepFrom - start;
    if (skip >= chunk.length) return;
    const piece = skip > 0 ? chunk.subarray(skip) : chunk;
    if (this.bufferEnd + piece.length > this.buffer.length) {
      const live = this.bufferEnd - this.bufferStart;
      if (live + piece.length <= this.buffer.length) this.buffer.copyWithin(0, this.bufferStart, this.bufferEnd);
      else {
        const grown = new Uint8Array(Math.max(live + piece.length, 2 * live));
        grown.set(this.buffer.subarray(this.bufferStart, this.bufferEnd));
        this.buffer = grown;
      }
      this.bufferStart = 0;
      this.bufferEnd = live;
    }
    this.buffer.set(piece, this.bufferEnd);
    this.bufferEnd += piece.length;
  }

  /** @private Remembers the refusal, so later calls throw it again. */
  private fail(error: UploadError): UploadError {
    this.failure = error;
    return error;
  }
}

/**
 * @private An entry's compressed bytes, after the refusals that need no inflating (in inflateEntries' order):
 * encrypted, unsupported method, local header not where the directory says, data running past the zip's end.
 */
function entryData(zip: Uint8Array, entry: ZipEntryInfo): Uint8Array {
  const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
  if (entry.flags & 0x1) {
    throw new UploadError(
      'encrypted_zip',
      `${entry.path} in the zip is password-protected, and encrypted files cannot be read. Make the zip again without a password and upload it.`,
      { entry: entry.path },
    );
  }
  if (entry.method !== 0 && entry.method !== 8) {
    throw new UploadError(
      'unsupported_zip_compression',
      `${entry.path} in the zip is compressed with method ${entry.method}, which this server does not unpack (it reads "stored" and "deflate", ` +
        'the standard zip methods). Make the zip again with standard compression and upload it.',
      { entry: entry.path, method: entry.method },
    );
  }
  const h = entry.localHeaderOffset;
  if (h + 30 > view.byteLength || view.getUint32(h, true) !== SIG_LOCAL) {
    throw new UploadError(
      'corrupt_zip',
      `The zip file is damaged: ${entry.path} cannot be found where its table of contents says. ${CORRUPT_ADVICE}`,
      {
        entry: entry.path,
      },
    );
  }
  const dataStart = h + 30 + view.getUint16(h + 26, true) + view.getUint16(h + 28, true);
  const dataEnd = dataStart + entry.compressedSize;
  if (dataEnd > view.byteLength) {
    throw new UploadError(
      'corrupt_zip',
      `The zip file is incomplete: ${entry.path} is cut short (was the upload or the copy interrupted?). ${CORRUPT_ADVICE}`,
      {
        entry: entry.path,
      },
    );
  }
  return zip.subarray(dataStart, dataEnd);
}

/** @private */
function storedEntry(data: Uint8Array, entry: ZipEntryInfo, budget: number, max: number): Uint8Array {
  checkStoredSize(data, entry, budget, max);
  return data.slice();
}

/** @private A stored entry's size against the budget, then against its declared size. */
function checkStoredSize(data: Uint8Array, entry: ZipEntryInfo, budget: number, max: number): void {
  if (data.length > budget) throw tooLargeWhileInflating(entry, max);
  if (data.length !== entry.declaredSize) {
    throw new UploadError(
      'corrupt_zip',
      `The zip file is damaged: ${entry.path} is not the size its table of contents says. ${CORRUPT_ADVICE}`,
      {
        entry: entry.path,
      },
    );
  }
}

/**
 * @private Streams `data` through a DEFLATE decoder, stopping as soon as the output passes the budget (what
 * is left of maxUncompressedBytes). An entry that ends within the budget but not at its declared size is damaged.
 */
function inflateCapped(data: Uint8Array, entry: ZipEntryInfo, budget: number, max: number): Uint8Array {
  // The output goes straight into one buffer of the declared size (within the budget), so an entry costs its own
  // size once, not its chunks and then their concatenation. Only an entry that inflates past its declared size
  // (damaged: refused below once its real size is known) falls back to collecting chunks.
  let out: Uint8Array | null = new Uint8Array(Math.min(entry.declaredSize, budget));
  const chunks: Uint8Array[] = [];
  let total = 0;
  let overBudget = false;
  const inflater = new Inflate((chunk) => {
    if (total + chunk.length > budget) {
      overBudget = true;
      throw new Error('inflate stopped: over budget');
    }
    if (out && total + chunk.length <= out.length) out.set(chunk, total);
    else {
      if (out) chunks.push(out.subarray(0, total));
      out = null;
      chunks.push(chunk.slice());
    }
    total += chunk.length;
  });
  try {
    if (data.length === 0) inflater.push(new Uint8Array(0), true);
    for (let i = 0; i < data.length; i += PUSH_BYTES) {
      const last = i + PUSH_BYTES >= data.length;
      inflater.push(data.subarray(i, last ? data.length : i + PUSH_BYTES), last);
    }
  } catch {
    if (overBudget) throw tooLargeWhileInflating(entry, max);
    throw cannotUnpack(entry);
  }
  if (total !== entry.declaredSize || !out) throw sizeMismatch(entry, total);
  return out;
}

/** @private The refusal of an entry whose bytes are damaged: `what` says how, e.g. 'fails its checksum'. */
function damagedEntry(entry: ZipEntryInfo, what: string): UploadError {
  return new UploadError('corrupt_zip', `The zip file is damaged: ${entry.path} ${what}. ${CORRUPT_ADVICE}`, { entry: entry.path });
}

/** @private */
const cannotUnpack = (entry: ZipEntryInfo) => damagedEntry(entry, 'cannot be unpacked');

/** @private */
const badChecksum = (entry: ZipEntryInfo) => damagedEntry(entry, 'fails its checksum');

/** @private A deflated entry whose real size is not its declared one. */
function sizeMismatch(entry: ZipEntryInfo, total: number): UploadError {
  return new UploadError(
    'corrupt_zip',
    `The zip file is damaged: ${entry.path} unpacks to ${formatBytes(total)}, not the ${formatBytes(entry.declaredSize)} its table of contents declares. ${CORRUPT_ADVICE}`,
    { entry: entry.path, declaredBytes: entry.declaredSize, inflatedBytes: total },
  );
}


/** @private */
function tooLargeWhileInflating(entry: ZipEntryInfo, max: number): UploadError {
  return new UploadError(
    'uncompressed_too_large',
    `The zip expands to more than ${formatBytes(max)} (unpacking stopped inside ${entry.path}); ` +
      `this server unpacks at most ${formatBytes(max)} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxUncompressedBytes}). ` +
      'Make the zip again from the original files and upload it.',
    { entry: entry.path, limitBytes: max },
  );
}

/** @private Scans back from the end for the end-of-central-directory record (it is followed by a comment of ≤ 65 535 bytes). */
function findEndOfCentralDirectory(view: DataView): number {
  const last = view.byteLength - 22;
  const first = Math.max(0, last - 65_535);
  for (let p = last; p >= first; p--) {
    if (view.getUint32(p, true) === SIG_END) return p;
  }
  throw new UploadError(
    'corrupt_zip',
    'The zip file is incomplete or damaged: its table of contents (at the end of the file) is missing, which usually means the upload or the copy was cut short. ' +
      CORRUPT_ADVICE,
  );
}

/** @private Little-endian unsigned 64-bit value as a Number (exact below 2^53). */
function readUint64(view: DataView, offset: number): number {
  return view.getUint32(offset, true) + view.getUint32(offset + 4, true) * 2 ** 32;
}

/** @private Entry names are UTF-8 when flag bit 11 is set; otherwise IBM 437 — read here as UTF-8, then windows-1252, which agree on ASCII. */
function decodeName(bytes: Uint8Array, utf8Flag: boolean): string {
  if (utf8Flag) return new TextDecoder('utf-8').decode(bytes);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return new TextDecoder('windows-1252').decode(bytes);
  }
}

let crcTable: Uint32Array | null = null;

/**
 * CRC-32 (ISO-HDLC: polynomial 0xEDB88320 reflected, init and final XOR 0xFFFFFFFF), as zip uses it.
 * Check value: crc32 of ASCII "123456789" = 0xCBF43926 (the catalogue check value of CRC-32/ISO-HDLC).
 * Incremental as zlib's: `crc32(b, crc32(a))` is the CRC-32 of a followed by b.
 *
 * @param bytes - the bytes to add.
 * @param previous - the CRC-32 of the bytes before them (0, the default, for none).
 * @example
 * crc32(new TextEncoder().encode('123456789')) // 0xcbf43926
 * crc32(new TextEncoder().encode('6789'), crc32(new TextEncoder().encode('12345'))) // 0xcbf43926
 */
export function crc32(bytes: Uint8Array, previous = 0): number {
  if (!crcTable) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  const table = crcTable;
  let crc = (previous ^ 0xffffffff) >>> 0;
  for (let i = 0; i < bytes.length; i++) crc = table[(crc ^ bytes[i]) & 0xff] ^ (crc >>> 8);
  return (crc ^ 0xffffffff) >>> 0;
}
