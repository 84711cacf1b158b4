/**
 * Character helpers of the parser, all on the comment-masked text and bounded by `hi`.
 *
 * Every loop adds the characters it visits to `steps`, which `parse` hands to the work meter
 * (`meter.ts`), so a test can show that parsing costs linear time in the text without timing it.
 */
import type { ExprText, Span } from './ast';
import { isSpace } from './scanner';

const IDENT_START = /[\p{L}_]/u;
/** A character that may continue an identifier. */
export const IDENT_PART = /[\p{L}\p{N}_]/u;

let steps = 0;

/** The characters visited since the last call, and resets the count. */
export function takeSteps(): number {
  const s = steps;
  steps = 0;
  return s;
}


export function isOpenBracket(m: string, p: number, hi: number): boolean {
  return p < hi && m[p] === '[';
}

export function skipSpace(m: string, p: number, hi: number): number {
  const from = p;
  while (p < hi && isSpace(m[p])) p++;
  steps += p - from + 1;
  return p;
}

/** End of the identifier starting at `p` (equal to `p` when there is none). */
export function identEnd(m: string, p: number, hi: number): number {
  const first = charIn(m, p, hi, IDENT_START);
  if (first === 0) return p;
  let e = p + first;
  for (let len = charIn(m, e, hi, IDENT_PART); len > 0; len = charIn(m, e, hi, IDENT_PART)) e += len;
  steps += e - p;
  return e;
}

/** Length (1 or 2 code units) of the code point at `p` when it matches `re`, else 0. */
export function charIn(m: string, p: number, hi: number, re: RegExp): number {
  if (p >= hi) return 0;
  const c = m.codePointAt(p)!;
  // Letters outside the basic plane (such as mathematical italic alpha) take two code units.
  const len = c > 0xffff ? 2 : 1;
  if (p + len > hi) return 0;
  return re.test(len === 1 ? m[p]! : String.fromCodePoint(c)) ? len : 0;
}

/** End of the token at `p`: an identifier, a number-like run, or one code point. */
export function tokenEnd(m: string, p: number, hi: number): number {
  const e = identEnd(m, p, hi);
  if (e > p) return e;
  if (/[0-9.]/.test(m[p]!)) {
    let q = p + 1;
    while (q < hi && /[0-9.eE]/.test(m[q]!)) q++;
    steps += q - p;
    return q;
  }
  const code = m.charCodeAt(p);
  return code >= 0xd800 && code <= 0xdbff && p + 1 < hi ? p + 2 : p + 1;
}

/** The offset just after the last non-space character before `p`. */
export function lastBefore(m: string, p: number): number {
  const from = p;
  while (p > 0 && isSpace(m[p - 1])) p--;
  steps += from - p + 1;
  return p;
}

export function trim(m: string, a: number, b: number): [number, number] {
  const width = b - a;
  while (a < b && isSpace(m[a])) a++;
  while (b > a && isSpace(m[b - 1])) b--;
  steps += width - (b - a) + 1;
  return [a, b];
}

/** The trimmed text of [a, b), or null when it is blank. */
export function exprText(m: string, a: number, b: number): ExprText | null {
  const [s, e] = trim(m, a, b);
  steps += e - s;
  return s < e ? { start: s, end: e, text: m.slice(s, e) } : null;
}

/** A single `=` at `p` (not part of `==`, `<=`, `>=`, `!=`). */
export function isSingleEquals(m: string, p: number): boolean {
  if (m[p] !== '=' || m[p + 1] === '=') return false;
  const prev = m[p - 1];
  return prev !== '=' && prev !== '<' && prev !== '>' && prev !== '!';
}

/**
 * Calls `visit(k)` for every offset k in [lo, hi) that is at top level (outside brackets and
 * double-quoted strings), including the opening brackets themselves; stops when it returns true.
 */
export function scanTop(m: string, lo: number, hi: number, visit: (k: number) => boolean): void {
  let depth = 0;
  steps += hi - lo;
  for (let k = lo; k < hi; k++) {
    const c = m[k];
    if (c === '"') {
      if (depth === 0 && visit(k)) return;
      k++;
      while (k < hi && m[k] !== '"') k += m[k] === '\\' ? 2 : 1;
      continue;
    }
    if (depth === 0 && visit(k)) return;
    if (c === '(' || c === '[' || c === '{') depth++;
    else if ((c === ')' || c === ']' || c === '}') && depth > 0) depth--;
  }
}

/** Pieces of [lo, hi) between top-level separators. */
export function splitTop(m: string, lo: number, hi: number, sep: string): [number, number][] {
  const pieces: [number, number][] = [];
  let start = lo;
  scanTop(m, lo, hi, (k) => {
    if (m[k] === sep) {
      pieces.push([start, k]);
      start = k + 1;
    }
    return false;
  });
  pieces.push([start, hi]);
  return pieces;
}

/** Offset of the bracket closing the one at `open` (any bracket kind closes), or -1. */
export function matchClose(m: string, open: number, hi: number): number {
  let depth = 0;
  for (let k = open; k < hi; k++) {
    steps++;
    const c = m[k];
    if (c === '"') {
      k++;
      while (k < hi && m[k] !== '"') k += m[k] === '\\' ? 2 : 1;
      continue;
    }
    if (c === '(' || c === '[' || c === '{') depth++;
    else if (c === ')' || c === ']' || c === '}') {
      depth--;
      if (depth === 0) return k;
    }
  }
  return -1;
}

/** End of one level of `expect weight`: up to top-level space, `..` or a comparison sign. */
export function levelEnd(m: string, p: number, hi: number): number {
  let end = p;
  let depth = 0;
  for (let k = p; k < hi; k++) {
    steps++;
    const c = m[k]!;
    if (depth === 0) {
      if (isSpace(c) || m.startsWith('..', k) || c === '>' || c === '<' || c === '≥' || c === '≤' || c === '±') break;
      if (c === '+' && m[k + 1] === '-') break;
    }
    if (c === '(' || c === '[' || c === '{') depth++;
    else if ((c === ')' || c === ']' || c === '}') && depth > 0) depth--;
    end = k + 1;
  }
  return end;
}

/** The comma after piece k (or before it, for the last piece): where an empty argument is reported. */
export function commaNear(pieces: readonly [number, number][], k: number, fallback: Span): Span {
  if (k + 1 < pieces.length) return { start: pieces[k]![1], end: pieces[k]![1] + 1 };
  if (k > 0) return { start: pieces[k - 1]![1], end: pieces[k - 1]![1] + 1 };
  return fallback;
}
