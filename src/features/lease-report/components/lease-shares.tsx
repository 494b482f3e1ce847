import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { LoadError, Loading } from '../../../components/ui/states';
import { ROLE_LABEL } from '../../../config/navigation';
import { fmtDateTime } from '../../../lib/format';
import { leaseShareKeys, revokeLeaseShare } from '../api/lease-notes-api';

/** For the lease's holder: the advisers and regulators who can see it, each with a way to stop sharing. */
export function LeaseShares({ leaseId, leaseCode }: { leaseId: string; leaseCode: string }) {
  const queryClient = useQueryClient();
  const shares = useQuery(leaseShareKeys.list(leaseId));
  const revoke = useMutation({
    mutationFn: (userId: string) => revokeLeaseShare(leaseId, userId),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: leaseShareKeys.list(leaseId).queryKey }),
  });
  return (
    <section aria-labelledby="shares-title" className="no-print space-y-2">
      <h2 id="shares-title" className="font-semibold text-deep-900">
        Who else can see {leaseCode}
      </h2>
      {shares.isPending ? (
        <Loading what="Loading whom this lease is shared with…" />
      ) : shares.isError ? (
        <LoadError error={shares.error} retry={() => shares.refetch()} />
      ) : shares.data.items.length === 0 ? (
        <p className="text-sm text-shell-700">
          Nobody: only you. Share it with your adviser from the Leases page (tick it, then give their e-mail under “Share with an adviser”).
        </p>
      ) : (
        <ul className="space-y-2" aria-label={`People who can see ${leaseCode}`}>
          {shares.data.items.map((s) => (
            <li
              key={s.userId}
              className="flex flex-wrap items-center justify-between gap-2 rounded-md border border-sand-200 bg-white p-2 text-sm"
            >
              <span>
                <span className="font-semibold">{s.name ?? s.email}</span> ({ROLE_LABEL[s.role]}, {s.email}) · since{' '}
                {fmtDateTime(s.grantedAt)}
              </span>
              <Button
                variant="secondary"
                onClick={() => revoke.mutate(s.userId)}
                disabled={revoke.isPending}
                aria-label={`Stop sharing ${leaseCode} with ${s.name ?? s.email}`}
              >
                Stop sharing
              </Button>
            </li>
          ))}
        </ul>
      )}
      {revoke.isError && <Notice tone="problem">{(revoke.error as Error).message}</Notice>}
    </section>
  );
}
