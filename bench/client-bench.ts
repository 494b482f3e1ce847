/**
 * Issue "Grower's app I" benchmarks: the built client's first-route JavaScript (gzipped: the
 * entry chunk and what index.html preloads; map, charts and PDF code load later), and the time
 * to render the exposure map of the demo region in headless chromium (sign-in excluded).
 */
import { readdirSync, readFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { createApp } from '../server/app';
import { createDb } from '../server/db/client';
import { DEMO_PASSWORD, seedDemo } from '../server/db/seed';
import { seedDemoRegion } from '../server/db/seed-demo-region';
import { loadEnv } from '../server/env';
import { createMailer } from '../server/mail/mailer';
import { openBrowser, signInThroughForm } from '../tests/e2e/browser';
import { type BenchResult, baseline } from './harness';

const DIST = path.resolve(import.meta.dirname, '../dist');

export function firstRouteJavaScript(): { gzipBytes: number; files: string[]; lazyChunks: number } {
  const html = readFileSync(path.join(DIST, 'index.html'), 'utf8');
  const files = [...html.matchAll(/(?:src|href)="\/(assets\/[^"]+\.js)"/g)].map((m) => m[1]);
  const gzipBytes = files.reduce((n, f) => n + gzipSync(readFileSync(path.join(DIST, f))).length, 0);
  const lazyChunks = readdirSync(path.join(DIST, 'assets')).filter((f) => f.endsWith('.js')).length - files.length;
  return { gzipBytes, files, lazyChunks };
}

export async function clientBenchmarks(databaseUrl: string): Promise<BenchResult[]> {
  const base = await baseline();
  const first = firstRouteJavaScript();
  const results: BenchResult[] = [
    {
      name: 'first-route JavaScript of the built client (gzipped)',
      medianMs: Number.NaN,
      p90Ms: Number.NaN,
      runs: 1,
      ratioToBaseline: Number.NaN,
      note: `${(first.gzipBytes / 1024).toFixed(1)} KB gzipped in ${first.files.length} file(s) (target ≤ 250 KB); ${first.lazyChunks} chunks load later (map, charts, PDF, admin)`,
    },
  ];
  const db = createDb(databaseUrl, 4);
  await seedDemo(db.db);
  await seedDemoRegion(db.db);
  const env = loadEnv({ NODE_ENV: 'test', DATABASE_URL: databaseUrl, AUTH_SECRET: 'bench-secret-bench-secret-bench-secret-01', SMTP_URL: 'smtp://127.0.0.1:9', SERVE_CLIENT: 'true' });
  const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
  const app = createApp({ env, db, mailer, authRateLimit: { limit: 10_000, windowMs: 60_000 }, accountRateLimit: { limit: 10_000, windowMs: 60_000 } });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const browser = await openBrowser();
  try {
    const page = await browser.newPage();
    await signInThroughForm(page, baseUrl, 'grower@brackline.test', DEMO_PASSWORD);
    await page.getByRole('heading', { name: 'Overview' }).waitFor();
    const samples: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now();
      await page.goto(`${baseUrl}/map`);
      await page.waitForSelector('[data-map][data-drawn]', { timeout: 60_000 });
      samples.push(performance.now() - t0);
    }
    samples.sort((a, b) => a - b);
    results.push({
      name: 'exposure map of the demo region rendered in headless chromium (page load to bands and leases drawn)',
      medianMs: samples[2],
      p90Ms: samples[4],
      runs: 5,
      ratioToBaseline: samples[2] / base,
      note: 'footprint cached after the first load',
    });
  } finally {
    await browser.close();
    server.closeAllConnections();
    await new Promise((r) => server.close(r));
    mailer.close();
    await db.pool.end();
  }
  return results;
}
