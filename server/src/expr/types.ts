/**
 * Contracts of the expression layer: the checked expression tree, dimensions, and compiled functions.
 * The layer turns an `ExprText` into a tree with exact document offsets, refuses what the sandbox
 * forbids, checks physical dimensions once, and compiles to plain closures over numbers in the
 * engine's internal units (hbar = 1; see `UnitSystem`).
 */
import type { EngineDiagnostic } from '../language/catalogue';

/** A node of a checked expression; offsets are document offsets. */
export type Expr =
  | { type: 'number'; value: number; start: number; end: number }
  | { type: 'symbol'; name: string; start: number; end: number }
  | { type: 'unary'; op: '-' | '+' | 'not'; arg: Expr; start: number; end: number }
  | {
      type: 'binary';
      op: '+' | '-' | '*' | '/' | '^' | '<' | '<=' | '>' | '>=' | '==' | '!=' | 'and' | 'or';
      left: Expr;
      right: Expr;
      /** True for implicit multiplication such as `2 pi` or `10 nm`. */
      implicit: boolean;
      start: number;
      end: number;
    }
  | { type: 'call'; name: string; args: Expr[]; nameStart: number; nameEnd: number; start: number; end: number }
  | { type: 'conditional'; test: Expr; then: Expr; otherwise: Expr; start: number; end: number };

/**
 * A physical dimension as integer (or half-integer) exponents of length, mass, time and charge, and
 * optionally temperature (absent means 0, so the four-exponent literals stay valid).
 * Dimensionless is [0, 0, 0, 0].
 */
export type Dimension = readonly [number, number, number, number, number?];

/** A complex number. */
export interface Complex {
  re: number;
  im: number;
}

/**
 * The unit system of a file.
 * Natural: hbar = 1 and values carry no units.
 * Physical: every value is converted to internal units where lengths are in `lengthUnit`, energies in
 * `energyUnit`, hbar = 1 (so the internal time unit is hbar / energyUnit), and the internal mass unit
 * is hbar^2 / (energyUnit * lengthUnit^2).
 */
export type UnitSystem =
  | { mode: 'natural' }
  | {
      mode: 'physical';
      length: { name: string; si: number };
      /** `frequency`: the unit is a frequency f standing for the energy h f (`units um, MHz`), `si` is h f in J. */
      energy: { name: string; si: number; frequency?: true };
      /** The unit times are shown in; absent means the internal time unit hbar / energy. */
      time: { name: string; si: number } | null;
    };

/** A named value in scope: a `let` name or a constant. */
export interface ScopeValue {
  /** Value in internal units. */
  value: Complex;
  dimension: Dimension;
  /** Where a `let` name was defined (absent for built-in constants). */
  definedAt?: { start: number; end: number };
}

/** What an expression may refer to besides numbers, units and the built-in functions. */
export interface Scope {
  units: UnitSystem;
  values: Map<string, ScopeValue>;
  /** True inside `psi(x)` and `V(x)`: the symbol `x` is the position (a length in physical mode). */
  hasX: boolean;
  /** True inside `psi(x)` when the file has a system: `phi(n, x)` is its eigenfunction n. */
  hasPhi: boolean;
}

/**
 * Eigenfunctions available to `phi(n, x)`: fills `out` (and the derivatives when asked) with level n
 * at the points `xs` (internal units).
 */
export type PhiProvider = (
  n: number,
  xs: Float64Array,
  out: Float64Array,
  d1?: Float64Array,
  d2?: Float64Array,
) => void;

/** Values of a compiled function of x on a grid, with optional first and second derivatives. */
export interface GridValues {
  re: Float64Array;
  im: Float64Array;
  d1re?: Float64Array;
  d1im?: Float64Array;
  d2re?: Float64Array;
  d2im?: Float64Array;
}

/** A compiled expression of x. */
export interface CompiledFunction {
  /** False when the expression is provably real for real x (no `i`, no complex names). */
  complex: boolean;
  /**
   * Evaluates at every point of `xs` (internal units). `order` 1 or 2 also computes exact
   * derivatives with respect to x (forward-mode differentiation, not finite differences).
   */
  evaluate(xs: Float64Array, order?: 0 | 1 | 2, phi?: PhiProvider): GridValues;
  /**
   * Points in [a, b] where a condition of a `?:` (or a comparison) changes value, or where abs,
   * sqrt, etc. have a kink, located to near machine precision; sorted. Used to split quadrature
   * panels and to report jumps and kinks.
   */
  breakpoints(a: number, b: number, phi?: PhiProvider): number[];
}

/** The outcome of preparing one expression. */
export interface Prepared<T> {
  /** Null when a diagnostic of severity error stops the expression from being used. */
  result: T | null;
  diagnostics: EngineDiagnostic[];
}
