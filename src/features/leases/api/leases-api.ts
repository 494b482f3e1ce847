import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Lease, LeaseUpdate } from '#shared/schemas/lease';
import type { ShareLeases, ShareResult } from '#shared/schemas/sharing';
import { api } from '../../../lib/api-client';

export interface LeaseListParams {
  q?: string;
  status?: 'held' | 'candidate';
  sort: string;
  order: 'asc' | 'desc';
  limit: number;
  offset: number;
  /** Add each lease's rating at every scenario of this river. */
  ratingsRiverId?: string;
}

export const leaseKeys = {
  all: ['leases'] as const,
  list: (p: LeaseListParams) =>
    queryOptions({
      queryKey: [...leaseKeys.all, 'list', p] as const,
      queryFn: () => {
        const search = new URLSearchParams({
          sort: p.sort,
          order: p.order,
          limit: String(p.limit),
          offset: String(p.offset),
          withGeometry: 'false',
        });
        if (p.q) search.set('q', p.q);
        if (p.status) search.set('status', p.status);
        if (p.ratingsRiverId) search.set('ratingsRiverId', p.ratingsRiverId);
        return api<{ items: Lease[]; total: number }>(`/leases?${search}`);
      },
      placeholderData: keepPreviousData,
    }),
  detail: (id: string) => queryOptions({ queryKey: [...leaseKeys.all, 'detail', id] as const, queryFn: () => api<Lease>(`/leases/${id}`) }),
};

export function updateLease(id: string, patch: LeaseUpdate) {
  return api<Lease>(`/leases/${id}`, { method: 'PATCH', json: patch });
}

/** Shares the chosen leases with an adviser's or regulator's account, by e-mail. */
export function shareLeases(input: ShareLeases) {
  return api<ShareResult>('/leases/shares', { method: 'POST', json: input });
}
