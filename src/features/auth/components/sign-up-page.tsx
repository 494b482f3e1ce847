import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate } from 'react-router-dom';
import { type SignUpInput, signUpSchema } from '#shared/schemas/auth';
import { RegionPicker } from '../../../components/region-picker';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/text-field';
import { api } from '../../../lib/api-client';
import { signInWithPassword } from '../../../lib/auth-client';
import { refreshMe } from '../../account/api/get-me';

export function SignUpPage() {
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const form = useForm<SignUpInput>({ resolver: zodResolver(signUpSchema), mode: 'onTouched' });
  const [regionId, setRegionId] = useState<string | null>(null);
  const signUp = useMutation({
    mutationFn: async (values: SignUpInput) => {
      await api('/account/sign-up', { method: 'POST', json: { ...values, organisationName: values.organisationName || undefined, regionId } });
      await signInWithPassword(values.email, values.password);
    },
    onSuccess: async () => {
      await refreshMe(queryClient);
      navigate('/', { replace: true });
    },
  });
  return (
    <div>
      <h1 className="text-xl font-bold text-deep-900">Create a grower account</h1>
      <p className="mt-1 text-sm text-shell-700">Advisers and regulators join by invitation from an administrator.</p>
      <form className="mt-4 flex flex-col gap-4" noValidate onSubmit={form.handleSubmit((v) => signUp.mutate(v))}>
        {signUp.isError && <Notice tone="problem">{(signUp.error as Error).message}</Notice>}
        <TextField label="Your name" autoComplete="name" {...form.register('name')} error={form.formState.errors.name?.message} />
        <TextField label="Farm or business (optional)" autoComplete="organization" {...form.register('organisationName')} error={form.formState.errors.organisationName?.message} />
        <TextField label="E-mail" type="email" autoComplete="email" {...form.register('email')} error={form.formState.errors.email?.message} />
        <TextField
          label="Password"
          type="password"
          autoComplete="new-password"
          hint="At least 10 characters."
          {...form.register('password')}
          error={form.formState.errors.password?.message}
        />
        <RegionPicker value={regionId} onChange={setRegionId} />
        <Button type="submit" disabled={signUp.isPending}>
          {signUp.isPending ? 'Creating your account…' : 'Create account'}
        </Button>
      </form>
      <Link className="mt-6 inline-block text-sm font-semibold text-deep-700 underline" to="/sign-in">
        Already have an account? Sign in
      </Link>
    </div>
  );
}
