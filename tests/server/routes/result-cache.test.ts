/**
 * The kept answers of the list routes (server/cache/result-cache.ts): served again only while nothing they read has
 * changed, whoever changed it (this app, another process, a transaction still open), never across callers.
 */
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createResultCache, type ResultCacheStats } from '../../../server/cache/result-cache';
import type { CurrentUser } from '../../../server/http/route';
import { createTestApp, signIn, type TestApp, testDatabaseUrl } from '../../helpers/test-app';

type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let t: TestApp;
let uncached: TestApp;
let grower: Agent;
let grower2: Agent;
/** Another process's connection: it writes without going through the app. */
let other: pg.Client;
let leaseId: string;
let riverId: string;

const stats = (app: TestApp): ResultCacheStats => (app.app.locals.resultCache as { stats(): ResultCacheStats }).stats();

async function userId(email: string): Promise<string> {
  return (await t.db.pool.query('select id from users where email = $1', [email])).rows[0].id;
}

beforeAll(async () => {
  t = await createTestApp();
  uncached = await createTestApp({ envOverrides: { RESULT_CACHE: 'false' } });
  other = new pg.Client({ connectionString: testDatabaseUrl() });
  await other.connect();
  await t.db.pool.query("delete from leases where lease_code like 'CACHE-%'");
  const owner = await userId('grower@brackline.test');
  const j = (await t.db.pool.query("select id from jurisdictions where slug = 'fennick-coast'")).rows[0].id;
  // Far from the demo bay, so no river screens it; its yearly figures are written by hand below.
  leaseId = (
    await t.db.pool.query(
      `insert into leases (lease_code, holder, species, status, owner_id, jurisdiction_id, geom, area_m2)
       select 'CACHE-1', 'Cache holder', 'pacific-oyster', 'held', $1, $2::uuid, g, ST_Area(g::geography)
         from (select ST_Multi(ST_MakeEnvelope(-20.70, 30.10, -20.698, 30.102, 4326)) as g) x returning id`,
      [owner, j],
    )
  ).rows[0].id;
  await t.db.pool.query("delete from rivers where name = 'Cache test river'");
  // A river row of the grower's own, never screened: it only names the yearly figures below.
  riverId = (
    await t.db.pool.query(
      `insert into rivers (name, owner_id, settings, mouth) values ('Cache test river', $1, '{}'::jsonb, ST_SetSRID(ST_MakePoint(-20.8, 30.1), 4326)) returning id`,
      [owner],
    )
  ).rows[0].id;
  await t.db.pool.query(
    `insert into lease_annual_exposure (lease_id, river_id, expected_days_per_year, probability_any_exposure, worst_rating, closure_days_per_year, harmful_salinity_chance)
     values ($1, $2, 1, 0.1, 'moderate', 1, 0.01)`,
    [leaseId, riverId],
  );
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
});

afterAll(async () => {
  await t.db.pool.query("delete from leases where lease_code like 'CACHE-%'");
  await t.db.pool.query("delete from rivers where name = 'Cache test river'");
  await other.end();
  await uncached.close();
  await t.close();
});

const closureDays = (body: { items: { leaseCode: string; closureDaysPerYear: number | null }[] }) =>
  body.items.find((i) => i.leaseCode === 'CACHE-1')?.closureDaysPerYear;

describe('kept list answers', () => {
  it('serves the same answer again while nothing it reads has changed', async () => {
    const first = await grower.get('/api/v1/screenings/annual').expect(200);
    const before = stats(t);
    const second = await grower.get('/api/v1/screenings/annual').expect(200);
    expect(stats(t).hits).toBe(before.hits + 1);
    expect(second.body).toEqual(first.body);
    expect(closureDays(second.body)).toBe(1);
  });

  it("sees another process's committed change on the very next request", async () => {
    await grower.get('/api/v1/screenings/annual').expect(200);
    await other.query('update lease_annual_exposure set closure_days_per_year = 40 where lease_id = $1', [leaseId]);
    const after = await grower.get('/api/v1/screenings/annual').expect(200);
    expect(closureDays(after.body)).toBe(40);
    // 40 closure days a year rate Severe (shared/scoring/annual-rating.ts cut points).
    expect(after.body.items.find((i: { leaseCode: string }) => i.leaseCode === 'CACHE-1').annualRating).toBe('severe');
  });

  it('keeps serving while a change is not yet committed, and stops the moment it is', async () => {
    await grower.get('/api/v1/leases?limit=100').expect(200);
    await other.query('begin');
    await other.query("update leases set holder = 'Renamed holder' where id = $1", [leaseId]);
    const before = stats(t);
    const during = await grower.get('/api/v1/leases?limit=100').expect(200);
    expect(stats(t).hits).toBe(before.hits + 1);
    expect(during.body.items.find((l: { id: string }) => l.id === leaseId).holder).toBe('Cache holder');
    await other.query('commit');
    const after = await grower.get('/api/v1/leases?limit=100').expect(200);
    expect(after.body.items.find((l: { id: string }) => l.id === leaseId).holder).toBe('Renamed holder');
  });

  it("shows a caller's own change through the API at once", async () => {
    await grower.get('/api/v1/leases?limit=100').expect(200);
    await grower.patch(`/api/v1/leases/${leaseId}`).send({ holder: 'Third holder' }).expect(200);
    const after = await grower.get('/api/v1/leases?limit=100').expect(200);
    expect(after.body.items.find((l: { id: string }) => l.id === leaseId).holder).toBe('Third holder');
  });

  it('never hands one caller the answer kept for another', async () => {
    const mine = await grower.get('/api/v1/screenings/annual').expect(200);
    const theirs = await grower2.get('/api/v1/screenings/annual').expect(200);
    expect(closureDays(mine.body)).toBe(40);
    expect(closureDays(theirs.body)).toBeUndefined();
    // Same caller, other query: its own entry.
    const one = await grower.get(`/api/v1/screenings/annual?leaseId=${leaseId}`).expect(200);
    expect(one.body.items.map((i: { leaseCode: string }) => i.leaseCode)).toEqual(['CACHE-1']);
  });

  it('sees a lease shared with the caller, and its end, at once', async () => {
    const adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
    const adviserId = await userId('adviser@brackline.test');
    const has = async () => (await adviser.get('/api/v1/leases?limit=500').expect(200)).body.items.some((l: { id: string }) => l.id === leaseId);
    expect(await has()).toBe(false);
    await other.query('insert into lease_shares (lease_id, grantee_id) values ($1, $2)', [leaseId, adviserId]);
    expect(await has()).toBe(true);
    await other.query('delete from lease_shares where lease_id = $1 and grantee_id = $2', [leaseId, adviserId]);
    expect(await has()).toBe(false);
  });

  it('sends a kept answer gzipped to a client that asks for it (as browsers do), and as it is to one that does not', async () => {
    // Ten more leases far from the demo bay make the grower's list several kB (answers under 1 kB go as they are).
    const owner = await userId('grower@brackline.test');
    await other.query(
      `insert into leases (lease_code, holder, species, status, owner_id, geom, area_m2)
       select 'CACHE-GZ-' || i, 'Gzip holder', 'pacific-oyster', 'held', $1, g, ST_Area(g::geography)
         from generate_series(1, 10) i, lateral (select ST_Multi(ST_MakeEnvelope(-20.8 + i * 0.01, 30.2, -20.798 + i * 0.01, 30.202, 4326)) as g) x`,
      [owner],
    );
    const route = '/api/v1/leases?limit=50';
    const plain = await grower.get(route).set('Accept-Encoding', 'identity').expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.text.length).toBeGreaterThan(1024);
    const before = stats(t);
    const zipped = await grower.get(route).set('Accept-Encoding', 'gzip, deflate, br').expect(200);
    expect(stats(t).hits).toBe(before.hits + 1);
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers.vary).toMatch(/Accept-Encoding/i);
    // supertest inflates the body: the same answer either way.
    expect(zipped.body).toEqual(plain.body);
    // An answer read fresh (no result cache) is gzipped by the compression middleware instead.
    const agent = (await signIn(uncached.app, 'grower@brackline.test')).agent;
    const fresh = await agent.get(route).set('Accept-Encoding', 'gzip').expect(200);
    expect(fresh.headers['content-encoding']).toBe('gzip');
    expect(fresh.body.total).toBe(plain.body.total);
    await other.query("delete from leases where lease_code like 'CACHE-GZ-%'");
  });

  it('with RESULT_CACHE=false reads every time and answers the same', async () => {
    const agent = (await signIn(uncached.app, 'grower@brackline.test')).agent;
    const a = await agent.get('/api/v1/screenings/annual').expect(200);
    const b = await agent.get('/api/v1/screenings/annual').expect(200);
    expect(stats(uncached).hits).toBe(0);
    expect(b.body).toEqual(a.body);
    expect(closureDays(b.body)).toBe(40);
  });
});

describe('createResultCache', () => {
  const user: CurrentUser = { id: 'cache-test', email: 'c@example.test', name: null, role: 'grower', organisationId: null, jurisdictionId: null };

  it('reads once for callers asking the same thing at the same time, and again after a change', async () => {
    const cache = createResultCache(t.db.pool, { enabled: true, maxBytes: 1e6, ttlMs: 60_000 });
    let reads = 0;
    const load = async () => {
      reads += 1;
      await new Promise((r) => setTimeout(r, 50));
      return { n: reads };
    };
    const n = async () => JSON.parse((await cache.answer('r', user, { q: 1 }, load)).text).n;
    const answers = await Promise.all(Array.from({ length: 10 }, n));
    expect(reads).toBe(1);
    expect(answers.every((a) => a === 1)).toBe(true);
    expect(await n()).toBe(1);
    await other.query('update leases set notes = notes where id = $1', [leaseId]);
    expect(await n()).toBe(2);
    expect(reads).toBe(2);
  });

  it('keeps no answer larger than a tenth of its room', async () => {
    const cache = createResultCache(t.db.pool, { enabled: true, maxBytes: 1_000, ttlMs: 60_000 });
    let reads = 0;
    const big = async () => {
      reads += 1;
      return { text: 'x'.repeat(200) };
    };
    await cache.answer('big', user, {}, big);
    await cache.answer('big', user, {}, big);
    expect(reads).toBe(2);
    expect(cache.stats().entries).toBe(0);
  });
});
