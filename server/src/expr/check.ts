/**
 * Name resolution and dimension analysis of a parsed expression.
 * Rules: sums, differences, comparisons and the branches of `?:` need equal dimensions, except that a
 * literal 0 fits any; exp, log, the trigonometric and hyperbolic functions and floor/ceil/round need
 * dimensionless arguments; sqrt halves the dimension; a power of a dimensional base needs a constant
 * dimensionless exponent. In physical mode a bare number where a dimension is expected "needs a unit".
 */
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import { didYouMean } from '../language/suggest';
import { BUILTIN_NUMBERS, DIM } from './constants';
import { BUILTINS, builtin } from './builtins/table';
import { isDimensionless, lookupPhysical, physicalNames, sameDimension, withArticle } from './units';
import type { Dimension, Expr, Scope } from './types';

/** Dimension of psi: length^(-1/2) in physical mode. */
export const WAVEFUNCTION_DIM: Dimension = [-0.5, 0, 0, 0];

const FUNCTION_NAMES = BUILTINS.map((f) => f.name);

/** 'any' marks a literal zero, which fits every dimension. */
type D = Dimension | 'any' | null;

/** The temperature exponent is carried only when it is not 0, so dimensions without one keep four entries. */
const withTemperature = (d: [number, number, number, number], t: number): Dimension => (t === 0 ? d : [...d, t]);
const scale = (d: Dimension, p: number): Dimension => withTemperature([d[0] * p, d[1] * p, d[2] * p, d[3] * p], (d[4] ?? 0) * p);
const plus = (a: Dimension, b: Dimension, sign: number): Dimension =>
  withTemperature([a[0] + sign * b[0], a[1] + sign * b[1], a[2] + sign * b[2], a[3] + sign * b[3]], (a[4] ?? 0) + sign * (b[4] ?? 0));
const concrete = (d: Dimension | 'any'): Dimension => (d === 'any' ? DIM.none : d);

/** Every name an expression could have meant, for "did you mean". */
export function candidateNames(scope: Scope): string[] {
  const out = [...scope.values.keys(), ...BUILTIN_NUMBERS.keys(), ...FUNCTION_NAMES];
  if (scope.units.mode === 'physical') out.push(...physicalNames());
  if (scope.hasX) out.push('x');
  return out;
}

/**
 * The real value of an expression built from numbers, pi, e, real names in scope and + - * / ^,
 * or null when it is not such a constant. Used for exponents and level numbers.
 */
export function foldReal(expr: Expr, scope: Scope): number | null {
  switch (expr.type) {
    case 'number':
      return expr.value;
    case 'symbol': {
      const v = scope.values.get(expr.name);
      if (v) return v.value.im === 0 ? v.value.re : null;
      const b = BUILTIN_NUMBERS.get(expr.name);
      return b && b.im === 0 ? b.re : null;
    }
    case 'unary': {
      const a = foldReal(expr.arg, scope);
      if (a === null || expr.op === 'not') return null;
      return expr.op === '-' ? -a : a;
    }
    case 'binary': {
      const l = foldReal(expr.left, scope);
      const r = foldReal(expr.right, scope);
      if (l === null || r === null) return null;
      switch (expr.op) {
        case '+':
          return l + r;
        case '-':
          return l - r;
        case '*':
          return l * r;
        case '/':
          return l / r;
        case '^':
          return Math.pow(l, r);
        default:
          return null;
      }
    }
    default:
      return null;
  }
}

/** True when the expression contains no name at all (a bare number such as `2.5` or `3/4`). */
function isBareNumber(e: Expr): boolean {
  switch (e.type) {
    case 'number':
      return true;
    case 'symbol':
      return false;
    case 'unary':
      return isBareNumber(e.arg);
    case 'binary':
      return isBareNumber(e.left) && isBareNumber(e.right);
    default:
      return false;
  }
}

class Checker {
  readonly diagnostics: EngineDiagnostic[] = [];
  constructor(readonly scope: Scope) {}

  private get physical(): boolean {
    return this.scope.units.mode === 'physical';
  }

  private err(code: 'name' | 'units' | 'syntax', e: { start: number; end: number }, message: string): null {
    this.diagnostics.push(diagnostic(code, e.start, e.end, message));
    return null;
  }

  /** Unifies two operand dimensions for + - comparisons and branches; reports a mismatch on `at`. */
  private unify(a: D, b: D, at: Expr, verb: string): D {
    if (a === null || b === null) return null;
    if (a === 'any') return b;
    if (b === 'any') return a;
    if (sameDimension(a, b)) return a;
    return this.err('units', at, `${verb} ${withArticle(a)} and ${withArticle(b)}.`);
  }

  private needDimensionless(d: D, arg: Expr, fn: string): boolean {
    if (d === null) return false;
    if (d === 'any' || isDimensionless(d)) return true;
    this.err('units', arg, `'${fn}' needs a dimensionless argument, found ${withArticle(d)}.`);
    return false;
  }

  infer(e: Expr): D {
    switch (e.type) {
      case 'number':
        return e.value === 0 ? 'any' : DIM.none;
      case 'symbol':
        return this.symbol(e);
      case 'unary': {
        const d = this.infer(e.arg);
        if (e.op === 'not') return d === null ? null : DIM.none;
        return d;
      }
      case 'binary':
        return this.binary(e);
      case 'conditional': {
        const t = this.infer(e.test);
        const a = this.infer(e.then);
        const b = this.infer(e.otherwise);
        if (t === null) return null;
        return this.unify(a, b, e, 'The branches of ?: disagree:');
      }
      case 'call':
        return this.call(e);
    }
  }

  private symbol(e: Extract<Expr, { type: 'symbol' }>): D {
    const name = e.name;
    if (name === 'x' && this.scope.hasX) return this.physical ? DIM.length : DIM.none;
    const v = this.scope.values.get(name);
    if (v) return this.physical ? v.dimension : DIM.none;
    if (BUILTIN_NUMBERS.has(name)) return DIM.none;
    const phys = lookupPhysical(name);
    if (phys) {
      if (!this.physical) return this.err('units', e, `'${name}' is a unit or physical constant, but the file has no units line.`);
      return phys.dimension;
    }
    if (name === 'x') return this.err('name', e, "'x' is only defined inside psi(x) and V(x).");
    if (builtin(name)) return this.err('name', e, `'${name}' is a function; call it as ${name}(...).`);
    return this.err('name', e, `Unknown name '${name}'.${didYouMean(name, candidateNames(this.scope))}`);
  }

  private binary(e: Extract<Expr, { type: 'binary' }>): D {
    const l = this.infer(e.left);
    const r = this.infer(e.right);
    switch (e.op) {
      case '+':
        return this.unify(l, r, e, 'Cannot add');
      case '-':
        return this.unify(l, r, e, 'Cannot subtract');
      case '<':
      case '<=':
      case '>':
      case '>=':
      case '==':
      case '!=':
        return this.unify(l, r, e, 'Cannot compare') === null ? null : DIM.none;
      case 'and':
      case 'or':
        return l === null || r === null ? null : DIM.none;
      case '*':
      case '/':
        if (l === null || r === null) return null;
        return plus(concrete(l), concrete(r), e.op === '*' ? 1 : -1);
      case '^': {
        if (l === null || r === null) return null;
        if (r !== 'any' && !isDimensionless(r)) return this.err('units', e.right, `The exponent must be dimensionless, found ${withArticle(r)}.`);
        const base = concrete(l);
        if (isDimensionless(base)) return DIM.none;
        const p = foldReal(e.right, this.scope);
        if (p === null || !Number.isFinite(p))
          return this.err('units', e.right, `A power of ${withArticle(base)} needs a constant exponent.`);
        return scale(base, p);
      }
    }
  }

  private call(e: Extract<Expr, { type: 'call' }>): D {
    const f = builtin(e.name);
    const nameSpan = { start: e.nameStart, end: e.nameEnd };
    if (!f) return this.err('name', nameSpan, `Unknown function '${e.name}'.${didYouMean(e.name, FUNCTION_NAMES)}`);
    if (e.args.length < f.minArgs || e.args.length > f.maxArgs) {
      const want = f.minArgs === f.maxArgs ? `${f.minArgs}` : `${f.minArgs} to ${f.maxArgs}`;
      return this.err('syntax', e, `'${e.name}' takes ${want} argument${f.maxArgs === 1 ? '' : 's'}, found ${e.args.length}.`);
    }
    if (f.dimensions === 'phi') return this.phi(e);
    const ds = e.args.map((a) => this.infer(a));
    if (ds.some((d) => d === null)) return null;
    const d0 = ds[0]!;
    switch (f.dimensions) {
      case 'dimensionless':
        return this.needDimensionless(d0, e.args[0]!, e.name) ? DIM.none : null;
      case 'half':
        return d0 === 'any' ? 'any' : scale(d0 as Dimension, 0.5);
      case 'same':
        return d0;
      case 'none':
        return DIM.none;
      case 'equal':
        return this.unify(d0, ds[1]!, e, `${e.name} cannot compare`);
      case 'equal-none':
        return this.unify(d0, ds[1]!, e, `${e.name} needs arguments of one dimension, found`) === null ? null : DIM.none;
    }
  }

  private phi(e: Extract<Expr, { type: 'call' }>): D {
    if (!this.scope.hasPhi) return this.err('name', { start: e.nameStart, end: e.nameEnd }, "'phi(n, x)' is only available in psi(x) of a file with a system.");
    const n = foldReal(e.args[0]!, this.scope);
    if (n === null || !Number.isInteger(n) || n < 0) this.err('syntax', e.args[0]!, 'The level number of phi must be a constant whole number.');
    const dx = this.infer(e.args[1]!);
    if (dx === null) return null;
    if (this.physical && dx !== 'any' && !sameDimension(dx, DIM.length))
      return this.err('units', e.args[1]!, `phi needs a length as its second argument, found ${withArticle(dx)}.`);
    if (n === null || !Number.isInteger(n) || n < 0) return null;
    return this.physical ? WAVEFUNCTION_DIM : DIM.none;
  }
}

/**
 * Resolves names and infers the dimension of `expr`, then compares it with `expected` (null: anything
 * goes). `what` names the thing in messages ("the potential"). A mismatch is one `units` error naming both
 * dimensions on the expression's range. In natural mode every value is dimensionless and `expected` is
 * not compared. Returns the inferred dimension (null when an error made it unknown). Never throws.
 */
export function checkExpression(
  expr: Expr,
  scope: Scope,
  expected: Dimension | null,
  what: string,
): { dimension: Dimension | null; diagnostics: EngineDiagnostic[] } {
  const c = new Checker(scope);
  let d: D;
  try {
    d = c.infer(expr);
  } catch {
    // Only a stack overflow on an absurdly deep tree can land here.
    c.diagnostics.push(diagnostic('limits', expr.start, expr.end, 'The expression is nested too deeply to check.'));
    return { dimension: null, diagnostics: c.diagnostics };
  }
  if (d === null) return { dimension: null, diagnostics: c.diagnostics };
  if (scope.units.mode === 'natural') return { dimension: DIM.none, diagnostics: c.diagnostics };
  if (d === 'any') return { dimension: expected ?? DIM.none, diagnostics: c.diagnostics };
  if (expected !== null && !sameDimension(d, expected)) {
    const found = isDimensionless(d) && isBareNumber(expr) ? 'a number without a unit' : withArticle(d);
    const hint = isDimensionless(d) ? ' It needs a unit.' : '';
    c.diagnostics.push(diagnostic('units', expr.start, expr.end, `${capitalise(what)}: expected ${withArticle(expected)}, found ${found}.${hint}`));
    return { dimension: d, diagnostics: c.diagnostics };
  }
  return { dimension: d, diagnostics: c.diagnostics };
}

function capitalise(s: string): string {
  return s.length > 0 ? s.charAt(0).toUpperCase() + s.slice(1) : s;
}
