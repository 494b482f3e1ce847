import type { Database } from '../db/client';
import { auditEntries } from '../db/schema';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

export interface AuditRecord {
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId?: string | null;
  jurisdictionId?: string | null;
  before?: unknown;
  after?: unknown;
}

/** Writes an audit entry inside the caller's transaction, so the change and its record stand or fall together. */
export async function recordAudit(tx: Tx | Database, entry: AuditRecord): Promise<void> {
  await tx.insert(auditEntries).values({
    actorId: entry.actorId,
    action: entry.action,
    subjectType: entry.subjectType,
    subjectId: entry.subjectId ?? null,
    jurisdictionId: entry.jurisdictionId ?? null,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}
