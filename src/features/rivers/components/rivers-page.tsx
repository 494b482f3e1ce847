import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { lazy, Suspense, useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate } from 'react-router-dom';
import { riverPlume } from '#shared/physics/river-plume';
import { applyRiverDefaults, DEFAULTABLE_FIELDS, type RiverCreate, riverCreateSchema } from '#shared/schemas/river';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { createRiver, getBuiltinCoast, riverKeys } from '../api/rivers-api';

const num = { setValueAs: (v: string) => (v === '' ? undefined : Number(v)) };
const MouthMap = lazy(() => import('./mouth-map'));
const round = (x: number, dp: number) => Math.round(x * 10 ** dp) / 10 ** dp;

/** The plume's first numbers for the form's values, from the shared engine (the same code the server runs). */
function PlumePreview({ values, flow }: { values: Partial<RiverCreate>; flow: number }) {
  const lat = values.mouthLatitude;
  if (typeof lat !== 'number' || !Number.isFinite(lat)) return null;
  const f = 2 * 7.2921e-5 * Math.sin((lat * Math.PI) / 180);
  const side = Math.abs(lat) < 2 ? 'no clear side (near the equator the plume spreads as a jet)' : lat > 0 ? 'right of the outflow (northern hemisphere)' : 'left of the outflow (southern hemisphere)';
  let plume: ReturnType<typeof riverPlume>['plume'] | null = null;
  let problem: string | null = null;
  if (typeof values.mouthWidth === 'number' && typeof values.mouthDepth === 'number' && values.mouthWidth > 0 && values.mouthDepth > 0) {
    try {
      const { settings } = applyRiverDefaults({ name: values.name || 'river', outflowAzimuthDeg: 0, mouthLongitude: 0, ...values } as RiverCreate);
      plume = riverPlume(settings, { discharge: flow, durationHours: 72 }).plume;
    } catch (err) {
      problem = (err as Error).message;
    }
  }
  return (
    <section aria-label="First plume numbers" className="rounded-md border border-shell-200 bg-sand-50 p-3 text-sm" data-testid="plume-preview">
      <h3 className="font-semibold text-deep-900">First plume numbers</h3>
      <ul className="mt-1 list-disc pl-5">
        <li>Coriolis parameter: {f.toExponential(2)} s⁻¹; the flood water turns {side}.</li>
        {plume ? (
          <>
            <li>At {flow.toLocaleString('en')} m³/s: {plume.regime.replace(/-/g, ' ')} plume, bulge about {(plume.bulgeOffshoreExtent / 1000).toFixed(1)} km offshore.</li>
            <li>Coastal current about {(plume.width / 1000).toFixed(1)} km wide and {plume.depth.toFixed(1)} m deep, its nose moving {plume.noseSpeed.toFixed(2)} m/s.</li>
          </>
        ) : problem ? (
          <li>{problem}</li>
        ) : (
          <li>Type the mouth width and depth for the bulge and the coastal current.</li>
        )}
      </ul>
      <p className="mt-1 text-xs text-shell-700">Estimates at regional defaults for the settings you have not typed; they are not a forecast.</p>
    </section>
  );
}

function NewRiverForm() {
  const qc = useQueryClient();
  const navigate = useNavigate();
  const form = useForm<RiverCreate>({ resolver: zodResolver(riverCreateSchema), defaultValues: { name: '' } });
  const [goTo, setGoTo] = useState({ lat: '', lon: '' });
  const [centre, setCentre] = useState<[number, number] | null>(null);
  const [placing, setPlacing] = useState(false);
  const [previewFlow, setPreviewFlow] = useState(100);
  const values = form.watch();
  const mouth: [number, number] | null =
    typeof values.mouthLongitude === 'number' && typeof values.mouthLatitude === 'number' && Number.isFinite(values.mouthLongitude) && Number.isFinite(values.mouthLatitude)
      ? [values.mouthLongitude, values.mouthLatitude]
      : null;
  const coastAround = useQuery({
    queryKey: ['coasts', 'builtin', centre],
    queryFn: () => getBuiltinCoast(centre![0], centre![1]),
    enabled: centre !== null,
    staleTime: Infinity,
  });
  const mouthCheck = useQuery({
    queryKey: ['coasts', 'builtin-check', mouth],
    queryFn: () => getBuiltinCoast(mouth![0], mouth![1]),
    enabled: mouth !== null && centre !== null,
    staleTime: Infinity,
  });
  const coasts = useMemo(() => (coastAround.data ? [coastAround.data.line] : []), [coastAround.data]);
  const create = useMutation({
    mutationFn: createRiver,
    onSuccess: (river) => {
      void qc.invalidateQueries({ queryKey: riverKeys.all });
      navigate(`/rivers/${river.id}`);
    },
  });
  const e = form.formState.errors;
  const showPlace = () => {
    const lat = Number(goTo.lat);
    const lon = Number(goTo.lon);
    if (goTo.lat !== '' && goTo.lon !== '' && Math.abs(lat) <= 85 && Math.abs(lon) <= 180) setCentre([lon, lat]);
  };
  return (
    <form
      className="space-y-3 rounded-lg border border-sand-200 bg-white p-4"
      // The check of a placed mouth appears while the user may still be dragging the arrow: the page must not scroll under the pointer.
      style={{ overflowAnchor: 'none' }}
      noValidate
      onSubmit={form.handleSubmit((b) => create.mutate(b))}
      aria-label="Set up a river"
    >
      <h2 className="font-semibold text-deep-900">Set up a river</h2>
      <p className="text-sm text-shell-700">
        The mouth is all you need to start: place it on the map (or type it). Water properties, mixing and die-off begin at documented regional defaults, marked on the river’s page until you set them.
      </p>
      <fieldset className="space-y-2 rounded-md border border-shell-200 p-3">
        <legend className="px-1 text-sm font-semibold text-deep-900">Place it on the map</legend>
        <p className="text-sm text-shell-700">Go to your coast, press “Place the mouth”, then press on the coast where the river meets the sea and drag towards the sea to set the outflow direction.</p>
        <div className="grid gap-3 sm:grid-cols-3">
          <TextField label="Go to latitude (°)" type="number" step="any" value={goTo.lat} onChange={(ev) => setGoTo({ ...goTo, lat: ev.target.value })} />
          <TextField label="Go to longitude (°)" type="number" step="any" value={goTo.lon} onChange={(ev) => setGoTo({ ...goTo, lon: ev.target.value })} />
          <div className="flex items-end">
            <Button type="button" variant="secondary" onClick={showPlace}>
              Show the coast here
            </Button>
          </div>
        </div>
        {coastAround.isFetching && <p className="text-sm text-shell-700">Loading the coast around this place…</p>}
        {coastAround.isError && <Notice tone="problem">{(coastAround.error as Error).message}</Notice>}
        <Suspense fallback={<p className="text-sm text-shell-700">Loading the map…</p>}>
          <MouthMap
            centre={centre}
            coasts={coasts}
            mouth={mouth}
            azimuthDeg={typeof values.outflowAzimuthDeg === 'number' ? values.outflowAzimuthDeg : null}
            placing={placing}
            onPlace={([lon, lat]) => {
              form.setValue('mouthLongitude', round(lon, 5), { shouldValidate: true });
              form.setValue('mouthLatitude', round(lat, 5), { shouldValidate: true });
            }}
            onAzimuth={(deg) => form.setValue('outflowAzimuthDeg', deg % 360, { shouldValidate: true })}
            onPlacingDone={() => setPlacing(false)}
          />
        </Suspense>
        <div className="flex flex-wrap items-center gap-3">
          <Button type="button" variant="secondary" aria-pressed={placing} onClick={() => setPlacing(!placing)}>
            {placing ? 'Press on the coast…' : 'Place the mouth'}
          </Button>
          <p className="text-xs text-shell-700">{coastAround.data?.attribution ?? 'Coast © OpenStreetMap contributors (ODbL 1.0), built in; your own uploaded coasts are used where they cover the mouth.'}</p>
        </div>
        {mouthCheck.data?.problem && <Notice tone="problem" title="This mouth cannot be saved on the built-in coast">{mouthCheck.data.problem}</Notice>}
        {mouthCheck.data && !mouthCheck.data.problem && <p className="text-xs text-shell-700">{mouthCheck.data.caution}</p>}
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="River name" {...form.register('name')} error={e.name?.message} />
        <TextField label="Latitude of the mouth (°)" type="number" step="any" hint="Allowed: −90 to 90, north positive." {...form.register('mouthLatitude', num)} error={e.mouthLatitude?.message} />
        <TextField label="Longitude of the mouth (°)" type="number" step="any" hint="Allowed: −180 to 180, east positive." {...form.register('mouthLongitude', num)} error={e.mouthLongitude?.message} />
        <TextField label="Direction of outflow (° from north)" type="number" step="1" hint="Allowed: 0 to 360; the way the water leaves the mouth." {...form.register('outflowAzimuthDeg', num)} error={e.outflowAzimuthDeg?.message} />
        <TextField label="Mouth width (m)" type="number" step="any" hint="Allowed: above 0, up to 100 000." {...form.register('mouthWidth', num)} error={e.mouthWidth?.message} />
        <TextField label="Mouth depth (m)" type="number" step="any" hint="Allowed: above 0, up to 500." {...form.register('mouthDepth', num)} error={e.mouthDepth?.message} />
        <TextField
          label="Flood flow for the preview (m³/s)"
          type="number"
          step="any"
          hint="Only for the numbers below; the flow record gives the real floods."
          value={previewFlow}
          onChange={(ev) => setPreviewFlow(Number(ev.target.value) > 0 ? Number(ev.target.value) : 100)}
        />
      </div>
      <PlumePreview values={values} flow={previewFlow} />
      {create.isError && <Notice tone="problem" title="The river was not created">{create.error.message}</Notice>}
      <Button type="submit" disabled={create.isPending}>
        {create.isPending ? 'Creating…' : 'Create river'}
      </Button>
    </form>
  );
}

/** Rivers of the user's jurisdiction and their own, with whether each has a record and how many settings are still defaults. */
export function RiversPage() {
  const q = useQuery(riverKeys.list());
  return (
    <div className="space-y-6">
      <PageHeader title="Rivers" question="Which rivers can flood your coast, and how well is each one described?" />
      {q.isPending ? (
        <Loading what="Loading rivers…" />
      ) : q.isError ? (
        <LoadError error={q.error} retry={() => q.refetch()} />
      ) : q.data.items.length === 0 ? (
        <Empty title="No rivers yet">Set one up below from its mouth, then upload its gauge record.</Empty>
      ) : (
        <table className="w-full border-collapse bg-white text-sm" data-testid="rivers-table">
          <caption className="p-2 text-left font-semibold text-deep-900">Rivers you can see</caption>
          <thead>
            <tr className="border-b border-shell-300 text-left">
              <th scope="col" className="p-2">River</th>
              <th scope="col" className="p-2">Flow record</th>
              <th scope="col" className="p-2">Settings at regional defaults</th>
              <th scope="col" className="p-2">Last changed</th>
            </tr>
          </thead>
          <tbody>
            {q.data.items.map((r) => (
              <tr key={r.id} className="border-t border-shell-100">
                <th scope="row" className="p-2 text-left">
                  <Link to={`/rivers/${r.id}`} className="font-semibold text-deep-700 underline">
                    {r.name}
                  </Link>
                </th>
                <td className="p-2">{r.hasFlowRecord ? 'Uploaded' : 'None yet'}</td>
                <td className="p-2">{r.defaultsUsed.length === 0 ? 'None — all set' : `${r.defaultsUsed.length} of ${DEFAULTABLE_FIELDS.length}`}</td>
                <td className="p-2 tabular-nums">{r.updatedAt.slice(0, 10)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <NewRiverForm />
    </div>
  );
}
