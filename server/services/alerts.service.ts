/**
 * Alert rules and alerts (issue "Paid alerts plan").
 *
 * A lease rule (Alerts plan) fires when a river's gauge reading, or a forecast flow the user types,
 * reaches the flow at which the lease enters a chosen band of its flow sweep. A zone rule (free for
 * regulators) fires when a reading approaches (a fraction of) and when it passes the zone's trigger flow.
 * An event is an up-crossing: the reading is at or above the level and the gauge's previous reading
 * was below it (or there was none). One alert per event per rule (unique dedupe key); each alert lands
 * in the in-app inbox in the same transaction, and its e-mail is a job retried until the mail server takes it.
 */
import { sql } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/node-postgres';
import type pg from 'pg';
import { ALERT_CAUTIONS, type Alert, type AlertRule, type RuleCreate } from '#shared/schemas/alerts';
import type { Database } from '../db/client';
import * as schema from '../db/schema';
import type { CurrentUser } from '../http/route';
import type { AlertJobs, Enqueue } from '../jobs/alert-jobs';
import { ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors';
import type { Mailer } from '../mail/mailer';
import { recordAudit } from './audit.service';
import type { BillingService } from './billing.service';
import { deliverToInbox } from './inbox.service';
import type { SweepService } from './sweep.service';

type Level = 'enters' | 'approaching' | 'passing';

type RuleRow = {
  id: string;
  user_id: string;
  kind: 'lease' | 'zone';
  river_id: string;
  river_name: string;
  lease_id: string | null;
  lease_code: string | null;
  zone_id: string | null;
  zone_name: string | null;
  min_closure_days: number | null;
  band_id: string | null;
  band_name: string | null;
  threshold_flow: number;
  approach_fraction: number | null;
  created_at: Date;
};

const RULE_SELECT = sql`
  SELECT ar.id, ar.user_id, ar.kind, ar.river_id, rv.name AS river_name, ar.lease_id, l.lease_code, ar.zone_id, z.name AS zone_name,
         z.min_closure_days, ar.band_id, ar.band_name, ar.threshold_flow, ar.approach_fraction, ar.created_at
    FROM alert_rules ar JOIN rivers rv ON rv.id = ar.river_id
    LEFT JOIN leases l ON l.id = ar.lease_id LEFT JOIN closure_zones z ON z.id = ar.zone_id`;

function toRule(r: RuleRow): AlertRule {
  return {
    id: r.id,
    kind: r.kind,
    riverId: r.river_id,
    riverName: r.river_name,
    leaseId: r.lease_id,
    leaseCode: r.lease_code,
    zoneId: r.zone_id,
    zoneName: r.zone_name,
    bandId: r.band_id,
    bandName: r.band_name,
    thresholdFlow: r.threshold_flow,
    approachFlow: r.approach_fraction ? r.threshold_flow * r.approach_fraction : null,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

type AlertRow = {
  id: string;
  rule_id: string;
  level: Level;
  source: 'reading' | 'forecast';
  discharge: number;
  observed_at: Date | null;
  subject: string;
  body: string;
  email_status: 'pending' | 'sent' | 'failed';
  email_attempts: number;
  email_last_error: string | null;
  email_sent_at: Date | null;
  created_at: Date;
};

function toAlert(a: AlertRow): Alert {
  return {
    id: a.id,
    ruleId: a.rule_id,
    level: a.level,
    source: a.source,
    discharge: a.discharge,
    observedAt: a.observed_at ? new Date(a.observed_at).toISOString() : null,
    subject: a.subject,
    body: a.body,
    emailStatus: a.email_status,
    emailAttempts: a.email_attempts,
    emailLastError: a.email_last_error,
    emailSentAt: a.email_sent_at ? new Date(a.email_sent_at).toISOString() : null,
    createdAt: new Date(a.created_at).toISOString(),
  };
}

const fmtFlow = (q: number) => `${q >= 100 ? Math.round(q) : Number(q.toPrecision(3))} m³/s`;

/** What entering a sweep band means for the stock (plain words; the numbers come from the band's name). */
function bandMeaning(bandId: string | null): string {
  if (!bandId) return '';
  if (bandId === 'plume-edge')
    return 'River water is predicted to reach the lease: expect fresher, more turbid water and watch the stock and the authority’s notices.';
  if (bandId.startsWith('indicator')) {
    return 'Indicator bacteria in the plume may exceed the approved-area standard at the lease: the shellfish authority may close harvesting, and product harvested now may need to be held. Check the authority’s notices before harvesting.';
  }
  if (bandId.startsWith('salinity-under')) {
    return 'Salinity at the lease may fall below the level the species tolerates: expect stress and, if it lasts, losses. Consider delaying sales, moving stock to higher ground in the lease, or checking salinity on site.';
  }
  return 'The lease is predicted to be inside this band of the plume.';
}

export interface AlertMessage {
  subject: string;
  body: string;
}

/** The alert's words: what flow, which lease or zone, which band, what it means, and the cautions. */
export function composeAlert(
  rule: RuleRow,
  level: Level,
  discharge: number,
  when: { observedAt: Date | null; gauge: string | null; source: 'reading' | 'forecast' },
  appUrl: string,
): AlertMessage {
  const flowLine =
    when.source === 'forecast'
      ? `A forecast flow of ${fmtFlow(discharge)} for the ${rule.river_name} (entered in Brackline).`
      : `The ${rule.river_name} gauge ${when.gauge ?? ''} read ${fmtFlow(discharge)} at ${when.observedAt?.toISOString().replace('T', ' ').slice(0, 16)} UTC.`;
  let subject: string;
  let what: string[];
  let link: string;
  if (rule.kind === 'lease') {
    subject = `Alert: lease ${rule.lease_code} enters "${rule.band_name}" (${rule.river_name} ${fmtFlow(discharge)})`;
    what = [
      `Lease: ${rule.lease_code}.`,
      `Band: ${rule.band_name}. By the lease's flow sweep it enters this band from about ${fmtFlow(rule.threshold_flow)}.`,
      `What it means: ${bandMeaning(rule.band_id)}`,
    ];
    link = `${appUrl}/leases/${rule.lease_id}`;
  } else {
    const approach = rule.threshold_flow * (rule.approach_fraction ?? 0.8);
    subject =
      level === 'passing'
        ? `Alert: closure zone ${rule.zone_name} trigger passed (${rule.river_name} ${fmtFlow(discharge)})`
        : `Alert: closure zone ${rule.zone_name} trigger approaching (${rule.river_name} ${fmtFlow(discharge)})`;
    what = [
      `Closure zone: ${rule.zone_name}. Trigger flow in its management plan: ${fmtFlow(rule.threshold_flow)}.`,
      level === 'passing'
        ? `What it means: the flow has reached the zone's trigger. Under the management plan the zone closes${rule.min_closure_days ? ` for at least ${rule.min_closure_days} days` : ''}; issue or confirm the closure notice.`
        : `What it means: the flow has reached ${Math.round((rule.approach_fraction ?? 0.8) * 100)} % of the trigger (${fmtFlow(approach)}). Prepare a closure notice in case it keeps rising.`,
    ];
    link = `${appUrl}/alerts`;
  }
  const body = [flowLine, '', ...what, '', `Open in Brackline: ${link}`, '', 'Cautions:', ...ALERT_CAUTIONS.map((c) => `- ${c}`)].join(
    '\n',
  );
  return { subject, body };
}

export function createAlertsService(deps: {
  db: Database;
  pool: pg.Pool;
  jobs: AlertJobs;
  billing: BillingService;
  sweeps: SweepService;
  mailer: Mailer;
  appUrl: string;
}) {
  const { db, pool, jobs, billing, sweeps, mailer, appUrl } = deps;

  async function ruleOf(user: CurrentUser, id: string): Promise<RuleRow> {
    const r = await db.execute<RuleRow>(sql`${RULE_SELECT} WHERE ar.id = ${id}::uuid AND ar.user_id = ${user.id}`);
    if (!r.rows[0]) throw new NotFoundError('No alert rule of yours has this id. It may have been deleted; reload the list.');
    return r.rows[0];
  }

  async function listRules(user: CurrentUser) {
    const r = await db.execute<RuleRow>(sql`${RULE_SELECT} WHERE ar.user_id = ${user.id} ORDER BY ar.created_at DESC`);
    return { items: r.rows.map(toRule) };
  }

  async function createRule(user: CurrentUser, input: RuleCreate): Promise<AlertRule> {
    let values: typeof schema.alertRules.$inferInsert;
    if (input.kind === 'lease') {
      await billing.requireAlertsPlan(user);
      const sweep = await sweeps.sweep(user, input.leaseId, input.riverId);
      const band = sweep.bands.find((b) => b.bandId === input.bandId);
      if (!band) {
        throw new UnprocessableError(
          `Lease ${sweep.leaseCode} has no band "${input.bandId}" in its flow sweep. Choose one of: ${sweep.bands.map((b) => b.bandId).join(', ')}.`,
        );
      }
      if (band.entersAtDischarge === null) {
        throw new UnprocessableError(
          `By its flow sweep, lease ${sweep.leaseCode} does not enter "${band.name}" at any flow of the ${sweep.riverName} up to ${fmtFlow(sweep.curve.at(-1)!.discharge)}. Choose a band it enters.`,
        );
      }
      values = {
        userId: user.id,
        kind: 'lease',
        riverId: input.riverId,
        leaseId: input.leaseId,
        bandId: band.bandId,
        bandName: band.name,
        thresholdFlow: band.entersAtDischarge,
      };
    } else {
      if (user.role !== 'regulator')
        throw new ForbiddenError('Closure-zone alerts are for regulators. Growers and advisers set lease alerts (Alerts plan).');
      const z = await db.execute<{ id: string; name: string; river_id: string | null; trigger_flow: number | null }>(
        sql`SELECT id, name, river_id, trigger_flow FROM closure_zones WHERE id = ${input.zoneId}::uuid AND jurisdiction_id = ${user.jurisdictionId}::uuid`,
      );
      const zone = z.rows[0];
      if (!zone) throw new NotFoundError('No closure zone with this id in your jurisdiction.');
      if (!zone.river_id || !zone.trigger_flow)
        throw new UnprocessableError(`Zone ${zone.name} has no river or trigger flow yet. Set them in its management plan first.`);
      values = {
        userId: user.id,
        kind: 'zone',
        riverId: zone.river_id,
        zoneId: zone.id,
        thresholdFlow: zone.trigger_flow,
        approachFraction: input.approachFraction ?? 0.8,
      };
    }
    const id = await db.transaction(async (tx) => {
      const [row] = await tx.insert(schema.alertRules).values(values).returning({ id: schema.alertRules.id });
      await recordAudit(tx, {
        actorId: user.id,
        action: 'alert_rule.created',
        subjectType: 'alert_rule',
        subjectId: row.id,
        after: values,
      });
      return row.id;
    });
    return toRule(await ruleOf(user, id));
  }

  async function deleteRule(user: CurrentUser, id: string): Promise<void> {
    const rule = await ruleOf(user, id);
    await db.transaction(async (tx) => {
      await tx.execute(sql`DELETE FROM alert_rules WHERE id = ${rule.id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'alert_rule.deleted',
        subjectType: 'alert_rule',
        subjectId: rule.id,
        before: toRule(rule),
      });
    });
  }

  /** Closure zones of the regulator's jurisdiction, with their river and trigger flow. */
  async function zones(user: CurrentUser) {
    const r = await db.execute<{ id: string; name: string; river_name: string | null; trigger_flow: number | null }>(sql`
      SELECT z.id, z.name, rv.name AS river_name, z.trigger_flow FROM closure_zones z LEFT JOIN rivers rv ON rv.id = z.river_id
       WHERE z.jurisdiction_id = ${user.jurisdictionId}::uuid ORDER BY z.name`);
    return { items: r.rows.map((z) => ({ id: z.id, name: z.name, riverName: z.river_name, triggerFlow: z.trigger_flow })) };
  }

  async function listAlerts(user: CurrentUser, limit = 100) {
    const r = await db.execute<AlertRow>(sql`SELECT * FROM alerts WHERE user_id = ${user.id} ORDER BY created_at DESC LIMIT ${limit}`);
    return { items: r.rows.map(toAlert) };
  }

  /** Stores new alerts (skipping repeats), puts them in the inbox and queues their e-mails, all in the caller's transaction. */
  async function storeAlerts(
    client: pg.PoolClient,
    enqueue: Enqueue,
    items: {
      rule: RuleRow;
      level: Level;
      dedupeKey: string;
      source: 'reading' | 'forecast';
      readingId: string | null;
      discharge: number;
      observedAt: Date | null;
      gauge: string | null;
    }[],
  ): Promise<string[]> {
    const created: string[] = [];
    const inbox = drizzle(client, { schema });
    for (const it of items) {
      const msg = composeAlert(it.rule, it.level, it.discharge, { observedAt: it.observedAt, gauge: it.gauge, source: it.source }, appUrl);
      const res = await client.query<{ id: string }>(
        `INSERT INTO alerts (rule_id, user_id, dedupe_key, level, source, reading_id, discharge, observed_at, subject, body)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10) ON CONFLICT (rule_id, dedupe_key) DO NOTHING RETURNING id`,
        [it.rule.id, it.rule.user_id, it.dedupeKey, it.level, it.source, it.readingId, it.discharge, it.observedAt, msg.subject, msg.body],
      );
      const id = res.rows[0]?.id;
      if (!id) continue;
      created.push(id);
      await deliverToInbox(inbox as unknown as Database, [
        {
          userId: it.rule.user_id,
          kind: 'alert',
          title: msg.subject,
          body: msg.body,
          link: it.rule.lease_id ? `/leases/${it.rule.lease_id}` : '/alerts',
          dedupeKey: `alert:${it.rule.id}:${it.dedupeKey}`,
        },
      ]);
      await enqueue({ name: 'email', alertId: id });
    }
    return created;
  }

  /** The rules a reading can fire: same river; zone rules only on the zone's own gauge; lease rules only with the plan. */
  async function rulesFor(client: pg.PoolClient, riverId: string, gaugeId: string): Promise<RuleRow[]> {
    const r = await client.query<RuleRow>(
      `SELECT ar.id, ar.user_id, ar.kind, ar.river_id, rv.name AS river_name, ar.lease_id, l.lease_code, ar.zone_id, z.name AS zone_name,
              z.min_closure_days, ar.band_id, ar.band_name, ar.threshold_flow, ar.approach_fraction, ar.created_at
         FROM alert_rules ar JOIN rivers rv ON rv.id = ar.river_id JOIN users u ON u.id = ar.user_id
         LEFT JOIN leases l ON l.id = ar.lease_id LEFT JOIN closure_zones z ON z.id = ar.zone_id
         LEFT JOIN billing_accounts b ON b.user_id = ar.user_id
        WHERE ar.river_id = $1 AND NOT u.disabled
          AND (ar.kind = 'zone' AND (z.gauge_id IS NULL OR z.gauge_id = $2)
               OR ar.kind = 'lease' AND b.status = ANY($3::text[]))`,
      [riverId, gaugeId, ['active', 'trialing', 'past_due']],
    );
    return r.rows;
  }

  function levelsOf(rule: RuleRow): { level: Level; flow: number }[] {
    if (rule.kind === 'lease') return [{ level: 'enters', flow: rule.threshold_flow }];
    return [
      { level: 'approaching', flow: rule.threshold_flow * (rule.approach_fraction ?? 0.8) },
      { level: 'passing', flow: rule.threshold_flow },
    ];
  }

  /** Evaluates stored readings against the rules; returns the ids of new alerts. */
  async function evaluateReadings(client: pg.PoolClient, enqueue: Enqueue, readingIds: string[]): Promise<string[]> {
    const readings = await client.query<{
      id: string;
      gauge_id: string;
      observed_at: Date;
      discharge: number;
      river_id: string;
      code: string;
      prev: number | null;
    }>(
      `SELECT r.id, r.gauge_id, r.observed_at, r.discharge, g.river_id, g.code,
              (SELECT p.discharge FROM gauge_readings p WHERE p.gauge_id = r.gauge_id AND p.observed_at < r.observed_at ORDER BY p.observed_at DESC LIMIT 1) AS prev
         FROM gauge_readings r JOIN gauges g ON g.id = r.gauge_id WHERE r.id = ANY($1::uuid[]) ORDER BY r.observed_at`,
      [readingIds],
    );
    const rulesByKey = new Map<string, RuleRow[]>();
    const created: string[] = [];
    for (const r of readings.rows) {
      const key = `${r.river_id}:${r.gauge_id}`;
      if (!rulesByKey.has(key)) rulesByKey.set(key, await rulesFor(client, r.river_id, r.gauge_id));
      const items = [];
      for (const rule of rulesByKey.get(key)!) {
        for (const { level, flow } of levelsOf(rule)) {
          if (r.discharge >= flow && (r.prev === null || r.prev < flow)) {
            items.push({
              rule,
              level,
              dedupeKey: `${level}:${r.gauge_id}:${new Date(r.observed_at).toISOString()}`,
              source: 'reading' as const,
              readingId: r.id,
              discharge: r.discharge,
              observedAt: new Date(r.observed_at),
              gauge: r.code,
            });
          }
        }
      }
      created.push(...(await storeAlerts(client, enqueue, items)));
    }
    return created;
  }

  /** A forecast flow the user typed: alerts now if it reaches the rule's flow (once per rule and flow). */
  async function forecast(user: CurrentUser, ruleId: string, discharge: number) {
    const rule = await ruleOf(user, ruleId);
    if (rule.kind === 'lease') await billing.requireAlertsPlan(user);
    const levels = levelsOf(rule).filter((l) => discharge >= l.flow);
    const top = levels.at(-1);
    if (!top) return { reaches: false, thresholdFlow: rule.threshold_flow, alert: null };
    const ids = await jobs.transaction((client, enqueue) =>
      storeAlerts(client, enqueue, [
        {
          rule,
          level: top.level,
          dedupeKey: `forecast:${top.level}:${discharge}`,
          source: 'forecast',
          readingId: null,
          discharge,
          observedAt: null,
          gauge: null,
        },
      ]),
    );
    const r = await db.execute<AlertRow>(
      sql`SELECT * FROM alerts WHERE rule_id = ${rule.id}::uuid AND dedupe_key = ${`forecast:${top.level}:${discharge}`}`,
    );
    return { reaches: true, thresholdFlow: rule.threshold_flow, alert: r.rows[0] ? toAlert(r.rows[0]) : null, newAlert: ids.length > 0 };
  }

  /**
   * Sends one alert's e-mail unless it was sent already. Each alert has exactly one e-mail job (queued
   * in the transaction that created it), and pg-boss runs a job on one worker at a time, so no lock is
   * held while talking to the mail server (the local fake writes to the same database pool). A failure
   * is recorded on the alert (visible to its user) and rethrown, so the job is retried with backoff.
   */
  async function sendEmail(alertId: string, final: boolean): Promise<void> {
    const r = await pool.query<{ id: string; email_status: string; subject: string; body: string; email: string }>(
      `SELECT a.id, a.email_status, a.subject, a.body, u.email FROM alerts a JOIN users u ON u.id = a.user_id WHERE a.id = $1`,
      [alertId],
    );
    const alert = r.rows[0];
    if (!alert || alert.email_status === 'sent') return;
    try {
      await mailer.send({ to: alert.email, subject: alert.subject, text: alert.body });
    } catch (err) {
      const failure = err as Error;
      await pool.query(
        `UPDATE alerts SET email_attempts = email_attempts + 1, email_last_error = $2, email_status = $3 WHERE id = $1 AND email_status <> 'sent'`,
        [alertId, `The mail server did not take the message: ${failure.message}`, final ? 'failed' : 'pending'],
      );
      throw failure;
    }
    await pool.query(
      `UPDATE alerts SET email_status = 'sent', email_attempts = email_attempts + 1, email_sent_at = now(), email_last_error = NULL WHERE id = $1`,
      [alertId],
    );
  }

  return { listRules, createRule, deleteRule, listAlerts, zones, evaluateReadings, forecast, sendEmail };
}

export type AlertsService = ReturnType<typeof createAlertsService>;
