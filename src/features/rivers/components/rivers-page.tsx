import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link, useNavigate } from 'react-router-dom';
import { DEFAULTABLE_FIELDS, type RiverCreate, riverCreateSchema } from '#shared/schemas/river';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { createRiver, riverKeys } from '../api/rivers-api';

const num = { setValueAs: (v: string) => (v === '' ? undefined : Number(v)) };

function NewRiverForm() {
  const qc = useQueryClient();
  const navigate = useNavigate();
  const form = useForm<RiverCreate>({ resolver: zodResolver(riverCreateSchema), defaultValues: { name: '' } });
  const create = useMutation({
    mutationFn: createRiver,
    onSuccess: (river) => {
      void qc.invalidateQueries({ queryKey: riverKeys.all });
      navigate(`/rivers/${river.id}`);
    },
  });
  const e = form.formState.errors;
  return (
    <form className="space-y-3 rounded-lg border border-sand-200 bg-white p-4" noValidate onSubmit={form.handleSubmit((b) => create.mutate(b))} aria-label="Set up a river">
      <h2 className="font-semibold text-deep-900">Set up a river</h2>
      <p className="text-sm text-shell-700">The mouth is all you need to start. Water properties, mixing and die-off begin at documented regional defaults, marked on the river’s page until you set them.</p>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="River name" {...form.register('name')} error={e.name?.message} />
        <TextField label="Latitude of the mouth (°)" type="number" step="any" hint="Allowed: −90 to 90, north positive." {...form.register('mouthLatitude', num)} error={e.mouthLatitude?.message} />
        <TextField label="Longitude of the mouth (°)" type="number" step="any" hint="Allowed: −180 to 180, east positive." {...form.register('mouthLongitude', num)} error={e.mouthLongitude?.message} />
        <TextField label="Direction of outflow (° from north)" type="number" step="1" hint="Allowed: 0 to 360; the way the water leaves the mouth." {...form.register('outflowAzimuthDeg', num)} error={e.outflowAzimuthDeg?.message} />
        <TextField label="Mouth width (m)" type="number" step="any" hint="Allowed: above 0, up to 100 000." {...form.register('mouthWidth', num)} error={e.mouthWidth?.message} />
        <TextField label="Mouth depth (m)" type="number" step="any" hint="Allowed: above 0, up to 500." {...form.register('mouthDepth', num)} error={e.mouthDepth?.message} />
      </div>
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
