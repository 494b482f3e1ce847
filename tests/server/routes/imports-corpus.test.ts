/**
 * The bad-input corpus (tests/fixtures/uploads, made by make-corpus.ts) through the real HTTP
 * API: every bad file gets its 4xx and a message naming the problem, and the database is
 * unchanged afterwards; files that need a coordinate system, carry warnings or need repair
 * are accepted as the manifests say.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

const DIR = path.resolve(import.meta.dirname, '../../fixtures/uploads');
interface Entry {
  file: string;
  kind: 'lease' | 'coast' | 'zone';
  limits?: Record<string, number>;
  options?: { layer?: string; tracksAsPolygons?: boolean };
  expectStatus: number;
  expectCode: string | null;
  expectMessage: string | null;
  expectCrsFound?: boolean;
  expectWarning?: string;
  expectFeatureCount?: number;
  expectedBbox?: unknown;
}
const manifest = (folder: string): Entry[] => JSON.parse(readFileSync(path.join(DIR, folder, 'manifest.json'), 'utf8'));

const apps = new Map<string, TestApp>();
async function appFor(limits: Record<string, number> | undefined) {
  const key = JSON.stringify(limits ?? {});
  let t = apps.get(key);
  if (!t) {
    t = await createTestApp({ uploadLimits: limits ?? {} });
    apps.set(key, t);
  }
  return t;
}
async function counts(t: TestApp) {
  const r = await t.db.pool.query(
    'select (select count(*) from imports)::int as imports, (select count(*) from import_features)::int as features, (select count(*) from leases)::int as leases, (select count(*) from coasts)::int as coasts, (select count(*) from closure_zones)::int as zones',
  );
  return r.rows[0];
}
async function post(entry: Entry, folder: string) {
  const t = await appFor(entry.limits);
  const role = entry.kind === 'zone' ? 'regulator' : 'grower';
  const { agent } = await signIn(t.app, `${role}@brackline.test`);
  const before = await counts(t);
  let request = agent.post('/api/v1/imports').field('kind', entry.kind);
  if (entry.options?.layer) request = request.field('layer', entry.options.layer);
  if (entry.options?.tracksAsPolygons) request = request.field('tracksAsPolygons', 'true');
  const res = await request.attach('file', readFileSync(path.join(DIR, folder, entry.file)), entry.file);
  return { t, agent, before, res };
}

beforeAll(async () => {
  await appFor(undefined);
});
afterAll(async () => {
  for (const t of apps.values()) await t.close();
});

describe('bad uploads: a 4xx naming the problem, and nothing written', () => {
  const bad = manifest('bad').filter((e) => !e.expectedBbox);
  it('the corpus holds at least 25 bad files', () => {
    expect(bad.length).toBeGreaterThanOrEqual(25);
  });
  it.each(bad.map((e) => [e.file, e]))('%s', async (_name, entry) => {
    const { t, before, res } = await post(entry as Entry, 'bad');
    const e = entry as Entry;
    expect(res.status, res.body?.error?.message).toBe(e.expectStatus);
    expect(res.body.error.code).toBe(e.expectCode);
    expect(res.body.error.message).toMatch(new RegExp(e.expectMessage ?? ''));
    expect(await counts(t)).toEqual(before);
  });
});

describe('files without a usable coordinate system stop at the CRS step', () => {
  it.each(manifest('needs-crs').map((e) => [e.file, e]))('%s', async (_name, entry) => {
    const e = entry as Entry;
    const { agent, res } = await post(e, 'needs-crs');
    expect(res.status).toBe(201);
    expect(res.body.crs.found).toBe(false);
    expect(res.body.features).toEqual([]);
    if (e.expectFeatureCount) expect(res.body.featureCount).toBe(e.expectFeatureCount);
    // Choosing the code continues the upload (the corpus writes these files in UTM zone 30 N).
    const chosen = await agent.post(`/api/v1/imports/${res.body.id}/crs`).send({ epsg: 32630 });
    expect(chosen.status, chosen.body?.error?.message).toBe(200);
    expect(chosen.body.crs).toMatchObject({ found: true, epsg: 32630 });
    expect(chosen.body.features.length).toBe(res.body.featureCount);
  });

  it('refuses an EPSG code that does not exist', async () => {
    const e = manifest('needs-crs')[0];
    const { agent, res } = await post(e, 'needs-crs');
    const bad = await agent.post(`/api/v1/imports/${res.body.id}/crs`).send({ epsg: 999_999 }).expect(400);
    expect(bad.body.error.message).toMatch(/EPSG:999999/);
  });

  it('finds coordinate systems by name or code', async () => {
    const t = await appFor(undefined);
    const { agent } = await signIn(t.app, 'grower@brackline.test');
    const byName = await agent.get('/api/v1/crs?q=UTM zone 30N').expect(200);
    expect(byName.body.items.map((i: { code: number }) => i.code)).toContain(32630);
    const byCode = await agent.get('/api/v1/crs?q=2193').expect(200);
    expect(byCode.body.items[0].code).toBe(2193);
  });
});

describe('files read with warnings or repairs', () => {
  it.each([...manifest('warnings').filter((e) => !e.expectedBbox), ...manifest('repairable'), ...manifest('good')].map((e) => [e.file, e]))('%s', async (_name, entry) => {
    const e = entry as Entry;
    const folder = ['warnings', 'repairable', 'good'].find((f) => manifest(f).some((m) => m.file === e.file))!;
    const { res } = await post(e, folder);
    expect(res.status, res.body?.error?.message).toBe(201);
    if (e.expectFeatureCount) expect(res.body.featureCount).toBe(e.expectFeatureCount);
    if (e.expectWarning) expect(res.body.warnings.join(' ')).toMatch(new RegExp(e.expectWarning));
    if (folder === 'repairable') expect(res.body.features.some((f: { repaired: boolean }) => f.repaired)).toBe(true);
  });
});
