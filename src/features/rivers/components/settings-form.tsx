import type { UseFormReturn } from 'react-hook-form';
import { RIVER_DEFAULTS, type RiverUpdate } from '#shared/schemas/river';
import { TextField } from '../../../components/ui/text-field';
import { FIELD_GROUPS } from './river-fields';

const num = { setValueAs: (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v)) };

/** "Regional default" until a user sets the field; "yours once saved" while an edit is pending. */
function DefaultBadge({ field, defaultsUsed, dirty }: { field: string; defaultsUsed: string[]; dirty: boolean }) {
  if (!defaultsUsed.includes(field)) return null;
  const source = (RIVER_DEFAULTS as Record<string, { source: string }>)[field]?.source;
  if (dirty) return <span className="mt-1 inline-block rounded bg-estuary-50 px-2 py-0.5 text-xs text-estuary-900">Your value once saved</span>;
  return (
    <span className="mt-1 inline-block rounded border border-sand-400 bg-sand-100 px-2 py-0.5 text-xs text-shell-900" title={source} data-testid={`default-${field}`}>
      Regional default — {source?.split(':')[0] ?? 'documented'}; set your own when you know it
    </span>
  );
}

/** The river's settings (react-hook-form + the shared schema); readonly for people who may not change the river. */
export function SettingsForm({
  form,
  defaultsUsed,
  canEdit,
  onSubmit,
  saving,
}: {
  form: UseFormReturn<RiverUpdate>;
  defaultsUsed: string[];
  canEdit: boolean;
  onSubmit: (values: RiverUpdate) => void;
  saving: boolean;
}) {
  const { register, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined> & { indicator?: Record<string, { message?: string }> };
  const dirty = formState.dirtyFields as Record<string, unknown>;
  const kind = form.watch('indicator.kind');
  return (
    <form className="space-y-4" noValidate onSubmit={form.handleSubmit(onSubmit)} aria-label="River settings">
      <fieldset className="grid gap-3 rounded-lg border border-sand-200 bg-white p-4" disabled={!canEdit}>
        <legend className="px-1 font-semibold text-deep-900">Name and gauge</legend>
        <TextField label="River name" {...register('name')} error={errors.name?.message} />
        <TextField label="Gauge name" hint="Optional: where the record was measured." {...register('gaugeName')} error={errors.gaugeName?.message} />
        <TextField label="Gauge code" hint="Optional: the agency’s code for the gauge." {...register('gaugeCode')} error={errors.gaugeCode?.message} />
        <div className="flex flex-col gap-1">
          <label htmlFor="design-distribution" className="text-sm font-semibold">
            Distribution for design flows
          </label>
          <select id="design-distribution" className="rounded-md border border-shell-300 bg-white px-3 py-2" {...register('designDistribution')}>
            <option value="gev">GEV (L-moments)</option>
            <option value="lp3">Log-Pearson III (Bulletin 17B skew)</option>
            <option value="gumbel">Gumbel</option>
          </select>
          <p className="text-xs text-shell-700">Which fitted curve gives the scenarios’ flows; takes effect at the next record upload.</p>
        </div>
      </fieldset>
      {FIELD_GROUPS.map((g) => (
        <fieldset key={g.title} className="grid gap-3 rounded-lg border border-sand-200 bg-white p-4" disabled={!canEdit}>
          <legend className="px-1 font-semibold text-deep-900">{g.title}</legend>
          {g.fields.map((f) => (
            <div key={f.name}>
              <TextField
                label={`${f.label}${f.unit ? ` (${f.unit})` : ''}`}
                type="number"
                step={f.step}
                inputMode="decimal"
                hint={`Allowed: ${f.range}. ${f.help}`}
                {...register(f.name, num)}
                error={errors[f.name]?.message}
              />
              <DefaultBadge field={f.name} defaultsUsed={defaultsUsed} dirty={Boolean(dirty[f.name])} />
            </div>
          ))}
          {g.title === 'Faecal indicator' && (
            <div className="grid gap-3">
              <div className="flex flex-col gap-1">
                <label htmlFor="indicator-kind" className="text-sm font-semibold">
                  Indicator in flood water
                </label>
                <select id="indicator-kind" className="rounded-md border border-shell-300 bg-white px-3 py-2" {...register('indicator.kind', {
                    onChange: (e: { target: { value: string } }) =>
                      form.setValue(
                        'indicator',
                        e.target.value === 'power-law' ? { kind: 'power-law', coefficient: 100, exponent: 1 } : { kind: 'constant', concentration: RIVER_DEFAULTS.indicator.value.concentration },
                        { shouldDirty: true, shouldValidate: true },
                      ),
                  })}>
                  <option value="constant">A fixed concentration</option>
                  <option value="power-law">Rising with flow, C = a·Q^b</option>
                </select>
                <p className="text-xs text-shell-700">E. coli (or faecal coliform) per 100 mL in the river water at the mouth.</p>
              </div>
              {kind === 'power-law' ? (
                <>
                  <TextField label="Coefficient a (per 100 mL)" type="number" step="any" hint="Allowed: 0 to 1 000 000 000." {...register('indicator.coefficient', num)} error={errors.indicator?.coefficient?.message} />
                  <TextField label="Exponent b" type="number" step="0.05" hint="Allowed: −5 to 5. Above 0 when floods carry more bacteria." {...register('indicator.exponent', num)} error={errors.indicator?.exponent?.message} />
                </>
              ) : (
                <TextField label="Concentration (per 100 mL)" type="number" step="any" hint="Allowed: 0 to 1 000 000 000. A rural catchment in flood is near 10 000." {...register('indicator.concentration', num)} error={errors.indicator?.concentration?.message} />
              )}
              <DefaultBadge field="indicator" defaultsUsed={defaultsUsed} dirty={Boolean(dirty.indicator)} />
            </div>
          )}
        </fieldset>
      ))}
      {canEdit && (
        <div className="sticky bottom-0 flex items-center gap-3 border-t border-sand-200 bg-sand-50 py-3">
          <button type="submit" className="rounded-md bg-deep-700 px-4 py-2 text-sm font-semibold text-white disabled:bg-shell-300" disabled={!formState.isDirty || saving}>
            {saving ? 'Saving…' : 'Save settings'}
          </button>
          <button type="button" className="text-sm text-deep-700 underline-offset-4 hover:underline disabled:text-shell-500" disabled={!formState.isDirty || saving} onClick={() => form.reset()}>
            Undo changes
          </button>
          {formState.isDirty && <span className="text-xs text-shell-700">Unsaved: the plume numbers show your changes.</span>}
        </div>
      )}
    </form>
  );
}
