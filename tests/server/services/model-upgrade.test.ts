/**
 * Start-up upgrade to a new model version (issue 14 item 6): stored screenings and footprints of
 * an older model are re-screened, and river settings saved with the old fixed mixing length get the
 * entrainment coefficient that gives the same dilution length at the river's median annual peak.
 * Runs on the invented demo region, on the real test database.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { createInlineScreeningJobs } from '../../../server/jobs/screening-jobs';
import { upgradeStoredModel } from '../../../server/services/model-upgrade.service';
import { createScreeningService } from '../../../server/services/screening.service';
import { computePlume } from '../../../shared/physics/compute-plume';
import { MODEL_VERSION } from '../../../shared/physics/model-version';
import { createTestApp, type TestApp } from '../../helpers/test-app';

let t: TestApp;
let amberlinId: string;

beforeAll(async () => {
  t = await createTestApp();
  await seedDemoRegion(t.db.db);
  amberlinId = (await t.db.pool.query(`SELECT id FROM rivers WHERE name = 'Amberlin River'`)).rows[0].id;
}, 180_000);
afterAll(async () => {
  await t.close();
});

describe('upgradeStoredModel', () => {
  it('re-screens results of an older model version and carries a legacy mixing length over to the entrainment coefficient', async () => {
    const pool = t.db.pool;
    // Make the demo's Amberlin River look as the old model left it.
    await pool.query(`UPDATE screenings SET model_version = 'brackline-model-1.0.0', rating = 'severe' WHERE river_id = $1`, [amberlinId]);
    // (an older model's footprints carry its version in their input hash too)
    await pool.query(`UPDATE footprints SET model_version = 'brackline-model-1.0.0', input_hash = 'v1-' || input_hash WHERE river_id = $1`, [amberlinId]);
    await pool.query(
      `UPDATE rivers SET settings = (settings - 'entrainmentCoefficient') || '{"mixingLength": 25000}'::jsonb,
              defaults_used = defaults_used || '["mixingLength"]'::jsonb WHERE id = $1`,
      [amberlinId],
    );
    const versionBefore = (await pool.query(`SELECT version FROM rivers WHERE id = $1`, [amberlinId])).rows[0].version;
    const stale = await pool.query(`SELECT count(*)::int AS n FROM screenings WHERE river_id = $1`, [amberlinId]);
    expect(stale.rows[0].n).toBeGreaterThan(0);

    const jobs = createInlineScreeningJobs(t.db.db, createScreeningService({ db: t.db.db }));
    const result = await upgradeStoredModel(t.db.db, jobs);
    expect(result.carried).toEqual([amberlinId]);
    expect(result.queued).toContain(amberlinId);

    // Settings: no mixing length; E = (2/3)·H0(Q_ref)/(φ0·L) at the median annual peak (science.md §1.11, c).
    const row = (await pool.query(`SELECT settings, defaults_used, version FROM rivers WHERE id = $1`, [amberlinId])).rows[0];
    expect(row.settings.mixingLength).toBeUndefined();
    expect(row.defaults_used).not.toContain('mixingLength');
    expect(row.version).toBeGreaterThan(versionBefore);
    const peaks = (await pool.query(`SELECT annual_peaks FROM flow_records WHERE river_id = $1 AND active`, [amberlinId])).rows[0].annual_peaks as {
      discharge: number;
      complete?: boolean;
    }[];
    const sorted = peaks.filter((p) => p.complete !== false).map((p) => p.discharge).sort((a, b) => a - b);
    const m = Math.floor(sorted.length / 2);
    const median = sorted.length % 2 ? sorted[m] : (sorted[m - 1] + sorted[m]) / 2;
    const s = row.settings;
    const plume = computePlume({
      latitude: s.mouthLatitude,
      discharge: median,
      riverSalinity: s.riverSalinity,
      riverTemperature: s.riverTemperature,
      seaSalinity: s.seaSalinity,
      seaTemperature: s.seaTemperature,
      mouthWidth: s.mouthWidth,
      mouthDepth: s.mouthDepth,
      shelfSlope: s.shelfSlope,
      alongshoreShare: s.alongshoreShare,
    });
    const expected = ((2 / 3) * plume.depth) / (s.nearFieldFreshwaterFraction * 25_000);
    expect(Math.abs(s.entrainmentCoefficient / expected - 1)).toBeLessThan(1e-3);

    // Every stored result of that river is from the current model now.
    const old = await pool.query(`SELECT count(*)::int AS n FROM screenings WHERE river_id = $1 AND model_version <> $2`, [amberlinId, MODEL_VERSION]);
    expect(old.rows[0].n).toBe(0);
    const fresh = await pool.query(`SELECT count(*)::int AS n FROM screenings WHERE river_id = $1 AND model_version = $2`, [amberlinId, MODEL_VERSION]);
    // every screening that was stale is redone (other test files sharing the database may have added leases since)
    expect(fresh.rows[0].n).toBeGreaterThanOrEqual(stale.rows[0].n);

    // A second start-up finds nothing to do, and the old footprints no screening uses are gone.
    const again = await upgradeStoredModel(t.db.db, jobs);
    expect(again).toEqual({ carried: [], queued: [] });
    const oldFootprints = await pool.query(`SELECT count(*)::int AS n FROM footprints WHERE river_id = $1 AND model_version <> $2`, [amberlinId, MODEL_VERSION]);
    expect(oldFootprints.rows[0].n).toBe(0);
  }, 300_000);
});
