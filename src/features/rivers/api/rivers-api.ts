import { queryOptions } from '@tanstack/react-query';
import type { FloodFrequencyResult } from '#shared/hydrology/flood-frequency';
import type { FlowRecordGap, FlowRecordProblem } from '#shared/hydrology/parse-flow-record';
import type { PlumeResult } from '#shared/physics/compute-plume';
import type { PlumeProfiles } from '#shared/physics/river-plume';
import type { River, RiverCreate, RiverUpdate, Scenario, ScenarioCreate } from '#shared/schemas/river';
import { api, ApiError } from '../../../lib/api-client';

export interface FlowRecord {
  id: string;
  file_name: string;
  units: 'm3s' | 'cfs';
  water_year_start: string;
  uploaded_at: string;
  reading_count: number;
  first_time: string;
  last_time: string;
  interval: 'daily' | 'sub-daily';
  problems: FlowRecordProblem[];
  gaps: FlowRecordGap[];
  annual_peaks: { waterYear: number; discharge: number; time: string; complete: boolean }[];
  fit: FloodFrequencyResult;
  durations: { medianHours: number | null; meanHours: number | null };
}

export interface ScenarioPlume {
  scenario: Scenario;
  riverVersion: number;
  plume: PlumeResult;
  profiles: PlumeProfiles;
}

export const riverKeys = {
  all: ['rivers'] as const,
  list: () => queryOptions({ queryKey: [...riverKeys.all, 'list'] as const, queryFn: () => api<{ items: River[] }>('/rivers') }),
  detail: (id: string) => queryOptions({ queryKey: [...riverKeys.all, 'detail', id] as const, queryFn: () => api<River>(`/rivers/${id}`) }),
  record: (id: string) =>
    queryOptions({
      queryKey: [...riverKeys.all, 'record', id] as const,
      queryFn: async () => {
        try {
          return await api<FlowRecord>(`/rivers/${id}/flow-records`);
        } catch (err) {
          if (err instanceof ApiError && err.status === 404) return null;
          throw err;
        }
      },
    }),
  readings: (id: string) =>
    queryOptions({ queryKey: [...riverKeys.all, 'readings', id] as const, queryFn: () => api<{ points: { t: string; q: number }[] }>(`/rivers/${id}/flow-records/readings`) }),
  scenarios: (id: string) => queryOptions({ queryKey: [...riverKeys.all, 'scenarios', id] as const, queryFn: () => api<{ items: Scenario[] }>(`/rivers/${id}/scenarios`) }),
  plume: (scenarioId: string) => queryOptions({ queryKey: [...riverKeys.all, 'plume', scenarioId] as const, queryFn: () => api<ScenarioPlume>(`/scenarios/${scenarioId}/plume`) }),
};

export const createRiver = (body: RiverCreate) => api<River>('/rivers', { method: 'POST', json: body });
export const updateRiver = (id: string, patch: RiverUpdate) => api<River>(`/rivers/${id}`, { method: 'PATCH', json: patch });
export const createScenario = (riverId: string, body: ScenarioCreate) => api<Scenario>(`/rivers/${riverId}/scenarios`, { method: 'POST', json: body });
export const updateScenario = (id: string, patch: { name?: string; durationHours?: number }) => api<Scenario>(`/scenarios/${id}`, { method: 'PATCH', json: patch });
export const deleteScenario = (id: string) => api<void>(`/scenarios/${id}`, { method: 'DELETE' });

export interface UploadResult {
  recordId: string;
  rows: number;
  readings: number;
  problems: FlowRecordProblem[];
  warnings: string[];
  format?: 'csv' | 'waterml2';
  unitsNote?: string;
  qualityCodes?: { code: string; count: number; provisional: boolean }[];
  droppedProvisional?: number;
  aggregated?: 'max' | 'mean' | null;
}

/** How to read a record: units, chosen columns, provisional values, daily aggregation. */
export interface FlowRecordReadOptions {
  units: 'm3s' | 'cfs' | 'auto';
  dateColumn?: string;
  dischargeColumn?: string;
  qualityColumn?: string;
  dropProvisional?: boolean;
  daily?: 'max' | 'mean';
}

/** The problems of a refused upload (422 with row problems). */
export interface UploadProblems {
  rows: number;
  problems: FlowRecordProblem[];
  problemCount: number;
}

/**
 * Uploads a gauge record as CSV with progress (XMLHttpRequest: fetch reports no upload progress).
 * Resolves with the stored record, or rejects with an ApiError whose details hold the row problems.
 */
export function uploadFlowRecord(
  riverId: string,
  file: File,
  options: FlowRecordReadOptions & { waterYearStart: string; acceptProblems: boolean; xml?: boolean },
  onProgress: (fraction: number) => void,
): Promise<UploadResult> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    const query = new URLSearchParams({ units: options.units, waterYearStart: options.waterYearStart, acceptProblems: String(options.acceptProblems) });
    if (options.dateColumn) query.set('dateColumn', options.dateColumn);
    if (options.dischargeColumn) query.set('dischargeColumn', options.dischargeColumn);
    if (options.qualityColumn !== undefined) query.set('qualityColumn', options.qualityColumn);
    if (options.dropProvisional) query.set('dropProvisional', 'true');
    if (options.daily) query.set('daily', options.daily);
    xhr.open('POST', `/api/v1/rivers/${riverId}/flow-records?${query}`);
    xhr.setRequestHeader('Content-Type', options.xml ? 'application/xml' : 'text/csv');
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.setRequestHeader('X-File-Name', file.name.replace(/[^\x20-\x7e]/g, '_'));
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      let body: { error?: { code: string; message: string; details?: unknown } } | null = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as unknown as UploadResult);
      else reject(new ApiError(xhr.status, body?.error?.code ?? 'http_error', body?.error?.message ?? `The server answered ${xhr.status}.`, body?.error?.details));
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload did not reach the server. Check your connection and try again.'));
    xhr.send(file);
  });
}

/** The built-in world coastline around a point (loaded on the server on first use) and whether a mouth may go there. */
export interface BuiltinCoast {
  coastId: string;
  attribution: string;
  caution: string;
  distanceM: number | null;
  onLand: boolean;
  maxMouthDistanceM: number;
  problem: string | null;
  line: import('geojson').Geometry;
  window: import('geojson').Geometry;
}
export const getBuiltinCoast = (lon: number, lat: number) => api<BuiltinCoast>(`/coasts/builtin?lon=${lon}&lat=${lat}`);
