/**
 * A small benchmark harness. Every figure is reported with the median of several runs AND as a
 * ratio to a fixed baseline workload timed in the same process, so results from a loaded or a
 * faster machine stay comparable. Nothing here is a test: targets are printed, never asserted.
 */
import { performance } from 'node:perf_hooks';

export interface BenchResult {
  name: string;
  medianMs: number;
  p90Ms: number;
  runs: number;
  ratioToBaseline: number;
  targetMs?: number;
  /** The figure compared with targetMs when it is not the median (e.g. a p99 under load); defaults to medianMs. */
  judgedMs?: number;
  note?: string;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}
function p90(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(s.length * 0.9))];
}

export async function time(fn: () => unknown | Promise<unknown>, runs: number, warmup = 2): Promise<number[]> {
  for (let i = 0; i < warmup; i++) await fn();
  const out: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    out.push(performance.now() - t0);
  }
  return out;
}

/** The reference workload: sort 200 000 pseudo-random doubles (a fixed LCG sequence). */
function baselineWorkload(): number {
  const a = new Float64Array(200_000);
  let x = 12345;
  for (let i = 0; i < a.length; i++) {
    x = (x * 1103515245 + 12345) % 2147483648;
    a[i] = x / 2147483648;
  }
  a.sort();
  return a[100];
}

let baselineMs: number | null = null;
export async function baseline(): Promise<number> {
  if (baselineMs === null) baselineMs = median(await time(baselineWorkload, 15, 3));
  return baselineMs;
}

export async function bench(name: string, fn: () => unknown | Promise<unknown>, opts: { runs?: number; warmup?: number; targetMs?: number; note?: string } = {}): Promise<BenchResult> {
  const base = await baseline();
  const samples = await time(fn, opts.runs ?? 20, opts.warmup ?? 2);
  const m = median(samples);
  return { name, medianMs: m, p90Ms: p90(samples), runs: samples.length, ratioToBaseline: m / base, targetMs: opts.targetMs, note: opts.note };
}

export function report(results: BenchResult[]): void {
  const base = baselineMs ?? Number.NaN;
  console.log(`\nbaseline (sort 200 000 doubles): ${base.toFixed(2)} ms median\n`);
  const rows = results.map((r) => ({
    benchmark: r.name,
    'median ms': Number.isNaN(r.medianMs) ? '' : r.medianMs.toFixed(2),
    'p90 ms': Number.isNaN(r.p90Ms) ? '' : r.p90Ms.toFixed(2),
    '× baseline': Number.isNaN(r.ratioToBaseline) ? '' : r.ratioToBaseline.toFixed(3),
    target: r.targetMs !== undefined ? `≤ ${r.targetMs} ms ${(r.judgedMs ?? r.medianMs) <= r.targetMs ? '(met)' : '(missed)'}` : '',
    note: r.note ?? '',
  }));
  console.table(rows);
}
