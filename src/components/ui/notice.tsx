import type { ReactNode } from 'react';

type Tone = 'info' | 'problem' | 'done';
const tones: Record<Tone, string> = {
  info: 'border-deep-300 bg-deep-50 text-deep-900',
  problem: 'border-[#c26a3d] bg-[#fbeee6] text-[#5c2509]',
  done: 'border-estuary-300 bg-estuary-50 text-estuary-900',
};

export function Notice({ tone = 'info', title, children }: { tone?: Tone; title?: string; children?: ReactNode }) {
  return (
    <div role={tone === 'problem' ? 'alert' : 'status'} className={`rounded-md border-l-4 px-4 py-3 text-sm ${tones[tone]}`}>
      {title && <p className="font-semibold">{title}</p>}
      {children}
    </div>
  );
}
