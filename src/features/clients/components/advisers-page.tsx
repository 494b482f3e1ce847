import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { AdviserLink } from '#shared/schemas/clients';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { speciesName } from '../../../lib/format';
import { useMe } from '../../account/api/get-me';
import { acceptInvitation, clientKeys, declineInvitation, endAdviser, type OwnLease, setAdviserLeases } from '../api/clients-api';

function LeaseChoice({ leases, chosen, onChange, name }: { leases: OwnLease[]; chosen: Set<string>; onChange: (next: Set<string>) => void; name: string }) {
  if (!leases.length) return <p className="text-sm text-shell-700">You have no leases yet. Upload lease boundaries first; you can share them later.</p>;
  return (
    <fieldset className="space-y-1">
      <legend className="text-sm font-semibold">Leases to share with {name}</legend>
      <ul className="grid gap-1 sm:grid-cols-2">
        {leases.map((l) => (
          <li key={l.id}>
            <label className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={chosen.has(l.id)}
                onChange={(e) => {
                  const next = new Set(chosen);
                  if (e.target.checked) next.add(l.id);
                  else next.delete(l.id);
                  onChange(next);
                }}
              />
              <span>
                <strong>{l.leaseId}</strong> · {speciesName(l.species)} · {l.status === 'held' ? 'held' : 'candidate'}
              </span>
            </label>
          </li>
        ))}
      </ul>
    </fieldset>
  );
}

function AdviserCard({ link, leases }: { link: AdviserLink; leases: OwnLease[] }) {
  const qc = useQueryClient();
  const [chosen, setChosen] = useState<Set<string>>(new Set(link.leaseIds));
  const [confirmEnd, setConfirmEnd] = useState(false);
  const refresh = () => qc.invalidateQueries({ queryKey: clientKeys.all });
  const accept = useMutation({ mutationFn: () => acceptInvitation(link.invitationId, [...chosen]), onSuccess: refresh });
  const decline = useMutation({ mutationFn: () => declineInvitation(link.invitationId), onSuccess: refresh });
  const save = useMutation({ mutationFn: () => setAdviserLeases(link.invitationId, [...chosen]), onSuccess: refresh });
  const end = useMutation({ mutationFn: () => endAdviser(link.invitationId), onSuccess: refresh });
  const name = link.adviser.name ?? link.adviser.email;
  const changed = chosen.size !== link.leaseIds.length || link.leaseIds.some((id) => !chosen.has(id));
  const failure = accept.error ?? decline.error ?? save.error ?? end.error;
  return (
    <li className="space-y-3 rounded-lg border border-sand-200 bg-white p-4" data-testid="adviser">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 className="font-semibold text-deep-900">{name}</h3>
        <span className="text-sm text-shell-700">
          {link.status === 'pending' ? `Invited you on ${link.invitedAt.slice(0, 10)}` : `Advising you since ${(link.respondedAt ?? link.invitedAt).slice(0, 10)} · sees ${link.leaseIds.length} of your leases`}
        </span>
      </div>
      {link.message && <blockquote className="border-l-4 border-sand-400 pl-3 text-sm italic">{link.message}</blockquote>}
      <LeaseChoice leases={leases} chosen={chosen} onChange={setChosen} name={name} />
      {failure && <Notice tone="problem">{failure.message}</Notice>}
      {link.status === 'pending' ? (
        <div className="flex flex-wrap gap-2">
          <Button type="button" onClick={() => accept.mutate()} disabled={accept.isPending}>
            Accept and share {chosen.size} lease{chosen.size === 1 ? '' : 's'}
          </Button>
          <Button type="button" variant="secondary" onClick={() => decline.mutate()} disabled={decline.isPending}>
            Decline
          </Button>
        </div>
      ) : (
        <div className="flex flex-wrap items-center gap-2">
          <Button type="button" onClick={() => save.mutate()} disabled={!changed || save.isPending}>
            Save which leases {name} sees
          </Button>
          {confirmEnd ? (
            <>
              <span className="text-sm">Stop sharing every lease with {name}?</span>
              <Button type="button" variant="secondary" onClick={() => end.mutate()} disabled={end.isPending}>
                Yes, stop working with {name}
              </Button>
              <Button type="button" variant="quiet" onClick={() => setConfirmEnd(false)}>
                Keep
              </Button>
            </>
          ) : (
            <Button type="button" variant="secondary" onClick={() => setConfirmEnd(true)}>
              Stop working with this adviser
            </Button>
          )}
          {save.isSuccess && !changed && <span className="text-sm text-estuary-900">Saved.</span>}
        </div>
      )}
    </li>
  );
}

/** The grower's advisers: invitations to answer, and for each adviser the leases they may see (changeable, revocable). */
export function AdvisersPage() {
  const me = useMe();
  const links = useQuery(clientKeys.advisers());
  const leases = useQuery(clientKeys.ownLeases());
  const own = (leases.data?.items ?? []).filter((l) => l.ownerId === me.data?.id);
  return (
    <div className="space-y-6">
      <PageHeader title="Advisers" question="Who advises you, and which of your leases can each of them see?" />
      {links.isPending || leases.isPending ? (
        <Loading what="Loading your advisers…" />
      ) : links.isError ? (
        <LoadError error={links.error} retry={() => links.refetch()} />
      ) : leases.isError ? (
        <LoadError error={leases.error} retry={() => leases.refetch()} />
      ) : links.data.items.length === 0 ? (
        <Empty title="No advisers">When an adviser invites you by e-mail, the invitation appears here for you to accept or decline.</Empty>
      ) : (
        <ul className="space-y-4">
          {links.data.items.map((l) => (
            <AdviserCard key={`${l.invitationId}-${l.status}-${l.leaseIds.join()}`} link={l} leases={own} />
          ))}
        </ul>
      )}
      <p className="text-sm text-shell-700">An adviser sees only the leases you tick, with their ratings and reports, and can write notes on them that you read on the lease’s page.</p>
    </div>
  );
}
