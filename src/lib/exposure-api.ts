/**
 * Read-only calls for screening results, shared by the lease report, the exposure map, the
 * compare page and the overview (features do not import each other, so the shapes live here).
 * Shapes follow server/routes/screening.routes.ts, rivers.routes.ts and leases.routes.ts.
 */
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { FeatureCollection } from 'geojson';
import type { MapSettings, ZoneMap } from '#shared/schemas/closures';
import type { Lease } from '#shared/schemas/lease';
import type { River, Scenario } from '#shared/schemas/river';
import { api } from './api-client';

export interface ScreeningRow {
  leaseId: string;
  leaseCode: string;
  species: string | null;
  status: 'held' | 'candidate';
  riverId: string;
  riverName: string;
  scenarioId: string;
  scenarioName: string;
  scenarioKind: 'aep' | 'seasonal' | 'manual';
  aep: number | null;
  discharge: number;
  durationHours: number;
  footprintId: string;
  bandFractions: Record<string, number>;
  lowestSalinity: number | null;
  highestIndicator: number | null;
  daysBelowTolerance: number | null;
  rating: 'low' | 'moderate' | 'high' | 'severe';
  score: number;
  reasons: string[];
  numbers: {
    chronicLowerSalinity?: number;
    acuteLowerSalinity?: number;
    indicatorThreshold?: number;
    floodDurationDays?: number;
    exposureFraction?: number;
    reachesLease?: boolean;
    [key: string]: unknown;
  };
  modelVersion: string;
  computedAt: string;
}


export interface FootprintProperties {
  footprintId: string;
  riverId: string;
  riverName: string;
  scenarioId: string | null;
  scenarioName: string | null;
  discharge: number;
  durationHours: number;
  modelVersion: string;
  warnings: string[];
  computedAt: string;
  plume: Record<string, unknown>;
}

export type Footprint = FeatureCollection & { properties: FootprintProperties };

export const exposureKeys = {
  rivers: () =>
    queryOptions({ queryKey: ['rivers', 'list'] as const, queryFn: () => api<{ items: River[] }>('/rivers'), staleTime: 60_000 }),
  scenarios: (riverId: string) =>
    queryOptions({
      queryKey: ['rivers', riverId, 'scenarios'] as const,
      queryFn: () => api<{ items: Scenario[] }>(`/rivers/${riverId}/scenarios`),
      staleTime: 60_000,
    }),
  screenings: (filter: { leaseId?: string; riverId?: string; scenarioId?: string }) =>
    queryOptions({
      queryKey: ['screenings', filter] as const,
      queryFn: () => {
        const search = new URLSearchParams({ limit: '5000', sort: 'discharge', order: 'asc' });
        for (const [k, v] of Object.entries(filter)) if (v) search.set(k, v);
        return api<{ items: ScreeningRow[]; total: number }>(`/screenings?${search}`);
      },
      staleTime: 30_000,
    }),
  /** A footprint for a scenario, or for any flow (m³/s): the server builds it once and caches it. */
  footprint: (riverId: string, by: { scenarioId: string } | { discharge: number }) =>
    queryOptions({
      queryKey: ['footprints', riverId, by] as const,
      queryFn: () => {
        const search = new URLSearchParams({ riverId });
        if ('scenarioId' in by) search.set('scenarioId', by.scenarioId);
        else search.set('discharge', String(by.discharge));
        return api<Footprint>(`/footprints?${search}`);
      },
      staleTime: 5 * 60_000,
      placeholderData: keepPreviousData,
    }),
  /** Same key as the leases feature's detail query, so the cache is shared. */
  lease: (id: string) => queryOptions({ queryKey: ['leases', 'detail', id] as const, queryFn: () => api<Lease>(`/leases/${id}`) }),
  /** Whether a raster basemap is configured (BASEMAP_URL); null means vector layers only. */
  mapSettings: () =>
    queryOptions({ queryKey: ['map-settings'] as const, queryFn: () => api<MapSettings>('/map-settings'), staleTime: Infinity }),
  /** Closure zones of the caller's jurisdictions, with status and trigger flow. */
  zones: () =>
    queryOptions({
      queryKey: ['overview', 'zones'] as const,
      queryFn: () => api<ZoneMap>('/overview/zones'),
      staleTime: 60_000,
    }),
  /** How many leases the caller may see (decides between GeoJSON and vector tiles on the map). */
  leaseCount: () =>
    queryOptions({
      queryKey: ['leases', 'count'] as const,
      queryFn: () => api<{ total: number }>('/leases?limit=1').then((r) => r.total),
      staleTime: 60_000,
    }),
  leasesWithGeometry: () =>
    queryOptions({
      queryKey: ['leases', 'all-with-geometry'] as const,
      queryFn: () => api<{ items: Lease[]; total: number }>('/leases?withGeometry=true&limit=5000'),
      staleTime: 60_000,
    }),
  /** Land polygons of the coasts you may use (same fetch as the upload preview's, own key for the land form). */
  land: () =>
    queryOptions({
      queryKey: ['coasts', 'land'] as const,
      queryFn: () => api<FeatureCollection>('/coasts?form=land'),
      staleTime: 5 * 60_000,
    }),
  leasesBrief: () =>
    queryOptions({
      queryKey: ['leases', 'all-brief'] as const,
      queryFn: () => api<{ items: Lease[]; total: number }>('/leases?withGeometry=false&limit=5000'),
      staleTime: 60_000,
    }),
};
