/**
 * `npm run bench`: every benchmark of the project, reported as medians and ratios to a baseline
 * workload timed in this same process. Sections needing the database run when DATABASE_URL is set
 * (npm run bench starts the local cluster through scripts/bench.sh).
 */
import { baseline, type BenchResult, report } from './harness';
import { scienceBenchmarks } from './science-bench';
import { clientBenchmarks } from './client-bench';
import { coastBenchmarks, screeningBenchmarks } from './screening-bench';
import { uploadBenchmarks } from './upload-bench';
import { apiBenchmarks } from './api-bench';
import { overlayLibraryBenchmarks } from './overlay-library-bench';
import { workersBenchmarks } from './workers-bench';

async function main() {
  await baseline();
  const results: BenchResult[] = [];
  const only = process.argv[2];
  if (!only || only === 'science') results.push(...(await scienceBenchmarks()));
  if (!only || only === 'overlay') results.push(...(await overlayLibraryBenchmarks()));
  // The coast footprint lines of the screening section alone, no database needed (`npx tsx bench/run-bench.ts footprint`).
  if (only === 'footprint') results.push(...(await coastBenchmarks()));
  const databaseUrl = process.env.DATABASE_URL;
  if (databaseUrl && (!only || only === 'upload')) results.push(...(await uploadBenchmarks(databaseUrl)));
  if (databaseUrl && (!only || only === 'screening')) results.push(...(await screeningBenchmarks(databaseUrl)));
  if (databaseUrl && (!only || only === 'workers')) results.push(...(await workersBenchmarks(databaseUrl)));
  if (databaseUrl && (!only || only === 'api')) results.push(...(await apiBenchmarks(databaseUrl)));
  if (databaseUrl && (!only || only === 'client')) results.push(...(await clientBenchmarks(databaseUrl)));
  report(results);
  const mem = process.memoryUsage();
  console.log(`peak-ish memory: rss ${(mem.rss / 1e6).toFixed(0)} MB, heap used ${(mem.heapUsed / 1e6).toFixed(0)} MB`);
}

void main();
