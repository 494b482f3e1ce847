import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { InboxMessage } from '#shared/schemas/inbox';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { fmtDateTime } from '../../../lib/format';
import { inboxKeys, useMarkRead } from '../../../lib/inbox-api';

export const KIND_LABEL: Record<InboxMessage['kind'], string> = {
  notice: 'Closure notice',
  alert: 'Flow alert',
  invitation: 'Invitation',
  note: 'Note',
};

function MessageCard({ message }: { message: InboxMessage }) {
  const markRead = useMarkRead();
  const unread = message.readAt === null;
  return (
    <li className={`rounded-lg border bg-white p-4 ${unread ? 'border-deep-500 border-l-4' : 'border-sand-200'}`}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p className="font-semibold text-deep-900">
          <span className="mr-2 rounded bg-sand-100 px-2 py-0.5 text-xs font-semibold text-shell-900">{KIND_LABEL[message.kind]}</span>
          {message.title}
          {unread && <span className="ml-2 text-xs font-semibold text-deep-700">(unread)</span>}
        </p>
        <time className="text-xs text-shell-700" dateTime={message.createdAt}>
          {fmtDateTime(message.createdAt)}
        </time>
      </div>
      <p className="mt-2 whitespace-pre-line text-sm text-shell-900">{message.body}</p>
      <div className="mt-3 flex flex-wrap gap-3 text-sm">
        {message.link && (
          <Link className="font-semibold text-deep-700 underline" to={message.link}>
            Open
          </Link>
        )}
        {unread && (
          <Button variant="secondary" onClick={() => markRead.mutate(message.id)} disabled={markRead.isPending}>
            Mark as read
          </Button>
        )}
      </div>
    </li>
  );
}

export function InboxPage() {
  const inbox = useQuery(inboxKeys.list(200));
  return (
    <div className="space-y-6">
      <PageHeader title="Inbox" question="What has Brackline told me about closures, flows and my leases?" />
      {inbox.isPending ? (
        <Loading what="Loading your messages…" />
      ) : inbox.isError ? (
        <LoadError error={inbox.error} retry={() => inbox.refetch()} />
      ) : inbox.data.items.length === 0 ? (
        <Empty title="No messages yet">Closure notices, flow alerts, invitations and notes on your leases arrive here and by e-mail.</Empty>
      ) : (
        <>
          <p className="text-sm text-shell-700" aria-live="polite">
            {inbox.data.unread === 0 ? 'All read.' : `${inbox.data.unread} unread.`}
          </p>
          <ul className="space-y-3" aria-label="Messages, newest first">
            {inbox.data.items.map((m) => (
              <MessageCard key={m.id} message={m} />
            ))}
          </ul>
        </>
      )}
      <Cautions />
    </div>
  );
}
