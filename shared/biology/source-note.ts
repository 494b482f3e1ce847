/**
 * @module shared/biology/source-note
 * The provenance of a tabulated value, using the labels of science.md ("How values are
 * labelled"): (a) published and seen, (b) published but recalled from memory, (c) common
 * practice or derived here.
 */

/** science.md provenance label. */
export type SourceLabel = 'a' | 'b' | 'c';

/**
 * Where a tabulated number comes from.
 *
 * @example
 * const note: SourceNote = { label: 'a', citation: 'Riisgård et al. 2013, Helgol. Mar. Res. 67' };
 */
export interface SourceNote {
  /** science.md label: 'a' published, 'b' from memory, 'c' common practice / derived. */
  readonly label: SourceLabel;
  /** The citation as science.md gives it. */
  readonly citation: string;
  /** What the cited source supports, when the note backs only part of a row. */
  readonly about?: string;
}

/**
 * Formats a note as "(a) published: <citation>", "(b) from memory: <citation>" or
 * "(c) common practice / derived: <citation>", the wording the JSDoc of the engine uses.
 *
 * @param note - the source note
 * @returns one line of text
 * @example
 * formatSourceNote({ label: 'c', citation: 'science.md §4.5' });
 * // => '(c) common practice / derived: science.md §4.5'
 */
export function formatSourceNote(note: SourceNote): string {
  const prefix = note.label === 'a' ? '(a) published' : note.label === 'b' ? '(b) from memory' : '(c) common practice / derived';
  return `${prefix}: ${note.citation}`;
}
