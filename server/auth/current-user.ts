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
 * The signed-in user for a request, or null. The Auth.js JWT must decode and be unexpired,
 * and its session version must equal the user's current one (revoked sessions are refused).
 */
export function createUserResolver(db: Database, secret: string) {
  async function resolve(req: Request): Promise<CurrentUser | null> {
    const headers = { cookie: req.headers.cookie ?? '' };
    const secure = headers.cookie.includes(SECURE_COOKIE_NAME);
    const token = await getToken({
      req: { headers },
      secret,
      secureCookie: secure,
      salt: secure ? SECURE_COOKIE_NAME : COOKIE_NAME,
    }).catch(() => null);
    if (!token || typeof token.uid !== 'string') return null;
    const [row] = await db.select().from(users).where(eq(users.id, token.uid)).limit(1);
    if (!row || row.disabled || row.sessionVersion !== token.sv) return null;
    return {
      id: row.id,
      email: row.email,
      name: row.name,
      role: row.role,
      organisationId: row.organisationId,
      jurisdictionId: row.jurisdictionId,
    };
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
