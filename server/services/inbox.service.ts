/**
 * The in-app inbox: closure notices, alerts, invitations and notes land here beside their e-mail.
 * Writes run inside the caller's transaction; a repeated dedupe key for the same user is ignored,
 * so a retried job never shows the same message twice.
 */
import { and, desc, eq, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { inboxMessages } from '../db/schema';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

export interface InboxDelivery {
  userId: string;
  kind: 'notice' | 'alert' | 'invitation' | 'note';
  title: string;
  body: string;
  link?: string | null;
  dedupeKey?: string | null;
}

/** Adds messages to users' inboxes; returns how many were new (duplicates by dedupe key are skipped). */
export async function deliverToInbox(tx: Tx | Database, messages: InboxDelivery[]): Promise<number> {
  if (messages.length === 0) return 0;
  const inserted = await tx
    .insert(inboxMessages)
    .values(messages.map((m) => ({ ...m, link: m.link ?? null, dedupeKey: m.dedupeKey ?? null })))
    .onConflictDoNothing()
    .returning({ id: inboxMessages.id });
  return inserted.length;
}

export function createInboxService(db: Database) {
  return {
    /**
     * The newest messages and the count of unread ones, in one statement: the count is a window over all the user's
     * messages (windows are worked out before LIMIT), so a busy page costs one pool connection, not two.
     */
    async list(userId: string, limit = 50): Promise<{ rows: (typeof inboxMessages.$inferSelect)[]; unread: number }> {
      const rows = await db
        .select({ message: inboxMessages, unread: sql<number>`(count(*) FILTER (WHERE ${inboxMessages.readAt} IS NULL) OVER ())::int` })
        .from(inboxMessages)
        .where(eq(inboxMessages.userId, userId))
        .orderBy(desc(inboxMessages.createdAt))
        .limit(limit);
      return { rows: rows.map((r) => r.message), unread: rows[0]?.unread ?? 0 };
    },
    /** Marks one of the user's own messages read; false when it is not theirs or does not exist. */
    async markRead(userId: string, id: string): Promise<boolean> {
      const rows = await db
        .update(inboxMessages)
        .set({ readAt: new Date() })
        .where(and(eq(inboxMessages.id, id), eq(inboxMessages.userId, userId)))
        .returning({ id: inboxMessages.id });
      return rows.length > 0;
    },
  };
}
