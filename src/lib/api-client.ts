/**
 * The one way the client calls the API. Errors come back as ApiError with the server's
 * message; a 401 sends the user to sign-in (except on the pages that are sign-in itself).
 */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details?: unknown;
  constructor(status: number, code: string, message: string, details?: unknown) {
    super(message);
    this.status = status;
    this.code = code;
    this.details = details;
  }
}

const PUBLIC_PATHS = ['/sign-in', '/sign-up', '/reset-password', '/invitation', '/status'];

function goToSignIn() {
  const here = window.location.pathname;
  if (PUBLIC_PATHS.some((p) => here.startsWith(p))) return;
  window.location.assign(`/sign-in?next=${encodeURIComponent(here + window.location.search)}`);
}

export async function api<T>(path: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, headers, ...rest } = init;
  const response = await fetch(`/api/v1${path}`, {
    credentials: 'same-origin',
    ...rest,
    headers: { Accept: 'application/json', ...(json !== undefined ? { 'Content-Type': 'application/json' } : {}), ...headers },
    ...(json !== undefined ? { body: JSON.stringify(json) } : {}),
  });
  if (response.status === 204) return undefined as T;
  const body = await response.json().catch(() => null);
  if (!response.ok) {
    if (response.status === 401) goToSignIn();
    const error = body?.error;
    throw new ApiError(response.status, error?.code ?? 'http_error', error?.message ?? `The server answered ${response.status}.`, error?.details);
  }
  return body as T;
}
