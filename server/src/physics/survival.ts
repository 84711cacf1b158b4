/**
 * The survival probability S(t) = |<psi(0)|psi(t)>|^2 on a time grid of its own, fine enough for the
 * fastest beat between the levels that matter, independent of the `evolve` steps (which size the
 * costlier density and <x>, <p>). S is a cheap sum over levels, so it can be sampled densely where the
 * density cannot. Times are internal (1 / energy unit, hbar = 1); the analysis converts them.
 */
import { unlimitedBudget, type Budget, type StopReason } from './budget';

/** Times between two direct evaluations of the phases (the rotation recurrence runs between them). */
const RESYNC = 32;

/** Options of `fineSurvival`, with their defaults. */
export interface FineSurvivalOptions {
  /** Samples a period of the fastest relevant beat (default 16). */
  perPeriod?: number;
  /** Most points of the fine grid (default 4097). */
  maxPoints?: number;
  /** Share of the weight the relevant levels hold, largest weights first (default 0.999). */
  relevantShare?: number;
  /** The analysis's budget (default: unlimited), polled every 256 times; counts one operation per level per time. */
  budget?: Budget;
}

/** The survival on its own grid. */
export interface FineSurvival {
  /** 0 .. tEnd in `steps * refine` equal intervals (internal units), so every evolve time is on it. */
  times: Float64Array;
  survival: Float64Array;
  /** Fine intervals per evolve step. */
  refine: number;
  /** Period 2 pi / (E_max - E_min) of the fastest relevant beat (internal units), or null with one level. */
  beatPeriod: number | null;
  /** Null when complete; otherwise why the budget stopped it (the arrays are then empty). */
  stopped: StopReason | null;
}

/**
 * The period 2 pi / (E_max - E_min) of the fastest beat among the fewest largest-weight levels holding
 * `share` of the weight (a level of tiny weight only ripples S by about its weight), or null when one
 * level holds it all.
 */
export function fastestBeatPeriod(E: Float64Array, p: Float64Array, share: number): number | null {
  let total = 0;
  for (let k = 0; k < p.length; k++) total += p[k];
  if (!(total > 0)) return null;
  const order = Array.from(p.keys()).sort((a, b) => p[b] - p[a]);
  let acc = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (const k of order) {
    lo = Math.min(lo, E[k]);
    hi = Math.max(hi, E[k]);
    acc += p[k];
    if (acc >= share * total) break;
  }
  return hi > lo ? (2 * Math.PI) / (hi - lo) : null;
}

/**
 * S(t) = |sum_k p_k e^{-i E_k t}|^2 / (sum_k p_k)^2, p_k = |c_k|^2 over every level given (Griffiths,
 * Introduction to Quantum Mechanics, ch. 2 (from memory)), on 0 .. tEnd with `steps * refine` intervals:
 * refine is the smallest whole number giving `perPeriod` samples a period of the fastest relevant beat,
 * bounded so the grid has at most `maxPoints` points (and at least 1, the evolve grid itself).
 */
export function fineSurvival(energies: Float64Array, cRe: Float64Array, cIm: Float64Array, tEnd: number, steps: number, options: FineSurvivalOptions = {}): FineSurvival {
  const n = Math.min(cRe.length, cIm.length, energies.length);
  const p = new Float64Array(n);
  let total = 0;
  for (let k = 0; k < n; k++) {
    p[k] = cRe[k] * cRe[k] + cIm[k] * cIm[k];
    total += p[k];
  }
  const E = energies.subarray(0, n);
  const beatPeriod = fastestBeatPeriod(E, p, options.relevantShare ?? 0.999);
  const s = Math.max(1, Math.floor(steps));
  const maxPoints = Math.max(s + 1, options.maxPoints ?? 4097);
  const wanted = beatPeriod === null || !(tEnd > 0) ? 1 : Math.ceil(((options.perPeriod ?? 16) * tEnd) / (beatPeriod * s));
  const refine = Math.max(1, Math.min(wanted, Math.floor((maxPoints - 1) / s)));
  const m = s * refine;
  const times = new Float64Array(m + 1);
  const survival = new Float64Array(m + 1);
  const budget = options.budget ?? unlimitedBudget();
  // e^{-i E_k t_j} by rotation from one time to the next (t_j equally spaced), recomputed from cos and
  // sin every RESYNC times so the recurrence's rounding stays a few eps; only levels with weight.
  const live: number[] = [];
  for (let k = 0; k < n; k++) if (p[k] !== 0) live.push(k);
  const q = live.length;
  const w = new Float64Array(q);
  const e = new Float64Array(q);
  const cr = new Float64Array(q);
  const ci = new Float64Array(q);
  const dr = new Float64Array(q);
  const di = new Float64Array(q);
  for (let i = 0; i < q; i++) {
    w[i] = p[live[i]];
    e[i] = E[live[i]];
    dr[i] = Math.cos((e[i] * tEnd) / m);
    di[i] = Math.sin((e[i] * tEnd) / m);
  }
  const norm = total > 0 ? 1 / (total * total) : NaN;
  for (let j = 0; j <= m; j++) {
    if ((j & 255) === 0) {
      budget.count(256 * n);
      if (budget.expired()) return { times: new Float64Array(0), survival: new Float64Array(0), refine, beatPeriod, stopped: budget.reason };
    }
    const t = (tEnd * j) / m;
    times[j] = t;
    let sr = 0;
    let si = 0;
    if (j % RESYNC === 0) {
      for (let i = 0; i < q; i++) {
        const c = Math.cos(e[i] * t);
        const sn = Math.sin(e[i] * t);
        cr[i] = c;
        ci[i] = sn;
        sr += w[i] * c;
        si += w[i] * sn;
      }
    } else {
      for (let i = 0; i < q; i++) {
        const c = cr[i] * dr[i] - ci[i] * di[i];
        const sn = ci[i] * dr[i] + cr[i] * di[i];
        cr[i] = c;
        ci[i] = sn;
        sr += w[i] * c;
        si += w[i] * sn;
      }
    }
    survival[j] = (sr * sr + si * si) * norm;
  }
  return { times, survival, refine, beatPeriod, stopped: null };
}
