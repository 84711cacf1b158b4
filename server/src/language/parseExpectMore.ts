/**
 * Readers of the `expect` forms about one level, the continuum, the revival and a mean at a time:
 *
 *   expect level 2 energy 45.4 meV +- 0.1 meV
 *   expect continuum <= 1e-3
 *   expect revival 10.998 fs +- 0.001 fs
 *   expect mean x(2 fs) 0.5 nm +- 0.01 nm        (also `mean p(T)`, a wave number)
 */
import type { Expectation, Span } from './ast';
import { fail, parseComparison, unexpected, type Ctx } from './parserParts';
import { exprText, identEnd, levelEnd, matchClose, skipSpace } from './text';

/** The kinds read here. */
export const MORE_EXPECT_KINDS = ['level', 'continuum', 'revival', 'mean'] as const;

/** Reads the rest of an `expect KIND ...` line for the kinds above (from the end of the kind word). */
export function parseMoreExpect(ctx: Ctx, kind: (typeof MORE_EXPECT_KINDS)[number], kindSpan: Span, from: number, hi: number): Expectation | null {
  const { m } = ctx;
  switch (kind) {
    case 'continuum':
    case 'revival': {
      const comparison = parseComparison(ctx, from, hi, kindSpan);
      return comparison === null ? null : { kind, comparison };
    }
    case 'level': {
      const example = "Expected a level and 'energy', as in 'expect level 2 energy 45.4 meV +- 0.1 meV'.";
      const q = skipSpace(m, from, hi);
      const end = levelEnd(m, q, hi);
      if (end === q) return unexpected(ctx, q, hi, kindSpan, example);
      const level = exprText(m, q, end)!;
      const w = skipSpace(m, end, hi);
      const we = identEnd(m, w, hi);
      if (m.slice(w, we) !== 'energy') return unexpected(ctx, w, hi, level, example);
      const comparison = parseComparison(ctx, we, hi, { start: w, end: we });
      return comparison === null ? null : { kind: 'level', level, comparison };
    }
    case 'mean': {
      const example = "Expected 'x(T)' or 'p(T)' after 'mean', as in 'expect mean x(2 fs) 0.5 nm +- 0.01 nm'.";
      const q = skipSpace(m, from, hi);
      const qe = identEnd(m, q, hi);
      const name = m.slice(q, qe);
      if (name !== 'x' && name !== 'p') return unexpected(ctx, q, hi, kindSpan, example);
      const open = skipSpace(m, qe, hi);
      if (open >= hi || m[open] !== '(') return fail(ctx, 'syntax', { start: q, end: qe }, example);
      const close = matchClose(m, open, hi);
      if (close < 0 || m[close] !== ')') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '(' is not closed.");
      const time = exprText(m, open + 1, close);
      if (time === null) return fail(ctx, 'syntax', { start: open, end: close + 1 }, 'Expected the time inside the parentheses.');
      const comparison = parseComparison(ctx, close + 1, hi, { start: q, end: close + 1 });
      return comparison === null ? null : { kind: 'mean', observable: name, time, comparison };
    }
  }
}
