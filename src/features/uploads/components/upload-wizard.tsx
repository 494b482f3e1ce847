import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { LazyVectorMap } from '../../../components/map/lazy-vector-map';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { Loading } from '../../../components/ui/states';
import { ApiError } from '../../../lib/api-client';
import {
  type ConfirmBody,
  confirmImport,
  type ImportResult,
  importKeys,
  pickImportLayer,
  setImportCrs,
  UPLOAD_ACCEPT,
  type UploadKind,
  uploadImport,
} from '../api/imports-api';

const KIND_WORDS: Record<UploadKind, { noun: string; plural: string }> = {
  lease: { noun: 'lease', plural: 'leases' },
  coast: { noun: 'coastline', plural: 'coastline features' },
  zone: { noun: 'closure zone', plural: 'closure zones' },
};

function formatArea(m2: number | null | undefined): string {
  if (m2 === null || m2 === undefined) return '—';
  return m2 >= 10_000 ? `${(m2 / 10_000).toLocaleString(undefined, { maximumFractionDigits: 2 })} ha` : `${Math.round(m2).toLocaleString()} m²`;
}

/** Upload → (coordinate system) → preview and attribute mapping → confirm. */
export function UploadWizard({ kinds, onDone }: { kinds: UploadKind[]; onDone?: () => void }) {
  const [kind, setKind] = useState<UploadKind>(kinds[0]);
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState(0);
  const [result, setResult] = useState<ImportResult | null>(null);
  const [tracksAsPolygons, setTracksAsPolygons] = useState(false);
  const fileInputId = useId();

  const upload = useMutation({
    mutationFn: (confirmTracks?: boolean) => {
      if (!file) throw new Error('Choose a file first.');
      setProgress(0);
      return uploadImport(file, kind, setProgress, { tracksAsPolygons: confirmTracks ?? tracksAsPolygons });
    },
    onSuccess: setResult,
  });
  const needsTracks = upload.error instanceof ApiError && upload.error.code === 'tracks_need_confirmation';

  if (result?.status === 'needs-crs') return <ChooseCrs result={result} onChosen={setResult} />;
  if (result) return <PreviewAndConfirm result={result} onChangeCrs={(r) => setResult(r)} onRestart={() => setResult(null)} onDone={onDone} />;

  return (
    <form
      className="space-y-4 rounded-lg border border-sand-200 bg-white p-4"
      onSubmit={(e) => {
        e.preventDefault();
        upload.mutate(undefined);
      }}
    >
      <h2 className="text-lg font-semibold text-deep-900">1. Choose a file</h2>
      <p className="text-sm text-shell-700">
        A zipped shapefile (.shp, .shx, .dbf and .prj together in one .zip), GeoJSON, KML or KMZ from a globe viewer, GPX from a GPS app (a track walked
        round each lease), or a GeoPackage. Any coordinate system: Brackline reprojects it.
      </p>
      {kinds.length > 1 && (
        <fieldset className="flex flex-wrap gap-4">
          <legend className="mb-1 text-sm font-semibold">What does the file hold?</legend>
          {kinds.map((k) => (
            <label key={k} className="flex items-center gap-2 text-sm">
              <input type="radio" name="kind" value={k} checked={kind === k} onChange={() => setKind(k)} />
              {KIND_WORDS[k].plural[0].toUpperCase() + KIND_WORDS[k].plural.slice(1)}
            </label>
          ))}
        </fieldset>
      )}
      <div className="flex flex-col gap-1">
        <label htmlFor={fileInputId} className="text-sm font-semibold">
          File
        </label>
        <input
          id={fileInputId}
          type="file"
          accept={UPLOAD_ACCEPT}
          onChange={(e) => {
            setFile(e.target.files?.[0] ?? null);
            setTracksAsPolygons(false);
          }}
        />
      </div>
      {upload.isPending && (
        <div role="status" aria-live="polite" className="text-sm">
          {progress < 1 ? `Uploading ${file?.name}… ${Math.round(progress * 100)}%` : `Reading, reprojecting and checking ${file?.name}…`}
          <progress className="mt-1 block w-full" max={1} value={progress < 1 ? progress : undefined} />
        </div>
      )}
      {upload.isError && !needsTracks && <Notice tone="problem" title="The file was not accepted">{(upload.error as Error).message}</Notice>}
      {needsTracks && (
        <Notice tone="info" title="Are these tracks the outlines of areas?">
          <p>{(upload.error as Error).message.replace(/ If each track.*$/, '')}</p>
          <p className="mt-2">If each track walks round one {KIND_WORDS[kind].noun}, Brackline can turn it into an area, closing any gap with a straight line. Check the outlines in the preview.</p>
          <Button
            type="button"
            className="mt-2"
            onClick={() => {
              setTracksAsPolygons(true);
              upload.mutate(true);
            }}
          >
            Turn tracks into areas
          </Button>
        </Notice>
      )}
      <Button type="submit" disabled={!file || upload.isPending}>
        Upload and check
      </Button>
    </form>
  );
}

function ChooseCrs({ result, onChosen }: { result: ImportResult; onChosen: (r: ImportResult) => void }) {
  const [query, setQuery] = useState('');
  const searchId = useId();
  const search = useQuery({ ...importKeys.crsSearch(query), enabled: query.trim().length >= 2 });
  const choose = useMutation({ mutationFn: (epsg: number) => setImportCrs(result.id, epsg), onSuccess: onChosen });
  return (
    <section className="space-y-4 rounded-lg border border-sand-200 bg-white p-4">
      <h2 className="text-lg font-semibold text-deep-900">2. Which coordinate system is the file in?</h2>
      <Notice tone="info">
        {result.fileName} has {result.featureCount} features but no coordinate system Brackline can read (no .prj file, or one it does not understand). Search for the
        system by name or EPSG code, for example "UTM zone 33" or "2193". You will see where the data lands before you confirm.
      </Notice>
      {result.warnings.length > 0 && <Warnings warnings={result.warnings} />}
      <div className="flex flex-col gap-1">
        <label htmlFor={searchId} className="text-sm font-semibold">
          Search coordinate systems
        </label>
        <input id={searchId} type="search" value={query} onChange={(e) => setQuery(e.target.value)} className="rounded-md border border-shell-300 px-3 py-2" />
      </div>
      {search.isFetching && <Loading what="Searching…" />}
      {choose.isError && <Notice tone="problem">{(choose.error as Error).message}</Notice>}
      {search.data && (
        <ul className="max-h-72 divide-y divide-shell-100 overflow-auto rounded border border-shell-100" aria-label="Coordinate systems found">
          {search.data.items.length === 0 && <li className="p-2 text-sm">Nothing matches. Try another name or the EPSG number.</li>}
          {search.data.items.map((c) => (
            <li key={c.code}>
              <button type="button" className="w-full p-2 text-left text-sm hover:bg-sand-50" onClick={() => choose.mutate(c.code)} disabled={choose.isPending}>
                <span className="font-semibold">EPSG:{c.code}</span> {c.name}
              </button>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function Warnings({ warnings }: { warnings: string[] }) {
  return (
    <Notice tone="problem" title="Please check">
      <ul className="list-disc pl-5">
        {warnings.map((w) => (
          <li key={w}>{w}</li>
        ))}
      </ul>
    </Notice>
  );
}

function PreviewAndConfirm({
  result,
  onChangeCrs,
  onRestart,
  onDone,
}: {
  result: ImportResult;
  onChangeCrs: (r: ImportResult) => void;
  onRestart: () => void;
  onDone?: () => void;
}) {
  const queryClient = useQueryClient();
  const preview = useQuery(importKeys.preview(result.id, `${result.status}-${result.crs.epsg}-${result.selectedLayer ?? ''}`));
  const [mapping, setMapping] = useState<ConfirmBody['mapping']>(result.suggestedMapping ?? {});
  const [duplicates, setDuplicates] = useState<string[] | null>(null);
  const [pickCrs, setPickCrs] = useState(false);
  const confirm = useMutation({
    mutationFn: (onDuplicate?: 'replace' | 'keep') => confirmImport(result.id, { mapping: cleanMapping(mapping), ...(onDuplicate ? { onDuplicate } : {}) }),
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: ['leases'] });
      onDone?.();
    },
    onError: (err) => {
      if (err instanceof ApiError && err.status === 409) {
        const d = (err.details as { duplicates?: string[] } | undefined)?.duplicates;
        if (d) setDuplicates(d);
      }
    },
  });
  // Figures over every feature of the file, from the server: the preview carries only the first features themselves.
  const { areaM2: areas, repaired, onLand, bbox } = result.overview;
  const words = KIND_WORDS[result.kind];
  const coasts = useQuery(importKeys.coasts());
  const layers = useMemo(
    () => [
      ...(coasts.data?.features.length ? [{ id: 'coast', label: 'Known coastline, for reference', data: coasts.data, fill: 'rgba(234,220,191,0.6)', stroke: '#9c7a3f', strokeWidth: 1 }] : []),
      ...(preview.data ? [{ id: 'upload', label: `${words.plural} in ${result.fileName}`, data: preview.data, fill: 'rgba(47,122,102,0.35)', stroke: '#1f5548' }] : []),
    ],
    [preview.data, coasts.data, result.fileName, words.plural],
  );
  const centre = bbox ? [(bbox[0] + bbox[2]) / 2, (bbox[1] + bbox[3]) / 2] : null;

  if (pickCrs) return <ChooseCrs result={result} onChosen={(r) => { setPickCrs(false); onChangeCrs(r); }} />;

  if (confirm.isSuccess) {
    return (
      <Notice tone="done" title="Saved">
        <p>
          {confirm.data.created} {confirm.data.created === 1 ? words.noun : words.plural} added{confirm.data.updated ? `, ${confirm.data.updated} replaced` : ''}.{' '}
          {result.kind === 'lease' && (
            <Link className="font-semibold underline" to="/leases">
              See them in the leases table
            </Link>
          )}
        </p>
        <button type="button" className="mt-2 font-semibold underline" onClick={onRestart}>
          Upload another file
        </button>
      </Notice>
    );
  }

  return (
    <section className="space-y-4 rounded-lg border border-sand-200 bg-white p-4" aria-label="Preview">
      <h2 className="text-lg font-semibold text-deep-900">3. Check what was read</h2>
      <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
        <dt className="font-semibold">Features</dt>
        <dd data-testid="feature-count">{result.featureCount}</dd>
        <dt className="font-semibold">Geometry</dt>
        <dd>{result.geometryTypes.join(', ')}</dd>
        <dt className="font-semibold">Coordinate system</dt>
        <dd>
          {result.crs.epsg ? `EPSG:${result.crs.epsg}` : ''} {result.crs.name ?? ''}{' '}
          <button type="button" className="text-deep-700 underline" onClick={() => setPickCrs(true)}>
            change
          </button>
        </dd>
        <dt className="font-semibold">Lands around</dt>
        <dd data-testid="lands-around">
          {centre ? `${Math.abs(centre[1]).toFixed(3)}° ${centre[1] >= 0 ? 'N' : 'S'}, ${Math.abs(centre[0]).toFixed(3)}° ${centre[0] >= 0 ? 'E' : 'W'}` : '—'}
        </dd>
        <dt className="font-semibold">Area</dt>
        <dd>{areas ? `${formatArea(areas.min)} to ${formatArea(areas.max)}` : '—'}</dd>
      </dl>
      {(result.layers?.length ?? 0) > 1 && <LayerPicker result={result} onPicked={onChangeCrs} />}
      {result.warnings.length > 0 && <Warnings warnings={result.warnings} />}
      {repaired.count > 0 && (
        <Notice tone="info" title={`${repaired.count} feature${repaired.count > 1 ? 's were' : ' was'} repaired`}>
          Invalid outlines (for example a ring that crosses itself) were made valid: features {featureList(repaired)}. Check them on the map.
        </Notice>
      )}
      {onLand.count > 0 && (
        <Notice tone="problem" title={`${onLand.count} on land`}>
          Features {featureList(onLand)} lie wholly on land according to the coastline. Check the file or the coordinate system.
        </Notice>
      )}
      {preview.isPending ? <Loading what="Drawing the preview…" /> : <LazyVectorMap layers={layers} height={280} ariaLabel={`Map of the ${words.plural} read from ${result.fileName}`} />}
      <AttributeTable result={result} />
      {result.kind !== 'coast' && <MappingForm result={result} mapping={mapping} onChange={setMapping} />}
      {confirm.isError && !duplicates && <Notice tone="problem">{(confirm.error as Error).message}</Notice>}
      {duplicates ? (
        <Notice tone="problem" title="Some lease ids already exist">
          <p>{duplicates.join(', ')} already exist among your leases. Replace them with the new outlines, or keep both?</p>
          <div className="mt-2 flex gap-2">
            <Button type="button" onClick={() => confirm.mutate('replace')}>
              Replace them
            </Button>
            <Button type="button" variant="secondary" onClick={() => confirm.mutate('keep')}>
              Keep both
            </Button>
          </div>
        </Notice>
      ) : (
        <div className="flex gap-2">
          <Button type="button" onClick={() => confirm.mutate(undefined)} disabled={confirm.isPending}>
            {confirm.isPending ? 'Saving…' : `Save ${result.featureCount} ${result.featureCount === 1 ? words.noun : words.plural}`}
          </Button>
          <Button type="button" variant="secondary" onClick={onRestart}>
            Start again
          </Button>
        </div>
      )}
    </section>
  );
}

/** Feature numbers as the user counts them (from 1), with how many more there are beyond the listed ones. */
function featureList(list: { count: number; indexes: number[] }): string {
  const shown = list.indexes.map((i) => i + 1).join(', ');
  return list.count > list.indexes.length ? `${shown} and ${list.count - list.indexes.length} more` : shown;
}

function cleanMapping(m: ConfirmBody['mapping']): ConfirmBody['mapping'] {
  return Object.fromEntries(Object.entries(m).filter(([, v]) => v)) as ConfirmBody['mapping'];
}

function AttributeTable({ result }: { result: ImportResult }) {
  const rows = result.features.slice(0, 5);
  if (result.fields.length === 0) return <p className="text-sm text-shell-700">The file has no attributes.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <caption className="text-left font-semibold">First {rows.length} rows of the attribute table</caption>
        <thead>
          <tr className="border-b border-sand-200 text-left">
            <th className="p-1">#</th>
            {result.fields.map((f) => (
              <th key={f} className="p-1">
                {f}
              </th>
            ))}
            <th className="p-1">Area</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.index} className="border-b border-shell-100">
              <td className="p-1">{r.index + 1}</td>
              {result.fields.map((f) => (
                <td key={f} className="p-1">
                  {String(r.properties[f] ?? '')}
                </td>
              ))}
              <td className="p-1">{formatArea(r.areaM2)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

const MAPPING_LABELS: { key: keyof ConfirmBody['mapping']; label: string; help: string }[] = [
  { key: 'leaseId', label: 'Lease id', help: 'Your own identifier for each lease.' },
  { key: 'holder', label: 'Holder', help: 'Who holds the lease.' },
  { key: 'species', label: 'Species', help: 'What is grown there.' },
  { key: 'status', label: 'Status (held or candidate)', help: 'Without one, leases are saved as candidate sites, visible only to you.' },
];

function MappingForm({ result, mapping, onChange }: { result: ImportResult; mapping: ConfirmBody['mapping']; onChange: (m: ConfirmBody['mapping']) => void }) {
  const baseId = useId();
  return (
    <fieldset className="space-y-2">
      <legend className="text-lg font-semibold text-deep-900">4. Which column is which?</legend>
      <div className="grid gap-3 sm:grid-cols-2">
        {MAPPING_LABELS.filter((m) => result.kind === 'lease' || m.key === 'leaseId').map((m) => (
          <div key={m.key} className="flex flex-col gap-1">
            <label htmlFor={`${baseId}-${m.key}`} className="text-sm font-semibold">
              {result.kind === 'zone' && m.key === 'leaseId' ? 'Zone name' : m.label}
            </label>
            <select
              id={`${baseId}-${m.key}`}
              value={mapping[m.key] ?? ''}
              onChange={(e) => onChange({ ...mapping, [m.key]: e.target.value || undefined })}
              className="rounded-md border border-shell-300 bg-white px-3 py-2"
            >
              <option value="">(none)</option>
              {result.fields.map((f) => (
                <option key={f} value={f}>
                  {f}
                </option>
              ))}
            </select>
            <p className="text-xs text-shell-700">{m.help}</p>
          </div>
        ))}
      </div>
    </fieldset>
  );
}

/** A file with several layers (KML folders, GeoPackage tables, shapefiles in a zip): list them and read one, or all. */
function LayerPicker({ result, onPicked }: { result: ImportResult; onPicked: (r: ImportResult) => void }) {
  const id = useId();
  const [choice, setChoice] = useState(result.selectedLayer ?? '');
  const pick = useMutation({ mutationFn: (layer: string | null) => pickImportLayer(result.id, layer), onSuccess: onPicked });
  return (
    <form
      className="space-y-2 rounded-md border border-shell-200 p-3"
      aria-label="Layers in the file"
      onSubmit={(e) => {
        e.preventDefault();
        pick.mutate(choice === '' ? null : choice);
      }}
    >
      <label htmlFor={id} className="block text-sm font-semibold">
        The file holds {result.layers!.length} layers. Read:
      </label>
      <div className="flex flex-wrap items-center gap-2">
        <select id={id} value={choice} onChange={(e) => setChoice(e.target.value)} className="rounded-md border border-shell-300 bg-white px-3 py-2 text-sm" data-testid="layer-picker">
          <option value="">Every layer that fits</option>
          {result.layers!.map((l) => (
            <option key={l.name} value={l.name}>
              {l.name} — {l.featureCount} feature{l.featureCount === 1 ? '' : 's'} ({l.geometryTypes.join(', ')})
            </option>
          ))}
        </select>
        <Button type="submit" variant="secondary" disabled={pick.isPending || choice === (result.selectedLayer ?? '')}>
          Read this layer
        </Button>
      </div>
      {pick.isError && <Notice tone="problem" title="That layer cannot be used">{(pick.error as Error).message}</Notice>}
    </form>
  );
}
