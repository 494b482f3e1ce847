/**
 * Memory and time of one lazy zipped-shapefile read, in a fresh process per case:
 * `node --expose-gc --import tsx bench/probe-shapefile-read.ts <zip> [root]` reads the zip with
 * `readShapefileZip(bytes, DEFAULT_UPLOAD_LIMITS, { lazy: true })`, then builds every feature once with
 * `chunks(2000)`, and prints peak RSS (getrusage maxRSS) before the read, after it and at the end,
 * `arrayBuffers` just after the read and again after a forced GC, and both times. `root` (default: this checkout)
 * is where `shared/` is imported from, so another checkout's code can be measured on the same file.
 * Make the zips with `node --import tsx bench/probe-shapefile-read.ts --make <count> <zip>` (generateLeaseShapefile).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { generateLeaseShapefile } from './upload-fixtures';

async function main() {
  if (process.argv[2] === '--make') {
    writeFileSync(process.argv[4], await generateLeaseShapefile(Number(process.argv[3])));
    return;
  }
  const root = path.resolve(process.argv[3] ?? path.join(import.meta.dirname, '..'));
  const { readShapefileZip } = await import(pathToFileURL(path.join(root, 'shared/geometry/read-shapefile-zip.ts')).href);
  const { DEFAULT_UPLOAD_LIMITS } = await import(pathToFileURL(path.join(root, 'shared/geometry/upload-limits.ts')).href);
  const gc = (globalThis as { gc?: () => void }).gc;
  if (!gc) throw new Error('run with node --expose-gc');
  const bytes = new Uint8Array(readFileSync(process.argv[2]));
  gc();
  const rssBefore = process.resourceUsage().maxRSS;
  const t0 = performance.now();
  const reading = readShapefileZip(bytes, DEFAULT_UPLOAD_LIMITS, { lazy: true });
  const t1 = performance.now();
  const arrayBuffers = process.memoryUsage().arrayBuffers;
  const rssRead = process.resourceUsage().maxRSS;
  gc();
  const arrayBuffersAfterGc = process.memoryUsage().arrayBuffers;
  const t2 = performance.now();
  let features = 0;
  for (const layer of reading.layers as { chunks: (size: number) => Iterable<unknown[]> }[]) {
    for (const chunk of layer.chunks(2_000)) features += chunk.length;
  }
  const t3 = performance.now();
  const mb = (x: number) => Number((x / 1e6).toFixed(1));
  console.log(
    JSON.stringify({
      file: path.basename(process.argv[2]),
      features,
      readMs: Math.round(t1 - t0),
      chunksMs: Math.round(t3 - t2),
      arrayBuffersAfterReadMB: mb(arrayBuffers),
      arrayBuffersAfterGcMB: mb(arrayBuffersAfterGc),
      maxRssBeforeMB: Math.round(rssBefore / 1024),
      maxRssAfterReadMB: Math.round(rssRead / 1024),
      maxRssMB: Math.round(process.resourceUsage().maxRSS / 1024),
    }),
  );
}

await main();
