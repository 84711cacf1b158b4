/**
 * Readers of the `sweep` statement and of the design-window form of `expect`:
 *
 * ```text
 * sweep       = "sweep" NAME "from" EXPR "to" EXPR "steps" EXPR [ "log" ]
 *                                  split at the first top-level word "to" and the last top-level
 *                                  word "steps"; a last word "log" (not called) asks for logarithmic spacing
 * expect      = "expect" "window" "covers" EXPR ".." EXPR
 *                                  split at the first top-level ".."
 * ```
 *
 * `steps K` means K equal steps, so K + 1 points from the first value to the last (as `evolve`'s
 * steps). What the names and values must be (a `let` name, the let's dimension, a whole number of
 * steps) is checked by the analysis (analysis/sweepModel.ts), not here.
 */
import type { Span, Statement, SweepSpec } from './ast';
import { fail, unexpected, type Ctx } from './parserParts';
import { isSpace } from './scanner';
import { exprText, identEnd, IDENT_PART, scanTop, skipSpace } from './text';

const EXAMPLE = "as in 'sweep width from 4 nm to 16 nm steps 24'";

/** The top-level offsets where the whole word `word` starts in [lo, hi). */
function topWords(m: string, lo: number, hi: number, word: string): number[] {
  const at: number[] = [];
  scanTop(m, lo, hi, (k) => {
    if (m.startsWith(word, k) && (k === lo || isSpace(m[k - 1]) || !IDENT_PART.test(m[k - 1]!)) && (k + word.length >= hi || !IDENT_PART.test(m[k + word.length]!))) at.push(k);
    return false;
  });
  return at;
}

/** `sweep NAME from A to B steps K [log]`. */
export function parseSweep(ctx: Ctx, span: Span, kwSpan: Span): Statement | null {
  const { m } = ctx;
  const hi = span.end;
  const p = skipSpace(m, kwSpan.end, hi);
  const e = identEnd(m, p, hi);
  if (e === p) return unexpected(ctx, p, hi, kwSpan, `Expected the name of a \`let\` to sweep after 'sweep', ${EXAMPLE}.`);
  const name = m.slice(p, e);
  const nameSpan: Span = { start: p, end: e };
  const f = skipSpace(m, e, hi);
  const fe = identEnd(m, f, hi);
  if (m.slice(f, fe) !== 'from') return unexpected(ctx, f, hi, nameSpan, `Expected 'from' after '${name}', ${EXAMPLE}.`);
  const fromSpan: Span = { start: f, end: fe };
  const to = topWords(m, fe, hi, 'to')[0];
  if (to === undefined) return fail(ctx, 'syntax', fromSpan, `Expected 'to' and the last value, ${EXAMPLE}.`);
  const from = exprText(m, fe, to);
  if (from === null) return fail(ctx, 'syntax', fromSpan, "Expected the first value after 'from'.");
  const stepsAt = topWords(m, to + 2, hi, 'steps');
  const steps = stepsAt[stepsAt.length - 1];
  if (steps === undefined) return fail(ctx, 'syntax', { start: to, end: to + 2 }, `Expected 'steps' and the number of steps after the last value, ${EXAMPLE}.`);
  const last = exprText(m, to + 2, steps);
  if (last === null) return fail(ctx, 'syntax', { start: to, end: to + 2 }, "Expected the last value after 'to'.");
  const stepsSpan: Span = { start: steps, end: steps + 5 };
  let countEnd = hi;
  let spacingSpan: Span | null = null;
  const logAt = topWords(m, steps + 5, hi, 'log');
  const lg = logAt[logAt.length - 1];
  if (lg !== undefined && skipSpace(m, lg + 3, hi) >= hi) {
    spacingSpan = { start: lg, end: lg + 3 };
    countEnd = lg;
  }
  const count = exprText(m, steps + 5, countEnd);
  if (count === null) return fail(ctx, 'syntax', stepsSpan, "Expected the number of steps after 'steps'.");
  const sweep: SweepSpec = { name, nameSpan, from, to: last, steps: count, spacing: spacingSpan ? 'log' : 'linear', spacingSpan };
  return { kind: 'sweep', span, keywordSpan: kwSpan, sweep };
}

/** After `expect window`: `covers A..B`; `kindSpan` is the word `window`. */
export function parseWindowExpect(ctx: Ctx, span: Span, kwSpan: Span, kindSpan: Span): Statement | null {
  const { m } = ctx;
  const hi = span.end;
  const c = skipSpace(m, kindSpan.end, hi);
  const ce = identEnd(m, c, hi);
  const form = "as in 'expect window covers 6 nm..12 nm'";
  if (m.slice(c, ce) !== 'covers') return unexpected(ctx, c, hi, kindSpan, `Expected 'covers' and a range of the swept value, ${form}.`);
  let dots = -1;
  scanTop(m, ce, hi, (k) => {
    if (m.startsWith('..', k)) dots = k;
    return dots >= 0;
  });
  const coversSpan: Span = { start: c, end: ce };
  if (dots < 0) return fail(ctx, 'syntax', coversSpan, `Expected a range 'A..B' after 'covers', ${form}.`);
  const dotSpan: Span = { start: dots, end: dots + 2 };
  const from = exprText(m, ce, dots);
  if (from === null) return fail(ctx, 'syntax', dotSpan, "Expected the range's first value before '..'.");
  const to = exprText(m, dots + 2, hi);
  if (to === null) return fail(ctx, 'syntax', dotSpan, "Expected the range's last value after '..'.");
  return { kind: 'expect', span, keywordSpan: kwSpan, expectation: { kind: 'window', from, to, rangeSpan: { start: from.start, end: to.end } } };
}
