import { useMutation, useQueryClient } from '@tanstack/react-query';
import { type FormEvent, useId, useState } from 'react';
import type { RowProblemDto } from '#shared/schemas/monitoring';
import { ApiError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { uploadSamples, uploadStations } from '../api/monitoring-api';

function problemsOf(error: unknown): RowProblemDto[] {
  if (error instanceof ApiError && error.details && typeof error.details === 'object' && 'problems' in error.details) {
    return (error.details as { problems: RowProblemDto[] }).problems;
  }
  return [];
}

/** The rows a file was refused for, one line each, so the user can fix the file. */
export function RowProblemsTable({ problems, label }: { problems: RowProblemDto[]; label: string }) {
  if (!problems.length) return null;
  return (
    <div className="mt-2 max-h-64 overflow-y-auto rounded border border-sand-200 bg-white">
      <table className="w-full border-collapse text-sm" aria-label={label}>
        <thead className="sticky top-0 bg-sand-100 text-left">
          <tr>
            <th className="p-2">Row</th>
            <th className="p-2">Column</th>
            <th className="p-2">What is wrong</th>
          </tr>
        </thead>
        <tbody>
          {problems.map((p) => (
            <tr key={`${p.row}-${p.column ?? ''}-${p.message}`} className="border-t border-shell-100 align-top">
              <td className="p-2 tabular-nums">{p.row}</td>
              <td className="p-2">{p.column ?? '—'}</td>
              <td className="p-2">{p.message}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function UploadError({ error, what }: { error: unknown; what: string }) {
  const problems = problemsOf(error);
  return (
    <Notice tone="problem" title={`The ${what} were not saved`}>
      <p>{error instanceof Error ? error.message : 'Unknown error.'}</p>
      <RowProblemsTable problems={problems} label={`Problems in the ${what} file`} />
    </Notice>
  );
}

/** Two uploads side by side: stations (points) and samples (CSV). Each is saved whole or not at all. */
export function UploadPanel() {
  const queryClient = useQueryClient();
  const ids = { stations: useId(), epsg: useId(), samples: useId() };
  const [stationFile, setStationFile] = useState<File | null>(null);
  const [epsg, setEpsg] = useState('');
  const [sampleFile, setSampleFile] = useState<File | null>(null);
  const refresh = () => queryClient.invalidateQueries({ queryKey: ['monitoring'] });
  const stations = useMutation({
    mutationFn: ({ file, code }: { file: File; code?: number }) => uploadStations(file, code),
    onSuccess: refresh,
  });
  const samples = useMutation({ mutationFn: (file: File) => uploadSamples(file), onSuccess: refresh });

  const submitStations = (e: FormEvent) => {
    e.preventDefault();
    if (stationFile) stations.mutate({ file: stationFile, code: epsg.trim() ? Number(epsg) : undefined });
  };
  const submitSamples = (e: FormEvent) => {
    e.preventDefault();
    if (sampleFile) samples.mutate(sampleFile);
  };

  return (
    <section aria-labelledby="upload-heading" className="space-y-3">
      <h2 id="upload-heading" className="text-lg font-semibold text-deep-900">
        1. Upload monitoring data
      </h2>
      <div className="grid gap-4 lg:grid-cols-2">
        <form onSubmit={submitStations} className="space-y-3 rounded-lg border border-sand-200 bg-white p-4" aria-label="Upload stations">
          <h3 className="font-semibold">Stations</h3>
          <p className="text-sm text-shell-700">
            Points, as a zipped shapefile, GeoJSON, KML or KMZ pins, GPX waypoints, a GeoPackage, or CSV with a station code and longitude/latitude (or x/y with the EPSG code). A station
            uploaded again under the same code is updated.
          </p>
          <div>
            <label htmlFor={ids.stations} className="block text-sm font-semibold">
              Stations file
            </label>
            <input
              id={ids.stations}
              type="file"
              accept=".zip,.geojson,.json,.csv,.kml,.kmz,.gpx,.gpkg"
              onChange={(e) => setStationFile(e.target.files?.[0] ?? null)}
              className="mt-1 text-sm"
            />
          </div>
          <div>
            <label htmlFor={ids.epsg} className="block text-sm font-semibold">
              EPSG code (only for x/y columns or a shapefile without .prj)
            </label>
            <input
              id={ids.epsg}
              inputMode="numeric"
              value={epsg}
              onChange={(e) => setEpsg(e.target.value.replace(/\D/g, ''))}
              placeholder="e.g. 32624"
              className="mt-1 w-40 rounded border border-shell-300 px-2 py-1 text-sm"
            />
          </div>
          <Button type="submit" disabled={!stationFile || stations.isPending}>
            {stations.isPending ? 'Reading the stations…' : 'Upload stations'}
          </Button>
          {stations.isError && <UploadError error={stations.error} what="stations" />}
          {stations.isSuccess && (
            <Notice tone="done" title="Stations saved">
              <p>
                {stations.data.created} new, {stations.data.updated} updated ({stations.data.format}).
              </p>
              {stations.data.warnings.map((w) => (
                <p key={w}>{w}</p>
              ))}
            </Notice>
          )}
        </form>

        <form onSubmit={submitSamples} className="space-y-3 rounded-lg border border-sand-200 bg-white p-4" aria-label="Upload samples">
          <h3 className="font-semibold">Samples</h3>
          <p className="text-sm text-shell-700">
            CSV with station id, date-time (UTC), salinity, the indicator (e.g. e_coli_per_100ml, per 100 mL), method (MPN or MF) and
            optional temperature. Detection limits such as “&lt;2” or “&gt;1600” are kept as limits, not numbers.
          </p>
          <div>
            <label htmlFor={ids.samples} className="block text-sm font-semibold">
              Samples file (CSV)
            </label>
            <input
              id={ids.samples}
              type="file"
              accept=".csv,text/csv"
              onChange={(e) => setSampleFile(e.target.files?.[0] ?? null)}
              className="mt-1 text-sm"
            />
          </div>
          <Button type="submit" disabled={!sampleFile || samples.isPending}>
            {samples.isPending ? 'Checking every row…' : 'Upload samples'}
          </Button>
          {samples.isError && <UploadError error={samples.error} what="samples" />}
          {samples.isSuccess && (
            <Notice tone="done" title="Samples saved">
              <p>
                {samples.data.created} new, {samples.data.updated} updated, at {samples.data.stations} stations
                {samples.data.firstSample && ` from ${samples.data.firstSample.slice(0, 10)} to ${samples.data.lastSample?.slice(0, 10)}`};{' '}
                {samples.data.censored} indicator results kept as detection limits.
              </p>
              {samples.data.warnings.map((w) => (
                <p key={w}>{w}</p>
              ))}
            </Notice>
          )}
        </form>
      </div>
    </section>
  );
}
