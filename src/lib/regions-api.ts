/**
 * Regions (jurisdictions with an area) and a grower's first-run steps: read by the sign-up page,
 * the account page and the overview (features do not import each other, so the calls live here).
 */
import { queryOptions } from '@tanstack/react-query';
import type { FirstRun, Region } from '#shared/schemas/regions';
import { api } from './api-client';

export const regionKeys = {
  list: () => queryOptions({ queryKey: ['regions'] as const, queryFn: () => api<{ items: Region[] }>('/regions'), staleTime: 5 * 60_000 }),
  firstRun: () => queryOptions({ queryKey: ['overview', 'first-run'] as const, queryFn: () => api<FirstRun>('/overview/first-run') }),
};

export const chooseRegion = (regionId: string | null) => api<{ regionId: string | null }>('/account/region', { method: 'PUT', json: { regionId } });
export const setRegionArea = (id: string, area: unknown) => api<Region>(`/regions/${id}/area`, { method: 'PUT', json: { area } });
