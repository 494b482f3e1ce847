import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { type Client, clientInviteSchema } from '#shared/schemas/clients';
import { Button } from '../../../components/ui/button';
import { Cautions } from '../../../components/ui/cautions';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { RatingBadge } from '../../../components/ui/rating-badge';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { speciesName } from '../../../lib/format';
import { cancelInvitation, clientKeys, inviteClient } from '../api/clients-api';

type InviteForm = z.input<typeof clientInviteSchema>;

function InviteGrower() {
  const qc = useQueryClient();
  const form = useForm<InviteForm, unknown, z.output<typeof clientInviteSchema>>({ resolver: zodResolver(clientInviteSchema), defaultValues: { email: '', message: '' } });
  const invite = useMutation({
    mutationFn: inviteClient,
    onSuccess: () => {
      form.reset({ email: '', message: '' });
      void qc.invalidateQueries({ queryKey: clientKeys.clients().queryKey });
    },
  });
  return (
    <form className="space-y-3 rounded-lg border border-sand-200 bg-white p-4" noValidate onSubmit={form.handleSubmit((v) => invite.mutate(v))} aria-label="Invite a grower">
      <h2 className="font-semibold text-deep-900">Invite a grower</h2>
      <p className="text-sm text-shell-700">They get an e-mail; once signed in they choose which leases to share with you, and can stop at any time.</p>
      <TextField label="Grower’s e-mail" type="email" autoComplete="off" {...form.register('email')} error={form.formState.errors.email?.message} />
      <div className="flex flex-col gap-1">
        <label htmlFor="invite-message" className="text-sm font-semibold">
          A short note (optional)
        </label>
        <textarea id="invite-message" rows={3} className="rounded-md border border-shell-300 px-3 py-2" {...form.register('message')} />
        {form.formState.errors.message && <p role="alert" className="text-sm font-semibold text-[#8a3b12]">{form.formState.errors.message.message}</p>}
      </div>
      {invite.isError && <Notice tone="problem" title="Not sent">{invite.error.message}</Notice>}
      {invite.isSuccess && <Notice tone="done">Invitation sent to {invite.data.email}.</Notice>}
      <Button type="submit" disabled={invite.isPending}>
        {invite.isPending ? 'Sending…' : 'Send invitation'}
      </Button>
    </form>
  );
}

function ClientCard({ client }: { client: Client }) {
  const qc = useQueryClient();
  const cancel = useMutation({ mutationFn: () => cancelInvitation(client.invitationId), onSuccess: () => void qc.invalidateQueries({ queryKey: clientKeys.clients().queryKey }) });
  const title = client.grower.name ?? client.grower.email;
  return (
    <li className="rounded-lg border border-sand-200 bg-white p-4" data-testid="client">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-semibold text-deep-900">{title}</h3>
        <span className="text-sm text-shell-700">
          {client.status === 'pending' ? `Invited ${client.invitedAt.slice(0, 10)}, waiting for an answer` : `Client since ${(client.respondedAt ?? client.invitedAt).slice(0, 10)}`}
        </span>
      </div>
      {client.grower.name && <p className="text-sm text-shell-700">{client.grower.email}</p>}
      {client.status === 'pending' ? (
        <Button type="button" variant="quiet" className="mt-2 px-0" onClick={() => cancel.mutate()} disabled={cancel.isPending}>
          Cancel invitation<span className="sr-only"> to {client.grower.email}</span>
        </Button>
      ) : client.leases.length === 0 ? (
        <p className="mt-2 text-sm text-shell-700">No leases shared with you at the moment.</p>
      ) : (
        <table className="mt-3 w-full border-collapse text-sm">
          <caption className="sr-only">Leases {title} shares with you</caption>
          <thead>
            <tr className="border-b border-shell-300 text-left">
              <th scope="col" className="p-2">Lease</th>
              <th scope="col" className="p-2">Species</th>
              <th scope="col" className="p-2">Held or candidate</th>
              <th scope="col" className="p-2">Worst rating</th>
              <th scope="col" className="p-2"><span className="sr-only">Report</span></th>
            </tr>
          </thead>
          <tbody>
            {client.leases.map((l) => (
              <tr key={l.id} className="border-t border-shell-100">
                <th scope="row" className="p-2 text-left font-semibold">{l.leaseId}</th>
                <td className="p-2">{speciesName(l.species)}</td>
                <td className="p-2">{l.status === 'held' ? 'Held' : 'Candidate'}</td>
                <td className="p-2">{l.worstRating ? <RatingBadge rating={l.worstRating} size="sm" /> : 'Not screened yet'}</td>
                <td className="p-2">
                  <Link to={`/leases/${l.id}#notes-title`} className="text-deep-700 underline">
                    Report and notes<span className="sr-only"> for {l.leaseId}</span>
                  </Link>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {cancel.isError && <Notice tone="problem">{cancel.error.message}</Notice>}
    </li>
  );
}

/** The adviser's clients: who accepted, what they share and how it rates; invitations still waiting. */
export function ClientsPage() {
  const q = useQuery(clientKeys.clients());
  return (
    <div className="space-y-6">
      <PageHeader title="Clients" question="Which growers have asked you to advise them, and how do the leases they share with you rate?" />
      <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
        <section aria-label="Your clients" className="space-y-3">
          {q.isPending ? (
            <Loading what="Loading your clients…" />
          ) : q.isError ? (
            <LoadError error={q.error} retry={() => q.refetch()} />
          ) : q.data.items.length === 0 ? (
            <Empty title="No clients yet">Invite a grower by e-mail; their shared leases appear here once they accept.</Empty>
          ) : (
            <ul className="space-y-3">
              {q.data.items.map((c) => (
                <ClientCard key={c.invitationId} client={c} />
              ))}
            </ul>
          )}
          <Cautions compact />
        </section>
        <InviteGrower />
      </div>
    </div>
  );
}
