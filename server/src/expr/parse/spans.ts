/**
 * Source spans of mathjs nodes, from a walk of the tree in source order that consumes the tokens, and
 * the tree's shape (nesting depth and chain length) for the caps.
 */
import type { Span } from '../../language/ast';
import type { MathNode } from './instance';
import type { Tok } from './tokens';

// ---------------------------------------------------------------------------------------------------
// Spans: walk the mathjs tree in source order, consuming tokens.

const join = (a: Span, b: Span): Span => ({ start: a.start, end: Math.max(a.start, b.end) });

export class Spanner {
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

  /** An operator: prefix, postfix (factorial, transpose, percent) or infix, implicit multiplication included. */
  private operator(node: MathNode): Span {
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

  /** A range `a:b` or `a:s:b`, whose start may be empty. */
  private range(node: MathNode): Span {
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

  private compute(node: MathNode): Span {
    switch (node.type) {
      case 'ConstantNode':
      case 'SymbolNode':
        return this.take();
      case 'ParenthesisNode': {
        const a = this.take();
        this.span(node['content'] as MathNode);
        return join(a, this.take());
      }
      case 'OperatorNode':
        return this.operator(node);
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
      case 'RangeNode':
        return this.range(node);
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
export function treeShape(root: MathNode): { depth: number; chain: number } {
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

