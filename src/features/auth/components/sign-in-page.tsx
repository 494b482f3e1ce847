import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { type SignInInput, signInSchema, emailSchema } from '#shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { Notice } from '../../../components/ui/notice';
import { TextField } from '../../../components/ui/text-field';
import { requestSignInLink, SIGN_IN_MESSAGES, signInWithPassword } from '../../../lib/auth-client';
import { refreshMe } from '../../account/api/get-me';

/** Only a path on this site (never `//other.host`), else the overview. */
function nextPath(next: string | null): string {
  return next?.startsWith('/') && !next.startsWith('//') ? next : '/';
}

export function SignInPage() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const queryClient = useQueryClient();
  const [problem, setProblem] = useState<string | null>(() => {
    const code = params.get('code') ?? (params.get('error') ? 'default' : null);
    return code ? (SIGN_IN_MESSAGES[code] ?? SIGN_IN_MESSAGES.default) : null;
  });
  const [linkSent, setLinkSent] = useState(false);
  const form = useForm<SignInInput>({ resolver: zodResolver(signInSchema), mode: 'onTouched' });

  async function onSubmit(values: SignInInput) {
    setProblem(null);
    try {
      await signInWithPassword(values.email, values.password);
      if (!(await refreshMe(queryClient))) {
        setProblem('You were signed in, but this browser did not keep the session. Allow cookies for this site, then try again.');
        return;
      }
      navigate(nextPath(params.get('next')), { replace: true });
    } catch (err) {
      setProblem((err as Error).message);
    }
  }

  async function sendLink() {
    setProblem(null);
    const email = emailSchema.safeParse(form.getValues('email'));
    if (!email.success) {
      form.setError('email', { message: 'Type your e-mail first, then ask for a link.' });
      return;
    }
    try {
      await requestSignInLink(email.data, nextPath(params.get('next')));
      setLinkSent(true);
    } catch (err) {
      setProblem((err as Error).message);
    }
  }

  return (
    <div>
      <h1 className="text-xl font-bold text-deep-900">Sign in</h1>
      <form className="mt-4 flex flex-col gap-4" noValidate onSubmit={form.handleSubmit(onSubmit)}>
        {problem && <Notice tone="problem">{problem}</Notice>}
        {linkSent && <Notice tone="done">If an account uses this e-mail, a sign-in link is on its way. It works for 15 minutes.</Notice>}
        <TextField label="E-mail" type="email" autoComplete="email" {...form.register('email')} error={form.formState.errors.email?.message} />
        <TextField label="Password" type="password" autoComplete="current-password" {...form.register('password')} error={form.formState.errors.password?.message} />
        <Button type="submit" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? 'Signing in…' : 'Sign in'}
        </Button>
        <Button type="button" variant="secondary" onClick={sendLink}>
          E-mail me a sign-in link instead
        </Button>
      </form>
      <div className="mt-6 flex justify-between text-sm">
        <Link className="font-semibold text-deep-700 underline" to="/sign-up">
          New grower? Create an account
        </Link>
        <Link className="font-semibold text-deep-700 underline" to="/reset-password">
          Forgot your password?
        </Link>
      </div>
    </div>
  );
}
