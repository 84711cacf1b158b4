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
  /** c_n of the normalised state; null for a mixed state (thermal, mixture), whose coefficients have no meaning. */
  re: number | null;
  im: number | null;
  /** |c_n|^2, or the population P_n of a mixed state. */
  weight: number;
  uncertainty?: number;
  /** Numerical systems: the uncertainty of re and im (twice their change between the solver's last two grids). */
  coefficientUncertainty?: number;
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
  /** `energyKind`: the energy unit is an `energy`, a `frequency` f standing for h f, or a `wavenumber` (invcm, h c / 1 cm); absent in natural units. */
  units: { length: string | null; energy: string | null; time: string | null; energyKind?: 'energy' | 'frequency' | 'wavenumber' };
  system: {
    kind: 'box' | 'well' | 'oscillator' | 'potential';
    energies: number[];
    uncertainties?: number[];
    boundCount?: number;
    center: number | null;
    /** A mass that depends on x: the regions between its interfaces, with the smallest and largest mass in each (m_e in a physical file). */
    mass?: { regions: { from: number | null; to: number | null; min: number; max: number }[]; unit: string | null };
  } | null;
  decay: { exponent: number | null; classification: 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown'; at: number | null } | null;
  levelsFor999: number | null;
  evolution?: {
    times: number[];
    meanX: number[];
    meanP: number[];
    survival: number[];
    revival: number | null;
    /** The survival probability on its own fine time grid, independent of the evolve steps. */
    survivalTimes?: number[];
    survivalFine?: number[];
  };
  /** Tr rho^2: 1 for a pure state. */
  purity?: number;
  /** Mixed states only: the parts' probabilities as used and the share of a thermal sum left out. */
  mixture?: { kind: 'thermal' | 'mixture'; weights: number[]; omitted: number };
  /** Oscillators only: the mean quantum number <n>; null when the energy mean diverges. */
  meanQuantumNumber?: number | null;
}

/** The default caps. */
export declare const DEFAULT_LIMITS: Readonly<Limits>;

/** The range of each settable cap, [lowest, highest]. */
export declare const LIMIT_RANGES: Readonly<Record<Exclude<keyof Limits, 'maxMillis'>, readonly [number, number]>>;

/** Every diagnostic code with its default severity. */
export declare const CODES: Readonly<Record<Code, Severity>>;

/** Analyses the text of a `.qstate` file; never throws for any text. Throws a RangeError for a bad option. */
export declare function analyse(text: string, options?: EngineOptions): EngineResult;
