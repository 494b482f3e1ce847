/**
 * Issue #15: a coast for any place. A grower of no region sets up a river on the built-in world
 * coastline (OpenStreetMap seas polygons, loaded into PostGIS on first use around the mouth), uploads
 * a flow record and a lease, and gets ratings; a mouth on land or far from any coast is refused.
 * The place is only coordinates on a straight sandy open coast facing west (sea to the west).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
let grower: Awaited<ReturnType<typeof signIn>>['agent'];
const MOUTH = { lon: -1.25, lat: 44.5 };
/** A lease about 2 km north of the mouth and half a kilometre off the shore: to the right of a westward outflow. */
const LEASE_NEAR_MOUTH = {
  type: 'Polygon',
  coordinates: [
    [
      [-1.262, 44.518],
      [-1.258, 44.518],
      [-1.258, 44.521],
      [-1.262, 44.521],
      [-1.262, 44.518],
    ],
  ],
};
const river = { name: 'Sandrun Creek', mouthLongitude: MOUTH.lon, mouthLatitude: MOUTH.lat, outflowAzimuthDeg: 270, mouthWidth: 40, mouthDepth: 2.5 };
const riverCount = async () => (await t.db.pool.query('select count(*)::int as n from rivers')).rows[0].n as number;

beforeAll(async () => {
  t = await createTestApp();
  // A new address per run: the file can run again on the same database.
  const email = `coastless.${Date.now().toString(36)}@brackline.test`;
  await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Coastless', email, password: 'coastless-pw-1' }).expect(201);
  grower = (await signIn(t.app, email, 'coastless-pw-1')).agent;
}, 60_000);
afterAll(async () => {
  await t.close();
});

describe('the built-in coast', () => {
  it('shows the coast around a place with its licence, and says whether a mouth may go there', async () => {
    const res = await grower.get(`/api/v1/coasts/builtin?lon=${MOUTH.lon}&lat=${MOUTH.lat}`).expect(200);
    expect(res.body.attribution).toMatch(/© OpenStreetMap contributors/);
    expect(res.body.attribution).toMatch(/ODbL/);
    expect(res.body.caution).toMatch(/0\.4 to 1 km apart/);
    expect(res.body.problem).toBeNull();
    // The package's coastline lies about 130 m west of this point (measured with PostGIS on the ellipsoid).
    expect(res.body.distanceM).toBeGreaterThan(50);
    expect(res.body.distanceM).toBeLessThan(500);
    expect(['LineString', 'MultiLineString']).toContain(res.body.line.type);
    await grower.get('/api/v1/coasts/builtin?lon=200&lat=44').expect(400);
  });

  it.each([
    ['on land', { mouthLongitude: -1.21, mouthLatitude: 44.5 }, /The mouth is on land, 3\.\d km from the nearest coast/],
    ['out at sea', { mouthLongitude: -1.5, mouthLatitude: 44.5 }, /The mouth is out at sea, 19\.\d km from the nearest coast/],
    ['far from any coast', { mouthLongitude: -35, mouthLatitude: 45 }, /The mouth is far from any coast/],
  ])('refuses a mouth %s with a clear message and saves nothing', async (_what, mouth, message) => {
    const before = await riverCount();
    const res = await grower.post('/api/v1/rivers').send({ ...river, ...mouth }).expect(422);
    expect(res.body.error.message).toMatch(message);
    expect(await riverCount()).toBe(before);
  });

  it('a grower of no region sets up a river on it, uploads a record and a lease, and gets ratings', async () => {
    const created = await grower.post('/api/v1/rivers').send(river).expect(201);
    expect(created.body.coastSource).toBe('builtin');
    expect(created.body.jurisdictionId).toBeNull();
    const csv = readFileSync(path.resolve(import.meta.dirname, '../../../demo-data/flows/tolley-brook-daily.csv'), 'utf8');
    await grower.post(`/api/v1/rivers/${created.body.id}/flow-records?units=m3s`).set('Content-Type', 'text/csv').send(csv).expect(201);
    const fc = { type: 'FeatureCollection', features: [{ type: 'Feature', properties: { LEASE_ID: 'SR-1' }, geometry: LEASE_NEAR_MOUTH }] };
    const up = await grower.post('/api/v1/imports').field('kind', 'lease').attach('file', Buffer.from(JSON.stringify(fc)), 'sr.geojson').expect(201);
    const saved = await grower.post(`/api/v1/imports/${up.body.id}/confirm`).send({ mapping: { leaseId: 'LEASE_ID' } }).expect(200);
    const screenings = await grower.get(`/api/v1/screenings?leaseId=${saved.body.ids[0]}&limit=100`).expect(200);
    expect(screenings.body.items.length).toBeGreaterThanOrEqual(6);
    // The largest flood's plume reaches the lease (it is 2 km up the coast, to the right of the outflow).
    const worst = Math.max(...screenings.body.items.map((s: { bandFractions: Record<string, number> }) => s.bandFractions['plume-edge'] ?? 0));
    expect(worst).toBeGreaterThan(0);
    const fp = await grower.get(`/api/v1/footprints?riverId=${created.body.id}&scenarioId=${screenings.body.items[0].scenarioId}`).expect(200);
    expect(fp.body.properties.warnings.join(' ')).toMatch(/built-in world coastline/);
  }, 120_000);

  it('a traced coast is saved as the user’s own line', async () => {
    const res = await grower
      .post('/api/v1/coasts')
      .send({ name: 'My shore', geometry: { type: 'LineString', coordinates: [[-1.252, 44.45], [-1.251, 44.55]] } })
      .expect(201);
    const list = await grower.get('/api/v1/coasts').expect(200);
    expect(list.body.features.map((f: { id: string }) => f.id)).toContain(res.body.id);
    const bad = await grower.post('/api/v1/coasts').send({ name: 'x', geometry: { type: 'LineString', coordinates: [[0, 0]] } }).expect(400);
    expect(bad.body.error.message).toMatch(/at least two points/);
  });
});
