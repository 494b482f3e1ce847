import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../../helpers/test-app';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await t.close();
});

describe('POST /api/v1/calc/water', () => {
  // UNESCO 1983 (Tech. Pap. Mar. Sci. 44) check values, science.md §8 #3 and #5 (a). The API
  // takes ITS-90 temperature; the check values are on IPTS-68, t68 = 1.00024 t90 (§8 #10, a).
  it.each([
    { pressureDbar: 0, expected: 1023.34306 },
    { pressureDbar: 10000, expected: 1062.53817 },
  ])('EOS-80 density at S=35, t68=25 °C, p=$pressureDbar dbar is $expected kg/m³', async ({ pressureDbar, expected }) => {
    const res = await request(t.app).post('/api/v1/calc/water').send({ salinity: 35, temperature: 25 / 1.00024, pressureDbar }).expect(200);
    expect(Math.abs(res.body.density - expected)).toBeLessThan(1e-5);
    expect(res.body.coriolis).toBeUndefined();
  });
  it('adds the Coriolis parameter when a latitude is given (science.md §8 #14, c: 1.003912e-4 at 43.5° N)', async () => {
    const res = await request(t.app).post('/api/v1/calc/water').send({ salinity: 0, temperature: 10, latitude: 43.5 }).expect(200);
    expect(Math.abs(res.body.coriolis - 1.003912e-4)).toBeLessThan(1e-9);
  });
  it('names the field and its range when a value is out of range', async () => {
    const res = await request(t.app).post('/api/v1/calc/water').send({ salinity: 50, temperature: 10 }).expect(400);
    expect(res.body.error.message).toMatch(/salinity/);
    expect(res.body.error.message).toMatch(/42/);
  });
  it('refuses unknown fields with 400', async () => {
    const res = await request(t.app).post('/api/v1/calc/water').send({ salinity: 30, temperature: 10, depth: 3 }).expect(400);
    expect(res.body.error.message).toMatch(/depth/);
  });
});

describe('POST /api/v1/calc/plume', () => {
  // The worked example of science.md §1.10 / §8 #19–#27 (c, derived there): Q = 900 m³/s at 43.5° N,
  // g′ = 0.191415 (Δρ = 20), L = 1.5 km, h0 = 6 m, slope 2e-3, all the flow alongshore.
  it('reproduces the worked example', async () => {
    const res = await request(t.app)
      .post('/api/v1/calc/plume')
      .send({ latitude: 43.5, discharge: 900, reducedGravity: 0.191415, mouthWidth: 1500, mouthDepth: 6, shelfSlope: 2e-3, alongshoreShare: 1, floodDurationHours: 48 })
      .expect(200);
    const b = res.body;
    expect(b.regime).toBe('surface-advected');
    expect(b.turnsTo).toBe('right');
    expect(Math.abs(b.depth - 0.9716)).toBeLessThan(1e-3); // #19
    expect(Math.abs(b.width - 6075.1)).toBeLessThan(1); // #20
    expect(Math.abs(b.bulgeOffshoreExtent - 45323)).toBeLessThan(1); // #26
    expect(Math.abs(b.bottomAttachmentDepth - 0.9716)).toBeLessThan(1e-3); // #26
    expect(Math.abs(b.noseSpeed - 0.3874) / 0.3874).toBeLessThan(1e-3); // #27
    expect(Math.abs(b.meanSpeed - 0.2287)).toBeLessThan(1e-4); // #23
    expect(b.reach).toBeCloseTo(b.noseSpeed * 48 * 3600, 6);
    expect(Array.isArray(b.warnings)).toBe(true);
  });
  it('turns left in the southern hemisphere with the same magnitudes', async () => {
    const body = { discharge: 900, reducedGravity: 0.191415, mouthWidth: 1500, mouthDepth: 6, alongshoreShare: 1 };
    const north = (await request(t.app).post('/api/v1/calc/plume').send({ ...body, latitude: 43.5 })).body;
    const south = (await request(t.app).post('/api/v1/calc/plume').send({ ...body, latitude: -43.5 })).body;
    expect(south.turnsTo).toBe('left');
    expect(south.width).toBeCloseTo(north.width, 6);
    expect(south.coriolis).toBeCloseTo(-north.coriolis, 12);
  });
  it('flags the equatorial fallback', async () => {
    const res = await request(t.app)
      .post('/api/v1/calc/plume')
      .send({ latitude: 1, discharge: 900, reducedGravity: 0.19, mouthWidth: 1500, mouthDepth: 6 })
      .expect(200);
    expect(res.body.turnsTo).toBe('none');
    expect(res.body.regime).toBe('equatorial-jet');
    expect(res.body.warnings.join(' ')).toMatch(/equator/i);
  });
  it('asks for either the water properties or reducedGravity', async () => {
    const res = await request(t.app).post('/api/v1/calc/plume').send({ latitude: 40, discharge: 100, mouthWidth: 100, mouthDepth: 3 }).expect(400);
    expect(res.body.error.message).toMatch(/reducedGravity/);
  });
  it('is documented in the OpenAPI document with the contract field names', async () => {
    const doc = (await request(t.app).get('/api/v1/openapi.json')).body;
    const op = doc.paths['/api/v1/calc/plume'].post;
    const schema = op.responses['200'].content['application/json'].schema;
    for (const field of ['coriolis', 'reducedGravity', 'regime', 'depth', 'width', 'meanSpeed', 'noseSpeed', 'bulgeOffshoreExtent', 'bottomAttachmentDepth', 'turnsTo', 'warnings']) {
      expect(Object.keys(schema.properties)).toContain(field);
    }
  });
});

describe('POST /api/v1/calc/flood-frequency', () => {
  // Fishkill Creek at Beacon, NY, 1945–1968 (Bulletin 17B Appendix 12 example, as quoted in
  // science.md §7.5 A, a). Station statistics of the log10 peaks: science.md §8 #38 (c, computed).
  const fishkill = [2290, 1470, 2220, 2970, 3020, 1210, 2490, 3170, 3220, 1760, 8800, 8280, 1310, 2500, 1960, 2140, 4340, 3060, 1780, 1380, 980, 1040, 1580, 3630];
  it('fits the Fishkill Creek record', async () => {
    const res = await request(t.app).post('/api/v1/calc/flood-frequency').send({ annualPeaks: fishkill }).expect(200);
    expect(res.body.n).toBe(24);
    expect(res.body.lp3.mean).toBeCloseTo(3.3684, 4);
    expect(res.body.lp3.stdDev).toBeCloseTo(0.2456, 4);
    expect(res.body.lp3.skew).toBeCloseTo(0.73, 3);
    const aeps = res.body.gev.quantiles.map((q: { aep: number }) => q.aep);
    expect(aeps).toEqual([0.5, 0.2, 0.1, 0.04, 0.02, 0.01, 0.005]);
    // Quantiles rise as the probability falls (a property of every fit).
    const lp3 = res.body.lp3.quantiles.map((q: { discharge: number }) => q.discharge);
    expect([...lp3].sort((a, b) => a - b)).toEqual(lp3);
    expect(res.body.warnings).toBeInstanceOf(Array);
  });
  it('with the regional skew of Bulletin 17B Appendix 12 gives the published 1% flood (science.md §8 #38: 11 531 cfs at G=0.7, c)', async () => {
    const res = await request(t.app)
      .post('/api/v1/calc/flood-frequency')
      .send({ annualPeaks: fishkill, aep: [0.01], regionalSkew: 0.6, regionalSkewMse: 0.302 })
      .expect(200);
    expect(res.body.lp3.weightedSkew).toBeCloseTo(0.668, 3);
  });
  it('refuses a zero peak, naming the field', async () => {
    const res = await request(t.app).post('/api/v1/calc/flood-frequency').send({ annualPeaks: [10, 0, 30] });
    expect([400, 422]).toContain(res.status);
    expect(res.body.error.message).toMatch(/annualPeaks/);
  });
});

describe('POST /api/v1/calc/flow-record', () => {
  it('reports row problems with row numbers and returns annual peaks by water year', async () => {
    const csv = ['date,discharge', '2020-09-30,5', '2020-10-01,7', 'bad-date,3', '2020-10-02,-1', '2021-03-01,40', '2021-10-05,12'].join('\n');
    const res = await request(t.app).post('/api/v1/calc/flow-record?units=m3s&waterYearStart=10-01').set('Content-Type', 'text/csv').send(csv).expect(200);
    expect(res.body.rows).toBe(6);
    expect(res.body.problems.map((p: { row: number }) => p.row)).toEqual([4, 5]);
    const byYear = Object.fromEntries(res.body.annualPeaks.map((p: { waterYear: number; discharge: number }) => [p.waterYear, p.discharge]));
    // Water year named for the year it ends in: 2020-10-01 … 2021-09-30 is water year 2021.
    expect(byYear[2020]).toBe(5);
    expect(byYear[2021]).toBe(40);
    expect(byYear[2022]).toBe(12);
  });
  it('converts cubic feet per second (1 ft³ = 0.028316846592 m³ exactly, international foot, a)', async () => {
    const res = await request(t.app).post('/api/v1/calc/flow-record?units=cfs').set('Content-Type', 'text/csv').send('2021-01-01,1000\n').expect(200);
    expect(res.body.annualPeaks[0].discharge).toBeCloseTo(28.316846592, 9);
  });
  it('asks for CSV when the body is JSON', async () => {
    const res = await request(t.app).post('/api/v1/calc/flow-record?units=m3s').send({ csv: 'x' });
    expect([400, 415]).toContain(res.status);
    expect(res.body.error.message).toMatch(/text\/csv/);
  });
  it('names the units parameter when it is missing', async () => {
    const res = await request(t.app).post('/api/v1/calc/flow-record').set('Content-Type', 'text/csv').send('2021-01-01,1\n').expect(400);
    expect(res.body.error.message).toMatch(/units/);
  });
});
