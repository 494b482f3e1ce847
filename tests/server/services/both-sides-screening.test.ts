/**
 * Issue 14 reproduction through the whole server path (real PostgreSQL + PostGIS, the inline
 * screening jobs): a grower's own coast at 41° S running north–south with the sea to the west, a
 * river mouth facing west with a 30-year record, and three 300 m leases 500 m offshore — 6 km south
 * (down-coast: in the south the current turns left of a westward outflow, science.md §1.1, a),
 * 6 km north (up-coast) and 45 km south.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { localProjection } from '../../../shared/geometry/local-projection';
import { syntheticRecordCsv } from '../../helpers/flood-record';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Row = { lease_code: string; aep: number; discharge: number; duration_hours: number; lowest_salinity: number | null; score: number; rating: string; numbers: { alongM: number | null } };
let rows: Row[] = [];
const MOUTH: [number, number] = [-38.6, -41];

/** A 300 m square lease, inner edge 500 m west of the coast, centred `north` m north of the mouth, as WKT. */
function leaseWkt(north: number): string {
  const p = localProjection(MOUTH);
  const ring = [
    [-500, north - 150],
    [-800, north - 150],
    [-800, north + 150],
    [-500, north + 150],
    [-500, north - 150],
  ].map((q) => p.inverse(q as [number, number]));
  return `MULTIPOLYGON(((${ring.map((c) => `${c[0]} ${c[1]}`).join(', ')})))`;
}

beforeAll(async () => {
  t = await createTestApp();
  await request(t.app).post('/api/v1/account/sign-up').send({ name: 'South Grower', email: 'south@brackline.test', password: 'south-grower-pw-1' });
  const grower = (await signIn(t.app, 'south@brackline.test', 'south-grower-pw-1')).agent;
  const me = (await t.db.pool.query(`SELECT id FROM users WHERE email = 'south@brackline.test'`)).rows[0].id;
  await t.db.pool.query(
    `INSERT INTO coasts (name, form, owner_id, shared, geom) VALUES ('South coast', 'line', $1, false, ST_SetSRID(ST_GeomFromText('LINESTRING(-38.6 -44, -38.6 -38)'), 4326))`,
    [me],
  );
  for (const [code, north] of [
    ['S6', -6000],
    ['N6', 6000],
    ['S45', -45_000],
  ] as const) {
    await t.db.pool.query(
      `INSERT INTO leases (lease_code, owner_id, geom, area_m2) VALUES ($1, $2, ST_SetSRID(ST_GeomFromText($3), 4326), 90000)`,
      [code, me, leaseWkt(north)],
    );
  }
  const river = await grower
    .post('/api/v1/rivers')
    .send({ name: 'South River', mouthLongitude: MOUTH[0], mouthLatitude: MOUTH[1], outflowAzimuthDeg: 270, mouthWidth: 1000, mouthDepth: 3, shelfSlope: 0.005 })
    .expect(201);
  const upload = await grower
    .post(`/api/v1/rivers/${river.body.id}/flow-records?units=m3s&waterYearStart=04-01`)
    .set('Content-Type', 'text/csv')
    .send(syntheticRecordCsv())
    .expect(201);
  expect(upload.body.fit.n).toBe(30);
  const res = await t.db.pool.query(
    `SELECT l.lease_code, sc.aep, sc.discharge, sc.duration_hours, s.lowest_salinity, s.score, s.rating, s.numbers
       FROM screenings s JOIN leases l ON l.id = s.lease_id JOIN scenarios sc ON sc.id = s.scenario_id
      WHERE s.river_id = $1 AND sc.kind = 'aep' ORDER BY sc.aep DESC, l.lease_code`,
    [river.body.id],
  );
  rows = res.rows;
}, 240_000);
afterAll(async () => {
  await t.close();
});

const at = (code: string) => rows.filter((r) => r.lease_code === code);

describe('both sides of the mouth and flood size, screened by the server', () => {
  it('screens every lease at every AEP scenario; prints the table', () => {
    for (const r of rows) console.log(`AEP ${r.aep} Q ${Math.round(r.discharge)} m³/s ${r.duration_hours} h ${r.lease_code}: lowest salinity ${r.lowest_salinity === null ? '—' : r.lowest_salinity.toFixed(2)}, score ${r.score.toFixed(3)} ${r.rating}, s ${r.numbers.alongM === null ? '—' : Math.round(r.numbers.alongM)} m`);
    expect(at('S6')).toHaveLength(6);
    expect(at('N6')).toHaveLength(6);
    expect(at('S45')).toHaveLength(6);
  });

  it('rarer floods last longer, from the record’s own hydrographs (science.md §1.11, c)', () => {
    const d = at('S6').map((r) => r.duration_hours);
    expect(d[d.length - 1]).toBeGreaterThan(d[0]);
    for (let i = 1; i < d.length; i += 1) expect(d[i]).toBeGreaterThanOrEqual(d[i - 1]);
  });

  it('the up-coast lease, outside the bulge, gets nothing from the river and keeps its own place (not "at the mouth")', () => {
    for (const r of at('N6')) {
      // a point on the lease, 5 850–6 150 m up-coast
      expect(r.numbers.alongM as number).toBeLessThan(-5800);
      expect(r.lowest_salinity).toBeNull();
      expect(r.score).toBe(0);
    }
  });

  it("the down-coast lease's lowest salinity falls and its score rises from the 50 % to the 1 % AEP flood", () => {
    const s6 = at('S6');
    expect(s6[0].numbers.alongM as number).toBeGreaterThan(5800);
    expect(s6[5].lowest_salinity as number).toBeLessThan(s6[0].lowest_salinity as number);
    expect(s6[5].score).toBeGreaterThan(s6[0].score);
    for (let i = 1; i < s6.length; i += 1) expect(s6[i].score).toBeGreaterThanOrEqual(s6[i - 1].score);
  });

  it('the 45 km lease is no worse than the 6 km one', () => {
    const s6 = at('S6');
    const s45 = at('S45');
    for (let i = 0; i < s6.length; i += 1) {
      expect(s45[i].score).toBeLessThanOrEqual(s6[i].score);
      if (s45[i].lowest_salinity !== null) expect(s45[i].lowest_salinity as number).toBeGreaterThanOrEqual(s6[i].lowest_salinity as number);
    }
  });
});
