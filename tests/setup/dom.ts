// DOM test setup: unexpected console.error fails the test.
const originalError = console.error;
console.error = (...args: unknown[]) => {
  originalError(...args);
  throw new Error(`console.error was called: ${String(args[0])}. Mock it if this is expected.`);
};
