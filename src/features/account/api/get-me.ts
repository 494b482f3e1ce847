import { type QueryClient, queryOptions, useQuery } from '@tanstack/react-query';
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

/**
 * Fetches the account afresh and stores it before the caller navigates. After sign-in the cached
 * answer is still "nobody" (null); marking it stale is not enough, because the shell would read
 * that cached null on its first render and send the visitor straight back to the sign-in form.
 */
export async function refreshMe(queryClient: QueryClient): Promise<Me | null> {
  return queryClient.fetchQuery({ ...meQueryOptions(), staleTime: 0 });
}
