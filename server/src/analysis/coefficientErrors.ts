/**
 * Uncertainties of the coefficients of numerical systems, by the same two-grid logic as their levels:
 * the state is projected on the solver's last two grids, and twice the difference of each coefficient
 * (the Richardson factor the levels use where convergence is algebraic) is its uncertainty, floored at
 * what the projection itself resolves.
 */
import type { Eigenbasis } from '../physics/types';
import type { PotentialBasisResult } from '../physics/potential';
import type { BuildOptions } from './systems';
import { expandState, type Expanded } from './expand';
import type { StateFunction } from './systems';

/** The projection's own resolution: the expansion's grids agree to 1e-12 of sqrt(norm) (expand.ts). */
export const PROJECTION_FLOOR = 1e-12;

/**
 * The basis on the next-to-last grid the solver used (`sizes`), solved again with that size as its cap;
 * null when there was only one grid or the budget has run out.
 */
export function coarserBasis(sizes: readonly number[], options: BuildOptions, solve: (maxPoints: number) => PotentialBasisResult): Eigenbasis | null {
  if (sizes.length < 2 || options.budget.expired()) return null;
  const r = solve(sizes[sizes.length - 2]!);
  if (r.basis.count === 0 || r.stopped === 'time' || r.stopped === 'cancelled') return null;
  return r.basis;
}

/**
 * Each coefficient's uncertainty: 2 |c_fine - c_coarse| (normalised by the fine norm), or the smaller
 * of that and 2 |c_fine + c_coarse| should a level's sign convention flip between grids, at least
 * `PROJECTION_FLOOR`. Null when the coarse projection did not finish.
 */
export function coefficientUncertainties(
  fine: Expanded,
  coarse: Eigenbasis,
  state: StateFunction,
  window: [number, number],
  options: { maxGridPoints: number; budget: BuildOptions['budget'] },
): Float64Array | null {
  const count = Math.min(fine.re.length, coarse.count);
  const c = expandState(state, coarse, count, window, options);
  if (c.re.length < count || c.stopped === 'time' || c.stopped === 'cancelled') return null;
  const s = 1 / Math.sqrt(fine.norm);
  const out = new Float64Array(fine.re.length).fill(Infinity);
  for (let k = 0; k < count; k++) {
    const minus = Math.hypot(fine.re[k]! - c.re[k]!, fine.im[k]! - c.im[k]!);
    const plus = Math.hypot(fine.re[k]! + c.re[k]!, fine.im[k]! + c.im[k]!);
    out[k] = Math.max(2 * Math.min(minus, plus) * s, PROJECTION_FLOOR);
  }
  return out;
}
