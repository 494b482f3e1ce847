import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { FeatureCollection, Polygon } from 'geojson';
import { lazy, Suspense, useMemo, useState } from 'react';
import { type UseFormRegister, useForm } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import type { z } from 'zod';
import { zonePlanSchema } from '#shared/schemas/zones';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { api } from '../../../lib/api-client';
import { createZone, zoneKeys } from '../api/zones-api';
import { type PlanNumbers, PlanValueFields } from './plan-value-fields';

const DrawZoneMap = lazy(() => import('./draw-zone-map'));

const drawFormSchema = zonePlanSchema.pick({ name: true, riverId: true, triggerFlow: true, minClosureDays: true, indicatorStandard: true });
type DrawForm = z.infer<typeof drawFormSchema>;

/** A zone drawn on the map, with its first plan values. */
export function DrawZoneForm({ onCancel }: { onCancel: () => void }) {
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const rivers = useQuery(zoneKeys.rivers());
  const zones = useQuery(zoneKeys.list(true));
  const land = useQuery({ queryKey: ['coasts'], queryFn: () => api<FeatureCollection>('/coasts'), staleTime: 5 * 60_000 });
  const [polygon, setPolygon] = useState<Polygon | null>(null);
  const [resetKey, setResetKey] = useState(0);
  const form = useForm<DrawForm>({
    resolver: zodResolver(drawFormSchema),
    defaultValues: { name: '', riverId: null, triggerFlow: null, minClosureDays: 5, indicatorStandard: 14 },
  });
  const save = useMutation({
    mutationFn: (v: DrawForm) => {
      if (!polygon) throw new Error('Draw the zone on the map first: click each corner, then double-click the last one.');
      return createZone({ ...v, riverId: v.riverId || null, geometry: polygon });
    },
    onSuccess: (zone) => {
      void queryClient.invalidateQueries({ queryKey: zoneKeys.all });
      navigate(`/zones/${zone.id}`);
    },
  });

  const context = useMemo<FeatureCollection | null>(() => {
    if (!zones.data || !land.data) return null;
    return {
      type: 'FeatureCollection',
      features: [
        ...land.data.features.filter((f) => f.properties?.form === 'land').map((f) => ({ ...f, properties: { name: '' } })),
        ...zones.data.items.map((z) => ({ type: 'Feature' as const, properties: { name: z.name }, geometry: z.geometry as Polygon })),
      ],
    };
  }, [zones.data, land.data]);

  const errors = form.formState.errors;
  return (
    <section aria-label="Draw a zone" className="space-y-4 rounded-lg border border-sand-200 bg-white p-4">
      <h2 className="text-lg font-semibold text-deep-900">Draw a zone</h2>
      <p className="text-sm text-shell-700">
        Click each corner of the zone on the map; double-click the last corner to finish. Drawing again replaces the shape.
      </p>
      {context ? (
        <Suspense fallback={<Loading what="Drawing the map…" />}>
          <DrawZoneMap context={context} onDrawn={setPolygon} resetKey={resetKey} />
        </Suspense>
      ) : (
        <Loading what="Loading the coast and the zones…" />
      )}
      <p role="status" className="text-sm">
        {polygon ? `Outline drawn with ${polygon.coordinates[0].length - 1} corners.` : 'No outline drawn yet.'}{' '}
        {polygon && (
          <button type="button" className="underline" onClick={() => setResetKey((k) => k + 1)}>
            Clear the outline
          </button>
        )}
      </p>
      <form className="grid gap-4 md:grid-cols-3" noValidate onSubmit={form.handleSubmit((v) => save.mutate(v))}>
        <TextField label="Zone name" {...form.register('name')} error={errors.name?.message} />
        <div className="flex flex-col gap-1">
          <label htmlFor="draw-river" className="text-sm font-semibold text-shell-900">
            River whose flow closes it
          </label>
          <select
            id="draw-river"
            className="rounded-md border border-shell-300 bg-white px-3 py-2"
            {...form.register('riverId', { setValueAs: (v) => v || null })}
          >
            <option value="">Choose later</option>
            {rivers.data?.items.map((r) => (
              <option key={r.id} value={r.id}>
                {r.name}
              </option>
            ))}
          </select>
        </div>
        <PlanValueFields
          register={form.register as unknown as UseFormRegister<PlanNumbers>}
          errors={errors}
          standardHint="14 is the approved-area geometric mean used for screening."
        />
        <div className="flex items-end gap-2">
          <Button type="submit" disabled={save.isPending}>
            {save.isPending ? 'Saving…' : 'Save the zone'}
          </Button>
          <Button type="button" variant="quiet" onClick={onCancel}>
            Cancel
          </Button>
        </div>
      </form>
      {save.isError && (
        <Notice tone="problem" title="The zone was not saved">
          {(save.error as Error).message}
        </Notice>
      )}
    </section>
  );
}
