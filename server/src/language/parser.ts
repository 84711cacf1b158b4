/**
 * The `.qstate` parser: text in, syntax tree and diagnostics out. It never throws.
 *
 * ## Grammar
 *
 * The scanner (`scanner.ts`) first cuts the text into statements: `#` starts a comment to the end of
 * the line, blank lines are ignored, and a line that starts with white space continues the statement
 * above it. Each statement is then read by the rules below. `EXPR` is a math expression; it is not
 * parsed here but kept verbatim (trimmed) with its document offsets for the expression layer.
 * "Top level" means outside `()`, `[]`, `{}` and `"..."`.
 *
 * ```text
 * statement   = units | mass | let | system | state | basis | expect | evolve
 * units       = "units" UNIT { "," UNIT }            UNIT: a letter followed by letters, digits or _
 * mass        = "mass" EXPR
 * let         = "let" NAME "=" EXPR                  NAME: an identifier, not a keyword, not one of
 *                                                    x i pi e phi psi, not over of to steps and or not xor mod in
 * system      = "system" SYSTEM
 * SYSTEM      = "box" "(" ARGS ")"
 *             | "well" "(" ARGS ")"
 *             | "oscillator" "(" ARGS ")"
 *             | "V" "(" "x" ")" "=" EXPR "over" "[" EXPR "," EXPR "]"
 *                                                    split at the last top-level "over" followed by "["
 * state       = "state" ( "psi" "(" "x" ")" "=" EXPR
 *                       | "eigen" "(" EXPR ")" "of" SYSTEM
 *                       | "gaussian" "(" ARGS ")" )
 * basis       = "basis" EXPR
 * expect      = "expect" ( "norm" CMP | "parity" ("even" | "odd" | "mixed") | "weight" LEVELS CMP
 *                        | "energy" CMP | "spread" CMP )
 * LEVELS      = LEVEL [ ".." LEVEL ]                 LEVEL: text up to top-level white space, "..",
 *                                                    or a comparison sign
 * CMP         = (">=" | "≥") EXPR | ("<=" | "≤") EXPR | EXPR ("+-" | "±") EXPR
 *                                                    split at the first top-level "+-" or "±"
 * evolve      = "evolve" "to" EXPR [ "steps" EXPR ]  split at the last top-level word "steps"
 * ARGS        = [ ARG { "," ARG } ]                  split at top-level commas
 * ARG         = NAME "=" EXPR | EXPR                 a single "=" at top level, not part of == <= >= !=
 * ```
 *
 * Constructor parameters are listed in `signatures.ts`: `box(left, right)` (positional or named),
 * `well(depth, width, center = 0)`, `oscillator(omega | frequency | quantum, center = 0)` and
 * `gaussian(center, width, momentum = 0)` (named only).
 *
 * ## Rules beyond the grammar
 * - `units`, `mass`, `system`, `state`, `basis` and `evolve` appear at most once; a second one is a
 *   `name` error on its keyword and is left out.
 * - `units` must come before any `let`, `mass`, `system`, `state`, `basis`, `expect` or `evolve`;
 *   `mass` before any `system`, `state`, `basis`, `expect` or `evolve` (a `name` error; the
 *   statement is still used).
 * - A `let` name may be defined only once.
 *
 * ## Errors and recovery
 * Every finding comes from the catalogue (`syntax` or `name`) with the exact range of the offending
 * text; when something is missing, the range is the token it should have followed. A statement with
 * an error is left out of `statements` (and listed in `rejected` when its keyword was known), and
 * parsing resumes at the next statement, so one mistake gives one diagnostic.
 * Comments inside a multi-line expression are replaced by spaces in `ExprText.text`, so its offsets
 * match the document one for one. Parsing is linear in the length of the text.
 */
import type { Arg, Comparison, ExprText, QFile, RejectedStatement, Span, Statement, StateSpec, SystemSpec } from './ast';
import { diagnostic, type Code, type EngineDiagnostic } from './catalogue';
import {
  EXPECT_KINDS,
  INNER_WORDS,
  isKeyword,
  KEYWORDS,
  KEYWORD_NAMES,
  OPERATOR_WORDS,
  PARITY_VALUES,
  RESERVED_NAMES,
  STATE_KINDS,
  SYSTEM_KINDS,
  type Keyword,
} from './keywords';
import { scan, isSpace, type ScannedStatement } from './scanner';
import { lineTable, positionAt, type LineTable } from './positions';
import { bindArguments, SIGNATURES, type Signature } from './signatures';
import { suggest } from './suggest';
import { isReservedName } from './reserved';
import { countWork } from './meter';
import {
  commaNear,
  exprText,
  identEnd,
  IDENT_PART,
  isOpenBracket,
  isSingleEquals,
  lastBefore,
  levelEnd,
  matchClose,
  scanTop,
  skipSpace,
  splitTop,
  takeSteps,
  tokenEnd,
  trim,
} from './text';

/** What `parse` returns. */
export interface ParseResult {
  file: QFile;
  diagnostics: EngineDiagnostic[];
}

/** Parser state shared by the statement readers. */
interface Ctx {
  /** The text with comments masked (same offsets as the document). */
  m: string;
  /** The text's line table (language/positions.ts), built when a message first names a line. */
  lines: () => LineTable;
  diags: EngineDiagnostic[];
}

const UNIT_START = /\p{L}/u;

/**
 * Parses a `.qstate` file (grammar above). Never throws; a non-string input is treated as empty.
 */
export function parse(text: string): ParseResult {
  const input = typeof text === 'string' ? text : '';
  takeSteps();
  const sc = scan(input);
  let table: LineTable | null = null;
  const ctx: Ctx = { m: sc.masked, lines: () => (table ??= lineTable(input)), diags: [] };
  const statements: Statement[] = [];
  const rejected: RejectedStatement[] = [];
  const order: OrderState = { first: new Map(), firstValueUse: null, firstModelUse: null, lets: new Map() };
  for (const st of sc.statements) {
    const before = ctx.diags.length;
    let result: StatementOutcome;
    try {
      result = parseStatement(ctx, st, order);
    } catch (err) {
      // A bug must not take the editor down; report it on the statement instead.
      ctx.diags.length = before;
      ctx.diags.push(diagnostic('syntax', st.start, st.end, `Internal parser error: ${String(err)}`));
      result = { statement: null, keyword: null };
    }
    if (result.statement !== null) statements.push(result.statement);
    else if (result.keyword !== null) {
      const entry: RejectedStatement = { keyword: result.keyword.word, span: { start: st.start, end: st.end }, keywordSpan: result.keyword.span };
      if (entry.keyword === 'let') {
        const p = skipSpace(ctx.m, entry.keywordSpan.end, st.end);
        const e = identEnd(ctx.m, p, st.end);
        if (e > p) entry.name = ctx.m.slice(p, e);
      }
      rejected.push(entry);
    }
  }
  countWork(takeSteps());
  return { file: { text: input, statements, rejected }, diagnostics: ctx.diags };
}

/** What the order and duplicate checks remember across statements. */
interface OrderState {
  /** Offset of the first statement with each keyword. */
  first: Map<Keyword, number>;
  firstValueUse: { keyword: Keyword; at: number } | null;
  firstModelUse: { keyword: Keyword; at: number } | null;
  /** Offset of each `let` name's definition. */
  lets: Map<string, number>;
}

interface StatementOutcome {
  statement: Statement | null;
  keyword: { word: Keyword; span: Span } | null;
}

const VALUE_USERS: ReadonlySet<Keyword> = new Set(['let', 'mass', 'system', 'state', 'basis', 'expect', 'evolve']);
const MODEL_USERS: ReadonlySet<Keyword> = new Set(['system', 'state', 'basis', 'expect', 'evolve']);

function parseStatement(ctx: Ctx, st: ScannedStatement, order: OrderState): StatementOutcome {
  const { m } = ctx;
  const hi = st.end;
  const kwEnd = identEnd(m, st.start, hi);
  if (kwEnd === st.start) {
    unexpected(ctx, st.start, hi, { start: st.start, end: st.end }, `Expected a statement keyword (${KEYWORD_NAMES.join(', ')}).`);
    return { statement: null, keyword: null };
  }
  const word = m.slice(st.start, kwEnd);
  const kwSpan: Span = { start: st.start, end: kwEnd };
  if (!isKeyword(word)) {
    unknownName(ctx, kwSpan, word, KEYWORD_NAMES, `Unknown statement '${word}'.`);
    return { statement: null, keyword: null };
  }
  const info = KEYWORDS.find((k) => k.keyword === word)!;
  const earlier = order.first.get(word);
  if (info.once && earlier !== undefined) {
    fail(ctx, 'name', kwSpan, `Only one '${word}' statement is allowed; the first is on line ${lineNo(ctx, earlier)}.`);
    return { statement: null, keyword: { word, span: kwSpan } };
  }
  if (earlier === undefined) order.first.set(word, st.start);
  if (word === 'units' && order.firstValueUse !== null) {
    const u = order.firstValueUse;
    fail(ctx, 'name', kwSpan, `'units' must come first, before the '${u.keyword}' statement on line ${lineNo(ctx, u.at)}.`);
  }
  if (word === 'mass' && order.firstModelUse !== null) {
    const u = order.firstModelUse;
    fail(ctx, 'name', kwSpan, `'mass' must come before the '${u.keyword}' statement on line ${lineNo(ctx, u.at)}.`);
  }
  if (VALUE_USERS.has(word) && order.firstValueUse === null) order.firstValueUse = { keyword: word, at: st.start };
  if (MODEL_USERS.has(word) && order.firstModelUse === null) order.firstModelUse = { keyword: word, at: st.start };

  const span: Span = { start: st.start, end: hi };
  let statement: Statement | null = null;
  switch (word) {
    case 'units':
      statement = parseUnits(ctx, span, kwSpan);
      break;
    case 'mass':
    case 'basis': {
      const expr = exprText(m, kwEnd, hi);
      if (expr === null) {
        const example = word === 'mass' ? 'mass 0.067 m_e' : 'basis 40';
        fail(ctx, 'syntax', kwSpan, `Expected a value after '${word}', as in '${example}'.`);
      } else statement = { kind: word, span, keywordSpan: kwSpan, expr };
      break;
    }
    case 'let':
      statement = parseLet(ctx, span, kwSpan, order);
      break;
    case 'system': {
      const system = parseSystem(ctx, kwEnd, hi, kwSpan, 'system');
      if (system !== null) statement = { kind: 'system', span, keywordSpan: kwSpan, system };
      break;
    }
    case 'state': {
      const state = parseState(ctx, kwEnd, hi, kwSpan);
      if (state !== null) statement = { kind: 'state', span, keywordSpan: kwSpan, state };
      break;
    }
    case 'expect':
      statement = parseExpect(ctx, span, kwSpan);
      break;
    case 'evolve':
      statement = parseEvolve(ctx, span, kwSpan);
      break;
  }
  return { statement, keyword: statement === null ? { word, span: kwSpan } : null };
}

// ---------------------------------------------------------------------------------------------
// Statements

function parseUnits(ctx: Ctx, span: Span, kwSpan: Span): Statement | null {
  const { m } = ctx;
  const hi = span.end;
  if (skipSpace(m, kwSpan.end, hi) >= hi) {
    return fail(ctx, 'syntax', kwSpan, "Expected unit names after 'units', as in 'units nm, meV, ps'.");
  }
  const units: { name: string; span: Span }[] = [];
  const pieces = splitTop(m, kwSpan.end, hi, ',');
  for (let k = 0; k < pieces.length; k++) {
    const [a, b] = trim(m, pieces[k]![0], pieces[k]![1]);
    if (a >= b) return fail(ctx, 'syntax', commaNear(pieces, k, kwSpan), 'Expected a unit name.');
    if (!UNIT_START.test(m[a]!)) return fail(ctx, 'syntax', { start: a, end: b }, 'Expected a unit name such as nm, meV or ps.');
    const e = identEnd(m, a, b);
    if (e < b) {
      const q = skipSpace(m, e, b);
      if (q > e && identEnd(m, q, b) > q) return fail(ctx, 'syntax', { start: q, end: tokenEnd(m, q, b) }, "Expected ',' between unit names.");
      return fail(ctx, 'syntax', { start: a, end: b }, 'Expected a unit name such as nm, meV or ps.');
    }
    units.push({ name: m.slice(a, b), span: { start: a, end: b } });
  }
  return { kind: 'units', span, keywordSpan: kwSpan, units };
}

function parseLet(ctx: Ctx, span: Span, kwSpan: Span, order: OrderState): Statement | null {
  const { m } = ctx;
  const hi = span.end;
  const p = skipSpace(m, kwSpan.end, hi);
  const e = identEnd(m, p, hi);
  if (e === p) return unexpected(ctx, p, hi, kwSpan, "Expected a name after 'let', as in 'let L = 10 nm'.");
  const name = m.slice(p, e);
  const nameSpan: Span = { start: p, end: e };
  const q = skipSpace(m, e, hi);
  if (q >= hi || !isSingleEquals(m, q)) return unexpected(ctx, q, hi, nameSpan, `Expected '=' after '${name}'.`);
  if (isKeyword(name) || (INNER_WORDS as readonly string[]).includes(name) || (OPERATOR_WORDS as readonly string[]).includes(name)) {
    return fail(ctx, 'name', nameSpan, `'${name}' is a keyword of the format and cannot be a name.`);
  }
  if ((RESERVED_NAMES as readonly string[]).includes(name)) {
    return fail(ctx, 'name', nameSpan, `'${name}' is reserved (x, i, pi, e, phi and psi have a built-in meaning).`);
  }
  if (isReservedName(name)) {
    return fail(ctx, 'name', nameSpan, `'${name}' cannot be a name: it belongs to the machinery that evaluates expressions; choose another name.`);
  }
  const earlier = order.lets.get(name);
  if (earlier !== undefined) return fail(ctx, 'name', nameSpan, `'${name}' is already defined on line ${lineNo(ctx, earlier)}.`);
  const expr = exprText(m, q + 1, hi);
  if (expr === null) return fail(ctx, 'syntax', { start: q, end: q + 1 }, `Expected a value after '${name} ='.`);
  order.lets.set(name, p);
  return { kind: 'let', span, keywordSpan: kwSpan, name, nameSpan, expr };
}

function parseState(ctx: Ctx, from: number, hi: number, anchor: Span): StateSpec | null {
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
  unknownName(ctx, kindSpan, kind, STATE_KINDS, `Unknown state '${kind}'; expected psi(x) = ..., gaussian(...) or eigen(N) of a system.`);
  return null;
}

function parseSystem(ctx: Ctx, from: number, hi: number, anchor: Span, after: string): SystemSpec | null {
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
function parsePotential(ctx: Ctx, vSpan: Span, hi: number): SystemSpec | null {
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

function parseExpect(ctx: Ctx, span: Span, kwSpan: Span): Statement | null {
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
  }
  unknownName(ctx, kindSpan, kind, EXPECT_KINDS, `Unknown check '${kind}'; expected ${EXPECT_KINDS.join(', ')}.`);
  return null;
}

function parseEvolve(ctx: Ctx, span: Span, kwSpan: Span): Statement | null {
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

// ---------------------------------------------------------------------------------------------
// Parts

/** A comparison from `from` to `hi`; `anchor` is the token before it (for "missing" errors). */
function parseComparison(ctx: Ctx, from: number, hi: number, anchor: Span): Comparison | null {
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
function parseCall(ctx: Ctx, sig: Signature, nameSpan: Span, hi: number): Arg[] | null {
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
function splitArgs(ctx: Ctx, open: number, close: number): Arg[] | null {
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
function expectXCall(ctx: Ctx, from: number, hi: number, nameSpan: Span, name: string): number {
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

// ---------------------------------------------------------------------------------------------
// Reporting

function fail(ctx: Ctx, code: Code, span: Span, message: string): null {
  ctx.diags.push(diagnostic(code, span.start, span.end, message));
  return null;
}

/** Reports the token at `p`, or `anchor` when the statement ended before `p`. */
function unexpected(ctx: Ctx, p: number, hi: number, anchor: Span, message: string): null {
  if (p < hi) return fail(ctx, 'syntax', { start: p, end: tokenEnd(ctx.m, p, hi) }, message);
  return fail(ctx, 'syntax', anchor, message);
}

/** Reports an unknown word with a "did you mean" and a quick fix when a candidate is close. */
function unknownName(ctx: Ctx, span: Span, word: string, candidates: readonly string[], message: string, code: Code = 'name'): null {
  const s = suggest(word, candidates);
  const text = s === null ? message : `${message} Did you mean '${s}'?`;
  const fixes = s === null ? [] : [{ kind: 'replace' as const, title: `Change to '${s}'`, start: span.start, end: span.end, text: s }];
  ctx.diags.push(diagnostic(code, span.start, span.end, text, { fixes }));
  return null;
}

/** 1-based line of an offset, for messages. */
function lineNo(ctx: Ctx, offset: number): number {
  return positionAt(ctx.lines(), offset).line + 1;
}
