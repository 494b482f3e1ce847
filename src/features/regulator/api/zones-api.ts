import { queryOptions } from '@tanstack/react-query';
import type {
  AuditEntry,
  ClosureCheckRequest,
  ClosureCheckResult,
  Notice,
  NoticeCreate,
  SampleCreate,
  TriggerSweep,
  Zone,
  ZoneCreate,
  ZoneSample,
  ZoneUpdate,
} from '#shared/schemas/zones';
import { api } from '../../../lib/api-client';

export interface GaugeOption {
  id: string;
  riverId: string;
  code: string;
  name: string;
  latestDischarge: number | null;
  latestAt: string | null;
}

export const zoneKeys = {
  all: ['zones'] as const,
  list: (withGeometry = false) =>
    queryOptions({
      queryKey: ['zones', 'list', withGeometry] as const,
      queryFn: () => api<{ items: Zone[] }>(`/zones?withGeometry=${withGeometry}`),
    }),
  detail: (id: string) => queryOptions({ queryKey: ['zones', 'detail', id] as const, queryFn: () => api<Zone>(`/zones/${id}`) }),
  sweep: (id: string, share: number) =>
    queryOptions({
      queryKey: ['zones', 'sweep', id, share] as const,
      queryFn: () => api<TriggerSweep>(`/zones/${id}/trigger-sweep?share=${share}`),
      staleTime: 60_000,
    }),
  samples: (id: string) =>
    queryOptions({ queryKey: ['zones', 'samples', id] as const, queryFn: () => api<{ items: ZoneSample[] }>(`/zones/${id}/samples`) }),
  zoneNotices: (id: string) =>
    queryOptions({ queryKey: ['zones', 'notices', id] as const, queryFn: () => api<{ items: Notice[] }>(`/zones/${id}/notices`) }),
  notices: () => queryOptions({ queryKey: ['zones', 'notices', 'all'] as const, queryFn: () => api<{ items: Notice[] }>('/notices') }),
  gauges: () =>
    queryOptions({ queryKey: ['zones', 'gauges'] as const, queryFn: () => api<{ items: GaugeOption[] }>('/closure-checks/gauges') }),
  rivers: () =>
    queryOptions({
      queryKey: ['rivers', 'list'] as const,
      queryFn: () => api<{ items: { id: string; name: string }[] }>('/rivers'),
      staleTime: 60_000,
    }),
  audit: (subjectType?: string) =>
    queryOptions({
      queryKey: ['audit', subjectType ?? 'all'] as const,
      queryFn: () =>
        api<{ items: AuditEntry[]; total: number }>(`/audit${subjectType ? `?subjectType=${encodeURIComponent(subjectType)}` : ''}`),
    }),
};

export const updateZone = (id: string, patch: ZoneUpdate) => api<Zone>(`/zones/${id}`, { method: 'PATCH', json: patch });
export const createZone = (body: ZoneCreate) => api<Zone>('/zones', { method: 'POST', json: body });
export const addSample = (id: string, body: SampleCreate) => api<ZoneSample>(`/zones/${id}/samples`, { method: 'POST', json: body });
export const runClosureCheck = (body: ClosureCheckRequest) => api<ClosureCheckResult>('/closure-checks', { method: 'POST', json: body });
export const issueNotice = (body: NoticeCreate) => api<Notice>('/notices', { method: 'POST', json: body });
