/**
 * The locked-down expression front end.
 * One private mathjs instance is used only to parse; user text is never evaluated by mathjs. The mathjs
 * node tree is converted to our `Expr` through a whitelist of node types, operators and functions;
 * everything else is a `forbidden` diagnostic on its exact document range. mathjs nodes carry no
 * positions, so a tokenizer that follows mathjs's own token rules runs over the same text and its tokens
 * are matched to the tree in source order.
 */
import type { ExprText } from '../language/ast';
import { diagnostic } from '../language/catalogue';
import type { Expr, Prepared } from './types';
import { mathParse, type MathNode } from './parse/instance';
import { tokenize } from './parse/tokens';
import { Spanner, treeShape } from './parse/spans';
import { Converter, tokenLevelRefusals } from './parse/convert';
import { raiseHint } from '../shared/limits';

export { DISABLED_FUNCTIONS, sandboxConfig } from './parse/instance';

/** Options of `parseExpression`, with defaults. */
export interface ParseOptions {
  /** Longest expression text accepted, in UTF-16 code units (default 10,000). */
  maxLength?: number;
  /** Deepest nesting accepted: brackets, calls, unary and power chains (default 200). */
  maxDepth?: number;
  /** Longest chain of left-associative binary operations, such as the terms of a sum (default 1500). */
  maxChain?: number;
}

/** Default caps of `parseExpression`. */
export const DEFAULT_PARSE_OPTIONS: Required<ParseOptions> = { maxLength: 10_000, maxDepth: 200, maxChain: 1500 };

/**
 * Parses one expression of the file. `src.start` is the document offset of `src.text`; every offset in
 * the returned tree and diagnostics is a document offset. Never throws.
 * Diagnostics: `limits` (text longer than `maxLength`, nesting deeper than `maxDepth`), `syntax` (at
 * the character mathjs reports), `forbidden` (every construct outside the whitelist, on its own range).
 */
export function parseExpression(src: ExprText, options: ParseOptions = {}): Prepared<Expr> {
  const literal = plainLiteral(src, options);
  if (literal) return literal;
  const { maxLength, maxDepth, maxChain } = { ...DEFAULT_PARSE_OPTIONS, ...options };
  if (src.text.length > MEMO_TEXT) return parseThroughMathjs(src, options);
  const key = `${src.start}:${maxLength}:${maxDepth}:${maxChain}:${src.text}`;
  let hit = parsed.get(key);
  if (hit) {
    parsed.delete(key);
  } else {
    hit = parseThroughMathjs(src, options);
    deepFreeze(hit.result);
    for (const d of hit.diagnostics) deepFreeze(d);
  }
  parsed.set(key, hit);
  if (parsed.size > MEMO_ENTRIES) parsed.delete(parsed.keys().next().value as string);
  // A fresh diagnostics array per call (callers may append to it); the tree and each diagnostic are frozen.
  return { result: hit.result, diagnostics: [...hit.diagnostics] };
}

/**
 * The last MEMO_ENTRIES parses of texts up to MEMO_TEXT characters, keyed by the text, its document
 * offset (every span in the tree is a document offset) and the caps: a sweep re-reads the same file
 * for every point, and the language server the unchanged lines of every edit. The parse is a pure
 * function of that key; the trees are frozen so no caller can change a shared one.
 */
const MEMO_ENTRIES = 512;
const MEMO_TEXT = 2000;
const parsed = new Map<string, Prepared<Expr>>();

function deepFreeze(value: unknown): void {
  if (value === null || typeof value !== 'object' || Object.isFrozen(value)) return;
  Object.freeze(value);
  for (const v of Object.values(value as Record<string, unknown>)) deepFreeze(v);
}

/**
 * A plain decimal number (digits, a decimal mark with digits, an exponent), the common case of a
 * parameter, as the full path reads it: mathjs turns the one number token into Number(text), and a
 * finite value becomes this node with the token's span (test/expr/sandbox.test.ts compares the two
 * paths). Null for anything else, which then takes the full path.
 */
const PLAIN_NUMBER = /^(?:0|[1-9][0-9]{0,20})(?:\.[0-9]{1,25})?(?:[eE][+-]?[0-9]{1,3})?$/;
function plainLiteral(src: ExprText, options: ParseOptions): Prepared<Expr> | null {
  const text = src.text;
  if (text.length > (options.maxLength ?? DEFAULT_PARSE_OPTIONS.maxLength) || !PLAIN_NUMBER.test(text)) return null;
  const value = Number(text);
  if (!Number.isFinite(value)) return null;
  return { result: { type: 'number', value, start: src.start, end: src.start + text.length }, diagnostics: [] };
}

/** parseExpression without the plain-number shortcut (exported for the test that compares the two). */
export function parseThroughMathjs(src: ExprText, options: ParseOptions = {}): Prepared<Expr> {
  const { maxLength, maxDepth, maxChain } = { ...DEFAULT_PARSE_OPTIONS, ...options };
  const text = src.text;
  const base = src.start;
  const whole = { start: base, end: base + text.length };
  try {
    if (text.length > maxLength) {
      return {
        result: null,
        diagnostics: [diagnostic('limits', whole.start, whole.end, `The expression is ${text.length} characters long; the limit is ${maxLength}.${raiseHint('maxExpressionLength')}`)],
      };
    }
    const { tokens, mathText } = tokenize(text);
    if (tokens.length === 0) {
      return { result: null, diagnostics: [diagnostic('syntax', whole.start, whole.end, 'An expression is expected here.')] };
    }
    // Bracket depth is checked on tokens first: it bounds mathjs's own recursion.
    let depth = 0;
    for (const t of tokens) {
      if (t.kind !== 'op') continue;
      if (t.text === '(' || t.text === '[' || t.text === '{') {
        depth++;
        if (depth > maxDepth)
          return {
            result: null,
            diagnostics: [diagnostic('limits', base + t.start, base + t.end, `Brackets are nested more than ${maxDepth} deep.${raiseHint('maxNesting')}`)],
          };
      } else if (t.text === ')' || t.text === ']' || t.text === '}') depth = Math.max(0, depth - 1);
    }
    let tree: MathNode;
    try {
      tree = mathParse(mathText);
    } catch (err) {
      if (err instanceof RangeError)
        return { result: null, diagnostics: [diagnostic('limits', whole.start, whole.end, 'The expression is nested too deeply.')] };
      const extra = tokenLevelRefusals(tokens, base);
      const ch = (err as { char?: unknown }).char;
      const message = String((err as Error).message ?? err).replace(/\s*\(char \d+\)$/, '');
      if (typeof ch === 'number' && Number.isFinite(ch)) {
        const at = Math.min(Math.max(0, ch - 1), text.length);
        return { result: null, diagnostics: [diagnostic('syntax', base + at, base + Math.min(at + 1, text.length), `${message}.`), ...extra] };
      }
      return { result: null, diagnostics: [diagnostic('syntax', whole.start, whole.end, `${message}.`), ...extra] };
    }
    const shape = treeShape(tree);
    if (shape.depth > maxDepth)
      return { result: null, diagnostics: [diagnostic('limits', whole.start, whole.end, `The expression is nested more than ${maxDepth} deep.${raiseHint('maxNesting')}`)] };
    if (shape.chain > maxChain)
      return {
        result: null,
        diagnostics: [diagnostic('limits', whole.start, whole.end, `The expression chains more than ${maxChain} operations in a row; split it with let lines.`)],
      };
    const spanner = new Spanner(tokens, text.length);
    spanner.span(tree);
    const conv = new Converter(spanner.spans, tokens, text, base);
    const expr = conv.convert(tree);
    return { result: conv.diagnostics.length > 0 ? null : expr, diagnostics: conv.diagnostics };
  } catch (err) {
    // Unforeseen input must not crash the caller.
    const message = err instanceof RangeError ? 'The expression is nested too deeply.' : 'The expression could not be read.';
    return { result: null, diagnostics: [diagnostic(err instanceof RangeError ? 'limits' : 'syntax', whole.start, whole.end, message)] };
  }
}
