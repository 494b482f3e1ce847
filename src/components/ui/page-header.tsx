import type { ReactNode } from 'react';

/** Each page opens with its question, so the reader knows what it answers. */
export function PageHeader({ title, question, actions }: { title: string; question?: string; actions?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4 border-b border-sand-200 pb-4">
      <div>
        <h1 className="text-2xl font-bold text-deep-900">{title}</h1>
        {question && <p className="mt-1 text-shell-700">{question}</p>}
      </div>
      {actions && <div className="flex gap-2">{actions}</div>}
    </header>
  );
}
