// Node test setup: an unexpected console.error is a failing test, not noise.
import fc from 'fast-check';
import { afterEach, vi } from 'vitest';

const originalError = console.error;
afterEach(() => {
  vi.restoreAllMocks();
});
console.error = (...args: unknown[]) => {
  originalError(...args);
  throw new Error(`console.error was called: ${String(args[0])}. Mock it if this is expected.`);
};

// Property tests run the same cases on every machine: a failure in CI reproduces locally.

fc.configureGlobal({ seed: 20_261_202 });
