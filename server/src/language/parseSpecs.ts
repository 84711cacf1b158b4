/**
 * Readers of the parser's `state` and `system` clauses (grammar in `parser.ts`): `psi(x) = ...`,
 * `gaussian(...)`, `eigen(N) of SYSTEM`, `box/well/oscillator(...)` and `V(x) = ... over [A, B]`.
 */
import type { Span, StateSpec, SystemSpec } from './ast';
import { STATE_KINDS, SYSTEM_KINDS } from './keywords';
import { isSpace } from './scanner';
import { SIGNATURES } from './signatures';
import { expectXCall, fail, parseCall, unexpected, unknownName, type Ctx } from './parserParts';
import { parseMixture, parseThermal } from './parseMixed';
import {
  exprText,
  identEnd,
  isOpenBracket,
  lastBefore,
  matchClose,
  scanTop,
  skipSpace,
  splitTop,
} from './text';

export function parseState(ctx: Ctx, from: number, hi: number, anchor: Span): StateSpec | null {
  const { m } = ctx;
  const p = skipSpace(m, from, hi);
  const e = identEnd(m, p, hi);
  if (e === p) return unexpected(ctx, p, hi, anchor, 'Expected a state: psi(x) = ..., gaussian(...) or eigen(N) of a system.');
  const kind = m.slice(p, e);
  const kindSpan: Span = { start: p, end: e };
  if (kind === 'psi') {
    const q = expectXCall(ctx, e, hi, kindSpan, 'psi');
    if (q < 0) return null;
    const expr = exprText(m, q + 1, hi);
    if (expr === null) return fail(ctx, 'syntax', { start: q, end: q + 1 }, "Expected the wave function after 'psi(x) ='.");
    return { kind: 'psi', span: { start: p, end: hi }, expr };
  }
  if (kind === 'gaussian') {
    const call = parseCall(ctx, SIGNATURES.gaussian, kindSpan, hi);
    if (call === null) return null;
    return { kind: 'gaussian', span: { start: p, end: hi }, keywordSpan: kindSpan, args: call };
  }
  if (kind === 'eigen') {
    const open = skipSpace(m, e, hi);
    if (open >= hi || m[open] !== '(') return unexpected(ctx, open, hi, kindSpan, "Expected '(' and a level after 'eigen', as in 'eigen(1) of box(0, 1)'.");
    const close = matchClose(m, open, hi);
    if (close < 0 || m[close] !== ')') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '(' is not closed.");
    const level = exprText(m, open + 1, close);
    if (level === null) return fail(ctx, 'syntax', { start: open, end: close + 1 }, 'Expected a level number inside the parentheses.');
    const headSpan: Span = { start: p, end: close + 1 };
    const o = skipSpace(m, close + 1, hi);
    const oe = identEnd(m, o, hi);
    if (m.slice(o, oe) !== 'of') return unexpected(ctx, o, hi, headSpan, "Expected 'of' and a system after 'eigen(N)'.");
    const system = parseSystem(ctx, oe, hi, { start: o, end: oe }, 'of');
    if (system === null) return null;
    return { kind: 'eigen', span: { start: p, end: hi }, level, system };
  }
  if (kind === 'thermal') return parseThermal(ctx, kindSpan, hi, parseSystem);
  if (kind === 'mixture') return parseMixture(ctx, kindSpan, hi, parseState);
  unknownName(ctx, kindSpan, kind, STATE_KINDS, `Unknown state '${kind}'; expected psi(x) = ..., gaussian(...), eigen(N) of a system, thermal(...) of a system or mixture(...).`);
  return null;
}

export function parseSystem(ctx: Ctx, from: number, hi: number, anchor: Span, after: string): SystemSpec | null {
  const { m } = ctx;
  const p = skipSpace(m, from, hi);
  const e = identEnd(m, p, hi);
  const expected = 'box(A, B), well(...), oscillator(...) or V(x) = ... over [A, B]';
  if (e === p) return unexpected(ctx, p, hi, anchor, `Expected a system after '${after}': ${expected}.`);
  const kind = m.slice(p, e);
  const kindSpan: Span = { start: p, end: e };
  if (kind === 'box' || kind === 'well' || kind === 'oscillator') {
    const args = parseCall(ctx, SIGNATURES[kind], kindSpan, hi);
    if (args === null) return null;
    return { kind, span: { start: p, end: hi }, keywordSpan: kindSpan, args };
  }
  if (kind === 'V') return parsePotential(ctx, kindSpan, hi);
  if (kind === 'system' && after === 'of') {
    return fail(ctx, 'name', kindSpan, "Write the system without the word 'system', as in 'eigen(1) of box(0, 1)'.");
  }
  unknownName(ctx, kindSpan, kind, SYSTEM_KINDS, `Unknown system '${kind}'; expected ${expected}.`);
  return null;
}

/** `V(x) = EXPR over [A, B]`, starting at the `V`. */
export function parsePotential(ctx: Ctx, vSpan: Span, hi: number): SystemSpec | null {
  const { m } = ctx;
  const eq = expectXCall(ctx, vSpan.end, hi, vSpan, 'V');
  if (eq < 0) return null;
  const head: Span = { start: vSpan.start, end: lastBefore(m, eq) };
  let over = -1;
  scanTop(m, eq + 1, hi, (k) => {
    if (m.startsWith('over', k) && isSpace(m[k - 1]) && isOpenBracket(m, skipSpace(m, k + 4, hi), hi)) over = k;
    return false;
  });
  const exprEnd = over < 0 ? hi : over;
  const expr = exprText(m, eq + 1, exprEnd);
  if (expr === null) return fail(ctx, 'syntax', { start: eq, end: eq + 1 }, "Expected the potential after 'V(x) ='.");
  if (over < 0) return fail(ctx, 'syntax', expr, "Expected 'over [A, B]' after the potential, giving the hard walls.");
  const open = skipSpace(m, over + 4, hi);
  const close = matchClose(m, open, hi);
  if (close < 0 || m[close] !== ']') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '[' is not closed.");
  const rest = skipSpace(m, close + 1, hi);
  if (rest < hi) return fail(ctx, 'syntax', { start: rest, end: hi }, "Unexpected text after 'over [A, B]'.");
  const ends = splitTop(m, open + 1, close, ',');
  const bracket: Span = { start: open, end: close + 1 };
  if (ends.length !== 2) return fail(ctx, 'syntax', bracket, `Expected two ends, as in 'over [-5, 5]'.`);
  const a = exprText(m, ends[0]![0], ends[0]![1]);
  const b = exprText(m, ends[1]![0], ends[1]![1]);
  if (a === null || b === null) return fail(ctx, 'syntax', bracket, `Expected two ends, as in 'over [-5, 5]'.`);
  return { kind: 'potential', span: { start: vSpan.start, end: hi }, keywordSpan: head, expr, from: a, to: b };
}
