/**
 * @module shared/hydrology/seeded-uniform
 * A seeded stream of uniform random numbers in (0, 1), for reproducible bootstraps and
 * synthetic records (no Math.random anywhere in the engine).
 */

import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';

/** A function returning the next uniform number in (0, 1), both ends excluded. */
export type UniformStream = () => number;

/**
 * Creates a seeded uniform stream (xoroshiro128+ generator, 53-bit floats). The same seed
 * always gives the same sequence.
 *
 * @param seed - whole number 0…4294967295
 * @returns a function giving the next value in (0, 1)
 * @throws RangeError if the seed is not a whole number in range
 * @example
 * const next = createUniformStream(42);
 * next(); // => a number in (0, 1), the same every run
 * Source: (c) common practice (the xoroshiro128+ generator; 0 is
 * replaced by 2⁻⁵⁴ so that inverse-CDF draws stay finite).
 */
export function createUniformStream(seed: number): UniformStream {
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new RangeError(`seed must be a whole number from 0 to 4294967295 (got ${String(seed)})`);
  }
  const rng = xoroshiro128plus(seed | 0);
  return () => {
    const u = uniformFloat64(rng);
    return u === 0 ? 2 ** -54 : u;
  };
}
