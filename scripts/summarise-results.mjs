// Prints one closing line, "tests: N passed, N failed", from the vitest JSON reports.
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';

const dir = process.argv[2];
let passed = 0;
let failed = 0;
let skipped = 0;
for (const file of readdirSync(dir).filter((f) => f.endsWith('.json'))) {
  const report = JSON.parse(readFileSync(path.join(dir, file), 'utf8'));
  passed += report.numPassedTests ?? 0;
  failed += (report.numFailedTests ?? 0) + (report.numFailedTestSuites ?? 0);
  skipped += (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
}
console.log(`tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed > 0 || passed === 0 ? 1 : 0);
