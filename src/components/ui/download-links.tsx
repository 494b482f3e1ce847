/** Download links for one layer in every export format (the server writes each file with its CRS and readme). */
const FORMATS = [
  { format: 'csv', label: 'CSV' },
  { format: 'geojson', label: 'GeoJSON' },
  { format: 'gpkg', label: 'GeoPackage' },
  { format: 'kml', label: 'KML' },
] as const;

export type DownloadFormat = (typeof FORMATS)[number]['format'];

/**
 * @param href - the export URL for a format, e.g. (f) => `/api/v1/zones/export?format=${f}`.
 * @param label - what is downloaded, read by screen readers with each format ("Export closure zones as KML").
 * @param verb - the visible word before the formats.
 */
export function DownloadLinks({ href, label, verb = 'Export' }: { href: (format: DownloadFormat) => string; label: string; verb?: string }) {
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm">
      <span className="font-semibold">{verb}</span>
      {FORMATS.map((f) => (
        <a
          key={f.format}
          className="rounded-md border border-deep-300 bg-white px-3 py-2 font-semibold text-deep-700"
          href={href(f.format)}
          download
          aria-label={`${verb} ${label} as ${f.label}`}
        >
          {f.label}
        </a>
      ))}
    </div>
  );
}
