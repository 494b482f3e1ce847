import { queryOptions } from '@tanstack/react-query';
import type { Alert, AlertRule, AlertZone, RuleCreate } from '#shared/schemas/alerts';
import type { Gauge } from '#shared/schemas/gauges';
import { api } from '../../../lib/api-client';

export interface SweepBand {
  bandId: string;
  name: string;
  entersAtDischarge: number | null;
}

export const alertKeys = {
  all: ['alerts'] as const,
  rules: () => queryOptions({ queryKey: [...alertKeys.all, 'rules'] as const, queryFn: () => api<{ items: AlertRule[] }>('/alert-rules') }),
  alerts: () => queryOptions({ queryKey: [...alertKeys.all, 'list'] as const, queryFn: () => api<{ items: Alert[] }>('/alerts') }),
  gauges: () => queryOptions({ queryKey: [...alertKeys.all, 'gauges'] as const, queryFn: () => api<{ items: Gauge[] }>('/gauges') }),
  leases: () =>
    queryOptions({
      queryKey: [...alertKeys.all, 'leases'] as const,
      queryFn: () => api<{ items: { id: string; leaseId: string }[] }>('/leases?limit=1000&withGeometry=false&sort=leaseId&order=asc'),
    }),
  zones: () =>
    queryOptions({ queryKey: [...alertKeys.all, 'zones'] as const, queryFn: () => api<{ items: AlertZone[] }>('/alert-rules/zones') }),
  rivers: () =>
    queryOptions({
      queryKey: [...alertKeys.all, 'rivers'] as const,
      queryFn: () => api<{ items: { id: string; name: string }[] }>('/rivers'),
    }),
  sweep: (leaseId: string, riverId: string) =>
    queryOptions({
      queryKey: [...alertKeys.all, 'sweep', leaseId, riverId] as const,
      queryFn: () => api<{ bands: SweepBand[] }>(`/leases/${leaseId}/sweep?riverId=${riverId}`),
      enabled: Boolean(leaseId && riverId),
    }),
};

export function createRule(input: RuleCreate) {
  return api<AlertRule>('/alert-rules', { method: 'POST', json: input });
}

export function deleteRule(id: string) {
  return api<void>(`/alert-rules/${id}`, { method: 'DELETE' });
}

export function checkForecast(id: string, discharge: number) {
  return api<{ reaches: boolean; thresholdFlow: number; alert: Alert | null }>(`/alert-rules/${id}/forecast`, {
    method: 'POST',
    json: { discharge },
  });
}

export function getPlan() {
  return api<{ alertsAllowed: boolean; zoneAlertsFree: boolean }>('/billing/subscription');
}
