/**
 * Sharing leases with advisers and regulators, and notes on a lease (issue "Grower's app I").
 * Only a lease's holder shares it; a lease the caller cannot see answers 404 (its existence stays
 * hidden). Whether an e-mail has an account is never revealed: every e-mail that is not an
 * adviser's or regulator's account gets the same answer.
 */
import { sql } from 'drizzle-orm';
import type { Role } from '#shared/schemas/roles';
import type { LeaseNote, LeaseShare, ShareLeases, ShareResult } from '#shared/schemas/sharing';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors';
import { recordAudit } from './audit.service';
import { deliverToInbox } from './inbox.service';
import { visibleLeases } from './leases.service';

const SHAREABLE_ROLES: Role[] = ['adviser', 'regulator'];

export const notAGranteeMessage = (email: string) =>
  `${email} is not an adviser or regulator account on Brackline. Ask them to accept an invitation first.`;

type NoteRow = { id: string; lease_id: string; body: string; created_at: Date; author_id: string; author_name: string | null; author_role: Role };

function toNote(r: NoteRow): LeaseNote {
  return {
    id: r.id,
    leaseId: r.lease_id,
    body: r.body,
    createdAt: new Date(r.created_at).toISOString(),
    author: { id: r.author_id, name: r.author_name, role: r.author_role },
  };
}

export function createSharingService(db: Database) {
  /** The lease if `user` may see it (404 otherwise), with whether they hold it and whether it is shared with them. */
  async function visibleLease(user: CurrentUser, leaseId: string) {
    const rows = await db.execute<{ id: string; lease_code: string; owner_id: string; shared_with_me: boolean }>(sql`
      SELECT l.id, l.lease_code, l.owner_id,
             EXISTS (SELECT 1 FROM lease_shares s WHERE s.lease_id = l.id AND s.grantee_id = ${user.id}) AS shared_with_me
        FROM leases l WHERE l.id = ${leaseId}::uuid AND ${visibleLeases(user)}`);
    const lease = rows.rows[0];
    if (!lease) throw new NotFoundError('No lease with this id that you can see. It may have been deleted, or not shared with you.');
    return lease;
  }

  async function requireHolder(user: CurrentUser, leaseId: string) {
    const lease = await visibleLease(user, leaseId);
    if (lease.owner_id !== user.id) {
      throw new ForbiddenError(`Only the account that holds lease ${lease.lease_code} can see or change whom it is shared with. Ask its holder.`);
    }
    return lease;
  }

  async function share(user: CurrentUser, input: ShareLeases): Promise<ShareResult> {
    const ids = [...new Set(input.leaseIds)];
    const found = await db.execute<{ id: string; lease_code: string; owner_id: string }>(sql`
      SELECT l.id, l.lease_code, l.owner_id FROM leases l
       WHERE l.id = ANY(${`{${ids.join(',')}}`}::uuid[]) AND ${visibleLeases(user)}`);
    const byId = new Map(found.rows.map((r) => [r.id, r]));
    const missing = ids.filter((id) => !byId.has(id));
    if (missing.length) {
      throw new NotFoundError(
        `No lease that you can see has ${missing.length === 1 ? 'this id' : 'these ids'}: ${missing.join(', ')}. They may have been deleted; reload the list and choose again.`,
      );
    }
    const notHeld = found.rows.filter((r) => r.owner_id !== user.id);
    if (notHeld.length) {
      throw new ForbiddenError(
        `Only a lease's holder can share it, and you do not hold ${notHeld.map((r) => `${r.lease_code} (${r.id})`).join(', ')}. Leave ${notHeld.length === 1 ? 'it' : 'them'} out of the selection.`,
      );
    }

    const email = input.email.toLowerCase();
    const grantees = await db.execute<{ id: string; name: string | null; email: string; role: Role; disabled: boolean }>(
      sql`SELECT id, name, email, role, disabled FROM users WHERE lower(email) = ${email} LIMIT 1`,
    );
    const grantee = grantees.rows[0];
    if (!grantee || grantee.disabled || !SHAREABLE_ROLES.includes(grantee.role)) throw new UnprocessableError(notAGranteeMessage(input.email));
    if (grantee.id === user.id) throw new UnprocessableError('These leases are already yours: share them with another adviser or regulator.');

    await db.transaction(async (tx) => {
      const inserted = await tx.execute(sql`
        INSERT INTO lease_shares (lease_id, grantee_id)
        SELECT unnest(${`{${ids.join(',')}}`}::uuid[]), ${grantee.id}
        ON CONFLICT DO NOTHING`);
      const n = inserted.rowCount ?? 0;
      await recordAudit(tx, {
        actorId: user.id,
        action: 'lease.share',
        subjectType: 'user',
        subjectId: grantee.id,
        jurisdictionId: user.jurisdictionId,
        after: { leaseIds: ids, grantee: grantee.email, granteeRole: grantee.role, newlyShared: n },
      });
    });
    return { shared: ids.length, grantee: { id: grantee.id, name: grantee.name, email: grantee.email } };
  }

  async function listShares(user: CurrentUser, leaseId: string): Promise<{ items: LeaseShare[] }> {
    await requireHolder(user, leaseId);
    const rows = await db.execute<{ user_id: string; name: string | null; email: string; role: Role; granted_at: Date }>(sql`
      SELECT u.id AS user_id, u.name, u.email, u.role, s.granted_at
        FROM lease_shares s JOIN users u ON u.id = s.grantee_id
       WHERE s.lease_id = ${leaseId}::uuid
       ORDER BY s.granted_at, u.email`);
    return {
      items: rows.rows.map((r) => ({ userId: r.user_id, name: r.name, email: r.email, role: r.role, grantedAt: new Date(r.granted_at).toISOString() })),
    };
  }

  async function revoke(user: CurrentUser, leaseId: string, granteeId: string): Promise<void> {
    const lease = await requireHolder(user, leaseId);
    await db.transaction(async (tx) => {
      const deleted = await tx.execute<{ grantee_id: string }>(
        sql`DELETE FROM lease_shares WHERE lease_id = ${leaseId}::uuid AND grantee_id = ${granteeId} RETURNING grantee_id`,
      );
      if (!deleted.rows.length) throw new NotFoundError(`Lease ${lease.lease_code} is not shared with that user. Reload its shares to see whom it is shared with.`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'lease.unshare',
        subjectType: 'lease',
        subjectId: leaseId,
        jurisdictionId: user.jurisdictionId,
        before: { granteeId },
      });
    });
  }

  const SELECT_NOTES = sql`
    SELECT n.id, n.lease_id, n.body, n.created_at, u.id AS author_id, u.name AS author_name, u.role AS author_role
      FROM lease_notes n JOIN users u ON u.id = n.author_id`;

  async function listNotes(user: CurrentUser, leaseId: string): Promise<{ items: LeaseNote[] }> {
    await visibleLease(user, leaseId);
    const rows = await db.execute<NoteRow>(sql`${SELECT_NOTES} WHERE n.lease_id = ${leaseId}::uuid ORDER BY n.created_at DESC, n.id DESC`);
    return { items: rows.rows.map(toNote) };
  }

  async function addNote(user: CurrentUser, leaseId: string, body: string): Promise<LeaseNote> {
    const lease = await visibleLease(user, leaseId);
    const mayWrite = lease.owner_id === user.id || (user.role === 'adviser' && lease.shared_with_me);
    if (!mayWrite) {
      throw new ForbiddenError(`Only the holder of lease ${lease.lease_code} and the advisers it is shared with can write notes on it. You can still read them.`);
    }
    const id = await db.transaction(async (tx) => {
      const inserted = await tx.execute<{ id: string }>(
        sql`INSERT INTO lease_notes (lease_id, author_id, body) VALUES (${leaseId}::uuid, ${user.id}, ${body}) RETURNING id`,
      );
      const noteId = inserted.rows[0].id;
      await recordAudit(tx, {
        actorId: user.id,
        action: 'lease.note',
        subjectType: 'lease',
        subjectId: leaseId,
        jurisdictionId: user.jurisdictionId,
        after: { noteId, chars: body.length },
      });
      if (lease.owner_id !== user.id) {
        await deliverToInbox(tx, [
          {
            userId: lease.owner_id,
            kind: 'note',
            title: `${user.name ?? user.email} wrote a note on lease ${lease.lease_code}`,
            body: body.length > 200 ? `${body.slice(0, 197)}…` : body,
            link: `/leases/${leaseId}`,
            dedupeKey: `note:${noteId}`,
          },
        ]);
      }
      return noteId;
    });
    const rows = await db.execute<NoteRow>(sql`${SELECT_NOTES} WHERE n.id = ${id}::uuid`);
    return toNote(rows.rows[0]);
  }

  return { share, listShares, revoke, listNotes, addNote };
}

export type SharingService = ReturnType<typeof createSharingService>;
