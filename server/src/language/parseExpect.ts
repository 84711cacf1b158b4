/**
 * Readers of the parser's `expect` and `evolve` statements (grammar in `parser.ts`).
 */
import type { ExprText, Span, Statement } from './ast';
import { EXPECT_KINDS, PARITY_VALUES } from './keywords';
import { isSpace } from './scanner';
import { fail, parseComparison, unexpected, unknownName, type Ctx } from './parserParts';
import { parseWindowExpect } from './parseSweep';
import { parseMoreExpect } from './parseExpectMore';
import {
  exprText,
  identEnd,
  IDENT_PART,
  levelEnd,
  scanTop,
  skipSpace,
} from './text';

export function parseExpect(ctx: Ctx, span: Span, kwSpan: Span): Statement | null {
  const { m } = ctx;
  const hi = span.end;
  const p = skipSpace(m, kwSpan.end, hi);
  const e = identEnd(m, p, hi);
  if (e === p) return unexpected(ctx, p, hi, kwSpan, `Expected what to check after 'expect': ${EXPECT_KINDS.join(', ')}.`);
  const kind = m.slice(p, e);
  const kindSpan: Span = { start: p, end: e };
  const done = (expectation: Extract<Statement, { kind: 'expect' }>['expectation']): Statement => ({
    kind: 'expect',
    span,
    keywordSpan: kwSpan,
    expectation,
  });
  switch (kind) {
    case 'norm':
    case 'energy':
    case 'spread': {
      const comparison = parseComparison(ctx, e, hi, kindSpan);
      return comparison === null ? null : done({ kind, comparison });
    }
    case 'parity': {
      const q = skipSpace(m, e, hi);
      const qe = identEnd(m, q, hi);
      const value = m.slice(q, qe);
      if (qe === q) return unexpected(ctx, q, hi, kindSpan, 'Expected even, odd or mixed.');
      if (value !== 'even' && value !== 'odd' && value !== 'mixed') {
        return unknownName(ctx, { start: q, end: qe }, value, PARITY_VALUES, `Expected even, odd or mixed, not '${value}'.`, 'syntax');
      }
      const r = skipSpace(m, qe, hi);
      if (r < hi) return fail(ctx, 'syntax', { start: r, end: hi }, `Unexpected text after '${value}'.`);
      return done({ kind: 'parity', value, valueSpan: { start: q, end: qe } });
    }
    case 'weight': {
      const q = skipSpace(m, e, hi);
      if (q >= hi) return fail(ctx, 'syntax', kindSpan, "Expected a level or a range of levels, as in 'weight 1..20 >= 0.999'.");
      const fromEnd = levelEnd(m, q, hi);
      if (fromEnd === q) return unexpected(ctx, q, hi, kindSpan, "Expected a level or a range of levels, as in 'weight 1..20 >= 0.999'.");
      const from = exprText(m, q, fromEnd)!;
      let to: ExprText | null = null;
      let r = skipSpace(m, fromEnd, hi);
      if (m.startsWith('..', r)) {
        const dots: Span = { start: r, end: r + 2 };
        const t = skipSpace(m, r + 2, hi);
        const toEnd = levelEnd(m, t, hi);
        if (toEnd === t) return unexpected(ctx, t, hi, dots, "Expected the last level after '..'.");
        to = exprText(m, t, toEnd)!;
        r = toEnd;
      }
      const comparison = parseComparison(ctx, r, hi, to ?? from);
      return comparison === null ? null : done({ kind: 'weight', from, to, comparison });
    }
    case 'window':
      return parseWindowExpect(ctx, span, kwSpan, kindSpan);
    case 'level':
    case 'continuum':
    case 'revival':
    case 'mean': {
      const expectation = parseMoreExpect(ctx, kind, kindSpan, e, hi);
      return expectation === null ? null : done(expectation);
    }
  }
  unknownName(ctx, kindSpan, kind, EXPECT_KINDS, `Unknown check '${kind}'; expected ${EXPECT_KINDS.join(', ')}.`);
  return null;
}

export function parseEvolve(ctx: Ctx, span: Span, kwSpan: Span): Statement | null {
  const { m } = ctx;
  const hi = span.end;
  const p = skipSpace(m, kwSpan.end, hi);
  const e = identEnd(m, p, hi);
  if (m.slice(p, e) !== 'to') return unexpected(ctx, p, hi, kwSpan, "Expected 'to' after 'evolve', as in 'evolve to 10 ps steps 200'.");
  const toSpan: Span = { start: p, end: e };
  let steps = -1;
  scanTop(m, e, hi, (k) => {
    if (m.startsWith('steps', k) && isSpace(m[k - 1]) && (k + 5 >= hi || !IDENT_PART.test(m[k + 5]!))) steps = k;
    return false;
  });
  const to = exprText(m, e, steps < 0 ? hi : steps);
  if (to === null) return fail(ctx, 'syntax', toSpan, "Expected the final time after 'evolve to'.");
  let count: ExprText | null = null;
  if (steps >= 0) {
    count = exprText(m, steps + 5, hi);
    if (count === null) return fail(ctx, 'syntax', { start: steps, end: steps + 5 }, "Expected the number of steps after 'steps'.");
  }
  return { kind: 'evolve', span, keywordSpan: kwSpan, to, steps: count };
}
