import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { Link, useSearchParams } from 'react-router-dom';
import { z } from 'zod';
import { passwordResetRequestSchema, passwordSchema } from '#shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/text-field';
import { api } from '../../../lib/api-client';

const newPasswordForm = z
  .object({ password: passwordSchema, repeat: z.string() })
  .refine((v) => v.password === v.repeat, { path: ['repeat'], message: 'The two passwords differ; type the same one twice.' });

/** Without a token: ask for a link. With ?token=…: choose the new password. */
export function ResetPasswordPage() {
  const [params] = useSearchParams();
  const token = params.get('token');
  return token ? <ChooseNewPassword token={token} /> : <AskForLink />;
}

function AskForLink() {
  const form = useForm<{ email: string }>({ resolver: zodResolver(passwordResetRequestSchema), mode: 'onTouched' });
  const request = useMutation({ mutationFn: (v: { email: string }) => api<{ message: string }>('/account/password-reset', { method: 'POST', json: v }) });
  return (
    <div>
      <h1 className="text-xl font-bold text-deep-900">Reset your password</h1>
      <form className="mt-4 flex flex-col gap-4" noValidate onSubmit={form.handleSubmit((v) => request.mutate(v))}>
        {request.isSuccess && <Notice tone="done">{request.data.message}</Notice>}
        {request.isError && <Notice tone="problem">{(request.error as Error).message}</Notice>}
        <TextField label="E-mail" type="email" autoComplete="email" {...form.register('email')} error={form.formState.errors.email?.message} />
        <Button type="submit" disabled={request.isPending}>
          E-mail me a reset link
        </Button>
      </form>
      <Link className="mt-6 inline-block text-sm font-semibold text-deep-700 underline" to="/sign-in">
        Back to sign-in
      </Link>
    </div>
  );
}

function ChooseNewPassword({ token }: { token: string }) {
  const form = useForm<z.infer<typeof newPasswordForm>>({ resolver: zodResolver(newPasswordForm), mode: 'onTouched' });
  const confirm = useMutation({
    mutationFn: (v: { password: string }) => api<{ message: string }>('/account/password-reset/confirm', { method: 'POST', json: { token, password: v.password } }),
  });
  if (confirm.isSuccess) {
    return (
      <div>
        <Notice tone="done">{confirm.data.message}</Notice>
        <Link className="mt-4 inline-block font-semibold text-deep-700 underline" to="/sign-in">
          Sign in
        </Link>
      </div>
    );
  }
  return (
    <div>
      <h1 className="text-xl font-bold text-deep-900">Choose a new password</h1>
      <form className="mt-4 flex flex-col gap-4" noValidate onSubmit={form.handleSubmit((v) => confirm.mutate(v))}>
        {confirm.isError && <Notice tone="problem">{(confirm.error as Error).message}</Notice>}
        <TextField label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." {...form.register('password')} error={form.formState.errors.password?.message} />
        <TextField label="Type it again" type="password" autoComplete="new-password" {...form.register('repeat')} error={form.formState.errors.repeat?.message} />
        <Button type="submit" disabled={confirm.isPending}>
          Save the new password
        </Button>
      </form>
    </div>
  );
}
