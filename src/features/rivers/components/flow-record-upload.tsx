import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useId, useState } from 'react';
import type { FlowRecordProblem } from '#shared/hydrology/parse-flow-record';
import type { FlowSourceResult } from '#shared/hydrology/read-flow-source';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { fmtNumber } from '../../../lib/format';
import { type FlowRecordReadOptions, riverKeys, type UploadProblems, type UploadResult, uploadFlowRecord } from '../api/rivers-api';

type State =
  | { step: 'idle' }
  | { step: 'uploading'; fraction: number }
  | { step: 'problems'; problems: UploadProblems; message: string }
  | { step: 'done'; result: UploadResult }
  | { step: 'failed'; message: string };

const SHOWN_PROBLEMS = 200;

/** Table of rows that could not be used: row number, the value at fault and why. */
export function ProblemsTable({ problems, total }: { problems: FlowRecordProblem[]; total: number }) {
  return (
    <div className="max-h-72 overflow-auto rounded border border-shell-300 bg-white">
      <table className="w-full border-collapse text-sm" data-testid="row-problems">
        <caption className="sr-only">Rows with problems</caption>
        <thead className="sticky top-0 bg-shell-50">
          <tr className="text-left">
            <th scope="col" className="p-2">Row</th>
            <th scope="col" className="p-2">Value</th>
            <th scope="col" className="p-2">Why it cannot be used</th>
          </tr>
        </thead>
        <tbody>
          {problems.slice(0, SHOWN_PROBLEMS).map((p) => (
            <tr key={`${p.row}-${p.value}`} className="border-t border-shell-100 align-top">
              <td className="p-2 tabular-nums">{p.row}</td>
              <td className="p-2 font-mono text-xs">{p.value || '(empty)'}</td>
              <td className="p-2">{p.reason}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {total > SHOWN_PROBLEMS && <p className="p-2 text-xs text-shell-700">The first {SHOWN_PROBLEMS} of {fmtNumber(total)} rows are shown.</p>}
    </div>
  );
}

/** Choose a CSV of dates and flows, send it with progress, and settle any row problems. */
export function FlowRecordUpload({ riverId }: { riverId: string }) {
  const qc = useQueryClient();
  const id = useId();
  const [file, setFile] = useState<File | null>(null);
  const [units, setUnits] = useState<'m3s' | 'cfs' | 'auto'>('auto');
  const [waterYearStart, setWaterYearStart] = useState('10-01');
  const [state, setState] = useState<State>({ step: 'idle' });
  const [text, setText] = useState<string | null>(null);
  const [choice, setChoice] = useState<Omit<FlowRecordReadOptions, 'units'>>({});
  const [preview, setPreview] = useState<{ result?: FlowSourceResult; error?: string } | null>(null);

  // The preview reads the file in the browser with the same reader as the server (loaded only on this page).
  useEffect(() => {
    if (text === null) {
      setPreview(null);
      return;
    }
    let live = true;
    void import('#shared/hydrology/read-flow-source').then(({ readFlowSource }) => {
      if (!live) return;
      try {
        setPreview({ result: readFlowSource(text, { units, ...choice }) });
      } catch (err) {
        setPreview({ error: err instanceof Error ? err.message : String(err) });
      }
    });
    return () => {
      live = false;
    };
  }, [text, units, choice]);

  async function send(acceptProblems: boolean) {
    if (!file) return;
    setState({ step: 'uploading', fraction: 0 });
    try {
      const result = await uploadFlowRecord(
        riverId,
        file,
        { units, waterYearStart, acceptProblems, ...choice, xml: preview?.result?.format === 'waterml2' || /\.xml$/i.test(file.name) },
        (fraction) => setState({ step: 'uploading', fraction }),
      );
      setState({ step: 'done', result });
      await qc.invalidateQueries({ queryKey: riverKeys.all });
    } catch (err) {
      if (err instanceof ApiError && err.status === 422 && (err.details as UploadProblems | undefined)?.problems?.length) {
        setState({ step: 'problems', problems: err.details as UploadProblems, message: err.message });
      } else {
        setState({ step: 'failed', message: err instanceof Error ? err.message : 'The upload failed.' });
      }
    }
  }

  const busy = state.step === 'uploading';
  return (
    <div className="space-y-3 rounded-lg border border-sand-200 bg-white p-4">
      <form
        className="grid gap-3 sm:grid-cols-[2fr_1fr_1fr_auto] sm:items-end"
        onSubmit={(e) => {
          e.preventDefault();
          void send(false);
        }}
        aria-label="Upload a flow record"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-file`} className="text-sm font-semibold">
            Gauge record (CSV or WaterML 2.0)
          </label>
          <input
            id={`${id}-file`}
            type="file"
            accept=".csv,.tsv,.txt,.xml,.wml,text/csv,text/plain,text/tab-separated-values,application/xml,text/xml"
            onChange={(e) => {
              const f = e.target.files?.[0] ?? null;
              setFile(f);
              setChoice({});
              setText(null);
              setState({ step: 'idle' });
              if (f) void f.text().then(setText);
            }}
            aria-describedby={`${id}-file-hint`}
          />
          <p id={`${id}-file-hint`} className="text-xs text-shell-700">
            An agency export as it comes: CSV or tab-separated (comment lines starting with #, several columns, quality codes), or a WaterML 2.0
            time series. Daily or finer; ten years or more for a trustworthy fit.
          </p>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-units`} className="text-sm font-semibold">
            Flow units
          </label>
          <select id={`${id}-units`} value={units} onChange={(e) => setUnits(e.target.value as 'm3s' | 'cfs' | 'auto')} className="rounded-md border border-shell-300 bg-white px-3 py-2">
            <option value="auto">as the file says</option>
            <option value="m3s">cubic metres per second (m³/s)</option>
            <option value="cfs">cubic feet per second (cfs)</option>
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-wy`} className="text-sm font-semibold">
            Water year starts (MM-DD)
          </label>
          <input id={`${id}-wy`} value={waterYearStart} onChange={(e) => setWaterYearStart(e.target.value)} pattern="\d\d-\d\d" className="rounded-md border border-shell-300 px-3 py-2" />
        </div>
        <Button type="submit" disabled={!file || busy}>
          Upload record
        </Button>
      </form>

      {preview?.error && (
        <Notice tone="problem" title="This file cannot be read yet">
          {preview.error}
        </Notice>
      )}
      {preview?.result && <RecordPreview result={preview.result} choice={choice} onChoice={setChoice} />}

      {state.step === 'uploading' && (
        <div role="status" aria-live="polite" className="space-y-1">
          <progress className="w-full" max={1} value={state.fraction} aria-label="Upload progress" />
          <p className="text-sm text-shell-700">
            {state.fraction < 1 ? `Sending the record… ${Math.round(state.fraction * 100)}%` : 'Reading the rows, fitting flood frequency and re-screening leases…'}
          </p>
        </div>
      )}
      {state.step === 'problems' && (
        <div className="space-y-3">
          <Notice tone="problem" title={`${fmtNumber(state.problems.problemCount)} of ${fmtNumber(state.problems.rows)} rows cannot be used`}>
            <p>Nothing has been saved yet. Fix these rows in the file and upload again, or continue without them.</p>
          </Notice>
          <ProblemsTable problems={state.problems.problems} total={state.problems.problemCount} />
          <div className="flex gap-2">
            <Button type="button" onClick={() => void send(true)}>
              Continue without these {fmtNumber(state.problems.problemCount)} rows
            </Button>
            <Button type="button" variant="secondary" onClick={() => setState({ step: 'idle' })}>
              Cancel
            </Button>
          </div>
        </div>
      )}
      {state.step === 'failed' && <Notice tone="problem" title="The record was not saved">{state.message}</Notice>}
      {state.step === 'done' && (
        <Notice tone="done" title="Record saved">
          {fmtNumber(state.result.readings)} readings kept
          {state.result.problems.length ? `, ${fmtNumber(state.result.problems.length)} rows left out` : ''}
          {state.result.droppedProvisional ? `, ${fmtNumber(state.result.droppedProvisional)} provisional values left out` : ''}. The flood-frequency fit and the
          scenarios below are new.
          {state.result.unitsNote && <span className="block">{state.result.unitsNote}</span>}
        </Notice>
      )}
    </div>
  );
}

/** What the reader makes of the file before it is sent: columns (changeable), units, quality codes, sub-daily days. */
function RecordPreview({
  result,
  choice,
  onChoice,
}: {
  result: FlowSourceResult;
  choice: Omit<FlowRecordReadOptions, 'units'>;
  onChoice: (c: Omit<FlowRecordReadOptions, 'units'>) => void;
}) {
  const id = useId();
  const provisional = result.qualityCodes.filter((c) => c.provisional).reduce((n, c) => n + c.count, 0);
  const cols = result.columns;
  const select = (key: 'dateColumn' | 'dischargeColumn' | 'qualityColumn', label: string, value: string | null, allowNone = false) => (
    <div className="flex flex-col gap-1">
      <label htmlFor={`${id}-${key}`} className="text-sm font-semibold">
        {label}
      </label>
      <select
        id={`${id}-${key}`}
        value={value ?? ''}
        onChange={(e) => onChoice({ ...choice, [key]: e.target.value })}
        className="rounded-md border border-shell-300 bg-white px-3 py-2 text-sm"
      >
        {allowNone && <option value="">none</option>}
        {cols?.names.map((n) => (
          <option key={n} value={n}>
            {n}
          </option>
        ))}
      </select>
    </div>
  );
  return (
    <section className="space-y-3 rounded-md border border-shell-200 p-3 text-sm" aria-label="What the file holds" data-testid="record-preview">
      <p>
        {result.format === 'waterml2' ? 'A WaterML 2.0 time series' : 'A table'}: {fmtNumber(result.readings.length)} readings
        {result.problems.length ? `, ${fmtNumber(result.problems.length)} rows with problems` : ''}, {result.interval === 'daily' ? 'daily' : 'several readings a day'}.{' '}
        {result.unitsNote}
      </p>
      {cols && (
        <div className="grid gap-3 sm:grid-cols-3">
          {select('dateColumn', cols.guessed ? 'Date column (guessed)' : 'Date column', cols.date)}
          {select('dischargeColumn', cols.guessed ? 'Flow column (guessed)' : 'Flow column', cols.discharge)}
          {select('qualityColumn', 'Quality or approval codes', cols.quality, true)}
        </div>
      )}
      {result.qualityCodes.length > 0 && (
        <div>
          <p className="font-semibold">Quality and approval codes (kept with each reading)</p>
          <ul className="flex flex-wrap gap-3" data-testid="quality-codes">
            {result.qualityCodes.map((c) => (
              <li key={c.code}>
                <span className="font-mono">{c.code}</span>: {fmtNumber(c.count)}
                {c.provisional ? ' (provisional)' : ''}
              </li>
            ))}
          </ul>
          {(provisional > 0 || choice.dropProvisional) && (
            <label className="mt-1 flex items-center gap-2">
              <input type="checkbox" checked={choice.dropProvisional ?? false} onChange={(e) => onChoice({ ...choice, dropProvisional: e.target.checked })} />
              Leave out the provisional values ({fmtNumber(provisional || result.droppedProvisional)})
            </label>
          )}
        </div>
      )}
      {result.daily && (
        <fieldset>
          <legend className="font-semibold">Several readings a day ({fmtNumber(result.daily.length)} days, times converted from their zones to UTC)</legend>
          {(['max', 'mean', undefined] as const).map((d) => (
            <label key={d ?? 'all'} className="mr-4 inline-flex items-center gap-2">
              <input type="radio" name={`${id}-daily`} checked={choice.daily === d} onChange={() => onChoice({ ...choice, daily: d })} />
              {d === 'max' ? 'Daily maxima' : d === 'mean' ? 'Daily means' : 'Every reading'}
            </label>
          ))}
        </fieldset>
      )}
      {result.aggregated && <p>Stored as daily {result.aggregated === 'max' ? 'maxima' : 'means'}, one reading a day as written in the file.</p>}
      {result.warnings.map((w) => (
        <p key={w} className="text-shell-900">
          {w}
        </p>
      ))}
    </section>
  );
}
