/**
 * The local gauge feed: an HTTP service on loopback that replays the demo rivers' daily flows
 * (demo-data/flows/*.csv) as live readings, so `npm start` shows readings that move. Each
 * `secondsPerDay` of wall-clock time serves the next day of the record (one minute by default).
 *
 *   GET  /readings/latest     → { readings: [{ code, observedAt, discharge }] } (m³/s), one per gauge,
 *                               plus readings pushed in the last ten minutes
 *   POST /_fake/readings      { code, discharge } → pushes a reading now (tests and demos: "the gauge rises")
 */
import { readFileSync } from 'node:fs';
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import express from 'express';
import Papa from 'papaparse';

export interface FeedGauge {
  code: string;
  /** A daily flow CSV with columns date,discharge (m³/s). */
  csvPath: string;
}

const DEMO_FLOWS = path.resolve(import.meta.dirname, '../../demo-data/flows');

/** The demo region's gauges and the records they replay. */
export const DEMO_FEED_GAUGES: FeedGauge[] = [
  { code: 'FCSA-G01', csvPath: path.join(DEMO_FLOWS, 'amberlin-river-daily.csv') },
  { code: 'FCSA-G02', csvPath: path.join(DEMO_FLOWS, 'tolley-brook-daily.csv') },
];

export interface GaugeFeed {
  port: number;
  url: string;
  stop(): Promise<void>;
}

export async function startGaugeFeed(options: {
  port: number;
  host?: string;
  gauges?: FeedGauge[];
  secondsPerDay?: number;
}): Promise<GaugeFeed> {
  const host = options.host ?? '127.0.0.1';
  const stepMs = (options.secondsPerDay ?? 60) * 1000;
  const series = (options.gauges ?? DEMO_FEED_GAUGES).map((g) => {
    const parsed = Papa.parse<{ date: string; discharge: string }>(readFileSync(g.csvPath, 'utf8'), { header: true, skipEmptyLines: true });
    const flows = parsed.data.map((r) => Number(r.discharge)).filter((q) => Number.isFinite(q) && q >= 0);
    if (!flows.length) throw new Error(`The gauge feed found no flows in ${g.csvPath}`);
    return { code: g.code, flows };
  });
  const pushed: { code: string; observedAt: string; discharge: number; at: number }[] = [];

  const app = express();
  app.disable('x-powered-by');
  app.use(express.json());
  app.get('/readings/latest', (_req, res) => {
    const slot = Math.floor(Date.now() / stepMs);
    const observedAt = new Date(slot * stepMs).toISOString();
    const cutoff = Date.now() - 10 * 60_000;
    while (pushed.length && pushed[0].at < cutoff) pushed.shift();
    res.json({
      readings: [
        ...series.map((s) => ({ code: s.code, observedAt, discharge: s.flows[slot % s.flows.length] })),
        ...pushed.map(({ code, observedAt, discharge }) => ({ code, observedAt, discharge })),
      ],
    });
  });
  app.post('/_fake/readings', (req, res) => {
    const { code, discharge } = req.body ?? {};
    if (!series.some((s) => s.code === code) || typeof discharge !== 'number' || !(discharge >= 0)) {
      res
        .status(400)
        .json({ error: `Send { code, discharge } with code one of ${series.map((s) => s.code).join(', ')} and discharge in m³/s.` });
      return;
    }
    const reading = { code, observedAt: new Date().toISOString(), discharge, at: Date.now() };
    pushed.push(reading);
    res.status(201).json({ code, observedAt: reading.observedAt, discharge });
  });

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(options.port, host);
    s.once('error', reject);
    s.once('listening', () => resolve(s));
  });
  const port = (server.address() as AddressInfo).port;
  return {
    port,
    url: `http://${host}:${port}`,
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
