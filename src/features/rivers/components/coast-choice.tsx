/**
 * Which coast a river walks: the built-in world coastline, or one of the user's own uploaded or
 * traced coasts. Choosing (or tracing) one replaces the built-in coast and re-screens the river's leases.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { LineString } from 'geojson';
import { lazy, Suspense, useMemo, useState } from 'react';
import type { River } from '#shared/schemas/river';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/text-field';
import { api } from '../../../lib/api-client';
import { getBuiltinCoast, riverKeys, updateRiver } from '../api/rivers-api';

const TraceCoastMap = lazy(() => import('./trace-coast-map'));

interface CoastList {
  features: { id: string; properties: { id: string; name: string; form: string; source: string } }[];
}

export function CoastChoice({ river }: { river: River }) {
  const qc = useQueryClient();
  const coasts = useQuery({ queryKey: ['coasts', 'mine'], queryFn: () => api<CoastList>('/coasts?form=line') });
  const current = (river.settings.coastId as string | undefined) ?? '';
  const [choice, setChoice] = useState(current);
  const [tracing, setTracing] = useState(false);
  const [traced, setTraced] = useState<LineString | null>(null);
  const [name, setName] = useState(`${river.name} shore (traced)`);
  const lon = Number(river.settings.mouthLongitude);
  const lat = Number(river.settings.mouthLatitude);
  const mouth = useMemo<[number, number]>(() => [lon, lat], [lon, lat]);
  const reference = useQuery({ queryKey: ['coasts', 'builtin', mouth], queryFn: () => getBuiltinCoast(mouth[0], mouth[1]), enabled: tracing, staleTime: Infinity });
  const use = useMutation({
    mutationFn: (coastId: string) => updateRiver(river.id, { coastId }),
    onSuccess: () => qc.invalidateQueries({ queryKey: riverKeys.all }),
  });
  const trace = useMutation({
    mutationFn: async () => {
      const saved = await api<{ id: string }>('/coasts', { method: 'POST', json: { name, geometry: traced } });
      await qc.invalidateQueries({ queryKey: ['coasts'] });
      return updateRiver(river.id, { coastId: saved.id });
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: riverKeys.all }),
  });
  const options = coasts.data?.features ?? [];
  return (
    <div className="space-y-2">
      {options.length > 0 ? (
        <div className="flex flex-wrap items-end gap-3">
          <label className="flex flex-col gap-1 text-sm font-semibold text-shell-900">
            Coast this river walks
            <select className="rounded-md border border-shell-300 bg-white px-3 py-2 font-normal" value={choice} onChange={(e) => setChoice(e.target.value)}>
              {river.coastSource === 'builtin' && <option value={current}>Built-in world coastline</option>}
              {options.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.properties.name} ({c.properties.source === 'traced' ? 'traced' : 'uploaded'})
                </option>
              ))}
            </select>
          </label>
          <Button type="button" variant="secondary" disabled={choice === current || use.isPending} onClick={() => use.mutate(choice)}>
            Use this coast
          </Button>
        </div>
      ) : (
        <p className="text-sm">To replace the built-in coast, upload your coastline (Leases → Upload lease boundaries, kind coastline) or trace it here.</p>
      )}
      <Button type="button" variant="quiet" aria-expanded={tracing} onClick={() => setTracing(!tracing)}>
        {tracing ? 'Stop tracing' : 'Trace the coast on the map'}
      </Button>
      {tracing && (
        <div className="space-y-2">
          <Suspense fallback={<p className="text-sm">Loading the map…</p>}>
            <TraceCoastMap mouth={mouth} reference={reference.data?.line ?? null} onTraced={setTraced} />
          </Suspense>
          <TextField label="Name of the traced coast" value={name} onChange={(e) => setName(e.target.value)} />
          <Button type="button" disabled={!traced || !name.trim() || trace.isPending} onClick={() => trace.mutate()}>
            Save the traced coast and use it
          </Button>
        </div>
      )}
      {(use.isError || trace.isError) && <Notice tone="problem">{((use.error ?? trace.error) as Error).message}</Notice>}
    </div>
  );
}
