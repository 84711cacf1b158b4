/**
 * Contracts of the physics layer. All quantities are in internal units: hbar = 1, the particle mass
 * is `mass`, lengths and energies in the file's units (or natural units).
 */
import type { Budget } from './budget';

/** The energy eigenbasis of a one-dimensional system. */
export interface Eigenbasis {
  kind: 'box' | 'well' | 'oscillator' | 'potential';
  /** How many levels the basis holds. */
  count: number;
  /** The label n of index 0 (1 for box, well and potential; 0 for the oscillator). */
  firstLabel: number;
  /** Energies by index, ascending. */
  energies: Float64Array;
  /** Estimated absolute error of each energy (numerical systems only). */
  uncertainty?: Float64Array;
  /** The particle mass (internal units); where it depends on x, the one inside the well or the file's default. */
  mass: number;
  /**
   * Present only when the mass depends on the position (a heterostructure): the mass at every x of xs
   * (internal units). The kinetic energy is then integral |psi'|^2 / (2 m(x)) dx.
   */
  masses?(xs: Float64Array): Float64Array;
  /** With `masses`: the points where the mass jumps (interfaces), ascending; each is also in `breakpoints`. */
  massJumps?: number[];
  /** Centre of symmetry of the potential, or null when it has none. */
  center: number | null;
  /** Hard walls (box, potential), or null on the whole line. */
  walls: [number, number] | null;
  /** An interval holding all but ~1e-16 of the weight of every level in the basis. */
  support: [number, number];
  /** Points where the potential jumps (finite well edges, steps); eigenfunctions have a jump in phi'' there. */
  breakpoints: number[];
  /** The potential energy at x (internal units); +Infinity outside hard walls. */
  potential(x: number): number;
  /**
   * Optional vectorised form of `potential`: the potential at every point of xs in one call (numerical
   * systems, where each single-point call would evaluate the compiled expression once).
   */
  potentials?(xs: Float64Array): Float64Array;
  /**
   * Optional closed form of the evolution's matrix elements X_jk = <phi_j|x|phi_k> and
   * D_jk = <phi_j|d/dx|phi_k>, j, k < levels, row-major; `matrixElements` in evolution.ts uses it when present.
   * A costly closed form charges `budget` as it goes and may throw `Stopped` (budget.ts).
   */
  matrixElements?(levels: number, budget?: Budget): { x: Float64Array; d: Float64Array };
  /**
   * Fills out[(k - from) * xs.length + j] with phi_k(xs[j]) for from <= k < levels (and the derivatives
   * when given): the whole table at once, because recurrences make that much cheaper than level by
   * level. `from` (default 0) skips the rows below it, so one high level costs one row of memory (and,
   * for closed forms, one row of work) instead of the whole table up to it.
   */
  table(xs: Float64Array, levels: number, out: Float64Array, d1?: Float64Array, d2?: Float64Array, from?: number): void;
  /**
   * Optional fast path of projection: adds sum_j wRe[j] phi_k(xs[j]) to outRe[k] and sum_j wIm[j] phi_k(xs[j])
   * to outIm[k] for k < levels, without building the table (wIm may be null). `project` uses it when present.
   * It charges `budget` its work node by node and throws `Stopped` (budget.ts) once it runs out.
   */
  weightedSums?(xs: Float64Array, wRe: Float64Array, wIm: Float64Array | null, levels: number, outRe: Float64Array, outIm: Float64Array, budget?: Budget): void;
}

/** A quadrature rule: nodes and weights. */
export interface Quadrature {
  x: Float64Array;
  w: Float64Array;
}
