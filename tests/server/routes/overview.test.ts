/** Closed zones near the caller's leases, for the overview: only leases the caller may see, only zones not open. */
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let t: TestApp;
let grower: Agent;
let grower2: Agent;
let regulator: Agent;

async function userId(email: string): Promise<string> {
  const r = await t.db.pool.query('select id from users where email = $1', [email]);
  return r.rows[0].id;
}

/** A 200 m square lease whose south-west corner is at (lon, lat). */
async function addLease(email: string, code: string, lon: number, lat: number, status: 'held' | 'candidate'): Promise<string> {
  const j = await t.db.pool.query("select id from jurisdictions where slug = 'fennick-coast'");
  const r = await t.db.pool.query(
    `insert into leases (lease_code, holder, species, status, owner_id, jurisdiction_id, geom, area_m2)
     select $1, 'Test holder', 'pacific-oyster', $2::lease_status, $3, $6::uuid, g, ST_Area(g::geography)
       from (select ST_Multi(ST_MakeEnvelope($4::float8, $5::float8, $4::float8 + 0.0024, $5::float8 + 0.0018, 4326)) as g) x returning id`,
    [code, status, await userId(email), lon, lat, j.rows[0].id],
  );
  return r.rows[0].id;
}

beforeAll(async () => {
  t = await createTestApp();
  // Far out to sea from the demo bay (8° east), so the demo region's zones and leases stay out of the way.
  await t.db.db.execute(sql`DELETE FROM leases WHERE lease_code IN ('IN-ZONE', 'NEAR', 'FAR', 'OTHER-CANDIDATE')`);
  await t.db.db.execute(sql`DELETE FROM closure_zones WHERE name IN ('Closed test zone', 'Open test zone')`);
  const j = await t.db.pool.query("select id from jurisdictions where slug = 'fennick-coast'");
  // One closed zone (a 0.02° square) and one open zone beside it.
  await t.db.pool.query(
    `insert into closure_zones (name, jurisdiction_id, geom, area_m2, status, status_since)
     select n, $1::uuid, g, ST_Area(g::geography), s, now() from (values
       ('Closed test zone', ST_Multi(ST_MakeEnvelope(-30.70, 41.10, -30.68, 41.12, 4326)), 'closed'),
       ('Open test zone', ST_Multi(ST_MakeEnvelope(-30.60, 41.10, -30.58, 41.12, 4326)), 'open')) v(n, g, s)`,
    [j.rows[0].id],
  );
  await addLease('grower@brackline.test', 'IN-ZONE', -30.695, 41.105, 'held');
  // About 2.5 km east of the closed zone's edge (0.03° of longitude at 41.1°N ≈ 2.52 km): near.
  await addLease('grower@brackline.test', 'NEAR', -30.65, 41.11, 'candidate');
  // About 25 km away: not near.
  await addLease('grower@brackline.test', 'FAR', -30.38, 41.11, 'held');
  await addLease('grower2@brackline.test', 'OTHER-CANDIDATE', -30.69, 41.11, 'candidate');
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
});
afterAll(async () => {
  await t.close();
});

describe('GET /overview/closures', () => {
  it("lists the closed zone with the grower's leases inside or near it, nearest first, and not the open zone", async () => {
    const res = await grower.get('/api/v1/overview/closures').expect(200);
    expect(res.body.distanceM).toBe(5000);
    const zone = res.body.items.find((z: { zoneName: string }) => z.zoneName === 'Closed test zone');
    expect(res.body.items.some((z: { zoneName: string }) => z.zoneName === 'Open test zone')).toBe(false);
    expect(zone.zoneName).toBe('Closed test zone');
    expect(zone.status).toBe('closed');
    expect(zone.leases.map((l: { leaseCode: string }) => l.leaseCode)).toEqual(['IN-ZONE', 'NEAR']);
    expect(zone.leases[0].distanceM).toBe(0);
    // Geodesic distance from -30.68 to -30.65 at ~41.11°N: about 2.52 km (0.03° × 111.32 km × cos 41.11°, common practice).
    expect(zone.leases[1].distanceM).toBeGreaterThan(2400);
    expect(zone.leases[1].distanceM).toBeLessThan(2600);
  });

  it("never shows another grower's candidate lease, to a grower or to the regulator", async () => {
    const testZone = (body: { items: { zoneName: string; leases: { leaseCode: string }[] }[] }) =>
      body.items.find((z) => z.zoneName === 'Closed test zone')?.leases.map((l) => l.leaseCode);
    expect(testZone((await grower2.get('/api/v1/overview/closures').expect(200)).body)).toEqual(['OTHER-CANDIDATE']);
    expect(testZone((await regulator.get('/api/v1/overview/closures').expect(200)).body)).toEqual(['IN-ZONE']);
  });
});

describe('GET /overview/zones', () => {
  it('gives the zones of the jurisdiction of the leases the grower sees, with status and trigger, as GeoJSON', async () => {
    const res = await grower.get('/api/v1/overview/zones').expect(200);
    expect(res.body.type).toBe('FeatureCollection');
    const closed = res.body.features.find((f: { properties: { name: string } }) => f.properties.name === 'Closed test zone');
    expect(closed.properties.status).toBe('closed');
    expect(closed.geometry.type).toBe('MultiPolygon');
    // The outline round-trips: the zone's west edge is at 30.70° W.
    expect(Math.min(...closed.geometry.coordinates[0][0].map((c: number[]) => c[0]))).toBeCloseTo(-30.7, 6);
    const reg = await regulator.get('/api/v1/overview/zones').expect(200);
    expect(reg.body.features.map((f: { properties: { name: string } }) => f.properties.name)).toContain('Open test zone');
  });
});

describe('GET /map-settings', () => {
  it('has no basemap unless one is configured, so the maps work with no internet', async () => {
    const res = await grower.get('/api/v1/map-settings').expect(200);
    expect(res.body).toEqual({ basemap: null });
    // Without a basemap no outside origin may serve images.
    expect(res.headers['content-security-policy']).toMatch(/img-src 'self' data: blob:;/);
  });

  it('offers a configured basemap and lets the page load its tiles (and only its tiles) from outside', async () => {
    const other = await createTestApp({
      envOverrides: { BASEMAP_URL: 'https://tiles.example.org/{z}/{x}/{y}.png', BASEMAP_ATTRIBUTION: 'Tiles: Example' },
    });
    try {
      const agent = (await signIn(other.app, 'grower@brackline.test')).agent;
      const res = await agent.get('/api/v1/map-settings').expect(200);
      expect(res.body).toEqual({ basemap: { url: 'https://tiles.example.org/{z}/{x}/{y}.png', attribution: 'Tiles: Example' } });
      expect(res.headers['content-security-policy']).toMatch(/img-src 'self' data: blob: https:\/\/tiles\.example\.org;/);
    } finally {
      await other.close();
    }
  });

  it('refuses a basemap template without {z}, {x} and {y} at boot, naming the variable', async () => {
    const { loadEnv } = await import('../../../server/env');
    expect(() =>
      loadEnv({ DATABASE_URL: 'postgres://x@127.0.0.1/y', AUTH_SECRET: 'x'.repeat(32), BASEMAP_URL: 'https://tiles.example.org/tile.png' }),
    ).toThrow(/BASEMAP_URL must be an http\(s\) tile template/);
  });
});
