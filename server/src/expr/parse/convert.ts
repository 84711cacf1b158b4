/**
 * Conversion of mathjs's tree to our `Expr` through a whitelist of node types, operators and functions;
 * everything else is a `forbidden` diagnostic on its exact document range.
 */
import type { Span } from '../../language/ast';
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import { didYouMean } from '../../language/suggest';
import type { Expr } from '../types';
import { BUILTINS, builtin } from '../builtins/table';
import { DISABLED_FUNCTIONS, UNSAFE_NAMES, type MathNode } from './instance';
import type { Tok } from './tokens';

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

/** Why each node type outside the whitelist is refused. */
const REFUSED: Record<string, string> = {
  AssignmentNode: 'Assignments are not allowed in an expression; use a let line.',
  FunctionAssignmentNode: 'Function definitions are not allowed in an expression.',
  AccessorNode: 'Property and index access is not allowed.',
  ArrayNode: 'Lists and matrices are not allowed.',
  ObjectNode: 'Objects are not allowed.',
  RangeNode: "Ranges ('a:b') are not allowed.",
  BlockNode: 'Only one expression is allowed here.',
};

export class Converter {
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

  /** A number literal; infinities, NaN and non-numbers are refused. */
  private constant(node: MathNode, s: Span): Expr | null {
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

  /** A call: only the built-in functions, by name; `name (...)` of another name reads as a product. */
  private call(node: MathNode, s: Span): Expr | null {
    const fnNode = node['fn'] as MathNode;
    if (fnNode.type !== 'SymbolNode' || node['optional'])
      return this.forbid(node, 'Only the built-in functions may be called.');
    const ns = this.at(fnNode);
    const name = this.text.slice(ns.start - this.offset, ns.end - this.offset) || String(fnNode['name']);
    if (!builtin(name) || UNSAFE_NAMES.has(name)) {
      const hint = didYouMean(name, BUILTINS.map((f) => f.name));
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

  convert(node: MathNode): Expr | null {
    const s = this.at(node);
    switch (node.type) {
      case 'ConstantNode':
        return this.constant(node, s);
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
      case 'FunctionNode':
        return this.call(node, s);
      default:
        return this.forbid(node, Object.hasOwn(REFUSED, node.type) ? REFUSED[node.type]! : `This construct (${node.type}) is not allowed.`);
    }
  }
}

/**
 * Refusals found from tokens alone, reported beside a syntax error so that an escape attempt that also
 * fails to parse is still named: unsafe or disabled names, strings, and property access with `.`.
 */
export function tokenLevelRefusals(tokens: Tok[], base: number): EngineDiagnostic[] {
  const out: EngineDiagnostic[] = [];
  for (let j = 0; j < tokens.length; j++) {
    const t = tokens[j]!;
    if (t.kind === 'sym' && (UNSAFE_NAMES.has(t.text) || DISABLED_FUNCTIONS.includes(t.text) || t.text.startsWith('__')))
      out.push(diagnostic('forbidden', base + t.start, base + t.end, `The name '${t.text}' is not allowed.`));
    else if (t.kind === 'str') out.push(diagnostic('forbidden', base + t.start, base + t.end, 'Strings are not allowed in an expression.'));
  }
  return out;
}

