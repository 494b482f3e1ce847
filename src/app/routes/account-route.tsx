/**
 * Account settings: a grower's region (pick one from the list and map, or none); for an admin or a
 * regulator, a region's area (upload GeoJSON or draw it). Composes the region picker with the zone
 * drawing map of the regulator's feature (features do not import each other).
 */
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Polygon } from 'geojson';
import { lazy, Suspense, useEffect, useMemo, useState } from 'react';
import { RegionPicker } from '../../components/region-picker';
import { Button } from '../../components/ui/button';
import { Notice } from '../../components/ui/notice';
import { PageHeader } from '../../components/ui/page-header';
import { Loading } from '../../components/ui/states';
import { meQueryOptions, useMe } from '../../features/account/api/get-me';
import { chooseRegion, regionKeys, setRegionArea } from '../../lib/regions-api';

const DrawZoneMap = lazy(() => import('../../features/regulator/components/draw-zone-map'));

function GrowerRegion({ current }: { current: string | null }) {
  const qc = useQueryClient();
  const [regionId, setRegionId] = useState<string | null>(current);
  useEffect(() => setRegionId(current), [current]);
  const save = useMutation({
    mutationFn: () => chooseRegion(regionId),
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: meQueryOptions().queryKey });
      await qc.invalidateQueries({ queryKey: ['overview'] });
    },
  });
  return (
    <section aria-labelledby="your-region" className="space-y-3 rounded-lg border border-sand-200 bg-white p-4">
      <h2 id="your-region" className="font-semibold text-deep-900">
        Your region
      </h2>
      <RegionPicker value={regionId} onChange={setRegionId} />
      {save.isError && <Notice tone="problem">{(save.error as Error).message}</Notice>}
      {save.isSuccess && <Notice tone="done">Region saved.</Notice>}
      <Button type="button" onClick={() => save.mutate()} disabled={save.isPending}>
        Save region
      </Button>
    </section>
  );
}

function RegionArea({ role, ownJurisdiction }: { role: 'admin' | 'regulator'; ownJurisdiction: string | null }) {
  const qc = useQueryClient();
  const regions = useQuery(regionKeys.list());
  const [regionId, setRegionId] = useState<string | null>(ownJurisdiction);
  const [drawn, setDrawn] = useState<Polygon | null>(null);
  const [resetKey, setResetKey] = useState(0);
  const choices = (regions.data?.items ?? []).filter((r) => role === 'admin' || r.id === ownJurisdiction);
  const context = useMemo(
    () => ({
      type: 'FeatureCollection' as const,
      features: (regions.data?.items ?? []).filter((r) => r.area).map((r) => ({ type: 'Feature' as const, properties: { name: r.name }, geometry: r.area! })),
    }),
    [regions.data],
  );
  const save = useMutation({
    mutationFn: (area: unknown) => setRegionArea(regionId ?? '', area),
    onSuccess: () => {
      setResetKey((k) => k + 1);
      void qc.invalidateQueries({ queryKey: regionKeys.list().queryKey });
    },
  });
  const [fileProblem, setFileProblem] = useState<string | null>(null);
  return (
    <section aria-labelledby="region-area" className="space-y-3 rounded-lg border border-sand-200 bg-white p-4">
      <h2 id="region-area" className="font-semibold text-deep-900">
        A region’s area
      </h2>
      <p className="text-sm text-shell-700">
        A grower who saves a lease inside the area joins the region. Areas must be closed polygons and may touch but not overlap another region.
      </p>
      <label className="flex flex-col gap-1 text-sm font-semibold text-shell-900">
        Region
        <select className="rounded-md border border-shell-300 bg-white px-3 py-2 text-base font-normal" value={regionId ?? ''} onChange={(e) => setRegionId(e.target.value || null)}>
          <option value="">Choose…</option>
          {choices.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name}
              {r.area ? '' : ' (no area yet)'}
            </option>
          ))}
        </select>
      </label>
      <label className="flex flex-col gap-1 text-sm font-semibold text-shell-900">
        Upload the area (GeoJSON polygon, longitude/latitude)
        <input
          type="file"
          accept=".geojson,.json,application/geo+json,application/json"
          disabled={!regionId}
          onChange={async (e) => {
            setFileProblem(null);
            const file = e.target.files?.[0];
            if (!file) return;
            try {
              save.mutate(JSON.parse(await file.text()));
            } catch {
              setFileProblem(`${file.name} is not GeoJSON: the file could not be read as JSON.`);
            }
          }}
        />
      </label>
      <p className="text-sm text-shell-700">Or draw it: click each corner, double-click to finish.</p>
      <Suspense fallback={<Loading what="Loading the map…" />}>
        <DrawZoneMap context={context} onDrawn={setDrawn} resetKey={resetKey} />
      </Suspense>
      {fileProblem && <Notice tone="problem">{fileProblem}</Notice>}
      {save.isError && (
        <Notice tone="problem" title="The area was not saved">
          {(save.error as Error).message}
        </Notice>
      )}
      {save.isSuccess && <Notice tone="done">Area saved.</Notice>}
      <Button type="button" disabled={!regionId || !drawn || save.isPending} onClick={() => drawn && save.mutate(drawn)}>
        Save the drawn area
      </Button>
    </section>
  );
}

export function AccountRoute() {
  const me = useMe();
  if (me.isPending || !me.data) return <Loading what="Loading your account…" />;
  const user = me.data;
  return (
    <div className="space-y-6">
      <PageHeader title="Account" question="Which region do your leases belong to?" />
      <p className="text-sm text-shell-700">
        Signed in as {user.name ?? user.email} ({user.email}).
      </p>
      {user.role === 'grower' && <GrowerRegion current={user.jurisdictionId} />}
      {(user.role === 'admin' || user.role === 'regulator') && <RegionArea role={user.role} ownJurisdiction={user.jurisdictionId} />}
    </div>
  );
}
