import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { adminKeys } from '../api/admin-api';

/** Mail caught by the local SMTP fake: what growers, advisers and regulators would have received. */
export function OutboxPage() {
  const outbox = useQuery({ ...adminKeys.outbox(), refetchInterval: 5_000 });
  const [openId, setOpenId] = useState<string | null>(null);
  const message = useQuery({ ...adminKeys.message(openId ?? ''), enabled: openId !== null });
  return (
    <div>
      <PageHeader title="Outbox" question="What e-mail has Brackline sent? (Local e-mail fake: nothing here left this machine.)" />
      {outbox.isPending ? (
        <Loading what="Loading messages…" />
      ) : outbox.isError ? (
        <LoadError error={outbox.error} retry={() => outbox.refetch()} />
      ) : outbox.data.items.length === 0 ? (
        <Empty title="No e-mail sent yet">Invitations, sign-in links, resets, notices and alerts appear here.</Empty>
      ) : (
        <div className="grid gap-4 lg:grid-cols-2">
          <ul className="divide-y divide-shell-100 rounded-lg border border-sand-200 bg-white" aria-label="Messages">
            {outbox.data.items.map((m) => (
              <li key={m.id}>
                <button
                  type="button"
                  onClick={() => setOpenId(m.id)}
                  aria-pressed={openId === m.id}
                  className={`w-full px-4 py-3 text-left text-sm ${openId === m.id ? 'bg-deep-50' : 'hover:bg-sand-50'}`}
                >
                  <span className="block font-semibold">{m.subject ?? '(no subject)'}</span>
                  <span className="block text-shell-700">
                    to {m.to.join(', ')} · {new Date(m.receivedAt).toLocaleString()}
                  </span>
                </button>
              </li>
            ))}
          </ul>
          <section aria-live="polite" className="rounded-lg border border-sand-200 bg-white p-4 text-sm">
            {!openId ? (
              <p className="text-shell-700">Choose a message to read it.</p>
            ) : message.isPending ? (
              <Loading what="Opening message…" />
            ) : message.isError ? (
              <LoadError error={message.error} />
            ) : (
              <article>
                <h2 className="font-semibold">{message.data.subject}</h2>
                <p className="text-shell-700">
                  From {message.data.from} to {message.data.to.join(', ')}
                </p>
                <pre className="mt-3 whitespace-pre-wrap font-sans">{message.data.text}</pre>
              </article>
            )}
          </section>
        </div>
      )}
    </div>
  );
}
