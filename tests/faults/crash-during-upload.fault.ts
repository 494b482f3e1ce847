/**
 * Durable data: the postmaster of a cluster this test owns (PostgreSQL's safe settings, as npm start
 * runs it) is killed with SIGKILL, and its backends with it, while a lease upload's confirm is
 * writing. After PostgreSQL restarts (crash recovery from the WAL), the upload is either wholly saved
 * or wholly absent, and every upload confirmed before it is intact, row for row and byte for byte.
 * PostgreSQL docs §30 "Reliability and the Write-Ahead Log": a committed transaction survives a crash
 * when fsync and full_page_writes are on; an uncommitted one leaves nothing.
 * FAULT_ROUNDS (npm run faults) repeats the kill at different points of the confirm.
 */
import type { Feature, Polygon } from 'geojson';
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { createDb, type DbHandle } from '../../server/db/client';
import { runMigrations } from '../../server/db/migrate';
import { DEMO_PASSWORD, seedDemo } from '../../server/db/seed';
import { loadEnv } from '../../server/env';
import { createMailer } from '../../server/mail/mailer';
import { rectangle, geojsonBuffer } from '../helpers/lease-fixtures';
import { createFaultCluster, type FaultCluster } from '../helpers/pg-cluster';

const ROUNDS = Number(process.env.FAULT_ROUNDS ?? 2);
const FEATURES = 600;

let cluster: FaultCluster;
let handle: DbHandle;
let app: ReturnType<typeof createApp>;
let agent: ReturnType<typeof request.agent>;

/** FEATURES small, separate squares on a grid (no overlaps), codes `<prefix>-0001…`. */
function grid(prefix: string) {
  const features: Feature<Polygon>[] = Array.from({ length: FEATURES }, (_, i) =>
    rectangle(-38.9 + (i % 40) * 0.006, 41.05 + Math.floor(i / 40) * 0.006, 150, { LEASE_ID: `${prefix}-${String(i + 1).padStart(4, '0')}`, STATUS: 'held' }),
  );
  return geojsonBuffer({ type: 'FeatureCollection', features });
}

async function stage(prefix: string): Promise<string> {
  const res = await agent.post('/api/v1/imports').field('kind', 'lease').attach('file', grid(prefix), `${prefix}.geojson`).expect(201);
  return res.body.id as string;
}

/** Lease count and a digest of every saved row of one upload (code, status and geometry bytes). */
async function fingerprint(importId: string): Promise<{ leases: number; digest: string | null; status: string }> {
  const r = await handle.pool.query(
    `SELECT count(l.id)::int AS leases,
            md5(string_agg(l.lease_code || ':' || l.status || ':' || encode(ST_AsBinary(l.geom), 'hex'), ',' ORDER BY l.lease_code)) AS digest,
            i.status
       FROM imports i LEFT JOIN leases l ON l.import_id = i.id
      WHERE i.id = $1::uuid GROUP BY i.status`,
    [importId],
  );
  return r.rows[0];
}

/** Waits until PostgreSQL takes queries again (crash recovery included), through the app's own pool. */
async function waitForDatabase(timeoutMs = 60_000) {
  const started = Date.now();
  for (;;) {
    try {
      await handle.pool.query('select 1');
      return;
    } catch (err) {
      if (Date.now() - started > timeoutMs) throw err;
      await new Promise((r) => setTimeout(r, 200));
    }
  }
}

beforeAll(async () => {
  cluster = await createFaultCluster('crash-upload');
  const settings = await new pg.Client({ connectionString: cluster.url() });
  await settings.connect();
  const shown = await settings.query(`SELECT name, setting FROM pg_settings WHERE name IN ('fsync', 'full_page_writes', 'synchronous_commit') ORDER BY name`);
  await settings.end();
  // The cluster runs with the safe settings npm start uses (PostgreSQL's defaults).
  expect(shown.rows).toEqual([
    { name: 'fsync', setting: 'on' },
    { name: 'full_page_writes', setting: 'on' },
    { name: 'synchronous_commit', setting: 'on' },
  ]);
  await runMigrations(cluster.url());
  handle = createDb(cluster.url(), 5);
  await seedDemo(handle.db);
  const env = loadEnv({
    NODE_ENV: 'test',
    DATABASE_URL: cluster.url(),
    AUTH_SECRET: 'fault-secret-fault-secret-fault-secret-01',
    SMTP_URL: 'smtp://127.0.0.1:1',
    SERVE_CLIENT: 'false',
  });
  app = createApp({ env, db: handle, mailer: createMailer(env.SMTP_URL, env.MAIL_FROM), rateLimitPrefix: 'crash-test' });
  agent = request.agent(app);
  const csrf = await agent.get('/auth/csrf').expect(200);
  await agent
    .post('/auth/callback/credentials')
    .set('X-Auth-Return-Redirect', '1')
    .type('form')
    .send({ csrfToken: csrf.body.csrfToken, email: 'grower@brackline.test', password: DEMO_PASSWORD });
  await agent.get('/api/v1/account/me').expect(200);
}, 180_000);

afterAll(async () => {
  await handle?.pool.end();
  await cluster?.destroy();
});

describe('SIGKILL of the postmaster during a lease upload confirm', () => {
  it(`leaves each upload wholly saved or wholly absent, and every earlier one intact (${ROUNDS} rounds)`, async () => {
    const committed = new Map<string, { leases: number; digest: string | null; status: string }>();
    const outcomes: string[] = [];
    for (let round = 1; round <= ROUNDS; round++) {
      // An upload confirmed (and answered) before the crash.
      const done = await stage(`DONE${round}`);
      await agent.post(`/api/v1/imports/${done}/confirm`).send({ mapping: { leaseId: 'LEASE_ID', status: 'STATUS' } }).expect(200);
      committed.set(done, await fingerprint(done));
      expect(committed.get(done)).toMatchObject({ leases: FEATURES, status: 'confirmed' });

      // The one that is being written when PostgreSQL dies.
      const victim = await stage(`CRASH${round}`);
      const watcher = new pg.Client({ connectionString: cluster.url() });
      watcher.on('error', () => undefined);
      await watcher.connect();
      const confirm = agent
        .post(`/api/v1/imports/${victim}/confirm`)
        .send({ mapping: { leaseId: 'LEASE_ID', status: 'STATUS' } })
        .then((r) => r.status);
      // Wait until the confirm is inserting leases, then kill after a delay that differs per round.
      const seenAt = Date.now();
      for (;;) {
        const busy = await watcher.query(`SELECT 1 FROM pg_stat_activity WHERE pid <> pg_backend_pid() AND position('INSERT INTO leases (lease_code' in query) > 0`);
        if (busy.rowCount) break;
        if (Date.now() - seenAt > 30_000) throw new Error('The confirm never started inserting leases');
        await new Promise((r) => setTimeout(r, 5));
      }
      await new Promise((r) => setTimeout(r, (round * 97) % 400));
      await cluster.kill();
      const answered = await confirm;
      await watcher.end().catch(() => undefined);
      const restartedAt = Date.now();
      await cluster.start();
      await waitForDatabase();
      const recoverySeconds = (Date.now() - restartedAt) / 1000;

      const after = await fingerprint(victim);
      // Wholly saved (every lease, and the upload marked confirmed) or wholly absent (none, still a preview).
      const whole = after.leases === FEATURES && after.status === 'confirmed';
      const absent = after.leases === 0 && after.status !== 'confirmed';
      expect(whole || absent, `upload ${victim}: ${after.leases} leases, status ${after.status}`).toBe(true);
      // The request that was cut off said so (503 database_unavailable), or had finished just before the kill.
      expect([200, 503]).toContain(answered);
      if (answered === 200) expect(whole).toBe(true);
      for (const [id, before] of committed) expect(await fingerprint(id), `earlier upload ${id}`).toEqual(before);
      if (whole) committed.set(victim, after);
      outcomes.push(`round ${round}: confirm answered ${answered}, upload ${whole ? 'wholly saved' : 'wholly absent'}, PostgreSQL back after ${recoverySeconds.toFixed(1)} s`);
    }
    console.log(`[faults] SIGKILL during upload confirm (${FEATURES} leases each):\n  ${outcomes.join('\n  ')}`);
  });
});
