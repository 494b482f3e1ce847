/**
 * Ratings in four plain steps, on one colour-blind-safe sequential scale (light sand to deep
 * plum: lightness rises step by step, so it reads in greyscale and for every common colour
 * vision deficiency) and always with two more cues: the word, and a gauge of one to four
 * filled bars. Never colour alone, never "safe".
 */
export type Rating = 'low' | 'moderate' | 'high' | 'severe';

export const RATINGS: readonly Rating[] = ['low', 'moderate', 'high', 'severe'];

export const RATING_LABEL: Record<Rating, string> = { low: 'Low', moderate: 'Moderate', high: 'High', severe: 'Severe' };

/** Fill (background), ink (text on it) and edge of each step. */
export const RATING_COLOURS: Record<Rating, { fill: string; ink: string; edge: string }> = {
  low: { fill: '#f2e8c4', ink: '#3d3413', edge: '#9c8a4a' },
  moderate: { fill: '#e4a75a', ink: '#2b1a05', edge: '#9a6420' },
  high: { fill: '#b5532f', ink: '#ffffff', edge: '#6e2c12' },
  severe: { fill: '#4f1a3f', ink: '#ffffff', edge: '#24071c' },
};

export function ratingRank(rating: string | null | undefined): number {
  return RATINGS.indexOf(rating as Rating);
}

export function worstRating(ratings: (string | null | undefined)[]): Rating | null {
  let worst = -1;
  for (const r of ratings) worst = Math.max(worst, ratingRank(r));
  return worst >= 0 ? RATINGS[worst] : null;
}

/** One to four bars, filled up to the rating's step: a shape cue that survives print and greyscale. */
export function RatingGauge({ rating, size = 14 }: { rating: Rating; size?: number }) {
  const level = ratingRank(rating) + 1;
  return (
    <svg width={size} height={size} viewBox="0 0 16 16" aria-hidden className="shrink-0">
      {[0, 1, 2, 3].map((i) => (
        <rect
          key={i}
          x={1 + i * 3.75}
          y={12 - i * 3.2}
          width={2.6}
          height={3 + i * 3.2}
          rx={0.6}
          fill={i < level ? 'currentColor' : 'none'}
          stroke="currentColor"
          strokeWidth={0.9}
        />
      ))}
    </svg>
  );
}

export function RatingBadge({ rating, size = 'md' }: { rating: Rating | string | null | undefined; size?: 'sm' | 'md' | 'lg' }) {
  if (!rating || ratingRank(rating) < 0) {
    return <span className="text-shell-700">Not screened</span>;
  }
  const r = rating as Rating;
  const c = RATING_COLOURS[r];
  const pad = size === 'lg' ? 'px-3 py-1 text-base' : size === 'sm' ? 'px-1.5 py-0 text-xs' : 'px-2 py-0.5 text-sm';
  return (
    <span
      data-rating={r}
      className={`inline-flex items-center gap-1.5 rounded-full border font-semibold whitespace-nowrap print:!bg-white print:!text-black ${pad}`}
      style={{ background: c.fill, color: c.ink, borderColor: c.edge }}
    >
      <RatingGauge rating={r} size={size === 'lg' ? 18 : 14} />
      {RATING_LABEL[r]}
    </span>
  );
}

/** The legend of the scale, for maps and printed reports. */
export function RatingLegend() {
  return (
    <ul className="flex flex-wrap items-center gap-2 text-xs" aria-label="Rating scale">
      {RATINGS.map((r) => (
        <li key={r}>
          <RatingBadge rating={r} size="sm" />
        </li>
      ))}
    </ul>
  );
}
