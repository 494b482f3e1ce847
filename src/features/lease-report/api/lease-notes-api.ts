import { queryOptions } from '@tanstack/react-query';
import type { LeaseNote, LeaseShare, NoteCreate } from '#shared/schemas/sharing';
import { api } from '../../../lib/api-client';

export const leaseNoteKeys = {
  list: (leaseId: string) =>
    queryOptions({
      queryKey: ['leases', 'notes', leaseId] as const,
      queryFn: () => api<{ items: LeaseNote[] }>(`/leases/${leaseId}/notes`),
    }),
};

export function addLeaseNote(leaseId: string, note: NoteCreate) {
  return api<LeaseNote>(`/leases/${leaseId}/notes`, { method: 'POST', json: note });
}

export const leaseShareKeys = {
  list: (leaseId: string) =>
    queryOptions({
      queryKey: ['leases', 'shares', leaseId] as const,
      queryFn: () => api<{ items: LeaseShare[] }>(`/leases/${leaseId}/shares`),
    }),
};

export function revokeLeaseShare(leaseId: string, userId: string) {
  return api<void>(`/leases/${leaseId}/shares/${encodeURIComponent(userId)}`, { method: 'DELETE' });
}
