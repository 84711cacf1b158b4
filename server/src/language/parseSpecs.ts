/**
 * Readers of the parser's `state` and `system` clauses (grammar in `parser.ts`): `psi(x) = ...`,
 * `gaussian(...)`, `eigen(N) of SYSTEM`, `box/well/oscillator(...)` and `V(x) = ... over [A, B]`.
 */
import type { ExprText, Span, StateSpec, SystemSpec, WallDeclaration, WallKind } from './ast';
import { STATE_KINDS, SYSTEM_KINDS, WALL_KINDS } from './keywords';
import { isSpace } from './scanner';
import { SIGNATURES } from './signatures';
import { parseSamples } from './parseSamples';
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
  if (kind === 'samples') return parseSamples(ctx, kindSpan, hi);
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
  let walls: WallDeclaration | undefined;
  let tail = rest;
  if (tail < hi && m.slice(tail, identEnd(m, tail, hi)) === 'walls') {
    const declared = parseWalls(ctx, tail, hi);
    if (declared === null) return null;
    walls = declared;
    tail = skipSpace(m, declared.span.end, hi);
  }
  const withMass = tail < hi ? parseMassClause(ctx, tail, hi) : undefined;
  if (withMass === null) return null;
  if (tail < hi && withMass === undefined) {
    return fail(ctx, 'syntax', { start: tail, end: hi }, "Unexpected text after 'over [A, B]'; only 'walls hard', 'walls open' or 'walls hard open' (left, right), then 'with mass(x) = ...', may follow.");
  }
  const ends = splitTop(m, open + 1, close, ',');
  const bracket: Span = { start: open, end: close + 1 };
  if (ends.length !== 2) return fail(ctx, 'syntax', bracket, `Expected two ends, as in 'over [-5, 5]'.`);
  const a = exprText(m, ends[0]![0], ends[0]![1]);
  const b = exprText(m, ends[1]![0], ends[1]![1]);
  if (a === null || b === null) return fail(ctx, 'syntax', bracket, `Expected two ends, as in 'over [-5, 5]'.`);
  const spec: SystemSpec = { kind: 'potential', span: { start: vSpan.start, end: hi }, keywordSpan: head, expr, from: a, to: b, ...(withMass ?? {}) };
  if (walls) spec.walls = walls;
  return spec;
}

/** `walls KIND [KIND]` after `over [A, B]`, up to a `with` clause or the end: one kind for both ends, or the left's and the right's. */
function parseWalls(ctx: Ctx, from: number, hi: number): WallDeclaration | null {
  const { m } = ctx;
  const e = identEnd(m, from, hi);
  const kinds: WallKind[] = [];
  let end = e;
  let p = skipSpace(m, e, hi);
  while (p < hi) {
    const q = identEnd(m, p, hi);
    const word = m.slice(p, q);
    if (word === 'with') break;
    if (word !== 'hard' && word !== 'open') {
      if (q === p) return fail(ctx, 'syntax', { start: p, end: hi }, "Expected 'hard' or 'open' for each wall.");
      return unknownName(ctx, { start: p, end: q }, word, WALL_KINDS, `Expected 'hard' or 'open' for each wall, not '${word}'.`, 'syntax');
    }
    if (kinds.length === 2) return fail(ctx, 'syntax', { start: p, end: q }, 'An interval has two walls: at most two kinds (left, right).');
    kinds.push(word);
    end = q;
    p = skipSpace(m, q, hi);
  }
  if (kinds.length === 0) return fail(ctx, 'syntax', { start: from, end: e }, "Expected 'hard' or 'open' after 'walls', as in 'walls hard open' (left, right).");
  return { left: kinds[0]!, right: kinds[kinds.length - 1]!, span: { start: from, end } };
}

/**
 * `with mass(x) = EXPR` after `over [A, B]`, starting at the `with`: undefined when the text there does
 * not start with `with`, null after a reported error.
 */
function parseMassClause(ctx: Ctx, from: number, hi: number): { mass: ExprText; massHead: Span } | null | undefined {
  const { m } = ctx;
  const we = identEnd(m, from, hi);
  if (m.slice(from, we) !== 'with') return undefined;
  const p = skipSpace(m, we, hi);
  const e = identEnd(m, p, hi);
  const withSpan: Span = { start: from, end: we };
  if (m.slice(p, e) !== 'mass') return unexpected(ctx, p, hi, withSpan, "Expected 'mass(x) = ...' after 'with'.");
  const eq = expectXCall(ctx, e, hi, { start: p, end: e }, 'mass');
  if (eq < 0) return null;
  const mass = exprText(m, eq + 1, hi);
  if (mass === null) return fail(ctx, 'syntax', { start: eq, end: eq + 1 }, "Expected the mass after 'mass(x) ='.");
  return { mass, massHead: { start: p, end: lastBefore(m, eq) } };
}
