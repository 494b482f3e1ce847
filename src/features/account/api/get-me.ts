import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Me } from '#shared/schemas/auth';
import { ApiError } from '../../../lib/api-client';

/** The signed-in user, or null when nobody is signed in (no redirect: the shell decides). */
export async function getMe(): Promise<Me | null> {
  const res = await fetch('/api/v1/account/me', { credentials: 'same-origin', headers: { Accept: 'application/json' } });
  if (res.status === 401) return null;
  const body = await res.json();
  if (!res.ok) throw new ApiError(res.status, body?.error?.code ?? 'http_error', body?.error?.message ?? 'Could not load your account.');
  return body as Me;
}

export const meQueryOptions = () => queryOptions({ queryKey: ['account', 'me'] as const, queryFn: getMe, staleTime: 60_000 });

export function useMe() {
  return useQuery(meQueryOptions());
}
