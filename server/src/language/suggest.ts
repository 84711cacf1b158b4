/**
 * "Did you mean" suggestions for unknown names.
 */

/**
 * Optimal string alignment distance (Levenshtein with adjacent transpositions), case-sensitive.
 * Source: Damerau, Comm. ACM 7, 171 (1964); common practice for spelling suggestions.
 */
export function editDistance(a: string, b: string): number {
  const n = a.length;
  const m = b.length;
  if (n === 0) return m;
  if (m === 0) return n;
  const d: number[][] = [];
  for (let i = 0; i <= n; i++) {
    d.push(new Array<number>(m + 1).fill(0));
    d[i]![0] = i;
  }
  for (let j = 0; j <= m; j++) d[0]![j] = j;
  for (let i = 1; i <= n; i++) {
    for (let j = 1; j <= m; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[n]![m]!;
}

/**
 * The closest candidate to `word`, or null when none is close enough.
 * Close enough: a case-insensitive match, or an edit distance of at most 1 for short words and at most
 * a third of the word's length for longer ones.
 */
export function suggest(word: string, candidates: Iterable<string>): string | null {
  let best: string | null = null;
  let bestScore = Infinity;
  const lower = word.toLowerCase();
  for (const c of candidates) {
    if (c === word) continue;
    const score = c.toLowerCase() === lower ? 0.5 : editDistance(word, c);
    if (score < bestScore || (score === bestScore && best !== null && c < best)) {
      best = c;
      bestScore = score;
    }
  }
  const allowed = word.length <= 4 ? 1 : Math.max(1, Math.floor(word.length / 3));
  return best !== null && bestScore <= allowed ? best : null;
}

/** The suffix " Did you mean 'x'?" or an empty string. */
export function didYouMean(word: string, candidates: Iterable<string>): string {
  const s = suggest(word, candidates);
  return s === null ? '' : ` Did you mean '${s}'?`;
}
