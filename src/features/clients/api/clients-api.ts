import { queryOptions } from '@tanstack/react-query';
import type { AdviserLink, Client, ClientInvite } from '#shared/schemas/clients';
import { api } from '../../../lib/api-client';

export interface OwnLease {
  id: string;
  leaseId: string;
  species: string | null;
  status: 'held' | 'candidate';
  ownerId: string;
  worstRating: string | null;
}

export const clientKeys = {
  all: ['clients'] as const,
  clients: () => queryOptions({ queryKey: [...clientKeys.all, 'clients'] as const, queryFn: () => api<{ items: Client[] }>('/clients') }),
  advisers: () => queryOptions({ queryKey: [...clientKeys.all, 'advisers'] as const, queryFn: () => api<{ items: AdviserLink[] }>('/advisers') }),
  /** The grower's own leases, to choose from when sharing. */
  ownLeases: () =>
    queryOptions({
      queryKey: [...clientKeys.all, 'own-leases'] as const,
      queryFn: () => api<{ items: OwnLease[]; total: number }>('/leases?limit=5000&withGeometry=false&sort=leaseId&order=asc'),
    }),
};

export const inviteClient = (body: ClientInvite) => api<{ invitationId: string; email: string }>('/clients/invitations', { method: 'POST', json: body });
export const cancelInvitation = (id: string) => api<void>(`/clients/invitations/${id}`, { method: 'DELETE' });
export const acceptInvitation = (id: string, leaseIds: string[]) => api<{ items: AdviserLink[] }>(`/advisers/${id}/accept`, { method: 'POST', json: { leaseIds } });
export const declineInvitation = (id: string) => api<void>(`/advisers/${id}/decline`, { method: 'POST' });
export const setAdviserLeases = (id: string, leaseIds: string[]) => api<{ items: AdviserLink[] }>(`/advisers/${id}/leases`, { method: 'PUT', json: { leaseIds } });
export const endAdviser = (id: string) => api<void>(`/advisers/${id}`, { method: 'DELETE' });
