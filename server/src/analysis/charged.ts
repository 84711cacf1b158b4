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
import { Stopped, type Budget } from '../physics/budget';
import type { Eigenbasis } from '../physics/types';
import type { StateFunction } from './systems';
import type { GridValues, PhiProvider } from '../expr/types';

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
 * Counted operations per level per point of a recurrence that runs through every level below the one
 * asked for (the oscillator's Hermite functions, a numerical basis's sine series): measured about
 * 0.11 ns a level a point for level 4,999 of the oscillator, 4 counted operations at this engine's
 * rate of about one counted operation a nanosecond.
 */
export const RECURRENCE_OPS = 4;

/**
 * Operations per point of a table of `levels` levels from level index `from` (a recurrence, the
 * oscillator's, or a sine series, a numerical basis's, works through every level below; a closed form,
 * the box's and the well's, computes only the rows asked for).
 */
export function tableOps(basis: Eigenbasis, levels: number, from = 0): number {
  if (basis.kind === 'oscillator' || basis.kind === 'potential') return LEVEL_ENTRY_OPS + RECURRENCE_OPS * Math.max(0, levels);
  return LEVEL_ENTRY_OPS * Math.max(1, levels - from);
}

/**
 * Operations of one chunk of an evaluation: a costly one (a high level's recurrence, a long formula on a
 * fine grid) is evaluated chunk by chunk of points, charging each, so the budget is polled as it goes.
 */
export const CHUNK_OPS = 1 << 21;

/**
 * Operations an evaluation may still do once the budget has run out (about 4 ms): a cheap one after the
 * stop (the parity or the plot of a result the limit cut) finishes, a costly one is cut there.
 */
export const CUT_OPS = 1 << 22;

/** Shared by a formula and its `phi(n, x)` provider: set when the provider was cut by the budget. */
export interface CutFlag {
  stopped: boolean;
}

const VALUE_KEYS = ['re', 'im', 'd1re', 'd1im', 'd2re', 'd2im'] as const;

function emptyValues(n: number, order: number): GridValues {
  const out: GridValues = { re: new Float64Array(n), im: new Float64Array(n) };
  if (order >= 1) [out.d1re, out.d1im] = [new Float64Array(n), new Float64Array(n)];
  if (order >= 2) [out.d2re, out.d2im] = [new Float64Array(n), new Float64Array(n)];
  return out;
}

/**
 * The same state, each evaluation charged `pointOps` operations per point per order computed (values,
 * first and second derivative), chunk by chunk of points. Once the budget has run out and the
 * evaluation has charged `CUT_OPS` past that, it throws `Stopped` (the numerical stage ends there and
 * the analysis reports the time limit); values never depend on the chunks (evaluation is pointwise).
 */
export function charged(state: StateFunction, budget: Budget, pointOps: number, cut?: CutFlag): StateFunction {
  return {
    ...state,
    evaluate(xs, order) {
      const per = pointOps * (1 + order);
      const n = xs.length;
      const chunk = Math.max(1, Math.floor(CHUNK_OPS / per));
      let late = 0;
      const pay = (points: number): void => {
        const cost = per * points;
        if (budget.spend(cost)) late += cost;
        if (late > CUT_OPS || cut?.stopped === true) {
          if (cut) cut.stopped = false;
          throw new Stopped(budget.reason ?? 'time');
        }
      };
      if (n <= chunk) {
        pay(n);
        const v = state.evaluate(xs, order);
        pay(0);
        return v;
      }
      const out = emptyValues(n, order);
      for (let s = 0; s < n; s += chunk) {
        const e = Math.min(n, s + chunk);
        pay(e - s);
        const v = state.evaluate(xs.subarray(s, e), order);
        pay(0);
        for (const key of VALUE_KEYS) {
          const part = v[key];
          const whole = out[key];
          if (part && whole) whole.set(part, s);
        }
      }
      return out;
    },
  };
}

/**
 * The `phi(n, x)` provider of a formula, each table it makes charged as `tableOps` says (level n only),
 * chunk by chunk of points. It cannot throw through the compiled formula (which reads a throw as a bad
 * value): once the budget has run out and it has charged `CUT_OPS` past that, it fills the rest with
 * zeros and sets `cut.stopped`, and the formula's `charged` wrapper throws `Stopped` after it.
 */
export function chargedPhi(phi: PhiProvider, basis: Eigenbasis, budget: Budget, cut: CutFlag): PhiProvider {
  return (n, xs, out, d1, d2) => {
    const k = Math.max(0, Math.round(n) - basis.firstLabel);
    const per = Number.isFinite(k) ? tableOps(basis, Math.min(k, basis.count) + 1, k) * (1 + (d1 ? 1 : 0) + (d2 ? 1 : 0)) : 0;
    const chunk = per > 0 ? Math.max(1, Math.floor(CHUNK_OPS / per)) : xs.length;
    let late = 0;
    for (let s = 0; s < xs.length; s += chunk) {
      const e = Math.min(xs.length, s + chunk);
      if (budget.spend(per * (e - s))) late += per * (e - s);
      if (late > CUT_OPS || cut.stopped) {
        cut.stopped = true;
        out.fill(0, s);
        d1?.fill(0, s);
        d2?.fill(0, s);
        return;
      }
      if (s === 0 && e === xs.length) phi(n, xs, out, d1, d2);
      else phi(n, xs.subarray(s, e), out.subarray(s, e), d1?.subarray(s, e), d2?.subarray(s, e));
    }
  };
}

/**
 * Counted operations per grid node of the energy integrals (<H> and the spread: the potential evaluated
 * twice over the grid, a numerical one through its formula, and two passes of a few multiplications).
 */
export const ENERGY_POINT_OPS = 128;
