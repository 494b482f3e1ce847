import { queryOptions } from '@tanstack/react-query';
import type { FeatureCollection } from 'geojson';
import { ApiError, api } from '../../../lib/api-client';

export type UploadKind = 'lease' | 'coast' | 'zone';

export interface ImportFeature {
  index: number;
  properties: Record<string, unknown>;
  areaM2: number | null;
  bbox: [number, number, number, number];
  repaired: boolean;
  onLand?: boolean;
  invalidReason?: string | null;
}

/** How many features have a trait, and the first 100 of them (0-based positions in the upload). */
export interface FeatureIndexList {
  count: number;
  indexes: number[];
}

export interface ImportResult {
  id: string;
  kind: UploadKind;
  status: 'needs-crs' | 'ready' | 'confirmed';
  fileName: string;
  format?: 'shapefile' | 'geojson' | 'kml' | 'kmz' | 'gpx' | 'geopackage';
  /** Every layer of a file holding several (KML folders, GeoPackage tables, shapefiles in a zip). */
  layers?: { name: string; featureCount: number; geometryTypes: string[] }[];
  selectedLayer?: string | null;
  tracksAsPolygons?: boolean;
  crs: { found: boolean; epsg?: number; wkt?: string; name?: string };
  featureCount: number;
  geometryTypes: string[];
  fields: string[];
  warnings: string[];
  /** Figures over every staged feature (the preview carries only the first features themselves). */
  overview: {
    bbox: [number, number, number, number] | null;
    areaM2: { min: number; max: number; total: number } | null;
    repaired: FeatureIndexList;
    onLand: FeatureIndexList;
  };
  /** Which features `features` holds: the first `limit` of `total`. */
  featurePage: { offset: number; limit: number; total: number };
  features: ImportFeature[];
  suggestedMapping: { leaseId?: string; holder?: string; species?: string; status?: string };
}

export interface ConfirmBody {
  mapping: { leaseId?: string; holder?: string; species?: string; status?: string };
  onDuplicate?: 'replace' | 'keep';
}

/**
 * Uploads with XMLHttpRequest because fetch cannot report upload progress.
 * `onProgress` gets 0..1 while the bytes go up; parsing on the server follows.
 */
export function uploadImport(
  file: File,
  kind: UploadKind,
  onProgress: (fraction: number) => void,
  choices: { tracksAsPolygons?: boolean } = {},
): Promise<ImportResult> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/v1/imports');
    xhr.responseType = 'json';
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const body = xhr.response;
      if (xhr.status >= 200 && xhr.status < 300) resolve(body as ImportResult);
      else reject(new ApiError(xhr.status, body?.error?.code ?? 'http_error', body?.error?.message ?? `The server answered ${xhr.status}.`, body?.error?.details));
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload did not reach the server. Check your connection and try again.'));
    const form = new FormData();
    form.append('kind', kind);
    if (choices.tracksAsPolygons) form.append('tracksAsPolygons', 'true');
    form.append('file', file);
    xhr.send(form);
  });
}

export const importKeys = {
  all: ['imports'] as const,
  detail: (id: string) => queryOptions({ queryKey: [...importKeys.all, id] as const, queryFn: () => api<ImportResult>(`/imports/${id}`) }),
  preview: (id: string, status: string) =>
    queryOptions({ queryKey: [...importKeys.all, id, 'preview', status] as const, queryFn: () => api<FeatureCollection>(`/imports/${id}/preview`) }),
  coasts: () => queryOptions({ queryKey: ['coasts'] as const, queryFn: () => api<FeatureCollection>('/coasts'), staleTime: 5 * 60_000 }),
  crsSearch: (q: string) =>
    queryOptions({
      queryKey: ['crs', q] as const,
      queryFn: () => api<{ items: { code: number; name: string; area?: string }[] }>(`/crs?q=${encodeURIComponent(q)}`),
      staleTime: 5 * 60_000,
    }),
};

export function setImportCrs(id: string, epsg: number) {
  return api<ImportResult>(`/imports/${id}/crs`, { method: 'POST', json: { epsg } });
}

export function confirmImport(id: string, body: ConfirmBody) {
  return api<{ created: number; updated: number; ids: string[] }>(`/imports/${id}/confirm`, { method: 'POST', json: body });
}

/** Reads only one layer of the upload (null: every usable layer); answers the new preview. */
export function pickImportLayer(id: string, layer: string | null) {
  return api<ImportResult>(`/imports/${id}/layer`, { method: 'POST', json: { layer } });
}

/** File types the upload takes (the server tells the format from the content). */
export const UPLOAD_ACCEPT =
  '.zip,.geojson,.json,.kml,.kmz,.gpx,.gpkg,application/zip,application/geo+json,application/vnd.google-earth.kml+xml,application/vnd.google-earth.kmz,application/gpx+xml,application/geopackage+sqlite3';
