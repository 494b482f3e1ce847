/**
 * Upload benchmarks (issues "Lease and coast upload" and "Jurisdiction-scale speed"):
 *  - a 5 000-polygon shapefile (UTM 24 N, generated here, not committed) uploaded end to end through the
 *    imports service: parse, reproject, check, stage in PostGIS with validity checks and repair, confirm;
 *  - a 40 000-lease GeoJSON: the upload, then its confirm timed on its own;
 *  - a 50 000-polygon shapefile (the feature limit) through the same steps, so that the upload's own share of
 *    memory at 5 000 and at 50 000 features can be compared ("flat with size");
 *  - a 50 000-feature GeoJSON (the feature limit) uploaded and confirmed, to show it is reachable, with the own share
 *    of a 5 000-feature GeoJSON beside it.
 * Each case runs in a fresh Node process (bench/upload-child.ts) so its peak RSS is the upload's own,
 * not what earlier benchmarks left in this process. The file is generated here and written to a temporary
 * file: the child reads its bytes (as the server receives an upload's bytes) but not the generator's garbage.
 */
import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { type BenchResult, baseline } from './harness';

import { generateLeaseGeoJson, generateLeaseShapefile } from './upload-fixtures';

export { generateLeaseGeoJson, generateLeaseShapefile };

const run = promisify(execFile);

export interface UploadChildResult {
  uploadMs: number[];
  confirmMs: number[];
  peakRssMb: number;
  startRssMb: number;
  fileMb: number;
  features: number;
}

async function child(kind: 'shapefile' | 'geojson', count: number, runs: number, nodeFlags: string[] = []): Promise<UploadChildResult> {
  const script = path.join(import.meta.dirname, 'upload-child.ts');
  const dir = await mkdtemp(path.join(os.tmpdir(), 'brackline-upload-bench-'));
  const file = path.join(dir, kind === 'shapefile' ? 'bench-leases.zip' : 'bench-leases.geojson');
  try {
    await writeFile(file, kind === 'shapefile' ? await generateLeaseShapefile(count) : generateLeaseGeoJson(count));
    const { stdout } = await run(process.execPath, [...nodeFlags, '--import', 'tsx', script, file, String(runs)], {
      env: process.env,
      maxBuffer: 10_000_000,
    });
    const last = stdout.trim().split('\n').pop() ?? '{}';
    return JSON.parse(last) as UploadChildResult;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/** The upload's own share of memory: the child's peak RSS less what it held before the file existed. */
const own = (r: UploadChildResult) => r.peakRssMb - r.startRssMb;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

export async function uploadBenchmarks(_databaseUrl: string): Promise<BenchResult[]> {
  const base = await baseline();
  const results: BenchResult[] = [];
  const shp = await child('shapefile', 5000, 3);
  const shpTotal = shp.uploadMs.map((u, i) => u + shp.confirmMs[i]);
  results.push({
    name: 'upload 5 000-polygon shapefile end to end (parse, reproject, validate in PostGIS, store)',
    medianMs: median(shpTotal),
    p90Ms: Math.max(...shpTotal),
    runs: shpTotal.length,
    ratioToBaseline: median(shpTotal) / base,
    targetMs: 10_000,
    note: `zip ${shp.fileMb.toFixed(2)} MB; peak RSS of the uploading process ${shp.peakRssMb.toFixed(0)} MB (goal ≤ 300 MB ${shp.peakRssMb <= 300 ? 'met' : 'missed'}), of which ${shp.startRssMb.toFixed(0)} MB before the file existed (the upload's own share ${own(shp).toFixed(0)} MB)`,
  });
  const shpLimit = await child('shapefile', 50_000, 1);
  results.push({
    name: 'upload 50 000-polygon shapefile (the feature limit) end to end: memory flat with size',
    medianMs: shpLimit.uploadMs[0] + shpLimit.confirmMs[0],
    p90Ms: shpLimit.uploadMs[0] + shpLimit.confirmMs[0],
    runs: 1,
    ratioToBaseline: (shpLimit.uploadMs[0] + shpLimit.confirmMs[0]) / base,
    note: `${shpLimit.features} leases stored; zip ${shpLimit.fileMb.toFixed(2)} MB; peak RSS ${shpLimit.peakRssMb.toFixed(0)} MB (${shpLimit.startRssMb.toFixed(0)} MB before the file); the upload's own share ${own(shpLimit).toFixed(0)} MB for 10× the features of the 5 000-polygon file (${own(shp).toFixed(0)} MB)`,
  });
  // RSS also counts what V8 keeps because it was allowed to (it grows the heap rather than collect while memory
  // is plentiful), so the same uploads again, at both sizes and in both formats, with the old generation capped: what
  // the upload cannot do without. Flat with size means the 50 000-feature file completes within the same cap.
  const capMb = 48;
  const cap = [`--max-old-space-size=${capMb}`];
  for (const kind of ['shapefile', 'geojson'] as const) {
    const small = await child(kind, 5_000, 1, cap).catch(() => null);
    const large = await child(kind, 50_000, 1, cap).catch(() => null);
    const said = (r: UploadChildResult | null) =>
      r ? `peak RSS ${r.peakRssMb.toFixed(0)} MB, own share ${own(r).toFixed(0)} MB` : 'ran out of memory';
    results.push({
      name: `upload 50 000-feature ${kind === 'shapefile' ? 'shapefile' : 'GeoJSON'} with the V8 old generation capped at ${capMb} MB`,
      medianMs: large ? large.uploadMs[0] + large.confirmMs[0] : Number.NaN,
      p90Ms: large ? large.uploadMs[0] + large.confirmMs[0] : Number.NaN,
      runs: 1,
      ratioToBaseline: large ? (large.uploadMs[0] + large.confirmMs[0]) / base : Number.NaN,
      note: `50 000 features: ${large ? `completed, ${large.features} leases stored; ` : ''}${said(large)}; 5 000 features under the same cap: ${said(small)}`,
    });
  }
  const big = await child('geojson', 40_000, 1);
  results.push({
    name: 'confirm of a 40 000-lease GeoJSON upload (one transaction; screening queued)',
    medianMs: median(big.confirmMs),
    p90Ms: Math.max(...big.confirmMs),
    runs: big.confirmMs.length,
    ratioToBaseline: median(big.confirmMs) / base,
    targetMs: 5_000,
    note: `file ${big.fileMb.toFixed(1)} MB; its upload (parse, stage) took ${(median(big.uploadMs) / 1000).toFixed(1)} s; peak RSS ${big.peakRssMb.toFixed(0)} MB (${big.startRssMb.toFixed(0)} MB before the file)`,
  });
  const smallJson = await child('geojson', 5_000, 1);
  const limit = await child('geojson', 50_000, 1);
  results.push({
    name: '50 000-feature GeoJSON (the feature limit): upload + confirm',
    medianMs: limit.uploadMs[0] + limit.confirmMs[0],
    p90Ms: limit.uploadMs[0] + limit.confirmMs[0],
    runs: 1,
    ratioToBaseline: (limit.uploadMs[0] + limit.confirmMs[0]) / base,
    note: `${limit.features} leases stored; file ${limit.fileMb.toFixed(1)} MB; peak RSS ${limit.peakRssMb.toFixed(0)} MB (${limit.startRssMb.toFixed(0)} MB before the file, own share ${own(limit).toFixed(0)} MB, against ${own(smallJson).toFixed(0)} MB for a 5 000-feature GeoJSON; must fit a 2 GB machine)`,
  });
  return results;
}
