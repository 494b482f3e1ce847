import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { type PublicStatus, ZONE_STATUS_LABEL } from '#shared/schemas/zones';
import { CAUTION_TEXT } from '../../../components/ui/cautions';
import { api } from '../../../lib/api-client';

const when = (iso: string) => `${new Date(iso).toLocaleString('en-GB', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' })} UTC`;

/** A jurisdiction's closure zones and recent notices: no sign-in, plain, printable (black-and-white legible). */
export function PublicStatusPage() {
  const { jurisdiction = '' } = useParams();
  const status = useQuery({
    queryKey: ['public-status', jurisdiction],
    queryFn: () => api<PublicStatus>(`/public/status/${encodeURIComponent(jurisdiction)}`),
    refetchInterval: 5 * 60_000,
  });
  return (
    <main className="mx-auto max-w-3xl bg-white px-6 py-8 text-black print:p-0">
      {status.isPending ? (
        <p role="status">Loading the current status…</p>
      ) : status.isError ? (
        <div role="alert">
          <h1 className="text-2xl font-bold">Status not available</h1>
          <p className="mt-2">{(status.error as Error).message}</p>
        </div>
      ) : (
        <>
          <h1 className="text-2xl font-bold">{status.data.jurisdiction.name}: shellfish harvesting areas</h1>
          <p className="mt-1 text-sm">
            Current status of each closure zone, as set by the authority. Updated {when(status.data.generatedAt)}.
          </p>
          <h2 className="mt-6 text-lg font-bold">Zones</h2>
          {status.data.zones.length === 0 ? (
            <p>No zones are listed.</p>
          ) : (
            <table aria-label="Zone status" className="mt-2 w-full border-collapse text-sm">
              <thead>
                <tr className="border-b-2 border-black text-left">
                  <th className="py-1 pr-4">Zone</th>
                  <th className="py-1 pr-4">Status</th>
                  <th className="py-1 pr-4">Since</th>
                  <th className="py-1">River</th>
                </tr>
              </thead>
              <tbody>
                {status.data.zones.map((z) => (
                  <tr key={z.name} className="border-b border-gray-400">
                    <td className="py-1 pr-4 font-semibold">{z.name}</td>
                    <td className={`py-1 pr-4 ${z.status === 'open' ? '' : 'font-bold uppercase'}`}>{ZONE_STATUS_LABEL[z.status]}</td>
                    <td className="py-1 pr-4">{when(z.statusSince)}</td>
                    <td className="py-1">{z.riverName ?? '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <h2 className="mt-6 text-lg font-bold">Recent notices</h2>
          {status.data.notices.length === 0 ? (
            <p>No notices yet.</p>
          ) : (
            <ol aria-label="Recent notices" className="mt-2 space-y-2">
              {status.data.notices.map((n) => (
                <li key={`${n.issuedAt}-${n.zones.join()}`} className="border-l-4 border-black pl-3">
                  <p className="font-semibold">
                    {n.kind === 'closure' ? 'Closure' : 'Reopening'}: {n.zones.join(', ')}
                  </p>
                  <p className="text-sm">{when(n.issuedAt)}</p>
                  {n.message && <p className="text-sm">{n.message}</p>}
                </li>
              ))}
            </ol>
          )}
          <p className="mt-8 border-t border-gray-400 pt-2 text-xs">{CAUTION_TEXT[2]}</p>
          <button type="button" className="mt-4 rounded border border-black px-3 py-1 text-sm print:hidden" onClick={() => window.print()}>
            Print this page
          </button>
        </>
      )}
    </main>
  );
}
