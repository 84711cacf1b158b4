/**
 * The quadrature grids of a box expansion whose coefficients came from the sine transform
 * (boxTransform.ts): they no longer project anything, so they are sized to their two remaining jobs.
 *
 * The transform checks its own coefficients (the state between its samples against their interpolant),
 * so what is left is one job:
 * - the norm, the energy integrals, the parity and the peaks need the state's resolution only: composite
 *   Gauss-Legendre split at the breakpoints, from 16 panels, doubled until two grids agree on the norm as
 *   two grids must agree in expand.ts (1e-12 of sqrt(norm), or 1e-13 of the norm); every panel halves on
 *   a doubling, so a piece cannot keep its nodes and agree with itself. A smooth piece is integrated to
 *   the rule's accuracy once the panels resolve the state there (common practice), a polynomial piece
 *   exactly; at most the basis-sized grid, whose first doubling the old path always solved.
 *
 * A triangle in 2,000 box levels: 320 + 640 nodes with derivatives, where the basis-sized path evaluated
 * 6,320 + 12,640 with derivatives and 12,640 mirror images for the parity.
 */
import type { Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';
import type { Budget } from './context';
import type { StateFunction } from './systems';

/** expand.ts's own helpers (passed in: this file must not import expand.ts, which imports it). */
export interface GridHelpers {
  quadrature(window: [number, number], breakpoints: number[], panels: number, refine: number): Quadrature;
  checkFinite(xs: Float64Array, v: GridValues): void;
  integrateAbs2(q: Quadrature, v: GridValues): number;
}

/** Fewest panels of the state's grid. */
const STATE_PANELS = 16;

/**
 * The state's grid for a transform expansion (`first`: the panels of the quadrature's basis-sized first
 * grid, the most this goes to twice), or null when the budget ran out between grids.
 */
export function transformGrids(
  state: StateFunction,
  window: [number, number],
  breakpoints: number[],
  first: number,
  budget: Budget,
  h: GridHelpers,
): { q: Quadrature; values: GridValues; norm: number } | null {
  let prev: { q: Quadrature; values: GridValues; norm: number } | null = null;
  const start = Math.min(STATE_PANELS, first);
  for (let refine = 1; ; refine *= 2) {
    if (budget.expired()) return null;
    const q = h.quadrature(window, breakpoints, start, refine);
    const values = state.evaluate(q.x, 2);
    h.checkFinite(q.x, values);
    budget.count(q.x.length, q.x.length);
    const cur = { q, values, norm: h.integrateAbs2(q, values) };
    if (prev) {
      const d = Math.abs(prev.norm - cur.norm);
      if (d <= 1e-12 * Math.sqrt(cur.norm) || d <= 1e-13 * cur.norm) return cur;
    }
    // The basis-sized grid's first doubling is as far as the old path went.
    if (start * refine >= 2 * first) return cur;
    prev = cur;
  }
}
