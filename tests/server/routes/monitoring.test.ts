/**
 * Monitoring stations and samples, the comparison of a river's plume with them, and calibrations
 * (fit, apply, roll back) over HTTP on the real test database, with the demo region loaded.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { zip as shpZip } from '@mapbox/shp-write';
import proj4 from 'proj4';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type CalibrationRiverSettings, effectiveT90Hours, predictSample } from '../../../shared/calibration/river-calibration';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

const DEMO = path.resolve(import.meta.dirname, '../../../demo-data');
const DEMO_SAMPLES = readFileSync(path.join(DEMO, 'monitoring/samples.csv'), 'utf8').trim().split('\n').slice(1);
const DEMO_CENSORED = DEMO_SAMPLES.filter((row) => /,[<>]\d/.test(row)).length;
const DEMO_STATIONS = JSON.parse(readFileSync(path.join(DEMO, 'monitoring/stations.geojson'), 'utf8')).features.length as number;
let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let regulator: Agent;
let grower: Agent;
let grower2: Agent;
let adviser: Agent;
let admin: Agent;
let amberlinId: string;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  admin = (await signIn(t.app, 'admin@brackline.test')).agent;
  const rivers = await regulator.get('/api/v1/rivers').expect(200);
  amberlinId = rivers.body.items.find((r: { name: string }) => r.name === 'Amberlin River').id;
}, 180_000);
afterAll(async () => {
  await t.close();
});

const upload = (agent: Agent, url: string, content: string | Buffer, name: string) =>
  agent.post(url).attach('file', Buffer.from(content), name);

describe('stations and samples', () => {
  it('the authority re-uploads the demo stations and samples: same codes and times are updated, detection limits kept censored', async () => {
    const stations = await upload(
      regulator,
      '/api/v1/stations',
      readFileSync(path.join(DEMO, 'monitoring/stations.geojson')),
      'stations.geojson',
    ).expect(201);
    expect(stations.body).toMatchObject({ created: 0, updated: DEMO_STATIONS, format: 'geojson' });
    expect(stations.body.items.map((s: { code: string }) => s.code)).toContain('FB-S08');
    const samples = await upload(
      regulator,
      '/api/v1/samples',
      readFileSync(path.join(DEMO, 'monitoring/samples.csv')),
      'samples.csv',
    ).expect(201);
    // The rows of demo-data/monitoring/samples.csv, and those written as <2 or >1600 (demo-data/README.md).
    expect(samples.body).toMatchObject({ created: 0, updated: DEMO_SAMPLES.length, censored: DEMO_CENSORED, stations: DEMO_STATIONS });
    const listed = await regulator.get('/api/v1/samples?limit=5000').expect(200);
    expect(listed.body.total).toBe(DEMO_SAMPLES.length);
    const limit = listed.body.items.find((s: { indicatorCensored: string | null }) => s.indicatorCensored === 'above');
    expect(limit).toMatchObject({ indicator: 1600, indicatorCensored: 'above' });
    expect(listed.body.items.find((s: { method: string }) => s.method === 'MF').indicatorUnit).toBe('CFU/100 mL');
    // Everyone in the authority's jurisdiction sees its stations.
    const seen = await grower.get('/api/v1/stations').expect(200);
    expect(seen.body.items.filter((s: { mine: boolean }) => !s.mine)).toHaveLength(DEMO_STATIONS);
  });

  it('stations as CSV: lon/lat, or x/y with an EPSG code; each bad row is reported and nothing is saved', async () => {
    const bad = [
      'station_id,name,lon,lat',
      'G-1,Gully,-38.61,41.23',
      ',No code,-38.6,41.2',
      'G-3,Far,abc,41.2',
      'G-1,Again,-38.6,41.2',
      'G-5,Off,-238,41.2',
    ].join('\n');
    const refused = await upload(grower, '/api/v1/stations', bad, 'stations.csv').expect(422);
    expect(refused.body.error.message).toMatch(/4 of 5 rows have problems; nothing was saved/);
    expect(refused.body.error.details.problems.map((p: { row: number }) => p.row)).toEqual([3, 4, 5, 6]);
    expect((await grower.get('/api/v1/stations')).body.items.filter((s: { mine: boolean }) => s.mine)).toHaveLength(0);

    // UTM zone 24N (EPSG:32624) coordinates of two points in the demo bay.
    const projected = 'code,x,y\nG-10,542000,4562000\nG-11,541000,4563000';
    const needsCrs = await upload(grower, '/api/v1/stations', projected, 'utm.csv').expect(422);
    expect(needsCrs.body.error.message).toMatch(/choose its coordinate system's EPSG code/);
    const ok = await grower.post('/api/v1/stations').field('epsg', '32624').attach('file', Buffer.from(projected), 'utm.csv').expect(201);
    expect(ok.body.created).toBe(2);
    const g10 = ok.body.items.find((s: { code: string }) => s.code === 'G-10');
    // UTM 24N has its central meridian at 39° W (500 000 E); 42 km east of it at 41.2° N, where a degree of longitude
    // is 111.32 km × cos 41.2° ≈ 83.7 km, is about 38.50° W (c, derived; the WGS 84 ellipsoid's 111.32 km per degree at the equator).
    expect(g10.longitude).toBeCloseTo(-38.5, 1);
    expect(g10.latitude).toBeCloseTo(41.21, 1);
  });

  it('stations as a zipped shapefile in a projected CRS are reprojected with its .prj; non-points are refused by feature', async () => {
    const utm24 = JSON.parse(readFileSync(path.resolve(import.meta.dirname, '../../../node_modules/epsg-index/s/32624.json'), 'utf8')) as {
      wkt: string;
      proj4: string;
    };
    const toUtm = proj4('EPSG:4326', utm24.proj4);
    const points = [
      { code: 'Z-1', lonlat: [-38.55, 41.2] },
      { code: 'Z-2', lonlat: [-38.6, 41.25] },
    ];
    const collection = {
      type: 'FeatureCollection',
      features: points.map((p) => ({
        type: 'Feature',
        properties: { STATION_ID: p.code, NAME: `Buoy ${p.code}` },
        geometry: { type: 'Point', coordinates: toUtm.forward(p.lonlat) },
      })),
    };
    const bytes = (await shpZip(collection as never, { outputType: 'nodebuffer', prj: utm24.wkt } as never)) as unknown as Buffer;
    const res = await upload(grower2, '/api/v1/stations', bytes, 'buoys.zip').expect(201);
    expect(res.body).toMatchObject({ created: 2, format: 'shapefile' });
    const z1 = res.body.items.find((s: { code: string }) => s.code === 'Z-1');
    // proj4 forward then inverse through the .prj's WKT returns the point to well under a metre (c).
    expect(z1.longitude).toBeCloseTo(-38.55, 6);
    expect(z1.latitude).toBeCloseTo(41.2, 6);
    expect(z1.name).toBe('Buoy Z-1');

    const polygon = JSON.stringify({
      type: 'FeatureCollection',
      features: [
        { type: 'Feature', properties: { code: 'P-1' }, geometry: { type: 'Point', coordinates: [-38.5, 41.2] } },
        {
          type: 'Feature',
          properties: { code: 'P-2' },
          geometry: {
            type: 'Polygon',
            coordinates: [
              [
                [-38.5, 41.2],
                [-38.4, 41.2],
                [-38.4, 41.3],
                [-38.5, 41.2],
              ],
            ],
          },
        },
      ],
    });
    const refused = await upload(grower2, '/api/v1/stations', polygon, 'mixed.geojson').expect(422);
    expect(refused.body.error.details.problems).toEqual([{ row: 2, message: 'Feature 2 is a Polygon; stations must be points.' }]);
  });

  it('a samples CSV with bad rows reports each with its row number and saves nothing', async () => {
    const csv = [
      'station_id,sampled_at,salinity,e_coli_per_100ml,method,temperature_c',
      'G-10,2024-03-01T10:00:00Z,31.2,<2,MPN,9',
      'G-10,2024-13-01T10:00:00Z,31.2,40,MPN,9',
      'G-10,2024-03-02T10:00:00Z,52,40,MPN,9',
      'G-10,2024-03-03T10:00:00Z,30,lots,MF,9',
      'NOPE,2024-03-04T10:00:00Z,30,40,MF,9',
      'G-10,2024-03-05T10:00:00Z,30,40,PCR,9',
      'G-10,2024-03-06T10:00:00Z,,,MPN,9',
      'G-11,2024-03-07T10:00:00Z,29,>1600,MF,',
    ].join('\n');
    const refused = await upload(grower, '/api/v1/samples', csv, 'samples.csv').expect(422);
    expect(refused.body.error.message).toMatch(/6 of 8 rows have problems; nothing was saved/);
    const problems = refused.body.error.details.problems as { row: number; column?: string; message: string }[];
    expect(problems.map((p) => p.row)).toEqual([3, 4, 5, 6, 7, 8]);
    expect(problems[0].message).toMatch(/not a date or date-time/);
    expect(problems[1].message).toMatch(/outside 0–45 psu/);
    expect(problems[2].message).toMatch(/detection limit such as <2 or >1600/);
    expect(problems[3].message).toMatch(/not among your stations/);
    expect(problems[4].message).toMatch(/MPN .* or MF/);
    expect(problems[5].message).toMatch(/neither a salinity nor an indicator/);
    expect(
      (await grower.get('/api/v1/samples')).body.items.filter((s: { stationCode: string }) => s.stationCode.startsWith('G-')),
    ).toHaveLength(0);

    const good = [csv.split('\n')[0], csv.split('\n')[1], csv.split('\n')[8]].join('\n');
    const saved = await upload(grower, '/api/v1/samples', good, 'samples.csv').expect(201);
    expect(saved.body).toMatchObject({ created: 2, censored: 2 });
  });

  it('only a station’s uploader adds samples to it; admins upload nothing', async () => {
    const csv = 'station_id,sampled_at,salinity\nFB-S01,2024-03-01T10:00:00Z,30';
    const refused = await upload(adviser, '/api/v1/samples', csv, 'samples.csv').expect(422);
    expect(refused.body.error.details.problems[0].message).toMatch(/FB-S01 is not among your stations/);
    await upload(admin, '/api/v1/samples', csv, 'samples.csv').expect(403);
    await upload(admin, '/api/v1/stations', csv, 'stations.csv').expect(403);
    await request(t.app).post('/api/v1/samples').attach('file', Buffer.from(csv), 'samples.csv').expect(401);
    const notMultipart = await grower.post('/api/v1/samples').send({ file: csv }).expect(415);
    expect(notMultipart.body.error.message).toMatch(/multipart\/form-data/);
  });
});

describe('comparison with the demo samples', () => {
  it('places each sample, compares observed and predicted, and lists samples outside every plume apart', async () => {
    const res = await grower.get(`/api/v1/rivers/${amberlinId}/comparison?lagDays=2`).expect(200);
    const c = res.body;
    expect(c.points.length).toBeGreaterThan(100);
    expect(c.points.length + c.outside.length + c.otherRivers).toBeGreaterThanOrEqual(DEMO_SAMPLES.length);
    // FB-S07 … FB-S09 lie 18–28 km up-coast of the Amberlin mouth, near Tolley Brook (demo-data/README.md). Placed at
    // their negative alongshore position, beyond the Amberlin's bulge, they get none of its water (science.md §1.11),
    // so they answer to Tolley Brook; placed "at the mouth" they would have been claimed by the Amberlin.
    expect(c.points.some((p: { stationCode: string }) => ['FB-S07', 'FB-S08', 'FB-S09'].includes(p.stationCode))).toBe(false);
    const p = c.points[0];
    expect(p.flow).toBeGreaterThan(0);
    expect(p.predictedSalinity).toBeGreaterThan(0);
    expect(c.stats.salinity.n).toBeGreaterThan(100);
    expect(c.stats.indicator.censored).toBeGreaterThan(0);
    expect(c.cautions[0]).toMatch(/^Rests on \d+ samples over 6 years/);
    // October 2020 to September 2025 (demo-data/README.md): six calendar years.
    expect(c.years).toBe(6);
    const bad = await grower.get(`/api/v1/rivers/${amberlinId}/comparison?lagDays=20`).expect(400);
    expect(bad.body.error.message).toMatch(/lagDays must be 0 to 10 days/);
  });

  it('a user of another jurisdiction cannot see the river', async () => {
    await request(t.app).post('/api/v1/account/sign-up').send({ name: 'Far Away', email: 'far@brackline.test', password: 'far-away-pw-1' });
    const far = (await signIn(t.app, 'far@brackline.test', 'far-away-pw-1')).agent;
    await far.get(`/api/v1/rivers/${amberlinId}/comparison`).expect(404);
    await far.post(`/api/v1/rivers/${amberlinId}/calibrations`).send({}).expect(404);
    await far.get(`/api/v1/rivers/${amberlinId}/calibrations`).expect(404);
  });
});

describe('calibration of a synthetic river with known parameters', () => {
  // A river owned by a user of no jurisdiction, so no other river competes for its samples. Its settings
  // are the truth: E = 4e-5 and T90 6 h by day, 30 h by night (effective T90 = 1/(0.5/6 + 0.5/30) = 10 h, c derived).
  const TRUTH = { entrainmentCoefficient: 4e-5, t90Hours: 10 };
  const settingsBody = {
    name: 'Synthetic Creek',
    // On the demo shore 20 km south of Tolley Brook, where the coast runs straight for the whole plume.
    mouthLongitude: -38.5943324,
    mouthLatitude: 40.7589134,
    outflowAzimuthDeg: 265,
    mouthWidth: 60,
    mouthDepth: 2,
    shelfSlope: 0.006,
    riverSalinity: 0.15,
    riverTemperature: 9,
    seaSalinity: 33.5,
    seaTemperature: 12,
    entrainmentCoefficient: TRUTH.entrainmentCoefficient,
    t90DayHours: 6,
    t90NightHours: 30,
    daylightFraction: 0.5,
    indicator: { kind: 'power-law', coefficient: 100, exponent: 1.2 },
    alongshoreShare: 0.6,
    nearFieldFreshwaterFraction: 0.6,
  };

  it('recovers the entrainment coefficient and T90 within 5 % from noisy, partly censored samples, and the skill improves', async () => {
    await request(t.app)
      .post('/api/v1/account/sign-up')
      .send({ name: 'Lone Grower', email: 'lone@brackline.test', password: 'lone-grower-pw-1' });
    const lone = (await signIn(t.app, 'lone@brackline.test', 'lone-grower-pw-1')).agent;
    const me = await t.db.pool.query(`SELECT id FROM users WHERE email = 'lone@brackline.test'`);
    // The demo shoreline, as this user's own coast.
    await t.db.pool.query(
      `INSERT INTO coasts (name, form, owner_id, shared, geom) SELECT 'Lone shoreline', form, $1, false, geom FROM coasts WHERE name = 'Fennick Coast shoreline (demo)'`,
      [me.rows[0].id],
    );
    const river = await lone.post('/api/v1/rivers').send(settingsBody).expect(201);
    const riverId = river.body.id as string;
    // The demo Amberlin's record: floods of hundreds of m³/s give a plume wide enough for every station below.
    await lone
      .post(`/api/v1/rivers/${riverId}/flow-records?units=m3s`)
      .set('Content-Type', 'text/csv')
      .send(readFileSync(path.join(DEMO, 'flows/amberlin-river-daily.csv'), 'utf8'))
      .expect(201);

    // Stations along the plume's path, 300 m to 2 km seaward (west) of it.
    const pts = await t.db.pool.query(
      `SELECT f AS fraction, o AS offset_deg, ST_X(ST_LineInterpolatePoint(path, f)) - o AS lon, ST_Y(ST_LineInterpolatePoint(path, f)) AS lat
         FROM (SELECT path FROM footprints WHERE river_id = $1 AND path IS NOT NULL ORDER BY discharge DESC LIMIT 1) fp,
              unnest(ARRAY[0.02, 0.06, 0.12, 0.2, 0.3, 0.45, 0.6, 0.8]) f, unnest(ARRAY[0.004, 0.012, 0.024]) o`,
      [riverId],
    );
    const stationCsv = ['code,lon,lat', ...pts.rows.map((p, i) => `SY-${i + 1},${p.lon},${p.lat}`)].join('\n');
    await upload(lone, '/api/v1/stations', stationCsv, 'stations.csv').expect(201);

    // Seeded dates (2005–2024) per station; placeholders first, to learn each sample's flow and place.
    const rng = xoroshiro128plus(20261202);
    const uniform = () => uniformFloat64(rng);
    const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
    const rows: { code: string; at: string }[] = [];
    for (let i = 0; i < pts.rows.length; i++) {
      for (let k = 0; k < 7; k++) {
        const day = Date.UTC(2005, 0, 1) + Math.floor(uniform() * 7300) * 86_400_000 + 36_000_000;
        rows.push({ code: `SY-${i + 1}`, at: new Date(day).toISOString() });
      }
    }
    const header = 'station_id,sampled_at,salinity,e_coli_per_100ml,method';
    await upload(lone, '/api/v1/samples', [header, ...rows.map((r) => `${r.code},${r.at},30,10,MPN`)].join('\n'), 'placeholder.csv').expect(
      201,
    );
    const placed = await lone.get(`/api/v1/rivers/${riverId}/comparison?lagDays=0`).expect(200);
    expect(placed.body.points.length).toBeGreaterThan(100);

    // The truth at each placed sample (the model itself, shared/calibration/river-calibration), plus noise:
    // salinity ± 0.3 psu, indicator × 10^N(0, 0.15); counts under 2 or over 1600 written as detection limits.
    const truthSettings = (await lone.get(`/api/v1/rivers/${riverId}`)).body.settings as CalibrationRiverSettings;
    expect(effectiveT90Hours(truthSettings)).toBeCloseTo(TRUTH.t90Hours, 10);
    let censored = 0;
    const lines = placed.body.points.map((p: { stationCode: string; sampledAt: string; flow: number; along: number; offshore: number }) => {
      const truth = predictSample(truthSettings, p);
      const salinity = Math.min(45, Math.max(0, truth.salinity + 0.3 * normal()));
      const count = 10 ** (Math.log10(Math.max(truth.indicator, 1e-3)) + 0.15 * normal());
      const cell = count < 2 ? '<2' : count > 1600 ? '>1600' : count.toPrecision(3);
      if (cell.startsWith('<') || cell.startsWith('>')) censored += 1;
      return `${p.stationCode},${p.sampledAt},${salinity.toFixed(2)},${cell},MPN`;
    });
    expect(censored).toBeGreaterThan(5);
    const real = await upload(lone, '/api/v1/samples', [header, ...lines].join('\n'), 'synthetic.csv').expect(201);
    expect(real.body.updated).toBe(lines.length);

    // Start from poor values: E four times too large, T90 five times too long.
    await lone.patch(`/api/v1/rivers/${riverId}`).send({ entrainmentCoefficient: 1.6e-4, t90DayHours: 30, t90NightHours: 150 }).expect(200);
    const fit = await lone.post(`/api/v1/rivers/${riverId}/calibrations`).send({ lagDays: 0 }).expect(201);
    const c = fit.body;
    expect(c.start.entrainmentCoefficient).toBe(1.6e-4);
    expect(Math.abs(c.fitted.entrainmentCoefficient / TRUTH.entrainmentCoefficient - 1)).toBeLessThan(0.05);
    expect(Math.abs(c.fitted.t90Hours / TRUTH.t90Hours - 1)).toBeLessThan(0.05);
    // Nash–Sutcliffe skill, (a) Nash & Sutcliffe 1970: better after the fit, for both variables.
    expect(c.after.salinity.skill).toBeGreaterThan(c.before.salinity.skill);
    expect(c.after.indicator.skill).toBeGreaterThan(c.before.indicator.skill);
    expect(c.after.salinity.skill).toBeGreaterThan(0.8);
    expect(c.after.indicator.censored).toBe(censored);
    // Applying scales both T90s by the same ratio (their ratio stays the user's, to the patch's four significant figures).
    expect(c.settingsPatch.t90NightHours / c.settingsPatch.t90DayHours).toBeCloseTo(5, 2);
    expect(c.cautions.join(' ')).toMatch(/lie beyond it: there the fitted values are extrapolated/);
    expect(c.status).toBe('fitted');
    expect(c.canApply).toBe(true);
  }, 240_000);
});

describe('apply and roll back on the demo region', () => {
  const ratingsOf = async (email: string) => {
    const res = await t.db.pool.query(
      `SELECT s.lease_id || ':' || s.scenario_id AS k, s.rating, s.score FROM screenings s JOIN leases l ON l.id = s.lease_id JOIN users u ON u.id = l.owner_id
        JOIN rivers r ON r.id = s.river_id WHERE u.email = $1 AND r.name = 'Amberlin River' ORDER BY 1`,
      [email],
    );
    return res.rows as { k: string; rating: string; score: number }[];
  };
  const settingsOf = async () => (await t.db.pool.query(`SELECT settings FROM rivers WHERE name = 'Amberlin River'`)).rows[0].settings;

  it("a grower fits; only the river's editors apply; the grower's ratings change with an audit entry; rollback restores them", async () => {
    const beforeSettings = await settingsOf();
    const beforeRatings = await ratingsOf('grower@brackline.test');
    expect(beforeRatings.length).toBeGreaterThan(0);

    const fit = await grower.post(`/api/v1/rivers/${amberlinId}/calibrations`).send({ lagDays: 2, fitNearFieldFraction: true }).expect(201);
    const id = fit.body.id as string;
    expect(fit.body.canApply).toBe(false);
    expect(fit.body.fittedNames).toEqual(['entrainmentCoefficient', 't90Hours', 'nearFieldFreshwaterFraction']);
    expect(fit.body.after.salinity.rmse).toBeLessThan(fit.body.before.salinity.rmse);

    // Denials: the grower did not create the river; another grower cannot see this fit; an adviser neither.
    const denied = await grower.post(`/api/v1/calibrations/${id}/apply`).expect(403);
    expect(denied.body.error.message).toMatch(/creator, a regulator of its jurisdiction or an admin/);
    await grower2.post(`/api/v1/calibrations/${id}/apply`).expect(404);
    await adviser.post(`/api/v1/calibrations/${id}/rollback`).expect(404);
    expect((await grower2.get(`/api/v1/rivers/${amberlinId}/calibrations`).expect(200)).body.items).toEqual([]);
    await request(t.app).post(`/api/v1/calibrations/${id}/apply`).expect(401);
    expect(await settingsOf()).toEqual(beforeSettings);

    // The regulator sees the grower's fit and applies it.
    const listed = await regulator.get(`/api/v1/rivers/${amberlinId}/calibrations`).expect(200);
    expect(listed.body.items.map((c: { id: string }) => c.id)).toContain(id);
    await regulator.post(`/api/v1/calibrations/${id}/rollback`).expect(409);
    const applied = await regulator.post(`/api/v1/calibrations/${id}/apply`).expect(200);
    expect(applied.body.status).toBe('applied');
    const after = await settingsOf();
    expect(after.entrainmentCoefficient).toBe(fit.body.settingsPatch.entrainmentCoefficient);
    expect(after.nearFieldFreshwaterFraction).toBe(fit.body.settingsPatch.nearFieldFreshwaterFraction);
    expect(applied.body.previous).toMatchObject({ entrainmentCoefficient: beforeSettings.entrainmentCoefficient, nearFieldFreshwaterFraction: 0.5 });
    const afterRatings = await ratingsOf('grower@brackline.test');
    expect(afterRatings).not.toEqual(beforeRatings);
    const audit = await t.db.pool.query(
      `SELECT action, before, after FROM audit_entries WHERE action LIKE 'calibration.%' AND subject_id = $1 ORDER BY at`,
      [amberlinId],
    );
    expect(audit.rows).toHaveLength(1);
    expect(audit.rows[0].before.entrainmentCoefficient).toBe(beforeSettings.entrainmentCoefficient);
    expect(audit.rows[0].after.entrainmentCoefficient).toBe(fit.body.settingsPatch.entrainmentCoefficient);
    await regulator.post(`/api/v1/calibrations/${id}/apply`).expect(409);

    // Rollback: a grower may not; the regulator restores the values and the ratings.
    await grower.post(`/api/v1/calibrations/${id}/rollback`).expect(403);
    const rolled = await regulator.post(`/api/v1/calibrations/${id}/rollback`).expect(200);
    expect(rolled.body.status).toBe('rolled-back');
    expect(await settingsOf()).toEqual(beforeSettings);
    expect(await ratingsOf('grower@brackline.test')).toEqual(beforeRatings);
    const audit2 = await t.db.pool.query(
      `SELECT action, after FROM audit_entries WHERE action = 'calibration.rollback' AND subject_id = $1`,
      [amberlinId],
    );
    expect(audit2.rows[0].after.entrainmentCoefficient).toBe(beforeSettings.entrainmentCoefficient);
    await regulator.post(`/api/v1/calibrations/${id}/rollback`).expect(409);
  }, 300_000);
});
