/**
 * Type declarations of `require('eigenspan/engine')` (hand-kept; test/cli/engine.test.ts checks them
 * against server/src/api/engine.ts, test/cli/engineShape.test.ts against the results the built engine
 * really returns). docs/api.md describes the result object.
 */

/** How serious a finding is. */
export type Severity = 'error' | 'warning' | 'info';

/** A stable diagnostic code. */
export type Code = 'syntax' | 'name' | 'units' | 'evaluation' | 'forbidden' | 'limits' | 'norm' | 'boundary' | 'convergence' | 'basis' | 'continuum' | 'parity' | 'expect' | 'data';

/** Resource caps; `maxMillis` is the time limit of one analysis in milliseconds. */
export interface Limits {
  maxBasis: number;
  maxGridPoints: number;
  maxExpressionLength: number;
  maxNesting: number;
  maxFileBytes: number;
  maxStatements: number;
  maxEvolveSteps: number;
  maxMillis: number;
}

/** Options of `analyse`. */
export interface EngineOptions {
  /** Levels to project on when the text has no `basis` line (default 40). */
  defaultBasis?: number;
  /** Caps and the time limit (`maxMillis`); a cap outside its range in LIMIT_RANGES is refused. */
  limits?: Partial<Limits>;
}

/** A finding, 1-based; columns count UTF-16 code units. */
export interface EngineFinding {
  line: number;
  column: number;
  endLine: number;
  endColumn: number;
  severity: Severity;
  code: Code;
  message: string;
}

/** One level of the expansion. */
export interface EngineLevel {
  n: number;
  energy: number;
  re: number;
  im: number;
  weight: number;
  uncertainty?: number;
}

/** The result of `analyse`: the fields of `eigenspan expand --json`. */
export interface EngineResult {
  levels: EngineLevel[];
  norm: number | null;
  captured: number | null;
  energy: { mean: number | null; spread: number | null };
  parity: 'even' | 'odd' | 'mixed' | null;
  continuum?: number;
  diagnostics: EngineFinding[];
  units: { length: string | null; energy: string | null; time: string | null };
  system: {
    kind: 'box' | 'well' | 'oscillator' | 'potential';
    energies: number[];
    uncertainties?: number[];
    boundCount?: number;
    center: number | null;
  } | null;
  decay: { exponent: number | null; classification: 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown'; at: number | null } | null;
  levelsFor999: number | null;
  evolution?: { times: number[]; meanX: number[]; meanP: number[]; survival: number[]; revival: number | null };
}

/** The default caps. */
export declare const DEFAULT_LIMITS: Readonly<Limits>;

/** The range of each settable cap, [lowest, highest]. */
export declare const LIMIT_RANGES: Readonly<Record<Exclude<keyof Limits, 'maxMillis'>, readonly [number, number]>>;

/** Every diagnostic code with its default severity. */
export declare const CODES: Readonly<Record<Code, Severity>>;

/** Analyses the text of a `.qstate` file; never throws for any text. Throws a RangeError for a bad option. */
export declare function analyse(text: string, options?: EngineOptions): EngineResult;
