/**
 * The pieces every statement reader of the parser shares: the parser state, argument lists,
 * comparisons, the `NAME(x) =` head, and the reporting helpers (`fail`, `unexpected`,
 * `unknownName`). The grammar is documented in `parser.ts`.
 */
import type { Arg, Comparison, Span } from './ast';
import { diagnostic, type Code, type EngineDiagnostic } from './catalogue';
import { positionAt, type LineTable } from './positions';
import { bindArguments, type Signature } from './signatures';
import { suggest } from './suggest';
import {
  commaNear,
  exprText,
  identEnd,
  isSingleEquals,
  matchClose,
  scanTop,
  skipSpace,
  splitTop,
  tokenEnd,
  trim,
} from './text';

/** Parser state shared by the statement readers. */
export interface Ctx {
  /** The text with comments masked (same offsets as the document). */
  m: string;
  /** The text's line table (language/positions.ts), built when a message first names a line. */
  lines: () => LineTable;
  diags: EngineDiagnostic[];
}


/** A comparison from `from` to `hi`; `anchor` is the token before it (for "missing" errors). */
export function parseComparison(ctx: Ctx, from: number, hi: number, anchor: Span): Comparison | null {
  const { m } = ctx;
  const p = skipSpace(m, from, hi);
  const what = "Expected a comparison: '>= V', '<= V' or 'V +- T'.";
  if (p >= hi) return fail(ctx, 'syntax', anchor, what);
  const two = m.startsWith('>=', p) || m.startsWith('<=', p);
  const one = m[p] === '≥' || m[p] === '≤';
  if (two || one) {
    const len = two ? 2 : 1;
    const value = exprText(m, p + len, hi);
    const sign: Span = { start: p, end: p + len };
    if (value === null) return fail(ctx, 'syntax', sign, `Expected a value after '${m.slice(p, p + len)}'.`);
    const atLeast = m[p] === '>' || m[p] === '≥';
    return { kind: atLeast ? 'atLeast' : 'atMost', span: { start: p, end: value.end }, value };
  }
  if (m[p] === '>' || m[p] === '<' || m[p] === '=') {
    return fail(ctx, 'syntax', { start: p, end: p + 1 }, `${what} ('>' and '<' are written '>=' and '<=').`);
  }
  let op = -1;
  let opLen = 0;
  scanTop(m, p, hi, (k) => {
    if (m[k] === '±') [op, opLen] = [k, 1];
    else if (m[k] === '+' && m[k + 1] === '-') [op, opLen] = [k, 2];
    return op >= 0;
  });
  const [va, vb] = trim(m, p, hi);
  if (op < 0) return fail(ctx, 'syntax', { start: va, end: vb }, `Expected '+-' and a tolerance after the value, or '>=' or '<=' before it.`);
  const sign: Span = { start: op, end: op + opLen };
  const value = exprText(m, p, op);
  if (value === null) return fail(ctx, 'syntax', sign, `Expected a value before '${m.slice(op, op + opLen)}'.`);
  const tolerance = exprText(m, op + opLen, hi);
  if (tolerance === null) return fail(ctx, 'syntax', sign, `Expected a tolerance after '${m.slice(op, op + opLen)}'.`);
  return { kind: 'tolerance', span: { start: value.start, end: tolerance.end }, value, tolerance };
}

/** `NAME(ARGS)` with nothing after it; checks the arguments against `sig`. */
export function parseCall(ctx: Ctx, sig: Signature, nameSpan: Span, hi: number): Arg[] | null {
  const { m } = ctx;
  const open = skipSpace(m, nameSpan.end, hi);
  if (open >= hi || m[open] !== '(') return unexpected(ctx, open, hi, nameSpan, `Expected '(' after '${sig.name}'.`);
  const close = matchClose(m, open, hi);
  if (close < 0 || m[close] !== ')') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '(' is not closed.");
  const rest = skipSpace(m, close + 1, hi);
  if (rest < hi) return fail(ctx, 'syntax', { start: rest, end: hi }, `Unexpected text after '${sig.name}(...)'.`);
  const args = splitArgs(ctx, open, close);
  if (args === null) return null;
  const binding = bindArguments(sig, args, { start: nameSpan.start, end: close + 1 });
  if (binding.diagnostics.length > 0) {
    ctx.diags.push(...binding.diagnostics);
    return null;
  }
  return args;
}

/** The arguments between the parentheses at `open` and `close`. */
export function splitArgs(ctx: Ctx, open: number, close: number): Arg[] | null {
  const { m } = ctx;
  if (skipSpace(m, open + 1, close) >= close) return [];
  const pieces = splitTop(m, open + 1, close, ',');
  const args: Arg[] = [];
  for (let k = 0; k < pieces.length; k++) {
    const [a, b] = trim(m, pieces[k]![0], pieces[k]![1]);
    if (a >= b) return fail(ctx, 'syntax', commaNear(pieces, k, { start: open, end: open + 1 }), 'Expected an argument.');
    let eq = -1;
    scanTop(m, a, b, (q) => {
      if (isSingleEquals(m, q)) eq = q;
      return eq >= 0;
    });
    if (eq < 0) {
      args.push({ start: a, end: b, name: null, nameSpan: null, value: exprText(m, a, b)! });
      continue;
    }
    const eqSpan: Span = { start: eq, end: eq + 1 };
    const [na, nb] = trim(m, a, eq);
    if (na >= nb) return fail(ctx, 'syntax', eqSpan, "Expected a parameter name before '='.");
    if (identEnd(m, na, nb) !== nb) return fail(ctx, 'syntax', { start: na, end: nb }, "Expected a parameter name before '='.");
    const value = exprText(m, eq + 1, b);
    if (value === null) return fail(ctx, 'syntax', eqSpan, `Expected a value after '${m.slice(na, nb)} ='.`);
    args.push({ start: a, end: b, name: m.slice(na, nb), nameSpan: { start: na, end: nb }, value });
  }
  return args;
}

/** After `psi` or `V`: `(x) =`; returns the offset of the `=`, or -1 after reporting. */
export function expectXCall(ctx: Ctx, from: number, hi: number, nameSpan: Span, name: string): number {
  const { m } = ctx;
  const form = `Expected '${name}(x) = ...'.`;
  const open = skipSpace(m, from, hi);
  if (open >= hi || m[open] !== '(') return unexpected(ctx, open, hi, nameSpan, form) ?? -1;
  const x = skipSpace(m, open + 1, hi);
  const xe = identEnd(m, x, hi);
  if (m.slice(x, xe) !== 'x') return unexpected(ctx, x, hi, { start: open, end: open + 1 }, `${form} The variable is always x.`) ?? -1;
  const close = skipSpace(m, xe, hi);
  if (close >= hi || m[close] !== ')') return unexpected(ctx, close, hi, { start: x, end: xe }, `Expected ')' after '${name}(x'.`) ?? -1;
  const eq = skipSpace(m, close + 1, hi);
  if (eq >= hi || !isSingleEquals(m, eq)) return unexpected(ctx, eq, hi, { start: nameSpan.start, end: close + 1 }, `Expected '=' after '${name}(x)'.`) ?? -1;
  return eq;
}


export function fail(ctx: Ctx, code: Code, span: Span, message: string): null {
  ctx.diags.push(diagnostic(code, span.start, span.end, message));
  return null;
}

/** Reports the token at `p`, or `anchor` when the statement ended before `p`. */
export function unexpected(ctx: Ctx, p: number, hi: number, anchor: Span, message: string): null {
  if (p < hi) return fail(ctx, 'syntax', { start: p, end: tokenEnd(ctx.m, p, hi) }, message);
  return fail(ctx, 'syntax', anchor, message);
}

/** Reports an unknown word with a "did you mean" and a quick fix when a candidate is close. */
export function unknownName(ctx: Ctx, span: Span, word: string, candidates: readonly string[], message: string, code: Code = 'name'): null {
  const s = suggest(word, candidates);
  const text = s === null ? message : `${message} Did you mean '${s}'?`;
  const fixes = s === null ? [] : [{ kind: 'replace' as const, title: `Change to '${s}'`, start: span.start, end: span.end, text: s }];
  ctx.diags.push(diagnostic(code, span.start, span.end, text, { fixes }));
  return null;
}

/** 1-based line of an offset, for messages. */
export function lineNo(ctx: Ctx, offset: number): number {
  return positionAt(ctx.lines(), offset).line + 1;
}
