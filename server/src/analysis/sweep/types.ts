/**
 * The result of a design sweep: one or two `sweep` lines, each varying a `let` over a range, and at
 * every point the numbers of the expansion and the verdict of every `expect` line (analysis/sweep/).
 * This shape is the contract of `expand --json`'s `sweep` field, `eigenspan sweep --json` and of any
 * view drawn from a sweep; docs/format.md ("Sweeps") documents it field by field.
 *
 * Units: swept values, window ends and located points are in the swept `let`'s display unit (`unit`,
 * the file's unit for its dimension as the `let` hovers show it); energies in the file's energy unit.
 */

/** One swept axis (one `sweep` line). */
export interface SweepAxis {
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
export interface SweepPoint {
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
  /** Each ordinary `expect` line's verdict here, in the order of `SweepResult.expects`. */
  expects: boolean[];
}

/** One ordinary `expect` line, as the verdicts refer to it. */
export interface SweepExpect {
  /** 1-based line of the `expect` statement. */
  line: number;
  /** The statement's text, trimmed. */
  text: string;
}

/**
 * A place along the first axis located by refinement between two neighbouring points: where the bound
 * count changes (`kind` `bound`, `before` and `after` the counts on either side in the direction of
 * the sweep) or where an `expect` line starts or stops holding (`kind` `expect`, `expect` its index,
 * `before`/`after` 1 for holds and 0 for fails). `at` is the middle of the final bracket `[lo, hi]`.
 */
export interface SweepLocated {
  kind: 'bound' | 'expect';
  expect?: number;
  at: number;
  bracket: [number, number];
  before: number;
  after: number;
  /** In a two-parameter sweep: the second axis's value of the row it was found in; null in one parameter. */
  row: number | null;
}

/** A sub-range of the first axis where every ordinary `expect` holds. */
export interface SweepWindow {
  from: number;
  to: number;
  /** True when that end is the sweep's own end (the window may reach beyond the range swept). */
  fromEdge: boolean;
  toEdge: boolean;
  /** As in `SweepLocated.row`. */
  row: number | null;
}

/** Everything a sweep found. */
export interface SweepResult {
  axes: SweepAxis[];
  /**
   * The points, the first axis running fastest (index i + (steps0 + 1) * j); null for a point the
   * budget did not reach.
   */
  points: (SweepPoint | null)[];
  expects: SweepExpect[];
  /** Where bound counts change and `expect` lines flip, along the first axis (each row in a map). */
  located: SweepLocated[];
  /** The design window: the sub-ranges of the first axis where every ordinary `expect` holds (every row in a map). */
  windows: SweepWindow[];
  /** True when the system does not depend on a swept name: its eigenbasis was solved once and reused. */
  systemFixed: boolean;
  /** Points finished out of `total`, and why the sweep stopped short (null when it finished). */
  finished: number;
  total: number;
  stopped: 'time' | 'cancelled' | null;
  /** Point analyses run by the refinement (beyond the points themselves). */
  probes: number;
}
