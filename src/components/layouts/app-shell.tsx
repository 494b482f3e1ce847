import { useQuery, useQueryClient } from '@tanstack/react-query';
import { Link, NavLink, Navigate, Outlet, useLocation } from 'react-router-dom';
import { NAVIGATION, ROLE_LABEL } from '../../config/navigation';
import { useMe } from '../../features/account/api/get-me';
import { signOut } from '../../lib/auth-client';
import { inboxKeys } from '../../lib/inbox-api';
import { LoadError, Loading } from '../ui/states';

export function BrandMark() {
  return (
    <span className="flex items-center gap-2 text-lg font-bold tracking-tight">
      <svg viewBox="0 0 32 32" width="28" height="28" aria-hidden>
        <path d="M2 20c5-6 9-6 14 0s9 6 14 0" stroke="#eadcbf" strokeWidth="3" fill="none" strokeLinecap="round" />
        <path d="M2 12c5-6 9-6 14 0s9 6 14 0" stroke="#7fb5a3" strokeWidth="3" fill="none" strokeLinecap="round" />
      </svg>
      Brackline
    </span>
  );
}

/** The header's way to the inbox, with the unread count read out to screen readers too. */
function InboxLink() {
  const inbox = useQuery(inboxKeys.list());
  const unread = inbox.data?.unread ?? 0;
  return (
    <Link
      to="/inbox"
      className="rounded border border-deep-300 px-3 py-1 hover:bg-deep-700"
      aria-label={unread ? `Inbox, ${unread} unread` : 'Inbox'}
    >
      Inbox
      {unread > 0 && (
        <span className="ml-2 rounded-full bg-sand-100 px-2 py-0.5 text-xs font-bold text-deep-900" aria-hidden>
          {unread}
        </span>
      )}
    </Link>
  );
}

/** The signed-in frame: a top band with the role's pages, the account, and the page below. */
export function AppShell() {
  const me = useMe();
  const location = useLocation();
  const queryClient = useQueryClient();
  if (me.isPending) return <Loading what="Opening Brackline…" />;
  if (me.isError) return <LoadError error={me.error} retry={() => me.refetch()} />;
  if (!me.data) return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname)}`} replace />;
  const user = me.data;

  async function handleSignOut() {
    await signOut();
    queryClient.clear();
    window.location.assign('/sign-in');
  }

  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:bg-white focus:p-2">
        Skip to content
      </a>
      <header className="no-print bg-deep-900 text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center justify-between gap-3 px-4 py-3">
          <BrandMark />
          <div className="flex items-center gap-3 text-sm">
            <span>
              <Link to="/account" className="font-semibold underline" title="Account settings">
                {user.name ?? user.email}
              </Link>
              <span className="ml-2 rounded bg-estuary-700 px-2 py-0.5 text-xs" data-testid="role-badge">
                {ROLE_LABEL[user.role]}
              </span>
            </span>
            <InboxLink />
            <button type="button" onClick={handleSignOut} className="rounded border border-deep-300 px-3 py-1 hover:bg-deep-700">
              Sign out
            </button>
          </div>
        </div>
        <nav aria-label="Main" className="mx-auto max-w-7xl px-4">
          <ul className="flex flex-wrap gap-1">
            {NAVIGATION[user.role].map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  end={item.to === '/'}
                  className={({ isActive }) =>
                    `block rounded-t-md px-4 py-2 text-sm font-semibold ${isActive ? 'bg-sand-50 text-deep-900' : 'text-deep-100 hover:bg-deep-700'}`
                  }
                >
                  {item.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
      </header>
      <main id="main" className="mx-auto max-w-7xl px-4 py-6">
        <Outlet />
      </main>
    </div>
  );
}

/** The frame for pages without an account: sign-in, sign-up, reset, invitation. */
export function PublicShell() {
  return (
    <div className="min-h-screen bg-deep-900 px-4 py-10">
      <div className="mx-auto max-w-md">
        <div className="mb-6 text-white">
          <BrandMark />
          <p className="mt-2 text-sm text-deep-100">
            Where a river's flood water goes along the coast, and what it does to each shellfish lease.
          </p>
        </div>
        <div className="rounded-lg bg-white p-6 shadow-lg">
          <Outlet />
        </div>
      </div>
    </div>
  );
}
