/**
 * Monitoring stations and samples, river comparisons and calibrations (server/routes/monitoring.routes.ts).
 * Query-option builders are the one source of each key.
 */
import { queryOptions } from '@tanstack/react-query';
import type {
  Calibration,
  CalibrationCreate,
  Comparison,
  SampleUploadResult,
  Station,
  StationUploadResult,
} from '#shared/schemas/monitoring';
import { api } from '../../../lib/api-client';

export const monitoringKeys = {
  stations: () => queryOptions({ queryKey: ['monitoring', 'stations'] as const, queryFn: () => api<{ items: Station[] }>('/stations') }),
  comparison: (riverId: string, lagDays: number) =>
    queryOptions({
      queryKey: ['monitoring', 'comparison', riverId, lagDays] as const,
      queryFn: () => api<Comparison>(`/rivers/${riverId}/comparison?lagDays=${lagDays}`),
      retry: false,
    }),
  calibrations: (riverId: string) =>
    queryOptions({
      queryKey: ['monitoring', 'calibrations', riverId] as const,
      queryFn: () => api<{ items: Calibration[] }>(`/rivers/${riverId}/calibrations`),
    }),
};

export function uploadStations(file: File, epsg?: number): Promise<StationUploadResult> {
  const form = new FormData();
  if (epsg !== undefined) form.append('epsg', String(epsg));
  form.append('file', file);
  return api<StationUploadResult>('/stations', { method: 'POST', body: form });
}

export function uploadSamples(file: File): Promise<SampleUploadResult> {
  const form = new FormData();
  form.append('file', file);
  return api<SampleUploadResult>('/samples', { method: 'POST', body: form });
}

export const fitCalibration = (riverId: string, body: CalibrationCreate) =>
  api<Calibration>(`/rivers/${riverId}/calibrations`, { method: 'POST', json: body });
export const applyCalibration = (id: string) => api<Calibration>(`/calibrations/${id}/apply`, { method: 'POST' });
export const rollbackCalibration = (id: string) => api<Calibration>(`/calibrations/${id}/rollback`, { method: 'POST' });
