/**
 * River settings over HTTP (issue "Grower's app II"): every field's allowed range, documented
 * defaults marked until a user sets them, a messy gauge record whose row problems reach the user,
 * editable flood durations and the plume numbers of a scenario from the saved settings.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RIVER_DEFAULTS } from '#shared/schemas/river';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let adviser: Agent;
let grower: Agent;

beforeAll(async () => {
  t = await createTestApp();
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
}, 120_000);
afterAll(async () => {
  await t.close();
});

const base = { name: 'Range Creek', mouthLongitude: -38.6, mouthLatitude: 41.1, outflowAzimuthDeg: 270, mouthWidth: 40, mouthDepth: 2 };

// [field, a value just outside below, a value just outside above, the message]; ranges from shared/schemas/river.ts.
const RANGES: [string, unknown, unknown, RegExp][] = [
  ['mouthLongitude', -180.01, 180.01, /mouthLongitude must be between -180 and 180 degrees/],
  ['mouthLatitude', -90.01, 90.01, /latitude must be between -90 and 90 degrees/],
  ['outflowAzimuthDeg', -0.01, 360.01, /outflowAzimuthDeg must be between 0 and 360 degrees/],
  ['mouthWidth', 0, 100_001, /mouthWidth must be greater than 0 and at most 100000 m/],
  ['mouthDepth', 0, 500.01, /mouthDepth must be greater than 0 and at most 500 m/],
  ['shelfSlope', -0.001, 0.51, /shelfSlope must be between 0 and 0.5 m\/m/],
  ['riverSalinity', -0.1, 42.1, /riverSalinity must be between 0 and 42/],
  ['riverTemperature', -2.1, 40.1, /riverTemperature must be between -2 and 40 °C/],
  ['seaSalinity', -0.1, 42.1, /seaSalinity must be between 0 and 42/],
  ['seaTemperature', -2.1, 40.1, /seaTemperature must be between -2 and 40 °C/],
  ['entrainmentCoefficient', 1e-7, 0.0011, /entrainmentCoefficient must be between 0.000001 and 0.001/],
  ['t90DayHours', 0, 10_001, /t90DayHours must be greater than 0 and at most 10000 h/],
  ['t90NightHours', 0, 10_001, /t90NightHours must be greater than 0 and at most 10000 h/],
  ['daylightFraction', -0.01, 1.01, /daylightFraction must be between 0 and 1/],
  ['alongshoreShare', 0.29, 1.01, /alongshoreShare must be between 0.3 and 1/],
  ['nearFieldFreshwaterFraction', 0.04, 1.01, /nearFieldFreshwaterFraction must be between 0.05 and 1/],
];

describe('river settings: every field has its range, and the message says which', () => {
  it.each(RANGES)('%s refuses values outside its range, on create and on change', async (field, below, above, message) => {
    for (const bad of [below, above]) {
      const res = await adviser.post('/api/v1/rivers').send({ ...base, [field]: bad }).expect(400);
      expect(res.body.error.message).toMatch(message);
    }
    const river = await adviser.post('/api/v1/rivers').send({ ...base, name: `Range ${field}` }).expect(201);
    const res = await adviser.patch(`/api/v1/rivers/${river.body.id}`).send({ [field]: above }).expect(400);
    expect(res.body.error.message).toMatch(message);
  });

  it.each([
    ['name', '', /name is required/],
    ['name', 'x'.repeat(121), /name must be at most 120 characters/],
    ['gaugeCode', 'x'.repeat(61), /gaugeCode must be at most 60 characters/],
    ['designDistribution', 'weibull', /designDistribution must be 'gev', 'lp3' or 'gumbel'/],
    ['coastId', 'not-a-uuid', /coastId must be a coast id/],
    ['indicator', { kind: 'constant', concentration: -1 }, /indicator.concentration must be between 0 and 1000000000/],
    ['indicator', { kind: 'power-law', coefficient: 10, exponent: 6 }, /indicator.exponent must be between -5 and 5/],
    ['indicator', { kind: 'lognormal' }, /indicator.kind must be 'constant' or 'power-law'/],
    ['mouthWidth', '40', /mouthWidth must be a number/],
  ])('%s = %j is refused', async (field, value, message) => {
    const res = await adviser.post('/api/v1/rivers').send({ ...base, [field]: value }).expect(400);
    expect(res.body.error.message).toMatch(message);
  });

  it('accepts the edges of every range', async () => {
    const edges = { ...base, name: 'Edge Creek', outflowAzimuthDeg: 360, shelfSlope: 0, riverSalinity: 0, seaSalinity: 42, riverTemperature: -2, seaTemperature: 40, daylightFraction: 1, alongshoreShare: 0.3, nearFieldFreshwaterFraction: 0.05 };
    const res = await adviser.post('/api/v1/rivers').send(edges).expect(201);
    expect(res.body.settings).toMatchObject(edges);
  });

  it('a river created without optional values gets the documented defaults and is marked as using them until a user sets each', async () => {
    const res = await adviser.post('/api/v1/rivers').send({ ...base, name: 'Default Creek' }).expect(201);
    expect(res.body.defaultsUsed.sort()).toEqual(Object.keys(RIVER_DEFAULTS).sort());
    for (const [field, d] of Object.entries(RIVER_DEFAULTS)) expect(res.body.settings[field]).toEqual(d.value);
    const changed = await adviser.patch(`/api/v1/rivers/${res.body.id}`).send({ entrainmentCoefficient: 5e-5, riverTemperature: 8 }).expect(200);
    expect(changed.body.defaultsUsed).not.toContain('entrainmentCoefficient');
    expect(changed.body.defaultsUsed).not.toContain('riverTemperature');
    expect(changed.body.defaultsUsed).toContain('seaSalinity');
    // Renaming does not clear any default flag.
    const renamed = await adviser.patch(`/api/v1/rivers/${res.body.id}`).send({ name: 'Default Creek II' }).expect(200);
    expect(renamed.body.defaultsUsed).toEqual(changed.body.defaultsUsed);
  });

  it('only the creator (or the regulator of its jurisdiction) changes a river', async () => {
    const river = await adviser.post('/api/v1/rivers').send({ ...base, name: 'Owned Creek' }).expect(201);
    const res = await grower.patch(`/api/v1/rivers/${river.body.id}`).send({ seaSalinity: 30 }).expect(403);
    expect(res.body.error.message).toMatch(/creator or a regulator/);
    await request(t.app).patch(`/api/v1/rivers/${river.body.id}`).send({ seaSalinity: 30 }).expect(401);
  });
});

describe('a messy gauge record', () => {
  let riverId: string;
  let messy: string;

  beforeAll(async () => {
    riverId = (await adviser.post('/api/v1/rivers').send({ ...base, name: 'Messy Record Creek' }).expect(201)).body.id;
    const lines = readFileSync(path.resolve(import.meta.dirname, '../../../demo-data/flows/tolley-brook-daily.csv'), 'utf8').split('\n');
    // Row numbers are 1-based lines of the file: the header is line 1.
    lines.splice(200, 0, '1991-04-19,n/a', '1991-04-20;12', '31/31/1991,4', '1991-04-21,-7');
    messy = lines.join('\n');
  });

  it('answers 422 with every problem row (row, value, reason) and stores nothing', async () => {
    const res = await adviser.post(`/api/v1/rivers/${riverId}/flow-records?units=m3s`).set('Content-Type', 'text/csv').send(messy).expect(422);
    expect(res.body.error.message).toMatch(/4 of \d+ rows have problems .*acceptProblems=true/);
    const problems = res.body.error.details.problems as { row: number; value: string; reason: string }[];
    expect(problems.map((p) => p.row)).toEqual([201, 202, 203, 204]);
    for (const p of problems) {
      expect(typeof p.value).toBe('string');
      expect(p.reason.length).toBeGreaterThan(10);
    }
    expect(problems[0].value).toBe('n/a');
    expect(res.body.error.details.problemCount).toBe(4);
    await adviser.get(`/api/v1/rivers/${riverId}/flow-records`).expect(404);
  });

  it('continues without the problem rows when asked, and keeps them with the record', async () => {
    const res = await adviser
      .post(`/api/v1/rivers/${riverId}/flow-records?units=m3s&acceptProblems=true`)
      .set('Content-Type', 'text/csv')
      .set('X-File-Name', 'messy.csv')
      .send(messy)
      .expect(201);
    expect(res.body.problems).toHaveLength(4);
    expect(res.body.readings).toBe(res.body.rows - 4);
    const record = await adviser.get(`/api/v1/rivers/${riverId}/flow-records`).expect(200);
    expect(record.body.file_name).toBe('messy.csv');
    expect(record.body.problems).toHaveLength(4);
    expect(record.body.fit.gev.quantiles.length).toBeGreaterThan(0);
  });

  it('refuses a wrong content type and a bad query with clear messages', async () => {
    // A JSON body is parsed before the route sees it: refused by the body check with the same advice.
    const wrongType = await adviser.post(`/api/v1/rivers/${riverId}/flow-records?units=m3s`).set('Content-Type', 'application/json').send('{}').expect(400);
    expect(wrongType.body.error.message).toMatch(/Content-Type: text\/csv/);
    const badUnits = await adviser.post(`/api/v1/rivers/${riverId}/flow-records?units=gallons`).set('Content-Type', 'text/csv').send(messy).expect(400);
    expect(badUnits.body.error.message).toMatch(/units must be 'm3s'/);
  });

  it('another user cannot upload to this river', async () => {
    const res = await grower.post(`/api/v1/rivers/${riverId}/flow-records?units=m3s`).set('Content-Type', 'text/csv').send(messy);
    expect([403, 404]).toContain(res.status);
  });

  it('flood durations are editable per scenario, within their range', async () => {
    const list = await adviser.get(`/api/v1/rivers/${riverId}/scenarios`).expect(200);
    const fitted = list.body.items.find((s: { kind: string }) => s.kind === 'aep');
    const edited = await adviser.patch(`/api/v1/scenarios/${fitted.id}`).send({ durationHours: 36 }).expect(200);
    expect(edited.body.durationHours).toBe(36);
    const bad = await adviser.patch(`/api/v1/scenarios/${fitted.id}`).send({ durationHours: 0 }).expect(400);
    expect(bad.body.error.message).toMatch(/durationHours must be greater than 0/);
    await grower.patch(`/api/v1/scenarios/${fitted.id}`).send({ durationHours: 12 }).expect(403);
  });

  it("gives a scenario's plume numbers, warnings, assumptions and profiles from the saved settings", async () => {
    const list = await adviser.get(`/api/v1/rivers/${riverId}/scenarios`).expect(200);
    const s = list.body.items.find((x: { kind: string; aep: number }) => x.kind === 'aep' && x.aep === 0.01);
    const res = await adviser.get(`/api/v1/scenarios/${s.id}/plume`).expect(200);
    const p = res.body.plume;
    for (const key of ['reducedGravity', 'coriolis', 'bulgeOffshoreExtent', 'depth', 'width', 'meanSpeed', 'noseSpeed', 'reach']) expect(Number.isFinite(p[key])).toBe(true);
    expect(['surface-advected', 'intermediate', 'bottom-advected']).toContain(p.regime);
    // f = 2Ω sin(41.1°) = 9.589e-5 s⁻¹ (Ω = 7.292115e-5 s⁻¹; science.md §1.1, published).
    expect(p.coriolis).toBeCloseTo(2 * 7.292115e-5 * Math.sin((41.1 * Math.PI) / 180), 9);
    // reach = nose speed × duration (science.md §0 item 6, derived).
    expect(p.reach).toBeCloseTo(p.noseSpeed * s.durationHours * 3600, 3);
    expect(p.assumptions.length).toBeGreaterThan(0);
    expect(res.body.profiles.crossShore[0].thickness).toBeCloseTo(p.depth, 6);
    expect(res.body.profiles.crossShore.at(-1).thickness).toBe(0);
    expect(res.body.profiles.alongshore[0].alongKm).toBe(0);
    // The coast at the mouth holds undiluted river water by default (near-field fraction 1).
    expect(res.body.profiles.alongshore[0].salinity).toBeCloseTo(0.1, 6);
    const other = await grower.get(`/api/v1/scenarios/${s.id}/plume`);
    expect(other.status).toBe(200); // same jurisdiction: growers read the region's rivers
    await request(t.app).get(`/api/v1/scenarios/${s.id}/plume`).expect(401);
  });
});
