/**
 * KML folders, GPX tracks and GeoPackage tables through the upload API: the preview lists the layers with
 * their feature counts and the user picks one (POST /imports/:id/layer); GPX tracks become areas only when
 * confirmed; stations come from KML pins, GPX waypoints and GeoPackage points. Files are the corpus
 * fixtures (make-corpus.ts) or written here.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeGeoPackage } from '../../../server/lib/write-geopackage';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

const DIR = path.resolve(import.meta.dirname, '../../fixtures/uploads');
let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let grower: Agent;
let grower2: Agent;

beforeAll(async () => {
  t = await createTestApp();
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
});
afterAll(async () => {
  // Leave the shared test database as found: later files count leases and stations.
  await t.db.pool.query("DELETE FROM leases WHERE import_id IN (SELECT id FROM imports WHERE file_name = 'fennick-leases.kml')");
  await t.db.pool.query("DELETE FROM stations WHERE code IN ('ST-G1', 'ST-G2', 'ST-K1', 'ST-P1')");
  await t.close();
});

const counts = async () =>
  (await t.db.pool.query('select (select count(*) from import_features)::int as features, (select count(*) from leases)::int as leases')).rows[0];

describe('a file with several layers', () => {
  it('lists the KML folders with their counts, reads one on request, or all again', async () => {
    const res = await grower.post('/api/v1/imports').field('kind', 'lease').attach('file', readFileSync(path.join(DIR, 'good/fennick-leases.kml')), 'fennick-leases.kml');
    expect(res.status, res.body?.error?.message).toBe(201);
    expect(res.body.format).toBe('kml');
    expect(res.body.layers).toEqual([
      { name: 'Held', featureCount: 2, geometryTypes: ['Polygon'] },
      { name: 'Candidates', featureCount: 2, geometryTypes: ['MultiPolygon', 'Polygon'] },
    ]);
    expect(res.body.featureCount).toBe(4);
    const one = await grower.post(`/api/v1/imports/${res.body.id}/layer`).send({ layer: 'Candidates' }).expect(200);
    expect(one.body).toMatchObject({ featureCount: 2, selectedLayer: 'Candidates' });
    expect(one.body.features.map((f: { properties: { LEASE_ID: string } }) => f.properties.LEASE_ID)).toEqual(['FB-016', 'FB-021']);
    const before = await counts();
    const missing = await grower.post(`/api/v1/imports/${res.body.id}/layer`).send({ layer: 'Moorings' }).expect(422);
    expect(missing.body.error).toMatchObject({ code: 'layer_not_found' });
    expect(missing.body.error.message).toMatch(/Its layers are: “Held”, “Candidates”/);
    expect(await counts()).toEqual(before);
    await grower2.post(`/api/v1/imports/${res.body.id}/layer`).send({ layer: 'Held' }).expect(404);
    const all = await grower.post(`/api/v1/imports/${res.body.id}/layer`).send({ layer: null }).expect(200);
    expect(all.body).toMatchObject({ featureCount: 4, selectedLayer: null });
    const saved = await grower.post(`/api/v1/imports/${res.body.id}/confirm`).send({ mapping: { leaseId: 'LEASE_ID' }, onDuplicate: 'keep' }).expect(200);
    expect(saved.body.created).toBe(4);
  });

  it('a GeoPackage needing a CRS keeps the chosen code when a layer is picked', async () => {
    const res = await grower.post('/api/v1/imports').field('kind', 'lease').attach('file', readFileSync(path.join(DIR, 'needs-crs/undefined-srs.gpkg')), 'undefined-srs.gpkg');
    expect(res.body).toMatchObject({ status: 'needs-crs', format: 'geopackage', featurePage: { total: 0 }, overview: { bbox: null } });
    // Nothing is staged before the coordinate system is known: the pages of features say what to do first.
    const early = await grower.get(`/api/v1/imports/${res.body.id}/features`).expect(409);
    expect(early.body.error.message).toMatch(/choose its coordinate system first/);
    const chosen = await grower.post(`/api/v1/imports/${res.body.id}/crs`).send({ epsg: 32630 }).expect(200);
    expect(chosen.body.features).toHaveLength(4);
    const pages = await grower.get(`/api/v1/imports/${res.body.id}/features?limit=3&offset=3`).expect(200);
    expect(pages.body).toMatchObject({ offset: 3, limit: 3, total: 4 });
    expect(pages.body.items.map((f: { index: number }) => f.index)).toEqual([3]);
  });
});

describe('GPX tracks', () => {
  it('are refused for leases until confirmed, then become areas (an unclosed one with a warning)', async () => {
    const file = readFileSync(path.join(DIR, 'good/walked-leases.gpx'));
    const before = await counts();
    const refused = await grower.post('/api/v1/imports').field('kind', 'lease').attach('file', file, 'walked-leases.gpx').expect(422);
    expect(refused.body.error.code).toBe('tracks_need_confirmation');
    expect(await counts()).toEqual(before);
    const ok = await grower.post('/api/v1/imports').field('kind', 'lease').field('tracksAsPolygons', 'true').attach('file', file, 'walked-leases.gpx').expect(201);
    expect(ok.body).toMatchObject({ format: 'gpx', featureCount: 2, geometryTypes: ['Polygon'], tracksAsPolygons: true });
    expect(ok.body.warnings.join(' ')).toMatch(/Track 2 ended \d+ m from its start; it was closed/);
    // FB-014 walked round its 0.0045° × 0.0025° rectangle at 47.58° N: about 338 m × 278 m ≈ 9.4 ha (hand computation).
    expect(ok.body.features[0].areaM2 / 10_000).toBeGreaterThan(9);
    expect(ok.body.features[0].areaM2 / 10_000).toBeLessThan(9.8);
  });
});

describe('stations from KML pins, GPX waypoints and GeoPackage points', () => {
  it('reads each as points with a code', async () => {
    const gpx = `<?xml version="1.0"?><gpx version="1.1" creator="t" xmlns="http://www.topografix.com/GPX/1/1"><wpt lat="47.58" lon="-2.95"><name>ST-G1</name></wpt><wpt lat="47.59" lon="-2.94"><name>ST-G2</name></wpt></gpx>`;
    const a = await grower.post('/api/v1/stations').attach('file', Buffer.from(gpx), 'stations.gpx');
    expect(a.status, a.body?.error?.message).toBe(201);
    expect(a.body).toMatchObject({ format: 'gpx', created: 2 });
    const kml = `<?xml version="1.0"?><kml xmlns="http://www.opengis.net/kml/2.2"><Document><Folder><name>Stations</name><Placemark><name>ST-K1</name><Point><coordinates>-2.93,47.57,0</coordinates></Point></Placemark></Folder></Document></kml>`;
    const b = await grower.post('/api/v1/stations').attach('file', Buffer.from(kml), 'stations.kml');
    expect(b.status, b.body?.error?.message).toBe(201);
    expect(b.body.items.map((s: { code: string }) => s.code)).toEqual(['ST-K1']);
    const gpkg = await writeGeoPackage({
      name: 'stations',
      title: 'Stations',
      fields: ['code'],
      features: [{ type: 'Feature', properties: { code: 'ST-P1' }, geometry: { type: 'Point', coordinates: [-2.92, 47.575] } }],
      readme: [],
    });
    const c = await grower.post('/api/v1/stations').attach('file', Buffer.from(gpkg), 'stations.gpkg');
    expect(c.status, c.body?.error?.message).toBe(201);
    expect(c.body).toMatchObject({ format: 'geopackage', created: 1 });
    expect(c.body.items[0]).toMatchObject({ code: 'ST-P1', longitude: -2.92, latitude: 47.575 });
  });
});
