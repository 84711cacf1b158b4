/**
 * The scanner: splits `.qstate` text into logical statements.
 *
 * Rules (see the grammar in `parser.ts`):
 * - Lines end at `\n`, `\r\n` or a lone `\r`.
 * - `#` starts a comment that runs to the end of its line.
 * - A line that is blank once its comment is removed is ignored.
 * - A line that starts with white space continues the statement above it (across ignored lines).
 * - A byte order mark at the start of the text is skipped.
 *
 * Everything is measured in document offsets (UTF-16 code units, as JavaScript strings index them),
 * so every range the parser reports can be shown by an editor without conversion tables.
 * The scanner never throws and runs in one pass over the text.
 */
import type { Span } from './ast';
import { countWork } from './meter';

/** One logical statement: the first line's code plus its continuation lines. */
export interface ScannedStatement {
  /** Offset of the first non-blank character of the statement. */
  start: number;
  /** Offset just after the last non-blank code character (comments excluded). */
  end: number;
  /** 0-based line of `start`. */
  line: number;
  /** True when the first line itself was indented (a continuation with nothing to continue). */
  indented: boolean;
}

/** What `scan` returns. */
export interface ScanResult {
  /**
   * The text with every comment (from `#` to the end of its line) replaced by spaces of the same
   * length, so offsets are unchanged and slices of it can be handed to the expression layer.
   */
  masked: string;
  statements: ScannedStatement[];
  /** Every comment, `#` included, without its line break. */
  comments: Span[];
}

/** White space inside a line: space, tab, form feed, vertical tab, no-break space, BOM. */
export function isInlineSpace(c: string | undefined): boolean {
  return c === ' ' || c === '\t' || c === '\f' || c === '\v' || c === '\u00a0' || c === '\ufeff';
}

/** White space including line breaks. */
export function isSpace(c: string | undefined): boolean {
  return isInlineSpace(c) || c === '\n' || c === '\r';
}

/**
 * Splits `text` into logical statements, masking comments.
 * Linear in the length of the text; never throws.
 */
export function scan(text: string): ScanResult {
  const n = text.length;
  const statements: ScannedStatement[] = [];
  const comments: Span[] = [];
  const pieces: string[] = [];
  let copied = 0; // text[0, copied) is already in `pieces`
  let current: ScannedStatement | null = null;
  let line = 0;
  let ls = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let steps = 0; // characters visited, for the work meter

  while (ls <= n) {
    // Find the end of this line and of its code part.
    let le = ls;
    let hash = -1;
    while (le < n) {
      const c = text[le];
      if (c === '\n' || c === '\r') break;
      if (c === '#' && hash < 0) hash = le;
      le++;
    }
    const codeEnd = hash < 0 ? le : hash;
    steps += le - ls + 1;
    if (hash >= 0) {
      comments.push({ start: hash, end: le });
      pieces.push(text.slice(copied, hash), ' '.repeat(le - hash));
      copied = le;
    }
    let a = ls;
    while (a < codeEnd && isInlineSpace(text[a])) a++;
    let b = codeEnd;
    while (b > a && isInlineSpace(text[b - 1])) b--;
    steps += codeEnd - ls - (b - a);
    if (a < b) {
      const indented = a > ls;
      if (indented && current !== null) {
        current.end = b;
      } else {
        current = { start: a, end: b, line, indented };
        statements.push(current);
      }
    }
    if (le >= n) break;
    // Step over the line break.
    const next = text[le] === '\r' && text[le + 1] === '\n' ? le + 2 : le + 1;
    line++;
    ls = next;
  }
  pieces.push(text.slice(copied));
  countWork(steps + pieces.length);
  return { masked: pieces.join(''), statements, comments };
}
