/**
 * Throttles with the shipped defaults (DEFAULT_RATE_LIMITS): normal use is never refused, the
 * sign-in family and the calculators still are, and the counters are shared between app processes
 * through PostgreSQL. Limits per address and per account are common practice (OWASP Authentication
 * Cheat Sheet, "Protect against automated attacks"); the numbers are ours.
 */
import { inArray, like } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hashPassword } from '../../../server/auth/passwords';
import { users } from '../../../server/db/schema';
import { DEFAULT_RATE_LIMITS } from '../../../server/middleware/rate-limits';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  // The real defaults, not the relaxed ones the other API tests use.
  t = await createTestApp({ authRateLimit: DEFAULT_RATE_LIMITS.address, accountRateLimit: DEFAULT_RATE_LIMITS.account, calcRateLimit: DEFAULT_RATE_LIMITS.calc });
});
afterAll(async () => {
  await t.close();
});

/** The page data the grower's pages load (each page calls /account/me first). */
const PAGE_DATA = [
  '/api/v1/account/me',
  '/api/v1/leases',
  '/api/v1/rivers',
  '/api/v1/inbox',
  '/api/v1/overview/closures',
  '/api/v1/alerts',
  '/api/v1/advisers',
  '/api/v1/billing/subscription',
  '/api/v1/screenings',
  '/api/v1/coasts',
];

describe('normal use is never throttled (defaults)', () => {
  it('serves 500 authenticated page-data requests from one address within a minute without a 429', async () => {
    const { agent, error } = await signIn(t.app, 'grower@brackline.test');
    expect(error).toBeNull();
    const started = Date.now();
    const statuses: number[] = [];
    // Ten at a time, as a browser loading pages in a few tabs would.
    for (let i = 0; i < 500; i += 10) {
      const batch = await Promise.all(Array.from({ length: 10 }, (_, j) => agent.get(PAGE_DATA[(i + j) % PAGE_DATA.length])));
      statuses.push(...batch.map((r) => r.status));
    }
    const seconds = (Date.now() - started) / 1000;
    console.log(`[rate limits] 500 page-data requests in ${seconds.toFixed(1)} s: ${statuses.filter((s) => s === 200).length} × 200`);
    expect(seconds).toBeLessThan(60);
    expect(statuses.filter((s) => s === 429)).toEqual([]);
    expect(statuses.every((s) => s === 200)).toBe(true);
  }, 90_000);

  it('signs in 30 different users from one address within a minute without a 429', async () => {
    const emails = Array.from({ length: 30 }, (_, i) => `office-${i}@rate-limits.test`);
    const passwordHash = await hashPassword('office-password-2026');
    await t.db.db.delete(users).where(like(users.email, '%@rate-limits.test'));
    await t.db.db.insert(users).values(emails.map((email, i) => ({ email, name: `Office user ${i}`, role: 'grower' as const, passwordHash })));
    const started = Date.now();
    const results: { error: string | null; status: number }[] = [];
    for (let i = 0; i < emails.length; i += 5) {
      results.push(...(await Promise.all(emails.slice(i, i + 5).map((email) => signIn(t.app, email, 'office-password-2026')))));
    }
    const seconds = (Date.now() - started) / 1000;
    console.log(`[rate limits] 30 sign-ins from one address in ${seconds.toFixed(1)} s`);
    expect(seconds).toBeLessThan(60);
    expect(results.map((r) => r.status).filter((s) => s === 429)).toEqual([]);
    expect(results.map((r) => r.error)).toEqual(emails.map(() => null));
    await t.db.db.delete(users).where(inArray(users.email, emails));
  }, 90_000);

  it('never throttles reading the session, even when the address is over its sign-in limit', async () => {
    const tight = await createTestApp({ authRateLimit: { limit: 1, windowMs: 60_000 } });
    try {
      const { agent } = await signIn(tight.app, 'grower@brackline.test');
      await agent.post('/auth/callback/credentials').type('form').send({ email: 'x@y.z', password: 'p' }).expect(429);
      for (let i = 0; i < 20; i++) {
        await agent.get('/auth/session').expect(200);
        await agent.get('/auth/csrf').expect(200);
        await agent.get('/api/v1/account/me').expect(200);
      }
    } finally {
      await tight.close();
    }
  });
});

describe('the throttles still trigger (defaults)', () => {
  it('refuses the eleventh password attempt for one account within 15 minutes, from any address', async () => {
    const email = 'guessed-account@rate-limits.test';
    const codes: (string | null)[] = [];
    for (let i = 0; i < DEFAULT_RATE_LIMITS.account.limit; i++) {
      const r = await signIn(t.app, email, `guess-${i}`);
      expect(r.status).not.toBe(429);
      codes.push(r.code);
    }
    // After five failures the account's own failure counter already refuses (too_many_attempts)…
    expect(codes.slice(0, 5)).toEqual(Array(5).fill('credentials'));
    expect(codes.slice(5)).toEqual(Array(5).fill('too_many_attempts'));
    // …and the per-account limit answers 429 before Auth.js is even asked.
    const agent = request.agent(t.app);
    const res = await agent.post('/auth/callback/credentials').type('form').send({ email: email.toUpperCase(), password: 'another-guess' }).expect(429);
    expect(res.body.error.message).toMatch(/Too many attempts for this account/);
    expect(res.headers['retry-after']).toBeDefined();
  });

  it('throttles password-reset requests for one e-mail address', async () => {
    const email = 'reset-spam@rate-limits.test';
    for (let i = 0; i < DEFAULT_RATE_LIMITS.account.limit; i++) await request(t.app).post('/api/v1/account/password-reset').send({ email }).expect(202);
    const res = await request(t.app).post('/api/v1/account/password-reset').send({ email }).expect(429);
    expect(res.body.error.code).toBe('too_many_requests');
  });

  it('throttles an invitation token tried again and again', async () => {
    const token = 'not-a-real-invitation-token-0123456789';
    for (let i = 0; i < DEFAULT_RATE_LIMITS.account.limit; i++) {
      const r = await request(t.app).post(`/api/v1/invitations/${token}/accept`).send({ name: 'Somebody', password: 'a-long-password-1' });
      expect(r.status).not.toBe(429);
    }
    await request(t.app).post(`/api/v1/invitations/${token}/accept`).send({ name: 'Somebody', password: 'a-long-password-1' }).expect(429);
  });

  it('throttles one address over its limit for sign-up and sign-in alike', async () => {
    const tight = await createTestApp({ authRateLimit: { limit: 4, windowMs: 60_000 } });
    try {
      await request(tight.app).post('/api/v1/account/sign-up').send({ name: 'A', email: 'tight-a@rate-limits.test', password: 'a-long-password-1' }).expect(201);
      await request(tight.app).post('/api/v1/account/sign-up').send({ name: 'B', email: 'tight-b@rate-limits.test', password: 'a-long-password-1' }).expect(201);
      await request(tight.app).post('/auth/callback/credentials').type('form').send({ email: 'c@y.z', password: 'p' });
      await request(tight.app).post('/auth/signin/nodemailer').type('form').send({ email: 'd@y.z' });
      const res = await request(tight.app).post('/api/v1/account/sign-up').send({ name: 'E', email: 'tight-e@rate-limits.test', password: 'a-long-password-1' }).expect(429);
      expect(res.body.error.message).toMatch(/Too many sign-in attempts from this address/);
    } finally {
      await tight.db.db.delete(users).where(like(users.email, 'tight-%@rate-limits.test'));
      await tight.close();
    }
  });

  it('throttles the open calculators per address', async () => {
    const tight = await createTestApp({ calcRateLimit: { limit: 3, windowMs: 60_000 } });
    try {
      const body = { salinity: 35, temperature: 10 };
      for (let i = 0; i < 3; i++) expect((await request(tight.app).post('/api/v1/calc/water').send(body)).status).not.toBe(429);
      const res = await request(tight.app).post('/api/v1/calc/water').send(body).expect(429);
      expect(res.body.error.message).toMatch(/Too many calculator requests/);
    } finally {
      await tight.close();
    }
  });

  it('shares the counters between app processes through PostgreSQL', async () => {
    const prefix = `shared-${Date.now()}`;
    const a = await createTestApp({ authRateLimit: { limit: 3, windowMs: 60_000 }, rateLimitPrefix: prefix });
    const b = await createTestApp({ authRateLimit: { limit: 3, windowMs: 60_000 }, rateLimitPrefix: prefix });
    try {
      for (const app of [a.app, b.app, a.app]) await request(app).post('/auth/callback/credentials').type('form').send({ email: 'x@y.z', password: 'p' });
      // The fourth request goes to the other app: it knows about the first three.
      await request(b.app).post('/auth/callback/credentials').type('form').send({ email: 'x@y.z', password: 'p' }).expect(429);
    } finally {
      await a.close();
      await b.close();
    }
  });
});
