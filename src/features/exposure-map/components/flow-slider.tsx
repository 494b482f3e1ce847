import { useId, useState } from 'react';
import { fmtFlow } from '../../../lib/format';

const STEPS = 1000;

/** Rounds a flow to three significant figures, so slider flows make reusable footprints. */
function tidy(q: number): number {
  const p = 10 ** (Math.floor(Math.log10(q)) - 2);
  return Math.round(q / p) * p;
}

/**
 * A flow slider on a log scale between the smallest and largest scenario flows. It reports a
 * flow only on release (pointer up, key up), so dragging does not fetch a footprint per pixel.
 */
export function FlowSlider({ min, max, value, onCommit }: { min: number; max: number; value: number; onCommit: (flow: number) => void }) {
  const id = useId();
  const [draft, setDraft] = useState<number | null>(null);
  const lo = Math.log(min);
  const hi = Math.log(Math.max(max, min * 1.01));
  const toFlow = (pos: number) => tidy(Math.exp(lo + (pos / STEPS) * (hi - lo)));
  const toPos = (q: number) => Math.round(((Math.log(Math.min(Math.max(q, min), max)) - lo) / (hi - lo)) * STEPS);
  const pos = draft ?? toPos(value);
  const shown = draft === null ? value : toFlow(draft);
  const commit = () => {
    if (draft === null) return;
    const flow = toFlow(draft);
    setDraft(null);
    if (flow !== value) onCommit(flow);
  };
  return (
    <div className="flex min-w-64 flex-1 flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold">
        River flow: <output data-testid="flow-value">{fmtFlow(shown)}</output>
      </label>
      <input
        id={id}
        type="range"
        min={0}
        max={STEPS}
        step={1}
        value={pos}
        aria-valuetext={fmtFlow(shown)}
        onChange={(e) => setDraft(Number(e.target.value))}
        onPointerUp={commit}
        onKeyUp={commit}
        onBlur={commit}
        className="w-full accent-deep-700"
      />
      <div className="flex justify-between text-xs text-shell-700">
        <span>{fmtFlow(min)}</span>
        <span>log scale</span>
        <span>{fmtFlow(max)}</span>
      </div>
    </div>
  );
}
