/**
 * Test helper for the physics tests: absolute and relative tolerance checks with readable
 * failure messages.
 */
import { expect } from 'vitest';

/** Asserts |actual − expected| ≤ tolerance. */
export function expectWithin(actual: number, expected: number, tolerance: number): void {
  expect(Number.isFinite(actual), `expected a finite number, got ${actual}`).toBe(true);
  expect(
    Math.abs(actual - expected),
    `|${actual} − ${expected}| = ${Math.abs(actual - expected)} exceeds ${tolerance}`,
  ).toBeLessThanOrEqual(tolerance);
}

/** Asserts |actual − expected| ≤ relative · |expected|. */
export function expectRelative(actual: number, expected: number, relative: number): void {
  expectWithin(actual, expected, relative * Math.abs(expected));
}
