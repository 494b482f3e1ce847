/**
 * Leases: who may see which (row-level rules of product.md §2), listing, editing, export.
 * A lease nobody may see answers 404, so its existence is not revealed.
 */
import { type SQL, sql } from 'drizzle-orm';
import type { Lease, LeaseListQuery, LeaseUpdate } from '#shared/schemas/lease';
import { ANNUAL_RATING_CUTS } from '#shared/scoring/annual-rating';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { ForbiddenError, NotFoundError } from '../lib/errors';
import { recordAudit } from './audit.service';

/** The rows `user` may read: own leases, leases shared with them, and for a regulator the held leases of the jurisdiction. */
export function visibleLeases(user: CurrentUser, alias = 'l'): SQL {
  const a = sql.raw(alias);
  // `id = ANY(ARRAY(subquery))` rather than EXISTS: the shares are read once (an InitPlan) and every branch of the OR
  // is then an index condition, so PostgreSQL combines three index scans instead of testing every row of the table.
  // The cost follows what the caller may see, not how many leases other accounts hold.
  const shared = sql`${a}.id = ANY(ARRAY(SELECT s.lease_id FROM lease_shares s WHERE s.grantee_id = ${user.id}))`;
  if (user.role === 'regulator') {
    return sql`(${a}.owner_id = ${user.id} OR ${shared} OR (${a}.status = 'held' AND ${a}.jurisdiction_id = ${user.jurisdictionId}::uuid))`;
  }
  if (user.role === 'grower' || user.role === 'adviser') return sql`(${a}.owner_id = ${user.id} OR ${shared})`;
  return sql`false`;
}

/**
 * shared/scoring/annual-rating.ts's `annualRating` as a SQL expression over two columns, built from the same cut points
 * (inclusive), so the leases table can sort on the server; NULL when a figure is missing.
 */
export function annualRatingSql(days: string, chance: string): string {
  const steps = ANNUAL_RATING_CUTS.map(
    (c) => `WHEN ${days} >= ${c.closureDaysPerYear} OR ${chance} >= ${c.harmfulSalinityChancePerYear} THEN '${c.rating}'`,
  );
  return `(CASE WHEN ${days} IS NULL OR ${chance} IS NULL THEN NULL ${steps.join(' ')} ELSE 'low' END)`;
}

const RATING_RANK = (expr: string) => `array_position(ARRAY['low','moderate','high','severe'], ${expr})`;

const SORT_COLUMNS: Record<Exclude<LeaseListQuery['sort'], 'annualRating'>, string> = {
  leaseId: 'l.lease_code',
  holder: 'l.holder',
  species: 'l.species',
  status: 'l.status',
  areaM2: 'l.area_m2',
  createdAt: 'l.created_at',
  worstRating: RATING_RANK('x.worst_rating'),
  expectedDaysPerYear: 'x.expected_days',
};

type LeaseRow = {
  id: string;
  lease_code: string;
  holder: string | null;
  species: string | null;
  status: 'held' | 'candidate';
  notes: string | null;
  owner_id: string;
  owner_name: string | null;
  area_m2: number;
  on_land: boolean;
  import_id: string | null;
  worst_rating: string | null;
  expected_days: number | null;
  closure_days: number | null;
  harmful_chance: number | null;
  annual_rating: string | null;
  scenario_ratings?: Record<string, Lease['worstRating'] & string> | null;
  probability_any: number | null;
  created_at: Date;
  updated_at: Date;
  geometry?: string;
};

function toLease(r: LeaseRow): Lease {
  return {
    id: r.id,
    leaseId: r.lease_code,
    holder: r.holder,
    species: r.species,
    status: r.status,
    notes: r.notes,
    ownerId: r.owner_id,
    ownerName: r.owner_name,
    areaM2: r.area_m2,
    onLand: r.on_land,
    importId: r.import_id,
    worstRating: (r.worst_rating as Lease['worstRating']) ?? null,
    expectedDaysPerYear: r.expected_days,
    probabilityAnyExposure: r.probability_any,
    annualRating: (r.annual_rating as Lease['annualRating']) ?? null,
    closureDaysPerYear: r.closure_days,
    harmfulSalinityChancePerYear: r.harmful_chance,
    createdAt: new Date(r.created_at).toISOString(),
    updatedAt: new Date(r.updated_at).toISOString(),
    ...(r.geometry ? { geometry: JSON.parse(r.geometry) } : {}),
    ...(r.scenario_ratings !== undefined ? { scenarioRatings: r.scenario_ratings ?? {} } : {}),
  };
}

/**
 * Across every river that screens a lease: its worst per-flood rating, the largest days below tolerance, and the
 * yearly figures combined as shared/scoring/annual-rating.ts's `combineAnnualFigures` does (closure days added,
 * capped at 365; chances as independent rivers, rounded to 12 decimals like it) with the yearly rating set from them.
 */
const SELECT_LEASE = (withGeometry: boolean, ratingsRiverId?: string) => sql`
  SELECT l.id, l.lease_code, l.holder, l.species, l.status, l.notes, l.owner_id, u.name AS owner_name,
         l.area_m2, l.on_land, l.import_id, l.created_at, l.updated_at,
         x.worst_rating, x.expected_days, x.probability_any, x.closure_days, x.harmful_chance,
         ${sql.raw(annualRatingSql('x.closure_days', 'x.harmful_chance'))} AS annual_rating
         ${withGeometry ? sql`, ST_AsGeoJSON(l.geom, 7) AS geometry` : sql``}
         ${
           ratingsRiverId
             ? sql`, (SELECT jsonb_object_agg(s.scenario_id, s.rating) FROM screenings s
                     WHERE s.lease_id = l.id AND s.river_id = ${ratingsRiverId}::uuid) AS scenario_ratings`
             : sql``
         }
    FROM leases l JOIN users u ON u.id = l.owner_id
    LEFT JOIN LATERAL (
      SELECT (ARRAY['low','moderate','high','severe'])[max(array_position(ARRAY['low','moderate','high','severe'], a.worst_rating))] AS worst_rating,
             max(a.expected_days_per_year) AS expected_days, max(a.probability_any_exposure) AS probability_any,
             CASE WHEN count(*) = 0 OR count(*) > count(a.closure_days_per_year) THEN NULL
                  ELSE least(365, sum(a.closure_days_per_year)) END AS closure_days,
             CASE WHEN count(*) = 0 OR count(*) > count(a.harmful_salinity_chance) THEN NULL
                  WHEN count(*) = 1 THEN max(a.harmful_salinity_chance)
                  ELSE round((1 - exp(sum(ln(greatest(1 - a.harmful_salinity_chance, 1e-300)))))::numeric, 12)::float8 END AS harmful_chance
        FROM lease_annual_exposure a WHERE a.lease_id = l.id) x ON true`;

export function createLeasesService(db: Database, hooks: { onLeasesChanged?: (ids: string[]) => Promise<void> } = {}) {
  function filters(user: CurrentUser, q: Partial<LeaseListQuery>): SQL {
    const parts: SQL[] = [visibleLeases(user)];
    if (q.q) parts.push(sql`(l.lease_code ILIKE ${`%${q.q}%`} OR l.holder ILIKE ${`%${q.q}%`})`);
    if (q.status) parts.push(sql`l.status = ${q.status}`);
    if (q.species) parts.push(sql`l.species ILIKE ${q.species}`);
    if (q.ownerId) parts.push(sql`l.owner_id = ${q.ownerId}`);
    return sql.join(parts, sql` AND `);
  }

  async function list(user: CurrentUser, q: LeaseListQuery) {
    const where = filters(user, q);
    const dir = q.order === 'desc' ? 'DESC' : 'ASC';
    // The yearly rating, then closure days, then the chance (the Overview's order when descending).
    const keys =
      q.sort === 'annualRating'
        ? [RATING_RANK(annualRatingSql('x.closure_days', 'x.harmful_chance')), 'x.closure_days', 'x.harmful_chance']
        : [SORT_COLUMNS[q.sort]];
    const order = sql.raw(`${keys.map((k) => `${k} ${dir} NULLS LAST`).join(', ')}, l.lease_code, l.id`);
    const rows = await db.execute<LeaseRow>(
      sql`${SELECT_LEASE(q.withGeometry, q.ratingsRiverId)} WHERE ${where} ORDER BY ${order} LIMIT ${q.limit} OFFSET ${q.offset}`,
    );
    const total = await db.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM leases l WHERE ${where}`);
    return { items: rows.rows.map(toLease), total: total.rows[0].n };
  }

  async function get(user: CurrentUser, id: string): Promise<Lease> {
    const rows = await db.execute<LeaseRow>(sql`${SELECT_LEASE(true)} WHERE l.id = ${id}::uuid AND ${visibleLeases(user)}`);
    if (!rows.rows[0]) throw new NotFoundError('No lease with this id that you can see. It may have been deleted, or not shared with you.');
    return toLease(rows.rows[0]);
  }

  async function requireOwner(user: CurrentUser, id: string) {
    const lease = await get(user, id);
    if (lease.ownerId !== user.id) {
      throw new ForbiddenError('Only the account that holds this lease can change or delete it. Ask its holder.');
    }
    return lease;
  }

  async function update(user: CurrentUser, id: string, patch: LeaseUpdate): Promise<Lease> {
    const before = await requireOwner(user, id);
    await db.transaction(async (tx) => {
      await tx.execute(sql`
        UPDATE leases SET
          lease_code = COALESCE(${patch.leaseId ?? null}, lease_code),
          holder = CASE WHEN ${patch.holder !== undefined} THEN ${patch.holder ?? null} ELSE holder END,
          species = CASE WHEN ${patch.species !== undefined} THEN ${patch.species ?? null} ELSE species END,
          status = COALESCE(${patch.status ?? null}::lease_status, status),
          notes = CASE WHEN ${patch.notes !== undefined} THEN ${patch.notes ?? null} ELSE notes END,
          updated_at = now()
        WHERE id = ${id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'lease.update',
        subjectType: 'lease',
        subjectId: id,
        before: { leaseId: before.leaseId, holder: before.holder, species: before.species, status: before.status, notes: before.notes },
        after: patch,
      });
    });
    if (patch.species !== undefined || patch.status !== undefined) await hooks.onLeasesChanged?.([id]);
    return get(user, id);
  }

  async function remove(user: CurrentUser, id: string): Promise<void> {
    const before = await requireOwner(user, id);
    await db.transaction(async (tx) => {
      await tx.execute(sql`DELETE FROM leases WHERE id = ${id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'lease.delete',
        subjectType: 'lease',
        subjectId: id,
        before: { leaseId: before.leaseId, status: before.status },
      });
    });
  }

  async function exportRows(user: CurrentUser, status?: 'held' | 'candidate') {
    const where = filters(user, { status });
    const rows = await db.execute<LeaseRow>(sql`${SELECT_LEASE(true)} WHERE ${where} ORDER BY l.lease_code, l.id`);
    return rows.rows.map(toLease);
  }

  return { list, get, update, remove, exportRows };
}

export type LeasesService = ReturnType<typeof createLeasesService>;

/** RFC 4180 CSV: quotes around fields with commas, quotes or line breaks; quotes doubled. */
export function toCsv(header: string[], rows: (string | number | boolean | null)[][]): string {
  const cell = (v: string | number | boolean | null) => {
    if (v === null || v === undefined) return '';
    const s = String(v);
    // A leading =, +, - or @ would run as a formula in a spreadsheet: prefix it.
    const safe = /^[=+\-@]/.test(s) && typeof v === 'string' ? `'${s}` : s;
    return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
  };
  return `${[header, ...rows].map((r) => r.map(cell).join(',')).join('\r\n')}\r\n`;
}
