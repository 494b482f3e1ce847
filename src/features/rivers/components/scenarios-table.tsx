import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { type ScenarioCreate, type Scenario, scenarioCreateSchema } from '#shared/schemas/river';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Empty } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { fmtNumber } from '../../../lib/format';
import { createScenario, deleteScenario, riverKeys, updateScenario } from '../api/rivers-api';

const KIND_LABEL: Record<Scenario['kind'], string> = { aep: 'From the fit', seasonal: 'Seasonal', manual: 'Typed' };

function DurationCell({ scenario, canEdit, riverId }: { scenario: Scenario; canEdit: boolean; riverId: string }) {
  const qc = useQueryClient();
  const [value, setValue] = useState(String(scenario.durationHours));
  const save = useMutation({
    mutationFn: (hours: number) => updateScenario(scenario.id, { durationHours: hours }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: riverKeys.scenarios(riverId).queryKey });
      void qc.invalidateQueries({ queryKey: riverKeys.plume(scenario.id).queryKey });
    },
  });
  if (!canEdit) return <>{fmtNumber(scenario.durationHours, 0)} h</>;
  const n = Number(value);
  const changed = value !== '' && n !== scenario.durationHours;
  return (
    <form
      className="flex items-center gap-1"
      onSubmit={(e) => {
        e.preventDefault();
        if (changed && n > 0) save.mutate(n);
      }}
    >
      <label className="sr-only" htmlFor={`dur-${scenario.id}`}>
        Flood duration of {scenario.name} (hours)
      </label>
      <input
        id={`dur-${scenario.id}`}
        type="number"
        min={1}
        max={8760}
        step={1}
        value={value}
        onChange={(e) => setValue(e.target.value)}
        className="w-20 rounded border border-shell-300 px-2 py-1 text-right tabular-nums"
      />
      <span>h</span>
      {changed && (
        <Button type="submit" variant="secondary" className="px-2 py-1" disabled={save.isPending || !(n > 0)}>
          Save
        </Button>
      )}
      {save.isError && (
        <span role="alert" className="text-xs text-[#8a3b12]">
          {save.error.message}
        </span>
      )}
    </form>
  );
}

/** The river's flood scenarios: from the fit, seasonal high flows and typed flows; durations editable by the river's editors. */
export function ScenariosTable({
  riverId,
  scenarios,
  canEdit,
  selectedId,
  onSelect,
}: {
  riverId: string;
  scenarios: Scenario[];
  canEdit: boolean;
  selectedId: string | null;
  onSelect: (id: string) => void;
}) {
  const qc = useQueryClient();
  const form = useForm<ScenarioCreate>({ resolver: zodResolver(scenarioCreateSchema), defaultValues: { name: '', durationHours: 48 } });
  const add = useMutation({
    mutationFn: (body: ScenarioCreate) => createScenario(riverId, body),
    onSuccess: (s) => {
      form.reset({ name: '', durationHours: 48 });
      void qc.invalidateQueries({ queryKey: riverKeys.scenarios(riverId).queryKey });
      onSelect(s.id);
    },
  });
  const remove = useMutation({
    mutationFn: deleteScenario,
    onSuccess: () => void qc.invalidateQueries({ queryKey: riverKeys.scenarios(riverId).queryKey }),
  });
  const num = { setValueAs: (v: string) => (v === '' ? undefined : Number(v)) };
  return (
    <div className="space-y-4">
      {scenarios.length === 0 ? (
        <Empty title="No flood scenarios yet">Upload a flow record to get scenarios from the flood-frequency fit, or type a flow below.</Empty>
      ) : (
        <div className="overflow-x-auto">
          <table className="w-full border-collapse bg-white text-sm tabular-nums" data-testid="scenarios-table">
            <caption className="p-2 text-left font-semibold text-deep-900">Flood scenarios</caption>
            <thead>
              <tr className="border-b border-shell-300 text-left">
                <th scope="col" className="p-2">Scenario</th>
                <th scope="col" className="p-2">Source</th>
                <th scope="col" className="p-2">Flow</th>
                <th scope="col" className="p-2">Flood duration</th>
                <th scope="col" className="p-2">Plume numbers</th>
                {canEdit && <th scope="col" className="p-2"><span className="sr-only">Actions</span></th>}
              </tr>
            </thead>
            <tbody>
              {scenarios.map((s) => (
                <tr key={s.id} className={`border-t border-shell-100 ${s.id === selectedId ? 'bg-deep-50' : ''}`}>
                  <th scope="row" className="p-2 text-left font-normal">{s.name}</th>
                  <td className="p-2">{KIND_LABEL[s.kind]}</td>
                  <td className="p-2">{fmtNumber(s.discharge, 0)} m³/s</td>
                  <td className="p-2">
                    <DurationCell key={`${s.id}-${s.durationHours}`} scenario={s} canEdit={canEdit} riverId={riverId} />
                  </td>
                  <td className="p-2">
                    <Button type="button" variant={s.id === selectedId ? 'primary' : 'secondary'} className="px-2 py-1" aria-pressed={s.id === selectedId} onClick={() => onSelect(s.id)}>
                      {s.id === selectedId ? 'Showing' : 'Show'}
                      <span className="sr-only"> plume numbers of {s.name}</span>
                    </Button>
                  </td>
                  {canEdit && (
                    <td className="p-2">
                      {s.kind === 'manual' && (
                        <Button type="button" variant="quiet" onClick={() => remove.mutate(s.id)} disabled={remove.isPending}>
                          Delete<span className="sr-only"> {s.name}</span>
                        </Button>
                      )}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {canEdit && (
        <form className="grid gap-3 rounded-lg border border-sand-200 bg-white p-4 sm:grid-cols-[2fr_1fr_1fr_auto] sm:items-start" onSubmit={form.handleSubmit((b) => add.mutate(b))} noValidate aria-label="Add a typed flow">
          <TextField label="Name of a typed flow" hint="e.g. Storm of record, 1998" {...form.register('name')} error={form.formState.errors.name?.message} />
          <TextField label="Flow (m³/s)" type="number" step="any" hint="Above 0" {...form.register('discharge', num)} error={form.formState.errors.discharge?.message} />
          <TextField label="Flood duration (h)" type="number" step="1" hint="Above 0, up to 8760" {...form.register('durationHours', num)} error={form.formState.errors.durationHours?.message} />
          <Button type="submit" className="sm:mt-6" disabled={add.isPending}>
            Add flow
          </Button>
          {add.isError && <div className="sm:col-span-4"><Notice tone="problem">{add.error.message}</Notice></div>}
        </form>
      )}
    </div>
  );
}
