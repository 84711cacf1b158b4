/**
 * Time evolution of a state expanded in an energy eigenbasis (hbar = 1):
 * psi(x, t) = sum_k c_k e^{-i E_k t} phi_k(x). Times are in internal units (1 / energy unit);
 * the analysis converts them for display.
 */
import type { Eigenbasis, Quadrature } from './types';
import { compositeGaussLegendre } from './quadrature';
import { Stopped, unlimitedBudget, type Budget, type StopReason } from './budget';
import { blockDensity, blockQuadraticForms, blockSize, transposeTable, triangleForms } from './evolutionForms';
import { phaseSteps, RESEED, ROTATE_OPS, TRIG_OPS } from './evolutionPhases';

/** Complex coefficients c_k = re[k] + i im[k] by level index. */
export interface Coefficients {
  re: Float64Array;
  im: Float64Array;
}

/** Options of `evolve` and `matrixElements`, with their defaults. */
export interface EvolveOptions {
  /** When given, |psi(x, t)|^2 of the normalised state on these x for every time. Default none. */
  density?: Float64Array;
  /** Levels whose weight is below this fraction of the total after the last kept one are dropped (default 1e-14). */
  weightCutoff?: number;
  /** Most levels used for <x> and <p> (default 400); matrix elements cost O(K^3). */
  maxLevels?: number;
  /**
   * The analysis's budget (default: unlimited), polled between rows of the matrix elements and between
   * blocks of times (`blockSize` of evolutionForms.ts: single times when X and D are sparse or few, else
   * 8); once it has expired the evolution stops, the result holds only the times finished (`complete`
   * false) and `stopped` says why. Counts K^2 operations per time, the phases and the quadrature's work.
   */
  budget?: Budget;
}

/** Real symmetric X_jk = <j|x|k> and real antisymmetric D_jk = integral phi_j phi_k' dx (so <j|p|k> = -i D_jk). */
export interface MatrixElements {
  levels: number;
  x: Float64Array;
  d: Float64Array;
  /** Null when complete; otherwise why the budget stopped the quadrature (x and d are then partial sums). */
  stopped: StopReason | null;
}

/**
 * A composite Gauss–Legendre rule on the basis's walls (or support), cut at its breakpoints, with
 * enough 20-point panels (about ten nodes per oscillation of phi_K^2) for products of the first K levels.
 */
export function evolutionQuadrature(basis: Eigenbasis, levels: number): Quadrature {
  const [a, b] = basis.walls ?? basis.support;
  const K = Math.max(1, Math.min(levels, basis.count));
  return compositeGaussLegendre(a, b, { breakpoints: basis.breakpoints, panels: Math.ceil(K / 2) + 16, order: 20 });
}

/**
 * X_jk = integral phi_j x phi_k dx and D_jk = integral phi_j phi_k' dx, j, k < levels, by quadrature
 * (`evolutionQuadrature`). D is antisymmetrised, (D - D^T)/2, which is exact when phi vanishes at both
 * ends (walls or decay), because integrating by parts leaves no boundary term. A basis with its own
 * closed form (`Eigenbasis.matrixElements`: box, oscillator, the sine series of numerical systems) is
 * used directly. With a budget, the quadrature polls it once per row and counts 2 K^2 operations per
 * node; once it has expired the result says so in `stopped`.
 */
export function matrixElements(basis: Eigenbasis, levels: number, options: { budget?: Budget } = {}): MatrixElements {
  const K = Math.max(0, Math.min(levels, basis.count));
  const x = new Float64Array(K * K);
  const d = new Float64Array(K * K);
  if (K === 0) return { levels: 0, x, d, stopped: null };
  const budget = options.budget ?? unlimitedBudget();
  if (basis.matrixElements) {
    // Closed form from the basis (sine series): no table on a grid; charged as it goes.
    let m: { x: Float64Array; d: Float64Array };
    try {
      m = basis.matrixElements(K, budget);
    } catch (err) {
      if (err instanceof Stopped) return { levels: K, x, d, stopped: err.reason };
      throw err;
    }
    x.set(m.x.subarray(0, K * K));
    d.set(m.d.subarray(0, K * K));
    return symmetrise(K, x, d);
  }
  const quad = evolutionQuadrature(basis, K);
  const nq = quad.x.length;
  const chunk = Math.max(1, Math.floor(4194304 / (2 * K)));
  for (let s = 0; s < nq; s += chunk) {
    const e = Math.min(nq, s + chunk);
    const xs = quad.x.subarray(s, e);
    const f = new Float64Array(K * xs.length);
    const f1 = new Float64Array(K * xs.length);
    basis.table(xs, K, f, f1);
    budget.count(2 * K * K * xs.length, xs.length);
    if (!accumulateChunk(K, xs, quad.w.subarray(s, e), f, f1, x, d, budget)) return { levels: K, x, d, stopped: budget.reason };
  }
  return symmetrise(K, x, d);
}

/** Adds one chunk of nodes to X (upper triangle) and D; false once the budget has expired (polled per row). */
function accumulateChunk(K: number, xs: Float64Array, w: Float64Array, f: Float64Array, f1: Float64Array, x: Float64Array, d: Float64Array, budget: Budget): boolean {
  const m = xs.length;
  const wx = new Float64Array(m);
  for (let i = 0; i < m; i++) wx[i] = w[i] * xs[i];
  for (let j = 0; j < K; j++) {
    if (budget.expired()) return false;
    const rj = j * m;
    for (let k = 0; k < K; k++) {
      const rk = k * m;
      let sd = 0;
      for (let i = 0; i < m; i++) sd += w[i] * f[rj + i] * f1[rk + i];
      d[j * K + k] += sd;
      if (k < j) continue;
      let sx = 0;
      for (let i = 0; i < m; i++) sx += wx[i] * f[rj + i] * f[rk + i];
      x[j * K + k] += sx;
    }
  }
  return true;
}

/** X made symmetric from its upper triangle, D antisymmetrised, (D - D^T)/2. */
function symmetrise(K: number, x: Float64Array, d: Float64Array): MatrixElements {
  for (let j = 0; j < K; j++) {
    for (let k = 0; k < j; k++) {
      x[j * K + k] = x[k * K + j];
      const anti = 0.5 * (d[j * K + k] - d[k * K + j]);
      d[j * K + k] = anti;
      d[k * K + j] = -anti;
    }
    d[j * K + j] = 0;
  }
  return { levels: K, x, d, stopped: null };
}

/** The result of `evolve`: one entry per time. */
export interface EvolveResult {
  meanX: Float64Array;
  meanP: Float64Array;
  survival: Float64Array;
  /** |psi(x, t)|^2 on options.density for each time (normalised state). */
  density?: Float64Array[];
  /** False when the budget stopped the evolution: the arrays then hold only the first times. */
  complete: boolean;
  /** Why the budget stopped it ('time' or 'cancelled'), or null when every time is done. */
  stopped: StopReason | null;
}

/** Levels kept: up to the last one above the weight cutoff, at most maxLevels. */
function keptLevels(basis: Eigenbasis, cRe: Float64Array, cIm: Float64Array, cutoff: number, maxLevels: number): { K: number; total: number } {
  const n = Math.min(cRe.length, cIm.length, basis.count);
  let total = 0;
  for (let k = 0; k < n; k++) total += cRe[k] * cRe[k] + cIm[k] * cIm[k];
  let last = -1;
  for (let k = 0; k < n; k++) if (cRe[k] * cRe[k] + cIm[k] * cIm[k] > cutoff * total) last = k;
  return { K: Math.min(last + 1, maxLevels), total };
}

/**
 * Expectation values along the evolution, for the state normalised within the levels given
 * (W = sum |c_k|^2): with a_k(t) = c_k e^{-i E_k t},
 * <x>(t) = sum_jk conj(a_j) X_jk a_k / W, <p>(t) = sum_jk conj(a_j) (-i D_jk) a_k / W
 * (X, D from `matrixElements`), and the survival probability
 * |<psi(0)|psi(t)>|^2 = |sum_k |c_k|^2 e^{-i E_k t}|^2 / W^2 (Griffiths, Introduction to Quantum
 * Mechanics, ch. 2 (from memory)). <x> and <p> use the levels up to the last with weight above
 * `weightCutoff` (at most `maxLevels`); the survival uses them all.
 */
export function evolve(basis: Eigenbasis, cRe: Float64Array, cIm: Float64Array, times: Float64Array, options: EvolveOptions = {}): EvolveResult {
  const nt = times.length;
  const meanX = new Float64Array(nt);
  const meanP = new Float64Array(nt);
  const survival = new Float64Array(nt);
  const n = Math.min(cRe.length, cIm.length, basis.count);
  const { K, total } = keptLevels(basis, cRe, cIm, options.weightCutoff ?? 1e-14, Math.max(1, options.maxLevels ?? 400));
  const result: EvolveResult = { meanX, meanP, survival, complete: true, stopped: null };
  if (!(total > 0) || n === 0) {
    meanX.fill(NaN);
    meanP.fill(NaN);
    survival.fill(NaN);
    return result;
  }
  const budget = options.budget ?? unlimitedBudget();
  const cut = (done: number): EvolveResult => {
    const part: EvolveResult = { meanX: meanX.slice(0, done), meanP: meanP.slice(0, done), survival: survival.slice(0, done), complete: false, stopped: budget.reason };
    if (result.density) part.density = result.density.slice(0, done);
    return part;
  };
  const me = matrixElements(basis, K, { budget });
  if (me.stopped !== null) return cut(0);
  const xs = options.density;
  let tableT: Float64Array | null = null;
  if (xs) {
    budget.count(K * xs.length, xs.length);
    if (budget.expired()) return cut(0);
    const table = new Float64Array(K * xs.length);
    basis.table(xs, K, table);
    tableT = transposeTable(table, K, xs.length);
    result.density = [];
  }
  let wK = 0;
  for (let k = 0; k < K; k++) wK += cRe[k] * cRe[k] + cIm[k] * cIm[k];
  const forms = triangleForms(me, K);
  const perTime = 4 * forms.entries + (xs ? 2 * K * xs.length : 0);
  const phases = phaseSteps(basis.energies, n, times);
  // Times in blocks (evolutionForms.ts): each row of X and D, and each point's levels, are read once a block.
  const B = blockSize(forms, xs !== undefined);
  const ar = new Float64Array(B * K);
  const ai = new Float64Array(B * K);
  for (let it = 0; it < nt; it += B) {
    if (budget.expired()) return cut(it);
    const nb = Math.min(B, nt - it);
    let ops = nb * perTime;
    for (let b = 0; b < nb; b++) {
      ops += phases.advance(it + b);
      survival[it + b] = phasesAt(phases, cRe, cIm, n, K, ar, ai, b * K) / (total * total);
    }
    budget.count(ops);
    blockQuadraticForms(forms, ar, ai, nb, meanX, meanP, it);
    for (let b = 0; b < nb; b++) {
      meanX[it + b] /= wK;
      meanP[it + b] /= wK;
    }
    if (xs && tableT && result.density) result.density.push(...blockDensity(tableT, ar, ai, K, nb, xs.length, wK));
  }
  return result;
}

/**
 * Sets a_k = c_k e^{-i E_k t} for k < K into ar[o + k], ai[o + k] from the phases of time t and returns
 * |sum_k |c_k|^2 e^{-i E_k t}|^2 over the n levels (the survival's numerator).
 */
function phasesAt(z: { zr: Float64Array; zi: Float64Array }, cRe: Float64Array, cIm: Float64Array, n: number, K: number, ar: Float64Array, ai: Float64Array, o: number): number {
  let sr = 0;
  let si = 0;
  for (let k = 0; k < n; k++) {
    const p = cRe[k] * cRe[k] + cIm[k] * cIm[k];
    const c = z.zr[k];
    const s = z.zi[k];
    sr += p * c;
    si += p * s;
    if (k < K) {
      ar[o + k] = cRe[k] * c - cIm[k] * s;
      ai[o + k] = cRe[k] * s + cIm[k] * c;
    }
  }
  return sr * sr + si * si;
}

/** Options of `revival` and `revivalTime`, with their defaults. */
export interface RevivalOptions {
  /** The survival must first fall below this (default 0.5). */
  low?: number;
  /** A revival is a local maximum of the survival at or above this (default 0.9). */
  high?: number;
  /** Latest time searched (default: 4 times the estimate 4 pi / |E''| at the mean level, at least 40 periods). */
  horizon?: number;
  /** Most time steps in the search (default 200000). */
  maxSteps?: number;
  /** The analysis's budget (default: unlimited), polled every 256 steps; counts `TRIG_OPS` per level per step. */
  budget?: Budget;
}

/** The result of `revival`. */
export interface RevivalResult {
  /** The revival time (internal units), or null when there is none (or the search was stopped). */
  time: number | null;
  /** Why the budget stopped the search, or null. */
  stopped: StopReason | null;
}

/** The revival time, or null (see `revival`, which also says whether the budget stopped the search). */
export function revivalTime(basis: Eigenbasis, cRe: Float64Array, cIm: Float64Array, options: RevivalOptions = {}): number | null {
  return revival(basis, cRe, cIm, options).time;
}

/** The populated levels of a state: their indices, weights p_k = |c_k|^2 and the total. */
interface Populated {
  idx: number[];
  p: Float64Array;
  total: number;
  /** Mean level index, sum p_k k / total. */
  mean: number;
}

function populated(cRe: Float64Array, cIm: Float64Array, count: number): Populated {
  const n = Math.min(cRe.length, cIm.length, count);
  const p = new Float64Array(n);
  let total = 0;
  for (let k = 0; k < n; k++) {
    p[k] = cRe[k] * cRe[k] + cIm[k] * cIm[k];
    total += p[k];
  }
  const idx: number[] = [];
  let mean = 0;
  for (let k = 0; k < n; k++) if (p[k] > 1e-12 * total) idx.push(k);
  for (const k of idx) mean += (p[k] / total) * k;
  return { idx, p, total, mean };
}

/**
 * The revival time of a state. Box on [a, b]: T_rev = 4 m L^2 / (pi hbar) = 2 pi / E_1
 * (Styer, Am. J. Phys. 69, 56 (2001) (from memory)); oscillator: its period 2 pi / omega,
 * omega = E_1 - E_0; each divided by the common step of the populated levels (`commonStep`), so a
 * state on odd box levels only revives at T_rev / 8 and one on even oscillator levels after half a
 * period. A state on one level has none. Otherwise the first revival of the survival probability S(t) (see `evolve`):
 * the first local maximum with S >= `high` after S first falls below `low`, refined by bisection on
 * the slope S'(t); null when S never falls below `low` or no revival comes before the horizon.
 * A packet that returns intact after one classical period (S >= `high` again) counts as a revival, so
 * for a narrow packet in a nearly harmonic spectrum the answer is its classical period.
 * The default horizon follows from the expansion E_n ~ E + E' (n - m) + E'' (n - m)^2 / 2 about the mean
 * level m, whose quadratic phases realign after 4 pi / |E''| (the same source, from memory).
 * A search stopped by the budget gives time null and `stopped`.
 */
export function revival(basis: Eigenbasis, cRe: Float64Array, cIm: Float64Array, options: RevivalOptions = {}): RevivalResult {
  const pop = populated(cRe, cIm, basis.count);
  // A single populated level only turns its phase: the state never changes, so it has no revival.
  if (!(pop.total > 0) || pop.idx.length < 2) return { time: null, stopped: null };
  if (basis.kind === 'box' && basis.walls) {
    const L = basis.walls[1] - basis.walls[0];
    const n = pop.idx.map((k) => k + basis.firstLabel);
    return { time: (4 * basis.mass * L * L) / Math.PI / commonStep(n.map((q) => q * q)), stopped: null };
  }
  if (basis.kind === 'oscillator') {
    return { time: (2 * Math.PI) / (basis.energies[1] - basis.energies[0]) / commonStep(pop.idx), stopped: null };
  }
  const E = basis.energies;
  let emin = Infinity;
  let emax = -Infinity;
  for (const k of pop.idx) {
    emin = Math.min(emin, E[k]);
    emax = Math.max(emax, E[k]);
  }
  const spread = emax - emin;
  if (!(spread > 0)) return { time: null, stopped: null };
  const dt = (2 * Math.PI) / spread / 16;
  const horizon = options.horizon ?? defaultHorizon(E, basis.count, pop.mean, spread);
  const steps = Math.min(Math.max(16, options.maxSteps ?? 200000), Math.ceil(horizon / dt));
  return searchRevival(E, pop, dt, steps, options.low ?? 0.5, options.high ?? 0.9, options.budget ?? unlimitedBudget());
}

/**
 * The greatest common divisor of the differences of integer level energies (in units of the spectrum's
 * own step: n^2 for a box, n for the oscillator) from the first: the phases e^{-i E_n t} of every
 * populated level agree again after T / g, where T is the revival of the full spectrum. Only odd box
 * levels (a state symmetric about the centre) give g = 8 (n^2 = 1 mod 8 for odd n), only even
 * oscillator levels (a squeezed vacuum) g = 2 (derived in this comment).
 */
function commonStep(values: readonly number[]): number {
  const gcd = (p: number, q: number): number => (q === 0 ? p : gcd(q, p % q));
  let g = 0;
  for (const v of values) g = gcd(g, Math.abs(v - values[0]));
  return g > 0 ? g : 1;
}

/** Horizon from the curvature of E_n near the mean level m: max(4 (4 pi / |E''|), 40 periods). */
function defaultHorizon(E: Float64Array, count: number, mean: number, spread: number): number {
  const m = Math.min(Math.max(1, Math.round(mean)), count - 2);
  const e1 = count >= 3 ? E[m + 1] - E[m - 1] : spread;
  const e2 = count >= 3 ? E[m + 1] - 2 * E[m] + E[m - 1] : 0;
  const period = (2 * Math.PI * 2) / Math.max(Math.abs(e1), 1e-300);
  const rev = Math.abs(e2) > 0 ? (4 * Math.PI) / Math.abs(e2) : 0;
  return Math.max(4 * rev, 40 * period);
}

/** The slope S'(t) of S(t) = |sum p_k e^{-i E_k t}|^2 / W^2 (up to the factor 2 / W^2, whose sign is S's). */
function survivalSlope(E: Float64Array, pop: Populated): (t: number) => number {
  const { idx, p } = pop;
  const slope = (t: number): number => {
    let ar = 0;
    let ai = 0;
    let br = 0;
    let bi = 0;
    for (const k of idx) {
      const c = Math.cos(E[k] * t);
      const sn = Math.sin(E[k] * t);
      // A = sum p (c - i sn); A' = sum p E (-sn - i c).
      ar += p[k] * c;
      ai -= p[k] * sn;
      br -= p[k] * E[k] * sn;
      bi -= p[k] * E[k] * c;
    }
    return ar * br + ai * bi;
  };
  return slope;
}

/**
 * S(j dt) for j = 0, 1, 2, ... in turn: each level's phase e^{i E_k j dt} is rotated by e^{i E_k dt}
 * (four multiplications instead of a cosine and a sine) and recomputed exactly every `RESEED` steps
 * (evolutionPhases.ts, which `evolve` uses the same way), so the rounding of the rotation never grows
 * past RESEED steps (about 1e-14 relative; common practice).
 */
function steppedSurvival(E: Float64Array, pop: Populated, dt: number): () => number {
  const { idx, p, total } = pop;
  const m = idx.length;
  const zr = new Float64Array(m);
  const zi = new Float64Array(m);
  const wr = new Float64Array(m);
  const wi = new Float64Array(m);
  for (let q = 0; q < m; q++) {
    wr[q] = Math.cos(E[idx[q]] * dt);
    wi[q] = Math.sin(E[idx[q]] * dt);
  }
  let j = 0;
  return (): number => {
    let sr = 0;
    let si = 0;
    const exact = j % RESEED === 0;
    for (let q = 0; q < m; q++) {
      if (exact) {
        const t = E[idx[q]] * j * dt;
        zr[q] = Math.cos(t);
        zi[q] = Math.sin(t);
      } else {
        const r = zr[q] * wr[q] - zi[q] * wi[q];
        zi[q] = zr[q] * wi[q] + zi[q] * wr[q];
        zr[q] = r;
      }
      const pk = p[idx[q]];
      sr += pk * zr[q];
      si += pk * zi[q];
    }
    j++;
    return (sr * sr + si * si) / (total * total);
  };
}

/** Steps through S(t) for the first maximum >= high after a dip below low, then bisects its slope. */
function searchRevival(E: Float64Array, pop: Populated, dt: number, steps: number, low: number, high: number, budget: Budget): RevivalResult {
  const slope = survivalSlope(E, pop);
  const next = steppedSurvival(E, pop, dt);
  let fallen = false;
  let s0 = next();
  let s1 = next();
  for (let j = 1; j < steps; j++) {
    if ((j & 255) === 0) {
      // Four multiplications and two sums a level a step, a cosine and sine every RESEED steps.
      budget.count(256 * (ROTATE_OPS + TRIG_OPS / RESEED) * pop.idx.length);
      if (budget.expired()) return { time: null, stopped: budget.reason };
    }
    const s2 = next();
    if (!fallen) {
      if (s1 < low) fallen = true;
    } else if (s1 >= high && s1 >= s0 && s1 >= s2) {
      // Bisection on S'(t) = 2 Re(conj(A) A') / W^2, A = sum p_k e^{-i E_k t}: a root of the slope is
      // located to rounding, where comparing values of the flat maximum would stop at sqrt(eps).
      let lo = (j - 1) * dt;
      let hi = (j + 1) * dt;
      for (let it = 0; it < 200 && hi - lo > 4e-16 * hi; it++) {
        const mid = 0.5 * (lo + hi);
        if (mid <= lo || mid >= hi) break;
        if (slope(mid) > 0) lo = mid;
        else hi = mid;
      }
      return { time: 0.5 * (lo + hi), stopped: null };
    }
    s0 = s1;
    s1 = s2;
  }
  return { time: null, stopped: null };
}
