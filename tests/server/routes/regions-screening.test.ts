/**
 * Issue #15 over HTTP on the invented demo region: screening by geography (a new grower's lease is
 * screened against the rivers whose plume reaches it, never against another grower's private river),
 * regions (areas, joining by a lease, bad areas refused) and candidate leases kept from the regulator.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let regulator: Agent;
let admin: Agent;
let demoJurisdictionId: string;
let regionRiverIds: string[];
let reachingRiverIds: string[];
let inPlumeLease: { type: 'MultiPolygon'; coordinates: number[][][][] };
const demo = (file: string) => readFileSync(path.resolve(import.meta.dirname, '../../../demo-data', file));

const RUN = Date.now().toString(36);
async function newGrower(name: string, regionId?: string | null): Promise<Agent> {
  // A new address per run: the file can run again on the same database.
  const email = name.replace('@', `.${RUN}@`);
  await request(t.app)
    .post('/api/v1/account/sign-up')
    .send({ name: name.split('@')[0], email, password: 'new-grower-pw-1', ...(regionId !== undefined ? { regionId } : {}) })
    .expect(201);
  return (await signIn(t.app, email, 'new-grower-pw-1')).agent;
}

async function uploadLeases(agent: Agent, code: string, geometry: unknown, status?: 'held'): Promise<string> {
  const fc = {
    type: 'FeatureCollection',
    features: [{ type: 'Feature', properties: { LEASE_ID: code, ...(status ? { STATUS: status } : {}) }, geometry }],
  };
  const res = await agent
    .post('/api/v1/imports')
    .field('kind', 'lease')
    .attach('file', Buffer.from(JSON.stringify(fc)), `${code}.geojson`)
    .expect(201);
  const saved = await agent
    .post(`/api/v1/imports/${res.body.id}/confirm`)
    .send({ mapping: { leaseId: 'LEASE_ID', ...(status ? { status: 'STATUS' } : {}) } })
    .expect(200);
  return saved.body.ids[0];
}

async function screenedRivers(leaseId: string): Promise<string[]> {
  const r = await t.db.pool.query('select distinct river_id from screenings where lease_id = $1', [leaseId]);
  return r.rows.map((x: { river_id: string }) => x.river_id).sort();
}

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  admin = (await signIn(t.app, 'admin@brackline.test')).agent;
  const j = await t.db.pool.query("select id from jurisdictions where slug = 'fennick-coast'");
  demoJurisdictionId = j.rows[0].id;
  // A small square the Amberlin's largest flood reaches (from its stored footprints, which other test files leave
  // alone even when they empty the leases table), inside the region's area: the new growers' leases sit on it.
  const amberlin = await t.db.pool.query("select id from rivers where jurisdiction_id = $1 and name = 'Amberlin River'", [
    demoJurisdictionId,
  ]);
  const largestReach = `select b.geom from footprint_bands b
     where b.band_id = 'plume-edge' and b.footprint_id = (select f.id from footprints f where f.river_id = r.id and f.scenario_id is not null order by f.discharge desc limit 1)`;
  const reach = await t.db.pool.query(
    `select ST_AsText(ST_Intersection(ST_Union(x.geom), (select area from jurisdictions where id = $2))) as g
       from rivers r, lateral (${largestReach}) x where r.id = $1`,
    [amberlin.rows[0].id, demoJurisdictionId],
  );
  const square = await t.db.pool.query(
    `select ST_AsGeoJSON(ST_Multi(ST_Envelope(ST_Buffer(ST_PointOnSurface(ST_GeomFromText($1, 4326))::geography, 60)::geometry)), 7) as g`,
    [reach.rows[0].g],
  );
  // Every river of the region (with scenarios) screens a lease the region holds…
  const all = await t.db.pool.query(
    'select id from rivers where jurisdiction_id = $1 and exists (select 1 from scenarios s where s.river_id = rivers.id)',
    [demoJurisdictionId],
  );
  regionRiverIds = all.rows.map((r: { id: string }) => r.id).sort();
  // …and those whose stored plume reaches that square screen a lease outside every region there.
  const reaching = await t.db.pool.query(
    `select distinct f.river_id as id from footprints f join footprint_band_pieces p on p.footprint_id = f.id and p.band_id = 'plume-edge'
      where f.river_id = any($1::uuid[]) and ST_Intersects(p.geom, ST_SetSRID(ST_GeomFromGeoJSON($2), 4326))`,
    [regionRiverIds, square.rows[0].g],
  );
  reachingRiverIds = reaching.rows.map((r: { id: string }) => r.id).sort();
  inPlumeLease = JSON.parse(square.rows[0].g);
}, 180_000);
afterAll(async () => {
  await t.db.db.execute(sql`DELETE FROM jurisdictions WHERE slug = 'test-neighbour'`);
  // This file's growers' leases lie in the demo region (and may lie in its zones): later files count the zones' growers.
  await t.db.pool.query(`DELETE FROM leases WHERE owner_id IN (SELECT id FROM users WHERE email LIKE $1)`, [`%.${RUN}@brackline.test`]);
  await t.close();
});

describe('regions', () => {
  it('lists the regions with their areas without sign-in', async () => {
    const res = await request(t.app).get('/api/v1/regions').expect(200);
    const fennick = res.body.items.find((r: { id: string }) => r.id === demoJurisdictionId);
    expect(fennick.area.type).toBe('MultiPolygon');
  });

  it("a new grower's lease in a region is screened against that region's rivers with no further action, and brings the grower into the region", async () => {
    const grower = await newGrower('newcomer@brackline.test');
    const leaseId = await uploadLeases(grower, 'NEW-1', inPlumeLease);
    expect(regionRiverIds.length).toBeGreaterThan(0);
    expect(await screenedRivers(leaseId)).toEqual(regionRiverIds);
    const screenings = await grower.get(`/api/v1/screenings?leaseId=${leaseId}&limit=500`).expect(200);
    expect(screenings.body.items.length).toBeGreaterThan(0);
    const me = await grower.get('/api/v1/account/me').expect(200);
    expect(me.body.jurisdictionId).toBe(demoJurisdictionId);
    const inbox = await grower.get('/api/v1/inbox').expect(200);
    expect(inbox.body.items.map((m: { title: string }) => m.title)).toContainEqual(expect.stringMatching(/You joined the region/));
    // The region's rivers are now the grower's to read.
    const rivers = await grower.get('/api/v1/rivers').expect(200);
    expect(rivers.body.items.map((r: { id: string }) => r.id)).toEqual(expect.arrayContaining(regionRiverIds));
  });

  it("a lease outside every region's area is still screened by the region's rivers whose plume reaches it", async () => {
    const saved = await t.db.pool.query('select ST_AsText(area) as a from jurisdictions where id = $1', [demoJurisdictionId]);
    await t.db.pool.query('update jurisdictions set area = null where id = $1', [demoJurisdictionId]);
    try {
      const grower = await newGrower('no-area@brackline.test');
      const leaseId = await uploadLeases(grower, 'NOAREA-1', inPlumeLease);
      const lease = await t.db.pool.query('select jurisdiction_id from leases where id = $1', [leaseId]);
      expect(lease.rows[0].jurisdiction_id).toBeNull(); // no region claims it…
      expect(await screenedRivers(leaseId)).toEqual(reachingRiverIds); // …yet every river that reaches it screens it
      expect((await grower.get('/api/v1/account/me')).body.jurisdictionId).toBeNull();
      // The first-run path: leases, rivers and records are there, and ratings too.
      const steps = await grower.get('/api/v1/overview/first-run').expect(200);
      expect(steps.body).toMatchObject({ region: null, leases: 1, leasesRated: 1 });
      expect(steps.body.rivers).toBeGreaterThanOrEqual(reachingRiverIds.length);
      // Rivers other test files add to the region may have typed scenarios and no record: count those with one.
      const withRecord = await t.db.pool.query(
        'select count(*)::int as n from rivers r where r.id = any($1::uuid[]) and exists (select 1 from flow_records f where f.river_id = r.id and f.active)',
        [reachingRiverIds],
      );
      expect(withRecord.rows[0].n).toBeGreaterThan(0);
      expect(steps.body.riversWithRecord).toBeGreaterThanOrEqual(withRecord.rows[0].n);
    } finally {
      await t.db.pool.query('update jurisdictions set area = ST_GeomFromText($2, 4326) where id = $1', [
        demoJurisdictionId,
        saved.rows[0].a,
      ]);
    }
  });

  it("a lease is not screened against another grower's private river", async () => {
    // A grower of no region sets up their own river (with their own copy of the shoreline) at the same place.
    const owner = await newGrower('private-river@brackline.test', null);
    const coast = await owner
      .post('/api/v1/imports')
      .field('kind', 'coast')
      .attach('file', demo('coast/fennick-shoreline.geojson'), 'shore.geojson')
      .expect(201);
    await owner.post(`/api/v1/imports/${coast.body.id}/confirm`).send({ mapping: {} }).expect(200);
    const amberlinId = (
      await t.db.pool.query("select id from rivers where jurisdiction_id = $1 and name = 'Amberlin River'", [demoJurisdictionId])
    ).rows[0].id;
    const amberlin = await regulator.get(`/api/v1/rivers/${amberlinId}`).expect(200);
    const { mouthLongitude, mouthLatitude, outflowAzimuthDeg, mouthWidth, mouthDepth } = amberlin.body.settings;
    const river = await owner
      .post('/api/v1/rivers')
      .send({ name: 'Private Creek', mouthLongitude, mouthLatitude, outflowAzimuthDeg, mouthWidth, mouthDepth })
      .expect(201);
    expect(river.body.jurisdictionId).toBeNull();
    await owner
      .post(`/api/v1/rivers/${river.body.id}/flow-records?units=m3s`)
      .set('Content-Type', 'text/csv')
      .send(demo('flows/amberlin-river-daily.csv').toString('utf8'))
      .expect(201);
    const reach = await t.db.pool.query(
      `select count(*)::int as n from footprints f join footprint_band_pieces p on p.footprint_id = f.id
        where f.river_id = $1 and p.band_id = 'plume-edge' and ST_Intersects(p.geom, ST_SetSRID(ST_GeomFromGeoJSON($2), 4326))`,
      [river.body.id, JSON.stringify(inPlumeLease)],
    );
    expect(reach.rows[0].n).toBeGreaterThan(0); // its plume does reach the place…
    const other = await newGrower('neighbour@brackline.test');
    const leaseId = await uploadLeases(other, 'NB-1', inPlumeLease);
    const rivers = await screenedRivers(leaseId);
    expect(rivers).not.toContain(river.body.id); // …but the river is private to its creator
    expect(rivers).toEqual(regionRiverIds);
    await other.get(`/api/v1/rivers/${river.body.id}`).expect(404);
    // The owner's own lease there is screened by their river.
    const ownLease = await uploadLeases(owner, 'OWN-1', inPlumeLease);
    expect(await screenedRivers(ownLease)).toContain(river.body.id);
  }, 120_000);

  it('a candidate lease is never visible to the regulator; a held one is', async () => {
    const grower = await newGrower('candidate@brackline.test');
    const candidate = await uploadLeases(grower, 'CAND-1', inPlumeLease);
    const held = await uploadLeases(grower, 'HELD-1', inPlumeLease, 'held');
    await regulator.get(`/api/v1/leases/${candidate}`).expect(404);
    await regulator.get(`/api/v1/leases/${held}`).expect(200);
    const list = await regulator.get('/api/v1/leases?limit=5000&withGeometry=false').expect(200);
    const ids = list.body.items.map((l: { id: string }) => l.id);
    expect(ids).not.toContain(candidate);
    const screenings = await regulator.get('/api/v1/screenings?limit=5000').expect(200);
    expect(screenings.body.items.map((s: { leaseId: string }) => s.leaseId)).not.toContain(candidate);
    expect((await screenedRivers(candidate)).length).toBeGreaterThan(0);
  });

  it('a grower picks a region at sign-up or later, or none', async () => {
    const picked = await newGrower('picker@brackline.test', demoJurisdictionId);
    const steps = await picked.get('/api/v1/overview/first-run').expect(200);
    expect(steps.body.region.id).toBe(demoJurisdictionId);
    expect(steps.body).toMatchObject({ leases: 0, leasesRated: 0 });
    expect(steps.body.rivers).toBeGreaterThanOrEqual(regionRiverIds.length); // the region's rivers count as the river step
    expect((await picked.get('/api/v1/account/me')).body.jurisdictionId).toBe(demoJurisdictionId);
    await picked.put('/api/v1/account/region').send({ regionId: null }).expect(200);
    expect((await picked.get('/api/v1/account/me')).body.jurisdictionId).toBeNull();
    await picked.put('/api/v1/account/region').send({ regionId: demoJurisdictionId }).expect(200);
    expect((await picked.get('/api/v1/account/me')).body.jurisdictionId).toBe(demoJurisdictionId);
    const bad = await request(t.app)
      .post('/api/v1/account/sign-up')
      .send({
        name: 'x',
        email: `badregion.${RUN}@brackline.test`,
        password: 'new-grower-pw-1',
        regionId: '00000000-0000-4000-8000-000000000000',
      })
      .expect(400);
    expect(bad.body.error.message).toMatch(/regionId: no region has this id/);
    await regulator.put('/api/v1/account/region').send({ regionId: null }).expect(403);
  });
});

describe('region areas: who sets them and what is refused', () => {
  const square = (w: number, s: number, e: number, n: number) => ({
    type: 'Polygon',
    coordinates: [
      [
        [w, s],
        [e, s],
        [e, n],
        [w, n],
        [w, s],
      ],
    ],
  });
  async function demoArea() {
    const r = await t.db.pool.query('select ST_AsText(area) as a from jurisdictions where id = $1', [demoJurisdictionId]);
    return r.rows[0].a as string;
  }

  it('the regulator of the jurisdiction sets its area; an admin may too', async () => {
    const before = await demoArea();
    const res = await regulator
      .put(`/api/v1/regions/${demoJurisdictionId}/area`)
      .send({ area: square(-38.9, 40.9, -38.3, 41.5) })
      .expect(200);
    expect(res.body.area.type).toBe('MultiPolygon');
    // Put the seeded area back through the admin.
    const wkb = await t.db.pool.query('select ST_AsGeoJSON(ST_GeomFromText($1, 4326)) as g', [before]);
    await admin
      .put(`/api/v1/regions/${demoJurisdictionId}/area`)
      .send({ area: { type: 'Feature', properties: {}, geometry: JSON.parse(wkb.rows[0].g) } })
      .expect(200);
    expect(await demoArea()).toBe(before);
  });

  it('refuses a polygon that does not close, and changes nothing', async () => {
    const before = await demoArea();
    const open = {
      type: 'Polygon',
      coordinates: [
        [
          [-38.9, 40.9],
          [-38.3, 40.9],
          [-38.3, 41.5],
          [-38.9, 41.5],
        ],
      ],
    };
    const res = await regulator.put(`/api/v1/regions/${demoJurisdictionId}/area`).send({ area: open }).expect(400);
    expect(res.body.error.message).toMatch(/does not close.*Repeat the first position at the end/);
    expect(await demoArea()).toBe(before);
  });

  it('refuses overlapping regions, and changes nothing', async () => {
    const before = await demoArea();
    await t.db.pool.query(
      "insert into jurisdictions (slug, name, area) values ('test-neighbour', 'Test Neighbour Authority', ST_Multi(ST_MakeEnvelope(-38.5, 41.0, -38.0, 41.5, 4326)))",
    );
    const res = await regulator
      .put(`/api/v1/regions/${demoJurisdictionId}/area`)
      .send({ area: square(-38.9, 40.9, -38.3, 41.5) })
      .expect(409);
    expect(res.body.error.message).toMatch(/overlaps the region Test Neighbour Authority/);
    expect(await demoArea()).toBe(before);
  });

  it("a regulator of another jurisdiction may not set this one's area; a grower may not either", async () => {
    const other = await t.db.pool.query("select id from jurisdictions where slug = 'test-neighbour'");
    const res = await regulator
      .put(`/api/v1/regions/${other.rows[0].id}/area`)
      .send({ area: square(10, 10, 11, 11) })
      .expect(403);
    expect(res.body.error.message).toMatch(/administrator or a regulator of this jurisdiction/);
    const grower = (await signIn(t.app, 'grower@brackline.test')).agent;
    await grower
      .put(`/api/v1/regions/${demoJurisdictionId}/area`)
      .send({ area: square(10, 10, 11, 11) })
      .expect(403);
  });
});
