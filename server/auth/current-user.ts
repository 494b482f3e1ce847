import { getToken } from '@auth/core/jwt';
import { eq } from 'drizzle-orm';
import type { Request } from 'express';
import type { Database } from '../db/client';
import { users } from '../db/schema';
import type { CurrentUser } from '../http/route';

const COOKIE_NAME = 'authjs.session-token';
const SECURE_COOKIE_NAME = '__Secure-authjs.session-token';
const cache = new WeakMap<Request, Promise<CurrentUser | null>>();

/**
 * How long a user's row (session version, disabled flag, role) is reused without asking the database again.
 * A change made in this process is seen at once (forgetUser); one made by another process within this time.
 */
export const USER_ROW_TTL_MS = 2_000;
/** Decoded session cookies are kept at most this long (and never past the token's own expiry). */
const TOKEN_TTL_MS = 60_000;
/** Both caches are cleared whole when they reach this size, so memory stays bounded under many distinct sessions. */
const MAX_ENTRIES = 10_000;

type UserRow = { user: CurrentUser; sessionVersion: number; disabled: boolean };
const rowCache = new Map<string, { at: number; row: Promise<UserRow | null> }>();
const tokenCache = new Map<string, { until: number; token: { uid: string; sv: unknown } | null }>();

/**
 * Drops the cached row of one user (every user when no id is given). Called wherever a users row changes
 * (session version bump, role change, password reset) so a revoked session is refused on its next request.
 */
export function forgetUser(id?: string): void {
  if (id === undefined) rowCache.clear();
  else rowCache.delete(id);
}

/**
 * The signed-in user for a request, or null. The Auth.js JWT must decode and be unexpired,
 * and its session version must equal the user's current one (revoked sessions are refused).
 * Decrypting the cookie and reading the users row are the two costs every API request pays, so both
 * are cached briefly (see USER_ROW_TTL_MS and forgetUser).
 */
export function createUserResolver(db: Database, secret: string) {
  async function decode(cookie: string): Promise<{ uid: string; sv: unknown } | null> {
    const now = Date.now();
    const hit = tokenCache.get(cookie);
    if (hit && hit.until > now) return hit.token;
    const secure = cookie.includes(SECURE_COOKIE_NAME);
    const token = await getToken({
      req: { headers: { cookie } },
      secret,
      secureCookie: secure,
      salt: secure ? SECURE_COOKIE_NAME : COOKIE_NAME,
    }).catch(() => null);
    const value = token && typeof token.uid === 'string' ? { uid: token.uid, sv: token.sv } : null;
    // getToken has checked expiry; keep the answer no later than the token's own exp.
    const exp = token && typeof token.exp === 'number' ? token.exp * 1000 : now + TOKEN_TTL_MS;
    if (tokenCache.size >= MAX_ENTRIES) tokenCache.clear();
    tokenCache.set(cookie, { until: Math.min(now + TOKEN_TTL_MS, exp), token: value });
    return value;
  }

  function userRow(id: string): Promise<UserRow | null> {
    const now = Date.now();
    const hit = rowCache.get(id);
    if (hit && now - hit.at < USER_ROW_TTL_MS) return hit.row;
    const row = db
      .select()
      .from(users)
      .where(eq(users.id, id))
      .limit(1)
      .then(([r]) =>
        r
          ? {
              sessionVersion: r.sessionVersion,
              disabled: r.disabled,
              user: { id: r.id, email: r.email, name: r.name, role: r.role, organisationId: r.organisationId, jurisdictionId: r.jurisdictionId },
            }
          : null,
      );
    if (rowCache.size >= MAX_ENTRIES) rowCache.clear();
    rowCache.set(id, { at: now, row });
    // A failed read (database down) must not be remembered.
    row.catch(() => {
      if (rowCache.get(id)?.row === row) rowCache.delete(id);
    });
    return row;
  }

  async function resolve(req: Request): Promise<CurrentUser | null> {
    const cookie = req.headers.cookie ?? '';
    if (!cookie.includes(COOKIE_NAME)) return null;
    const token = await decode(cookie);
    if (!token) return null;
    const row = await userRow(token.uid);
    if (!row || row.disabled || row.sessionVersion !== token.sv) return null;
    return { ...row.user };
  }
  return (req: Request) => {
    let p = cache.get(req);
    if (!p) {
      p = resolve(req);
      cache.set(req, p);
    }
    return p;
  };
}
