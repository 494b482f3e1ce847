import { queryOptions } from '@tanstack/react-query';
import type { Role } from '#shared/schemas/roles';
import { api } from '../../../lib/api-client';

export interface PersonRow {
  id: string;
  email: string;
  name: string | null;
  role: Role;
  jurisdictionId: string | null;
  disabled: boolean;
  createdAt: string;
}
export interface OutboxRow {
  id: string;
  receivedAt: string;
  to: string[];
  subject: string | null;
}
export interface OutboxMessage extends OutboxRow {
  from: string | null;
  text: string | null;
}
export interface AuditRow {
  id: string;
  at: string;
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId: string | null;
  before: unknown;
  after: unknown;
}

export const adminKeys = {
  all: ['admin'] as const,
  people: () => queryOptions({ queryKey: [...adminKeys.all, 'people'] as const, queryFn: () => api<{ items: PersonRow[]; total: number }>('/admin/users?limit=500') }),
  outbox: () => queryOptions({ queryKey: [...adminKeys.all, 'outbox'] as const, queryFn: () => api<{ items: OutboxRow[]; total: number }>('/admin/outbox?limit=200') }),
  message: (id: string) => queryOptions({ queryKey: [...adminKeys.all, 'outbox', id] as const, queryFn: () => api<OutboxMessage>(`/admin/outbox/${id}`) }),
  audit: () => queryOptions({ queryKey: [...adminKeys.all, 'audit'] as const, queryFn: () => api<{ items: AuditRow[] }>('/admin/audit?limit=200') }),
  jurisdictions: () =>
    queryOptions({ queryKey: ['jurisdictions'] as const, queryFn: () => api<{ items: { id: string; slug: string; name: string }[] }>('/jurisdictions') }),
};
