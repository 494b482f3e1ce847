/**
 * @module shared/geometry/upload-limits
 * Size and count limits of an upload, their defaults, the server settings that change them, the
 * errors raised when one is passed, and the number formats used in messages (digits grouped in threes by
 * a plain space, e.g. "61 204", whatever the locale).
 */
import { UploadError } from './upload-error';

/** Limits applied by {@link readUpload}. Sizes in bytes (SI: 1 MB = 1 000 000 bytes); counts are totals over all layers. */
export interface UploadLimits {
  /** Largest upload as sent (the zip or the GeoJSON file) [bytes]; over it → 413. */
  maxCompressedBytes: number;
  /** Largest total size of the zip entries that are read, declared and actually inflated [bytes]; over it → 413. */
  maxUncompressedBytes: number;
  /** Most features in one upload; over it → 422. */
  maxFeatures: number;
  /** Most vertices (positions, closing ones included) in one upload; over it → 422. */
  maxVertices: number;
}

/**
 * Defaults: 50 MB sent, 300 MB expanded, 50 000 features, 5 000 000 vertices.
 * Common practice (c): generous for lease files (a few hundred parcels), small enough that one upload
 * cannot take the server's memory.
 */
export const DEFAULT_UPLOAD_LIMITS: Readonly<UploadLimits> = Object.freeze({
  maxCompressedBytes: 50_000_000,
  maxUncompressedBytes: 300_000_000,
  maxFeatures: 50_000,
  maxVertices: 5_000_000,
});

/**
 * The environment setting that changes each limit on the server; named in the messages so an operator knows
 * what to raise.
 *
 * @example
 * UPLOAD_LIMIT_SETTINGS.maxFeatures // 'UPLOAD_MAX_FEATURES'
 */
export const UPLOAD_LIMIT_SETTINGS: Readonly<Record<keyof UploadLimits, string>> = Object.freeze({
  maxCompressedBytes: 'UPLOAD_MAX_BYTES',
  maxUncompressedBytes: 'UPLOAD_MAX_UNCOMPRESSED_BYTES',
  maxFeatures: 'UPLOAD_MAX_FEATURES',
  maxVertices: 'UPLOAD_MAX_VERTICES',
});

/**
 * Merges partial limits over the defaults, refusing non-positive or non-finite values.
 *
 * @param limits - overrides, e.g. `{ maxFeatures: 10 }`.
 * @returns the complete limits.
 * @throws RangeError when a limit is not a positive finite number (a programming error, not a user's).
 * @example
 * resolveUploadLimits({ maxFeatures: 10 }).maxVertices // 5_000_000
 */
export function resolveUploadLimits(limits?: Partial<UploadLimits>): UploadLimits {
  const out: UploadLimits = { ...DEFAULT_UPLOAD_LIMITS };
  for (const key of Object.keys(DEFAULT_UPLOAD_LIMITS) as (keyof UploadLimits)[]) {
    const value = limits?.[key];
    if (value === undefined) continue;
    if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
      throw new RangeError(`Upload limit ${key} must be a positive number, got ${String(value)}`);
    }
    out[key] = value;
  }
  return out;
}

/**
 * Formats a count with digits grouped in threes by a plain space (locale-independent).
 *
 * @example
 * formatCount(61204) // '61 204'
 * formatCount(5000000) // '5 000 000'
 */
export function formatCount(n: number): string {
  const sign = n < 0 ? '-' : '';
  const digits = String(Math.trunc(Math.abs(n)));
  return sign + digits.replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
}

/**
 * Formats a size in bytes with SI units (1 kB = 1 000 bytes), at most one decimal.
 *
 * @example
 * formatBytes(50_000_000) // '50 MB'
 * formatBytes(1_234_567) // '1.2 MB'
 * formatBytes(812) // '812 bytes'
 */
export function formatBytes(bytes: number): string {
  if (bytes < 1000) return `${formatCount(bytes)} bytes`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let value = bytes / 1000;
  let unit = 0;
  while (value >= 1000 && unit < units.length - 1) {
    value /= 1000;
    unit += 1;
  }
  const rounded = Math.round(value * 10) / 10;
  const text = Number.isInteger(rounded) ? String(rounded) : rounded.toFixed(1);
  return `${text} ${units[unit]}`;
}

/**
 * Lists up to `max` items, then "and N more".
 *
 * @example
 * listSome(['a', 'b', 'c', 'd'], 2) // 'a, b and 2 more'
 */
export function listSome(items: readonly (string | number)[], max = 10): string {
  const shown = items.slice(0, max).map(String);
  const rest = items.length - shown.length;
  if (rest > 0) return `${shown.join(', ')} and ${formatCount(rest)} more`;
  if (shown.length <= 1) return shown.join('');
  return `${shown.slice(0, -1).join(', ')} and ${shown[shown.length - 1]}`;
}

/**
 * The error for an upload with more features than `limits.maxFeatures` (422).
 *
 * @param count - features found (or declared, e.g. by a .shp's records).
 * @example
 * featureLimitError(61204, DEFAULT_UPLOAD_LIMITS).message
 * // 'The file has 61 204 features; this server takes at most 50 000 per upload (setting UPLOAD_MAX_FEATURES). Split the file and upload the parts.'
 */
export function featureLimitError(count: number, limits: Pick<UploadLimits, 'maxFeatures'>): UploadError {
  return new UploadError(
    'too_many_features',
    `The file has ${formatCount(count)} features; this server takes at most ${formatCount(limits.maxFeatures)} per upload ` +
      `(setting ${UPLOAD_LIMIT_SETTINGS.maxFeatures}). Split the file and upload the parts.`,
    { features: count, limit: limits.maxFeatures },
  );
}

/**
 * The error for an upload with more vertices than `limits.maxVertices` (422).
 *
 * @param count - vertices counted so far (at least the limit + 1).
 * @param complete - true when `count` is the file's total, false when counting stopped at the limit.
 * @example
 * vertexLimitError(6_000_000, DEFAULT_UPLOAD_LIMITS, true).code // 'too_many_vertices'
 */
export function vertexLimitError(count: number, limits: Pick<UploadLimits, 'maxVertices'>, complete: boolean): UploadError {
  const has = complete ? `${formatCount(count)} vertices` : `more than ${formatCount(limits.maxVertices)} vertices`;
  return new UploadError(
    'too_many_vertices',
    `The file has ${has}; this server takes at most ${formatCount(limits.maxVertices)} per upload (setting ${UPLOAD_LIMIT_SETTINGS.maxVertices}). ` +
      'Simplify the boundaries in your GIS (a tolerance of 0.5 m keeps lease edges exact enough) or split the file, and upload again.',
    { ...(complete ? { vertices: count } : {}), limit: limits.maxVertices },
  );
}
