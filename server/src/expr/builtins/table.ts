/**
 * The built-in functions, one record each: everything the sandbox (arity), the checker (dimension
 * rules), completion and hover (docs), and the compiler (kernels, real domain, complex forcing,
 * non-negativity, jumps and kinks) know about a function lives in its record here and nowhere else.
 */
import * as K from './kernels';
import type { ComplexKernel, RealKernel } from './kernels';

/**
 * How the checker treats the arguments' dimensions.
 * - `dimensionless`: the argument must be dimensionless; so is the result.
 * - `half`: any argument; the result has half its dimension (sqrt).
 * - `same`: any argument; the result has its dimension (abs, re, im, conj).
 * - `none`: any argument; the result is dimensionless (sign).
 * - `equal`: two arguments of one dimension; the result has it (min, max).
 * - `equal-none`: two arguments of one dimension; the result is dimensionless (atan2).
 * - `phi`: a constant whole level number and a length; the result is a wavefunction.
 */
export type DimensionRule = 'dimensionless' | 'half' | 'same' | 'none' | 'equal' | 'equal-none' | 'phi';

/**
 * How the compiler builds the function's node.
 * - `holomorphic`: `real` and `complex` kernels with exact derivatives.
 * - `step`: piecewise constant (`step` gives the value); jumps where the value changes.
 * - `abs`, `extremum` (min, max), `atan2`, `part` (re, im, conj), `phi`: nodes of their own.
 */
export type BuiltinForm = 'holomorphic' | 'step' | 'abs' | 'extremum' | 'atan2' | 'part' | 'phi';

/** One built-in function. */
export interface Builtin {
  name: string;
  minArgs: number;
  maxArgs: number;
  /** One-line description for completion and hover. */
  doc: string;
  dimensions: DimensionRule;
  form: BuiltinForm;
  /** f, f', f'' of a real argument (holomorphic functions). */
  real?: RealKernel;
  /** f, f', f'' of a complex argument (holomorphic functions). */
  complex?: ComplexKernel;
  /** The real arguments [lo, hi] on which `real` gives the real value (default: every real number). */
  realDomain?: readonly [number, number];
  /**
   * When the result may be non-real for real arguments: `never`, `always` (unless the argument is a
   * constant, which is folded), or `negative` (unless the argument is provably >= 0).
   */
  forcesComplex: 'never' | 'always' | 'negative';
  /**
   * When the result is provably real and >= 0: `never`, `always`, `real` (for a real argument), or
   * `args` (when every argument is).
   */
  nonneg: 'never' | 'always' | 'real' | 'args';
  /** The piecewise-constant value of a `step` function (also its jump indicator). */
  step?: (u: number) => number;
  /**
   * Where the function breaks for real arguments: `jump` (the value jumps where `step` changes, so the
   * argument's own kinks cannot show), `kink` (the derivative jumps where the argument, or for min and
   * max the difference of the arguments, changes sign), or `none`.
   */
  breaks: 'none' | 'jump' | 'kink';
  /** Real arguments where the value jumps (for the table's own test). */
  jumpsAt?: readonly number[];
}

const ALL: readonly [number, number] = [-Infinity, Infinity];
const HALF_LINE: readonly [number, number] = [0, Infinity];
const UNIT_INTERVAL: readonly [number, number] = [-1, 1];

function holomorphic(
  name: string,
  doc: string,
  real: RealKernel,
  complex: ComplexKernel,
  more: Partial<Pick<Builtin, 'realDomain' | 'forcesComplex' | 'nonneg' | 'dimensions'>> = {},
): Builtin {
  return { name, minArgs: 1, maxArgs: 1, doc, dimensions: 'dimensionless', form: 'holomorphic', real, complex, realDomain: ALL, forcesComplex: 'never', nonneg: 'never', breaks: 'none', ...more };
}

function step(name: string, doc: string, f: (u: number) => number, jumpsAt: readonly number[], dimensions: DimensionRule): Builtin {
  return { name, minArgs: 1, maxArgs: 1, doc, dimensions, form: 'step', step: f, forcesComplex: 'never', nonneg: 'never', breaks: 'jump', jumpsAt };
}

function one(name: string, doc: string, form: BuiltinForm, dimensions: DimensionRule, nonneg: Builtin['nonneg'], breaks: Builtin['breaks'] = 'none'): Builtin {
  return { name, minArgs: 1, maxArgs: 1, doc, dimensions, form, forcesComplex: 'never', nonneg, breaks };
}

function two(name: string, doc: string, form: BuiltinForm, dimensions: DimensionRule, nonneg: Builtin['nonneg'], breaks: Builtin['breaks']): Builtin {
  return { name, minArgs: 2, maxArgs: 2, doc, dimensions, form, forcesComplex: 'never', nonneg, breaks };
}

/** Every built-in function, in the order completion lists them. `phi` is limited to `psi(x)` of a file with a system. */
export const BUILTINS: readonly Builtin[] = [
  holomorphic('exp', 'exp(z): the exponential e^z', K.realExp, K.complexExp, { nonneg: 'real' }),
  holomorphic('log', 'log(z): natural logarithm (principal value)', K.realLog, K.complexLog, { realDomain: HALF_LINE, forcesComplex: 'negative' }),
  holomorphic('log10', 'log10(z): base-10 logarithm', K.realLog10, K.complexLog10, { realDomain: HALF_LINE, forcesComplex: 'negative' }),
  holomorphic('sqrt', 'sqrt(z): principal square root; halves the dimension', K.realSqrt, K.complexSqrt, {
    realDomain: HALF_LINE,
    forcesComplex: 'negative',
    nonneg: 'real',
    dimensions: 'half',
  }),
  one('abs', 'abs(z): absolute value |z|', 'abs', 'same', 'always', 'kink'),
  step('sign', 'sign(x): -1, 0 or 1', K.signOf, [0], 'none'),
  holomorphic('sin', 'sin(z): sine (radians)', K.realSin, K.complexSin),
  holomorphic('cos', 'cos(z): cosine (radians)', K.realCos, K.complexCos),
  holomorphic('tan', 'tan(z): tangent (radians)', K.realTan, K.complexTan),
  holomorphic('asin', 'asin(z): inverse sine (principal value)', K.realAsin, K.complexAsin, { realDomain: UNIT_INTERVAL, forcesComplex: 'always' }),
  holomorphic('acos', 'acos(z): inverse cosine (principal value)', K.realAcos, K.complexAcos, { realDomain: UNIT_INTERVAL, forcesComplex: 'always', nonneg: 'real' }),
  holomorphic('atan', 'atan(x): inverse tangent', K.realAtan, K.complexAtan),
  two('atan2', 'atan2(y, x): angle of the point (x, y)', 'atan2', 'equal-none', 'never', 'none'),
  holomorphic('sinh', 'sinh(z): hyperbolic sine', K.realSinh, K.complexSinh),
  holomorphic('cosh', 'cosh(z): hyperbolic cosine', K.realCosh, K.complexCosh, { nonneg: 'real' }),
  holomorphic('tanh', 'tanh(z): hyperbolic tangent', K.realTanh, K.complexTanh),
  holomorphic('sech', 'sech(z): hyperbolic secant 1/cosh(z)', K.realSech, K.complexSech, { nonneg: 'real' }),
  step('floor', 'floor(x): largest integer <= x', Math.floor, [-2, -1, 0, 1, 2], 'dimensionless'),
  step('ceil', 'ceil(x): smallest integer >= x', Math.ceil, [-2, -1, 0, 1, 2], 'dimensionless'),
  step('round', 'round(x): nearest integer', K.roundHalfAway, [-1.5, -0.5, 0.5, 1.5], 'dimensionless'),
  two('min', 'min(a, b): the smaller of two real values', 'extremum', 'equal', 'args', 'kink'),
  two('max', 'max(a, b): the larger of two real values', 'extremum', 'equal', 'args', 'kink'),
  one('re', 're(z): real part', 'part', 'same', 'args'),
  one('im', 'im(z): imaginary part', 'part', 'same', 'never'),
  one('conj', 'conj(z): complex conjugate', 'part', 'same', 'args'),
  { name: 'phi', minArgs: 2, maxArgs: 2, doc: "phi(n, x): the system's eigenfunction n (only in psi(x))", dimensions: 'phi', form: 'phi', forcesComplex: 'never', nonneg: 'never', breaks: 'none' },
];

const BY_NAME: ReadonlyMap<string, Builtin> = new Map(BUILTINS.map((b) => [b.name, b]));

/** The record of built-in `name`, or undefined. */
export function builtin(name: string): Builtin | undefined {
  return BY_NAME.get(name);
}
