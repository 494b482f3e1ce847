/**
 * Several processes, one PostgreSQL: two app processes (`tsx server/index.ts`, WORKERS=false) and
 * two worker processes (`tsx server/worker.ts`), real child processes on a database of their own
 * (created and migrated here, on the test cluster of TEST_DATABASE_URL):
 *  - a session made on one app process works on the other;
 *  - a river change made through one app is screened by the workers, its chunks spread over both;
 *  - a burst of 100 alerts sends each e-mail exactly once (counted in the SMTP fake's outbox);
 *  - a worker killed with SIGKILL in the middle of a chunk: the other finishes it.
 * Run by `npm run faults` (it takes a few minutes); the in-process subset is tests/server/routes/screening-chunks.test.ts.
 */
import { type ChildProcess, spawn } from 'node:child_process';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb, type DbHandle } from '../../server/db/client';
import { runMigrations } from '../../server/db/migrate';
import { readiness } from '../../server/db/readiness';
import { DEMO_PASSWORD, seedDemo } from '../../server/db/seed';
import { seedDemoRegion } from '../../server/db/seed-demo-region';
import { type SmtpFake, startSmtpFake } from '../../server/fakes/smtp-fake';

const ROOT = path.resolve(import.meta.dirname, '../..');
const DB_NAME = 'brackline_multiproc';
const EXTRA_LEASES = 2000;
const CHUNK_LEASES = 200;
const ALERTS = 100;
/** A dead worker's chunk goes back to the queue this long after it was taken (pg-boss expiry). */
const CHUNK_EXPIRE_SECONDS = 30;

interface Proc {
  name: string;
  child: ChildProcess;
  output: string[];
  url?: string;
}

let db: DbHandle;
let dbUrl: string;
let smtp: SmtpFake;
const procs: Proc[] = [];
let appA: Proc;
let appB: Proc;
let w1: Proc;
let w2: Proc;
let amberlinId: string;
let scenarioCount: number;
let leaseCount: number;
const figures: Record<string, string | number> = {};

function testDatabaseUrl(): string {
  const url = process.env.TEST_DATABASE_URL;
  if (!url) throw new Error('TEST_DATABASE_URL is not set: run this through `npm run faults`, which starts the test cluster.');
  return url;
}

/** Starts one process; resolves when its output shows `ready`. */
function start(name: string, script: string, env: Record<string, string>, ready: RegExp): Promise<Proc> {
  // node itself with tsx's loader (not the tsx command, which runs the script in a child process
  // of its own): the pid here is the server's, so SIGKILL kills the server.
  const child = spawn(process.execPath, ['--import', 'tsx', script], {
    cwd: ROOT,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const proc: Proc = { name, child, output: [] };
  procs.push(proc);
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${name} did not start in 90 s:\n${proc.output.join('')}`)), 90_000);
    const onData = (chunk: Buffer) => {
      const text = chunk.toString();
      proc.output.push(text);
      const m = proc.output.join('').match(ready);
      if (m && !proc.url) {
        proc.url = m[1] ?? '';
        clearTimeout(timer);
        resolve(proc);
      }
    };
    child.stdout?.on('data', onData);
    child.stderr?.on('data', onData);
    child.on('exit', (code) => {
      clearTimeout(timer);
      if (!proc.url) reject(new Error(`${name} exited (${code}) before it was ready:\n${proc.output.join('')}`));
    });
  });
}

/** Cookies of one browser, kept by name (every app process is on 127.0.0.1). */
class Jar {
  private cookies = new Map<string, string>();
  store(res: Response) {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const i = pair.indexOf('=');
      this.cookies.set(pair.slice(0, i), pair.slice(i + 1));
    }
  }
  header() {
    return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  }
  names() {
    return [...this.cookies.keys()];
  }
}

/** Signs in through Auth.js's own routes on one app process. */
async function signIn(base: string, email: string): Promise<Jar> {
  const jar = new Jar();
  const csrf = await fetch(`${base}/auth/csrf`);
  jar.store(csrf);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${base}/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { cookie: jar.header(), 'content-type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
    body: new URLSearchParams({ csrfToken, email, password: DEMO_PASSWORD }),
  });
  jar.store(res);
  return jar;
}

async function api(base: string, jar: Jar | null, method: string, route: string, body?: unknown, headers: Record<string, string> = {}) {
  const res = await fetch(`${base}/api/v1${route}`, {
    method,
    headers: { ...(jar ? { cookie: jar.header() } : {}), ...(body ? { 'content-type': 'application/json' } : {}), ...headers },
    body: body ? JSON.stringify(body) : undefined,
  });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : null };
}

async function waitFor<T>(what: string, read: () => Promise<T>, ok: (v: T) => boolean, timeoutMs: number, everyMs = 250): Promise<T> {
  const started = Date.now();
  for (;;) {
    const v = await read();
    if (ok(v)) return v;
    if (Date.now() - started > timeoutMs) throw new Error(`Timed out waiting for ${what}: last value ${JSON.stringify(v)}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

const one = async <T = Record<string, unknown>>(q: string, params: unknown[] = []) => (await db.pool.query(q, params)).rows[0] as T;

/** Changes the river through app A; returns the run the change queued. */
async function changeRiver(regulator: Jar, mixingLength: number): Promise<string> {
  const before = new Date();
  const res = await api(appA.url!, regulator, 'PATCH', `/rivers/${amberlinId}`, { mixingLength });
  expect(res.status).toBe(200);
  const run = await waitFor(
    'the run the change queued',
    () =>
      one<{ id: string } | undefined>(
        `select id from screening_runs where river_id = $1 and queued_at >= $2 order by queued_at desc limit 1`,
        [amberlinId, before],
      ),
    (r) => r !== undefined,
    10_000,
  );
  return run!.id;
}

beforeAll(async () => {
  // A database of its own on the test cluster, created and migrated here.
  const server = new URL(testDatabaseUrl());
  const adminUrl = new URL(server);
  adminUrl.pathname = '/postgres';
  const admin = new pg.Client({ connectionString: adminUrl.toString() });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS ${DB_NAME} WITH (FORCE)`);
  await admin.query(`CREATE DATABASE ${DB_NAME}`);
  await admin.end();
  const url = new URL(server);
  url.pathname = `/${DB_NAME}`;
  dbUrl = url.toString();
  db = createDb(dbUrl, 4);
  // Readiness says "not ready" until the migrations are applied.
  expect(await readiness(db.pool)).toMatchObject({ status: 'not-ready', database: 'ok', migrations: 'pending' });
  await runMigrations(dbUrl);
  expect(await readiness(db.pool)).toMatchObject({ status: 'ready', migrations: 'applied' });
  await seedDemo(db.db);
  await seedDemoRegion(db.db);
  // Enough leases in the jurisdiction for several chunks (about 1 ha squares in the demo sea, as the screening benchmark makes them).
  await db.pool.query(
    `WITH sea AS (SELECT ST_Difference(ST_MakeEnvelope(-38.82, 41.02, -38.46, 41.38, 4326), (SELECT ST_Union(geom) FROM coasts WHERE form = 'land')) AS g),
          pts AS (SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM sea), $1, 5))).geom AS p)
     INSERT INTO leases (lease_code, status, species, owner_id, jurisdiction_id, geom, area_m2)
     SELECT 'MP-' || row_number() OVER (), 'held', 'pacific-oyster', u.id, u.jurisdiction_id, g, ST_Area(g::geography)
       FROM (SELECT ST_Multi(ST_Expand(p, 0.0006)) AS g FROM pts) x, users u WHERE u.email = 'grower3@brackline.test'`,
    [EXTRA_LEASES],
  );
  amberlinId = (await one<{ id: string }>(`select id from rivers where name = 'Amberlin River'`)).id;
  scenarioCount = (await one<{ n: number }>(`select count(*)::int as n from scenarios where river_id = $1`, [amberlinId])).n;
  smtp = await startSmtpFake(db.db, 0);

  const shared = {
    DATABASE_URL: dbUrl,
    AUTH_SECRET: 'multi-process-secret-multi-process-0123',
    SMTP_URL: `smtp://127.0.0.1:${smtp.port}`,
    APP_URL: 'http://127.0.0.1:3999',
    NODE_ENV: 'test',
    LOG_LEVEL: 'warn',
    START_FAKES: 'false',
    SERVE_CLIENT: 'false',
    HOST: '127.0.0.1',
    SCREENING_CHUNK_LEASES: String(CHUNK_LEASES),
    SCREENING_CHUNK_EXPIRE_SECONDS: String(CHUNK_EXPIRE_SECONDS),
    JOB_MAINTENANCE_SECONDS: '1',
    ALERT_RETRY_DELAY_SECONDS: '1',
  };
  const appReady = /Brackline is running at (http:\/\/127\.0\.0\.1:\d+)/;
  [appA, appB, w1, w2] = await Promise.all([
    start('app A', 'server/index.ts', { ...shared, PORT: '0', WORKERS: 'false' }, appReady),
    start('app B', 'server/index.ts', { ...shared, PORT: '0', WORKERS: 'false' }, appReady),
    start('worker 1', 'server/worker.ts', { ...shared, WORKER_ID: 'w1' }, /Worker w1 is running()/),
    start('worker 2', 'server/worker.ts', { ...shared, WORKER_ID: 'w2' }, /Worker w2 is running()/),
  ]);
}, 240_000);

afterAll(async () => {
  for (const p of procs) if (p.child.exitCode === null && p.child.signalCode === null) p.child.kill('SIGTERM');
  await Promise.all(
    procs.map(
      (p) =>
        new Promise<void>((resolve) => {
          if (p.child.exitCode !== null || p.child.signalCode !== null) return resolve();
          const t = setTimeout(() => {
            p.child.kill('SIGKILL');
            resolve();
          }, 15_000);
          p.child.on('exit', () => {
            clearTimeout(t);
            resolve();
          });
        }),
    ),
  );
  await smtp?.stop();
  await db?.pool.end();
  console.log(`[multi-process figures] ${JSON.stringify(figures)}`);
}, 60_000);

describe('two app processes and two workers on one PostgreSQL', () => {
  it('serves health and readiness from each app process', async () => {
    for (const app of [appA, appB]) {
      const ready = await fetch(`${app.url}/api/ready`);
      expect(ready.status).toBe(200);
      expect(await ready.json()).toMatchObject({ status: 'ready', database: 'ok', migrations: 'applied' });
      const health = await fetch(`${app.url}/api/health`);
      expect(((await health.json()) as { database: string }).database).toBe('ok');
    }
  });

  it('a session made on one app process works on the other', async () => {
    const jar = await signIn(appA.url!, 'grower@brackline.test');
    expect(jar.names().some((n) => /session-token/.test(n))).toBe(true);
    const onA = await api(appA.url!, jar, 'GET', '/account/me');
    const onB = await api(appB.url!, jar, 'GET', '/account/me');
    expect(onA.status).toBe(200);
    expect(onB.status).toBe(200);
    expect(onB.body.email).toBe('grower@brackline.test');
    expect(onB.body).toEqual(onA.body);
    // Without the cookie app B refuses, so it is the shared session that let the request in.
    expect((await api(appB.url!, null, 'GET', '/account/me')).status).toBe(401);
  });

  it('a river change made through one app is screened by the workers, its chunks spread over both', async () => {
    const regulator = await signIn(appA.url!, 'regulator@brackline.test');
    const started = Date.now();
    const runId = await changeRiver(regulator, 9000);
    // Progress read through the other app process.
    const viewer = await signIn(appB.url!, 'regulator@brackline.test');
    const run = await waitFor(
      'the re-screen to finish',
      async () =>
        (await api(appB.url!, viewer, 'GET', `/screenings/runs?riverId=${amberlinId}`)).body.items.find(
          (r: { id: string }) => r.id === runId,
        ),
      (r) => r?.status === 'done' || r?.status === 'failed',
      240_000,
      500,
    );
    figures.rescreenSeconds = Number(((Date.now() - started) / 1000).toFixed(1));
    expect(run.status).toBe('done');
    leaseCount = run.total;
    expect(run.done).toBe(run.total);
    const scoped = await one<{ n: number }>(
      `select count(*)::int as n from leases l, rivers r where r.id = $1 and ((r.jurisdiction_id is not null and l.jurisdiction_id = r.jurisdiction_id) or l.owner_id = r.owner_id)`,
      [amberlinId],
    );
    expect(leaseCount).toBe(scoped.n);
    expect(leaseCount).toBeGreaterThan(EXTRA_LEASES);
    const chunks = await db.pool.query(
      `select chunk_no, worker, status, cardinality(lease_ids) as n from screening_run_chunks where run_id = $1 order by chunk_no`,
      [runId],
    );
    expect(chunks.rows).toHaveLength(Math.ceil(leaseCount / CHUNK_LEASES));
    expect(chunks.rows.every((c) => c.status === 'done')).toBe(true);
    figures.chunksByWorker = JSON.stringify(
      Object.fromEntries(['w1', 'w2'].map((w) => [w, chunks.rows.filter((c) => c.worker === w).length])),
    );
    expect(new Set(chunks.rows.map((c) => c.worker))).toEqual(new Set(['w1', 'w2']));
    // Every lease × scenario screened again by this run, each once.
    const fresh = await one<{ n: number; distinct: number }>(
      `select count(*)::int as n, count(distinct (s.lease_id, s.scenario_id))::int as distinct
         from screenings s, screening_runs r where r.id = $2 and s.river_id = $1 and s.computed_at >= r.started_at`,
      [amberlinId, runId],
    );
    expect(fresh).toEqual({ n: leaseCount * scenarioCount, distinct: leaseCount * scenarioCount });
  }, 300_000);

  it(`a burst of ${ALERTS} alerts sends each e-mail exactly once`, async () => {
    await db.pool.query(
      `insert into billing_accounts (user_id, customer_id, subscription_id, status)
       select id, 'cus_multiproc', 'sub_multiproc', 'active' from users where email = 'grower@brackline.test'
       on conflict (user_id) do update set status = 'active'`,
    );
    const grower = await signIn(appA.url!, 'grower@brackline.test');
    const regulator = await signIn(appB.url!, 'regulator@brackline.test');
    const gauge = (await api(appA.url!, grower, 'GET', '/gauges')).body.items.find((g: { code: string }) => g.code === 'FCSA-G01');
    const token = (await api(appB.url!, regulator, 'POST', `/gauges/${gauge.id}/token`)).body.token;
    const fb001 = (await api(appA.url!, grower, 'GET', '/leases?q=FB-001')).body.items[0].id;
    const rule = await api(appB.url!, grower, 'POST', '/alert-rules', {
      kind: 'lease',
      leaseId: fb001,
      riverId: gauge.riverId,
      bandId: 'plume-edge',
    });
    expect(rule.status).toBe(201);
    const threshold = rule.body.thresholdFlow as number;
    // Readings go up and down 100 times: 100 crossings, 100 alerts, half the readings through each app.
    const readings = Array.from({ length: ALERTS * 2 }, (_, i) => ({
      observedAt: new Date(Date.UTC(2031, 0, 1) + i * 3600_000).toISOString(),
      discharge: i % 2 === 0 ? threshold / 4 : threshold * 2,
    }));
    const started = Date.now();
    for (const [k, app] of [appA, appB].entries()) {
      const posted = await api(
        app.url!,
        null,
        'POST',
        `/gauges/${gauge.id}/readings`,
        { readings: readings.slice(k * ALERTS, (k + 1) * ALERTS) },
        { authorization: `Bearer ${token}` },
      );
      expect(posted.status).toBe(201);
    }
    const count = async (q: string) => (await one<{ n: number }>(q)).n;
    await waitFor(
      'every alert e-mailed',
      () => count(`select count(*)::int as n from alerts where email_status = 'sent'`),
      (n) => n === ALERTS,
      120_000,
    );
    figures.alertBurstSeconds = Number(((Date.now() - started) / 1000).toFixed(1));
    await waitFor(
      'the alert queues to drain',
      () => count(`select count(*)::int as n from pgboss.job where name like 'alerts-%' and state in ('created', 'retry', 'active')`),
      (n) => n === 0,
      30_000,
    );
    // One alert per crossing, and the SMTP fake stored one message per alert, each a different one.
    expect(await count(`select count(*)::int as n from alerts`)).toBe(ALERTS);
    const outbox = await one<{ n: number; bodies: number }>(
      `select count(*)::int as n, count(distinct text_body)::int as bodies from outbox_messages where envelope_to @> '["grower@brackline.test"]'::jsonb`,
    );
    figures.alertEmailsSent = outbox.n;
    expect(outbox).toEqual({ n: ALERTS, bodies: ALERTS });
  }, 180_000);

  it("a worker killed in the middle of a chunk: the other worker finishes the killed worker's chunk", async () => {
    const regulator = await signIn(appB.url!, 'regulator@brackline.test');
    const runId = await changeRiver(regulator, 9500);
    // Worker 1 has taken a chunk and is screening it: kill it (no clean-up, no goodbye).
    const taken = await waitFor(
      'worker 1 to be screening a chunk',
      () =>
        one<{ chunk_no: number } | undefined>(
          `select chunk_no from screening_run_chunks where run_id = $1 and worker = 'w1' and status = 'running'`,
          [runId],
        ),
      (r) => r !== undefined,
      180_000,
      20,
    );
    w1.child.kill('SIGKILL');
    const killedAt = Date.now();
    await new Promise((r) => w1.child.once('exit', r));
    const killedChunk = taken!.chunk_no;
    expect(
      (await one<{ status: string }>(`select status from screening_run_chunks where run_id = $1 and chunk_no = $2`, [runId, killedChunk]))
        .status,
    ).toBe('running');

    const chunk = await waitFor(
      "the killed worker's chunk to be finished",
      () =>
        one<{ status: string; worker: string; attempts: number; started_at: Date; finished_at: Date | null }>(
          `select status, worker, attempts, started_at, finished_at from screening_run_chunks where run_id = $1 and chunk_no = $2`,
          [runId, killedChunk],
        ),
      (c) => c.status === 'done',
      CHUNK_EXPIRE_SECONDS * 1000 + 120_000,
      200,
    );
    // Taken again by the survivor once pg-boss expired it (CHUNK_EXPIRE_SECONDS after it was first taken).
    figures.killedChunkRetakenAfterSeconds = Number(((chunk.started_at.getTime() - killedAt) / 1000).toFixed(1));
    figures.killedChunkFinishedAfterSeconds = Number(((chunk.finished_at!.getTime() - killedAt) / 1000).toFixed(1));
    expect(chunk.worker).toBe('w2');
    expect(chunk.attempts).toBe(2);
    expect(w2.child.exitCode).toBeNull();
    const run = await waitFor(
      'the run to finish',
      () => one<{ status: string; done: number; total: number }>(`select status, done, total from screening_runs where id = $1`, [runId]),
      (r) => r.status === 'done' || r.status === 'failed',
      240_000,
      500,
    );
    expect(run).toEqual({ status: 'done', done: leaseCount, total: leaseCount });
    const fresh = await one<{ n: number }>(
      `select count(*)::int as n from screenings s, screening_runs r where r.id = $2 and s.river_id = $1 and s.computed_at >= r.started_at`,
      [amberlinId, runId],
    );
    expect(fresh.n).toBe(leaseCount * scenarioCount);
  }, 420_000);
});
