/**
 * Refinement between neighbouring sweep points along one axis (`axis`, 0 the first; the other fixed): where the bound-level count
 * steps (bisection on the count, each step of a multiple jump found on its own) and where an `expect`
 * line starts or stops holding (regula falsi in the Illinois form on the expect's signed margin, with a
 * bisection every third step, so the bracket shrinks from both sides; plain bisection on the verdict
 * for an expect without a numeric margin such as parity). Each probe is a full point analysis.
 *
 * Brackets close to `REFINE_RELATIVE` of the swept value (1e-13, well inside the 1e-8 and 1e-9 the
 * checks in the tests ask for), or after `MAX_ITERATIONS` probes, or when the fraction cannot be split
 * further in double precision.
 */
import type { Budget } from '../../physics/budget';
import type { PointOutcome } from './point';

/** Relative width of the swept value at which a bracket is closed. */
export const REFINE_RELATIVE = 1e-13;
/** Probes per bracket at most. */
export const MAX_ITERATIONS = 80;

/** A point analysed at fraction t of the axis refined (the other axis fixed). */
export interface Probe {
  t: number;
  out: PointOutcome;
}

/** What a bracket closed on: the probes on either side of the change. */
export interface Closed {
  lo: Probe;
  hi: Probe;
}

/**
 * Runs one point at fraction t of the axis refined; null when the budget or the probe allowance ran out.
 * With `systemOnly` only the system is solved (the bound count needs no state, and a level just
 * appearing reaches so far out that projecting a state on it would need an unbounded grid).
 */
export type Prober = (t: number, systemOnly?: boolean) => PointOutcome | null;

/** True when the bracket is closed along `axis` (the axis being refined). */
function narrow(lo: Probe, hi: Probe, axis: number): boolean {
  const a = lo.out.point.at[axis]!;
  const b = hi.out.point.at[axis]!;
  const mid = 0.5 * (lo.t + hi.t);
  return Math.abs(b - a) <= REFINE_RELATIVE * Math.max(Math.abs(a), Math.abs(b)) || mid <= Math.min(lo.t, hi.t) || mid >= Math.max(lo.t, hi.t);
}

/** A usable probe: finished and valid. */
function usable(p: PointOutcome | null): p is PointOutcome {
  return p !== null && p.complete && p.point.valid;
}

/**
 * Every place between `lo` and `hi` where the bound count changes, each as its closed bracket.
 * A jump of several levels in one interval is split until each bracket holds one change.
 */
export function boundSteps(lo: Probe, hi: Probe, probe: Prober, budget: Budget, axis = 0, depth = 0): Closed[] {
  const a = lo.out.point.bound;
  const b = hi.out.point.bound;
  if (a === null || b === null || a === b) return [];
  if (narrow(lo, hi, axis) || depth >= MAX_ITERATIONS || budget.expired()) return [{ lo, hi }];
  const t = 0.5 * (lo.t + hi.t);
  const out = probe(t, true);
  if (!usable(out) || out.point.bound === null) return [{ lo, hi }];
  const mid: Probe = { t, out };
  return [...boundSteps(lo, mid, probe, budget, axis, depth + 1), ...boundSteps(mid, hi, probe, budget, axis, depth + 1)];
}

/** Where expect `e` flips between `lo` and `hi` (their verdicts differ). */
export function expectFlip(e: number, lo: Probe, hi: Probe, probe: Prober, budget: Budget, axis = 0): Closed {
  let [a, b] = [lo, hi];
  let [ma, mb] = [a.out.margins[e] ?? null, b.out.margins[e] ?? null];
  let side = 0;
  for (let k = 0; k < MAX_ITERATIONS && !narrow(a, b, axis) && !budget.expired(); k++) {
    let t = 0.5 * (a.t + b.t);
    const numeric = ma !== null && mb !== null && Number.isFinite(ma) && Number.isFinite(mb) && ma !== mb && k % 3 !== 2;
    if (numeric) {
      const guess = a.t + ((b.t - a.t) * ma!) / (ma! - mb!);
      // A guess at or beyond an end falls back to the middle.
      if (guess > Math.min(a.t, b.t) && guess < Math.max(a.t, b.t)) t = guess;
    }
    const out = probe(t);
    if (!usable(out)) break;
    const mid: Probe = { t, out };
    const m = out.margins[e] ?? null;
    if (out.point.expects[e] === a.out.point.expects[e]) {
      a = mid;
      ma = m;
      // Illinois: the end kept twice in a row has its margin halved.
      if (side === -1 && mb !== null) mb /= 2;
      side = -1;
    } else {
      b = mid;
      mb = m;
      if (side === 1 && ma !== null) ma /= 2;
      side = 1;
    }
  }
  return { lo: a, hi: b };
}
