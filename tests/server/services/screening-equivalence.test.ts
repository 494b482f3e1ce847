/**
 * Issue "Jurisdiction-scale speed": the optimised screening gives the same answers as the straightforward one.
 * The demo jurisdiction (its coast, rivers and leases) plus 160 generated leases across its sea (fixed seeds, so
 * the same leases every run) are screened for the Amberlin River inline, and every stored screening is compared
 * field by field with a snapshot taken from the code before the optimisation (tests/fixtures/screening/
 * amberlin-before.json; written by running this file with WRITE_SCREENING_SNAPSHOT=1 on that code).
 * Only the generated leases are compared (other test files add and change leases in the same database).
 * Keys are lease code × scenario name (ids are random per database). Exact for ratings, reasons, species and
 * counts; floating-point figures to 1e-9 relative, because PostGIS sums a lease's band pieces in no fixed order
 * (the last bits of a fraction differ between two runs of the same code).
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { createScreeningService } from '../../../server/services/screening.service';
import { createTestApp, type TestApp } from '../../helpers/test-app';

const SNAPSHOT = path.resolve(import.meta.dirname, '../../fixtures/screening/amberlin-before.json');
type Row = Record<string, unknown>;
let t: TestApp;
let rows: Row[] = [];

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  const owner = (await t.db.pool.query("SELECT id, jurisdiction_id FROM users WHERE email = 'grower3@brackline.test'")).rows[0];
  await t.db.db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'EQV-%'`);
  // 100 leases in the plume-prone sea near the mouth and 60 in open sea beyond the bay, most outside every plume
  // (ST_GeneratePoints seeds 5 and 6).
  await t.db.db.execute(sql`
    WITH sea AS (SELECT ST_Difference(ST_MakeEnvelope(-38.82, 41.02, -38.46, 41.38, 4326), (SELECT ST_Union(geom) FROM coasts WHERE form = 'land')) AS g),
         near AS (SELECT ST_Intersection((SELECT g FROM sea), ST_MakeEnvelope(-38.72, 41.12, -38.56, 41.28, 4326)) AS g),
         far AS (SELECT ST_Difference(ST_MakeEnvelope(-39.4, 40.5, -38.9, 41.9, 4326), (SELECT ST_Union(geom) FROM coasts WHERE form = 'land')) AS g),
         pts AS (SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM near), 100, 5))).geom AS p
                 UNION ALL SELECT (ST_Dump(ST_GeneratePoints((SELECT g FROM far), 60, 6))).geom)
    INSERT INTO leases (lease_code, status, species, owner_id, jurisdiction_id, geom, area_m2)
    SELECT 'EQV-' || lpad((row_number() OVER (ORDER BY ST_X(p), ST_Y(p)))::text, 3, '0'), 'held',
           (ARRAY['pacific-oyster', 'blue-mussel', NULL])[1 + (row_number() OVER (ORDER BY ST_X(p), ST_Y(p))) % 3],
           ${owner.id}, ${owner.jurisdiction_id}::uuid, ST_Multi(ST_Expand(p, 0.0006)), ST_Area(ST_Expand(p, 0.0006)::geography)
      FROM pts`);
  const river = (await t.db.pool.query("SELECT id FROM rivers WHERE name = 'Amberlin River'")).rows[0].id as string;
  await createScreeningService({ db: t.db.db }).screenRiver(river);
  const res = await t.db.pool.query(
    `SELECT l.lease_code, sc.name AS scenario, s.band_fractions, s.lowest_salinity, s.highest_indicator, s.days_below_tolerance,
            s.rating, s.score, s.reasons, s.numbers, s.model_version
       FROM screenings s JOIN leases l ON l.id = s.lease_id JOIN scenarios sc ON sc.id = s.scenario_id
      WHERE s.river_id = $1 AND l.lease_code LIKE 'EQV-%' ORDER BY l.lease_code, sc.name`,
    [river],
  );
  rows = res.rows;
  if (process.env.WRITE_SCREENING_SNAPSHOT === '1') writeFileSync(SNAPSHOT, `${JSON.stringify(rows)}\n`);
}, 600_000);

afterAll(async () => {
  // The files share one database: later tests count the jurisdiction's held leases.
  await t.db.db.execute(sql`DELETE FROM leases WHERE lease_code LIKE 'EQV-%'`);
  await t.close();
});

/** Compares two stored values: numbers to 1e-9 relative (1e-12 absolute near 0), everything else exactly. */
function same(a: unknown, b: unknown, where: string, diffs: string[]): void {
  if (typeof a === 'number' && typeof b === 'number') {
    if (Math.abs(a - b) > Math.max(1e-12, 1e-9 * Math.max(Math.abs(a), Math.abs(b)))) diffs.push(`${where}: ${b} → ${a}`);
    return;
  }
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    const keys = new Set([...Object.keys(a), ...Object.keys(b)]);
    for (const k of keys) same((a as Row)[k], (b as Row)[k], `${where}.${k}`, diffs);
    return;
  }
  if (a !== b) diffs.push(`${where}: ${JSON.stringify(b)} → ${JSON.stringify(a)}`);
}

describe('optimised screening against the straightforward one (snapshot before the optimisation)', () => {
  it('screens the same lease × scenario pairs, with leases inside and outside the plume', () => {
    expect(existsSync(SNAPSHOT)).toBe(true);
    const before = JSON.parse(readFileSync(SNAPSHOT, 'utf8')) as Row[];
    expect(rows.map((r) => `${r.lease_code}|${r.scenario}`)).toEqual(before.map((r) => `${r.lease_code}|${r.scenario}`));
    // The snapshot must exercise both paths: leases placed by their worst point and leases placed from outside.
    expect(before.some((r) => (r.band_fractions as Record<string, number>)['plume-edge'] > 0)).toBe(true);
    expect(before.some((r) => !((r.band_fractions as Record<string, number>)['plume-edge'] > 0))).toBe(true);
  });

  it('gives every screening the same fractions, salinity, indicator, days, rating, score, reasons and numbers', () => {
    const before = JSON.parse(readFileSync(SNAPSHOT, 'utf8')) as Row[];
    const diffs: string[] = [];
    for (const [i, r] of rows.entries()) same(r, before[i], `${r.lease_code} ${r.scenario}`, diffs);
    expect(diffs.slice(0, 20)).toEqual([]);
  });
});
