/**
 * Round trips against GDAL (Debian's gdal-bin, the reference reader and writer of these formats):
 *  - the lease fixtures converted by ogr2ogr into GeoPackage (in several CRSs), KML and KMZ, uploaded through the
 *    API: the same leases, attributes and areas (within 0.1 %) as the GeoJSON and the shapefile uploads;
 *  - every export (leases, a footprint's bands, closure zones, stations) as GeoPackage and KML, read back with
 *    ogrinfo: the CRS (EPSG:4326), the feature count and the attributes, and the readme naming the model version
 *    and the cautions.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { CAUTION_TEXT } from '../../../shared/cautions';
import { layerExportGeoJsonSchema } from '../../../shared/schemas/exports';
import { LEASE_EXPORT_CSV_COLUMNS, leaseExportGeoJsonSchema } from '../../../shared/schemas/lease';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

const REF = path.resolve(import.meta.dirname, '../../fixtures/uploads/reference');
let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let grower: Agent;
let regulator: Agent;
let work: string;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  work = mkdtempSync(path.join(tmpdir(), 'brackline-gdal-'));
}, 180_000);
afterAll(async () => {
  rmSync(work, { recursive: true, force: true });
  // Leave the shared test database as found: later files count the demo leases.
  await t.db.pool.query("DELETE FROM leases WHERE import_id IN (SELECT id FROM imports WHERE file_name = 'confirm.kmz')");
  await t.close();
});

const ogr2ogr = (...args: string[]) => execFileSync('ogr2ogr', args, { stdio: ['ignore', 'pipe', 'pipe'] });
const ogrinfo = (...args: string[]) => execFileSync('ogrinfo', ['-ro', ...args], { encoding: 'utf8' });

/** Features of `ogrinfo -al` output: each OGRFeature's "name (Type) = value" lines. */
function ogrFeatures(text: string): Record<string, string>[] {
  return text
    .split(/\nOGRFeature\([^)]*\):\d+\n/)
    .slice(1)
    .map((block) => {
      const props: Record<string, string> = {};
      for (const line of block.split('\n')) {
        const m = /^ {2}(.+?) \(([A-Za-z0-9]+)\) = (.*)$/.exec(line);
        if (m) props[m[1]] = m[3];
      }
      return props;
    });
}

async function upload(agent: Agent, file: string, kind = 'lease', fields: Record<string, string> = {}) {
  let req = agent.post('/api/v1/imports').field('kind', kind);
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  const res = await req.attach('file', readFileSync(file), path.basename(file));
  expect(res.status, res.body?.error?.message).toBe(201);
  return res.body as { id: string; crs: { found: boolean; epsg?: number }; format: string; features: { properties: Record<string, unknown>; areaM2: number }[] };
}
const areasById = (body: { features: { properties: Record<string, unknown>; areaM2: number }[] }, field = 'LEASE_ID') =>
  Object.fromEntries(body.features.map((f) => [String(f.properties[field]), f.areaM2]));

describe('uploads of GDAL-written GeoPackage, KML and KMZ give the same leases as GeoJSON and shapefiles', () => {
  let reference: Record<string, number>;
  beforeAll(async () => {
    reference = areasById(await upload(grower, path.join(REF, 'source.geojson')));
    expect(Object.keys(reference)).toHaveLength(4);
  });

  it('a shapefile (UTM 30N, written by ogr2ogr) matches the GeoJSON', async () => {
    const shp = areasById(await upload(grower, path.join(REF, 'utm30n.zip')));
    for (const [id, area] of Object.entries(reference)) expect(Math.abs(shp[id] / area - 1)).toBeLessThan(0.001);
  });

  it.each([4326, 32630, 2154, 3857])('GeoPackage in EPSG:%i: CRS from gpkg_spatial_ref_sys, areas within 0.1 %%', async (epsg) => {
    const out = path.join(work, `leases-${epsg}.gpkg`);
    ogr2ogr('-f', 'GPKG', out, path.join(REF, 'source.geojson'), '-s_srs', 'EPSG:4326', '-t_srs', `EPSG:${epsg}`, '-nln', 'registry');
    const body = await upload(grower, out);
    expect(body.format).toBe('geopackage');
    expect(body.crs).toMatchObject({ found: true, epsg });
    const got = areasById(body);
    for (const [id, area] of Object.entries(reference)) expect(Math.abs(got[id] / area - 1), `${id} in EPSG:${epsg}`).toBeLessThan(0.001);
    expect(body.features.find((f) => f.properties.LEASE_ID === 'FB-015')?.properties.HOLDER).toBe('Gullhaven Mussels');
  });

  it.each([
    ['utm30n.zip', 'KML'],
    ['lambert93.zip', 'KML'],
    ['utm30n.zip', 'LIBKML'],
  ])('%s converted by ogr2ogr to %s: attributes from ExtendedData, areas within 0.1 %%', async (zip, driver) => {
    const out = path.join(work, `${zip}-${driver}.${driver === 'LIBKML' ? 'kmz' : 'kml'}`);
    ogr2ogr('-f', driver, out, `/vsizip/${path.join(REF, zip)}`, '-t_srs', 'EPSG:4326');
    const body = await upload(grower, out);
    expect(body.format).toBe(driver === 'LIBKML' ? 'kmz' : 'kml');
    expect(body.crs).toMatchObject({ found: true, epsg: 4326 });
    const got = areasById(body);
    for (const [id, area] of Object.entries(reference)) expect(Math.abs(got[id] / area - 1), id).toBeLessThan(0.001);
  });

  it('a GeoPackage of two tables (written by ogr2ogr): the preview lists both with their counts and one is picked', async () => {
    const out = path.join(work, 'two-tables.gpkg');
    ogr2ogr('-f', 'GPKG', out, path.join(REF, 'source.geojson'), '-nln', 'held', '-where', "LEASE_ID IN ('FB-014', 'FB-015')", '-t_srs', 'EPSG:32630');
    ogr2ogr('-f', 'GPKG', '-update', out, path.join(REF, 'source.geojson'), '-nln', 'candidates', '-where', "LEASE_ID NOT IN ('FB-014', 'FB-015')", '-t_srs', 'EPSG:2154');
    const body = (await upload(grower, out)) as Awaited<ReturnType<typeof upload>> & { layers: { name: string; featureCount: number }[] };
    expect(body.layers.map((l) => [l.name, l.featureCount])).toEqual([
      ['held', 2],
      ['candidates', 2],
    ]);
    expect(Object.keys(areasById(body)).sort()).toEqual(Object.keys(reference).sort());
    const picked = await grower.post(`/api/v1/imports/${body.id}/layer`).send({ layer: 'candidates' }).expect(200);
    expect(picked.body.crs).toMatchObject({ found: true, epsg: 2154 });
    const got = areasById(picked.body);
    expect(Object.keys(got).sort()).toEqual(Object.keys(reference).filter((id) => id !== 'FB-014' && id !== 'FB-015').sort());
    for (const id of Object.keys(got)) expect(Math.abs(got[id] / reference[id] - 1), id).toBeLessThan(0.001);
  });

  it('a KMZ upload confirms into the same leases as the shapefile', async () => {
    const out = path.join(work, 'confirm.kmz');
    ogr2ogr('-f', 'LIBKML', out, path.join(REF, 'source.geojson'));
    const body = await upload(grower, out);
    const confirm = await grower
      .post(`/api/v1/imports/${body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID', holder: 'HOLDER', species: 'SPECIES', status: 'STATUS' }, onDuplicate: 'keep' });
    expect(confirm.status, confirm.body?.error?.message).toBe(200);
    expect(confirm.body.created).toBe(4);
  }, 180_000);
});

describe('exports open in GDAL with the right CRS, features and attributes', () => {
  /** Downloads an export, writes it to disk and returns its path. */
  async function download(agent: Agent, url: string, file: string) {
    const res = await agent.get(url).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status, String(res.body)).toBe(200);
    const out = path.join(work, file);
    writeFileSync(out, res.body as Buffer);
    return { out, res };
  }

  /** ogrinfo's summary of a layer: feature count and the EPSG code of its CRS. */
  function summary(file: string, layer: string) {
    const text = ogrinfo('-so', file, layer);
    return {
      count: Number(/Feature Count: (\d+)/.exec(text)?.[1]),
      epsg: Number(/ID\["EPSG",(\d+)\]\]\s*$/m.exec(text)?.[1] ?? /ID\["EPSG",(\d+)\]/.exec(text.slice(text.lastIndexOf('ID["EPSG"')))?.[1]),
    };
  }

  async function checkLayer(
    agent: Agent,
    url: string,
    name: string,
    layer: string,
    expected: { count: number; field: string; values: string[] },
  ) {
    const gpkg = await download(agent, `${url}format=gpkg`, `${name}.gpkg`);
    expect(gpkg.res.headers['content-type']).toMatch(/geopackage/);
    const s = summary(gpkg.out, layer);
    expect(s).toEqual({ count: expected.count, epsg: 4326 });
    const features = ogrFeatures(ogrinfo('-al', gpkg.out, layer));
    expect(features.map((f) => f[expected.field]).sort()).toEqual([...expected.values].sort());
    // The readme table: model version and cautions, read by GDAL as a non-spatial layer.
    const readme = ogrFeatures(ogrinfo('-al', gpkg.out, 'readme'));
    const notes = Object.fromEntries(readme.map((r) => [r.key, r.value]));
    expect(notes['Model version']).toMatch(/^brackline-model-/);
    expect(notes.Cautions).toContain(CAUTION_TEXT[0].slice(0, 60));
    expect(notes['Coordinate reference system']).toMatch(/EPSG:4326/);

    const kml = await download(agent, `${url}format=kml`, `${name}.kml`);
    expect(kml.res.headers['content-type']).toMatch(/kml/);
    const kmlText = readFileSync(kml.out, 'utf8');
    expect(kmlText).toContain('Model version: brackline-model-');
    expect(kmlText).toContain(CAUTION_TEXT[1]);
    const k = summary(kml.out, layer);
    expect(k).toEqual({ count: expected.count, epsg: 4326 });
    const kmlFeatures = ogrFeatures(ogrinfo('-al', kml.out, layer));
    expect(kmlFeatures.map((f) => f[expected.field]).sort()).toEqual([...expected.values].sort());
    return { gpkg: features, kml: kmlFeatures };
  }

  it('leases with their latest yearly rating', async () => {
    const list = await grower.get('/api/v1/leases').expect(200);
    const ids = (list.body.items as { leaseId: string }[]).map((l) => l.leaseId);
    const { gpkg, kml } = await checkLayer(grower, '/api/v1/leases/export?', 'leases', 'leases', { count: ids.length, field: 'Lease id', values: ids });
    type Rated = { leaseId: string; annualRating: string | null; closureDaysPerYear: number | null; harmfulSalinityChancePerYear: number | null };
    const rated = (list.body.items as Rated[]).find((l) => l.annualRating);
    expect(rated, 'the demo region screens its leases').toBeDefined();
    // The file carries the API's yearly rating and its two figures (GET /leases), rounded to 2 and 4 decimals; read back by GDAL.
    for (const file of [gpkg, kml]) {
      const f = file.find((x) => x['Lease id'] === rated!.leaseId)!;
      expect(f['Yearly rating']).toBe(rated!.annualRating);
      expect(Number(f['Closure days a year'])).toBeCloseTo(rated!.closureDaysPerYear!, 2);
      expect(Number(f['Chance of harmful salinity in a year'])).toBeCloseTo(rated!.harmfulSalinityChancePerYear!, 4);
    }
    expect(Object.keys(gpkg[0])).toEqual(expect.arrayContaining(['Holder', 'Species', 'Area (ha)', 'Closure days a year', 'Chance of harmful salinity in a year']));
  });

  it("a footprint's bands", async () => {
    const rivers = await grower.get('/api/v1/rivers').expect(200);
    const river = rivers.body.items.find((r: { name: string }) => r.name === 'Amberlin River');
    const scenarios = await grower.get(`/api/v1/rivers/${river.id}/scenarios`).expect(200);
    const scenario = (scenarios.body.items ?? scenarios.body)[0];
    const fc = await grower.get(`/api/v1/footprints?riverId=${river.id}&scenarioId=${scenario.id}`).expect(200);
    const bands = (fc.body.features as { properties: { bandId: string } }[]).map((f) => f.properties.bandId);
    const { gpkg } = await checkLayer(grower, `/api/v1/footprints/export?riverId=${river.id}&scenarioId=${scenario.id}&`, 'bands', 'bands', {
      count: bands.length,
      field: 'Band',
      values: bands,
    });
    expect(gpkg[0].River).toBe('Amberlin River');
    const readme = ogrFeatures(ogrinfo('-al', path.join(work, 'bands.gpkg'), 'readme'));
    expect(readme.find((r) => r.key === 'Model version')?.value).toBe(fc.body.properties.modelVersion);
  });

  it('closure zones and stations', async () => {
    const zones = await regulator.get('/api/v1/zones').expect(200);
    const names = (zones.body.items as { name: string }[]).map((z) => z.name);
    expect(names.length).toBeGreaterThan(0);
    await checkLayer(regulator, '/api/v1/zones/export?', 'zones', 'closure_zones', { count: names.length, field: 'Zone', values: names });
    const stations = await regulator.get('/api/v1/stations').expect(200);
    const codes = (stations.body.items as { code: string }[]).map((s) => s.code);
    expect(codes.length).toBeGreaterThan(0);
    await checkLayer(regulator, '/api/v1/stations/export?', 'stations', 'stations', { count: codes.length, field: 'Station', values: codes });
    const csv = await regulator.get('/api/v1/stations/export?format=csv').expect(200);
    expect(csv.text.split('\r\n')[0]).toBe('Station,Name,Samples,First sample,Last sample,Longitude (WGS 84),Latitude (WGS 84)');
  });

  it('GeoJSON and CSV downloads match the schemas the API document declares for them', async () => {
    // The export routes write their files themselves, so the response check of defineRoute does not see them: check here.
    for (const [agent, url] of [
      [regulator, '/api/v1/zones/export?format=geojson'],
      [regulator, '/api/v1/stations/export?format=geojson'],
    ] as const) {
      const res = await agent.get(url).expect(200);
      const parsed = layerExportGeoJsonSchema.safeParse(JSON.parse(res.text));
      expect(parsed.success, `${url}: ${parsed.error?.message}`).toBe(true);
    }
    const leases = await grower.get('/api/v1/leases/export?format=geojson').expect(200);
    const parsed = leaseExportGeoJsonSchema.safeParse(JSON.parse(leases.text));
    expect(parsed.success, parsed.error?.message).toBe(true);
    const csv = await grower.get('/api/v1/leases/export?format=csv').expect(200);
    expect(csv.text.split('\r\n')[0]).toBe(LEASE_EXPORT_CSV_COLUMNS.join(','));
  });

  it('refuses an unknown format and other roles', async () => {
    const bad = await regulator.get('/api/v1/zones/export?format=shp').expect(400);
    expect(bad.body.error.message).toMatch(/format must be csv, geojson, gpkg \(GeoPackage\) or kml/);
    await grower.get('/api/v1/zones/export?format=kml').expect(403);
  });
});
