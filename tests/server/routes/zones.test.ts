/**
 * The regulator's workspace over HTTP (issue #8) on the invented demo region: zones and plan
 * values, the trigger sweep, closure checks, notices (statuses, e-mails through the SMTP fake,
 * in-app messages), reopening rules, the public status page, the audit log and privacy.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { geojsonBuffer, rectangle } from '../../helpers/lease-fixtures';
import { createTestApp, signIn, type TestApp, waitForMail } from '../../helpers/test-app';

type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
/** The demo zones' plan triggers (demo-data/README.md: each river's 2-year flood, rounded down to two significant figures). */
const DEMO_ZONES = JSON.parse(readFileSync(path.resolve(import.meta.dirname, '../../../demo-data/zones/fennick-zones.geojson'), 'utf8')).features as {
  properties: { ZONE_NAME: string; TRIGGER_M3S: number };
}[];
const INNER_TRIGGER = DEMO_ZONES.find((z) => z.properties.ZONE_NAME === 'Fennick Bay inner zone')!.properties.TRIGGER_M3S;
const TOLLEY_TRIGGER = DEMO_ZONES.find((z) => z.properties.ZONE_NAME === 'Tolley shore zone')!.properties.TRIGGER_M3S;
let t: TestApp;
let regulator: Agent;
let grower: Agent;
let adviser: Agent;
let admin: Agent;
let outsider: Agent;
let inner: { id: string; riverId: string; triggerFlow: number };
let tolley: { id: string; riverId: string };

const GROWERS_IN_INNER = ['grower2@brackline.test', 'grower3@brackline.test', 'grower4@brackline.test', 'grower@brackline.test'];

async function outboxTo(email: string, subjectLike: string): Promise<{ subject: string; text: string }[]> {
  const r = await t.db.pool.query(
    `select subject, text_body as text from outbox_messages where envelope_to @> $1::jsonb and subject like $2 order by received_at`,
    [JSON.stringify([email]), subjectLike],
  );
  return r.rows;
}

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  // The test database is reused between runs: start from the demo zones' plan values, open, with no samples, notices or readings.
  await t.db.pool.query('delete from zone_samples; delete from notices; delete from gauge_readings');
  await t.db.pool.query(
    `update closure_zones set status = 'open', status_since = now(), trigger_flow = (source_properties->>'TRIGGER_M3S')::float8,
            min_closure_days = (source_properties->>'CLOSURE_DAYS')::float8 where source_properties ? 'TRIGGER_M3S'`,
  );
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  admin = (await signIn(t.app, 'admin@brackline.test')).agent;
  // A regulator of another authority, with the demo password.
  await t.db.pool.query(`insert into jurisdictions (slug, name) values ('other-coast', 'Other Coast Authority') on conflict do nothing`);
  await t.db.pool.query(
    `insert into users (id, email, name, role, password_hash, jurisdiction_id, email_verified)
     select gen_random_uuid()::text, 'other-regulator@brackline.test', 'Other regulator', 'regulator', u.password_hash, (select id from jurisdictions where slug = 'other-coast'), now()
       from users u where u.email = 'regulator@brackline.test' on conflict do nothing`,
  );
  outsider = (await signIn(t.app, 'other-regulator@brackline.test')).agent;
  const zones = await regulator.get('/api/v1/zones').expect(200);
  inner = zones.body.items.find((z: { name: string }) => z.name === 'Fennick Bay inner zone');
  tolley = zones.body.items.find((z: { name: string }) => z.name === 'Tolley shore zone');
}, 180_000);
afterAll(async () => {
  await t?.close();
});

describe('zones', () => {
  it('lists the jurisdiction’s zones with their plan values; held leases only are counted (FB-004 is a candidate)', async () => {
    const res = await regulator.get('/api/v1/zones').expect(200);
    expect(res.body.items.map((z: { name: string }) => z.name)).toEqual(['Fennick Bay inner zone', 'Tolley shore zone']);
    expect(inner).toMatchObject({
      triggerFlow: INNER_TRIGGER,
      minClosureDays: 5,
      indicatorStandard: 14,
      status: 'open',
      gaugeCode: 'FCSA-G01',
      riverName: 'Amberlin River',
    });
    // FB-001, 002, 003, 005, 007 and 009 are held; FB-004 (the demo grower's candidate site) also touches the zone and is not counted.
    expect(res.body.items[0].heldLeases).toBe(6);
    const one = await regulator.get(`/api/v1/zones/${inner.id}`).expect(200);
    expect(one.body.geometry.type).toBe('MultiPolygon');
  });

  it('changes plan values with an audit entry holding before and after; bad values are refused with the field named', async () => {
    const bad = await regulator.patch(`/api/v1/zones/${tolley.id}`).send({ triggerFlow: -5 }).expect(400);
    expect(bad.body.error.message).toMatch(/triggerFlow must be greater than 0/);
    const unknown = await regulator.patch(`/api/v1/zones/${tolley.id}`).send({ colour: 'red' }).expect(400);
    expect(unknown.body.error.message).toMatch(/colour/);
    const res = await regulator.patch(`/api/v1/zones/${tolley.id}`).send({ minClosureDays: 4 }).expect(200);
    expect(res.body.minClosureDays).toBe(4);
    const audit = await t.db.pool.query(
      `select before, after from audit_entries where action = 'zone.update' and subject_id = $1 order by at desc limit 1`,
      [tolley.id],
    );
    expect(audit.rows[0]).toEqual({ before: { minClosureDays: 3 }, after: { minClosureDays: 4 } });
  });

  it('refuses a gauge that is not on the zone’s river', async () => {
    const tolleyZone = await regulator.get(`/api/v1/zones/${tolley.id}`).expect(200);
    const res = await regulator.patch(`/api/v1/zones/${inner.id}`).send({ gaugeId: tolleyZone.body.gaugeId }).expect(422);
    expect(res.body.error.message).toMatch(/not on the chosen river/);
  });

  it('an uploaded zone (the imports pipeline, kind zone) appears open and takes its river, gauge and plan values', async () => {
    const fc = { type: 'FeatureCollection', features: [rectangle(-38.62, 41.13, 1500, { ZONE_NAME: 'Uploaded test zone' })] };
    const up = await regulator.post('/api/v1/imports').field('kind', 'zone').attach('file', geojsonBuffer(fc), 'zones.geojson').expect(201);
    await regulator
      .post(`/api/v1/imports/${up.body.id}/confirm`)
      .send({ mapping: { leaseId: 'ZONE_NAME' } })
      .expect(200);
    const listed = (await regulator.get('/api/v1/zones').expect(200)).body.items.find(
      (z: { name: string }) => z.name === 'Uploaded test zone',
    );
    expect(listed).toMatchObject({ status: 'open', riverId: null, triggerFlow: null });
    expect(listed.areaM2).toBeCloseTo(1500 * 1500, -4);
    const gauge = (await regulator.get(`/api/v1/zones/${inner.id}`).expect(200)).body.gaugeId;
    const linked = await regulator
      .patch(`/api/v1/zones/${listed.id}`)
      .send({ riverId: inner.riverId, gaugeId: gauge, triggerFlow: 800, minClosureDays: 2, indicatorStandard: 14 })
      .expect(200);
    expect(linked.body).toMatchObject({ riverName: 'Amberlin River', gaugeCode: 'FCSA-G01', triggerFlow: 800, minClosureDays: 2 });
    await t.db.pool.query(`delete from closure_zones where id = $1`, [listed.id]);
  });

  it('saves a zone drawn on the map, and refuses a shape with no area', async () => {
    const square = {
      type: 'Polygon',
      coordinates: [
        [
          [-38.6, 41.12],
          [-38.59, 41.12],
          [-38.59, 41.13],
          [-38.6, 41.13],
          [-38.6, 41.12],
        ],
      ],
    };
    const res = await regulator
      .post('/api/v1/zones')
      .send({ name: 'Drawn test zone', geometry: square, riverId: inner.riverId, triggerFlow: 500 })
      .expect(201);
    expect(res.body).toMatchObject({ name: 'Drawn test zone', status: 'open', triggerFlow: 500, riverName: 'Amberlin River' });
    expect(res.body.areaM2).toBeGreaterThan(500_000);
    const line = {
      type: 'Polygon',
      coordinates: [
        [
          [-38.6, 41.12],
          [-38.59, 41.12],
          [-38.6, 41.12],
        ],
      ],
    };
    const bad = await regulator.post('/api/v1/zones').send({ name: 'Flat', geometry: line }).expect(400);
    expect(bad.body.error.message).toMatch(/no area|not a readable/);
    await t.db.pool.query(`delete from closure_zones where id = $1`, [res.body.id]);
  });
});

describe('trigger sweep', () => {
  it('finds the lowest flow at which any part of the zone is over the standard, with the margin to the plan and the AEPs', async () => {
    const res = await regulator.get(`/api/v1/zones/${inner.id}/trigger-sweep`).expect(200);
    const s = res.body;
    expect(s.curve).toHaveLength(60);
    expect(s.indicatorStandard).toBe(14);
    expect(s.planTrigger).toBe(INNER_TRIGGER);
    expect(s.suggestedTrigger).toBeGreaterThan(0);
    // The step just below the suggestion has none of the zone over the standard; the first at or above it has some.
    const below = s.curve.filter((p: { discharge: number }) => p.discharge < s.suggestedTrigger);
    expect(below.length).toBeGreaterThan(0);
    expect(below.at(-1).fraction).toBe(0);
    expect(s.curve.find((p: { discharge: number }) => p.discharge >= s.suggestedTrigger).fraction).toBeGreaterThan(0);
    expect(s.marginM3s).toBeCloseTo(INNER_TRIGGER - s.suggestedTrigger, 6);
    // Fractions are shares of the zone.
    for (const p of s.curve) {
      expect(p.fraction).toBeGreaterThanOrEqual(0);
      expect(p.fraction).toBeLessThanOrEqual(1);
    }
    // AEP falls as flow rises wherever the fit gives one.
    const withAep = s.curve.filter((p: { aep: number | null }) => p.aep != null);
    expect(withAep.length).toBeGreaterThan(3);
    for (let i = 1; i < withAep.length; i++) expect(withAep[i].aep).toBeLessThanOrEqual(withAep[i - 1].aep);
    // The plan trigger lies just below the fitted 2-year flood, so its AEP comes from the annual peaks by the
    // Weibull plotting position m/(n+1) (common practice): m years of n reached it.
    const peaks = await t.db.pool.query(
      `select count(*) filter (where (p->>'discharge')::float8 >= $2)::int as m, count(*)::int as n
         from flow_records f, jsonb_array_elements(f.annual_peaks) p where f.river_id = $1 and f.active and (p->>'complete')::boolean`,
      [inner.riverId, INNER_TRIGGER],
    );
    expect(s.planAep).toBeCloseTo(peaks.rows[0].m / (peaks.rows[0].n + 1), 12);
    expect(s.modelVersion).toMatch(/^brackline-model-/);
  });

  it('agrees with the lease sweep: no lease inside the zone enters the indicator band below the zone’s suggested trigger', async () => {
    const s = (await regulator.get(`/api/v1/zones/${inner.id}/trigger-sweep`).expect(200)).body;
    const inside = await t.db.pool.query(
      `select l.id, l.lease_code from leases l, closure_zones z where z.id = $1 and l.status = 'held' and ST_CoveredBy(l.geom, z.geom) order by l.lease_code`,
      [inner.id],
    );
    expect(inside.rows.length).toBeGreaterThan(0);
    for (const l of inside.rows) {
      const ls = (await regulator.get(`/api/v1/leases/${l.id}/sweep?riverId=${inner.riverId}`).expect(200)).body;
      const enters = ls.bands.find((b: { bandId: string }) => b.bandId === 'indicator-over-standard').entersAtDischarge;
      // Part of the lease over the standard is part of the zone over it (the lease sweep steps more coarsely: 1 % slack).
      if (enters != null) expect(enters, l.lease_code).toBeGreaterThanOrEqual(s.suggestedTrigger * 0.99);
    }
  });

  it('a larger share gives a suggestion at or above the any-part one; a bad share is refused', async () => {
    const any = (await regulator.get(`/api/v1/zones/${inner.id}/trigger-sweep`).expect(200)).body.suggestedTrigger;
    const half = (await regulator.get(`/api/v1/zones/${inner.id}/trigger-sweep?share=0.5`).expect(200)).body.suggestedTrigger;
    expect(half).toBeGreaterThanOrEqual(any);
    const bad = await regulator.get(`/api/v1/zones/${inner.id}/trigger-sweep?share=2`).expect(400);
    expect(bad.body.error.message).toMatch(/share must be at most 1/);
  });
});

describe('closure checks', () => {
  it('at a flood flow lists the zones over their trigger and the held leases in each band, with inputs and model version', async () => {
    const res = await regulator.post('/api/v1/closure-checks').send({ riverId: inner.riverId, flow: 1200 }).expect(200);
    const c = res.body;
    expect(c.flowSource.kind).toBe('typed');
    expect(c.flow).toBe(1200);
    expect(c.aep).toBeGreaterThan(0);
    expect(c.aep).toBeLessThan(0.2);
    const zone = c.zones.find((z: { id: string }) => z.id === inner.id);
    expect(zone.atOrAboveTrigger).toBe(true);
    expect(zone.bandFractions['indicator-over-standard']).toBeGreaterThan(0);
    const codes = c.leases.map((l: { leaseId: string }) => l.leaseId);
    expect(codes).toContain('FB-001');
    // Never a candidate site, even one inside the zone.
    expect(codes).not.toContain('FB-004');
    expect(c.leases.find((l: { leaseId: string }) => l.leaseId === 'FB-001').zones).toEqual(['Fennick Bay inner zone']);
    expect(c.note).toMatch(/model brackline-model-/);
    expect(c.map.features.some((f: { properties: { layer: string } }) => f.properties.layer === 'band')).toBe(true);
  });

  it('a flow below the trigger says so', async () => {
    const c = (await regulator.post('/api/v1/closure-checks').send({ riverId: inner.riverId, flow: 300 }).expect(200)).body;
    expect(c.zones.find((z: { id: string }) => z.id === inner.id).atOrAboveTrigger).toBe(false);
  });

  it('uses the latest gauge reading when asked, and says clearly when there is none', async () => {
    const none = await regulator
      .post('/api/v1/closure-checks')
      .send({ riverId: inner.riverId, source: 'latest-gauge-reading' })
      .expect(422);
    expect(none.body.error.message).toMatch(/has sent a reading yet. Type a flow instead/);
    const z = await regulator.get(`/api/v1/zones/${inner.id}`).expect(200);
    await t.db.pool.query(
      `insert into gauge_readings (gauge_id, observed_at, discharge, source) values ($1, now() - interval '2 hours', 700, 'manual'), ($1, now() - interval '1 hour', 1100, 'manual')`,
      [z.body.gaugeId],
    );
    const c = (await regulator.post('/api/v1/closure-checks').send({ riverId: inner.riverId, source: 'latest-gauge-reading' }).expect(200))
      .body;
    expect(c.flow).toBe(1100);
    expect(c.flowSource).toMatchObject({ kind: 'latest-gauge-reading', gaugeCode: 'FCSA-G01' });
    expect(c.note).toMatch(/latest reading of gauge FCSA-G01/);
    const gauges = (await regulator.get('/api/v1/closure-checks/gauges').expect(200)).body.items;
    expect(gauges.find((g: { code: string }) => g.code === 'FCSA-G01')).toMatchObject({ latestDischarge: 1100 });
    expect(gauges.find((g: { code: string }) => g.code === 'FCSA-G02')).toMatchObject({ latestDischarge: null, latestAt: null });
  });

  it('a typed check needs a flow', async () => {
    const res = await regulator.post('/api/v1/closure-checks').send({ riverId: inner.riverId }).expect(400);
    expect(res.body.error.message).toMatch(/give flow/);
  });
});

describe('notices, reopening and the public page', () => {
  it('a closure notice closes the zone, e-mails and messages every grower with a held lease there', async () => {
    await t.db.pool.query('delete from outbox_messages');
    const res = await regulator
      .post('/api/v1/notices')
      .send({ kind: 'closure', zoneIds: [inner.id], flow: 1100, message: 'Amberlin River in flood.' })
      .expect(201);
    expect(res.body).toMatchObject({
      kind: 'closure',
      recipients: 4,
      emailsSent: 4,
      zones: [{ id: inner.id, statusBefore: 'open', statusAfter: 'closed' }],
    });
    const zone = (await regulator.get(`/api/v1/zones/${inner.id}`).expect(200)).body;
    expect(zone.status).toBe('closed');
    expect(new Date(zone.earliestReopening).getTime() - new Date(zone.statusSince).getTime()).toBe(5 * 86_400_000);
    for (const email of GROWERS_IN_INNER) {
      const mail = await waitForMail(t.db, email);
      expect(mail.subject).toBe('Closure notice: Fennick Bay inner zone');
    }
    const saltreed = await waitForMail(t.db, 'grower@brackline.test');
    expect(saltreed.text).toMatch(/FB-001 \(Fennick Bay inner zone\)/);
    expect(saltreed.text).toMatch(/Amberlin River in flood\./);
    // The candidate site is never named.
    expect(saltreed.text).not.toMatch(/FB-004/);
    expect(saltreed.text).not.toMatch(/\bsafe\b/i);
    const inbox = await t.db.pool.query(
      `select u.email from inbox_messages m join users u on u.id = m.user_id where m.dedupe_key = $1 order by u.email`,
      [`notice:${res.body.id}`],
    );
    expect(inbox.rows.map((r) => r.email)).toEqual(GROWERS_IN_INNER);
    const audit = await t.db.pool.query(
      `select before, after from audit_entries where action = 'zone.status' and subject_id = $1 order by at desc limit 1`,
      [inner.id],
    );
    expect(audit.rows[0].before.status).toBe('open');
    expect(audit.rows[0].after.status).toBe('closed');
  });

  it('is all or nothing across zones: closing an already closed zone with another refuses both', async () => {
    const res = await regulator
      .post('/api/v1/notices')
      .send({ kind: 'closure', zoneIds: [inner.id, tolley.id] })
      .expect(409);
    expect(res.body.error.message).toMatch(/Fennick Bay inner zone is already closed.*No notice was issued for any of the chosen zones/);
    expect((await regulator.get(`/api/v1/zones/${tolley.id}`).expect(200)).body.status).toBe('open');
  });

  it('the public page shows the zone closed and the notice, without signing in and without leases or growers', async () => {
    const res = await request(t.app).get('/api/v1/public/status/fennick-coast').expect(200);
    expect(res.body.jurisdiction.name).toBe('Fennick Coast Shellfish Authority');
    expect(res.body.zones.find((z: { name: string }) => z.name === 'Fennick Bay inner zone').status).toBe('closed');
    expect(res.body.notices[0]).toMatchObject({ kind: 'closure', zones: ['Fennick Bay inner zone'] });
    const text = JSON.stringify(res.body);
    expect(text).not.toMatch(/FB-0|Saltreed|@brackline/);
    const missing = await request(t.app).get('/api/v1/public/status/nowhere').expect(404);
    expect(missing.body.error.message).toMatch(/No jurisdiction called "nowhere"/);
  });

  it('refuses an early reopening with a clear message', async () => {
    const res = await regulator
      .post('/api/v1/notices')
      .send({ kind: 'reopening', zoneIds: [inner.id] })
      .expect(409);
    expect(res.body.error.message).toMatch(
      /Fennick Bay inner zone cannot reopen yet: it closed on .* and its minimum closure is 5 days, so the earliest reopening is .* \(in 5\.0 days\)/,
    );
    expect((await regulator.get(`/api/v1/zones/${inner.id}`).expect(200)).body.status).toBe('closed');
  });

  it('after the minimum period still needs a passing sample; then reopens and tells the growers', async () => {
    // Simulate the minimum closure passing: move the closure's start six days back in the test database.
    await t.db.pool.query(`update closure_zones set status_since = now() - interval '6 days' where id = $1`, [inner.id]);
    const noSample = await regulator
      .post('/api/v1/notices')
      .send({ kind: 'reopening', zoneIds: [inner.id] })
      .expect(409);
    expect(noSample.body.error.message).toMatch(/no passing sample result has been entered since it closed/);

    const failing = await regulator
      .post(`/api/v1/zones/${inner.id}/samples`)
      .send({ sampledAt: new Date(Date.now() - 3_600_000).toISOString(), indicator: 40 })
      .expect(201);
    expect(failing.body).toMatchObject({ passed: false, standard: 14 });
    await regulator
      .post('/api/v1/notices')
      .send({ kind: 'reopening', zoneIds: [inner.id] })
      .expect(409);

    const passing = await regulator
      .post(`/api/v1/zones/${inner.id}/samples`)
      .send({ sampledAt: new Date(Date.now() - 1_800_000).toISOString(), indicator: 4, notes: 'Station FB-S2' })
      .expect(201);
    expect(passing.body.passed).toBe(true);
    expect((await regulator.get(`/api/v1/zones/${inner.id}`).expect(200)).body.status).toBe('reopening-pending');

    await t.db.pool.query('delete from outbox_messages');
    const res = await regulator
      .post('/api/v1/notices')
      .send({ kind: 'reopening', zoneIds: [inner.id] })
      .expect(201);
    expect(res.body).toMatchObject({
      kind: 'reopening',
      recipients: 4,
      zones: [{ statusBefore: 'reopening-pending', statusAfter: 'open' }],
    });
    expect((await regulator.get(`/api/v1/zones/${inner.id}`).expect(200)).body.status).toBe('open');
    const mail = await waitForMail(t.db, 'grower3@brackline.test');
    expect(mail.subject).toBe('Reopening notice: Fennick Bay inner zone');
    expect(await outboxTo('grower2@brackline.test', 'Reopening notice%')).toHaveLength(1);
    const history = await regulator.get(`/api/v1/zones/${inner.id}/notices`).expect(200);
    expect(history.body.items.map((n: { kind: string }) => n.kind)).toEqual(['reopening', 'closure']);
    const samples = await regulator.get(`/api/v1/zones/${inner.id}/samples`).expect(200);
    expect(samples.body.items.map((s: { passed: boolean }) => s.passed)).toEqual([true, false]);
  });

  it('a sample with a future date is refused', async () => {
    const res = await regulator
      .post(`/api/v1/zones/${inner.id}/samples`)
      .send({ sampledAt: new Date(Date.now() + 86_400_000).toISOString(), indicator: 2 })
      .expect(400);
    expect(res.body.error.message).toMatch(/sampledAt is in the future/);
  });
});

describe('audit log', () => {
  it('a regulator reads its jurisdiction’s changes with before and after; an admin reads them too', async () => {
    await regulator.patch(`/api/v1/zones/${tolley.id}`).send({ triggerFlow: 90 }).expect(200);
    const res = await regulator.get('/api/v1/audit?subjectType=zone').expect(200);
    const change = res.body.items.find(
      (a: { action: string; subjectId: string }) => a.action === 'zone.trigger-change' && a.subjectId === tolley.id,
    );
    expect(change).toMatchObject({
      before: { triggerFlow: TOLLEY_TRIGGER },
      after: { triggerFlow: 90 },
      actorEmail: 'regulator@brackline.test',
      subjectName: 'Tolley shore zone',
    });
    const actions = new Set(res.body.items.map((a: { action: string }) => a.action));
    expect([...actions]).toEqual(expect.arrayContaining(['zone.status', 'zone.sample', 'zone.update', 'zone.trigger-change']));
    const notices = await regulator.get('/api/v1/audit?subjectType=notice').expect(200);
    expect(notices.body.items.map((a: { action: string }) => a.action)).toEqual(
      expect.arrayContaining(['notice.closure', 'notice.reopening']),
    );
    const forAdmin = await admin.get('/api/v1/audit?subjectType=zone').expect(200);
    expect(forAdmin.body.total).toBeGreaterThanOrEqual(res.body.total);
    // Another authority's regulator reads none of them.
    expect((await outsider.get('/api/v1/audit?subjectType=zone').expect(200)).body.total).toBe(0);
  });

  it('a regulator reads role changes into its jurisdiction; another authority’s regulator does not', async () => {
    const j = await t.db.pool.query(`select id from jurisdictions where slug = 'fennick-coast'`);
    // A grower account, reset to a grower on every run (the test database is reused).
    const officer = await t.db.pool.query(
      `insert into users (id, email, name, role) values (gen_random_uuid()::text, 'officer@brackline.test', 'New officer', 'grower')
       on conflict (email) do update set role = 'grower', jurisdiction_id = null returning id`,
    );
    await admin.patch(`/api/v1/admin/users/${officer.rows[0].id}`).send({ role: 'regulator', jurisdictionId: j.rows[0].id }).expect(200);
    const res = await regulator.get('/api/v1/audit?subjectType=user').expect(200);
    const change = res.body.items.find(
      (a: { action: string; subjectId: string }) => a.action === 'user.role-change' && a.subjectId === officer.rows[0].id,
    );
    expect(change).toMatchObject({
      before: { role: 'grower' },
      after: { role: 'regulator', jurisdictionId: j.rows[0].id },
      subjectName: 'officer@brackline.test',
    });
    const other = await outsider.get('/api/v1/audit?subjectType=user').expect(200);
    expect(other.body.items.some((a: { subjectId: string }) => a.subjectId === officer.rows[0].id)).toBe(false);
  });

  it('is append-only in the database: UPDATE and DELETE are refused', async () => {
    const count = async () =>
      (await t.db.pool.query(`select count(*)::int as n from audit_entries where action = 'zone.trigger-change'`)).rows[0].n;
    const before = await count();
    expect(before).toBeGreaterThan(0);
    await expect(t.db.pool.query(`update audit_entries set after = '{}'::jsonb where action = 'zone.trigger-change'`)).rejects.toThrow(
      /append-only/,
    );
    await expect(t.db.pool.query(`delete from audit_entries where action = 'zone.trigger-change'`)).rejects.toThrow(/append-only/);
    expect(await count()).toBe(before);
    const blanked = await t.db.pool.query(
      `select count(*)::int as n from audit_entries where action = 'zone.trigger-change' and after = '{}'::jsonb`,
    );
    expect(blanked.rows[0].n).toBe(0);
  });
});

describe('privacy, route by route', () => {
  it('growers and advisers are refused every regulator route (403), an admin too except the audit log', async () => {
    const calls: [string, string, unknown?][] = [
      ['get', '/api/v1/zones'],
      ['get', `/api/v1/zones/${inner.id}`],
      ['patch', `/api/v1/zones/${inner.id}`, { triggerFlow: 1 }],
      ['get', `/api/v1/zones/${inner.id}/trigger-sweep`],
      ['get', `/api/v1/zones/${inner.id}/samples`],
      ['post', `/api/v1/zones/${inner.id}/samples`, { sampledAt: new Date().toISOString(), indicator: 1 }],
      ['get', `/api/v1/zones/${inner.id}/notices`],
      ['post', '/api/v1/closure-checks', { riverId: inner.riverId, flow: 1200 }],
      ['get', '/api/v1/closure-checks/gauges'],
      ['get', '/api/v1/notices'],
      ['post', '/api/v1/notices', { kind: 'closure', zoneIds: [inner.id] }],
    ];
    for (const agent of [grower, adviser, admin]) {
      for (const [method, url, body] of calls) {
        const r = await (agent as unknown as Record<string, (u: string) => request.Test>)[method](url).send(body as object);
        expect(r.status, `${method} ${url}`).toBe(403);
      }
    }
    await grower.get('/api/v1/audit').expect(403);
    await adviser.get('/api/v1/audit').expect(403);
  });

  it('another authority’s regulator sees none of this jurisdiction’s zones, rivers or notices (404 or empty)', async () => {
    expect((await outsider.get('/api/v1/zones').expect(200)).body.items).toEqual([]);
    await outsider.get(`/api/v1/zones/${inner.id}`).expect(404);
    await outsider.patch(`/api/v1/zones/${inner.id}`).send({ triggerFlow: 1 }).expect(404);
    await outsider.get(`/api/v1/zones/${inner.id}/trigger-sweep`).expect(404);
    await outsider.post(`/api/v1/zones/${inner.id}/samples`).send({ sampledAt: new Date().toISOString(), indicator: 1 }).expect(404);
    await outsider.post('/api/v1/closure-checks').send({ riverId: inner.riverId, flow: 1200 }).expect(404);
    await outsider
      .post('/api/v1/notices')
      .send({ kind: 'closure', zoneIds: [tolley.id] })
      .expect(404);
    expect((await outsider.get('/api/v1/notices').expect(200)).body.items).toEqual([]);
    expect((await regulator.get(`/api/v1/zones/${tolley.id}`).expect(200)).body.status).toBe('open');
  });

  it('the regulator’s closure check never includes a candidate site, even one shared with it', async () => {
    // Candidate sites are a grower's private plans; the zone workspace works on held leases only.
    const fb004 = await t.db.pool.query(
      `select l.id from leases l join users u on u.id = l.owner_id where u.email = 'grower@brackline.test' and l.lease_code = 'FB-004'`,
    );
    await grower
      .post('/api/v1/leases/shares')
      .send({ leaseIds: [fb004.rows[0].id], email: 'regulator@brackline.test' })
      .expect(200);
    // Shared, the regulator may read the lease itself…
    await regulator.get(`/api/v1/leases/${fb004.rows[0].id}`).expect(200);
    const c = (await regulator.post('/api/v1/closure-checks').send({ riverId: inner.riverId, flow: 1200 }).expect(200)).body;
    // …but it is no held lease: not in the check, not counted in the zone.
    expect(c.leases.map((l: { id: string }) => l.id)).not.toContain(fb004.rows[0].id);
    expect((await regulator.get(`/api/v1/zones/${inner.id}`).expect(200)).body.heldLeases).toBe(6);
    await t.db.pool.query(`delete from lease_shares where lease_id = $1`, [fb004.rows[0].id]);
  });
});
