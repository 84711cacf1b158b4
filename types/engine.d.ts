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
  /** Numerical systems: true on a level the solver did not resolve to 1e-9 (absent otherwise). */
  unresolved?: boolean;
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
    /** The label n of the first level: 0 for the oscillator, 1 otherwise. */
    firstLabel: number;
    energies: number[];
    uncertainties?: number[];
    /** Numerical systems: the label of the first level not resolved to 1e-9 (absent when all are). */
    unresolvedFrom?: number;
    boundCount?: number;
    center: number | null;
    /** A mass that depends on x: the regions between its interfaces, with the smallest and largest mass in each (m_e in a physical file). */
    mass?: { regions: { from: number | null; to: number | null; min: number; max: number }[]; unit: string | null };
  } | null;
  decay: {
    exponent: number | null;
    classification: 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown';
    at: number | null;
    /** r in |c_n| ~ e^{-r n} when the fall is geometric, else null. */
    rate?: number | null;
    /** First and last level n of the tail fitted, or null. */
    range?: [number, number] | null;
  } | null;
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
  /** A file with `sweep` lines: the sweep (docs/format.md, "Sweeps"). */
  sweep?: EngineSweep;
}

/**
 * The result of a design sweep (`EngineResult.sweep`, a file with `sweep` lines): one or two `sweep`
 * lines, each varying a `let` over a range, and at every point the numbers of the expansion and the
 * verdict of every `expect` line (server/src/analysis/sweep/). This shape is the contract of
 * `expand --json`'s `sweep` field, `eigenspan sweep --json`, the editor's `eigenspan/sweepResult` and
 * of any view drawn from a sweep; docs/format.md ("Sweeps") documents it field by field.
 *
 * Units: swept values, window ends and located points are in the swept `let`'s display unit (`unit`,
 * the file's unit for its dimension as the `let` hovers show it); energies in the file's energy unit.
 */

/** One swept axis (one `sweep` line). */
export interface EngineSweepAxis {
  /** The swept `let` name. */
  name: string;
  /** The unit the values are shown in, or null (natural units, dimensionless). */
  unit: string | null;
  from: number;
  to: number;
  steps: number;
  spacing: 'linear' | 'log';
  /** The steps + 1 values of the axis, in order from `from` to `to`. */
  values: number[];
}

/** The numbers of one point of the sweep. */
export interface EngineSweepPoint {
  /** Index along each axis ([i] or [i, j]). */
  index: number[];
  /** The swept values at this point, one per axis (display units). */
  at: number[];
  /** False when the setup is invalid here (a negative width, a state that cannot be evaluated): see `problem`. */
  valid: boolean;
  /** The first error at an invalid point, as its message says it; null at a valid point. */
  problem: string | null;
  /** Codes of the warnings the analysis gave at this point (boundary, basis, continuum, ...), sorted, without `expect`. */
  findings: string[];
  /** The lowest levels (at most 10): label, energy and population |c_n|^2 of the normalised state. */
  levels: { n: number; energy: number; weight: number }[];
  /** Sum of the populations over the levels computed. */
  captured: number | null;
  /** Finite well: 1 - the bound-state weight; null elsewhere. */
  continuum: number | null;
  /** Energy mean and spread of the normalised state (null where they diverge or were not measured). */
  mean: number | null;
  spread: number | null;
  /**
   * Bound levels: a finite well's count; for a numerical potential the levels below the lower of V at
   * the two walls, when one of the system's first 20 levels lies above it (null otherwise, and for the
   * box and the oscillator, which bind every level).
   */
  bound: number | null;
  /** Each ordinary `expect` line's verdict here, in the order of `EngineSweep.expects`. */
  expects: boolean[];
}

/** One ordinary `expect` line, as the verdicts refer to it. */
export interface EngineSweepExpect {
  /** 1-based line of the `expect` statement. */
  line: number;
  /** The statement's text, trimmed. */
  text: string;
}

/**
 * A place located by refinement between two neighbouring points along one axis (`axis`: 0 the first,
 * 1 the second of a map, the other axis fixed): where the bound count changes (`kind` `bound`, `before`
 * and `after` the counts on either side in the direction of the sweep) or where an `expect` line starts
 * or stops holding (`kind` `expect`, `expect` its index, `before`/`after` 1 for holds and 0 for fails).
 * `at` is the middle of the final bracket `[lo, hi]`, values of the axis refined.
 */
export interface EngineSweepLocated {
  kind: 'bound' | 'expect';
  /** The axis refined along: 0 (the first sweep line) or 1 (the second, in a map). */
  axis: 0 | 1;
  expect?: number;
  at: number;
  bracket: [number, number];
  before: number;
  after: number;
  /** In a map: the other axis's value where it was found (the second's for `axis` 0, the first's for `axis` 1); null in one parameter. */
  row: number | null;
}

/** A sub-range of the first axis where every ordinary `expect` holds. */
export interface EngineSweepWindow {
  from: number;
  to: number;
  /** True when that end is the sweep's own end (the window may reach beyond the range swept). */
  fromEdge: boolean;
  toEdge: boolean;
  /** As in `EngineSweepLocated.row`. */
  row: number | null;
  /**
   * True when the sweep stopped short (`EngineSweep.stopped`): the window is over the points that
   * finished, its ends are at points (not refined), and an end beside a point not reached may reach further.
   */
  partial: boolean;
}

/** Everything a sweep found. */
export interface EngineSweep {
  axes: EngineSweepAxis[];
  /**
   * The points, the first axis running fastest (index i + (steps0 + 1) * j); null for a point the
   * budget did not reach.
   */
  points: (EngineSweepPoint | null)[];
  expects: EngineSweepExpect[];
  /** Where bound counts change and `expect` lines flip: along the first axis (each row in a map), then in a map along the second (each column). */
  located: EngineSweepLocated[];
  /** The design window: the sub-ranges of the first axis where every ordinary `expect` holds (every row in a map). */
  windows: EngineSweepWindow[];
  /** True when the system does not depend on a swept name: its eigenbasis was solved once and reused. */
  systemFixed: boolean;
  /** Points finished out of `total`, and why the sweep stopped short (null when it finished). */
  finished: number;
  total: number;
  stopped: 'time' | 'cancelled' | null;
  /** Point analyses run by the refinement (beyond the points themselves). */
  probes: number;
}

/** The default caps. */
export declare const DEFAULT_LIMITS: Readonly<Limits>;

/** The range of each settable cap, [lowest, highest]. */
export declare const LIMIT_RANGES: Readonly<Record<Exclude<keyof Limits, 'maxMillis'>, readonly [number, number]>>;

/** Every diagnostic code with its default severity. */
export declare const CODES: Readonly<Record<Code, Severity>>;

/** Analyses the text of a `.qstate` file; never throws for any text. Throws a RangeError for a bad option. */
export declare function analyse(text: string, options?: EngineOptions): EngineResult;
