/**
 * @module shared/schemas/physical-fields
 * Builders for the numeric fields of the calculator schemas: every message names the field
 * and its allowed range, and every field carries a description with its unit.
 */

import { z } from 'zod';

/** Range of a numeric field. `exclusiveMin` makes the lower bound strict (> min). */
export interface FieldRange {
  /** Lower bound. */
  readonly min?: number;
  /** True when the value must be strictly greater than min. */
  readonly exclusiveMin?: boolean;
  /** Upper bound (inclusive). */
  readonly max?: number;
}

/**
 * A finite number field with range messages that name the field, e.g.
 * "latitude must be between -90 and 90 degrees".
 *
 * @param name - field name used in the messages
 * @param unit - unit for messages and the description ('' for dimensionless)
 * @param description - what the field is, without the unit
 * @param range - { min, exclusiveMin, max }
 * @returns a zod number schema
 * @example
 * numberField('latitude', 'degrees', 'Latitude of the river mouth, north positive', { min: -90, max: 90 });
 * Source: (c) common practice.
 */
export function numberField(name: string, unit: string, description: string, range: FieldRange) {
  const u = unit ? ` ${unit}` : '';
  const { min, max, exclusiveMin } = range;
  const rangeText =
    min !== undefined && max !== undefined
      ? exclusiveMin
        ? `greater than ${min} and at most ${max}${u}`
        : `between ${min} and ${max}${u}`
      : min !== undefined
        ? exclusiveMin
          ? `greater than ${min}${u}`
          : `at least ${min}${u}`
        : max !== undefined
          ? `at most ${max}${u}`
          : `a finite number${u}`;
  const message = `${name} must be ${rangeText}`;
  let schema = z.number({
    error: (issue) =>
      issue.input === undefined ? `${name} is required (${rangeText})` : `${name} must be a number (${rangeText})`,
  });
  if (min !== undefined) schema = exclusiveMin ? schema.gt(min, { error: message }) : schema.min(min, { error: message });
  if (max !== undefined) schema = schema.max(max, { error: message });
  return schema.describe(unit ? `${description} (${unit})` : description);
}

/**
 * Options for strict request objects: a message listing unknown fields, and one for a body
 * that is not an object.
 *
 * @param what - what the object is, e.g. 'plume request'
 * @returns zod object params
 * @example
 * z.strictObject({ a: z.number() }, strictObjectError('water request'));
 * Source: (c) common practice.
 */
export function strictObjectError(what: string) {
  return {
    error: (issue: { code?: string; keys?: string[] }) =>
      issue.code === 'unrecognized_keys'
        ? `${what} has unknown field(s): ${(issue.keys ?? []).join(', ')}`
        : `${what} must be a JSON object`,
  };
}

/**
 * Makes a field optional while keeping its description (a plain `.optional()` wrapper
 * would not carry the description of the inner schema).
 *
 * @param schema - a described field schema
 * @returns the optional schema with the same description
 * @example
 * optionalField(numberField('pressureDbar', 'dbar', 'Sea pressure', { min: 0, max: 11000 }));
 * Source: (c) common practice.
 */
export function optionalField<T extends z.ZodType>(schema: T) {
  const wrapped = schema.optional();
  return schema.description === undefined ? wrapped : wrapped.describe(schema.description);
}
