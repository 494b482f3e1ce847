/**
 * Throttles for what an attacker would repeat: password and link sign-in, sign-up, password reset,
 * invitation accept (per address and per account) and the open calculators (per address). Session
 * reads and page data are never throttled: a grower clicking through the app, or an office behind one
 * address, must never see "too many attempts".
 *
 * The counters live in PostgreSQL (@acpr/rate-limit-postgresql, a store for express-rate-limit), so
 * every app process behind a load balancer counts against the same limits. The store's schema is
 * created by `npm run db:migrate` (server/db/migrate.ts). Its queries run on the app's own pool, so a
 * database outage is handled in one place: the store's error reaches the error handler, which answers
 * 503 with Retry-After like every other request.
 */
import { PostgresStore } from '@acpr/rate-limit-postgresql';
import type { Request, RequestHandler } from 'express';
import { rateLimit, ipKeyGenerator } from 'express-rate-limit';
import type pg from 'pg';
import { TooManyRequestsError } from '../lib/errors';

export interface RateLimitWindow {
  limit: number;
  windowMs: number;
}

export interface RateLimitOptions {
  /** The app's pool (guarded, with a short connect timeout). */
  pool: pg.Pool;
  /** Names this app's counters; every process of one deployment must use the same. */
  prefix: string;
  /** Sign-in, sign-up, reset and invitation requests from one address. */
  address: RateLimitWindow;
  /** The same requests naming one account (e-mail address, reset or invitation token). */
  account: RateLimitWindow;
  /** Open calculator requests from one address. */
  calc: RateLimitWindow;
}

/** Defaults: generous per address (an office signs in together), tight per account. */
export const DEFAULT_RATE_LIMITS = {
  address: { limit: 300, windowMs: 15 * 60_000 },
  account: { limit: 10, windowMs: 15 * 60_000 },
  calc: { limit: 300, windowMs: 60_000 },
} as const;

const minutes = (ms: number) => {
  const m = Math.max(1, Math.round(ms / 60_000));
  return m === 1 ? 'a minute' : `${m} minutes`;
};

/** The account a sign-in family request names: its e-mail, or the reset/invitation token. */
function accountOf(req: Request): string | undefined {
  const body = (req.body ?? {}) as Record<string, unknown>;
  if (typeof body.email === 'string' && body.email.trim()) return `email:${body.email.trim().toLowerCase()}`;
  if (typeof body.token === 'string' && body.token) return `token:${body.token}`;
  const invitation = /^\/invitations\/([^/]+)\/accept$/.exec(req.path) ?? /^\/([^/]+)\/accept$/.exec(req.path);
  if (invitation) return `invitation:${invitation[1]}`;
  return undefined;
}

/**
 * The package's store on the app's pool. Its constructor would start applying its migrations without
 * waiting (an unhandled rejection if the database is down at boot) and its init() would open a pool of
 * its own without an error listener (a restart would then kill the process). Both jobs are done
 * elsewhere: the migrations by db:migrate, the pool by createDb. The queries are the package's own.
 */
function postgresStore(pool: pg.Pool, prefix: string): PostgresStore {
  const store: PostgresStore = Object.create(PostgresStore.prototype);
  store.prefix = prefix;
  store.init = (options: { windowMs: number }) => {
    store.windowMs = options.windowMs;
    store.pool = pool;
  };
  return store;
}

export interface RateLimits {
  /** Per address then per account: the sign-in family. Mount with a body parser before it. */
  signIn: RequestHandler[];
  calc: RequestHandler;
}

export function createRateLimits(o: RateLimitOptions): RateLimits {
  const limiter = (name: string, w: RateLimitWindow, message: string, key: (req: Request) => string | undefined) => {
    const store = postgresStore(o.pool, `${o.prefix}:${name}`);
    return rateLimit({
      windowMs: w.windowMs,
      limit: w.limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      store,
      keyGenerator: (req) => key(req) ?? 'none',
      skip: (req) => key(req) === undefined,
      handler: (_req, _res, next) => next(new TooManyRequestsError(message)),
    });
  };
  const address = (req: Request) => ipKeyGenerator(req.ip ?? '0.0.0.0');
  return {
    signIn: [
      limiter('address', o.address, `Too many sign-in attempts from this address. Wait ${minutes(o.address.windowMs)}, then try again.`, address),
      limiter('account', o.account, `Too many attempts for this account. Wait ${minutes(o.account.windowMs)}, then try again, or reset your password.`, accountOf),
    ],
    calc: limiter('calc', o.calc, `Too many calculator requests. Wait ${minutes(o.calc.windowMs)}, then try again.`, address),
  };
}
