/**
 * @module shared/hydrology/check-values
 * Guard clauses shared by the hydrology modules: each throws a RangeError whose message names
 * the argument and the allowed range.
 */

/**
 * Throws unless `values` is an array of at least `minLength` finite numbers.
 *
 * @param name - argument name used in the message, e.g. 'annualPeaks'
 * @param values - the array to check
 * @param minLength - fewest values allowed (≥ 0)
 * @returns the array, for chaining
 * @example
 * requireFiniteArray('annualPeaks', [120, 340, 95], 3); // => [120, 340, 95]
 * // requireFiniteArray('annualPeaks', [1, NaN], 2) throws "annualPeaks[1] must be a finite number (got NaN)"
 * Source: (c) common practice.
 */
export function requireFiniteArray(name: string, values: readonly number[], minLength: number): readonly number[] {
  if (!Array.isArray(values)) {
    throw new RangeError(`${name} must be an array of numbers (got ${typeof values})`);
  }
  if (values.length < minLength) {
    throw new RangeError(`${name} must hold at least ${minLength} values (got ${values.length})`);
  }
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      throw new RangeError(`${name}[${i}] must be a finite number (got ${String(v)})`);
    }
  }
  return values;
}

/**
 * Throws unless `value` is a probability strictly between 0 and 1.
 *
 * @param name - argument name used in the message, e.g. 'aep'
 * @param value - the value to check
 * @returns the value, for chaining
 * @example
 * requireOpenProbability('aep', 0.01); // => 0.01
 * // requireOpenProbability('aep', 1) throws "aep must be between 0 and 1, both excluded (got 1)"
 * Source: (c) common practice.
 */
export function requireOpenProbability(name: string, value: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0 || value >= 1) {
    throw new RangeError(`${name} must be between 0 and 1, both excluded (got ${String(value)})`);
  }
  return value;
}

/**
 * Throws unless `value` is a finite number within [min, max] (inclusive).
 *
 * @param name - argument name used in the message
 * @param value - the value to check
 * @param min - smallest allowed value
 * @param max - largest allowed value
 * @returns the value, for chaining
 * @example
 * requireBetween('regionalSkew', 0.6, -3, 3); // => 0.6
 * Source: (c) common practice.
 */
export function requireBetween(name: string, value: number, min: number, max: number): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(`${name} must be between ${min} and ${max} (got ${String(value)})`);
  }
  return value;
}

/**
 * Throws unless `value` is an integer within [min, max] (inclusive).
 *
 * @param name - argument name used in the message
 * @param value - the value to check
 * @param min - smallest allowed value
 * @param max - largest allowed value
 * @returns the value, for chaining
 * @example
 * requireInteger('resamples', 200, 0, 100000); // => 200
 * Source: (c) common practice.
 */
export function requireInteger(name: string, value: number, min: number, max: number): number {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < min || value > max) {
    throw new RangeError(`${name} must be a whole number between ${min} and ${max} (got ${String(value)})`);
  }
  return value;
}

/**
 * Throws unless `value` is a finite number strictly greater than zero.
 *
 * @param name - argument name used in the message
 * @param value - the value to check
 * @param unit - unit shown in the message ('' for none)
 * @returns the value, for chaining
 * @example
 * requirePositiveNumber('recessionDays', 4, 'days'); // => 4
 * Source: (c) common practice.
 */
export function requirePositiveNumber(name: string, value: number, unit: string): number {
  const suffix = unit ? ` ${unit}` : '';
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${name} must be a finite number greater than 0${suffix} (got ${String(value)})`);
  }
  return value;
}
