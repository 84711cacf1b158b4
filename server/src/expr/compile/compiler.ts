/**
 * Compilation of checked expressions into plain JavaScript closures over typed arrays.
 *
 * - Every subtree that does not depend on x is folded at compile time to one complex number in internal
 *   units (units and constants become their internal-unit values, see `units.ts`).
 * - Evaluation is vectorised: each node allocates its output arrays once per call and fills them in one
 *   loop; no allocation happens per point.
 * - Derivatives are exact forward-mode jets: each node carries value, d/dx and d2/dx2, propagated with the
 *   chain rule y' = f'(u) u', y'' = f''(u) u'^2 + f'(u) u'' and the product and quotient rules.
 * - Real or complex: a function is compiled complex when any node may produce a non-real value from real
 *   x: the imaginary unit or a complex name, `sqrt`, `log`, `log10` of an argument not provably
 *   non-negative, `asin`/`acos` of a non-constant, a power with a non-integer exponent whose base is not
 *   provably non-negative. Otherwise the real fast path runs and the imaginary parts are zero. In
 *   complex mode sqrt, log and powers of negative numbers give the principal value, as mathjs does.
 * - Comparisons are exact (mathjs compares with a relative tolerance of 1e-12) and use real parts;
 *   floor, ceil, round, sign, min, max and atan2 act on real parts in complex mode and have zero
 *   derivative where they are flat.
 * - Evaluation problems are not thrown: NaN and ±Infinity appear in the output arrays (log 0, 1/0,
 *   overflow); `findBadPoint` finds the first such x.
 */
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import { didYouMean } from '../../language/suggest';
import { candidateNames, checkExpression } from '../check';
import { BUILTIN_NUMBERS } from '../constants';
import { lookupPhysical, toInternal } from '../units';
import { builtin } from '../builtins/table';
import { signOf } from '../builtins/kernels';
import type { CompiledFunction, Complex, Dimension, Expr, GridValues, PhiProvider, Prepared, Scope } from '../types';
import { constNode, finish, makeXNode, type CNode, type F64, type Jet } from './jet';
import { addSub, div, mul, neg } from './arith';
import { powConst, powGeneral } from './power';
import { absNode, atan2Node, compare, conditional, extremumNode, flat, holoNode, partNode, phiNode, truthy } from './nodes';
import { findBreakpoints, type Switch } from './breakpoints';

/** The tree walk: one node per expression node, folding constants and recording where features switch. */
class Compiler {
  readonly diagnostics: EngineDiagnostic[] = [];
  readonly switches: Switch[] = [];
  /** True once any node may be complex: then the whole function runs in complex mode. */
  cx = false;
  private readonly x = makeXNode();
  /**
   * Above zero while compiling operands whose value only feeds a discrete result (comparisons, tests,
   * floor...): their own kinks and jumps cannot show in the result except through the outer switch.
   */
  private discrete = 0;
  constructor(readonly scope: Scope) {}

  private register(node: CNode, indicator: (r: number, m: number) => number): void {
    if (this.discrete === 0 && node.cst === null) this.switches.push({ node, indicator });
  }

  private inDiscrete<T>(f: () => T): T {
    this.discrete++;
    try {
      return f();
    } finally {
      this.discrete--;
    }
  }

  private fail(e: { start: number; end: number }, code: 'name' | 'units' | 'syntax', message: string): CNode {
    this.diagnostics.push(diagnostic(code, e.start, e.end, message));
    return constNode({ re: NaN, im: 0 });
  }

  node(e: Expr): CNode {
    const r = this.node0(e);
    if (r.complex) this.cx = true;
    return r;
  }

  private node0(e: Expr): CNode {
    switch (e.type) {
      case 'number':
        return constNode({ re: e.value, im: 0 });
      case 'symbol':
        return this.symbol(e);
      case 'unary': {
        if (e.op === '+') return this.node(e.arg);
        if (e.op === '-') return neg(this.node(e.arg));
        const a = this.inDiscrete(() => this.node(e.arg));
        const node = flat([a], ([u], i) => (truthy(u!, i) ? 0 : 1), true);
        this.register(node, (r) => r);
        return node;
      }
      case 'binary':
        return this.binary(e);
      case 'conditional': {
        const t = this.inDiscrete(() => this.node(e.test));
        const node = conditional(t, this.node(e.then), this.node(e.otherwise));
        if (node.cst !== null) return node;
        this.register(t, (r, m) => (r !== 0 || m !== 0 ? 1 : 0));
        return node;
      }
      case 'call':
        return this.call(e);
    }
  }

  private symbol(e: Extract<Expr, { type: 'symbol' }>): CNode {
    const name = e.name;
    if (name === 'x' && this.scope.hasX) return this.x;
    const v = this.scope.values.get(name);
    if (v) return constNode(v.value);
    const b = BUILTIN_NUMBERS.get(name);
    if (b) return constNode({ re: b.re, im: b.im });
    const phys = lookupPhysical(name);
    if (phys) {
      if (this.scope.units.mode === 'natural') return this.fail(e, 'units', `'${name}' is a unit or physical constant, but the file has no units line.`);
      return constNode({ re: toInternal(phys.si, phys.dimension, this.scope.units), im: 0 });
    }
    return this.fail(e, 'name', `Unknown name '${name}'.${didYouMean(name, candidateNames(this.scope))}`);
  }

  private binary(e: Extract<Expr, { type: 'binary' }>): CNode {
    const logical = !['+', '-', '*', '/', '^'].includes(e.op);
    const a = logical ? this.inDiscrete(() => this.node(e.left)) : this.node(e.left);
    const b = logical ? this.inDiscrete(() => this.node(e.right)) : this.node(e.right);
    switch (e.op) {
      case '+':
        return addSub(a, b, 1);
      case '-':
        return addSub(a, b, -1);
      case '*':
        return mul(a, b);
      case '/':
        return div(a, b);
      case '^':
        return b.cst !== null ? powConst(a, b.cst) : finish(powGeneral(a, b), [a, b]);
      case 'and':
      case 'or': {
        const and = e.op === 'and';
        const node = flat([a, b], ([u, w], i) => ((and ? truthy(u!, i) && truthy(w!, i) : truthy(u!, i) || truthy(w!, i)) ? 1 : 0), true);
        this.register(node, (r) => r);
        return node;
      }
      default: {
        const node = compare(e.op, a, b);
        this.register(node, (r) => r);
        return node;
      }
    }
  }

  private call(e: Extract<Expr, { type: 'call' }>): CNode {
    const f = builtin(e.name);
    if (!f) return this.fail({ start: e.nameStart, end: e.nameEnd }, 'name', `Unknown function '${e.name}'.`);
    // The argument of a function that jumps only feeds a discrete result.
    const args = e.args.map((a) => (f.breaks === 'jump' ? this.inDiscrete(() => this.node(a)) : this.node(a)));
    const a = args[0]!;
    const kink = (node: CNode, indicator: (r: number, m: number) => number, sub: CNode = a): CNode => {
      if (node.cst === null) this.register(sub, indicator);
      return node;
    };
    switch (f.form) {
      case 'holomorphic':
        return holoNode(f, a);
      case 'step': {
        const g = f.step!;
        return kink(flat([a], ([u], i) => g(u!.v[i]!), f.nonneg === 'always'), g);
      }
      case 'abs':
        return a.complex ? absNode(a) : kink(absNode(a), signOf);
      case 'extremum':
        return kink(extremumNode(a, args[1]!, f.name === 'min'), signOf, addSub(a, args[1]!, -1));
      case 'atan2':
        return atan2Node(a, args[1]!);
      case 'part':
        return partNode(a, e.name as 're' | 'im' | 'conj');
      case 'phi': {
        const n = a.cst;
        if (n === null || n.im !== 0 || !Number.isInteger(n.re)) return this.fail(e.args[0]!, 'syntax', 'The level number of phi must be a constant whole number.');
        if (!this.scope.hasPhi) return this.fail(e, 'name', "'phi(n, x)' is only available in psi(x) of a file with a system.");
        return phiNode(n.re, args[1]!);
      }
    }
  }
}

function nodeUsesX(e: Expr): boolean {
  switch (e.type) {
    case 'number':
      return false;
    case 'symbol':
      return e.name === 'x';
    case 'unary':
      return nodeUsesX(e.arg);
    case 'binary':
      return nodeUsesX(e.left) || nodeUsesX(e.right);
    case 'conditional':
      return nodeUsesX(e.test) || nodeUsesX(e.then) || nodeUsesX(e.otherwise);
    case 'call':
      return e.name === 'phi' || e.args.some(nodeUsesX);
  }
}

/**
 * Copies the root's buffers out (they are reused by the next call) into views of one fresh buffer, so a
 * call allocates once. In real mode the imaginary parts are zero arrays created on first access only
 * (reading `im` gives an ordinary Float64Array of zeros), which halves the allocation of real functions.
 */
function jetToGrid(j: Jet, n: number, order: number): GridValues {
  const real = j.vi === null;
  const count = (real ? 1 : 2) * (1 + order);
  const buffer = new ArrayBuffer(count * n * 8);
  let slot = 0;
  const copy = (a: F64): F64 => {
    const out = new Float64Array(buffer, slot++ * n * 8, n);
    out.set(a);
    return out;
  };
  const out = { re: copy(j.v) } as GridValues;
  const zeros = (key: 'im' | 'd1im' | 'd2im') =>
    Object.defineProperty(out, key, {
      configurable: true,
      enumerable: true,
      get() {
        const z = new Float64Array(n);
        Object.defineProperty(out, key, { value: z, writable: true, enumerable: true, configurable: true });
        return z;
      },
    });
  if (real) zeros('im');
  else out.im = copy(j.vi!);
  if (order >= 1) {
    out.d1re = copy(j.d1!);
    if (real) zeros('d1im');
    else out.d1im = copy(j.d1i!);
  }
  if (order >= 2) {
    out.d2re = copy(j.d2!);
    if (real) zeros('d2im');
    else out.d2im = copy(j.d2i!);
  }
  return out;
}

/**
 * Compiles an expression of x (inside `psi(x)` or `V(x)`) into a `CompiledFunction` over internal units.
 * Assumes `checkExpression` has run; names that still do not resolve give diagnostics and a null
 * result. Never throws. See the module comment for how real or complex compilation is chosen.
 */
export function compileFunction(expr: Expr, scope: Scope): Prepared<CompiledFunction> {
  try {
    const comp = new Compiler(scope);
    const root = comp.node(expr);
    if (comp.diagnostics.length > 0) return { result: null, diagnostics: comp.diagnostics };
    const cx = comp.cx || root.complex;
    const switches = comp.switches;
    const cache = new Map<object, Jet>();
    const fn: CompiledFunction = {
      complex: cx,
      evaluate(xs: Float64Array, order: 0 | 1 | 2 = 0, phi?: PhiProvider): GridValues {
        try {
          const j = root.run({ cache, n: xs.length, xs, order, cx, phi });
          return jetToGrid(j, xs.length, order);
        } catch {
          // Only a stack overflow on an extreme tree (or a throwing phi provider) lands here: the values
          // are reported as NaN, which callers detect with findBadPoint.
          const nan = constNode({ re: NaN, im: NaN }).run({ cache: new Map(), n: xs.length, xs, order, cx: true, phi });
          return jetToGrid(nan, xs.length, order);
        }
      },
      breakpoints(a: number, b: number, phi?: PhiProvider): number[] {
        return findBreakpoints(switches, cx, a, b, phi);
      },
    };
    return { result: fn, diagnostics: [] };
  } catch {
    return { result: null, diagnostics: [diagnostic('limits', expr.start, expr.end, 'The expression is nested too deeply to compile.')] };
  }
}

/**
 * Evaluates an expression that must not depend on x (a `let` value, a box end, a depth) to one complex
 * number in internal units, with its dimension. Errors: those of `checkExpression`, `name` when the
 * expression depends on x, `evaluation` when the value is NaN or infinite. Never throws.
 */
export function evaluateConstant(expr: Expr, scope: Scope): Prepared<{ value: Complex; dimension: Dimension }> {
  const checked = checkExpression(expr, { ...scope, hasX: false, hasPhi: false }, null, 'the value');
  if (checked.diagnostics.some((d) => d.severity === 'error') || checked.dimension === null)
    return { result: null, diagnostics: checked.diagnostics };
  if (nodeUsesX(expr)) return { result: null, diagnostics: [diagnostic('name', expr.start, expr.end, 'This value must not depend on x.')] };
  try {
    const comp = new Compiler({ ...scope, hasX: false, hasPhi: false });
    const root = comp.node(expr);
    if (comp.diagnostics.length > 0 || root.cst === null) return { result: null, diagnostics: comp.diagnostics };
    const value = root.cst;
    if (!Number.isFinite(value.re) || !Number.isFinite(value.im))
      return { result: null, diagnostics: [diagnostic('evaluation', expr.start, expr.end, `The value is ${Number.isNaN(value.re) || Number.isNaN(value.im) ? 'not a number' : 'infinite'}.`)] };
    return { result: { value, dimension: checked.dimension }, diagnostics: checked.diagnostics };
  } catch {
    return { result: null, diagnostics: [diagnostic('limits', expr.start, expr.end, 'The expression is nested too deeply to evaluate.')] };
  }
}

/**
 * The first x whose value (real or imaginary part, or any derivative present) is NaN or infinite, or
 * null when every value is finite. Accepts a `GridValues` or a plain array of values.
 */
export function findBadPoint(values: GridValues | Float64Array, xs: Float64Array): number | null {
  const arrays: Float64Array[] =
    values instanceof Float64Array
      ? [values]
      : ([values.re, values.im, values.d1re, values.d1im, values.d2re, values.d2im].filter(Boolean) as Float64Array[]);
  const n = xs.length;
  for (let i = 0; i < n; i++) for (const a of arrays) if (!Number.isFinite(a[i]!)) return xs[i]!;
  return null;
}

