/**
 * Talks to Auth.js at /auth. With the X-Auth-Return-Redirect header Auth.js answers JSON
 * `{ url }` instead of redirecting; an `error`/`code` in that URL says why sign-in failed.
 */
async function csrfToken(): Promise<string> {
  const res = await fetch('/auth/csrf', { credentials: 'same-origin' });
  const body = (await res.json()) as { csrfToken: string };
  return body.csrfToken;
}

async function postForm(path: string, fields: Record<string, string>): Promise<{ url: string; status: number }> {
  const body = new URLSearchParams({ ...fields, csrfToken: await csrfToken() });
  const res = await fetch(path, {
    method: 'POST',
    credentials: 'same-origin',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', 'X-Auth-Return-Redirect': '1' },
    body,
  });
  if (res.status === 429 || res.status === 503) {
    const json = await res.json().catch(() => null);
    throw new Error(json?.error?.message ?? 'Too many attempts. Wait a few minutes, then try again.');
  }
  const json = (await res.json().catch(() => ({ url: '' }))) as { url: string };
  return { url: json.url, status: res.status };
}

export const SIGN_IN_MESSAGES: Record<string, string> = {
  credentials: 'That e-mail and password do not match an account. Check both, or reset your password.',
  too_many_attempts: 'Too many sign-in attempts for this e-mail. Wait 15 minutes, or reset your password.',
  default: 'Sign-in did not work. Try again.',
};

export async function signInWithPassword(email: string, password: string): Promise<void> {
  const { url } = await postForm('/auth/callback/credentials', { email, password });
  const parsed = new URL(url, window.location.origin);
  const error = parsed.searchParams.get('error');
  if (error) {
    const code = parsed.searchParams.get('code') ?? 'default';
    throw new Error(SIGN_IN_MESSAGES[code] ?? SIGN_IN_MESSAGES.default);
  }
}

/** `callbackUrl` is where the link lands after signing in (the deep link the visitor started from). */
export async function requestSignInLink(email: string, callbackUrl = '/'): Promise<void> {
  const { url } = await postForm('/auth/signin/nodemailer', { email, callbackUrl });
  const parsed = new URL(url, window.location.origin);
  if (parsed.searchParams.get('error')) throw new Error('The sign-in link could not be sent. Check the address and try again.');
}

export async function signOut(): Promise<void> {
  await postForm('/auth/signout', {});
}
