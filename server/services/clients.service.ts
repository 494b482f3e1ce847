/**
 * Advisers and their clients. An adviser invites a grower by e-mail; the grower, signed in with
 * that e-mail, accepts and chooses which of their leases to share (through lease_shares, the same
 * table as sharing from the leases table), changes the choice later, or ends the link, which stops
 * sharing every lease with that adviser. Whether an e-mail has an account is never revealed to the
 * adviser: every invitation gets the same answer and the same e-mail.
 */
import { sql } from 'drizzle-orm';
import type { AdviserLink, Client, ClientInvite } from '#shared/schemas/clients';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors';
import type { Mailer } from '../mail/mailer';
import { recordAudit } from './audit.service';
import { deliverToInbox } from './inbox.service';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

type InvitationRow = {
  id: string;
  adviser_id: string;
  email: string;
  grower_id: string | null;
  status: 'pending' | 'accepted' | 'declined' | 'ended';
  message: string | null;
  created_at: Date;
  responded_at: Date | null;
};

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);
const pgUuids = (ids: string[]) => `{${ids.join(',')}}`;

export function createClientsService(deps: { db: Database; mailer: Mailer; appUrl: string }) {
  const { db, mailer, appUrl } = deps;

  async function invite(user: CurrentUser, input: ClientInvite): Promise<{ invitationId: string; email: string }> {
    const email = input.email.toLowerCase();
    if (email === user.email.toLowerCase()) throw new UnprocessableError('That is your own e-mail address. Invite a grower by their e-mail address.');
    const open = await db.execute<{ status: string }>(sql`
      SELECT status FROM client_invitations WHERE adviser_id = ${user.id} AND email = ${email} AND status IN ('pending', 'accepted')`);
    if (open.rows[0]) {
      throw new ConflictError(
        open.rows[0].status === 'accepted'
          ? `${email} is already your client. Their shared leases are on your Clients page.`
          : `You have already invited ${email}; the invitation is waiting for them. Cancel it on your Clients page to send a new one.`,
      );
    }
    const id = await db.transaction(async (tx) => {
      const res = await tx.execute<{ id: string }>(sql`
        INSERT INTO client_invitations (adviser_id, email, message) VALUES (${user.id}, ${email}, ${input.message || null}) RETURNING id`);
      const invitationId = res.rows[0].id;
      await recordAudit(tx, { actorId: user.id, action: 'client.invite', subjectType: 'client_invitation', subjectId: invitationId, jurisdictionId: user.jurisdictionId, after: { email } });
      const grower = await tx.execute<{ id: string }>(sql`SELECT id FROM users WHERE lower(email) = ${email} AND role = 'grower' AND NOT disabled LIMIT 1`);
      if (grower.rows[0]) {
        await deliverToInbox(tx, [
          {
            userId: grower.rows[0].id,
            kind: 'invitation',
            title: `${user.name ?? user.email} would like to advise you`,
            body: 'Open Advisers to accept and choose which leases to share, or to decline.',
            link: '/advisers',
            dedupeKey: `client-invitation:${invitationId}`,
          },
        ]);
      }
      return invitationId;
    });
    const who = user.name ? `${user.name} (${user.email})` : user.email;
    await mailer.send({
      to: email,
      subject: `${user.name ?? user.email} invites you to share your leases on Brackline`,
      text:
        `${who}, an adviser on Brackline, would like to advise you on your shellfish leases.\n\n` +
        (input.message ? `Their note: ${input.message}\n\n` : '') +
        `Sign in with this e-mail address and open Advisers to accept and choose which leases to share (you can stop sharing at any time):\n${appUrl}/advisers\n\n` +
        `No account yet? Sign up as a grower with this e-mail address first:\n${appUrl}/sign-up\n`,
    });
    return { invitationId: id, email };
  }

  async function listClients(user: CurrentUser): Promise<{ items: Client[] }> {
    const res = await db.execute<InvitationRow & { grower_name: string | null; grower_user_id: string | null; leases: Client['leases'] | null }>(sql`
      SELECT i.*, g.name AS grower_name, g.id AS grower_user_id,
             (SELECT jsonb_agg(jsonb_build_object('id', l.id, 'leaseId', l.lease_code, 'species', l.species, 'status', l.status, 'worstRating', x.worst_rating) ORDER BY l.lease_code)
                FROM leases l JOIN lease_shares s ON s.lease_id = l.id AND s.grantee_id = i.adviser_id
                LEFT JOIN LATERAL (
                  SELECT (ARRAY['low','moderate','high','severe'])[max(array_position(ARRAY['low','moderate','high','severe'], a.worst_rating))] AS worst_rating
                    FROM lease_annual_exposure a WHERE a.lease_id = l.id) x ON true
               WHERE i.status = 'accepted' AND l.owner_id = i.grower_id) AS leases
        FROM client_invitations i LEFT JOIN users g ON g.id = i.grower_id
       WHERE i.adviser_id = ${user.id} AND i.status IN ('pending', 'accepted')
       ORDER BY i.status, coalesce(g.name, i.email)`);
    return {
      items: res.rows.map((r) => ({
        invitationId: r.id,
        status: r.status,
        grower: { id: r.grower_user_id, name: r.grower_name, email: r.email },
        invitedAt: iso(r.created_at)!,
        respondedAt: iso(r.responded_at),
        leases: r.leases ?? [],
      })),
    };
  }

  async function cancel(user: CurrentUser, invitationId: string): Promise<void> {
    await db.transaction(async (tx) => {
      const res = await tx.execute<InvitationRow>(sql`SELECT * FROM client_invitations WHERE id = ${invitationId}::uuid AND adviser_id = ${user.id} FOR UPDATE`);
      const inv = res.rows[0];
      if (!inv) throw new NotFoundError('No invitation of yours with this id. Reload your Clients page.');
      if (inv.status !== 'pending') throw new ConflictError('Only a waiting invitation can be cancelled; an accepted client decides themselves when to stop sharing.');
      await tx.execute(sql`UPDATE client_invitations SET status = 'ended', ended_at = now() WHERE id = ${invitationId}::uuid`);
      await recordAudit(tx, { actorId: user.id, action: 'client.cancel', subjectType: 'client_invitation', subjectId: invitationId, jurisdictionId: user.jurisdictionId, before: { email: inv.email } });
    });
  }

  /** Invitations addressed to the grower's e-mail, and links they accepted. */
  async function listAdvisers(user: CurrentUser): Promise<{ items: AdviserLink[] }> {
    const res = await db.execute<InvitationRow & { adviser_name: string | null; adviser_email: string; lease_ids: string[] | null }>(sql`
      SELECT i.*, a.name AS adviser_name, a.email AS adviser_email,
             (SELECT array_agg(l.id::text ORDER BY l.lease_code) FROM leases l JOIN lease_shares s ON s.lease_id = l.id
               WHERE s.grantee_id = i.adviser_id AND l.owner_id = ${user.id}) AS lease_ids
        FROM client_invitations i JOIN users a ON a.id = i.adviser_id
       WHERE i.status IN ('pending', 'accepted')
         AND ((i.status = 'pending' AND i.email = ${user.email.toLowerCase()}) OR i.grower_id = ${user.id})
       ORDER BY i.status DESC, i.created_at DESC`);
    return {
      items: res.rows.map((r) => ({
        invitationId: r.id,
        status: r.status,
        adviser: { id: r.adviser_id, name: r.adviser_name, email: r.adviser_email },
        message: r.message,
        invitedAt: iso(r.created_at)!,
        respondedAt: iso(r.responded_at),
        leaseIds: r.status === 'accepted' ? (r.lease_ids ?? []) : [],
      })),
    };
  }

  /** The grower's invitation row, locked; 404 when it is not addressed to them. */
  async function ownInvitation(tx: Tx, user: CurrentUser, invitationId: string): Promise<InvitationRow> {
    const res = await tx.execute<InvitationRow>(sql`
      SELECT * FROM client_invitations
       WHERE id = ${invitationId}::uuid AND (grower_id = ${user.id} OR (grower_id IS NULL AND email = ${user.email.toLowerCase()}))
       FOR UPDATE`);
    if (!res.rows[0]) throw new NotFoundError('No invitation to you with this id. It may have been cancelled; reload your Advisers page.');
    return res.rows[0];
  }

  /** Checks that every lease is held by the grower (404 for unknown ids, 403 for others' leases). */
  async function requireHeld(tx: Tx, user: CurrentUser, leaseIds: string[]) {
    if (!leaseIds.length) return;
    const found = await tx.execute<{ id: string; lease_code: string; owner_id: string }>(sql`
      SELECT l.id, l.lease_code, l.owner_id FROM leases l
       WHERE l.id = ANY(${pgUuids(leaseIds)}::uuid[])
         AND (l.owner_id = ${user.id} OR EXISTS (SELECT 1 FROM lease_shares s WHERE s.lease_id = l.id AND s.grantee_id = ${user.id}))`);
    const byId = new Map(found.rows.map((r) => [r.id, r]));
    const missing = leaseIds.filter((id) => !byId.has(id));
    if (missing.length) throw new NotFoundError(`No lease that you can see has ${missing.length === 1 ? 'this id' : 'these ids'}: ${missing.join(', ')}. Reload the list and choose again.`);
    const notHeld = found.rows.filter((r) => r.owner_id !== user.id);
    if (notHeld.length) {
      throw new ForbiddenError(`Only a lease's holder can share it, and you do not hold ${notHeld.map((r) => r.lease_code).join(', ')}. Leave ${notHeld.length === 1 ? 'it' : 'them'} out.`);
    }
  }

  /** Makes exactly `leaseIds` of the grower's leases shared with the adviser. */
  async function setShares(tx: Tx, user: CurrentUser, adviserId: string, leaseIds: string[]) {
    await tx.execute(sql`
      DELETE FROM lease_shares s USING leases l
       WHERE s.lease_id = l.id AND l.owner_id = ${user.id} AND s.grantee_id = ${adviserId}
         AND NOT (s.lease_id = ANY(${pgUuids(leaseIds)}::uuid[]))`);
    if (leaseIds.length) {
      await tx.execute(sql`
        INSERT INTO lease_shares (lease_id, grantee_id) SELECT unnest(${pgUuids(leaseIds)}::uuid[]), ${adviserId} ON CONFLICT DO NOTHING`);
    }
  }

  async function accept(user: CurrentUser, invitationId: string, leaseIds: string[]): Promise<{ items: AdviserLink[] }> {
    const ids = [...new Set(leaseIds)];
    await db.transaction(async (tx) => {
      const inv = await ownInvitation(tx, user, invitationId);
      if (inv.status !== 'pending') throw new ConflictError(`This invitation is already ${inv.status}. Change the shared leases on your Advisers page instead.`);
      await requireHeld(tx, user, ids);
      await tx.execute(sql`UPDATE client_invitations SET status = 'accepted', grower_id = ${user.id}, responded_at = now() WHERE id = ${invitationId}::uuid`);
      await setShares(tx, user, inv.adviser_id, ids);
      await recordAudit(tx, { actorId: user.id, action: 'client.accept', subjectType: 'client_invitation', subjectId: invitationId, jurisdictionId: user.jurisdictionId, after: { adviserId: inv.adviser_id, leaseIds: ids } });
      await deliverToInbox(tx, [
        {
          userId: inv.adviser_id,
          kind: 'invitation',
          title: `${user.name ?? user.email} accepted your invitation`,
          body: `${ids.length} lease${ids.length === 1 ? '' : 's'} shared with you.`,
          link: '/clients',
          dedupeKey: `client-accepted:${invitationId}`,
        },
      ]);
    });
    return listAdvisers(user);
  }

  async function decline(user: CurrentUser, invitationId: string): Promise<void> {
    await db.transaction(async (tx) => {
      const inv = await ownInvitation(tx, user, invitationId);
      if (inv.status !== 'pending') throw new ConflictError(`This invitation is already ${inv.status}.`);
      await tx.execute(sql`UPDATE client_invitations SET status = 'declined', responded_at = now() WHERE id = ${invitationId}::uuid`);
      await recordAudit(tx, { actorId: user.id, action: 'client.decline', subjectType: 'client_invitation', subjectId: invitationId, jurisdictionId: user.jurisdictionId });
    });
  }

  async function setLeases(user: CurrentUser, invitationId: string, leaseIds: string[]): Promise<{ items: AdviserLink[] }> {
    const ids = [...new Set(leaseIds)];
    await db.transaction(async (tx) => {
      const inv = await ownInvitation(tx, user, invitationId);
      if (inv.status !== 'accepted') throw new ConflictError('Accept the invitation first; then choose the leases to share.');
      await requireHeld(tx, user, ids);
      await setShares(tx, user, inv.adviser_id, ids);
      await recordAudit(tx, { actorId: user.id, action: 'client.leases', subjectType: 'client_invitation', subjectId: invitationId, jurisdictionId: user.jurisdictionId, after: { leaseIds: ids } });
    });
    return listAdvisers(user);
  }

  /** Ends the link: the adviser stops seeing every lease of this grower. */
  async function end(user: CurrentUser, invitationId: string): Promise<void> {
    await db.transaction(async (tx) => {
      const inv = await ownInvitation(tx, user, invitationId);
      if (inv.status !== 'accepted') throw new ConflictError(inv.status === 'pending' ? 'This invitation is still waiting: decline it instead.' : `This link is already ${inv.status}.`);
      await setShares(tx, user, inv.adviser_id, []);
      await tx.execute(sql`UPDATE client_invitations SET status = 'ended', ended_at = now() WHERE id = ${invitationId}::uuid`);
      await recordAudit(tx, { actorId: user.id, action: 'client.end', subjectType: 'client_invitation', subjectId: invitationId, jurisdictionId: user.jurisdictionId, before: { adviserId: inv.adviser_id } });
    });
  }

  return { invite, listClients, cancel, listAdvisers, accept, decline, setLeases, end };
}

export type ClientsService = ReturnType<typeof createClientsService>;
