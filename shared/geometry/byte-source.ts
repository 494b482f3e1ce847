/**
 * @module shared/geometry/byte-source
 * What the shapefile readers read from: a file's length and its bytes by range. A plain `Uint8Array`
 * satisfies it as it is; so does a zip entry read in bounded memory ({@link openEntryReader}), which
 * inflates only up to the range asked for and forgets what lies before it.
 */

/**
 * A file's bytes by range. The range handed out by `subarray` may be a view into a buffer the source reuses:
 * read it (or copy what must be kept) before asking for the next range. Sources that stream prefer ranges
 * asked for in increasing order; going back costs a restart from the file's first byte.
 */
export interface ByteSource {
  /** Length of the file [bytes]. */
  readonly length: number;
  /**
   * Bytes [begin, end) of the file, 0 ≤ begin ≤ end ≤ length.
   *
   * @example
   * source.subarray(0, 100) // the header of a .shp
   */
  subarray(begin: number, end: number): Uint8Array;
}

/**
 * Signed 32-bit little-endian integer at `offset` of `bytes`.
 *
 * @example
 * int32LE(Uint8Array.of(0xe8, 0x03, 0, 0), 0) // 1000, a .shp's version
 */
export function int32LE(bytes: Uint8Array, offset: number): number {
  return bytes[offset] | (bytes[offset + 1] << 8) | (bytes[offset + 2] << 16) | (bytes[offset + 3] << 24);
}

/**
 * Signed 32-bit big-endian integer at `offset` of `bytes`.
 *
 * @example
 * int32BE(Uint8Array.of(0, 0, 0x27, 0x0a), 0) // 9994, a .shp's file code
 */
export function int32BE(bytes: Uint8Array, offset: number): number {
  return (bytes[offset] << 24) | (bytes[offset + 1] << 16) | (bytes[offset + 2] << 8) | bytes[offset + 3];
}
