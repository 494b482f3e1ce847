import { BUILTIN_COAST_ATTRIBUTION, BUILTIN_COAST_CAUTION } from '#shared/cautions';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useMemo, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import type { RiverPlumeSettings } from '#shared/physics/river-plume';
import { type River, type RiverUpdate, riverUpdateSchema, type Scenario } from '#shared/schemas/river';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { fmtNumber } from '../../../lib/format';
import { useMe } from '../../account/api/get-me';
import { CoastChoice } from './coast-choice';
import { riverKeys, updateRiver } from '../api/rivers-api';
import { DesignFlowTable } from './design-flow-table';
import { type DistributionId, FloodFrequencyChart } from './flood-frequency-chart';
import { FlowRecordUpload, ProblemsTable } from './flow-record-upload';
import { HydrographChart } from './hydrograph-chart';
import { PlumePanel } from './plume-panel';
import { ScenariosTable } from './scenarios-table';
import { SettingsForm } from './settings-form';

function Section({ id, title, question, children }: { id: string; title: string; question: string; children: React.ReactNode }) {
  return (
    <section aria-labelledby={`${id}-title`} id={id} className="scroll-mt-4 space-y-3">
      <div>
        <h2 id={`${id}-title`} className="text-xl font-bold text-deep-900">
          {title}
        </h2>
        <p className="text-sm text-shell-700">{question}</p>
      </div>
      {children}
    </section>
  );
}

function RecordSections({ river }: { river: River }) {
  const record = useQuery(riverKeys.record(river.id));
  const design = ((river.settings.designDistribution as DistributionId | undefined) ?? 'gev') as DistributionId;
  if (record.isPending) return <Loading what="Loading the flow record…" />;
  if (record.isError) return <LoadError error={record.error} retry={() => record.refetch()} />;
  const r = record.data;
  return (
    <>
      <Section id="record" title="Flow record" question="What has the river done in the years it was measured?">
        {r ? (
          <>
            <p className="text-sm">
              <strong>{r.file_name}</strong>: {fmtNumber(r.reading_count)} {r.interval} readings from {r.first_time.slice(0, 10)} to {r.last_time.slice(0, 10)}, water years from{' '}
              {r.water_year_start}. {r.gaps.length ? `${r.gaps.length} gaps (${fmtNumber(r.gaps.reduce((a, g) => a + g.missingDays, 0))} missing days).` : 'No gaps.'}
            </p>
            {r.problems.length > 0 && (
              <details className="rounded border border-sand-200 bg-white p-2 text-sm">
                <summary className="cursor-pointer">{r.problems.length} rows were left out when the record was saved</summary>
                <ProblemsTable problems={r.problems} total={r.problems.length} />
              </details>
            )}
            <HydrographChart riverId={river.id} />
          </>
        ) : (
          <Empty title="No flow record yet">Upload the gauge’s record below: the flood-frequency fit, design flows and scenarios come from it.</Empty>
        )}
        <FlowRecordUpload riverId={river.id} />
      </Section>
      {r && (
        <Section id="floods" title="Flood frequency and design flows" question="How big is the flood that comes once in 10, 50 or 100 years on average?">
          <FloodFrequencyChart fit={r.fit} design={design} />
          <DesignFlowTable fit={r.fit} design={design} />
        </Section>
      )}
    </>
  );
}

/** Parsed unsaved settings, for the browser preview; null when the form is unchanged or not valid. */
function usePreview(form: ReturnType<typeof useForm<RiverUpdate>>, river: River): RiverPlumeSettings | null {
  const values = useWatch({ control: form.control });
  const dirty = form.formState.isDirty;
  return useMemo(() => {
    if (!dirty) return null;
    const parsed = riverUpdateSchema.safeParse(values);
    if (!parsed.success) return null;
    return { ...(river.settings as unknown as RiverPlumeSettings), ...(parsed.data as Partial<RiverPlumeSettings>) };
  }, [values, dirty, river.settings]);
}

/** The settings form beside the plume numbers; remounted per river version so the form starts from the saved settings. */
function SettingsAndPlume({ river, canEdit, scenario, onSaved }: { river: River; canEdit: boolean; scenario: Scenario | undefined; onSaved: () => void }) {
  const qc = useQueryClient();
  const form = useForm<RiverUpdate>({ resolver: zodResolver(riverUpdateSchema), mode: 'onChange', defaultValues: river.settings as RiverUpdate });
  const preview = usePreview(form, river);
  const save = useMutation({
    mutationFn: (patch: RiverUpdate) => updateRiver(river.id, patch),
    onSuccess: (updated) => {
      onSaved();
      qc.setQueryData(riverKeys.detail(river.id).queryKey, updated);
      void qc.invalidateQueries({ queryKey: riverKeys.all });
    },
  });
  const onSubmit = (values: RiverUpdate) => {
    const dirty = form.formState.dirtyFields as Record<string, unknown>;
    const patch = Object.fromEntries(Object.entries(values).filter(([k, v]) => dirty[k] && v !== undefined)) as RiverUpdate;
    save.mutate(patch);
  };
  return (
    <div className="grid gap-6 lg:grid-cols-[24rem_1fr]">
      <div>
        {!canEdit && <p className="mb-2 text-sm text-shell-700">Only the river’s creator or a regulator of its jurisdiction can change these settings.</p>}
        <SettingsForm form={form} defaultsUsed={river.defaultsUsed} canEdit={canEdit} onSubmit={onSubmit} saving={save.isPending} />
        {save.isError && <Notice tone="problem" title="Not saved">{save.error.message}</Notice>}
      </div>
      <div className="lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)] lg:self-start lg:overflow-y-auto">{scenario ? <PlumePanel key={scenario.id} scenario={scenario} preview={preview} /> : <Empty title="No scenario to show">Upload a record or add a typed flow to see the plume’s numbers.</Empty>}</div>
    </div>
  );
}

function RiverView({ river }: { river: River }) {
  const me = useMe();
  const canEdit = Boolean(me.data && (river.ownerId === me.data.id || (me.data.role === 'regulator' && river.jurisdictionId === me.data.jurisdictionId)));
  const scenarios = useQuery(riverKeys.scenarios(river.id));
  const [selected, setSelected] = useState<string | null>(null);
  const [savedAt, setSavedAt] = useState<number | null>(null);
  const items = scenarios.data?.items ?? [];
  const chosen = items.find((s) => s.id === selected) ?? items.find((s) => s.aep !== null && Math.abs(s.aep - 0.1) < 1e-9) ?? items[0];

  return (
    <div className="space-y-10">
      <PageHeader
        title={river.name}
        question="How big are this river’s floods, and where does its flood water go along the coast?"
        actions={
          <Link to="/rivers" className="text-sm text-deep-700 underline">
            All rivers
          </Link>
        }
      />
      <nav aria-label="On this page" className="flex flex-wrap gap-4 text-sm">
        <a href="#record" className="text-deep-700 underline">Flow record</a>
        <a href="#floods" className="text-deep-700 underline">Flood frequency</a>
        <a href="#scenarios" className="text-deep-700 underline">Scenarios</a>
        <a href="#plume" className="text-deep-700 underline">Settings and plume numbers</a>
      </nav>
      {river.coastSource === 'builtin' && (
        <Notice tone="info" title="On the built-in world coastline">
          <p>{BUILTIN_COAST_CAUTION}</p>
          <p className="mt-1 text-xs">{BUILTIN_COAST_ATTRIBUTION}</p>
          {canEdit && (
            <div className="mt-2">
              <CoastChoice river={river} />
            </div>
          )}
        </Notice>
      )}
      {river.defaultsUsed.length > 0 && (
        <Notice tone="info" title={`${river.defaultsUsed.length} settings still use regional defaults`}>
          <p>
            They are documented screening values, marked below. Replace them with measured values when you have them; each stops being marked once you save it.
          </p>
        </Notice>
      )}
      <RecordSections river={river} />
      <Section id="scenarios" title="Flood scenarios" question="Which floods are the leases screened against, and for how long does each last?">
        {scenarios.isPending ? (
          <Loading what="Loading scenarios…" />
        ) : scenarios.isError ? (
          <LoadError error={scenarios.error} retry={() => scenarios.refetch()} />
        ) : (
          <ScenariosTable riverId={river.id} scenarios={items} canEdit={canEdit} selectedId={chosen?.id ?? null} onSelect={setSelected} />
        )}
      </Section>
      <Section id="plume" title="Settings and plume numbers" question="With these settings, how big is the plume in the chosen flood, and which model assumptions do they stretch?">
        {savedAt !== null && <Notice tone="done">Settings saved. The server recomputed the numbers and is screening this river’s leases again.</Notice>}
        <SettingsAndPlume key={river.version} river={river} canEdit={canEdit} scenario={chosen} onSaved={() => setSavedAt(Date.now())} />
      </Section>
    </div>
  );
}

/** One river: its record, flood frequency, scenarios, settings and plume numbers. */
export function RiverPage() {
  const { id = '' } = useParams();
  const river = useQuery(riverKeys.detail(id));
  if (river.isPending) return <Loading what="Loading the river…" />;
  if (river.isError) return <LoadError error={river.error} retry={() => river.refetch()} />;
  return <RiverView river={river.data} />;
}
