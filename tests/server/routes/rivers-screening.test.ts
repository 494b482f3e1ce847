/**
 * Rivers, flow records, scenarios, footprints and screenings over HTTP, on the invented demo
 * region (loaded by the same code as npm start).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { createScreeningService } from '../../../server/services/screening.service';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let regulator: Agent;
let grower: Agent;
let grower2: Agent;
let adviser: Agent;
let amberlinId: string;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  const rivers = await regulator.get('/api/v1/rivers').expect(200);
  amberlinId = rivers.body.items.find((r: { name: string }) => r.name === 'Amberlin River').id;
}, 120_000);
afterAll(async () => {
  await t.close();
});

const newRiver = { name: 'Test Creek', mouthLongitude: -38.6, mouthLatitude: 41.1, outflowAzimuthDeg: 270, mouthWidth: 40, mouthDepth: 2 };

describe('rivers', () => {
  it('creates a river and marks the documented defaults it uses', async () => {
    const res = await adviser.post('/api/v1/rivers').send(newRiver).expect(201);
    expect(res.body.defaultsUsed).toEqual(expect.arrayContaining(['seaSalinity', 'entrainmentCoefficient', 't90DayHours', 'alongshoreShare']));
    expect(res.body.settings.seaSalinity).toBe(34);
    const changed = await adviser.patch(`/api/v1/rivers/${res.body.id}`).send({ seaSalinity: 33 }).expect(200);
    expect(changed.body.defaultsUsed).not.toContain('seaSalinity');
    expect(changed.body.version).toBe(res.body.version + 1);
  });

  it.each([
    [{ ...newRiver, outflowAzimuthDeg: 400 }, /outflowAzimuthDeg must be between 0 and 360/],
    [{ ...newRiver, mouthLatitude: 95 }, /latitude must be between -90 and 90/],
    [{ ...newRiver, shelfSlope: 2 }, /shelfSlope must be between 0 and 0.5/],
    [{ ...newRiver, seaSalinity: 50 }, /seaSalinity must be between 0 and 42/],
    [{ ...newRiver, alongshoreShare: 0.1 }, /alongshoreShare must be between 0.3 and 1/],
    [{ ...newRiver, mouthWidth: 0 }, /mouthWidth must be greater than 0/],
    [{ ...newRiver, colour: 'blue' }, /colour/],
  ])('refuses bad settings with a message naming the field (%#)', async (body, message) => {
    const res = await adviser.post('/api/v1/rivers').send(body).expect(400);
    expect(res.body.error.message).toMatch(message);
  });

  it("only the river's creator or the jurisdiction's regulator may change it", async () => {
    const res = await grower.patch(`/api/v1/rivers/${amberlinId}`).send({ entrainmentCoefficient: 1e-4 }).expect(403);
    expect(res.body.error.message).toMatch(/creator or a regulator/);
    await grower2.get(`/api/v1/rivers/${amberlinId}`).expect(200);
  });

  it('a user of no jurisdiction does not see the region’s rivers', async () => {
    await request(t.app)
      .post('/api/v1/account/sign-up')
      .send({ name: 'Elsewhere', email: 'elsewhere@brackline.test', password: 'elsewhere-pw-1' });
    const other = (await signIn(t.app, 'elsewhere@brackline.test', 'elsewhere-pw-1')).agent;
    await other.get(`/api/v1/rivers/${amberlinId}`).expect(404);
  });
});

describe('flow records and scenarios', () => {
  it('reports row problems and stores nothing until the user accepts them', async () => {
    const river = await adviser
      .post('/api/v1/rivers')
      .send({ ...newRiver, name: 'Messy Brook' })
      .expect(201);
    const csv = readFileSync(path.resolve(import.meta.dirname, '../../../demo-data/flows/tolley-brook-daily.csv'), 'utf8').split('\n');
    csv.splice(100, 0, '1991-01-05,abc', 'not-a-date,5', '1991-01-07,-3');
    const messy = csv.join('\n');
    const refused = await adviser
      .post(`/api/v1/rivers/${river.body.id}/flow-records?units=m3s`)
      .set('Content-Type', 'text/csv')
      .send(messy)
      .expect(422);
    expect(refused.body.error.message).toMatch(/3 of \d+ rows have problems/);
    expect(refused.body.error.details.problems.map((p: { row: number }) => p.row)).toEqual([101, 102, 103]);
    expect(refused.body.error.details.problems[0].reason).toMatch(/not a number/);
    const none = await adviser.get(`/api/v1/rivers/${river.body.id}/scenarios`).expect(200);
    expect(none.body.items).toEqual([]);
    // The river has no coast of its own, and none in its (adviser's) jurisdiction is a line… the demo shoreline serves it.
    const accepted = await adviser
      .post(`/api/v1/rivers/${river.body.id}/flow-records?units=m3s&acceptProblems=true`)
      .set('Content-Type', 'text/csv')
      .send(messy)
      .expect(201);
    expect(accepted.body.problems).toHaveLength(3);
    expect(accepted.body.fit.n).toBe(35);
    const scenarios = await adviser.get(`/api/v1/rivers/${river.body.id}/scenarios`).expect(200);
    const aeps = scenarios.body.items
      .filter((s: { kind: string }) => s.kind === 'aep')
      .map((s: { aep: number }) => s.aep)
      .sort();
    expect(aeps).toEqual([0.01, 0.02, 0.04, 0.1, 0.2, 0.5]);
    const seasonal = scenarios.body.items.filter((s: { kind: string }) => s.kind === 'seasonal');
    expect(seasonal).toHaveLength(4);
    // Named by their months, never by season codes (issue #14 item 6), so they read right in both hemispheres.
    expect(seasonal.map((s: { name: string }) => s.name).sort()).toEqual([
      'Dec–Feb high flow (99th percentile of daily flow)',
      'Jun–Aug high flow (99th percentile of daily flow)',
      'Mar–May high flow (99th percentile of daily flow)',
      'Sep–Nov high flow (99th percentile of daily flow)',
    ]);
  });

  it('adds, edits and deletes a typed scenario; fitted ones cannot be deleted', async () => {
    const created = await regulator
      .post(`/api/v1/rivers/${amberlinId}/scenarios`)
      .send({ name: 'Storm of record', discharge: 3200, durationHours: 96 })
      .expect(201);
    expect(created.body.kind).toBe('manual');
    const edited = await regulator.patch(`/api/v1/scenarios/${created.body.id}`).send({ durationHours: 72 }).expect(200);
    expect(edited.body.durationHours).toBe(72);
    await regulator.delete(`/api/v1/scenarios/${created.body.id}`).expect(204);
    const fitted = (await regulator.get(`/api/v1/rivers/${amberlinId}/scenarios`)).body.items.find(
      (s: { kind: string }) => s.kind === 'aep',
    );
    const refused = await regulator.delete(`/api/v1/scenarios/${fitted.id}`).expect(403);
    expect(refused.body.error.message).toMatch(/upload a new record/);
  });
});

describe('screening the demo region', () => {
  it('every demo lease has a screening for every scenario of each river', async () => {
    const counts = await t.db.pool.query(`
      select r.name, (select count(*) from scenarios s where s.river_id = r.id)::int as scenarios,
             (select count(*) from screenings x where x.river_id = r.id)::int as screenings,
             (select count(*) from leases l where l.jurisdiction_id = r.jurisdiction_id and l.lease_code like 'FB-%')::int as leases
        from rivers r where r.name in ('Amberlin River', 'Tolley Brook')`);
    for (const row of counts.rows) {
      expect(row.scenarios).toBeGreaterThanOrEqual(10);
      expect(row.screenings).toBeGreaterThanOrEqual(row.scenarios * row.leases);
    }
  });

  it('loads the demo monitoring stations and samples, keeping detection limits as censored values', async () => {
    // Only the demo stations (FB-S01…FB-S09): other test files add stations of their own to the same database.
    const r = await t.db.pool.query(
      `select (select count(*) from stations where code like 'FB-S%')::int as stations,
              (select count(*) from samples s join stations st on st.id = s.station_id where st.code like 'FB-S%')::int as samples,
              (select count(*) from samples s join stations st on st.id = s.station_id
                where st.code like 'FB-S%' and s.indicator_censored is not null)::int as censored`,
    );
    // The counts of demo-data/monitoring/: its stations, its sample rows and those written as <2 or >1600.
    const demo = path.resolve(import.meta.dirname, '../../../demo-data/monitoring');
    const rows = readFileSync(path.join(demo, 'samples.csv'), 'utf8').trim().split('\n').slice(1);
    expect(r.rows[0].stations).toBe(JSON.parse(readFileSync(path.join(demo, 'stations.geojson'), 'utf8')).features.length);
    expect(r.rows[0].samples).toBe(rows.length);
    expect(r.rows[0].censored).toBe(rows.filter((row) => /,[<>]\d/.test(row)).length);
  });

  it('gives every rating its reasons, and never calls a site safe', async () => {
    const res = await regulator.get(`/api/v1/screenings?riverId=${amberlinId}&limit=5000`).expect(200);
    expect(res.body.items.length).toBeGreaterThan(100);
    for (const s of res.body.items) {
      expect(['low', 'moderate', 'high', 'severe']).toContain(s.rating);
      expect(s.reasons.length).toBeGreaterThan(0);
      expect(s.reasons.join(' ')).not.toMatch(/\bsafe\b/i);
      expect(s.modelVersion).toMatch(/^brackline-model-/);
    }
  });

  it('a grower sees only the screenings of leases it may see', async () => {
    const mine = await grower.get('/api/v1/screenings?limit=5000').expect(200);
    const codes = new Set(mine.body.items.map((s: { leaseCode: string }) => s.leaseCode));
    const own = await grower.get('/api/v1/leases?limit=5000&withGeometry=false').expect(200);
    const ownCodes = new Set(own.body.items.map((l: { leaseId: string }) => l.leaseId));
    for (const c of codes) expect(ownCodes.has(c)).toBe(true);
    expect(codes.size).toBeGreaterThan(0);
  });

  it('returns a footprint as GeoJSON for a scenario and for a typed flow, with its inputs', async () => {
    const scenarios = (await grower.get(`/api/v1/rivers/${amberlinId}/scenarios`)).body.items;
    const tenYear = scenarios.find((s: { aep: number | null }) => s.aep === 0.1);
    const fp = await grower.get(`/api/v1/footprints?riverId=${amberlinId}&scenarioId=${tenYear.id}`).expect(200);
    expect(fp.body.type).toBe('FeatureCollection');
    expect(fp.body.properties.modelVersion).toMatch(/^brackline-model-/);
    expect(fp.body.properties.plume.turnsTo).toBe('right');
    const bandIds = fp.body.features.map((f: { id: string }) => f.id);
    expect(bandIds).toContain('plume-edge');
    const adhoc = await grower.get(`/api/v1/footprints?riverId=${amberlinId}&discharge=500&durationHours=48`).expect(200);
    expect(adhoc.body.properties.discharge).toBe(500);
    const again = await grower.get(`/api/v1/footprints?riverId=${amberlinId}&discharge=500&durationHours=48`).expect(200);
    expect(again.body.properties.footprintId).toBe(adhoc.body.properties.footprintId);
  });

  it('sweeps flows for one lease: bands are entered at rising flows', async () => {
    const lease = (await grower.get('/api/v1/leases?q=FB-001')).body.items[0];
    const sweep = await grower.get(`/api/v1/leases/${lease.id}/sweep?riverId=${amberlinId}`).expect(200);
    expect(sweep.body.curve.length).toBe(60);
    const flows = sweep.body.curve.map((p: { discharge: number }) => p.discharge);
    expect([...flows].sort((a, b) => a - b)).toEqual(flows);
    const enters = Object.fromEntries(
      sweep.body.bands.map((b: { bandId: string; entersAtDischarge: number | null }) => [b.bandId, b.entersAtDischarge]),
    );
    // Any river water arrives no later than water fresh enough to harm the species.
    const plumeEdge = enters['plume-edge'];
    for (const [id, q] of Object.entries(enters)) if (q !== null && id.startsWith('salinity')) expect(plumeEdge).not.toBeNull();
    expect(sweep.body.note).toMatch(/typical flood duration/);
  });

  it('refuses a sweep of a lease the user may not see', async () => {
    const lease = (await grower.get('/api/v1/leases?q=FB-001')).body.items[0];
    await grower2.get(`/api/v1/leases/${lease.id}/sweep?riverId=${amberlinId}`).expect(404);
  });

  it('serves lease vector tiles', async () => {
    const res = await regulator
      .get('/api/v1/tiles/leases/10/402/383.mvt')
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/vnd.mapbox-vector-tile/);
    expect((res.body as Buffer).length).toBeGreaterThan(100);
  });

  it('rates each lease in a tile at the chosen scenario, and leaves out leases the caller may not see', async () => {
    const { default: MVT } = await import('ol/format/MVT');
    const fetchTile = async (agent: Agent, query: string) => {
      const res = await agent
        .get(`/api/v1/tiles/leases/12/1608/1532.mvt${query}`)
        .buffer(true)
        .parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        });
      expect(res.status).toBe(200);
      const bytes = res.body as Buffer;
      // Decoded with OpenLayers' MVT reader, the same code the map uses.
      return new MVT().readFeatures(new Uint8Array(bytes).buffer, {}).map((f) => f.getProperties());
    };
    const scenarios = (await grower.get(`/api/v1/rivers/${amberlinId}/scenarios`).expect(200)).body.items;
    const tenYear = scenarios.find((s: { aep: number | null }) => s.aep === 0.1);
    const features = await fetchTile(grower, `?scenarioId=${tenYear.id}`);
    expect(features.length).toBeGreaterThan(0);
    const screened = (await grower.get(`/api/v1/screenings?riverId=${amberlinId}&scenarioId=${tenYear.id}`).expect(200)).body.items;
    const ratingOf = new Map(screened.map((r: { leaseId: string; rating: string }) => [r.leaseId, r.rating]));
    for (const f of features) expect(f.rating).toBe(ratingOf.get(String(f.id)) ?? 'none');
    const mine = new Set(features.map((f) => f.id));
    const theirs = await fetchTile(grower2, `?scenarioId=${tenYear.id}`);
    expect(theirs.some((f) => mine.has(f.id))).toBe(false);
    await grower.get('/api/v1/tiles/leases/12/1608/1532.mvt?scenarioId=nope').expect(400);
  });

  it('lists leases with their worst rating and annual figures, sortable by rating', async () => {
    const res = await grower.get('/api/v1/leases?sort=worstRating&order=desc&withGeometry=false').expect(200);
    const order = ['low', 'moderate', 'high', 'severe'];
    const ratings = res.body.items.map((l: { worstRating: string | null }) => l.worstRating);
    expect(ratings.every((r: string | null) => r !== null)).toBe(true);
    expect([...ratings].sort((a, b) => order.indexOf(b) - order.indexOf(a))).toEqual(ratings);
    expect(res.body.items[0].expectedDaysPerYear).toBeGreaterThanOrEqual(0);
  });

  it("adds each lease's rating at every scenario of a chosen river to the leases list", async () => {
    const list = (await grower.get(`/api/v1/leases?withGeometry=false&ratingsRiverId=${amberlinId}&limit=5`).expect(200)).body.items;
    const lease = list[0];
    const screened = (await grower.get(`/api/v1/screenings?riverId=${amberlinId}&leaseId=${lease.id}`).expect(200)).body.items;
    expect(Object.keys(lease.scenarioRatings).length).toBe(screened.length);
    for (const r of screened) expect(lease.scenarioRatings[r.scenarioId]).toBe(r.rating);
    // Without the parameter the field is absent; a malformed river id is refused with the field named.
    const plain = (await grower.get('/api/v1/leases?withGeometry=false&limit=1').expect(200)).body.items[0];
    expect(plain.scenarioRatings).toBeUndefined();
    const bad = await grower.get('/api/v1/leases?ratingsRiverId=amberlin').expect(400);
    expect(JSON.stringify(bad.body)).toContain('ratingsRiverId');
  });

  it('annualises exposure across the flood-frequency scenarios', async () => {
    const res = await grower.get('/api/v1/screenings/annual').expect(200);
    expect(res.body.items.length).toBeGreaterThan(0);
    for (const a of res.body.items) {
      expect(a.expectedDaysPerYear).toBeGreaterThanOrEqual(0);
      expect(a.probabilityAnyExposure).toBeGreaterThanOrEqual(0);
      expect(a.probabilityAnyExposure).toBeLessThanOrEqual(1);
    }
  });

  it('annualises the faecal indicator too: the chance a year is the most frequent flood that puts the indicator above 14 per 100 mL', async () => {
    const annual = (await grower.get(`/api/v1/screenings/annual?riverId=${amberlinId}`).expect(200)).body.items;
    const screened = (await grower.get(`/api/v1/screenings?riverId=${amberlinId}&limit=1000`).expect(200)).body.items as {
      leaseId: string;
      scenarioKind: string;
      aep: number | null;
      highestIndicator: number | null;
      durationHours: number;
    }[];
    expect(annual.length).toBeGreaterThan(0);
    for (const a of annual) {
      const rows = screened.filter((r) => r.leaseId === a.leaseId && r.scenarioKind === 'aep' && r.aep !== null);
      const above = rows.filter((r) => (r.highestIndicator ?? 0) > 14).map((r) => r.aep as number);
      expect(a.probabilityIndicatorAboveStandard).toBeCloseTo(above.length ? Math.max(...above) : 0, 12);
      // Never more days a year than the longest flood lasts (each flood counts at most its duration).
      const longest = Math.max(...rows.map((r) => r.durationHours / 24));
      expect(a.indicatorDaysPerYear).toBeGreaterThanOrEqual(0);
      expect(a.indicatorDaysPerYear).toBeLessThanOrEqual(longest + 1e-9);
    }
  });
});

describe('the yearly rating (GET /screenings/annual, issue #14 item 4)', () => {
  // Species limits as science.md §4.1–4.4 suggest them for screening ((c): acute psu / days, chronic psu / days).
  const LIMITS: Record<string, { acute: number; acuteDays: number; chronic: number; chronicDays: number }> = {
    'pacific-oyster': { acute: 10, acuteDays: 2, chronic: 15, chronicDays: 7 },
    'eastern-oyster': { acute: 3, acuteDays: 7, chronic: 8, chronicDays: 14 },
    'flat-oyster': { acute: 15, acuteDays: 3, chronic: 20, chronicDays: 7 },
    'blue-mussel': { acute: 5, acuteDays: 5, chronic: 10, chronicDays: 14 },
    'mediterranean-mussel': { acute: 10, acuteDays: 5, chronic: 15, chronicDays: 7 },
    'hard-clam': { acute: 10, acuteDays: 3, chronic: 17, chronicDays: 7 },
    'manila-clam': { acute: 10, acuteDays: 2, chronic: 18, chronicDays: 7 },
    'bay-scallop': { acute: 20, acuteDays: 2, chronic: 25, chronicDays: 7 },
    'sea-scallop': { acute: 20, acuteDays: 2, chronic: 25, chronicDays: 7 },
    'great-scallop': { acute: 20, acuteDays: 2, chronic: 25, chronicDays: 7 },
  };
  // The cut points agreed in issue #14 (inclusive), written out here rather than imported.
  const rate = (days: number, chance: number) =>
    days >= 30 || chance >= 0.5 ? 'severe' : days >= 10 || chance >= 0.2 ? 'high' : days >= 2 || chance >= 0.05 ? 'moderate' : 'low';
  const RANK = ['low', 'moderate', 'high', 'severe'];
  type Screened = {
    leaseId: string;
    species: string;
    scenarioKind: string;
    aep: number | null;
    lowestSalinity: number | null;
    highestIndicator: number | null;
    daysBelowTolerance: number;
    durationHours: number;
  };
  type Annual = {
    leaseId: string;
    leaseCode: string;
    riverId: string;
    closureDaysPerYear: number;
    harmfulSalinityChancePerYear: number;
    annualRating: string;
    indicatorDaysPerYear: number;
  };

  it('computes both figures from the screenings and rates each lease from them, beside the figures', async () => {
    const annual = (await grower.get(`/api/v1/screenings/annual?riverId=${amberlinId}`).expect(200)).body.items as Annual[];
    const screened = (await grower.get(`/api/v1/screenings?riverId=${amberlinId}&limit=5000`).expect(200)).body.items as Screened[];
    expect(annual.length).toBeGreaterThan(0);
    for (const a of annual) {
      const rows = screened
        .filter((r) => r.leaseId === a.leaseId && r.scenarioKind === 'aep' && r.aep !== null)
        .sort((x, y) => x.aep! - y.aep!);
      expect(rows.length).toBeGreaterThan(1);
      // Expected annual days as flood-risk practice computes expected annual damage ((c) common practice): each AEP band
      // between two scenarios carries its probability mass × the mean of its end days; floods rarer than the rarest
      // scenario count as it; from the most frequent scenario to AEP 1 the days fall linearly to 0.
      const days = rows.map((r) => ((r.highestIndicator ?? 0) > 14 ? r.durationHours / 24 : 0));
      let expected = rows[0].aep! * days[0];
      for (let i = 1; i < rows.length; i++) expected += (rows[i].aep! - rows[i - 1].aep!) * ((days[i] + days[i - 1]) / 2);
      expected += ((1 - rows.at(-1)!.aep!) * days.at(-1)!) / 2;
      expect(a.closureDaysPerYear).toBeCloseTo(expected, 9);
      expect(a.indicatorDaysPerYear).toBeCloseTo(expected, 9);
      // A harmful salinity event: under the acute limit for more than its days, or under the chronic limit for more than its days.
      const l = LIMITS[rows[0].species];
      expect(l).toBeDefined();
      const harmful = rows.filter(
        (r) =>
          r.lowestSalinity !== null &&
          ((r.lowestSalinity < l.acute && r.daysBelowTolerance > l.acuteDays) ||
            (r.lowestSalinity < l.chronic && r.daysBelowTolerance > l.chronicDays)),
      );
      expect(a.harmfulSalinityChancePerYear).toBe(harmful.length ? Math.max(...harmful.map((r) => r.aep!)) : 0);
      expect(a.annualRating).toBe(rate(a.closureDaysPerYear, a.harmfulSalinityChancePerYear));
    }
  });

  it('lists the worst yearly rating first, then more closure days, then the higher chance', async () => {
    const items = (await grower.get('/api/v1/screenings/annual').expect(200)).body.items as Annual[];
    for (let i = 1; i < items.length; i++) {
      const [a, b] = [items[i - 1], items[i]];
      const key = (x: Annual) => [RANK.indexOf(x.annualRating), x.closureDaysPerYear, x.harmfulSalinityChancePerYear];
      const [ka, kb] = [key(a), key(b)];
      const firstDiff = ka.findIndex((v, k) => v !== kb[k]);
      if (firstDiff >= 0) expect(ka[firstDiff]).toBeGreaterThan(kb[firstDiff]);
    }
  });

  it('rates and sorts the leases list by the same rule, on the server, with cut points inclusive', async () => {
    // Set one river's stored figures of a lease at a cut point (or just under), its other rivers' to none, and read the
    // lease back through the list (which combines rivers on the server) and the annual endpoint.
    const mine = (await grower.get('/api/v1/screenings/annual').expect(200)).body.items as Annual[];
    const byLease = new Map<string, Annual[]>();
    for (const a of mine) byLease.set(a.leaseId, [...(byLease.get(a.leaseId) ?? []), a]);
    const leases = [...byLease.values()];
    expect(leases.length).toBeGreaterThanOrEqual(6);
    const cases: [number, number, string][] = [
      [30, 0, 'severe'],
      [0, 0.5, 'severe'],
      [10, 0.1, 'high'],
      [0, 0.2, 'high'],
      [2, 0, 'moderate'],
      [1.999, 0.049, 'low'],
    ];
    const saved = await t.db.pool.query(
      'SELECT lease_id, river_id, closure_days_per_year, harmful_salinity_chance FROM lease_annual_exposure',
    );
    try {
      for (const [i, [d, p]] of cases.entries()) {
        await t.db.pool.query(
          'UPDATE lease_annual_exposure SET closure_days_per_year = 0, harmful_salinity_chance = 0 WHERE lease_id = $1',
          [leases[i][0].leaseId],
        );
        await t.db.pool.query(
          'UPDATE lease_annual_exposure SET closure_days_per_year = $3, harmful_salinity_chance = $4 WHERE lease_id = $1 AND river_id = $2',
          [leases[i][0].leaseId, leases[i][0].riverId, d, p],
        );
      }
      const list = (await grower.get('/api/v1/leases?sort=annualRating&order=desc&withGeometry=false&limit=1000').expect(200)).body
        .items as {
        id: string;
        annualRating: string | null;
        closureDaysPerYear: number | null;
        harmfulSalinityChancePerYear: number | null;
      }[];
      for (const [i, [, , expected]] of cases.entries()) {
        expect(list.find((l) => l.id === leases[i][0].leaseId)?.annualRating).toBe(expected);
      }
      for (const l of list) {
        if (l.annualRating === null) continue;
        expect(l.annualRating).toBe(rate(l.closureDaysPerYear!, l.harmfulSalinityChancePerYear!));
      }
      const rated = list.filter((l) => l.annualRating !== null);
      for (let i = 1; i < rated.length; i++) {
        const [a, b] = [rated[i - 1], rated[i]];
        const ka = [RANK.indexOf(a.annualRating!), a.closureDaysPerYear!, a.harmfulSalinityChancePerYear!];
        const kb = [RANK.indexOf(b.annualRating!), b.closureDaysPerYear!, b.harmfulSalinityChancePerYear!];
        const k = ka.findIndex((v, j) => v !== kb[j]);
        if (k >= 0) expect(ka[k]).toBeGreaterThan(kb[k]);
      }
      // The overview endpoint agrees with the list for the same figures.
      const annual = (await grower.get('/api/v1/screenings/annual').expect(200)).body.items as Annual[];
      for (const [i, [, , expected]] of cases.entries()) {
        expect(annual.find((a) => a.leaseId === leases[i][0].leaseId && a.riverId === leases[i][0].riverId)?.annualRating).toBe(expected);
      }
    } finally {
      for (const r of saved.rows) {
        await t.db.pool.query(
          'UPDATE lease_annual_exposure SET closure_days_per_year = $3, harmful_salinity_chance = $4 WHERE lease_id = $1 AND river_id = $2',
          [r.lease_id, r.river_id, r.closure_days_per_year, r.harmful_salinity_chance],
        );
      }
    }
  });

  it('works the figures out again at start-up when they were stored before the yearly rating', async () => {
    const before = (await grower.get(`/api/v1/screenings/annual?riverId=${amberlinId}`).expect(200)).body.items as Annual[];
    await t.db.pool.query(
      'UPDATE lease_annual_exposure SET harmful_salinity_chance = NULL, closure_days_per_year = NULL WHERE river_id = $1',
      [amberlinId],
    );
    const stale = (await grower.get(`/api/v1/screenings/annual?riverId=${amberlinId}`).expect(200)).body.items as Annual[];
    expect(stale.every((a) => a.annualRating === null)).toBe(true);
    expect(await createScreeningService({ db: t.db.db }).annualiseMissing()).toBe(1);
    const after = (await grower.get(`/api/v1/screenings/annual?riverId=${amberlinId}`).expect(200)).body.items as Annual[];
    expect(after.map((a) => [a.leaseId, a.annualRating, a.closureDaysPerYear, a.harmfulSalinityChancePerYear])).toEqual(
      before.map((a) => [a.leaseId, a.annualRating, a.closureDaysPerYear, a.harmfulSalinityChancePerYear]),
    );
  });

  it('is for growers, advisers and regulators only', async () => {
    const admin = (await signIn(t.app, 'admin@brackline.test')).agent;
    await admin.get('/api/v1/screenings/annual').expect(403);
    await request(t.app).get('/api/v1/screenings/annual').expect(401);
    const bad = await grower.get('/api/v1/screenings/annual?riverId=amberlin').expect(400);
    expect(JSON.stringify(bad.body)).toContain('riverId');
  });

  it('is documented in the OpenAPI document with the new fields beside the figures', async () => {
    const doc = (await request(t.app).get('/api/v1/openapi.json').expect(200)).body;
    const item = doc.paths['/api/v1/screenings/annual'].get.responses['200'].content['application/json'].schema.properties.items.items;
    for (const field of ['closureDaysPerYear', 'harmfulSalinityChancePerYear', 'annualRating', 'expectedDaysPerYear', 'worstRating']) {
      expect(Object.keys(item.properties)).toContain(field);
    }
    // null until a lease stored before the yearly rating is re-annualised.
    expect(item.properties.annualRating.enum).toEqual(['low', 'moderate', 'high', 'severe', null]);
    const lease = doc.paths['/api/v1/leases'].get.responses['200'].content['application/json'].schema.properties.items.items;
    expect(Object.keys(lease.properties)).toEqual(
      expect.arrayContaining(['annualRating', 'closureDaysPerYear', 'harmfulSalinityChancePerYear']),
    );
    const sort = doc.paths['/api/v1/leases'].get.parameters.find((p: { name: string }) => p.name === 'sort');
    expect(sort.schema.enum).toContain('annualRating');
  });
});

describe('seasonal scenarios stored under season codes (migration 0015)', () => {
  it('are renamed by their months, with their stored season and the reasons that quote them', async () => {
    const river = await adviser
      .post('/api/v1/rivers')
      .send({ ...newRiver, name: 'Old Names Creek' })
      .expect(201);
    const id = river.body.id as string;
    await t.db.pool.query(
      `INSERT INTO scenarios (river_id, name, kind, aep, discharge, duration_hours, source) VALUES
         ($1, 'DJF high flow (99th percentile of daily flow)', 'seasonal', NULL, 50, 24, '{"season":"DJF","percentile":99}'),
         ($1, 'SON high flow (99th percentile of daily flow)', 'seasonal', NULL, 40, 24, '{"season":"SON","percentile":99}'),
         ($1, 'DJF storm I typed', 'manual', NULL, 30, 24, NULL)`,
      [id],
    );
    // A flow record whose seasonal percentiles were stored under the old codes.
    await t.db.pool.query(`UPDATE flow_records SET percentiles = jsonb_set(percentiles, '{seasonal,0,label}', '"DJF"')
                            WHERE id = (SELECT id FROM flow_records WHERE percentiles ? 'seasonal' LIMIT 1)`);
    const migration = readFileSync(path.resolve(import.meta.dirname, '../../../drizzle/0015_rename_seasonal_scenarios.sql'), 'utf8');
    const client = await t.db.pool.connect();
    try {
      for (const statement of migration.split('--> statement-breakpoint')) await client.query(statement);
    } finally {
      client.release();
    }
    const rows = await t.db.pool.query('SELECT name, kind, source FROM scenarios WHERE river_id = $1 ORDER BY discharge DESC', [id]);
    expect(rows.rows.map((r) => [r.name, r.source?.season ?? null])).toEqual([
      ['Dec–Feb high flow (99th percentile of daily flow)', 'Dec–Feb'],
      ['Sep–Nov high flow (99th percentile of daily flow)', 'Sep–Nov'],
      ['DJF storm I typed', null], // a typed scenario keeps the name its author gave it
    ]);
    const codes = await t.db.pool.query(
      "SELECT count(*)::int AS n FROM scenarios WHERE kind = 'seasonal' AND name ~ '^(DJF|MAM|JJA|SON) '",
    );
    expect(codes.rows[0].n).toBe(0);
    const labels = await t.db.pool.query(
      "SELECT DISTINCT jsonb_array_elements(percentiles->'seasonal')->>'label' AS label FROM flow_records WHERE percentiles ? 'seasonal'",
    );
    expect(labels.rows.map((r) => r.label).sort()).toEqual(['Dec–Feb', 'Jun–Aug', 'Mar–May', 'Sep–Nov']);
  });
});
