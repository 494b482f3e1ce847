/**
 * The pieces of surviving a database outage, without restarting anything: a connection closed by
 * the server ("terminating connection due to administrator command", SQLSTATE 57P01, what every
 * connection gets on `pg_ctl restart`) must not throw out of the pool, and an unreachable database
 * must give 503 + Retry-After quickly. tests/faults/db-restart.fault.ts restarts a real cluster.
 * pg_terminate_backend sends the same FATAL 57P01 as a shutdown (PostgreSQL docs §9.27.2, Appendix A).
 */
import pg from 'pg';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createApp } from '../../server/app';
import { createDb, isDatabaseUnavailable } from '../../server/db/client';
import { loadEnv } from '../../server/env';
import { createMailer } from '../../server/mail/mailer';
import { freePort } from '../helpers/pg-cluster';
import { testDatabaseUrl } from '../helpers/test-app';

describe('a connection closed by the server', () => {
  let killer: pg.Client;
  beforeAll(async () => {
    killer = new pg.Client({ connectionString: testDatabaseUrl() });
    await killer.connect();
  });
  afterAll(async () => {
    await killer.end();
  });

  it('is dropped from the pool without an uncaught error, and the next query opens a new one', async () => {
    const handle = createDb(testDatabaseUrl(), 2);
    const uncaught: unknown[] = [];
    const onUncaught = (err: unknown) => uncaught.push(err);
    process.on('uncaughtException', onUncaught);
    try {
      // Two connections: one goes back idle (the case that used to kill the process), one stays checked out between queries.
      const [idle, held] = [await handle.pool.connect(), await handle.pool.connect()];
      const pidOf = async (c: pg.PoolClient) => (await c.query<{ pid: number }>('select pg_backend_pid() as pid')).rows[0].pid;
      const [pid, heldPid] = [await pidOf(idle), await pidOf(held)];
      expect(pid).not.toBe(heldPid);
      idle.release();
      const lost = new Promise((resolve) => handle.pool.once('error', resolve));
      await killer.query('select pg_terminate_backend($1), pg_terminate_backend($2)', [pid, heldPid]);
      const err = (await lost) as Error & { code?: string };
      expect(err.message).toMatch(/terminating connection due to administrator command/);
      expect(isDatabaseUnavailable(err)).toBe(true);
      await expect(held.query('select 1')).rejects.toSatisfy(isDatabaseUnavailable);
      held.release(true);
      const again = await handle.pool.query<{ pid: number }>('select pg_backend_pid() as pid');
      expect(again.rows[0].pid).not.toBe(pid);
      await new Promise((r) => setTimeout(r, 100));
      expect(uncaught).toEqual([]);
    } finally {
      process.off('uncaughtException', onUncaught);
      await handle.pool.end();
    }
  });
});

describe('isDatabaseUnavailable', () => {
  it('tells an outage from a bad query', async () => {
    const handle = createDb(testDatabaseUrl(), 1);
    try {
      const syntax = await handle.pool.query('select from where').catch((e) => e);
      expect(syntax.code).toBe('42601');
      expect(isDatabaseUnavailable(syntax)).toBe(false);
      const missing = await handle.pool.query('select * from no_such_table').catch((e) => e);
      expect(isDatabaseUnavailable(missing)).toBe(false);
    } finally {
      await handle.pool.end();
    }
    const closed = createDb(`postgres://app@127.0.0.1:${await freePort()}/nothing`, 1);
    try {
      const refused = await closed.pool.query('select 1').catch((e) => e);
      expect(isDatabaseUnavailable(refused)).toBe(true);
      // Drizzle wraps driver errors; the cause chain is followed.
      const wrapped = await closed.db.execute('select 1').catch((e) => e);
      expect(isDatabaseUnavailable(wrapped)).toBe(true);
    } finally {
      await closed.pool.end();
    }
  });
});

describe('requests while the database is unreachable', () => {
  it('answer 503 with Retry-After and a clear message, fast; health says degraded', async () => {
    // The store logs its failed query with console.error before rethrowing; expected here.
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
    const url = `postgres://app@127.0.0.1:${await freePort()}/brackline`;
    const db = createDb(url, 2);
    const env = loadEnv({ NODE_ENV: 'test', DATABASE_URL: url, AUTH_SECRET: 'outage-secret-outage-secret-outage-secret', SMTP_URL: 'smtp://127.0.0.1:1', SERVE_CLIENT: 'false' });
    const mailer = createMailer(env.SMTP_URL, env.MAIL_FROM);
    const app = createApp({ env, db, mailer });
    try {
      const started = Date.now();
      const res = await request(app).post('/api/v1/account/password-reset').send({ email: 'grower@brackline.test' }).expect(503);
      expect(Date.now() - started).toBeLessThan(4_000);
      expect(res.headers['retry-after']).toBe('5');
      expect(res.body.error.code).toBe('database_unavailable');
      expect(res.body.error.message).toMatch(/database is not reachable just now/);
      const health = await request(app).get('/api/health').expect(503);
      expect(health.body).toMatchObject({ status: 'degraded', database: 'unreachable' });
      expect(health.headers['retry-after']).toBe('5');
      // Liveness stays 200: restarting the app would not bring the database back.
      await request(app).get('/api/health/live').expect(200);
    } finally {
      mailer.close();
      await db.pool.end();
    }
  });
});
