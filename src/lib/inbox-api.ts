/**
 * The in-app inbox and the closures near the caller's leases: read by the header, the overview
 * and the inbox page (features do not import each other, so the calls live here).
 */
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { NearbyClosureList } from '#shared/schemas/closures';
import type { InboxList } from '#shared/schemas/inbox';
import { api } from './api-client';

export const inboxKeys = {
  all: ['inbox'] as const,
  list: (limit = 50) =>
    queryOptions({
      queryKey: [...inboxKeys.all, limit],
      queryFn: () => api<InboxList>(`/inbox?limit=${limit}`),
      // New notices and alerts arrive without the user doing anything.
      refetchInterval: 60_000,
    }),
  nearbyClosures: () => queryOptions({ queryKey: ['overview', 'closures'], queryFn: () => api<NearbyClosureList>('/overview/closures') }),
};

export function useMarkRead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<void>(`/inbox/${id}/read`, { method: 'POST' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: inboxKeys.all }),
  });
}
