/**
 * The quadrature grids of a box expansion whose coefficients came from the sine transform
 * (boxTransform.ts): they no longer project anything, so they are sized to their two remaining jobs.
 *
 * - The spot check of a few levels against the transform needs the basis's resolution (its highest
 *   level is among them), but only the state's values: one grid sized to the basis, evaluated without
 *   derivatives.
 * - The norm, the energy integrals, the parity and the peaks need the state's resolution only: composite
 *   Gauss-Legendre split at the breakpoints, from 16 panels, doubled until two grids agree on the norm as
 *   two grids must agree in expand.ts (1e-12 of sqrt(norm), or 1e-13 of the norm); every panel halves on
 *   a doubling, so a piece cannot keep its nodes and agree with itself. A smooth piece is integrated to
 *   the rule's accuracy once the panels resolve the state there (common practice), a polynomial piece
 *   exactly; at most the basis-sized grid, whose first doubling the old path always solved.
 *
 * A triangle in 2,000 box levels: 6,320 nodes evaluated once without derivatives and 320 + 640 with them,
 * where the old path evaluated 6,320 + 12,640 with derivatives and 12,640 mirror images for the parity.
 */
import type { Eigenbasis, Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';
import type { Budget } from './context';
import type { StateFunction } from './systems';

/** The transform's coefficients and estimate (BoxTransformResult's fields that matter here). */
interface Fast {
  re: Float64Array;
  im: Float64Array;
  error: Float64Array;
}

/** expand.ts's own helpers (passed in: this file must not import expand.ts, which imports it). */
export interface GridHelpers {
  quadrature(window: [number, number], breakpoints: number[], panels: number, refine: number): Quadrature;
  spotCheck(basis: Eigenbasis, q: Quadrature, values: GridValues, fast: Fast, levels: number, norm: number, budget: Budget): boolean;
  checkFinite(xs: Float64Array, v: GridValues): void;
  integrateAbs2(q: Quadrature, v: GridValues): number;
}

/** Fewest panels of the state's grid. */
const STATE_PANELS = 16;

/**
 * The expansion with the transform's coefficients on the state's grid, or null when the spot check on the
 * basis-sized grid (`panels.spot` panels; `panels.first` is the quadrature's first grid) fails (the caller then projects by quadrature) or the budget ran
 * out between grids.
 */
export function transformGrids(
  state: StateFunction,
  basis: Eigenbasis,
  levels: number,
  window: [number, number],
  breakpoints: number[],
  panels: { spot: number; first: number },
  fast: Fast,
  budget: Budget,
  h: GridHelpers,
): { q: Quadrature; values: GridValues; norm: number } | null {
  const spot = h.quadrature(window, breakpoints, panels.spot, 1);
  const sv = state.evaluate(spot.x, 0);
  h.checkFinite(spot.x, sv);
  budget.count(spot.x.length, spot.x.length);
  const spotNorm = h.integrateAbs2(spot, sv);
  if (!h.spotCheck(basis, spot, sv, fast, levels, spotNorm, budget)) return null;
  let prev: { q: Quadrature; values: GridValues; norm: number } | null = null;
  const start = Math.min(STATE_PANELS, panels.first);
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
    if (start * refine >= 2 * panels.first) return cur;
    prev = cur;
  }
}
