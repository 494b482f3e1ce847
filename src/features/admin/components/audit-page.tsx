import { useQuery } from '@tanstack/react-query';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { adminKeys } from '../api/admin-api';

export function AuditPage() {
  const audit = useQuery(adminKeys.audit());
  return (
    <div>
      <PageHeader title="Audit log" question="Who changed what, and when? Entries can be added, never edited or removed." />
      {audit.isPending ? (
        <Loading what="Loading the audit log…" />
      ) : audit.isError ? (
        <LoadError error={audit.error} retry={() => audit.refetch()} />
      ) : audit.data.items.length === 0 ? (
        <Empty title="No entries yet" />
      ) : (
        <table className="w-full border-collapse bg-white text-sm">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">When</th>
              <th className="p-2">What</th>
              <th className="p-2">Subject</th>
              <th className="p-2">Before → after</th>
            </tr>
          </thead>
          <tbody>
            {audit.data.items.map((a) => (
              <tr key={a.id} className="border-b border-shell-100 align-top">
                <td className="p-2 whitespace-nowrap">{new Date(a.at).toLocaleString()}</td>
                <td className="p-2">{a.action}</td>
                <td className="p-2">
                  {a.subjectType} {a.subjectId?.slice(0, 8)}
                </td>
                <td className="p-2 font-mono text-xs">
                  {a.before ? JSON.stringify(a.before) : '—'} → {a.after ? JSON.stringify(a.after) : '—'}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
