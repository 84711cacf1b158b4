/**
 * Readers of the mixed-state clauses of `state` (grammar in `parser.ts`):
 * `thermal(nbar = N | temperature = T) of SYSTEM` and `mixture(W1: STATE, W2: STATE, ...)`, where each
 * STATE is a pure one (`psi(x) = ...`, `gaussian(...)` or `eigen(N) of SYSTEM`) and each weight W an
 * expression (one that uses `?:` goes in parentheses: the first top-level `:` ends the weight).
 */
import type { MixturePart, Span, StateSpec } from './ast';
import { bindArguments, SIGNATURES } from './signatures';
import { fail, splitArgs, unexpected, type Ctx } from './parserParts';
import { commaNear, exprText, identEnd, matchClose, scanTop, skipSpace, splitTop, trim } from './text';

/** A reader of pure states (`parseState`), passed in so this module does not import its caller. */
export type PureReader = (ctx: Ctx, from: number, hi: number, anchor: Span) => StateSpec | null;

/** `thermal(ARGS) of SYSTEM`, from just after the word `thermal`. */
export function parseThermal(
  ctx: Ctx,
  kindSpan: Span,
  hi: number,
  readSystem: (ctx: Ctx, from: number, hi: number, anchor: Span, after: string) => import('./ast').SystemSpec | null,
): StateSpec | null {
  const { m } = ctx;
  const open = skipSpace(m, kindSpan.end, hi);
  if (open >= hi || m[open] !== '(') return unexpected(ctx, open, hi, kindSpan, "Expected '(' after 'thermal', as in 'thermal(nbar = 0.3) of oscillator(omega = 1)'.");
  const close = matchClose(m, open, hi);
  if (close < 0 || m[close] !== ')') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '(' is not closed.");
  const args = splitArgs(ctx, open, close);
  if (args === null) return null;
  const binding = bindArguments(SIGNATURES.thermal, args, { start: kindSpan.start, end: close + 1 });
  if (binding.diagnostics.length > 0) {
    ctx.diags.push(...binding.diagnostics);
    return null;
  }
  const headSpan: Span = { start: kindSpan.start, end: close + 1 };
  const o = skipSpace(m, close + 1, hi);
  const oe = identEnd(m, o, hi);
  if (m.slice(o, oe) !== 'of') return unexpected(ctx, o, hi, headSpan, "Expected 'of' and the system in equilibrium after 'thermal(...)'.");
  const system = readSystem(ctx, oe, hi, { start: o, end: oe }, 'of');
  if (system === null) return null;
  return { kind: 'thermal', span: { start: kindSpan.start, end: hi }, keywordSpan: kindSpan, args, system };
}

/** `mixture(W: STATE, ...)`, from just after the word `mixture`. */
export function parseMixture(ctx: Ctx, kindSpan: Span, hi: number, readPure: PureReader): StateSpec | null {
  const { m } = ctx;
  const open = skipSpace(m, kindSpan.end, hi);
  if (open >= hi || m[open] !== '(') return unexpected(ctx, open, hi, kindSpan, "Expected '(' after 'mixture', as in 'mixture(0.7: eigen(1) of box(0, 1), 0.3: eigen(2) of box(0, 1))'.");
  const close = matchClose(m, open, hi);
  if (close < 0 || m[close] !== ')') return fail(ctx, 'syntax', { start: open, end: open + 1 }, "This '(' is not closed.");
  const rest = skipSpace(m, close + 1, hi);
  if (rest < hi) return fail(ctx, 'syntax', { start: rest, end: hi }, "Unexpected text after 'mixture(...)'.");
  const whole: Span = { start: kindSpan.start, end: close + 1 };
  if (skipSpace(m, open + 1, close) >= close) return fail(ctx, 'syntax', whole, "A mixture needs at least one part 'WEIGHT: STATE'.");
  const pieces = splitTop(m, open + 1, close, ',');
  const parts: MixturePart[] = [];
  for (let k = 0; k < pieces.length; k++) {
    const [a, b] = trim(m, pieces[k]![0], pieces[k]![1]);
    if (a >= b) return fail(ctx, 'syntax', commaNear(pieces, k, { start: open, end: open + 1 }), "Expected a part 'WEIGHT: STATE'.");
    const part = parsePart(ctx, a, b, readPure);
    if (part === null) return null;
    parts.push(part);
  }
  return { kind: 'mixture', span: { start: kindSpan.start, end: hi }, keywordSpan: kindSpan, parts };
}

/** One `WEIGHT: STATE` between `a` and `b`. */
function parsePart(ctx: Ctx, a: number, b: number, readPure: PureReader): MixturePart | null {
  const { m } = ctx;
  let colon = -1;
  scanTop(m, a, b, (q) => {
    if (m[q] === ':') colon = q;
    return colon >= 0;
  });
  if (colon < 0) return fail(ctx, 'syntax', { start: a, end: b }, "Expected 'WEIGHT: STATE', as in '0.7: eigen(1) of box(0, 1)'.");
  const weight = exprText(m, a, colon);
  if (weight === null) return fail(ctx, 'syntax', { start: colon, end: colon + 1 }, "Expected a weight before ':'.");
  const colonSpan: Span = { start: colon, end: colon + 1 };
  const p = skipSpace(m, colon + 1, b);
  const word = m.slice(p, identEnd(m, p, b));
  if (word === 'thermal' || word === 'mixture') {
    return fail(ctx, 'syntax', { start: p, end: p + word.length }, 'The parts of a mixture are pure states: psi(x) = ..., gaussian(...) or eigen(N) of a system.');
  }
  const state = readPure(ctx, colon + 1, b, colonSpan);
  if (state === null) return null;
  return { start: a, end: b, weight, state };
}
