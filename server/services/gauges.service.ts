/**
 * River gauges and their readings. A gauge's own uploader posts readings with the gauge's token
 * (JSON or CSV); the app also polls the gauge feed. Readings are stored and their alert evaluation
 * queued in one transaction; a repeated reading (same gauge and time) is skipped.
 */
import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import { sql } from 'drizzle-orm';
import Papa from 'papaparse';
import {
  type Gauge,
  MAX_READINGS_PER_POST,
  type ReadingInput,
  type ReadingsResult,
  readingInputSchema,
  readingsPostSchema,
} from '#shared/schemas/gauges';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { describeZodError } from '../http/zod-issues';
import type { AlertJobs } from '../jobs/alert-jobs';
import { NotFoundError, UnauthenticatedError, ValidationError } from '../lib/errors';
import { logger } from '../lib/logger';
import { recordAudit } from './audit.service';

const sha256 = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

type ReadingRow = { id: string; observed_at: Date; discharge: number; source: 'token' | 'csv' | 'feed' | 'manual' };
const toReading = (r: ReadingRow) => ({
  id: r.id,
  observedAt: new Date(r.observed_at).toISOString(),
  discharge: r.discharge,
  source: r.source,
});

/** Reads "observedAt,discharge" CSV (also time/date/observed_at; discharge in m³/s); every bad row is named. */
export function parseReadingsCsv(text: string): ReadingInput[] {
  const parsed = Papa.parse<Record<string, string>>(text.trim(), {
    header: true,
    skipEmptyLines: true,
    transformHeader: (h) => h.trim().toLowerCase(),
  });
  const fields = parsed.meta.fields ?? [];
  const timeCol = fields.find((f) => ['observedat', 'observed_at', 'time', 'datetime', 'date'].includes(f));
  const flowCol = fields.find((f) => ['discharge', 'flow', 'discharge_m3s'].includes(f));
  if (!timeCol || !flowCol) {
    throw new ValidationError(
      `The CSV needs a header row with a time column (observedAt) and a discharge column (m³/s); it has: ${fields.join(', ') || 'no header'}.`,
    );
  }
  const problems: string[] = [];
  const readings: ReadingInput[] = [];
  parsed.data.forEach((row, i) => {
    const raw = (row[timeCol] ?? '').trim();
    const observedAt = /^\d{4}-\d{2}-\d{2}$/.test(raw) ? `${raw}T00:00:00Z` : raw;
    const r = readingInputSchema.safeParse({ observedAt, discharge: Number(row[flowCol]) });
    if (r.success) readings.push(r.data);
    else problems.push(`row ${i + 2}: ${r.error.issues.map((x) => x.message).join('; ')}`);
  });
  if (problems.length)
    throw new ValidationError(
      `${problems.length} row(s) of the CSV could not be read, so nothing was stored. Fix them and send the file again.`,
      { problems: problems.slice(0, 50) },
    );
  if (!readings.length) throw new ValidationError('The CSV has no readings under its header row.');
  if (readings.length > MAX_READINGS_PER_POST)
    throw new ValidationError(`Send at most ${MAX_READINGS_PER_POST} readings at a time; split the file.`);
  return readings;
}

export function createGaugesService(deps: { db: Database; jobs: AlertJobs; feedUrl?: string }) {
  const { db, jobs } = deps;

  async function list(): Promise<{ items: Gauge[] }> {
    const r = await db.execute<{
      id: string;
      code: string;
      name: string;
      river_id: string;
      river_name: string;
      has_token: boolean;
      r_id: string | null;
      observed_at: Date | null;
      discharge: number | null;
      source: ReadingRow['source'] | null;
    }>(sql`
      SELECT g.id, g.code, g.name, g.river_id, rv.name AS river_name, g.token_hash IS NOT NULL AS has_token,
             lr.id AS r_id, lr.observed_at, lr.discharge, lr.source
        FROM gauges g JOIN rivers rv ON rv.id = g.river_id
        LEFT JOIN LATERAL (SELECT id, observed_at, discharge, source FROM gauge_readings WHERE gauge_id = g.id ORDER BY observed_at DESC LIMIT 1) lr ON true
       ORDER BY g.code`);
    return {
      items: r.rows.map((g) => ({
        id: g.id,
        code: g.code,
        name: g.name,
        riverId: g.river_id,
        riverName: g.river_name,
        hasToken: g.has_token,
        latest: g.r_id ? toReading({ id: g.r_id, observed_at: g.observed_at!, discharge: g.discharge!, source: g.source! }) : null,
      })),
    };
  }

  async function gaugeExists(id: string) {
    const r = await db.execute<{ id: string; token_hash: string | null; code: string }>(
      sql`SELECT id, token_hash, code FROM gauges WHERE id = ${id}::uuid`,
    );
    if (!r.rows[0]) throw new NotFoundError('No gauge with this id. See GET /api/v1/gauges for the gauges.');
    return r.rows[0];
  }

  async function readings(id: string, limit: number) {
    await gaugeExists(id);
    const r = await db.execute<ReadingRow>(
      sql`SELECT id, observed_at, discharge, source FROM gauge_readings WHERE gauge_id = ${id}::uuid ORDER BY observed_at DESC LIMIT ${limit}`,
    );
    return { gaugeId: id, items: r.rows.map(toReading) };
  }

  /** A new upload token for the gauge (the old one stops working); shown once. */
  async function issueToken(user: CurrentUser, id: string) {
    const gauge = await gaugeExists(id);
    const token = `gauge_${randomBytes(24).toString('base64url')}`;
    await db.transaction(async (tx) => {
      await tx.execute(sql`UPDATE gauges SET token_hash = ${sha256(token)} WHERE id = ${id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'gauge.token.issued',
        subjectType: 'gauge',
        subjectId: id,
        after: { code: gauge.code },
      });
    });
    return { gaugeId: id, token };
  }

  /** Checks "Authorization: Bearer <token>" against the gauge's token hash. */
  async function checkToken(id: string, authorization: string | undefined) {
    const gauge = await gaugeExists(id);
    const token = /^Bearer\s+(\S+)$/i.exec(authorization ?? '')?.[1];
    const ok = token && gauge.token_hash && timingSafeEqual(Buffer.from(sha256(token)), Buffer.from(gauge.token_hash));
    if (!ok)
      throw new UnauthenticatedError(
        `Send this gauge's upload token as "Authorization: Bearer <token>". An administrator or regulator can issue one (POST /api/v1/gauges/${id}/token).`,
      );
  }

  /** Stores readings for one gauge and queues their alert evaluation in the same transaction. */
  async function store(gaugeId: string, items: ReadingInput[], source: ReadingRow['source']): Promise<ReadingsResult> {
    const stored = await jobs.transaction(async (client, enqueue) => {
      const r = await client.query<{ id: string }>(
        `INSERT INTO gauge_readings (gauge_id, observed_at, discharge, source)
         SELECT $1::uuid, t, q, $4 FROM unnest($2::timestamptz[], $3::float8[]) AS x(t, q)
         ON CONFLICT (gauge_id, observed_at) DO NOTHING RETURNING id`,
        [gaugeId, items.map((i) => i.observedAt), items.map((i) => i.discharge), source],
      );
      const ids = r.rows.map((x) => x.id);
      if (ids.length) await enqueue({ name: 'evaluate', readingIds: ids });
      return ids.length;
    });
    return { received: items.length, stored, duplicates: items.length - stored };
  }

  async function postReadings(id: string, authorization: string | undefined, body: unknown, isCsv: boolean): Promise<ReadingsResult> {
    await checkToken(id, authorization);
    // The token is checked first, so a caller without it learns nothing about the body.
    let items: ReadingInput[];
    if (isCsv) items = parseReadingsCsv(String(body ?? ''));
    else {
      const parsed = readingsPostSchema.safeParse(body);
      if (!parsed.success) {
        const { message, details } = describeZodError(parsed.error, 'body');
        throw new ValidationError(message, details);
      }
      items = parsed.data.readings;
    }
    return store(id, items, isCsv ? 'csv' : 'token');
  }

  /** Reads the gauge feed once and stores what is new (the pg-boss poll calls this). */
  async function pollFeed(): Promise<number> {
    if (!deps.feedUrl) return 0;
    const res = await fetch(`${deps.feedUrl}/readings/latest`, { signal: AbortSignal.timeout(10_000) });
    if (!res.ok) throw new Error(`The gauge feed answered ${res.status}`);
    const { readings: feed } = (await res.json()) as { readings: { code: string; observedAt: string; discharge: number }[] };
    const gauges = await db.execute<{ id: string; code: string }>(sql`SELECT id, code FROM gauges`);
    const byCode = new Map(gauges.rows.map((g) => [g.code, g.id]));
    let stored = 0;
    for (const [code, id] of byCode) {
      const items = feed
        .filter((f) => f.code === code)
        .map((f) => readingInputSchema.safeParse({ observedAt: f.observedAt, discharge: f.discharge }))
        .flatMap((p) => (p.success ? [p.data] : []));
      if (items.length) stored += (await store(id, items, 'feed')).stored;
    }
    if (stored) logger.debug({ stored }, 'gauge feed readings stored');
    return stored;
  }

  return { list, readings, issueToken, postReadings, store, pollFeed };
}

export type GaugesService = ReturnType<typeof createGaugesService>;
