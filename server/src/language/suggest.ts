/**
 * "Did you mean" suggestions for unknown names.
 *
 * Suggestions run in the quick stage, on every keystroke and outside the time limit, once for every
 * unknown name against every name in scope, so each call is bounded by constants (`SUGGEST_CAPS`):
 * a word longer than `maxWordLength` gets no suggestion, at most `maxCandidates` names are looked at,
 * candidates whose length differs by more than the allowed distance are skipped without work, the
 * distance is computed in a band of that width with an early exit, and a call stops after
 * `maxCellsPerCall` table cells. A file's suggestion work is therefore at most linear in its number of
 * unknown names. Inside a quick-stage context (`meter.ts`) all calls together also share an allowance
 * proportional to the text's length, and the work is counted on the context's meter.
 */
import { countWork, spendSuggestionCells, suggestionCellsLeft } from './meter';

/** The caps of one suggestion search (common practice: typos are short edits of short names). */
export const SUGGEST_CAPS = {
  /** Words (and candidates) longer than this many UTF-16 code units get no suggestion. */
  maxWordLength: 64,
  /** Candidates looked at per call; the rest are ignored (the scope's own names come first). */
  maxCandidates: 1000,
  /** Edit-distance table cells computed per call before the search stops with what it has. */
  maxCellsPerCall: 5000,
} as const;

/**
 * Optimal string alignment distance (Levenshtein with adjacent transpositions), case-sensitive,
 * computed only when it is at most `max`: a larger distance returns `max + 1`. Only the band of cells
 * within `max` of the diagonal is filled (Ukkonen, Inf. Control 64, 100 (1985)), and the search stops
 * as soon as a whole row exceeds `max`. Memory is three rows.
 * Source: Damerau, Comm. ACM 7, 171 (1964); common practice for spelling suggestions.
 */
export function editDistance(a: string, b: string, max = Math.max(a.length, b.length)): number {
  const d = banded(a, b, max);
  countWork(lastCells);
  return d;
}

/** Cells filled by the last call of `banded`. */
let lastCells = 0;

/** The distance of `editDistance`, recording the cells it filled in `lastCells`. */
function banded(a: string, b: string, max: number): number {
  lastCells = 0;
  const n = a.length;
  const m = b.length;
  const big = max + 1;
  if (Math.abs(n - m) > max) return big;
  if (n === 0 || m === 0) return Math.max(n, m);
  let [older, prev, cur] = rows(m + 1, big);
  for (let j = 0; j <= Math.min(m, max); j++) prev[j] = j;
  let cells = 0;
  for (let i = 1; i <= n; i++) {
    const lo = Math.max(1, i - max);
    const hi = Math.min(m, i + max);
    const ai = a.charCodeAt(i - 1);
    const aPrev = i > 1 ? a.charCodeAt(i - 2) : -1;
    cur[lo - 1] = lo === 1 ? i : big;
    if (hi < m) cur[hi + 1] = big;
    let rowMin = cur[lo - 1]!;
    for (let j = lo; j <= hi; j++) {
      const bj = b.charCodeAt(j - 1);
      let v = prev[j - 1]! + (ai === bj ? 0 : 1);
      const del = prev[j]! + 1;
      const ins = cur[j - 1]! + 1;
      if (del < v) v = del;
      if (ins < v) v = ins;
      if (j > 1 && ai === b.charCodeAt(j - 2) && aPrev === bj && older[j - 2]! + 1 < v) v = older[j - 2]! + 1;
      if (v > big) v = big;
      cur[j] = v;
      if (v < rowMin) rowMin = v;
    }
    cells += hi - lo + 1;
    if (rowMin > max) {
      lastCells = cells;
      return big;
    }
    const spare = older;
    older = prev;
    prev = cur;
    cur = spare;
  }
  lastCells = cells;
  return Math.min(prev[m]!, big);
}

let scratch: Int32Array[] = [];

/** Three rows of at least `width` cells filled with `fill`, reused between calls. */
function rows(width: number, fill: number): [Int32Array, Int32Array, Int32Array] {
  if (scratch.length === 0 || scratch[0]!.length < width) scratch = [0, 1, 2].map(() => new Int32Array(Math.max(width, 128)));
  for (const r of scratch) r.fill(fill, 0, width);
  return [scratch[0]!, scratch[1]!, scratch[2]!];
}

/** The largest distance a suggestion for `word` may have. */
function allowedDistance(word: string): number {
  return word.length <= 4 ? 1 : Math.max(1, Math.floor(word.length / 3));
}

/**
 * The closest candidate to `word`, or null when none is close enough (or the caps were reached first).
 * Close enough: a case-insensitive match, or an edit distance of at most 1 for short words and at most
 * a third of the word's length for longer ones. Ties go to the alphabetically first candidate.
 */
export function suggest(word: string, candidates: Iterable<string>): string | null {
  if (word.length === 0 || word.length > SUGGEST_CAPS.maxWordLength) return null;
  const allowed = allowedDistance(word);
  const lower = word.toLowerCase();
  let best: string | null = null;
  let bestScore = allowed + 1;
  let seen = 0;
  let cells = 0;
  const cellCap = Math.min(SUGGEST_CAPS.maxCellsPerCall, suggestionCellsLeft());
  for (const c of candidates) {
    if (++seen > SUGGEST_CAPS.maxCandidates || cells >= cellCap) break;
    // Only a distance that can still win or tie is computed, so the band narrows as the best improves.
    const bound = Math.floor(bestScore);
    if (c === word || Math.abs(c.length - word.length) > bound) continue;
    let score: number;
    if (c.length === word.length && c.toLowerCase() === lower) score = 0.5;
    else {
      score = banded(word, c, bound);
      cells += lastCells + 1;
    }
    if (score < bestScore || (score === bestScore && best !== null && c < best)) {
      best = c;
      bestScore = score;
    }
  }
  countWork(seen + cells);
  spendSuggestionCells(cells);
  return best !== null && bestScore <= allowed ? best : null;
}

/** The suffix " Did you mean 'x'?" or an empty string. */
export function didYouMean(word: string, candidates: Iterable<string>): string {
  const s = suggest(word, candidates);
  return s === null ? '' : ` Did you mean '${s}'?`;
}
