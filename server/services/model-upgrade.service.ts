/**
 * Carrying stored rivers and screenings over to a new model version at start-up:
 * - river settings saved with the old fixed alongshore "mixingLength" get the entrainment
 *   coefficient that gives the same dilution length at the river's median annual peak flow
 *   (science.md §1.11; without a flow record, the documented default);
 * - every river with a screening of an older model version is queued for re-screening, so no
 *   stored result from the old model is shown as current; footprints of an older model that no
 *   screening uses are deleted.
 */
import { sql } from 'drizzle-orm';
import { DEFAULT_ENTRAINMENT_COEFFICIENT } from '#shared/physics/constants';
import { MODEL_VERSION } from '#shared/physics/model-version';
import { entrainmentForDilutionLength, type RiverPlumeSettings } from '#shared/physics/river-plume';
import { applyRiverDefaults, type RiverCreate } from '#shared/schemas/river';
import type { Database } from '../db/client';
import type { ScreeningJobs } from '../jobs/screening-jobs';

/** Median of the complete annual peaks of a river's active flow record, or null without one. */
async function medianAnnualPeak(db: Database, riverId: string): Promise<number | null> {
  const res = await db.execute<{ annual_peaks: { discharge: number; complete?: boolean }[] | null }>(sql`
    SELECT annual_peaks FROM flow_records WHERE river_id = ${riverId}::uuid AND active ORDER BY uploaded_at DESC LIMIT 1`);
  const peaks = (res.rows[0]?.annual_peaks ?? [])
    .filter((p) => p.complete !== false && p.discharge > 0)
    .map((p) => p.discharge)
    .sort((a, b) => a - b);
  if (!peaks.length) return null;
  const m = Math.floor(peaks.length / 2);
  return peaks.length % 2 ? peaks[m] : (peaks[m - 1] + peaks[m]) / 2;
}

/**
 * Replaces a river's fixed mixing length by the entrainment coefficient giving the same dilution
 * length at its median annual peak (the default coefficient when it has no record), bumping the
 * river's version so its footprints are rebuilt.
 *
 * @returns the coefficient written
 */
export async function carryMixingLength(db: Database, riverId: string, mixingLength: number): Promise<number> {
  const res = await db.execute<{ settings: Record<string, unknown>; defaults_used: string[] }>(sql`
    SELECT settings, defaults_used FROM rivers WHERE id = ${riverId}::uuid`);
  const row = res.rows[0];
  if (!row) throw new Error(`no river ${riverId}`);
  const { mixingLength: _old, ...rest } = row.settings;
  const filled = applyRiverDefaults({ ...rest, entrainmentCoefficient: undefined } as unknown as RiverCreate).settings;
  const reference = await medianAnnualPeak(db, riverId);
  const coefficient =
    reference === null ? DEFAULT_ENTRAINMENT_COEFFICIENT : entrainmentForDilutionLength(filled as unknown as RiverPlumeSettings, mixingLength, reference);
  const settings = { ...rest, entrainmentCoefficient: coefficient };
  const defaultsUsed = row.defaults_used.filter((d) => d !== 'mixingLength' && d !== 'entrainmentCoefficient');
  if (reference === null) defaultsUsed.push('entrainmentCoefficient');
  await db.execute(sql`
    UPDATE rivers SET settings = ${JSON.stringify(settings)}::jsonb, defaults_used = ${JSON.stringify(defaultsUsed)}::jsonb,
           version = version + 1, updated_at = now()
     WHERE id = ${riverId}::uuid`);
  return coefficient;
}

/**
 * Start-up step: carries legacy river settings over (see the module comment) and queues every
 * river whose stored screenings come from another model version.
 *
 * @returns the ids of the rivers carried over and of those queued
 */
export async function upgradeStoredModel(db: Database, jobs: Pick<ScreeningJobs, 'enqueueRiver'>): Promise<{ carried: string[]; queued: string[] }> {
  const legacy = await db.execute<{ id: string; mixing_length: number | string }>(sql`
    SELECT id, settings->>'mixingLength' AS mixing_length FROM rivers
     WHERE settings ? 'mixingLength' AND NOT settings ? 'entrainmentCoefficient'`);
  const carried: string[] = [];
  for (const r of legacy.rows) {
    const length = Number(r.mixing_length);
    if (length > 0) {
      await carryMixingLength(db, r.id, length);
      carried.push(r.id);
    }
  }
  const stale = await db.execute<{ river_id: string }>(sql`
    SELECT DISTINCT river_id FROM screenings WHERE model_version <> ${MODEL_VERSION}`);
  // Footprints of an older model that no screening uses any more are only clutter: drop them
  // (the ones still in use go once their river is re-screened, at a later start-up).
  await db.execute(sql`
    DELETE FROM footprints f WHERE f.model_version <> ${MODEL_VERSION}
       AND NOT EXISTS (SELECT 1 FROM screenings s WHERE s.footprint_id = f.id)`);
  const queued = [...new Set([...carried, ...stale.rows.map((r) => r.river_id)])];
  for (const id of queued) await jobs.enqueueRiver(id);
  return { carried, queued };
}
