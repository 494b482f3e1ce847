/**
 * Which coast a river walks: the usual choice (an uploaded coast of the user or the jurisdiction),
 * the built-in world coastline, or one of the user's own uploaded or traced coasts. Choosing an
 * uploaded coast replaces the built-in one and re-screens the river's leases.
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { River } from '#shared/schemas/river';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { api } from '../../../lib/api-client';
import { riverKeys, updateRiver } from '../api/rivers-api';

interface CoastList {
  features: { id: string; properties: { id: string; name: string; form: string; source: string } }[];
}

export function CoastChoice({ river }: { river: River }) {
  const qc = useQueryClient();
  const coasts = useQuery({ queryKey: ['coasts', 'mine'], queryFn: () => api<CoastList>('/coasts?form=line') });
  const current = (river.settings.coastId as string | undefined) ?? '';
  const [choice, setChoice] = useState(current);
  const save = useMutation({
    mutationFn: () => updateRiver(river.id, { coastId: choice }),
    onSuccess: () => qc.invalidateQueries({ queryKey: riverKeys.all }),
  });
  const options = coasts.data?.features ?? [];
  if (!options.length) {
    return <p className="text-sm text-shell-700">To replace the built-in coast, upload your coastline (Leases → Upload, kind coastline) and choose it here.</p>;
  }
  return (
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
      <Button type="button" variant="secondary" disabled={choice === current || save.isPending} onClick={() => save.mutate()}>
        Use this coast
      </Button>
      {save.isError && <Notice tone="problem">{(save.error as Error).message}</Notice>}
    </div>
  );
}
