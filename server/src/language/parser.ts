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
 * statement   = units | mass | let | system | state | basis | expect | evolve | sweep
 *                                                    (sweep and expect window: see parseSweep.ts)
 * units       = "units" UNIT { "," UNIT }            UNIT: a letter followed by letters, digits or _
 * mass        = "mass" EXPR
 * let         = "let" NAME "=" EXPR                  NAME: an identifier, not a keyword, not one of
 *                                                    x i pi e phi psi, not over of to steps and or not xor mod in
 * system      = "system" SYSTEM
 * SYSTEM      = "box" "(" ARGS ")"
 *             | "well" "(" ARGS ")"
 *             | "oscillator" "(" ARGS ")"
 *             | "V" "(" "x" ")" "=" EXPR "over" "[" EXPR "," EXPR "]" [ "walls" WALL [ WALL ] ]
 *                                                    split at the last top-level "over" followed by "[";
 *                                                    WALL: "hard" | "open" (one for both ends, or left, right)
 * state       = "state" ( "psi" "(" "x" ")" "=" EXPR
 *                       | "eigen" "(" EXPR ")" "of" SYSTEM
 *                       | "gaussian" "(" ARGS ")"
 *                       | "thermal" "(" ARGS ")" "of" SYSTEM
 *                       | "mixture" "(" PART { "," PART } ")" )      (parseMixed.ts)
 * PART        = EXPR ":" STATE                       a pure state; split at the first top-level ":" 
 * basis       = "basis" EXPR
 * expect      = "expect" ( "norm" CMP | "parity" ("even" | "odd" | "mixed") | "weight" LEVELS CMP
 *                        | "energy" CMP | "spread" CMP | "level" LEVEL "energy" CMP
 *                        | "continuum" CMP | "revival" CMP | "mean" ("x" | "p") "(" EXPR ")" CMP )
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
import type { QFile, RejectedStatement, Span, Statement } from './ast';
import { diagnostic, type EngineDiagnostic } from './catalogue';
import { INNER_WORDS, isKeyword, KEYWORDS, KEYWORD_NAMES, OPERATOR_WORDS, RESERVED_NAMES, type Keyword } from './keywords';
import { scan, type ScannedStatement } from './scanner';
import { lineTable, type LineTable } from './positions';
import { isReservedName } from './reserved';
import { countWork } from './meter';
import { fail, lineNo, unexpected, unknownName, type Ctx } from './parserParts';
import { parseState, parseSystem } from './parseSpecs';
import { parseEvolve, parseExpect } from './parseExpect';
import { parseSweep } from './parseSweep';
import {
  commaNear,
  exprText,
  identEnd,
  isSingleEquals,
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

const VALUE_USERS: ReadonlySet<Keyword> = new Set(['let', 'mass', 'system', 'state', 'basis', 'expect', 'evolve', 'sweep']);
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
    case 'sweep':
      statement = parseSweep(ctx, span, kwSpan);
      break;
  }
  return { statement, keyword: statement === null ? { word, span: kwSpan } : null };
}

// ---------------------------------------------------------------------------------------------
// Statements (the readers of state, system, expect and evolve live in parseSpecs.ts and parseExpect.ts;
// a new statement gets its own reader file and one case in parseStatement)

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
