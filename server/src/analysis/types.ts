/**
 * The result of analysing one `.qstate` file: what every front end (command line, language server,
 * panel) shows. Energies are in the file's energy unit (or natural units), lengths in its length
 * unit, times in its time unit (or the internal hbar/energy unit when the file names none).
 */
import type { EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';
import type { SweepResult } from './sweep/types';

/** One level of the expansion. */
export interface LevelResult {
  n: number;
  energy: number;
  /** Estimated absolute error of the energy (numerical systems only). */
  uncertainty?: number;
  /** c_n = <phi_n|psi> for the normalised state; null for a mixed state, whose coefficients have no meaning. */
  re: number | null;
  im: number | null;
  /** |c_n|^2. */
  weight: number;
  /** Estimated absolute error of c_n (numerical systems: twice its change between the solver's last two grids). */
  coefficientUncertainty?: number;
  /** Numerical systems: true on a level the solver did not resolve to its tolerance (absent otherwise). */
  unresolved?: true;
}

/** How the coefficients decay with n, fitted over the tail. */
export interface DecayResult {
  /** p in |c_n| ~ n^-p (algebraic), or null when the decay is faster than any power. */
  exponent: number | null;
  classification: 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown';
  /** Where a detected jump or kink sits (file length unit), if found. */
  at: number | null;
  /** r in |c_n| ~ B e^{-r n} when the fall is geometric (each level |c_n| times e^{-r}), else null. */
  rate?: number | null;
  /** First and last level n of the tail fitted (of the levels holding weight, for a finite sum), or null. */
  range?: [number, number] | null;
}

/** Time evolution on a grid of times. */
export interface EvolutionResult {
  times: number[];
  meanX: number[];
  meanP: number[];
  survival: number[];
  /** Revival time (spectrum-based or the first revival of the survival probability), or null. */
  revival: number | null;
  /** |psi(x, t)|^2 on `samples.x` for each time (panel only; omitted from the command line's JSON). */
  density?: number[][];
  /**
   * The survival's own fine time grid (same unit as `times`), 0 to the `evolve` end in a whole number of
   * intervals per evolve step (so every evolve time is on it), at least 16 a period of the fastest beat
   * between the levels holding 99.9 % of the weight, at most 4097 points. Absent when the time limit
   * stopped the evolution.
   */
  survivalTimes?: number[];
  /** The survival probability on `survivalTimes` (`survival` stays parallel to `times`). */
  survivalFine?: number[];
}

/** Samples for plots (panel only). */
export interface SampleResult {
  x: number[];
  re: number[];
  im: number[];
  /** The potential on x (finite values; hard walls marked by `walls`). */
  potential: number[];
  /** The eigenfunctions on x, phi[k][j] for level index k (capped in count); the panel builds partial sums from these. */
  phi: number[][];
  walls: [number, number] | null;
  /** A sampled state (`samples("PATH")`): its samples, normalised like `re` and `im`, for the panel to draw over the reconstruction. */
  data?: { x: number[]; re: number[]; im: number[] };
  /** A mass that depends on x: its value on x (in `massUnit`: m_e in a physical file) and the interfaces where it jumps. */
  mass?: number[];
  interfaces?: number[];
  massUnit?: string | null;
  /** A mixed state: its density <x|rho|x> on x (then `re` and `im` are all 0: a mixture has no wave function). */
  density?: number[];
}

/** What a file's energy unit is (see `AnalysisResult.units`). */
export type EnergyKind = 'energy' | 'frequency' | 'wavenumber';

/** Everything known about a file after analysis. */
export interface AnalysisResult {
  /** The parsed file (null only if parsing itself was skipped). */
  file: QFile | null;
  diagnostics: EngineDiagnostic[];
  /**
   * Unit names; `energyKind` says what the energy unit is: an `energy`, a `frequency` f standing for the
   * energy h f (`units um, MHz`: energies are E / h in MHz), or a `wavenumber` (`invcm`: E / (h c) in 1/cm).
   * Absent in natural units.
   */
  units: { length: string | null; energy: string | null; time: string | null; energyKind?: EnergyKind };
  /**
   * What the `expect revival` and `expect mean` lines measured (for hovers; not in the JSON): the
   * statement's start offset, the value in the unit it is compared in, and that unit (null when none).
   */
  measured?: { start: number; value: number | null; unit: string | null }[];
  system: {
    kind: 'box' | 'well' | 'oscillator' | 'potential';
    /** The label n of the first level (the basis's `firstLabel`: 0 for the oscillator, 1 otherwise). */
    firstLabel: number;
    /** The first levels' energies (for hovers on the system line), at most 20. */
    energies: number[];
    uncertainties?: number[];
    /** Numerical systems: the label of the first level not resolved to the solver's tolerance (absent when all are). */
    unresolvedFrom?: number;
    boundCount?: number;
    center: number | null;
    /**
     * A mass that depends on x: the regions between its interfaces (null ends: the open line), with the
     * smallest and largest mass in each, in `unit` (m_e in a physical file, null in natural units).
     */
    mass?: { regions: { from: number | null; to: number | null; min: number; max: number }[]; unit: string | null };
  } | null;
  levels: LevelResult[];
  /** Integral of |psi|^2 as written (file units). */
  norm: number | null;
  /** Sum of weights over the levels computed. */
  captured: number | null;
  /**
   * Tr rho^2 of the state: 1 for a pure state, below 1 for a mixture (mixed.ts says how it is computed).
   * Optional: absent where no state was measured.
   */
  purity?: number;
  /** A mixed state's parts: their probabilities (normalised, in the order written or of the levels) and the thermal weight left out. */
  mixture?: { kind: 'thermal' | 'mixture'; weights: number[]; omitted: number };
  energy: { mean: number | null; spread: number | null } | null;
  parity: 'even' | 'odd' | 'mixed' | null;
  /** Finite well only: 1 - sum of bound-state weights. */
  continuum?: number;
  /**
   * Oscillator only: the mean quantum number <n> = (<E> - E_0) / (hbar omega) = sum_n n |c_n|^2, or
   * null when the energy mean is not finite.
   */
  meanQuantumNumber?: number | null;
  decay: DecayResult | null;
  /** The smallest number of levels whose weights add up to 0.999 of the state, if reached. */
  levelsFor999: number | null;
  evolution: EvolutionResult | null;
  samples: SampleResult | null;
  /**
   * A point where the state is infinite, as measured: |psi| ~ |x - x0|^-power (or logarithmic growth),
   * whether |psi|^2 is integrable across it, and (for an integrable spike) the share of |psi|^2 too close
   * to it for double precision to sample. Optional; absent or null when there is none.
   */
  singularity?: { x: number; power: number; logarithmic: boolean; integrable: boolean; unresolvedWeight: number } | null;
  /**
   * Work the analysis's budget counted: `ops` (one per level per node projected, one per node
   * evaluated) and `points` (nodes evaluated). Deterministic for a given file and caps, so tests can
   * bound a stage's cost without timing it. Optional.
   */
  work?: { ops: number; points: number };
  /** Milliseconds spent (on the analysis's clock). */
  elapsedMs: number;
  /**
   * The value of each `let` name in the file's units (for hovers and inlay hints), in file order.
   * Optional: front ends show the expression text when it is absent. `unit` is the unit the value is
   * shown in (null for natural units or a dimensionless value).
   */
  values?: { name: string; re: number; im: number; unit: string | null }[];
  /**
   * The sweep of a file with `sweep` lines (analysis/sweep/types.ts, docs/format.md "Sweeps"), when the
   * front end ran it (`analyseWithSweep`, the command line); every other field keeps the lets' own values.
   */
  sweep?: SweepResult;
}
