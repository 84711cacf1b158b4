/**
 * Walks over the syntax tree for the editor features: which statement an offset is in, every
 * expression text of a file, and where a `let` name occurs.
 */
import type { Arg, ExprText, QFile, Span, Statement, SystemSpec, Comparison } from '../language/ast';
import type { Expr } from '../expr/types';
import { parseExpression } from '../expr/sandbox';
import { forEachNode } from '../expr/walk';

/** True when `offset` lies in [span.start, span.end] (the end counts, so a cursor just after a word hits it). */
export function within(span: Span, offset: number): boolean {
  return offset >= span.start && offset <= span.end;
}

/** The statement whose span holds `offset`, or null. */
export function statementAt(file: QFile | null, offset: number): Statement | null {
  if (!file) return null;
  for (const s of file.statements) if (within(s.span, offset)) return s;
  return null;
}

function argTexts(args: Arg[], out: ExprText[]): void {
  for (const a of args) out.push(a.value);
}

function systemTexts(sys: SystemSpec, out: ExprText[]): void {
  if (sys.kind === 'potential') out.push(sys.expr, sys.from, sys.to);
  else argTexts(sys.args, out);
}

/** The expression texts of `thermal(...) of SYSTEM` and of each part of `mixture(...)`. */
function mixedTexts(spec: Extract<Statement, { kind: 'state' }>['state'], out: ExprText[]): void {
  if (spec.kind === 'thermal') {
    argTexts(spec.args, out);
    systemTexts(spec.system, out);
  } else if (spec.kind === 'mixture') {
    for (const part of spec.parts) out.push(part.weight, ...statementExprTexts({ kind: 'state', span: part, keywordSpan: part, state: part.state }));
  }
}

function comparisonTexts(c: Comparison, out: ExprText[]): void {
  out.push(c.value);
  if (c.kind === 'tolerance') out.push(c.tolerance);
}

/** Every expression text of one statement, in document order. */
export function statementExprTexts(s: Statement): ExprText[] {
  const out: ExprText[] = [];
  switch (s.kind) {
    case 'mass':
    case 'let':
    case 'basis':
      out.push(s.expr);
      break;
    case 'system':
      systemTexts(s.system, out);
      break;
    case 'state':
      if (s.state.kind === 'psi') out.push(s.state.expr);
      else if (s.state.kind === 'gaussian') argTexts(s.state.args, out);
      else if (s.state.kind === 'samples') break;
      else if (s.state.kind === 'eigen') {
        out.push(s.state.level);
        systemTexts(s.state.system, out);
      } else mixedTexts(s.state, out);
      break;
    case 'expect': {
      const e = s.expectation;
      if (e.kind === 'weight') {
        out.push(e.from);
        if (e.to) out.push(e.to);
      }
      if (e.kind === 'window') out.push(e.from, e.to);
      else if (e.kind !== 'parity') comparisonTexts(e.comparison, out);
      break;
    }
    case 'sweep':
      out.push({ ...s.sweep.nameSpan, text: s.sweep.name }, s.sweep.from, s.sweep.to, s.sweep.steps);
      break;
    case 'evolve':
      out.push(s.to);
      if (s.steps) out.push(s.steps);
      break;
    case 'units':
      break;
  }
  return out.sort((a, b) => a.start - b.start);
}

/** A name as it appears in an expression text. */
export interface NameUse {
  name: string;
  start: number;
  end: number;
}

// Numbers first so that the exponent of `1e5` is not read as a name; comments are skipped.
const TOKEN = /(\d+\.?\d*(?:[eE][+-]?\d+)?|\.\d+(?:[eE][+-]?\d+)?)|([\p{L}_][\p{L}\p{N}_]*)|(#[^\n]*)/gu;

function collect(e: Expr, out: NameUse[]): void {
  forEachNode(e, (n) => {
    if (n.type === 'symbol') out.push({ name: n.name, start: n.start, end: n.end });
  });
}

/**
 * The names used in one expression text with their document offsets: the single place that finds
 * symbol occurrences. It walks the expression layer's tree (`parseExpression`), and falls back to a
 * word-boundary scan that skips numbers and comments when the expression does not parse yet.
 */
export function namesIn(expr: ExprText): NameUse[] {
  const out: NameUse[] = [];
  let tree: Expr | null = null;
  try {
    tree = parseExpression(expr).result;
  } catch {
    tree = null;
  }
  if (tree) {
    collect(tree, out);
    // Offsets must point at the name itself; otherwise trust the scan below.
    if (out.every((u) => expr.text.slice(u.start - expr.start, u.end - expr.start) === u.name)) return out.sort((a, b) => a.start - b.start);
    out.length = 0;
  }
  TOKEN.lastIndex = 0;
  for (let m = TOKEN.exec(expr.text); m; m = TOKEN.exec(expr.text)) {
    if (m[2] !== undefined) out.push({ name: m[2], start: expr.start + m.index, end: expr.start + m.index + m[2].length });
  }
  return out;
}

/** The `let` statements of a file, by name (the first definition wins when a name is repeated). */
export function letDefinitions(file: QFile | null): Map<string, Extract<Statement, { kind: 'let' }>> {
  const defs = new Map<string, Extract<Statement, { kind: 'let' }>>();
  if (!file) return defs;
  for (const s of file.statements) if (s.kind === 'let' && !defs.has(s.name)) defs.set(s.name, s);
  return defs;
}

/** The `let` name at `offset` (its definition or a use), with the span of the word under the cursor. */
export function letNameAt(file: QFile | null, offset: number): { name: string; span: Span } | null {
  const defs = letDefinitions(file);
  const s = statementAt(file, offset);
  if (!s) return null;
  if (s.kind === 'let' && within(s.nameSpan, offset)) return { name: s.name, span: s.nameSpan };
  for (const e of statementExprTexts(s)) {
    if (!within(e, offset)) continue;
    for (const u of namesIn(e)) if (within(u, offset) && defs.has(u.name)) return { name: u.name, span: u };
  }
  return null;
}

/** Every occurrence of the `let` name `name`: its definition(s) first, then the uses, in document order. */
export function occurrences(file: QFile | null, name: string): { definition: Span[]; uses: Span[] } {
  const definition: Span[] = [];
  const uses: Span[] = [];
  if (!file) return { definition, uses };
  for (const s of file.statements) {
    if (s.kind === 'let' && s.name === name) definition.push(s.nameSpan);
    for (const e of statementExprTexts(s)) for (const u of namesIn(e)) if (u.name === name) uses.push({ start: u.start, end: u.end });
  }
  return { definition, uses };
}
