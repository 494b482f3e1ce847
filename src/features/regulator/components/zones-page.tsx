import { useQuery } from '@tanstack/react-query';
import { type ReactNode, useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/button';
import { DownloadLinks } from '../../../components/ui/download-links';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { fmtArea, fmtFlow, fmtDays } from '../../../lib/format';
import { zoneKeys } from '../api/zones-api';
import { DrawZoneForm } from './draw-zone-form';
import { fmtWhen, ZoneStatusBadge } from './zone-status';

/** The regulator's closure zones: status, river, gauge and plan values; upload or draw new ones. */
export function ZonesPage({ renderUpload }: { renderUpload?: (onDone: () => void) => ReactNode }) {
  const zones = useQuery(zoneKeys.list());
  const [adding, setAdding] = useState<'upload' | 'draw' | null>(null);

  return (
    <div className="space-y-6">
      <PageHeader
        title="Closure zones"
        question="Which zones are open or closed, and on which trigger flows and closure periods?"
        actions={
          <>
            {renderUpload && (
              <Button
                variant={adding === 'upload' ? 'primary' : 'secondary'}
                onClick={() => setAdding(adding === 'upload' ? null : 'upload')}
              >
                Upload zones
              </Button>
            )}
            <Button variant={adding === 'draw' ? 'primary' : 'secondary'} onClick={() => setAdding(adding === 'draw' ? null : 'draw')}>
              Draw a zone
            </Button>
          </>
        }
      />
      {adding === 'upload' && renderUpload && (
        <section aria-label="Upload zones" className="rounded-lg border border-sand-200 bg-white p-4">
          {renderUpload(() => {
            setAdding(null);
            void zones.refetch();
          })}
        </section>
      )}
      {adding === 'draw' && <DrawZoneForm onCancel={() => setAdding(null)} />}

      {zones.isPending ? (
        <Loading what="Loading the zones…" />
      ) : zones.isError ? (
        <LoadError error={zones.error} retry={() => zones.refetch()} />
      ) : zones.data.items.length === 0 ? (
        <Empty title="No closure zones yet">Upload your zones (zipped shapefile, GeoJSON, KML/KMZ, GPX or GeoPackage) or draw one on the map.</Empty>
      ) : (
        <>
        <DownloadLinks label="closure zones" href={(f) => `/api/v1/zones/export?format=${f}`} />
        <table aria-label="Closure zones" className="w-full border-collapse bg-white text-sm">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Zone</th>
              <th className="p-2">Status</th>
              <th className="p-2">Since</th>
              <th className="p-2">River and gauge</th>
              <th className="p-2 text-right">Trigger flow</th>
              <th className="p-2 text-right">Minimum closure</th>
              <th className="p-2 text-right">Held leases</th>
              <th className="p-2 text-right">Area</th>
            </tr>
          </thead>
          <tbody className="tabular-nums">
            {zones.data.items.map((z) => (
              <tr key={z.id} className="border-b border-shell-100 align-top">
                <td className="p-2 font-semibold">
                  <Link className="text-deep-700 underline" to={`/zones/${z.id}`}>
                    {z.name}
                  </Link>
                </td>
                <td className="p-2">
                  <ZoneStatusBadge status={z.status} />
                </td>
                <td className="p-2 whitespace-nowrap">{fmtWhen(z.statusSince)}</td>
                <td className="p-2">
                  {z.riverName ?? <span className="text-shell-700">No river linked</span>}
                  {z.gaugeCode && <span className="block text-xs text-shell-700">Gauge {z.gaugeCode}</span>}
                </td>
                <td className="p-2 text-right">{z.triggerFlow != null ? fmtFlow(z.triggerFlow) : '—'}</td>
                <td className="p-2 text-right">{fmtDays(z.minClosureDays)}</td>
                <td className="p-2 text-right">{z.heldLeases}</td>
                <td className="p-2 text-right">{fmtArea(z.areaM2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
        </>
      )}
    </div>
  );
}
