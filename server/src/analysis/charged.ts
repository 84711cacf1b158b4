/**
 * Evaluations of a state charged to the budget. A state is evaluated on every grid of the expansion and
 * again by the window scan, the parity, the walls, the breakpoints and the plot, and a formula costs far
 * more than one counted operation per point: uncounted, these evaluations were 100 to 300 ms of every
 * analysis on a loaded machine that no deadline saw. Charged here (`budget.spend`), they poll the clock
 * as they go, so a stage that follows one sees the deadline, and a clock of counted work sees them too.
 *
 * The charges are estimates of cost, not of time: a fixed number of operations per point for each
 * kind of state (measured on this machine: 400 to 1,600 counted operations per microsecond, one counted
 * operation about a nanosecond), so results never depend on the clock.
 */
import type { Budget } from '../physics/budget';
import type { Eigenbasis } from '../physics/types';
import type { StateFunction } from './systems';
import type { PhiProvider } from '../expr/types';

/**
 * Counted operations per point of a Gaussian packet (an exponential, a cosine and a sine: measured
 * 40-60 ns a point with two derivatives).
 */
export const GAUSSIAN_POINT_OPS = 48;

/**
 * Counted operations per point and per character of a formula, for each order of derivative computed
 * (measured 20-60 ns a point for `x * (1 - x)` to about 200 ns for an 80-character conditional, on
 * values and two derivatives: about 2-3 ns per character; the 16 is the fixed cost of a call).
 */
export const FORMULA_OPS_PER_CHAR = 2;
export const FORMULA_BASE_OPS = 16;

/**
 * Counted operations per table entry of a level (one level at one point), as the projection counts them
 * (expand.ts: a Hermite recurrence step or a closed form, about 30-110 ns an entry).
 */
export const LEVEL_ENTRY_OPS = 32;

/** Operations per point of a formula of `length` characters, for values only. */
export function formulaPointOps(length: number): number {
  return FORMULA_BASE_OPS + FORMULA_OPS_PER_CHAR * length;
}

/**
 * Operations per point of a table of `levels` levels from level index `from` (a recurrence, the
 * oscillator's, or a sine series, a numerical basis's, works through every level below; a closed form,
 * the box's and the well's, computes only the rows asked for).
 */
export function tableOps(basis: Eigenbasis, levels: number, from = 0): number {
  const rows = basis.kind === 'oscillator' || basis.kind === 'potential' ? levels : Math.max(0, levels - from);
  return LEVEL_ENTRY_OPS * Math.max(1, rows);
}

/**
 * The same state, each evaluation charged `pointOps` operations per point per order computed (values,
 * first and second derivative). Evaluation is one vectorised call, so it is never cut; the charge polls
 * the clock, and the caller's next `expired()` sees the deadline.
 */
export function charged(state: StateFunction, budget: Budget, pointOps: number): StateFunction {
  return {
    ...state,
    evaluate(xs, order) {
      budget.spend(pointOps * (1 + order) * xs.length);
      return state.evaluate(xs, order);
    },
  };
}

/** The `phi(n, x)` provider of a formula, each table it makes charged as `tableOps` says (level n only). */
export function chargedPhi(phi: PhiProvider, basis: Eigenbasis, budget: Budget): PhiProvider {
  return (n, xs, out, d1, d2) => {
    const k = Math.max(0, Math.round(n) - basis.firstLabel);
    if (Number.isFinite(k)) budget.spend(tableOps(basis, Math.min(k, basis.count) + 1, k) * (1 + (d1 ? 1 : 0) + (d2 ? 1 : 0)) * xs.length);
    phi(n, xs, out, d1, d2);
  };
}

/**
 * Counted operations per grid node of the energy integrals (<H> and the spread: the potential evaluated
 * twice over the grid, a numerical one through its formula, and two passes of a few multiplications).
 */
export const ENERGY_POINT_OPS = 128;
