/**
 * Refinement between neighbouring sweep points along one axis (`axis`, 0 the first; the other fixed): where the bound-level count
 * steps and where an `expect` line starts or stops holding. Both close a bracket by regula falsi with
 * safeguards (bracket.ts) on a continuous margin: an expect's signed margin, and for the bound count
 * its gauge (bound.ts: a finite well's 2 z0 / pi, a numerical potential's level against the wall
 * value), each step of a multiple jump found on its own. Without a margin (an expect such as parity, a
 * count with no gauge) the bracket is bisected on the verdict. A bound-count probe solves only the
 * system; an expect probe is a full point analysis.
 *
 * Brackets close to `REFINE_RELATIVE` of the swept value (1e-13, well inside the 1e-8 and 1e-9 the
 * checks in the tests ask for), or after `MAX_ITERATIONS` probes, or when the fraction cannot be split
 * further in double precision.
 */
import type { Budget } from '../../physics/budget';
import type { PointOutcome } from './point';
import { closeBracket, type BracketSpec, type Closed, type Probe } from './bracket';
import { stepMargin } from './bound';

export type { Closed, Probe } from './bracket';

/** Relative width of the swept value at which a bracket is closed. */
export const REFINE_RELATIVE = 1e-13;
/** Probes per bracket at most. */
export const MAX_ITERATIONS = 80;

/**
 * Runs one point at fraction t of the axis refined; null when the budget or the probe allowance ran out.
 * With `systemOnly` only the system is solved (the bound count needs no state, and a level just
 * appearing reaches so far out that projecting a state on it would need an unbounded grid).
 */
export type Prober = (t: number, systemOnly?: boolean) => PointOutcome | null;

/** What refining along one axis needs. */
export interface Refiner {
  probe: Prober;
  budget: Budget;
  /** The axis refined (0 the first). */
  axis: number;
  /** The fraction step near t that moves the swept value by well under `REFINE_RELATIVE` of it. */
  minStep: (t: number) => number;
  /** True when the axis is logarithmic (the gauge's margin is taken in the logarithm there). */
  logAxis?: boolean;
}

/** True when the bracket is closed along `axis` (the axis being refined). */
export function narrow(lo: Probe, hi: Probe, axis: number): boolean {
  const a = lo.out.point.at[axis]!;
  const b = hi.out.point.at[axis]!;
  const mid = 0.5 * (lo.t + hi.t);
  return Math.abs(b - a) <= REFINE_RELATIVE * Math.max(Math.abs(a), Math.abs(b)) || mid <= Math.min(lo.t, hi.t) || mid >= Math.max(lo.t, hi.t);
}

/** A usable probe: finished and valid. */
function usable(p: PointOutcome | null): p is PointOutcome {
  return p !== null && p.complete && p.point.valid;
}

/** The bracket spec shared by both kinds of change. */
function spec(r: Refiner, side: (p: Probe) => boolean, margin: (p: Probe) => number | null, probe: (t: number) => Probe | null): BracketSpec {
  return { side, margin, probe, closed: (a, b) => narrow(a, b, r.axis), minStep: r.minStep, budget: r.budget, maxProbes: MAX_ITERATIONS };
}

/**
 * Every place between `lo` and `hi` where the bound count changes, each as its closed bracket, in
 * order from `lo`. A jump of several levels in one interval is split until each bracket holds one change.
 */
export function boundSteps(lo: Probe, hi: Probe, r: Refiner): Closed[] {
  const a = lo.out.point.bound;
  const b = hi.out.point.bound;
  if (a === null || b === null || a === b) return [];
  if (!lo.out.gauge || !hi.out.gauge) return bisectSteps(lo, hi, r, 0);
  const probe = (t: number): Probe | null => {
    const out = r.probe(t, true);
    return usable(out) && out.point.bound !== null ? { t, out } : null;
  };
  const found: Closed[] = [];
  let cur = lo;
  for (;;) {
    const c = cur.out.point.bound!;
    if (b > a ? c >= b : c <= b) break;
    // The step between n and n + 1 levels: the side is `bound > n`, the margin the gauge's for n.
    const n = b > a ? c : c - 1;
    const closed = closeBracket(cur, hi, spec(r, (p) => p.out.point.bound! > n, (p) => (p.out.gauge ? stepMargin(p.out.gauge, n, r.logAxis) : null), probe));
    found.push(closed);
    if (!narrow(closed.lo, closed.hi, r.axis)) break;
    cur = closed.hi;
  }
  return found;
}

/** The bound steps by bisection on the count (for counts without a gauge). */
export function bisectSteps(lo: Probe, hi: Probe, r: Refiner, depth: number): Closed[] {
  const a = lo.out.point.bound;
  const b = hi.out.point.bound;
  if (a === null || b === null || a === b) return [];
  if (narrow(lo, hi, r.axis) || depth >= MAX_ITERATIONS || r.budget.expired()) return [{ lo, hi }];
  const t = 0.5 * (lo.t + hi.t);
  const out = r.probe(t, true);
  if (!usable(out) || out.point.bound === null) return [{ lo, hi }];
  const mid: Probe = { t, out };
  return [...bisectSteps(lo, mid, r, depth + 1), ...bisectSteps(mid, hi, r, depth + 1)];
}

/** Where expect `e` flips between `lo` and `hi` (their verdicts differ). */
export function expectFlip(e: number, lo: Probe, hi: Probe, r: Refiner): Closed {
  const probe = (t: number): Probe | null => {
    const out = r.probe(t);
    return usable(out) ? { t, out } : null;
  };
  return closeBracket(lo, hi, spec(r, (p) => p.out.point.expects[e] === true, (p) => p.out.margins[e] ?? null, probe));
}
