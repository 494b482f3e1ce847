/**
 * Rivers, their flow records and their flood scenarios. A river belongs to a jurisdiction and
 * is read by everyone in it; its creator and the jurisdiction's regulators may change it.
 * Every change bumps the river's version, so footprints and screenings built on older inputs
 * are recomputed (see screening.service.ts).
 */
import { sql } from 'drizzle-orm';
import { annualMaxima } from '#shared/hydrology/annual-maxima';
import { fitFloodFrequency, type FloodFrequencyResult } from '#shared/hydrology/flood-frequency';
import { durationsForFlows, floodEvents, typicalDurationForPeak } from '#shared/hydrology/flood-duration';
import { flowPercentiles, seasonalScenarioName } from '#shared/hydrology/flow-percentiles';
import { FlowSourceError, type FlowSourceResult, readFlowSource } from '#shared/hydrology/read-flow-source';
import { plumeProfiles, riverPlume } from '#shared/physics/river-plume';
import {
  applyRiverDefaults,
  DEFAULTABLE_FIELDS,
  type River,
  type RiverCreate,
  type RiverSettings,
  type RiverUpdate,
  type Scenario,
  type ScenarioCreate,
} from '#shared/schemas/river';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors';
import { recordAudit } from './audit.service';
import { checkMouthOnBuiltinCoast, mouthError, uploadedCoastNear } from './builtin-coast.service';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

/** The flood-frequency scenarios every river with a record gets (annual exceedance probabilities). */
export const SCENARIO_AEPS = [0.5, 0.2, 0.1, 0.04, 0.02, 0.01] as const;

type RiverRow = {
  id: string;
  name: string;
  jurisdiction_id: string | null;
  owner_id: string | null;
  settings: RiverSettings;
  defaults_used: string[];
  version: number;
  created_at: Date;
  updated_at: Date;
  has_record: boolean;
  coast_source: 'upload' | 'traced' | 'builtin' | null;
};

function toRiver(r: RiverRow): River {
  return {
    id: r.id,
    name: r.name,
    jurisdictionId: r.jurisdiction_id,
    ownerId: r.owner_id,
    settings: r.settings,
    defaultsUsed: r.defaults_used,
    version: r.version,
    hasFlowRecord: r.has_record,
    coastSource: r.coast_source ?? null,
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
  };
}

/**
 * Rivers a user may read: their own, those of their jurisdiction, those that screen one of their
 * leases (issue #15: a river of any jurisdiction whose plume reaches the lease), and a grower's
 * advisers' rivers (an accepted client link shares them).
 */
export function visibleRivers(user: CurrentUser, alias = 'r') {
  const a = sql.raw(alias);
  if (user.role === 'admin') return sql`false`;
  return sql`(${a}.owner_id = ${user.id} OR (${a}.jurisdiction_id IS NOT NULL AND ${a}.jurisdiction_id = ${user.jurisdictionId}::uuid)
    OR EXISTS (SELECT 1 FROM screenings vs JOIN leases vl ON vl.id = vs.lease_id WHERE vs.river_id = ${a}.id AND vl.owner_id = ${user.id})
    OR EXISTS (SELECT 1 FROM client_invitations vc WHERE vc.status = 'accepted' AND vc.adviser_id = ${a}.owner_id AND vc.grower_id = ${user.id}))`;
}

function ordinalAep(aep: number): string {
  const years = Math.round(1 / aep);
  return `1-in-${years}-year flood (${(aep * 100).toLocaleString('en', { maximumFractionDigits: 1 })}% AEP)`;
}

export function createRiversService(deps: { db: Database; onRiverChanged?: (riverId: string) => Promise<void> | void }) {
  const { db } = deps;
  const changed = async (riverId: string) => {
    await deps.onRiverChanged?.(riverId);
  };

  async function load(user: CurrentUser, id: string): Promise<RiverRow> {
    const res = await db.execute<RiverRow>(sql`
      SELECT r.*, EXISTS (SELECT 1 FROM flow_records f WHERE f.river_id = r.id AND f.active) AS has_record, (SELECT c.source FROM coasts c WHERE c.id = r.coast_id) AS coast_source
        FROM rivers r WHERE r.id = ${id}::uuid AND ${visibleRivers(user)}`);
    if (!res.rows[0]) throw new NotFoundError('No river with this id that you can see.');
    return res.rows[0];
  }

  function requireEditor(user: CurrentUser, river: RiverRow) {
    const isOwner = river.owner_id === user.id;
    const isRegulator = user.role === 'regulator' && river.jurisdiction_id === user.jurisdictionId;
    if (!isOwner && !isRegulator) {
      throw new ForbiddenError("Only the river's creator or a regulator of its jurisdiction can change it.");
    }
  }

  async function list(user: CurrentUser): Promise<River[]> {
    const res = await db.execute<RiverRow>(sql`
      SELECT r.*, EXISTS (SELECT 1 FROM flow_records f WHERE f.river_id = r.id AND f.active) AS has_record, (SELECT c.source FROM coasts c WHERE c.id = r.coast_id) AS coast_source
        FROM rivers r WHERE ${visibleRivers(user)} ORDER BY r.name`);
    return res.rows.map(toRiver);
  }

  async function get(user: CurrentUser, id: string): Promise<River> {
    return toRiver(await load(user, id));
  }

  /**
   * The coast a river at this mouth walks when none is chosen: an uploaded coast the user may use near
   * the mouth (then null: the usual choice in screening), else the built-in world coastline, which
   * also checks the mouth is on the coast (refusing a mouth on land or far from any coast).
   */
  async function builtinCoastFor(user: CurrentUser, lon: number, lat: number, t: Tx | Database): Promise<string | null> {
    if (await uploadedCoastNear(t, user, lon, lat)) return null;
    const check = await checkMouthOnBuiltinCoast(db, lon, lat);
    if (check.problem) throw mouthError(check);
    return check.coastId;
  }

  async function create(user: CurrentUser, input: RiverCreate, tx?: Tx): Promise<River> {
    const builtin = input.coastId ? null : await builtinCoastFor(user, input.mouthLongitude, input.mouthLatitude, tx ?? db);
    const body = builtin ? { ...input, coastId: builtin } : input;
    const { settings, defaultsUsed } = applyRiverDefaults(body);
    const run = async (t: Tx | Database) => {
      const res = await t.execute<{ id: string }>(sql`
        INSERT INTO rivers (name, jurisdiction_id, owner_id, settings, defaults_used, mouth, coast_id)
        VALUES (${body.name}, ${user.jurisdictionId}::uuid, ${user.id}, ${JSON.stringify(settings)}::jsonb, ${JSON.stringify(defaultsUsed)}::jsonb,
                ST_SetSRID(ST_MakePoint(${body.mouthLongitude}, ${body.mouthLatitude}), 4326), ${body.coastId ?? null}::uuid)
        RETURNING id`);
      await recordAudit(t, { actorId: user.id, action: 'river.create', subjectType: 'river', subjectId: res.rows[0].id, jurisdictionId: user.jurisdictionId, after: settings });
      return res.rows[0].id;
    };
    const id = tx ? await run(tx) : await db.transaction(run);
    return get(user, id);
  }

  async function update(user: CurrentUser, id: string, patch: RiverUpdate): Promise<River> {
    const river = await load(user, id);
    requireEditor(user, river);
    const merged = { ...river.settings, ...patch } as RiverCreate;
    const mouthMoved =
      (patch.mouthLongitude !== undefined && patch.mouthLongitude !== river.settings.mouthLongitude) ||
      (patch.mouthLatitude !== undefined && patch.mouthLatitude !== river.settings.mouthLatitude);
    if (mouthMoved && patch.coastId === undefined && (river.coast_source === 'builtin' || !river.settings.coastId)) {
      // A moved mouth on the built-in coast is checked again (and may need another window of it).
      merged.coastId = (await builtinCoastFor(user, merged.mouthLongitude, merged.mouthLatitude, db)) ?? undefined;
    }
    // A field the user sets stops being a default; the rest keep their flag.
    const stillDefault = river.defaults_used.filter((f) => !(f in patch));
    const { settings } = applyRiverDefaults(merged);
    const defaultsUsed = DEFAULTABLE_FIELDS.filter((f) => stillDefault.includes(f));
    await db.transaction(async (tx) => {
      await tx.execute(sql`
        UPDATE rivers SET name = ${settings.name}, settings = ${JSON.stringify(settings)}::jsonb, defaults_used = ${JSON.stringify(defaultsUsed)}::jsonb,
               mouth = ST_SetSRID(ST_MakePoint(${settings.mouthLongitude}, ${settings.mouthLatitude}), 4326),
               coast_id = ${settings.coastId ?? null}::uuid, version = version + 1, updated_at = now()
         WHERE id = ${id}::uuid`);
      await recordAudit(tx, { actorId: user.id, action: 'river.update', subjectType: 'river', subjectId: id, jurisdictionId: river.jurisdiction_id, before: river.settings, after: settings });
    });
    await changed(id);
    return get(user, id);
  }

  async function uploadFlowRecord(
    user: CurrentUser,
    id: string,
    csv: string,
    options: {
      units: 'm3s' | 'cfs' | 'auto';
      waterYearStart: string;
      acceptProblems: boolean;
      fileName?: string;
      dateColumn?: string;
      dischargeColumn?: string;
      qualityColumn?: string;
      dropProvisional?: boolean;
      daily?: 'max' | 'mean';
    },
    tx?: Tx,
  ) {
    const river = await load(user, id);
    requireEditor(user, river);
    let parsed: FlowSourceResult;
    try {
      parsed = readFlowSource(csv, {
        units: options.units,
        dateColumn: options.dateColumn,
        dischargeColumn: options.dischargeColumn,
        qualityColumn: options.qualityColumn,
        dropProvisional: options.dropProvisional,
        daily: options.daily,
      });
    } catch (err) {
      if (err instanceof FlowSourceError) throw new UnprocessableError(err.message);
      throw err;
    }
    if (parsed.problems.length && !options.acceptProblems) {
      throw new UnprocessableError(
        `${parsed.problems.length} of ${parsed.rows} rows have problems (first: row ${parsed.problems[0].row}, ${parsed.problems[0].reason}). Fix them and upload again, or upload with acceptProblems=true to continue without those rows.`,
        { rows: parsed.rows, problems: parsed.problems.slice(0, 1000), problemCount: parsed.problems.length },
      );
    }
    if (parsed.readings.length < 365) {
      throw new UnprocessableError(`The record holds ${parsed.readings.length} usable readings; flood-frequency analysis needs at least a year of data (and ideally 10 years or more).`);
    }
    const peaks = annualMaxima(parsed.readings, { waterYearStart: options.waterYearStart });
    const complete = peaks.filter((p) => p.complete);
    if (complete.length < 3) {
      throw new UnprocessableError(`The record has ${complete.length} complete water years; at least 3 are needed to fit a flood-frequency curve (10 or more to trust it).`);
    }
    let fit: FloodFrequencyResult;
    try {
      fit = fitFloodFrequency({ annualPeaks: complete.map((p) => p.discharge), waterYears: complete.map((p) => p.waterYear), bootstrapResamples: 200, seed: 1 });
    } catch (err) {
      throw new UnprocessableError((err as Error).message);
    }
    const typical = typicalDurationForPeak(parsed.readings, { waterYearStart: options.waterYearStart });
    const percentiles = flowPercentiles(parsed.readings, { percentiles: [50, 90, 95, 99] });
    const distribution = river.settings.designDistribution ?? 'gev';
    const quantiles = fit[distribution].quantiles;
    const durationHours = Math.max(24, Math.round(typical.medianHours ?? 72));
    // Each design flood lasts as long as the record's own floods of that size (time above half the peak).
    const scenarioQuantiles = quantiles.filter((q) => SCENARIO_AEPS.some((a) => Math.abs(a - q.aep) < 1e-9));
    const perFlow = durationsForFlows(typical.events, scenarioQuantiles.map((q) => q.discharge));
    const durationOf = new Map(scenarioQuantiles.map((q, i) => [q.aep, Math.max(24, Math.round(perFlow.hours[i]))]));

    const run = async (t: Tx) => {
      await t.execute(sql`UPDATE flow_records SET active = false WHERE river_id = ${id}::uuid`);
      const rec = await t.execute<{ id: string }>(sql`
        INSERT INTO flow_records (river_id, file_name, units, water_year_start, uploaded_by, reading_count, first_time, last_time, interval, problems, gaps, annual_peaks, fit, durations, percentiles)
        VALUES (${id}::uuid, ${options.fileName ?? 'record.csv'}, ${parsed.units}, ${options.waterYearStart}, ${user.id}, ${parsed.readings.length},
                ${parsed.readings[0].time}::timestamptz, ${parsed.readings.at(-1)!.time}::timestamptz, ${parsed.interval},
                ${JSON.stringify(parsed.problems.slice(0, 1000))}::jsonb, ${JSON.stringify(parsed.gaps)}::jsonb, ${JSON.stringify(peaks)}::jsonb,
                ${JSON.stringify(fit)}::jsonb, ${JSON.stringify({ medianHours: typical.medianHours, meanHours: typical.meanHours, fraction: typical.fraction })}::jsonb,
                ${JSON.stringify(percentiles)}::jsonb)
        RETURNING id`);
      const recordId = rec.rows[0].id;
      const CHUNK = 5000;
      for (let i = 0; i < parsed.readings.length; i += CHUNK) {
        const chunk = parsed.readings.slice(i, i + CHUNK).map((r) => ({ t: r.time, q: r.discharge }));
        await t.execute(sql`
          INSERT INTO flow_readings (record_id, t, discharge)
          SELECT ${recordId}::uuid, x.t, x.q FROM jsonb_to_recordset(${JSON.stringify(chunk)}::jsonb) AS x(t timestamptz, q double precision)`);
      }
      await t.execute(sql`DELETE FROM scenarios WHERE river_id = ${id}::uuid AND kind IN ('aep', 'seasonal')`);
      for (const q of quantiles) {
        if (!SCENARIO_AEPS.some((a) => Math.abs(a - q.aep) < 1e-9)) continue;
        await t.execute(sql`
          INSERT INTO scenarios (river_id, name, kind, aep, discharge, duration_hours, source)
          VALUES (${id}::uuid, ${ordinalAep(q.aep)}, 'aep', ${q.aep}, ${q.discharge}, ${durationOf.get(q.aep) ?? durationHours},
                  ${JSON.stringify({ distribution, lower: q.lower ?? null, upper: q.upper ?? null, durationRule: 'time above half the peak, from the record’s annual floods by peak size', durationExponent: perFlow.exponent, durationWarnings: perFlow.warnings, recordId })}::jsonb)`);
      }
      for (const season of percentiles.seasonal) {
        const p99 = season.percentiles.find((p) => p.p === 99)?.discharge;
        if (!p99) continue;
        const events = floodEvents(parsed.readings, p99);
        await t.execute(sql`
          INSERT INTO scenarios (river_id, name, kind, aep, discharge, duration_hours, source)
          VALUES (${id}::uuid, ${seasonalScenarioName(season, 99)}, 'seasonal', NULL, ${p99},
                  ${Math.max(24, Math.round(events.medianHours ?? 24))}, ${JSON.stringify({ season: season.label, percentile: 99, recordId })}::jsonb)`);
      }
      await t.execute(sql`UPDATE rivers SET version = version + 1, updated_at = now() WHERE id = ${id}::uuid`);
      await recordAudit(t, {
        actorId: user.id,
        action: 'river.flow-record',
        subjectType: 'river',
        subjectId: id,
        jurisdictionId: river.jurisdiction_id,
        after: { recordId, readings: parsed.readings.length, problems: parsed.problems.length, years: complete.length },
      });
      return recordId;
    };
    const recordId = tx ? await run(tx) : await db.transaction(run);
    if (!tx) await changed(id);
    return {
      recordId,
      rows: parsed.rows,
      readings: parsed.readings.length,
      problems: parsed.problems.slice(0, 1000),
      gaps: parsed.gaps,
      annualPeaks: peaks,
      fit,
      typicalDurationHours: durationHours,
      warnings: [parsed.unitsNote, ...parsed.warnings, ...fit.warnings, ...perFlow.warnings],
      format: parsed.format,
      units: parsed.units,
      unitsNote: parsed.unitsNote,
      columns: parsed.columns,
      qualityCodes: parsed.qualityCodes,
      droppedProvisional: parsed.droppedProvisional,
      aggregated: parsed.aggregated,
    };
  }

  async function flowRecord(user: CurrentUser, id: string) {
    await load(user, id);
    const res = await db.execute(sql`SELECT id, file_name, units, water_year_start, uploaded_at, reading_count, first_time, last_time, interval, problems, gaps, annual_peaks, fit, durations, percentiles
      FROM flow_records WHERE river_id = ${id}::uuid AND active`);
    if (!res.rows[0]) throw new NotFoundError('This river has no flow record yet. Upload a CSV of dates and discharges.');
    return res.rows[0];
  }

  async function readings(user: CurrentUser, id: string, maxPoints = 5000) {
    await load(user, id);
    // Thinned to at most maxPoints by keeping each bucket's maximum, so floods stay visible.
    const res = await db.execute<{ t: Date; q: number }>(sql`
      WITH r AS (SELECT fr.t, fr.discharge FROM flow_readings fr JOIN flow_records f ON f.id = fr.record_id WHERE f.river_id = ${id}::uuid AND f.active),
           n AS (SELECT count(*) AS c FROM r),
           b AS (SELECT t, discharge, ntile(LEAST((SELECT c FROM n), ${maxPoints})::int) OVER (ORDER BY t) AS bucket FROM r)
      SELECT DISTINCT ON (bucket) t, discharge AS q FROM b ORDER BY bucket, discharge DESC`);
    return res.rows.map((r) => ({ t: new Date(r.t).toISOString(), q: r.q }));
  }

  async function scenarios(user: CurrentUser, riverId: string): Promise<Scenario[]> {
    await load(user, riverId);
    const res = await db.execute<{ id: string; river_id: string; name: string; kind: Scenario['kind']; aep: number | null; discharge: number; duration_hours: number; source: Scenario['source'] }>(sql`
      SELECT * FROM scenarios WHERE river_id = ${riverId}::uuid ORDER BY kind, aep DESC NULLS LAST, discharge`);
    return res.rows.map((s) => ({ id: s.id, riverId: s.river_id, name: s.name, kind: s.kind, aep: s.aep, discharge: s.discharge, durationHours: s.duration_hours, source: s.source }));
  }

  async function createScenario(user: CurrentUser, riverId: string, body: ScenarioCreate) {
    const river = await load(user, riverId);
    requireEditor(user, river);
    const res = await db.execute<{ id: string }>(sql`
      INSERT INTO scenarios (river_id, name, kind, discharge, duration_hours, source)
      VALUES (${riverId}::uuid, ${body.name}, 'manual', ${body.discharge}, ${body.durationHours}, ${JSON.stringify({ typedBy: user.id })}::jsonb) RETURNING id`);
    await changed(riverId);
    return (await scenarios(user, riverId)).find((s) => s.id === res.rows[0].id)!;
  }

  async function loadScenario(user: CurrentUser, scenarioId: string) {
    const res = await db.execute<{ river_id: string; kind: string }>(sql`SELECT river_id, kind FROM scenarios WHERE id = ${scenarioId}::uuid`);
    if (!res.rows[0]) throw new NotFoundError('No scenario with this id.');
    const river = await load(user, res.rows[0].river_id);
    return { river, kind: res.rows[0].kind };
  }

  async function updateScenario(user: CurrentUser, scenarioId: string, patch: { name?: string; durationHours?: number }) {
    const { river } = await loadScenario(user, scenarioId);
    requireEditor(user, river);
    await db.execute(sql`
      UPDATE scenarios SET name = COALESCE(${patch.name ?? null}, name), duration_hours = COALESCE(${patch.durationHours ?? null}, duration_hours)
       WHERE id = ${scenarioId}::uuid`);
    await changed(river.id);
    return (await scenarios(user, river.id)).find((s) => s.id === scenarioId)!;
  }

  async function deleteScenario(user: CurrentUser, scenarioId: string) {
    const { river, kind } = await loadScenario(user, scenarioId);
    requireEditor(user, river);
    if (kind !== 'manual') {
      throw new ForbiddenError('Scenarios from the flood-frequency fit and the seasonal percentiles come from the record; upload a new record to change them.');
    }
    await db.execute(sql`DELETE FROM scenarios WHERE id = ${scenarioId}::uuid`);
  }

  /** The plume numbers and profiles of one scenario, from the river's saved settings. */
  async function scenarioPlume(user: CurrentUser, scenarioId: string) {
    const { river } = await loadScenario(user, scenarioId);
    const scenario = (await scenarios(user, river.id)).find((s) => s.id === scenarioId)!;
    try {
      const { plume, params } = riverPlume(river.settings, { discharge: scenario.discharge, durationHours: scenario.durationHours });
      return { scenario, riverVersion: river.version, plume, profiles: plumeProfiles(plume, params) };
    } catch (err) {
      if (err instanceof RangeError) throw new UnprocessableError(`The plume cannot be computed with these settings: ${err.message}. Change the river's settings.`);
      throw err;
    }
  }

  return { list, get, create, update, uploadFlowRecord, flowRecord, readings, scenarios, createScenario, updateScenario, deleteScenario, scenarioPlume, load };
}

export type RiversService = ReturnType<typeof createRiversService>;
