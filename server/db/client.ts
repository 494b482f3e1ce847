import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { logger } from '../lib/logger';
import * as schema from './schema';

export type Database = NodePgDatabase<typeof schema>;

export interface DbHandle {
  pool: pg.Pool;
  db: Database;
}

/**
 * How long a request waits for a connection before it is answered 503. Short, so that during a
 * restart or failover requests fail fast instead of hanging; a healthy pool hands one out in
 * well under a millisecond, and a busy one within this time.
 */
export const CONNECT_TIMEOUT_MS = 3_000;

/**
 * Keeps connection errors from killing the process. When PostgreSQL restarts (`pg_ctl restart`,
 * a minor upgrade, a failover) every open connection is closed with "terminating connection due
 * to administrator command"; node-postgres reports that as an 'error' event on the pool (idle
 * clients) or on the client (checked-out clients between queries), and an 'error' event with no
 * listener throws. The broken client is discarded; the next query opens a new connection.
 */
export function guardPool(pool: pg.Pool, name: string): pg.Pool {
  pool.on('error', (err) => logger.warn({ err: { message: err.message, code: (err as { code?: string }).code }, pool: name }, 'database connection lost'));
  pool.on('connect', (client) => {
    client.on('error', (err) => logger.warn({ err: { message: err.message }, pool: name }, 'database connection lost (in use)'));
  });
  return pool;
}

/** One pool per process; web servers stay stateless so several can share the database. */
export function createDb(databaseUrl: string, max = 10): DbHandle {
  // JIT compilation costs ~0.7 s on every spatial join of the screening and never pays back on
  // queries this short (measured in npm run bench): off for the app's connections.
  const pool = guardPool(new pg.Pool({ connectionString: databaseUrl, max, options: '-c jit=off', connectionTimeoutMillis: CONNECT_TIMEOUT_MS }), 'app');
  return { pool, db: drizzle(pool, { schema }) };
}

// SQLSTATE classes and codes that mean "the database is not there just now", not "the query is wrong":
// 08 connection exception; 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now
// (starting up or shutting down); 53300 too_many_connections (PostgreSQL docs, Appendix A).
const UNAVAILABLE_SQLSTATES = new Set(['57P01', '57P02', '57P03', '53300']);
const UNAVAILABLE_NET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EAI_AGAIN', 'EHOSTUNREACH', 'ENETUNREACH']);
const UNAVAILABLE_MESSAGES = [
  /Connection terminated/i,
  /timeout exceeded when trying to connect/i,
  /Client has encountered a connection error/i,
  /Connection ended unexpectedly/i,
  /terminating connection due to administrator command/i,
  /the database system is (starting up|shutting down|in recovery mode)/i,
];

/** True when an error (or any error in its `cause` chain, as Drizzle wraps them) says the database is unreachable. */
export function isDatabaseUnavailable(err: unknown): boolean {
  const seen = new Set<unknown>();
  let e: unknown = err;
  while (e && typeof e === 'object' && !seen.has(e)) {
    seen.add(e);
    const { code, message, errors } = e as { code?: unknown; message?: unknown; errors?: unknown };
    if (typeof code === 'string' && (UNAVAILABLE_SQLSTATES.has(code) || code.startsWith('08') || UNAVAILABLE_NET_CODES.has(code))) return true;
    if (typeof message === 'string' && UNAVAILABLE_MESSAGES.some((re) => re.test(message))) return true;
    // AggregateError (a refused connection to both ::1 and 127.0.0.1).
    if (Array.isArray(errors) && errors.some((x) => isDatabaseUnavailable(x))) return true;
    e = (e as { cause?: unknown }).cause;
  }
  return false;
}
