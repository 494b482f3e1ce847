import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { invitationCreateSchema } from '#shared/schemas/auth';
import { ROLES, type Role } from '#shared/schemas/roles';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { PageHeader } from '../../../components/ui/page-header';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { ROLE_LABEL } from '../../../config/navigation';
import { api } from '../../../lib/api-client';
import { adminKeys } from '../api/admin-api';

type InviteForm = z.infer<typeof invitationCreateSchema>;

export function PeoplePage() {
  const queryClient = useQueryClient();
  const people = useQuery(adminKeys.people());
  const jurisdictions = useQuery(adminKeys.jurisdictions());
  const changeRole = useMutation({
    mutationFn: (v: { id: string; role: Role }) => api(`/admin/users/${v.id}`, { method: 'PATCH', json: { role: v.role } }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: adminKeys.people().queryKey }),
  });
  const form = useForm<InviteForm>({ resolver: zodResolver(invitationCreateSchema), mode: 'onTouched', defaultValues: { role: 'adviser' } });
  const invite = useMutation({
    mutationFn: (v: InviteForm) => api('/admin/invitations', { method: 'POST', json: { ...v, jurisdictionId: v.jurisdictionId || undefined } }),
    onSuccess: () => form.reset({ email: '', role: 'adviser' }),
  });

  return (
    <div>
      <PageHeader title="People" question="Who can use Brackline here, and with what role?" />
      <section aria-labelledby="invite-heading" className="mb-8 rounded-lg border border-sand-200 bg-white p-4">
        <h2 id="invite-heading" className="font-semibold text-deep-900">
          Invite someone
        </h2>
        <form className="mt-3 grid gap-3 sm:grid-cols-4 sm:items-end" noValidate onSubmit={form.handleSubmit((v) => invite.mutate(v))}>
          <TextField label="E-mail" type="email" {...form.register('email')} error={form.formState.errors.email?.message} />
          <div className="flex flex-col gap-1">
            <label htmlFor="invite-role" className="text-sm font-semibold">
              Role
            </label>
            <select id="invite-role" className="rounded-md border border-shell-300 bg-white px-3 py-2" {...form.register('role')}>
              {ROLES.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABEL[r]}
                </option>
              ))}
            </select>
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="invite-jurisdiction" className="text-sm font-semibold">
              Jurisdiction
            </label>
            <select id="invite-jurisdiction" className="rounded-md border border-shell-300 bg-white px-3 py-2" {...form.register('jurisdictionId')}>
              <option value="">None</option>
              {jurisdictions.data?.items.map((j) => (
                <option key={j.id} value={j.id}>
                  {j.name}
                </option>
              ))}
            </select>
          </div>
          <Button type="submit" disabled={invite.isPending}>
            Send invitation
          </Button>
        </form>
        <div className="mt-3">
          {invite.isSuccess && <Notice tone="done">Invitation sent. It works for 7 days.</Notice>}
          {invite.isError && <Notice tone="problem">{(invite.error as Error).message}</Notice>}
        </div>
      </section>
      {changeRole.isError && <Notice tone="problem">{(changeRole.error as Error).message}</Notice>}
      {people.isPending ? (
        <Loading what="Loading people…" />
      ) : people.isError ? (
        <LoadError error={people.error} retry={() => people.refetch()} />
      ) : people.data.items.length === 0 ? (
        <Empty title="Nobody yet" />
      ) : (
        <table className="w-full border-collapse bg-white text-sm">
          <caption className="sr-only">People and their roles</caption>
          <thead>
            <tr className="border-b border-sand-200 text-left">
              <th className="p-2">Name</th>
              <th className="p-2">E-mail</th>
              <th className="p-2">Role</th>
              <th className="p-2">Since</th>
            </tr>
          </thead>
          <tbody>
            {people.data.items.map((p) => (
              <tr key={p.id} className="border-b border-shell-100">
                <td className="p-2">{p.name}</td>
                <td className="p-2">{p.email}</td>
                <td className="p-2">
                  <label className="sr-only" htmlFor={`role-${p.id}`}>
                    Role of {p.email}
                  </label>
                  <select
                    id={`role-${p.id}`}
                    value={p.role}
                    onChange={(e) => changeRole.mutate({ id: p.id, role: e.target.value as Role })}
                    className="rounded border border-shell-300 px-2 py-1"
                  >
                    {ROLES.map((r) => (
                      <option key={r} value={r}>
                        {ROLE_LABEL[r]}
                      </option>
                    ))}
                  </select>
                </td>
                <td className="p-2">{new Date(p.createdAt).toLocaleDateString()}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
