import { UnprocessableError } from '../lib/errors';

/**
 * The science engine throws RangeError with a message naming the argument and its range when
 * inputs pass the schema but not the physics (e.g. river water denser than the sea). Those are
 * the caller's to fix: 422 with the engine's message.
 */
export function engineCall<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof RangeError || err instanceof TypeError) throw new UnprocessableError(err.message);
    throw err;
  }
}
