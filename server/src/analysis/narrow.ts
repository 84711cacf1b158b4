/**
 * Narrow peaks a formula announces: every exp(q(x)) whose exponent q has a constant negative second
 * derivative (a Gaussian factor exp(-(x - c)^2 / (2 w^2) + ...)) peaks at c = x - q'(x) / q''(x) with
 * |psi| width w = 1 / sqrt(-q''). A grid over the whole system steps over a peak far narrower than its
 * spacing and sees zero everywhere; knowing the peak, the quadrature puts panels on it instead.
 */
import type { Expr, Scope } from '../expr/types';
import { forEachNode } from '../expr/walk';
import { compileFunction } from '../expr/compile';
import type { StateFunction } from './systems';

/** A Gaussian factor of the state: where it peaks and its width (standard deviation of |psi| as exp(-(x - c)^2 / (2 w^2))). */
export interface NarrowPeak {
  center: number;
  width: number;
}

/** At most this many exp factors are examined in one formula. */
const MAX_FACTORS = 16;

/** The Gaussian factors of `e` (real part of the exponent quadratic in x, opening downwards). */
export function gaussianFactors(e: Expr, scope: Scope): NarrowPeak[] {
  const out: NarrowPeak[] = [];
  let seen = 0;
  forEachNode(e, (node) => {
    if (node.type !== 'call' || node.name !== 'exp' || node.args.length !== 1 || seen >= MAX_FACTORS) return;
    seen++;
    const c = compileFunction(node.args[0]!, { ...scope, hasX: true, hasPhi: false });
    if (!c.result) return;
    const v = c.result.evaluate(Float64Array.of(0, 1), 2);
    const d2 = v.d2re![0]!;
    // Quadratic: the same second derivative at two points.
    if (!(d2 < 0) || !Number.isFinite(d2) || Math.abs(v.d2re![1]! - d2) > 1e-9 * Math.abs(d2)) return;
    out.push({ center: -v.d1re![0]! / d2, width: 1 / Math.sqrt(-d2) });
  });
  return out;
}

/** Peaks narrower than this share of the window get panels of their own. */
const NARROW = 1e-3;

/**
 * The state with breakpoints on each narrow peak inside the window (at c + k w, k = -12..12), so every
 * grid resolves it; the state itself when there is none. `narrow` lists the peaks treated so.
 */
export function withPeaks(state: StateFunction, peaks: readonly NarrowPeak[], window: [number, number]): { state: StateFunction; narrow: NarrowPeak[] } {
  const L = window[1] - window[0];
  const narrow = peaks.filter((p) => p.width < NARROW * L && p.center > window[0] - 12 * p.width && p.center < window[1] + 12 * p.width);
  if (narrow.length === 0) return { state, narrow };
  const extra: number[] = [];
  for (const p of narrow) for (let k = -12; k <= 12; k++) extra.push(p.center + k * p.width);
  const wrapped: StateFunction = {
    ...state,
    evaluate: (xs, order) => state.evaluate(xs, order),
    breakpoints: (a, b) => {
      const own = state.breakpoints(a, b);
      const inside = extra.filter((x) => x > a && x < b);
      return [...new Set([...own, ...inside])].sort((p, q) => p - q);
    },
  };
  return { state: wrapped, narrow };
}
