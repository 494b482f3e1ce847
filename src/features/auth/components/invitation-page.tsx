import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link, useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { invitationAcceptSchema } from '#shared/schemas/auth';
import type { Role } from '#shared/schemas/roles';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { LoadError, Loading } from '../../../components/ui/states';
import { TextField } from '../../../components/ui/text-field';
import { ROLE_LABEL } from '../../../config/navigation';
import { api } from '../../../lib/api-client';

export function InvitationPage() {
  const [params] = useSearchParams();
  const token = params.get('token') ?? '';
  const invitation = useQuery({
    queryKey: ['invitation', token],
    queryFn: () => api<{ email: string; role: Role; expiresAt: string }>(`/invitations/${encodeURIComponent(token)}`),
    enabled: token.length > 0,
  });
  const form = useForm<z.infer<typeof invitationAcceptSchema>>({ resolver: zodResolver(invitationAcceptSchema), mode: 'onTouched' });
  const accept = useMutation({
    mutationFn: (v: z.infer<typeof invitationAcceptSchema>) => api(`/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST', json: v }),
  });
  if (!token) return <Notice tone="problem">This page needs the link from your invitation e-mail.</Notice>;
  if (invitation.isPending) return <Loading what="Reading your invitation…" />;
  if (invitation.isError) return <LoadError error={invitation.error} />;
  if (accept.isSuccess) {
    return (
      <div>
        <Notice tone="done">Your account is ready.</Notice>
        <Link className="mt-4 inline-block font-semibold text-deep-700 underline" to="/sign-in">
          Sign in
        </Link>
      </div>
    );
  }
  return (
    <div>
      <h1 className="text-xl font-bold text-deep-900">Join Brackline</h1>
      <p className="mt-1 text-sm">
        Invitation for <strong>{invitation.data.email}</strong> as <strong>{ROLE_LABEL[invitation.data.role]}</strong>.
      </p>
      <form className="mt-4 flex flex-col gap-4" noValidate onSubmit={form.handleSubmit((v) => accept.mutate(v))}>
        {accept.isError && <Notice tone="problem">{(accept.error as Error).message}</Notice>}
        <TextField label="Your name" {...form.register('name')} error={form.formState.errors.name?.message} />
        <TextField label="Password" type="password" autoComplete="new-password" hint="At least 10 characters." {...form.register('password')} error={form.formState.errors.password?.message} />
        <Button type="submit" disabled={accept.isPending}>
          Create my account
        </Button>
      </form>
    </div>
  );
}
