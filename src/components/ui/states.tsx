import type { ReactNode } from 'react';
import { Notice } from './notice';

export function Loading({ what }: { what: string }) {
  return (
    <p role="status" aria-live="polite" className="flex items-center gap-2 py-6 text-sm text-shell-700">
      <span className="inline-block h-3 w-3 animate-pulse rounded-full bg-deep-500" aria-hidden />
      {what}
    </p>
  );
}

export function LoadError({ error, retry }: { error: unknown; retry?: () => void }) {
  return (
    <Notice tone="problem" title="This could not be loaded">
      <p>{error instanceof Error ? error.message : 'Unknown error.'}</p>
      {retry && (
        <button type="button" className="mt-2 font-semibold underline" onClick={retry}>
          Try again
        </button>
      )}
    </Notice>
  );
}

export function Empty({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-shell-300 bg-white px-6 py-8 text-center">
      <p className="font-semibold text-shell-900">{title}</p>
      {children && <div className="mt-2 text-sm text-shell-700">{children}</div>}
    </div>
  );
}
