/**
 * Closing a bracket on a change between two probes, on a continuous margin whose sign goes with the
 * change (an `expect` line's signed margin; for a bound-level step the gauge of bound.ts). Each probe
 * is the first of these that lies inside the bracket:
 *
 * - inverse quadratic interpolation through the three latest probes, or the secant through the two
 *   latest (Brent, Algorithms for Minimization without Derivatives, ch. 4 (from memory)): superlinear
 *   even when every probe falls on one side of the change;
 * - regula falsi on the bracket's ends in the Anderson-Bjorck form;
 * - the middle.
 *
 * Two safeguards: a guess closer to an end than the closing width (`minStep`) is moved to that width
 * past the end, so the probe after a near-exact guess lands on the change's far side and closes the
 * bracket at once (Brent's least step); and when two probes in a row did not halve the bracket, the
 * next one bisects, so it never does much worse than bisection (a margin that is not smooth, or missing,
 * is bisected throughout).
 *
 * The sides come from the probes themselves (`side`), never from the sign of the margin, so a margin
 * that rounds the wrong way near the change can cost a probe but never misplace it.
 */
import type { Budget } from '../../physics/budget';
import type { PointOutcome } from './point';

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

/** What `closeBracket` needs. */
export interface BracketSpec {
  /** The side a probe is on (the two ends differ). */
  side(p: Probe): boolean;
  /** The margin at a probe (its sign follows the side; null or non-finite when it has none). */
  margin(p: Probe): number | null;
  /** Runs one probe at fraction t; null when it cannot (budget, probe allowance, invalid point). */
  probe(t: number): Probe | null;
  /** True when the bracket is closed (narrow enough, or not splittable in double precision). */
  closed(a: Probe, b: Probe): boolean;
  /** The fraction step near t that moves the swept value by well under the closing width. */
  minStep(t: number): number;
  budget: Budget;
  /** Probes at most. */
  maxProbes: number;
}

/** Closes the bracket [lo, hi] (their sides differ); lo stays on lo's side and hi on hi's. */
export function closeBracket(lo: Probe, hi: Probe, spec: BracketSpec): Closed {
  let [a, b] = [lo, hi];
  const sideA = spec.side(a);
  let [ma, mb] = [finite(spec.margin(a)), finite(spec.margin(b))];
  // The latest probes with a margin (for the interpolation), which end the last probe replaced (-1 a,
  // 1 b, 0 none yet), the widths before each probe, and whether the last probe was a step past an end
  // (one that did not close the bracket failed).
  const recent: [number, number][] = [];
  for (const [p, m] of [[a, ma], [b, mb]] as const) if (m !== null) recent.push([p.t, m]);
  let last = 0;
  const widths: number[] = [];
  let straddled = false;
  for (let k = 0; k < spec.maxProbes && !spec.closed(a, b) && !spec.budget.expired(); k++) {
    const width = Math.abs(b.t - a.t);
    const slow = widths.length >= 2 && width > 0.5 * widths[widths.length - 2]!;
    widths.push(width);
    const next = nextFraction(a.t, b.t, ma, mb, recent, spec.minStep);
    // A step past an end goes first (unless the last one failed); a slow bracket is bisected.
    const t: number = next.past && !straddled ? next.t : slow || next.past ? 0.5 * (a.t + b.t) : next.t;
    straddled = next.past && t === next.t;
    const p = spec.probe(t);
    if (p === null) break;
    const m = finite(spec.margin(p));
    if (m !== null) recent.push([p.t, m]);
    if (spec.side(p) === sideA) {
      if (last === -1 && mb !== null) mb *= shrink(m, ma);
      a = p;
      ma = m;
      last = -1;
    } else {
      if (last === 1 && ma !== null) ma *= shrink(m, mb);
      b = p;
      mb = m;
      last = 1;
    }
  }
  return { lo: a, hi: b };
}

/**
 * The next fraction (see the module comment), kept `minStep` from the ends; `past` when the guess lay
 * closer than that to an end and was moved to that distance past it.
 */
function nextFraction(ta: number, tb: number, ma: number | null, mb: number | null, recent: [number, number][], minStep: (t: number) => number): { t: number; past: boolean } {
  const [lo, hi] = ta < tb ? [ta, tb] : [tb, ta];
  const mid = 0.5 * (lo + hi);
  const inside = (g: number | null): g is number => g !== null && Number.isFinite(g) && g >= lo && g <= hi;
  let t: number | null = interpolate(recent);
  if (!inside(t) && ma !== null && mb !== null && ma !== mb) {
    // Regula falsi on the ends; a guess on an end (its margin rounds to zero there) stays, to be stepped past.
    t = ta + ((tb - ta) * ma) / (ma - mb);
  }
  if (!inside(t)) return { t: mid, past: false };
  const d = minStep(t);
  if (!(d > 0) || hi - lo <= 4 * d) return { t: mid, past: false };
  if (t - lo < d) return { t: lo + d, past: true };
  if (hi - t < d) return { t: hi - d, past: true };
  return { t, past: false };
}

/** Where the margin through the latest probes is zero: inverse quadratic through three, the secant through two; null without. */
function interpolate(recent: [number, number][]): number | null {
  const n = recent.length;
  if (n < 2) return null;
  const [t1, m1] = recent[n - 1]!;
  const [t2, m2] = recent[n - 2]!;
  if (n >= 3) {
    const [t3, m3] = recent[n - 3]!;
    if (m1 !== m2 && m1 !== m3 && m2 !== m3) {
      return (t1 * m2 * m3) / ((m1 - m2) * (m1 - m3)) + (t2 * m1 * m3) / ((m2 - m1) * (m2 - m3)) + (t3 * m1 * m2) / ((m3 - m1) * (m3 - m2));
    }
  }
  return m1 !== m2 ? t1 - (m1 * (t1 - t2)) / (m1 - m2) : null;
}

/**
 * The factor on the margin of the end kept twice in a row: 1 - m_new / m_replaced (Anderson & Bjorck,
 * BIT 13, 253 (1973) (from memory)), or 1/2 (the Illinois factor) when that is not in (0, 1).
 */
function shrink(mNew: number | null, mReplaced: number | null): number {
  if (mNew === null || mReplaced === null || mReplaced === 0) return 0.5;
  const g = 1 - mNew / mReplaced;
  return g > 0 && g < 1 ? g : 0.5;
}

function finite(m: number | null): number | null {
  return m !== null && Number.isFinite(m) ? m : null;
}
