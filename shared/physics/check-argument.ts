/**
 * @module shared/physics/check-argument
 * Guard clauses shared by the physics modules: each throws a RangeError whose message names
 * the argument, its unit and the allowed range.
 */

/**
 * Throws unless `value` is a finite number within [min, max] (inclusive).
 *
 * @param name - argument name used in the message, e.g. 'salinity'
 * @param value - the value to check
 * @param min - smallest allowed value
 * @param max - largest allowed value
 * @param unit - unit shown in the message, e.g. 'kg m⁻³' ('' for dimensionless)
 * @returns the value, for chaining
 * @example
 * requireInRange('salinity', 35, 0, 42, ''); // => 35
 * // requireInRange('salinity', 50, 0, 42, '') throws "salinity must be between 0 and 42 (got 50)"
 * Source: (c) common practice.
 */
export function requireInRange(name: string, value: number, min: number, max: number, unit: string): number {
  const suffix = unit ? ` ${unit}` : '';
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max) {
    throw new RangeError(`${name} must be between ${min} and ${max}${suffix} (got ${String(value)})`);
  }
  return value;
}

/**
 * Throws unless `value` is a finite number strictly greater than zero.
 *
 * @param name - argument name used in the message
 * @param value - the value to check
 * @param unit - unit shown in the message
 * @returns the value, for chaining
 * @example
 * requirePositive('discharge', 900, 'm³ s⁻¹'); // => 900
 * // requirePositive('discharge', 0, 'm³ s⁻¹') throws "discharge must be a finite number greater than 0 m³ s⁻¹ (got 0)"
 * Source: (c) common practice.
 */
export function requirePositive(name: string, value: number, unit: string): number {
  const suffix = unit ? ` ${unit}` : '';
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${name} must be a finite number greater than 0${suffix} (got ${String(value)})`);
  }
  return value;
}

/**
 * Throws unless `value` is a finite number greater than or equal to zero.
 *
 * @param name - argument name used in the message
 * @param value - the value to check
 * @param unit - unit shown in the message
 * @returns the value, for chaining
 * @example
 * requireNonNegative('offshore distance', 0, 'm'); // => 0
 * Source: (c) common practice.
 */
export function requireNonNegative(name: string, value: number, unit: string): number {
  const suffix = unit ? ` ${unit}` : '';
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    throw new RangeError(`${name} must be a finite number of at least 0${suffix} (got ${String(value)})`);
  }
  return value;
}

/**
 * Throws unless the Coriolis parameter is finite and not zero (the rotating scalings divide by |f|).
 *
 * @param coriolis - Coriolis parameter f [s⁻¹], either sign
 * @returns |f| [s⁻¹]
 * @example
 * requireRotation(-1.0e-4); // => 1.0e-4
 * Source: (c) common practice.
 */
export function requireRotation(coriolis: number): number {
  if (typeof coriolis !== 'number' || !Number.isFinite(coriolis) || coriolis === 0) {
    throw new RangeError(
      `coriolis must be a finite, non-zero Coriolis parameter in s⁻¹ (got ${String(coriolis)}); ` +
        'the rotating scalings do not apply on the equator',
    );
  }
  return Math.abs(coriolis);
}
