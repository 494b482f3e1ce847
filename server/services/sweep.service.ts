/**
 * The flow sweep for one lease: at which river flow the lease enters each band. Uses the
 * lease's position along and off the river's walked coast (from its longest footprint) and
 * the engine's field at each flow, so it needs no new geometry per flow.
 */
import { sql } from 'drizzle-orm';
import { getSpeciesTolerance, SPECIES_IDS } from '#shared/biology/species-tolerance';
import { worstField } from '#shared/physics/exposure-field';
import { strictestSpecies } from '#shared/scoring/lease-band-specs';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { NotFoundError, UnprocessableError } from '../lib/errors';
import { visibleLeases } from './leases.service';
import { footprintCoastFrame, placeOutline } from './coast-positions';
import { plumeFor, polygonRings, type ScreeningService } from './screening.service';

/** AEP of a flow from a fitted quantile table, by log-log interpolation; null outside it. */
export function aepOfFlow(quantiles: { aep: number; discharge: number }[], q: number): number | null {
  const sorted = [...quantiles].sort((a, b) => a.discharge - b.discharge);
  if (!sorted.length || q < sorted[0].discharge || q > sorted.at(-1)!.discharge) return null;
  for (let i = 1; i < sorted.length; i++) {
    const a = sorted[i - 1];
    const b = sorted[i];
    if (q <= b.discharge) {
      const t = (Math.log(q) - Math.log(a.discharge)) / (Math.log(b.discharge) - Math.log(a.discharge) || 1);
      return Math.exp(Math.log(a.aep) + t * (Math.log(b.aep) - Math.log(a.aep)));
    }
  }
  return null;
}

export function createSweepService(deps: { db: Database; screening: ScreeningService }) {
  const { db, screening } = deps;

  async function sweep(user: CurrentUser, leaseId: string, riverId: string, steps = 60) {
    const lease = await db.execute<{ id: string; lease_code: string; species: string | null }>(sql`
      SELECT l.id, l.lease_code, l.species FROM leases l WHERE l.id = ${leaseId}::uuid AND ${visibleLeases(user)}`);
    if (!lease.rows[0]) throw new NotFoundError('No lease with this id that you can see.');
    const river = await screening.riverInputs(riverId);
    const scenarios = await db.execute<{ id: string; aep: number | null; discharge: number; duration_hours: number }>(sql`
      SELECT id, aep, discharge, duration_hours FROM scenarios WHERE river_id = ${riverId}::uuid ORDER BY discharge DESC`);
    if (!scenarios.rows.length) throw new UnprocessableError(`${river.name} has no scenarios yet: upload its flow record first.`);
    const largest = scenarios.rows[0];
    const fp = await screening.ensureFootprint(river, { scenarioId: largest.id, discharge: largest.discharge, durationHours: largest.duration_hours });
    const pos = await db.execute<{ s: number; x: number }>(sql`
      SELECT ST_LineLocatePoint(f.path, ST_ClosestPoint(f.path, l.geom)) * ST_Length(f.path::geography) AS s,
             ST_Distance(l.geom::geography, f.path::geography) AS x
        FROM leases l, footprints f WHERE l.id = ${leaseId}::uuid AND f.id = ${fp.id}::uuid`);
    const { s, x } = pos.rows[0];
    // The lease is judged at its worst point: its outline in the plume's signed coordinates.
    const frame = await footprintCoastFrame(db, fp.id, river.settings);
    const geo = await db.execute<{ geometry: string }>(sql`SELECT ST_AsGeoJSON(geom, 7) AS geometry FROM leases WHERE id = ${leaseId}::uuid`);
    const outline = frame && geo.rows[0] ? placeOutline(frame, polygonRings(JSON.parse(geo.rows[0].geometry))) : [];
    const positions = outline.length ? outline : [{ s: Math.max(0, s), x: Math.max(0, x) }];
    const fit = await db.execute<{ fit: { gev: { quantiles: { aep: number; discharge: number }[] } } | null; durations: { medianHours: number | null } | null }>(sql`
      SELECT fit, durations FROM flow_records WHERE river_id = ${riverId}::uuid AND active`);
    const quantiles = fit.rows[0]?.fit?.[(river.settings.designDistribution ?? 'gev') as 'gev']?.quantiles ?? [];
    const durationHours = Math.max(24, Math.round(fit.rows[0]?.durations?.medianHours ?? largest.duration_hours));
    const species = lease.rows[0].species && (SPECIES_IDS as readonly string[]).includes(lease.rows[0].species) ? getSpeciesTolerance(lease.rows[0].species) : strictestSpecies();

    const qMax = largest.discharge * 1.5;
    const qMin = Math.max(0.5, largest.discharge / 200);
    const curve = Array.from({ length: steps }, (_, i) => {
      const q = qMin * (qMax / qMin) ** (i / (steps - 1));
      const { plume, params } = plumeFor(river.settings, { discharge: q, durationHours });
      const v = worstField(plume, params, positions).field;
      return { discharge: q, salinity: v.salinity, indicator: v.indicator, freshwaterFraction: v.freshwaterFraction, aep: aepOfFlow(quantiles, q) };
    });
    const bands = [
      { bandId: 'plume-edge', name: 'Plume edge (any river water)', test: (p: (typeof curve)[number]) => p.freshwaterFraction > 0.01 },
      { bandId: 'indicator-over-standard', name: 'Indicator above the approved-area standard (14 per 100 mL)', test: (p: (typeof curve)[number]) => p.indicator > 14 },
      {
        bandId: `salinity-under-${species.chronicLowerSalinity}`,
        name: `Salinity under ${species.chronicLowerSalinity} (the sustained limit for ${species.commonNamePlural})`,
        test: (p: (typeof curve)[number]) => p.salinity < species.chronicLowerSalinity,
      },
      {
        bandId: `salinity-under-${species.acuteLowerSalinity}`,
        name: `Salinity under ${species.acuteLowerSalinity} (the short-term limit for ${species.commonNamePlural})`,
        test: (p: (typeof curve)[number]) => p.salinity < species.acuteLowerSalinity,
      },
    ].map((b) => {
      const first = curve.find(b.test);
      return { bandId: b.bandId, name: b.name, entersAtDischarge: first ? first.discharge : null, entersAtAep: first ? first.aep : null };
    });
    return {
      leaseId,
      leaseCode: lease.rows[0].lease_code,
      riverId,
      riverName: river.name,
      species: species.id,
      // the lease's centre in the plume's signed coordinates (negative up-coast of the mouth)
      alongCoastM: positions[positions.length - 1].s,
      offshoreM: positions[positions.length - 1].x,
      durationHours,
      bands,
      curve,
      note: 'Flows held for the typical flood duration of the record; position measured along the coast walked by the largest scenario’s plume.',
    };
  }

  return { sweep };
}

export type SweepService = ReturnType<typeof createSweepService>;
