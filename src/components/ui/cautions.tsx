import { CAUTION_TEXT } from '#shared/cautions';

export { CAUTION_TEXT };

export function Cautions({ compact = false }: { compact?: boolean }) {
  return (
    <aside aria-label="Cautions" className="rounded-md border border-sand-400 bg-sand-100 px-4 py-3 text-sm text-shell-900 print:border-black">
      <p className="font-semibold">Read before you rely on these results</p>
      {compact ? (
        <p className="mt-1">{CAUTION_TEXT[0]} {CAUTION_TEXT[2]}</p>
      ) : (
        <ul className="mt-1 list-disc space-y-1 pl-5">
          {CAUTION_TEXT.map((line) => (
            <li key={line}>{line}</li>
          ))}
        </ul>
      )}
    </aside>
  );
}
