import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { zoneKeys } from '../api/zones-api';
import { fmtWhen } from './zone-status';

const SUBJECTS = [
  { value: '', label: 'Everything' },
  { value: 'zone', label: 'Zones, triggers and statuses' },
  { value: 'notice', label: 'Notices' },
  { value: 'user', label: 'Accounts and roles' },
  { value: 'lease', label: 'Leases' },
  { value: 'river', label: 'Rivers' },
];

function show(v: unknown): string {
  if (v == null) return '—';
  return Object.entries(v as Record<string, unknown>)
    .map(([k, x]) => `${k}: ${typeof x === 'object' && x !== null ? JSON.stringify(x) : String(x)}`)
    .join('; ');
}

/** The jurisdiction's audit log for a regulator: who changed what, when, before and after. */
export function AuditLogPage() {
  const [subject, setSubject] = useState('');
  const audit = useQuery(zoneKeys.audit(subject || undefined));
  return (
    <div className="space-y-4">
      <PageHeader
        title="Audit log"
        question="Who changed which zone, trigger, notice or role, and when? Entries can be added, never edited or removed."
      />
      <div className="flex flex-col gap-1">
        <label htmlFor="audit-subject" className="text-sm font-semibold">
          Show
        </label>
        <select
          id="audit-subject"
          className="max-w-80 rounded-md border border-shell-300 bg-white px-3 py-2"
          value={subject}
          onChange={(e) => setSubject(e.target.value)}
        >
          {SUBJECTS.map((s) => (
            <option key={s.value} value={s.value}>
              {s.label}
            </option>
          ))}
        </select>
      </div>
      {audit.isPending ? (
        <Loading what="Loading the audit log…" />
      ) : audit.isError ? (
        <LoadError error={audit.error} retry={() => audit.refetch()} />
      ) : audit.data.items.length === 0 ? (
        <Empty title="No entries yet" />
      ) : (
        <table aria-label="Audit log" className="w-full border-collapse bg-white text-sm">
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">When</th>
              <th className="p-2">Who</th>
              <th className="p-2">What</th>
              <th className="p-2">Before</th>
              <th className="p-2">After</th>
            </tr>
          </thead>
          <tbody>
            {audit.data.items.map((a) => (
              <tr key={a.id} className="border-b border-shell-100 align-top">
                <td className="p-2 whitespace-nowrap">{fmtWhen(a.at)}</td>
                <td className="p-2">{a.actorName ?? a.actorEmail ?? 'System'}</td>
                <td className="p-2">
                  <span className="font-mono text-xs">{a.action}</span>
                  <span className="block text-xs text-shell-700">
                    {a.subjectName ?? `${a.subjectType} ${a.subjectId?.slice(0, 8) ?? ''}`}
                  </span>
                </td>
                <td className="max-w-xs p-2 text-xs break-words">{show(a.before)}</td>
                <td className="max-w-md p-2 text-xs break-words">{show(a.after)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {audit.data && audit.data.total > audit.data.items.length && (
        <p className="text-sm text-shell-700">
          Showing the newest {audit.data.items.length} of {audit.data.total} entries.
        </p>
      )}
    </div>
  );
}
