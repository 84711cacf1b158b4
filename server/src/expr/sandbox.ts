/**
 * The locked-down expression front end.
 * One private mathjs instance is used only to parse; user text is never evaluated by mathjs. The mathjs
 * node tree is converted to our `Expr` through a whitelist of node types, operators and functions;
 * everything else is a `forbidden` diagnostic on its exact document range. mathjs nodes carry no
 * positions, so a tokenizer that follows mathjs's own token rules runs over the same text and its tokens
 * are matched to the tree in source order.
 */
import { create, parseDependencies } from 'mathjs';
import type { ExprText, Span } from '../language/ast';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import { didYouMean } from '../language/suggest';
import type { Expr, Prepared } from './types';
import { BUILTINS } from './builtins/table';

/** A function an expression may call: arity range and a one-line description (for completion and hover). */
export interface AllowedFunction {
  name: string;
  minArgs: number;
  maxArgs: number;
  doc: string;
}

/** The whitelist of callable functions: the built-in table's records (`phi` is limited to `psi(x)` of a file with a system). */
export const ALLOWED_FUNCTIONS: readonly AllowedFunction[] = BUILTINS;

const ALLOWED = new Map(ALLOWED_FUNCTIONS.map((f) => [f.name, f]));

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
 * mathjs functions its security guidance says to disable, plus every other entry point that parses,
 * compiles, evaluates or alters the instance. They are refused as calls and as bare names, and are
 * replaced by throwing stubs inside the private instance.
 */
export const DISABLED_FUNCTIONS: readonly string[] = [
  'import',
  'createUnit',
  'evaluate',
  'parse',
  'compile',
  'simplify',
  'simplifyConstant',
  'simplifyCore',
  'rationalize',
  'derivative',
  'resolve',
  'reviver',
  'replacer',
  'symbolicEqual',
  'leafCount',
  'parser',
  'chain',
  'help',
  'typed',
  'config',
];

/** Property names that reach JavaScript internals; refused wherever they appear as a symbol. */
const UNSAFE_NAMES = new Set([
  'constructor',
  '__proto__',
  'prototype',
  '__defineGetter__',
  '__defineSetter__',
  '__lookupGetter__',
  '__lookupSetter__',
  'hasOwnProperty',
  'isPrototypeOf',
  'propertyIsEnumerable',
  'toString',
  'toLocaleString',
  'valueOf',
  'eval',
  'Function',
  'globalThis',
  'window',
  'process',
  'require',
]);

/* The private instance: created once, its parser captured, then its dangerous functions replaced.
   It is built from the parser's factories alone: the sandbox only parses, and creating every mathjs
   function made up most of the start-up time and of the bundles (docs/performance.md). */
const instance = create({ parseDependencies }, {});
const mathParse: (text: string) => MathNode = instance.parse as unknown as (text: string) => MathNode;
{
  const stubs: Record<string, () => never> = {};
  for (const name of DISABLED_FUNCTIONS) {
    // `config` and `typed` are instance internals that mathjs does not let import replace: `config` is
    // made read-only below, and the whitelist keeps both out of reach of expressions.
    if (name === 'config' || name === 'typed') continue;
    stubs[name] = () => {
      throw new Error(`Function ${name} is disabled`);
    };
  }
  instance.import(stubs, { override: true });
}
/* `config` cannot be replaced through import; the instance's own function is swapped for one that only
   reads, so not even code holding the instance can change the parser's number type. */
const readConfig = (instance.config as unknown as (o?: unknown) => Record<string, unknown>).bind(instance);
Object.defineProperty(instance, 'config', {
  value: (options?: unknown) => {
    if (options !== undefined) throw new Error('Function config is disabled');
    return readConfig();
  },
  writable: false,
  configurable: false,
});

/** A snapshot of the private instance's configuration (tests check it never changes). */
export function sandboxConfig(): Record<string, unknown> {
  return { ...readConfig() };
}

/** The parts of a mathjs node this module reads. */
interface MathNode {
  type: string;
  [key: string]: unknown;
}

// ---------------------------------------------------------------------------------------------------
// Tokenizer: follows the token rules of mathjs 15.2's parser so that tokens line up with the tree.

type TokKind = 'num' | 'sym' | 'str' | 'op' | 'bad';
interface Tok {
  kind: TokKind;
  text: string;
  start: number;
  end: number;
}

const DELIM3 = new Set(['>>>']);
const DELIM2 = new Set(['.*', './', '.^', '^|', '?.', '??', '==', '!=', '<=', '>=', '<<', '>>']);
const DELIM1 = new Set([',', '(', ')', '[', ']', '{', '}', ';', '+', '-', '*', '/', '%', '^', '~', '!', '&', '|', '=', ':', '?', '<', '>']);
const NAMED = new Set(['mod', 'to', 'in', 'and', 'xor', 'or', 'not']);

const isDigit = (c: string) => c >= '0' && c <= '9';
// mathjs's letters plus the micro sign, which is handed to mathjs as the Greek mu.
const LETTER = /^[a-zA-Z_$\u00B5\u00C0-\u02AF\u0370-\u03FF\u2100-\u214F]$/;
function isAlpha(s: string, i: number): boolean {
  const c = s.charAt(i);
  if (LETTER.test(c)) return true;
  const hi = c === '\uD835' ? c : s.charAt(i - 1);
  const lo = c === '\uD835' ? s.charAt(i + 1) : c;
  return hi === '\uD835' && /^[\uDC00-\uDFFF]$/.test(lo);
}
const isSpace = (c: string) => c === ' ' || c === '\t' || c === '\u00A0' || c === '\n' || c === '\r';
const isDecimalMark = (c: string, next: string) => c === '.' && next !== '/' && next !== '*' && next !== '^';

/**
 * Splits `s` into tokens the way mathjs does, and returns the text to hand to mathjs: newlines become
 * spaces (continuation lines belong to one expression), comments are blanked, the micro sign becomes mu.
 */
function tokenize(s: string): { tokens: Tok[]; mathText: string } {
  const tokens: Tok[] = [];
  const out = s.split('');
  let i = 0;
  const n = s.length;
  const operandEnd = (t: Tok | undefined) =>
    t !== undefined &&
    (t.kind === 'num' || t.kind === 'sym' || t.kind === 'str' || (t.kind === 'op' && [')', ']', '}', "'", '!'].includes(t.text)));
  while (i < n) {
    const c = s.charAt(i);
    if (c === '\n' || c === '\r') {
      out[i] = ' ';
      i++;
      continue;
    }
    if (isSpace(c)) {
      i++;
      continue;
    }
    if (c === '#') {
      while (i < n && s.charAt(i) !== '\n' && s.charAt(i) !== '\r') out[i++] = ' ';
      continue;
    }
    const start = i;
    if (c === '"' || (c === "'" && !operandEnd(tokens[tokens.length - 1]))) {
      i++;
      while (i < n && s.charAt(i) !== c) i += s.charAt(i) === '\\' ? 2 : 1;
      i = Math.min(n, i + 1);
      tokens.push({ kind: 'str', text: s.slice(start, i), start, end: i });
      continue;
    }
    const c3 = s.substr(i, 3);
    const c2 = s.substr(i, 2);
    if (DELIM3.has(c3)) {
      i += 3;
      tokens.push({ kind: 'op', text: c3, start, end: i });
      continue;
    }
    if (DELIM2.has(c2) && (c2 !== '?.' || !isDigit(s.charAt(i + 2)))) {
      i += 2;
      tokens.push({ kind: 'op', text: c2, start, end: i });
      continue;
    }
    if (DELIM1.has(c) || c === "'") {
      i++;
      tokens.push({ kind: 'op', text: c, start, end: i });
      continue;
    }
    if (isDigit(c) || c === '.') {
      if (c2 === '0b' || c2 === '0o' || c2 === '0x') {
        i += 2;
        while (i < n && (isAlpha(s, i) || isDigit(s.charAt(i)))) i++;
        if (s.charAt(i) === '.') {
          i++;
          while (i < n && (isAlpha(s, i) || isDigit(s.charAt(i)))) i++;
        }
        tokens.push({ kind: 'num', text: s.slice(start, i), start, end: i });
        continue;
      }
      if (c === '.') {
        i++;
        if (!isDigit(s.charAt(i))) {
          tokens.push({ kind: 'op', text: '.', start, end: i });
          continue;
        }
      } else {
        while (isDigit(s.charAt(i))) i++;
        if (isDecimalMark(s.charAt(i), s.charAt(i + 1))) i++;
      }
      while (isDigit(s.charAt(i))) i++;
      const e = s.charAt(i);
      if ((e === 'e' || e === 'E') && (isDigit(s.charAt(i + 1)) || s.charAt(i + 1) === '-' || s.charAt(i + 1) === '+')) {
        i++;
        if (s.charAt(i) === '+' || s.charAt(i) === '-') i++;
        while (isDigit(s.charAt(i))) i++;
      }
      tokens.push({ kind: 'num', text: s.slice(start, i), start, end: i });
      continue;
    }
    if (isAlpha(s, i)) {
      while (i < n && (isAlpha(s, i) || isDigit(s.charAt(i)))) {
        if (s.charAt(i) === '\u00B5') out[i] = '\u03BC';
        i++;
      }
      const text = s.slice(start, i);
      tokens.push({ kind: NAMED.has(text) ? 'op' : 'sym', text, start, end: i });
      continue;
    }
    tokens.push({ kind: 'bad', text: s.slice(i), start, end: n });
    break;
  }
  return { tokens, mathText: out.join('') };
}

// ---------------------------------------------------------------------------------------------------
// Spans: walk the mathjs tree in source order, consuming tokens.

class Spanner {
  k = 0;
  readonly spans = new Map<MathNode, Span>();
  constructor(
    readonly toks: Tok[],
    readonly textEnd: number,
  ) {}

  private peek(): Tok | undefined {
    return this.toks[this.k];
  }

  private take(): Span {
    const t = this.toks[this.k];
    if (!t) return { start: this.textEnd, end: this.textEnd };
    this.k++;
    return { start: t.start, end: t.end };
  }

  /** Consumes a bracketed group starting at the current token up to its matching closer. */
  private skipGroup(): Span {
    const first = this.take();
    let depth = 1;
    let last = first;
    while (depth > 0 && this.k < this.toks.length) {
      const t = this.toks[this.k]!;
      if (t.kind === 'op' && (t.text === '(' || t.text === '[' || t.text === '{')) depth++;
      if (t.kind === 'op' && (t.text === ')' || t.text === ']' || t.text === '}')) depth--;
      last = this.take();
    }
    return { start: first.start, end: last.end };
  }

  private index(node: MathNode, optional: boolean): Span {
    if (node['dotNotation']) {
      const dot = optional ? null : this.take();
      const name = this.take();
      return { start: dot ? dot.start : name.start, end: name.end };
    }
    const open = this.take();
    const dims = (node['dimensions'] as MathNode[]) ?? [];
    dims.forEach((d, j) => {
      if (j > 0) this.take();
      this.span(d);
    });
    const close = this.take();
    return { start: open.start, end: close.end };
  }

  span(node: MathNode): Span {
    const s = this.compute(node);
    this.spans.set(node, s);
    return s;
  }

  private compute(node: MathNode): Span {
    const join = (a: Span, b: Span): Span => ({ start: a.start, end: Math.max(a.start, b.end) });
    switch (node.type) {
      case 'ConstantNode':
      case 'SymbolNode':
        return this.take();
      case 'ParenthesisNode': {
        const a = this.take();
        this.span(node['content'] as MathNode);
        return join(a, this.take());
      }
      case 'OperatorNode': {
        const args = node['args'] as MathNode[];
        if (node['isPercentage']) return join(this.span(args[0]!), this.take());
        if (args.length === 1) {
          if (node['fn'] === 'factorial' || node['fn'] === 'ctranspose') return join(this.span(args[0]!), this.take());
          const op = this.take();
          return join(op, this.span(args[0]!));
        }
        const right = args[1]!;
        const rargs = right['args'] as MathNode[] | undefined;
        if (right.type === 'OperatorNode' && rargs && rargs[0] === args[0] && rargs[1]?.['isPercentage']) {
          // `a + 50%` is built as a + a*(50/100) reusing the node of `a`.
          const l = this.span(args[0]!);
          this.take();
          const r = this.span(rargs[1]!);
          this.spans.set(right, r);
          return join(l, r);
        }
        const l = this.span(args[0]!);
        if (!node['implicit']) this.take();
        return join(l, this.span(right));
      }
      case 'RelationalNode': {
        const params = node['params'] as MathNode[];
        let s = this.span(params[0]!);
        for (let j = 1; j < params.length; j++) {
          this.take();
          s = join(s, this.span(params[j]!));
        }
        return s;
      }
      case 'ConditionalNode': {
        const c = this.span(node['condition'] as MathNode);
        this.take();
        this.span(node['trueExpr'] as MathNode);
        this.take();
        return join(c, this.span(node['falseExpr'] as MathNode));
      }
      case 'FunctionNode': {
        const f = this.span(node['fn'] as MathNode);
        if (node['optional']) this.take();
        this.take();
        (node['args'] as MathNode[]).forEach((a, j) => {
          if (j > 0) this.take();
          this.span(a);
        });
        return join(f, this.take());
      }
      case 'AccessorNode': {
        const o = this.span(node['object'] as MathNode);
        const optional = Boolean(node['optionalChaining']);
        if (optional) this.take();
        return join(o, this.index(node['index'] as MathNode, optional));
      }
      case 'IndexNode':
        return this.index(node, false);
      case 'ArrayNode':
      case 'ObjectNode':
        return this.skipGroup();
      case 'RangeNode': {
        const first = this.peek();
        let s: Span | null = null;
        if (!(first && first.kind === 'op' && first.text === ':')) s = this.span(node['start'] as MathNode);
        let last = this.take();
        s = s ?? last;
        if (node['step']) {
          this.span(node['step'] as MathNode);
          last = this.take();
        }
        const t = this.peek();
        if (t && !(t.kind === 'op' && [')', ']', ','].includes(t.text))) last = this.span(node['end'] as MathNode);
        return join(s, last);
      }
      case 'AssignmentNode': {
        const o = this.span(node['object'] as MathNode);
        if (node['index']) this.index(node['index'] as MathNode, false);
        this.take();
        return join(o, this.span(node['value'] as MathNode));
      }
      case 'FunctionAssignmentNode': {
        const name = this.take();
        if (this.peek()?.text === '(') this.skipGroup();
        this.take();
        return join(name, this.span(node['expr'] as MathNode));
      }
      default: {
        // BlockNode (several statements) and anything unforeseen: the rest of the text.
        const first = this.peek();
        const start = first ? first.start : this.textEnd;
        let end = start;
        while (this.k < this.toks.length) end = this.take().end;
        return { start, end };
      }
    }
  }
}

/** Direct children of a mathjs node, in any order (used for the depth cap). */
function children(node: MathNode): MathNode[] {
  switch (node.type) {
    case 'ParenthesisNode':
      return [node['content'] as MathNode];
    case 'OperatorNode':
      return node['args'] as MathNode[];
    case 'RelationalNode':
      return node['params'] as MathNode[];
    case 'ConditionalNode':
      return [node['condition'], node['trueExpr'], node['falseExpr']] as MathNode[];
    case 'FunctionNode':
      return [node['fn'] as MathNode, ...(node['args'] as MathNode[])];
    case 'AccessorNode':
      return [node['object'], node['index']] as MathNode[];
    case 'IndexNode':
      return node['dimensions'] as MathNode[];
    case 'ArrayNode':
      return node['items'] as MathNode[];
    case 'ObjectNode':
      return Object.values(node['properties'] as Record<string, MathNode>);
    case 'RangeNode':
      return [node['start'], node['end'], node['step']].filter(Boolean) as MathNode[];
    case 'AssignmentNode':
      return [node['object'], node['index'], node['value']].filter(Boolean) as MathNode[];
    case 'FunctionAssignmentNode':
      return [node['expr'] as MathNode];
    case 'BlockNode':
      return (node['blocks'] as { node: MathNode }[]).map((b) => b.node);
    default:
      return [];
  }
}

/**
 * Nesting depth of the tree, and the longest chain of left-associative binary operators. A chain such as
 * `a + b - c + ...` or `2 pi x y` counts as one level of depth, so long sums are not mistaken for deep
 * nesting; its length is capped separately because every later stage walks it recursively.
 */
function treeShape(root: MathNode): { depth: number; chain: number } {
  let depth = 0;
  let chain = 0;
  const stack: [MathNode, number, number][] = [[root, 1, 0]];
  while (stack.length > 0) {
    const [node, d, c] = stack.pop()!;
    if (d > depth) depth = d;
    if (c > chain) chain = c;
    const kids = children(node);
    for (let j = 0; j < kids.length; j++) {
      const kid = kids[j]!;
      const link =
        node.type === 'OperatorNode' &&
        j === 0 &&
        kids.length === 2 &&
        kid.type === 'OperatorNode' &&
        (kid['args'] as MathNode[]).length === 2;
      stack.push(link ? [kid, d, c + 1] : [kid, d + 1, 0]);
    }
  }
  return { depth, chain };
}

// ---------------------------------------------------------------------------------------------------
// Conversion through the whitelist.

const BINARY: Record<string, Exclude<Expr, { type: 'number' | 'symbol' | 'unary' | 'call' | 'conditional' }>['op']> = {
  add: '+',
  subtract: '-',
  multiply: '*',
  divide: '/',
  pow: '^',
  smaller: '<',
  smallerEq: '<=',
  larger: '>',
  largerEq: '>=',
  equal: '==',
  unequal: '!=',
  and: 'and',
  or: 'or',
};
const UNARY: Record<string, '-' | '+' | 'not'> = { unaryMinus: '-', unaryPlus: '+', not: 'not' };
/** The source spelling each allowed mathjs operator function must have (rules out `.*`, `./`, `%`). */
const SPELLING: Record<string, string> = { ...BINARY, ...UNARY };

class Converter {
  readonly diagnostics: EngineDiagnostic[] = [];
  constructor(
    readonly spans: Map<MathNode, Span>,
    readonly toks: Tok[],
    readonly text: string,
    readonly offset: number,
  ) {}

  private at(node: MathNode): Span {
    const s = this.spans.get(node) ?? { start: 0, end: this.text.length };
    return { start: s.start + this.offset, end: s.end + this.offset };
  }

  private forbid(node: MathNode, message: string): null {
    const s = this.at(node);
    this.diagnostics.push(diagnostic('forbidden', s.start, s.end, message));
    return null;
  }

  convert(node: MathNode): Expr | null {
    const s = this.at(node);
    switch (node.type) {
      case 'ConstantNode': {
        const v = node['value'];
        if (typeof v === 'number') {
          if (Number.isFinite(v)) return { type: 'number', value: v, start: s.start, end: s.end };
          if (Number.isNaN(v) || /^[A-Za-z]/.test(this.text.slice(s.start - this.offset, s.end - this.offset)))
            return this.forbid(node, `'${this.text.slice(s.start - this.offset, s.end - this.offset)}' is not allowed; write a finite number.`);
          this.diagnostics.push(diagnostic('syntax', s.start, s.end, 'This number is too large to represent.'));
          return null;
        }
        if (typeof v === 'string') return this.forbid(node, 'Strings are not allowed in an expression.');
        return this.forbid(node, `'${String(v)}' is not a number; only numbers are allowed.`);
      }
      case 'SymbolNode': {
        const name = this.text.slice(s.start - this.offset, s.end - this.offset) || String(node['name']);
        if (UNSAFE_NAMES.has(name) || DISABLED_FUNCTIONS.includes(name) || name.startsWith('__'))
          return this.forbid(node, `The name '${name}' is not allowed.`);
        return { type: 'symbol', name, start: s.start, end: s.end };
      }
      case 'ParenthesisNode':
        return this.convert(node['content'] as MathNode);
      case 'OperatorNode': {
        const fn = String(node['fn']);
        const op = String(node['op']);
        const args = node['args'] as MathNode[];
        if (node['isPercentage']) return this.forbid(node, "Percentages ('%') are not allowed.");
        if (SPELLING[fn] !== op || (args.length === 1) !== fn in UNARY)
          return this.forbid(node, `The operator '${op}' is not allowed.`);
        if (args.length === 1) {
          const arg = this.convert(args[0]!);
          return arg && { type: 'unary', op: UNARY[fn]!, arg, start: s.start, end: s.end };
        }
        const left = this.convert(args[0]!);
        const right = this.convert(args[1]!);
        if (!left || !right) return null;
        return { type: 'binary', op: BINARY[fn]!, left, right, implicit: Boolean(node['implicit']), start: s.start, end: s.end };
      }
      case 'RelationalNode': {
        // `a < b < c` means (a < b) and (b < c); the middle operand is shared.
        const params = (node['params'] as MathNode[]).map((p) => this.convert(p));
        const fns = node['conditionals'] as string[];
        if (params.some((p) => p === null)) return null;
        let out: Expr | null = null;
        for (let j = 0; j < fns.length; j++) {
          const l = params[j]!;
          const r = params[j + 1]!;
          const cmp: Expr = { type: 'binary', op: BINARY[fns[j]!]!, left: l, right: r, implicit: false, start: l.start, end: r.end };
          out = out === null ? cmp : { type: 'binary', op: 'and', left: out, right: cmp, implicit: false, start: s.start, end: r.end };
        }
        return out;
      }
      case 'ConditionalNode': {
        const test = this.convert(node['condition'] as MathNode);
        const then = this.convert(node['trueExpr'] as MathNode);
        const otherwise = this.convert(node['falseExpr'] as MathNode);
        if (!test || !then || !otherwise) return null;
        return { type: 'conditional', test, then, otherwise, start: s.start, end: s.end };
      }
      case 'FunctionNode': {
        const fnNode = node['fn'] as MathNode;
        if (fnNode.type !== 'SymbolNode' || node['optional'])
          return this.forbid(node, 'Only the built-in functions may be called.');
        const ns = this.at(fnNode);
        const name = this.text.slice(ns.start - this.offset, ns.end - this.offset) || String(fnNode['name']);
        if (!ALLOWED.has(name) || UNSAFE_NAMES.has(name)) {
          const hint = didYouMean(name, ALLOWED.keys());
          if (hint !== '' || UNSAFE_NAMES.has(name) || DISABLED_FUNCTIONS.includes(name))
            return this.forbid(node, `'${name}' is not an allowed function.${hint}`);
          // `m_e (w x)^2` reads as a call in mathjs's syntax; the writer most likely meant a product.
          this.diagnostics.push(
            diagnostic('syntax', s.start, s.end, `'${name}' is not a function; to multiply, write '${name} * (...)'.`, {
              fixes: [{ kind: 'insert', title: `Insert '*' after '${name}'`, at: ns.end, text: ' *' }],
            }),
          );
          return null;
        }
        const args = (node['args'] as MathNode[]).map((a) => this.convert(a));
        if (args.some((a) => a === null)) return null;
        return { type: 'call', name, args: args as Expr[], nameStart: ns.start, nameEnd: ns.end, start: s.start, end: s.end };
      }
      case 'AssignmentNode':
        return this.forbid(node, 'Assignments are not allowed in an expression; use a let line.');
      case 'FunctionAssignmentNode':
        return this.forbid(node, 'Function definitions are not allowed in an expression.');
      case 'AccessorNode':
        return this.forbid(node, 'Property and index access is not allowed.');
      case 'ArrayNode':
        return this.forbid(node, 'Lists and matrices are not allowed.');
      case 'ObjectNode':
        return this.forbid(node, 'Objects are not allowed.');
      case 'RangeNode':
        return this.forbid(node, "Ranges ('a:b') are not allowed.");
      case 'BlockNode':
        return this.forbid(node, 'Only one expression is allowed here.');
      default:
        return this.forbid(node, `This construct (${node.type}) is not allowed.`);
    }
  }
}

/**
 * Refusals found from tokens alone, reported beside a syntax error so that an escape attempt that also
 * fails to parse is still named: unsafe or disabled names, strings, and property access with `.`.
 */
function tokenLevelRefusals(tokens: Tok[], base: number): EngineDiagnostic[] {
  const out: EngineDiagnostic[] = [];
  for (let j = 0; j < tokens.length; j++) {
    const t = tokens[j]!;
    if (t.kind === 'sym' && (UNSAFE_NAMES.has(t.text) || DISABLED_FUNCTIONS.includes(t.text) || t.text.startsWith('__')))
      out.push(diagnostic('forbidden', base + t.start, base + t.end, `The name '${t.text}' is not allowed.`));
    else if (t.kind === 'str') out.push(diagnostic('forbidden', base + t.start, base + t.end, 'Strings are not allowed in an expression.'));
  }
  return out;
}

/**
 * Parses one expression of the file. `src.start` is the document offset of `src.text`; every offset in
 * the returned tree and diagnostics is a document offset. Never throws.
 * Diagnostics: `limits` (text longer than `maxLength`, nesting deeper than `maxDepth`), `syntax` (at
 * the character mathjs reports), `forbidden` (every construct outside the whitelist, on its own range).
 */
export function parseExpression(src: ExprText, options: ParseOptions = {}): Prepared<Expr> {
  const { maxLength, maxDepth, maxChain } = { ...DEFAULT_PARSE_OPTIONS, ...options };
  const text = src.text;
  const base = src.start;
  const whole = { start: base, end: base + text.length };
  try {
    if (text.length > maxLength) {
      return {
        result: null,
        diagnostics: [diagnostic('limits', whole.start, whole.end, `The expression is ${text.length} characters long; the limit is ${maxLength}.`)],
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
            diagnostics: [diagnostic('limits', base + t.start, base + t.end, `Brackets are nested more than ${maxDepth} deep.`)],
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
      return { result: null, diagnostics: [diagnostic('limits', whole.start, whole.end, `The expression is nested more than ${maxDepth} deep.`)] };
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
