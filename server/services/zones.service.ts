/**
 * The regulator's workspace (issue #8): closure zones and their plan values, sample results,
 * the trigger sweep (the model's justification of a trigger flow), closure checks, notices to
 * growers, the audit log and the public status page.
 *
 * Privacy: a regulator reaches only the zones of its own jurisdiction (others answer 404), and
 * sees only *held* leases there; a grower's candidate sites never appear in a zone's lease
 * counts, in closure checks or among a notice's recipients.
 */
import { sql } from 'drizzle-orm';
import { fieldAt } from '#shared/physics/exposure-field';
import { MODEL_VERSION } from '#shared/physics/model-version';
import { footprintCoastFrame, placePoints } from './coast-positions';
import type {
  AuditEntry,
  ClosureCheckRequest,
  ClosureCheckResult,
  Notice,
  NoticeCreate,
  PublicStatus,
  SampleCreate,
  TriggerSweep,
  Zone,
  ZoneCreate,
  ZoneSample,
  ZoneStatus,
  ZoneUpdate,
} from '#shared/schemas/zones';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors';
import { logger } from '../lib/logger';
import type { Mailer } from '../mail/mailer';
import { recordAudit } from './audit.service';
import { deliverToInbox } from './inbox.service';
import type { RiversService } from './rivers.service';
import { plumeFor, type ScreeningService } from './screening.service';
import { aepOfFlow } from './sweep.service';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

const DAY_MS = 86_400_000;
/** Points scattered over a zone to measure the share of it inside a band (c: a Monte Carlo area estimate; 400 points give ±2.5 % at worst). */
const SWEEP_POINTS = 400;

type ZoneRow = {
  id: string;
  name: string;
  jurisdiction_id: string;
  river_id: string | null;
  river_name: string | null;
  gauge_id: string | null;
  gauge_code: string | null;
  gauge_name: string | null;
  trigger_flow: number | null;
  min_closure_days: number | null;
  indicator_standard: number | null;
  status: ZoneStatus;
  status_since: Date;
  area_m2: number;
  held_leases: number;
  geometry?: string;
};

function earliestReopening(r: Pick<ZoneRow, 'status' | 'status_since' | 'min_closure_days'>): Date | null {
  if (r.status === 'open') return null;
  return new Date(new Date(r.status_since).getTime() + (r.min_closure_days ?? 0) * DAY_MS);
}

function toZone(r: ZoneRow): Zone {
  const earliest = earliestReopening(r);
  return {
    id: r.id,
    name: r.name,
    riverId: r.river_id,
    riverName: r.river_name,
    gaugeId: r.gauge_id,
    gaugeCode: r.gauge_code,
    gaugeName: r.gauge_name,
    triggerFlow: r.trigger_flow,
    minClosureDays: r.min_closure_days,
    indicatorStandard: r.indicator_standard,
    status: r.status,
    statusSince: new Date(r.status_since).toISOString(),
    earliestReopening: earliest ? earliest.toISOString() : null,
    areaM2: r.area_m2,
    heldLeases: r.held_leases,
    ...(r.geometry ? { geometry: JSON.parse(r.geometry) } : {}),
  };
}

const SELECT_ZONE = (withGeometry: boolean) => sql`
  SELECT z.id, z.name, z.jurisdiction_id, z.river_id, r.name AS river_name, z.gauge_id, g.code AS gauge_code, g.name AS gauge_name,
         z.trigger_flow, z.min_closure_days, z.indicator_standard, z.status, z.status_since, z.area_m2,
         (SELECT count(*)::int FROM leases l WHERE l.status = 'held' AND l.jurisdiction_id = z.jurisdiction_id AND ST_Intersects(l.geom, z.geom)) AS held_leases
         ${withGeometry ? sql`, ST_AsGeoJSON(z.geom, 6) AS geometry` : sql``}
    FROM closure_zones z LEFT JOIN rivers r ON r.id = z.river_id LEFT JOIN gauges g ON g.id = z.gauge_id`;

const fmtDate = (d: Date) => `${d.toISOString().replace('T', ' ').slice(0, 16)} UTC`;

/** The regulator's jurisdiction, or a clear refusal when its account has none. */
function jurisdictionOf(user: CurrentUser): string {
  if (!user.jurisdictionId)
    throw new ForbiddenError('Your account has no jurisdiction, so it manages no closure zones. Ask an administrator to set it.');
  return user.jurisdictionId;
}

export function createZonesService(deps: {
  db: Database;
  mailer: Mailer;
  screening: ScreeningService;
  rivers: RiversService;
  appUrl: string;
}) {
  const { db, mailer, screening, rivers } = deps;

  async function loadZone(user: CurrentUser, id: string, withGeometry = false, tx: Tx | Database = db): Promise<ZoneRow> {
    const j = jurisdictionOf(user);
    const rows = await tx.execute<ZoneRow>(sql`${SELECT_ZONE(withGeometry)} WHERE z.id = ${id}::uuid AND z.jurisdiction_id = ${j}::uuid`);
    if (!rows.rows[0])
      throw new NotFoundError('No closure zone with this id in your jurisdiction. It may have been deleted; reload the zones list.');
    return rows.rows[0];
  }

  async function list(user: CurrentUser, withGeometry = false): Promise<{ items: Zone[] }> {
    const j = jurisdictionOf(user);
    const rows = await db.execute<ZoneRow>(sql`${SELECT_ZONE(withGeometry)} WHERE z.jurisdiction_id = ${j}::uuid ORDER BY z.name`);
    return { items: rows.rows.map(toZone) };
  }

  async function get(user: CurrentUser, id: string): Promise<Zone> {
    return toZone(await loadZone(user, id, true));
  }

  /** Checks that a river is one the regulator may use and that a gauge belongs to it. */
  async function checkLinks(user: CurrentUser, riverId: string | null | undefined, gaugeId: string | null | undefined) {
    if (riverId) await rivers.get(user, riverId);
    if (gaugeId) {
      if (!riverId) throw new ValidationError('gaugeId: choose the zone’s river first; a gauge belongs to a river.');
      const g = await db.execute<{ id: string }>(sql`SELECT id FROM gauges WHERE id = ${gaugeId}::uuid AND river_id = ${riverId}::uuid`);
      if (!g.rows[0]) throw new UnprocessableError('gaugeId: this gauge is not on the chosen river. Choose one of the river’s gauges.');
    }
  }

  async function create(user: CurrentUser, body: ZoneCreate): Promise<Zone> {
    const j = jurisdictionOf(user);
    await checkLinks(user, body.riverId, body.gaugeId);
    const id = await db.transaction(async (tx) => {
      const valid = await tx
        .execute<{ valid: boolean; reason: string; area: number | null }>(sql`
        WITH g AS (SELECT ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(body.geometry)}), 4326) AS g)
        SELECT ST_IsValid(g) AS valid, ST_IsValidReason(g) AS reason, ST_Area(g::geography) AS area FROM g`)
        .catch(() => {
          throw new ValidationError('geometry: this is not a readable GeoJSON polygon. Draw the zone again (at least three corners).');
        });
      if (!valid.rows[0].area)
        throw new ValidationError('geometry: the zone has no area. Draw at least three corners that do not lie on one line.');
      const inserted = await tx.execute<{ id: string; area_m2: number }>(sql`
        INSERT INTO closure_zones (name, jurisdiction_id, geom, area_m2, river_id, gauge_id, trigger_flow, min_closure_days, indicator_standard)
        SELECT ${body.name}, ${j}::uuid, g, ST_Area(g::geography), ${body.riverId ?? null}::uuid, ${body.gaugeId ?? null}::uuid,
               ${body.triggerFlow ?? null}::float8, ${body.minClosureDays ?? null}::float8, ${body.indicatorStandard ?? null}::float8
          FROM (SELECT ST_Multi(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(body.geometry)}), 4326)), 3)) AS g) x
        RETURNING id, area_m2`);
      const zone = inserted.rows[0];
      await recordAudit(tx, {
        actorId: user.id,
        action: 'zone.create',
        subjectType: 'zone',
        subjectId: zone.id,
        jurisdictionId: j,
        after: {
          name: body.name,
          areaM2: Math.round(zone.area_m2),
          repaired: !valid.rows[0].valid ? valid.rows[0].reason : undefined,
          riverId: body.riverId ?? null,
          gaugeId: body.gaugeId ?? null,
          triggerFlow: body.triggerFlow ?? null,
          minClosureDays: body.minClosureDays ?? null,
          indicatorStandard: body.indicatorStandard ?? null,
        },
      });
      return zone.id;
    });
    return get(user, id);
  }

  const PLAN_COLUMNS = {
    name: 'name',
    riverId: 'river_id',
    gaugeId: 'gauge_id',
    triggerFlow: 'trigger_flow',
    minClosureDays: 'min_closure_days',
    indicatorStandard: 'indicator_standard',
  } as const;

  async function update(user: CurrentUser, id: string, body: ZoneUpdate): Promise<Zone> {
    const before = await loadZone(user, id);
    const riverId = body.riverId === undefined ? before.river_id : body.riverId;
    // A new river drops the old river's gauge unless a gauge is given too.
    const gaugeId = body.gaugeId !== undefined ? body.gaugeId : riverId !== before.river_id ? null : before.gauge_id;
    await checkLinks(user, riverId, gaugeId);
    const next = { ...body, riverId, gaugeId };
    const changed = (Object.keys(PLAN_COLUMNS) as (keyof typeof PLAN_COLUMNS)[]).filter((k) => next[k] !== undefined);
    const current: Record<string, unknown> = {
      name: before.name,
      riverId: before.river_id,
      gaugeId: before.gauge_id,
      triggerFlow: before.trigger_flow,
      minClosureDays: before.min_closure_days,
      indicatorStandard: before.indicator_standard,
    };
    const diff = changed.filter((k) => current[k] !== next[k]);
    if (diff.length) {
      await db.transaction(async (tx) => {
        const sets = diff.map((k) => {
          const col = sql.raw(PLAN_COLUMNS[k]);
          const v = next[k] ?? null;
          return k === 'riverId' || k === 'gaugeId'
            ? sql`${col} = ${v}::uuid`
            : k === 'name'
              ? sql`${col} = ${v}`
              : sql`${col} = ${v}::float8`;
        });
        await tx.execute(sql`UPDATE closure_zones SET ${sql.join(sets, sql`, `)} WHERE id = ${id}::uuid`);
        await recordAudit(tx, {
          actorId: user.id,
          action: diff.includes('triggerFlow') ? 'zone.trigger-change' : 'zone.update',
          subjectType: 'zone',
          subjectId: id,
          jurisdictionId: before.jurisdiction_id,
          before: Object.fromEntries(diff.map((k) => [k, current[k]])),
          after: Object.fromEntries(diff.map((k) => [k, next[k] ?? null])),
        });
      });
    }
    return get(user, id);
  }

  function toSample(r: {
    id: string;
    zone_id: string;
    sampled_at: Date;
    indicator: number;
    standard: number;
    passed: boolean;
    notes: string | null;
    entered_by_name: string | null;
    created_at: Date;
  }): ZoneSample {
    return {
      id: r.id,
      zoneId: r.zone_id,
      sampledAt: new Date(r.sampled_at).toISOString(),
      indicator: r.indicator,
      standard: r.standard,
      passed: r.passed,
      notes: r.notes,
      enteredBy: r.entered_by_name,
      createdAt: new Date(r.created_at).toISOString(),
    };
  }

  async function listSamples(user: CurrentUser, zoneId: string): Promise<{ items: ZoneSample[] }> {
    await loadZone(user, zoneId);
    const rows = await db.execute<Parameters<typeof toSample>[0]>(sql`
      SELECT s.*, u.name AS entered_by_name FROM zone_samples s LEFT JOIN users u ON u.id = s.entered_by
       WHERE s.zone_id = ${zoneId}::uuid ORDER BY s.sampled_at DESC, s.created_at DESC`);
    return { items: rows.rows.map(toSample) };
  }

  /**
   * Enters a sample result. It passes when the indicator is at or under the zone's standard. A
   * passing result taken after a closure moves the zone to "reopening pending"; the zone's
   * status_since stays the closure's start, so the minimum closure still counts from it.
   */
  async function addSample(user: CurrentUser, zoneId: string, body: SampleCreate): Promise<ZoneSample> {
    const zone = await loadZone(user, zoneId);
    if (zone.indicator_standard == null) {
      throw new UnprocessableError(
        `${zone.name} has no indicator standard yet, so a result cannot be judged. Set the standard in its plan values first.`,
      );
    }
    const sampledAt = new Date(body.sampledAt);
    if (sampledAt.getTime() > Date.now() + 5 * 60_000)
      throw new ValidationError('sampledAt is in the future. Give the date and time the sample was taken.');
    const passed = body.indicator <= zone.indicator_standard;
    const id = await db.transaction(async (tx) => {
      const inserted = await tx.execute<{ id: string }>(sql`
        INSERT INTO zone_samples (zone_id, sampled_at, indicator, standard, passed, notes, entered_by)
        VALUES (${zoneId}::uuid, ${sampledAt.toISOString()}::timestamptz, ${body.indicator}, ${zone.indicator_standard}, ${passed}, ${body.notes ?? null}, ${user.id})
        RETURNING id`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'zone.sample',
        subjectType: 'zone',
        subjectId: zoneId,
        jurisdictionId: zone.jurisdiction_id,
        after: {
          sampleId: inserted.rows[0].id,
          sampledAt: sampledAt.toISOString(),
          indicator: body.indicator,
          standard: zone.indicator_standard,
          passed,
        },
      });
      if (passed && zone.status === 'closed' && sampledAt >= new Date(zone.status_since)) {
        await tx.execute(sql`UPDATE closure_zones SET status = 'reopening-pending' WHERE id = ${zoneId}::uuid`);
        await recordAudit(tx, {
          actorId: user.id,
          action: 'zone.status',
          subjectType: 'zone',
          subjectId: zoneId,
          jurisdictionId: zone.jurisdiction_id,
          before: { status: zone.status, statusSince: new Date(zone.status_since).toISOString() },
          after: {
            status: 'reopening-pending',
            statusSince: new Date(zone.status_since).toISOString(),
            reason: 'passing sample result entered',
          },
        });
      }
      return inserted.rows[0].id;
    });
    const rows = await db.execute<Parameters<typeof toSample>[0]>(sql`
      SELECT s.*, u.name AS entered_by_name FROM zone_samples s LEFT JOIN users u ON u.id = s.entered_by WHERE s.id = ${id}::uuid`);
    return toSample(rows.rows[0]);
  }

  /**
   * The river's design quantiles and typical flood duration (as the lease sweep uses them), and
   * the AEP of a flow: from the fitted curve inside its range; below it (flows more frequent than
   * the smallest fitted flood) from the record's annual peaks by the Weibull plotting position
   * m/(n+1), m = years whose peak reached the flow (c: common practice); null above the range.
   */
  async function riverFit(riverId: string, designDistribution: string | undefined) {
    const fit = await db.execute<{
      fit: Record<string, { quantiles: { aep: number; discharge: number }[] }> | null;
      durations: { medianHours: number | null } | null;
      annual_peaks: { discharge: number; complete?: boolean }[] | null;
    }>(sql`
      SELECT fit, durations, annual_peaks FROM flow_records WHERE river_id = ${riverId}::uuid AND active ORDER BY uploaded_at DESC LIMIT 1`);
    const quantiles = fit.rows[0]?.fit?.[designDistribution ?? 'gev']?.quantiles ?? [];
    const durationHours = Math.max(24, Math.round(fit.rows[0]?.durations?.medianHours ?? 72));
    const peaks = (fit.rows[0]?.annual_peaks ?? []).filter((p) => p.complete !== false).map((p) => p.discharge);
    const smallest = quantiles.length ? Math.min(...quantiles.map((q) => q.discharge)) : Number.POSITIVE_INFINITY;
    const aep = (q: number): number | null => {
      const fitted = aepOfFlow(quantiles, q);
      if (fitted != null) return fitted;
      if (q < smallest && peaks.length) return peaks.filter((p) => p >= q).length / (peaks.length + 1);
      return null;
    };
    return { quantiles, durationHours, aep };
  }

  /**
   * The model's justification of a trigger: for flows swept over the river's range, the share of
   * the zone where the indicator is above the zone's standard. The share is measured on points
   * scattered evenly over the zone, each placed along and off the coast walked by the largest
   * scenario's plume (as the lease sweep does), so no new geometry is built per flow. The
   * suggested trigger is the lowest flow at which that share passes `share` (0 = any part),
   * refined by bisection between the two sweep steps around it.
   */
  async function triggerSweep(user: CurrentUser, zoneId: string, share: number, steps: number): Promise<TriggerSweep> {
    const zone = await loadZone(user, zoneId);
    if (!zone.river_id)
      throw new UnprocessableError(`${zone.name} is not linked to a river yet. Choose its river in the plan values, then run the sweep.`);
    if (zone.indicator_standard == null)
      throw new UnprocessableError(`${zone.name} has no indicator standard yet. Set it in the plan values, then run the sweep.`);
    const standard = zone.indicator_standard;
    const river = await screening.riverInputs(zone.river_id);
    const scenarios = await db.execute<{ id: string; discharge: number; duration_hours: number }>(sql`
      SELECT id, discharge, duration_hours FROM scenarios WHERE river_id = ${zone.river_id}::uuid ORDER BY discharge DESC`);
    if (!scenarios.rows.length) throw new UnprocessableError(`${river.name} has no scenarios yet: upload its flow record first.`);
    const largest = scenarios.rows[0];
    const fp = await screening.ensureFootprint(river, {
      scenarioId: largest.id,
      discharge: largest.discharge,
      durationHours: largest.duration_hours,
    });
    const pts = await db.execute<{ s: number; x: number; lon: number; lat: number }>(sql`
      WITH p AS (SELECT (ST_Dump(ST_GeneratePoints(z.geom, ${SWEEP_POINTS}, 1))).geom AS g FROM closure_zones z WHERE z.id = ${zoneId}::uuid)
      SELECT ST_LineLocatePoint(f.path, ST_ClosestPoint(f.path, p.g)) * ST_Length(f.path::geography) AS s,
             ST_Distance(p.g::geography, f.path::geography) AS x, ST_X(p.g) AS lon, ST_Y(p.g) AS lat
        FROM p, footprints f WHERE f.id = ${fp.id}::uuid`);
    // Signed positions: points up-coast of the mouth sit in the bulge's frame, not "in the bulge at the mouth".
    const frame = await footprintCoastFrame(db, fp.id, river.settings);
    const points = frame ? placePoints(frame, pts.rows) : pts.rows.map((r) => ({ s: Math.max(0, r.s), x: Math.max(0, r.x) }));
    if (!points.length) throw new UnprocessableError(`${zone.name} has no area to sample. Redraw or re-upload the zone.`);
    const { aep, durationHours } = await riverFit(zone.river_id, river.settings.designDistribution as string | undefined);

    const fractionAt = (q: number) => {
      const { plume, params } = plumeFor(river.settings, { discharge: q, durationHours });
      let inside = 0;
      for (const p of points) if (fieldAt(plume, params, p.s, p.x).indicator > standard) inside++;
      return inside / points.length;
    };
    const passes = (f: number) => (share === 0 ? f > 0 : f >= share);

    // Down to low flows: a river's indicator load falls with flow (power law), so the share of a
    // zone over the standard can start far below the flood flows of the scenarios.
    const qMax = largest.discharge * 1.5;
    const qMin = Math.max(0.05, largest.discharge / 5000);
    const curve = Array.from({ length: steps }, (_, i) => {
      const q = qMin * (qMax / qMin) ** (i / (steps - 1));
      return { discharge: q, fraction: fractionAt(q), aep: aep(q) };
    });
    const firstIdx = curve.findIndex((p) => passes(p.fraction));
    let suggested: number | null = null;
    if (firstIdx === 0) suggested = curve[0].discharge;
    else if (firstIdx > 0) {
      let lo = curve[firstIdx - 1].discharge;
      let hi = curve[firstIdx].discharge;
      for (let i = 0; i < 14; i++) {
        const mid = Math.sqrt(lo * hi);
        if (passes(fractionAt(mid))) hi = mid;
        else lo = mid;
      }
      suggested = hi;
    }
    const plan = zone.trigger_flow;
    const margin = plan != null && suggested != null ? plan - suggested : null;
    return {
      zoneId,
      zoneName: zone.name,
      riverId: zone.river_id,
      riverName: river.name,
      indicatorStandard: standard,
      share,
      durationHours,
      samplePoints: points.length,
      curve,
      suggestedTrigger: suggested,
      suggestedAep: suggested != null ? aep(suggested) : null,
      planTrigger: plan,
      planAep: plan != null ? aep(plan) : null,
      marginM3s: margin,
      marginPercent: margin != null && suggested ? (margin / suggested) * 100 : null,
      modelVersion: MODEL_VERSION,
      note: `Share of the zone (${points.length} evenly scattered points) where the modelled indicator is above ${standard} per 100 mL, for flows held ${durationHours} hours (the record's typical flood duration). Annual exceedance probabilities from the river's fitted flood-frequency curve, and below its smallest flood from the record's annual peaks (m/(n+1)).${
        firstIdx === 0
          ? ' The share is passed already at the lowest flow swept, so the suggestion is that flow.'
          : firstIdx < 0
            ? ' The share is not passed at any flow swept: the model suggests no trigger.'
            : ''
      }`,
    };
  }

  /** Which zones and which held leases a flow puts in which bands (fractions of their area, from PostGIS). */
  async function closureCheck(user: CurrentUser, body: ClosureCheckRequest): Promise<ClosureCheckResult> {
    const j = jurisdictionOf(user);
    await rivers.get(user, body.riverId);
    const river = await screening.riverInputs(body.riverId);
    let flow = body.flow ?? 0;
    let flowSource: ClosureCheckResult['flowSource'] = { kind: 'typed', gaugeCode: null, gaugeName: null, observedAt: null };
    if (body.source === 'latest-gauge-reading') {
      const reading = await db.execute<{ code: string; name: string; observed_at: Date; discharge: number }>(sql`
        SELECT g.code, g.name, r.observed_at, r.discharge FROM gauges g JOIN gauge_readings r ON r.gauge_id = g.id
         WHERE g.river_id = ${body.riverId}::uuid ORDER BY r.observed_at DESC LIMIT 1`);
      const r = reading.rows[0];
      if (!r) throw new UnprocessableError(`No gauge on ${river.name} has sent a reading yet. Type a flow instead.`);
      flow = r.discharge;
      flowSource = {
        kind: 'latest-gauge-reading',
        gaugeCode: r.code,
        gaugeName: r.name,
        observedAt: new Date(r.observed_at).toISOString(),
      };
    }
    const { aep, durationHours } = await riverFit(body.riverId, river.settings.designDistribution as string | undefined);
    const fp = await screening.ensureFootprint(river, { discharge: flow, durationHours });
    const bands = await db.execute<{ band_id: string; name: string; geometry: string; sort_order: number }>(sql`
      SELECT band_id, name, sort_order, ST_AsGeoJSON(geom, 6) AS geometry FROM footprint_bands WHERE footprint_id = ${fp.id}::uuid AND band_id <> 'bulge' ORDER BY sort_order`);
    const zoneRows = await db.execute<{
      id: string;
      name: string;
      status: ZoneStatus;
      trigger_flow: number | null;
      geometry: string;
      fractions: Record<string, number> | null;
    }>(sql`
      SELECT z.id, z.name, z.status, z.trigger_flow, ST_AsGeoJSON(z.geom, 6) AS geometry,
             (SELECT jsonb_object_agg(band_id, LEAST(1, f)) FROM (
                SELECT b.band_id, ST_Area(ST_Intersection(z.geom, b.geom)::geography) / NULLIF(z.area_m2, 0) AS f
                  FROM footprint_bands b WHERE b.footprint_id = ${fp.id}::uuid AND b.band_id <> 'bulge' AND ST_Intersects(z.geom, b.geom)) x) AS fractions
        FROM closure_zones z
       WHERE z.jurisdiction_id = ${j}::uuid AND (z.river_id = ${body.riverId}::uuid OR z.river_id IS NULL)
       ORDER BY z.name`);
    // Held leases of the jurisdiction only: never a candidate site, whoever holds it.
    const leaseRows = await db.execute<{
      id: string;
      lease_code: string;
      holder: string | null;
      species: string | null;
      zones: string[] | null;
      geometry: string;
      fractions: Record<string, number> | null;
    }>(sql`
      SELECT l.id, l.lease_code, l.holder, l.species, ST_AsGeoJSON(l.geom, 6) AS geometry,
             (SELECT array_agg(z.name ORDER BY z.name) FROM closure_zones z WHERE z.jurisdiction_id = l.jurisdiction_id AND ST_Intersects(z.geom, l.geom)) AS zones,
             (SELECT jsonb_object_agg(band_id, LEAST(1, f)) FROM (
                SELECT b.band_id, SUM(CASE WHEN ST_CoveredBy(l.geom, p.geom) THEN 1.0 ELSE ST_Area(ST_Intersection(l.geom, p.geom)) / NULLIF(ST_Area(l.geom), 0) END) AS f
                  FROM footprint_band_pieces p JOIN footprint_bands b ON b.footprint_id = p.footprint_id AND b.band_id = p.band_id
                 WHERE p.footprint_id = ${fp.id}::uuid AND ST_Intersects(l.geom, p.geom) GROUP BY b.band_id) x) AS fractions
        FROM leases l
       WHERE l.status = 'held' AND l.jurisdiction_id = ${j}::uuid
         AND EXISTS (SELECT 1 FROM footprint_band_pieces p WHERE p.footprint_id = ${fp.id}::uuid AND ST_Intersects(l.geom, p.geom))
       ORDER BY l.lease_code`);
    const zones = zoneRows.rows.map((z) => ({
      id: z.id,
      name: z.name,
      status: z.status,
      triggerFlow: z.trigger_flow,
      atOrAboveTrigger: z.trigger_flow == null ? null : flow >= z.trigger_flow,
      bandFractions: z.fractions ?? {},
    }));
    const leases = leaseRows.rows.map((l) => ({
      id: l.id,
      leaseId: l.lease_code,
      holder: l.holder,
      species: l.species,
      zones: l.zones ?? [],
      bandFractions: l.fractions ?? {},
    }));
    const map = {
      type: 'FeatureCollection' as const,
      features: [
        ...bands.rows.map((b) => ({
          type: 'Feature' as const,
          properties: { layer: 'band' as const, bandId: b.band_id, name: b.name, order: b.sort_order },
          geometry: JSON.parse(b.geometry),
        })),
        ...zoneRows.rows.map((z) => ({
          type: 'Feature' as const,
          properties: { layer: 'zone' as const, id: z.id, name: z.name, status: z.status },
          geometry: JSON.parse(z.geometry),
        })),
        ...leaseRows.rows.map((l) => ({
          type: 'Feature' as const,
          properties: { layer: 'lease' as const, id: l.id, name: l.lease_code, holder: l.holder },
          geometry: JSON.parse(l.geometry),
        })),
      ],
    };
    return {
      riverId: body.riverId,
      riverName: river.name,
      flow,
      flowSource,
      aep: aep(flow),
      durationHours,
      modelVersion: MODEL_VERSION,
      footprintId: fp.id,
      computedAt: new Date().toISOString(),
      bands: bands.rows.map((b) => ({ bandId: b.band_id, name: b.name })),
      zones,
      leases,
      map,
      note:
        `${river.name} at ${flow.toFixed(1)} m³/s (${flowSource.kind === 'typed' ? 'typed' : `latest reading of gauge ${flowSource.gaugeCode} at ${fmtDate(new Date(flowSource.observedAt!))}`}), ` +
        `held ${durationHours} hours; model ${MODEL_VERSION}; river settings version ${river.version}. Held leases only.`,
    };
  }

  type NoticeRow = {
    id: string;
    kind: 'closure' | 'reopening';
    message: string | null;
    flow: number | null;
    issued_at: Date;
    issued_by_name: string | null;
    recipients: number;
    emails_sent: number;
    zones: Notice['zones'];
  };
  const SELECT_NOTICES = sql`
    SELECT n.id, n.kind, n.message, n.flow, n.issued_at, u.name AS issued_by_name, n.recipients, n.emails_sent,
           (SELECT jsonb_agg(jsonb_build_object('id', z.id, 'name', z.name, 'statusBefore', nz.status_before, 'statusAfter', nz.status_after) ORDER BY z.name)
              FROM notice_zones nz JOIN closure_zones z ON z.id = nz.zone_id WHERE nz.notice_id = n.id) AS zones
      FROM notices n LEFT JOIN users u ON u.id = n.issued_by`;
  const toNotice = (r: NoticeRow): Notice => ({
    id: r.id,
    kind: r.kind,
    message: r.message,
    flow: r.flow,
    issuedAt: new Date(r.issued_at).toISOString(),
    issuedBy: r.issued_by_name,
    recipients: r.recipients,
    emailsSent: r.emails_sent,
    zones: r.zones ?? [],
  });

  async function listNotices(user: CurrentUser, zoneId?: string): Promise<{ items: Notice[] }> {
    const j = jurisdictionOf(user);
    if (zoneId) await loadZone(user, zoneId);
    const rows = await db.execute<NoticeRow>(sql`${SELECT_NOTICES}
      WHERE n.jurisdiction_id = ${j}::uuid ${zoneId ? sql`AND EXISTS (SELECT 1 FROM notice_zones nz WHERE nz.notice_id = n.id AND nz.zone_id = ${zoneId}::uuid)` : sql``}
      ORDER BY n.issued_at DESC LIMIT 200`);
    return { items: rows.rows.map(toNotice) };
  }

  /** Why a zone may not reopen now, or null when it may (the minimum closure has passed and a passing sample was taken since the closure). */
  async function reopeningRefusal(tx: Tx, zone: ZoneRow, now: Date): Promise<string | null> {
    if (zone.status === 'open') return `${zone.name} is already open; there is nothing to reopen.`;
    const since = new Date(zone.status_since);
    const earliest = earliestReopening(zone)!;
    if (now < earliest) {
      const days = (earliest.getTime() - now.getTime()) / DAY_MS;
      return `${zone.name} cannot reopen yet: it closed on ${fmtDate(since)} and its minimum closure is ${zone.min_closure_days ?? 0} days, so the earliest reopening is ${fmtDate(earliest)} (in ${days.toFixed(1)} days).`;
    }
    const sample = await tx.execute<{ id: string }>(sql`
      SELECT id FROM zone_samples WHERE zone_id = ${zone.id}::uuid AND passed AND sampled_at >= ${since.toISOString()}::timestamptz LIMIT 1`);
    if (!sample.rows[0]) {
      return `${zone.name} cannot reopen yet: no passing sample result has been entered since it closed on ${fmtDate(since)}. Enter a result at or under ${zone.indicator_standard ?? 'the standard'} per 100 mL on the zone's page first.`;
    }
    return null;
  }

  /**
   * Issues a closure or reopening notice for one or more zones, all or nothing: the status
   * changes (with timestamps), the notice, its audit entries and every grower's in-app message
   * are written in one transaction; the e-mails go out after it commits (an SMTP server cannot
   * take part in a transaction), and the notice records how many were accepted.
   */
  async function issueNotice(user: CurrentUser, body: NoticeCreate): Promise<Notice> {
    const j = jurisdictionOf(user);
    const zoneIds = [...new Set(body.zoneIds)];
    const now = new Date();
    const { noticeId, mails } = await db.transaction(async (tx) => {
      // Lock the zones so two notices for the same zone cannot cross.
      await tx.execute(
        sql`SELECT id FROM closure_zones WHERE id = ANY(${`{${zoneIds.join(',')}}`}::uuid[]) AND jurisdiction_id = ${j}::uuid ORDER BY id FOR UPDATE`,
      );
      const zones: ZoneRow[] = [];
      for (const id of zoneIds) zones.push(await loadZone(user, id, false, tx));
      const refusals: string[] = [];
      for (const z of zones) {
        if (body.kind === 'closure') {
          if (z.status === 'closed') refusals.push(`${z.name} is already closed (since ${fmtDate(new Date(z.status_since))}).`);
        } else {
          const why = await reopeningRefusal(tx, z, now);
          if (why) refusals.push(why);
        }
      }
      if (refusals.length) {
        throw new ConflictError(`${refusals.join(' ')} No notice was issued${zones.length > 1 ? ' for any of the chosen zones' : ''}.`, {
          refusals,
        });
      }
      const after: ZoneStatus = body.kind === 'closure' ? 'closed' : 'open';
      const inserted = await tx.execute<{ id: string }>(sql`
        INSERT INTO notices (jurisdiction_id, kind, message, flow, issued_by, issued_at)
        VALUES (${j}::uuid, ${body.kind}, ${body.message || null}, ${body.flow ?? null}, ${user.id}, ${now.toISOString()}::timestamptz) RETURNING id`);
      const id = inserted.rows[0].id;
      for (const z of zones) {
        await tx.execute(
          sql`INSERT INTO notice_zones (notice_id, zone_id, status_before, status_after) VALUES (${id}::uuid, ${z.id}::uuid, ${z.status}, ${after})`,
        );
        await tx.execute(
          sql`UPDATE closure_zones SET status = ${after}, status_since = ${now.toISOString()}::timestamptz WHERE id = ${z.id}::uuid`,
        );
        await recordAudit(tx, {
          actorId: user.id,
          action: 'zone.status',
          subjectType: 'zone',
          subjectId: z.id,
          jurisdictionId: j,
          before: { status: z.status, statusSince: new Date(z.status_since).toISOString() },
          after: { status: after, statusSince: now.toISOString(), noticeId: id },
        });
      }
      // Every grower with a held lease touching one of the zones, with their leases there.
      const growers = await tx.execute<{
        user_id: string;
        email: string;
        name: string | null;
        leases: { leaseId: string; zone: string }[];
      }>(sql`
        SELECT u.id AS user_id, u.email, u.name,
               jsonb_agg(DISTINCT jsonb_build_object('leaseId', l.lease_code, 'zone', z.name)) AS leases
          FROM closure_zones z
          JOIN leases l ON l.status = 'held' AND l.jurisdiction_id = z.jurisdiction_id AND ST_Intersects(l.geom, z.geom)
          JOIN users u ON u.id = l.owner_id AND NOT u.disabled
         WHERE z.id = ANY(${`{${zoneIds.join(',')}}`}::uuid[])
         GROUP BY u.id, u.email, u.name ORDER BY u.email`);
      const zoneNames = zones.map((z) => z.name).join(', ');
      const title = body.kind === 'closure' ? `Closure notice: ${zoneNames}` : `Reopening notice: ${zoneNames}`;
      const mails = growers.rows.map((g) => {
        const lines = [
          `Hello ${g.name ?? g.email},`,
          '',
          body.kind === 'closure'
            ? `The shellfish authority has closed ${zoneNames} as of ${fmtDate(now)}. Do not harvest from the leases below until a reopening notice is issued.`
            : `The shellfish authority has reopened ${zoneNames} as of ${fmtDate(now)}, after the minimum closure period and a passing sample result.`,
          ...(body.flow ? [`River flow that prompted the notice: ${body.flow} m³/s.`] : []),
          ...(body.message ? ['', body.message] : []),
          '',
          'Your held leases in these zones:',
          ...[...g.leases].sort((a, b) => a.leaseId.localeCompare(b.leaseId)).map((l) => `  - ${l.leaseId} (${l.zone})`),
          '',
          'Follow local regulations and the authority’s notices before harvesting.',
        ];
        return { userId: g.user_id, email: g.email, title, text: lines.join('\n') };
      });
      await deliverToInbox(
        tx,
        mails.map((m) => ({
          userId: m.userId,
          kind: 'notice' as const,
          title: m.title,
          body: m.text,
          link: '/leases',
          dedupeKey: `notice:${id}`,
        })),
      );
      await tx.execute(sql`UPDATE notices SET recipients = ${mails.length} WHERE id = ${id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: `notice.${body.kind}`,
        subjectType: 'notice',
        subjectId: id,
        jurisdictionId: j,
        after: {
          kind: body.kind,
          zones: zones.map((z) => ({ id: z.id, name: z.name, before: z.status, after })),
          message: body.message ?? null,
          flow: body.flow ?? null,
          recipients: mails.length,
        },
      });
      return { noticeId: id, mails };
    });

    let sent = 0;
    for (const m of mails) {
      try {
        await mailer.send({ to: m.email, subject: m.title, text: m.text });
        sent++;
      } catch (err) {
        logger.error({ err, noticeId, to: m.email }, 'notice e-mail not accepted');
      }
    }
    await db.execute(sql`UPDATE notices SET emails_sent = ${sent} WHERE id = ${noticeId}::uuid`);
    const row = await db.execute<NoticeRow>(sql`${SELECT_NOTICES} WHERE n.id = ${noticeId}::uuid`);
    return toNotice(row.rows[0]);
  }

  /** The audit log: a regulator reads its jurisdiction's entries (and role changes into or out of it); an admin reads all. */
  async function audit(
    user: CurrentUser,
    q: { subjectType?: string; limit: number; offset: number },
  ): Promise<{ items: AuditEntry[]; total: number }> {
    let scope = sql`true`;
    if (user.role !== 'admin') {
      const j = jurisdictionOf(user);
      scope = sql`(a.jurisdiction_id = ${j}::uuid OR (a.action = 'user.role-change' AND (a.before->>'jurisdictionId' = ${j} OR a.after->>'jurisdictionId' = ${j})))`;
    }
    const where = q.subjectType ? sql`${scope} AND a.subject_type = ${q.subjectType}` : scope;
    const rows = await db.execute<{
      id: string;
      at: Date;
      actor_id: string | null;
      actor_name: string | null;
      actor_email: string | null;
      action: string;
      subject_type: string;
      subject_id: string | null;
      subject_name: string | null;
      before: unknown;
      after: unknown;
    }>(sql`
      SELECT a.id, a.at, a.actor_id, u.name AS actor_name, u.email AS actor_email, a.action, a.subject_type, a.subject_id, a.before, a.after,
             CASE a.subject_type
               WHEN 'zone' THEN (SELECT z.name FROM closure_zones z WHERE z.id::text = a.subject_id)
               WHEN 'river' THEN (SELECT r.name FROM rivers r WHERE r.id::text = a.subject_id)
               WHEN 'user' THEN (SELECT s.email FROM users s WHERE s.id = a.subject_id)
               WHEN 'notice' THEN (SELECT initcap(n.kind) || ' notice' FROM notices n WHERE n.id::text = a.subject_id)
             END AS subject_name
        FROM audit_entries a LEFT JOIN users u ON u.id = a.actor_id
       WHERE ${where} ORDER BY a.at DESC, a.id LIMIT ${q.limit} OFFSET ${q.offset}`);
    const total = await db.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM audit_entries a WHERE ${where}`);
    return {
      items: rows.rows.map((r) => ({
        id: r.id,
        at: new Date(r.at).toISOString(),
        actorId: r.actor_id,
        actorName: r.actor_name,
        actorEmail: r.actor_email,
        action: r.action,
        subjectType: r.subject_type,
        subjectId: r.subject_id,
        subjectName: r.subject_name,
        before: r.before,
        after: r.after,
      })),
      total: total.rows[0].n,
    };
  }

  /** The public page's data: no lease, no grower, no geometry; only zone statuses and recent notices. */
  async function publicStatus(slug: string): Promise<PublicStatus> {
    const j = await db.execute<{ id: string; slug: string; name: string }>(
      sql`SELECT id, slug, name FROM jurisdictions WHERE slug = ${slug}`,
    );
    if (!j.rows[0]) throw new NotFoundError(`No jurisdiction called "${slug}". Check the address of the status page.`);
    const zones = await db.execute<{
      name: string;
      status: ZoneStatus;
      status_since: Date;
      river_name: string | null;
      trigger_flow: number | null;
    }>(sql`
      SELECT z.name, z.status, z.status_since, r.name AS river_name, z.trigger_flow
        FROM closure_zones z LEFT JOIN rivers r ON r.id = z.river_id WHERE z.jurisdiction_id = ${j.rows[0].id}::uuid ORDER BY z.name`);
    const notices = await db.execute<{
      kind: 'closure' | 'reopening';
      issued_at: Date;
      zones: string[] | null;
      message: string | null;
    }>(sql`
      SELECT n.kind, n.issued_at, n.message,
             (SELECT array_agg(z.name ORDER BY z.name) FROM notice_zones nz JOIN closure_zones z ON z.id = nz.zone_id WHERE nz.notice_id = n.id) AS zones
        FROM notices n WHERE n.jurisdiction_id = ${j.rows[0].id}::uuid ORDER BY n.issued_at DESC LIMIT 20`);
    return {
      jurisdiction: { slug: j.rows[0].slug, name: j.rows[0].name },
      generatedAt: new Date().toISOString(),
      zones: zones.rows.map((z) => ({
        name: z.name,
        status: z.status,
        statusSince: new Date(z.status_since).toISOString(),
        riverName: z.river_name,
        triggerFlow: z.trigger_flow,
      })),
      notices: notices.rows.map((n) => ({
        kind: n.kind,
        issuedAt: new Date(n.issued_at).toISOString(),
        zones: n.zones ?? [],
        message: n.message,
      })),
    };
  }

  /** Rivers and their gauges a regulator may link zones to. */
  async function gaugesOf(user: CurrentUser) {
    const j = jurisdictionOf(user);
    const rows = await db.execute<{
      id: string;
      river_id: string;
      code: string;
      name: string;
      latest_discharge: number | null;
      latest_at: Date | null;
    }>(sql`
      SELECT g.id, g.river_id, g.code, g.name, lr.discharge AS latest_discharge, lr.observed_at AS latest_at
        FROM gauges g JOIN rivers r ON r.id = g.river_id
        LEFT JOIN LATERAL (SELECT discharge, observed_at FROM gauge_readings WHERE gauge_id = g.id ORDER BY observed_at DESC LIMIT 1) lr ON true
       WHERE r.jurisdiction_id = ${j}::uuid ORDER BY g.code`);
    return {
      items: rows.rows.map((g) => ({
        id: g.id,
        riverId: g.river_id,
        code: g.code,
        name: g.name,
        latestDischarge: g.latest_discharge,
        latestAt: g.latest_at ? new Date(g.latest_at).toISOString() : null,
      })),
    };
  }

  return {
    list,
    get,
    create,
    update,
    listSamples,
    addSample,
    triggerSweep,
    closureCheck,
    listNotices,
    issueNotice,
    audit,
    publicStatus,
    gaugesOf,
  };
}

export type ZonesService = ReturnType<typeof createZonesService>;
