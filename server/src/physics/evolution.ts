/**
 * Time evolution of a state expanded in an energy eigenbasis (hbar = 1):
 * psi(x, t) = sum_k c_k e^{-i E_k t} phi_k(x). Times are in internal units (1 / energy unit);
 * the analysis converts them for display.
 */
import type { Eigenbasis, Quadrature } from './types';
import { compositeGaussLegendre } from './quadrature';

/** Complex coefficients c_k = re[k] + i im[k] by level index. */
export interface Coefficients {
  re: Float64Array;
  im: Float64Array;
}

/**
 * psi(x, t) = sum_k c_k e^{-i E_k t} phi_k(x) at every x of `xs` (the Schroedinger equation's solution
 * for a time-independent H, each stationary state turning with its phase e^{-i E_k t}; Griffiths,
 * Introduction to Quantum Mechanics, ch. 2 (from memory)). Levels beyond basis.count are ignored.
 */
export function psiAt(basis: Eigenbasis, c: Coefficients, t: number, xs: Float64Array): Coefficients {
  const K = Math.min(c.re.length, c.im.length, basis.count);
  const nx = xs.length;
  const re = new Float64Array(nx);
  const im = new Float64Array(nx);
  if (K === 0 || nx === 0) return { re, im };
  const table = new Float64Array(K * nx);
  basis.table(xs, K, table);
  for (let k = 0; k < K; k++) {
    const ph = -basis.energies[k] * t;
    const cr = Math.cos(ph);
    const ci = Math.sin(ph);
    const ar = c.re[k] * cr - c.im[k] * ci;
    const ai = c.re[k] * ci + c.im[k] * cr;
    if (ar === 0 && ai === 0) continue;
    const row = k * nx;
    for (let j = 0; j < nx; j++) {
      re[j] += ar * table[row + j];
      im[j] += ai * table[row + j];
    }
  }
  return { re, im };
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
   * Polled between rows of the matrix elements and between times; once it returns true the evolution
   * stops, and the result holds only the times finished (`complete` false).
   */
  cancelled?: () => boolean;
}

/** Real symmetric X_jk = <j|x|k> and real antisymmetric D_jk = integral phi_j phi_k' dx (so <j|p|k> = -i D_jk). */
export interface MatrixElements {
  levels: number;
  x: Float64Array;
  d: Float64Array;
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
 * used directly. With `cancelled`, the quadrature polls it once per row and returns null once it is true.
 */
export function matrixElements(basis: Eigenbasis, levels: number): MatrixElements;
export function matrixElements(basis: Eigenbasis, levels: number, cancelled: () => boolean): MatrixElements | null;
export function matrixElements(basis: Eigenbasis, levels: number, cancelled?: () => boolean): MatrixElements | null {
  const K = Math.max(0, Math.min(levels, basis.count));
  const x = new Float64Array(K * K);
  const d = new Float64Array(K * K);
  if (K === 0) return { levels: 0, x, d };
  if (basis.matrixElements) {
    // Closed form from the basis (sine series): no table on a grid.
    const m = basis.matrixElements(K);
    x.set(m.x.subarray(0, K * K));
    d.set(m.d.subarray(0, K * K));
    return symmetrise(K, x, d);
  }
  const quad = evolutionQuadrature(basis, K);
  const nq = quad.x.length;
  const chunk = Math.max(1, Math.floor(4194304 / (2 * K)));
  for (let s = 0; s < nq; s += chunk) {
    const e = Math.min(nq, s + chunk);
    const m = e - s;
    const xs = quad.x.subarray(s, e);
    const f = new Float64Array(K * m);
    const f1 = new Float64Array(K * m);
    basis.table(xs, K, f, f1);
    const wx = new Float64Array(m);
    const w = quad.w.subarray(s, e);
    for (let i = 0; i < m; i++) wx[i] = w[i] * xs[i];
    for (let j = 0; j < K; j++) {
      if (cancelled?.()) return null;
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
  }
  return symmetrise(K, x, d);
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
  return { levels: K, x, d };
}

/** The result of `evolve`: one entry per time. */
export interface EvolveResult {
  meanX: Float64Array;
  meanP: Float64Array;
  survival: Float64Array;
  /** |psi(x, t)|^2 on options.density for each time (normalised state). */
  density?: Float64Array[];
  /** False when `cancelled` stopped the evolution: the arrays then hold only the first times. */
  complete: boolean;
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
  const result: EvolveResult = { meanX, meanP, survival, complete: true };
  if (!(total > 0) || n === 0) {
    meanX.fill(NaN);
    meanP.fill(NaN);
    survival.fill(NaN);
    return result;
  }
  const stopped = (done: number): EvolveResult => {
    const cut: EvolveResult = { meanX: meanX.slice(0, done), meanP: meanP.slice(0, done), survival: survival.slice(0, done), complete: false };
    if (result.density) cut.density = result.density.slice(0, done);
    return cut;
  };
  const me = matrixElements(basis, K, options.cancelled ?? (() => false));
  if (me === null) return stopped(0);
  const ar = new Float64Array(K);
  const ai = new Float64Array(K);
  const xs = options.density;
  let table: Float64Array | null = null;
  if (xs) {
    table = new Float64Array(K * xs.length);
    basis.table(xs, K, table);
    result.density = [];
  }
  let wK = 0;
  for (let k = 0; k < K; k++) wK += cRe[k] * cRe[k] + cIm[k] * cIm[k];
  for (let it = 0; it < nt; it++) {
    if (options.cancelled?.()) return stopped(it);
    const t = times[it];
    let sr = 0;
    let si = 0;
    for (let k = 0; k < n; k++) {
      const p = cRe[k] * cRe[k] + cIm[k] * cIm[k];
      const ph = -basis.energies[k] * t;
      sr += p * Math.cos(ph);
      si += p * Math.sin(ph);
      if (k < K) {
        const c = Math.cos(ph);
        const s = Math.sin(ph);
        ar[k] = cRe[k] * c - cIm[k] * s;
        ai[k] = cRe[k] * s + cIm[k] * c;
      }
    }
    survival[it] = (sr * sr + si * si) / (total * total);
    // <x> = ar.X ar + ai.X ai; <p> = ar.D ai - ai.D ar (X symmetric, D antisymmetric).
    let mx = 0;
    let mp = 0;
    for (let j = 0; j < K; j++) {
      const row = j * K;
      let xr = 0;
      let xi = 0;
      let dr = 0;
      let di = 0;
      for (let k = 0; k < K; k++) {
        const X = me.x[row + k];
        const D = me.d[row + k];
        xr += X * ar[k];
        xi += X * ai[k];
        dr += D * ar[k];
        di += D * ai[k];
      }
      mx += ar[j] * xr + ai[j] * xi;
      mp += ar[j] * di - ai[j] * dr;
    }
    meanX[it] = mx / wK;
    meanP[it] = mp / wK;
    if (xs && table && result.density) {
      const nx = xs.length;
      const pr = new Float64Array(nx);
      const pi = new Float64Array(nx);
      for (let k = 0; k < K; k++) {
        const row = k * nx;
        for (let j = 0; j < nx; j++) {
          pr[j] += ar[k] * table[row + j];
          pi[j] += ai[k] * table[row + j];
        }
      }
      const dens = new Float64Array(nx);
      for (let j = 0; j < nx; j++) dens[j] = (pr[j] * pr[j] + pi[j] * pi[j]) / wK;
      result.density.push(dens);
    }
  }
  return result;
}

/** Options of `revivalTime`, with their defaults. */
export interface RevivalOptions {
  /** The survival must first fall below this (default 0.5). */
  low?: number;
  /** A revival is a local maximum of the survival at or above this (default 0.9). */
  high?: number;
  /** Latest time searched (default: 4 times the estimate 4 pi / |E''| at the mean level, at least 40 periods). */
  horizon?: number;
  /** Most time steps in the search (default 200000). */
  maxSteps?: number;
  /** Polled every 256 steps of the search; once it returns true the search gives up (null). */
  cancelled?: () => boolean;
}

/**
 * The revival time of a state. Box on [a, b]: T_rev = 4 m L^2 / (pi hbar) = 2 pi / E_1
 * (Styer, Am. J. Phys. 69, 56 (2001) (from memory)); oscillator: its period 2 pi / omega,
 * omega = E_1 - E_0. Otherwise the first revival of the survival probability S(t) (see `evolve`):
 * the first local maximum with S >= `high` after S first falls below `low`, refined by bisection on
 * the slope S'(t); null when S never falls below `low` or no revival comes before the horizon.
 * A packet that returns intact after one classical period (S >= `high` again) counts as a revival, so
 * for a narrow packet in a nearly harmonic spectrum the answer is its classical period.
 * The default horizon follows from the expansion E_n ~ E + E' (n - m) + E'' (n - m)^2 / 2 about the mean
 * level m, whose quadratic phases realign after 4 pi / |E''| (the same source, from memory).
 * A search stopped by `cancelled` returns null too.
 */
export function revivalTime(basis: Eigenbasis, cRe: Float64Array, cIm: Float64Array, options: RevivalOptions = {}): number | null {
  if (basis.kind === 'box' && basis.walls) {
    const L = basis.walls[1] - basis.walls[0];
    return (4 * basis.mass * L * L) / Math.PI;
  }
  if (basis.kind === 'oscillator') {
    if (basis.count < 2) return null;
    return (2 * Math.PI) / (basis.energies[1] - basis.energies[0]);
  }
  const n = Math.min(cRe.length, cIm.length, basis.count);
  const p = new Float64Array(n);
  let total = 0;
  for (let k = 0; k < n; k++) {
    p[k] = cRe[k] * cRe[k] + cIm[k] * cIm[k];
    total += p[k];
  }
  if (!(total > 0)) return null;
  const idx: number[] = [];
  for (let k = 0; k < n; k++) if (p[k] > 1e-12 * total) idx.push(k);
  if (idx.length < 2) return null;
  const E = basis.energies;
  let emin = Infinity;
  let emax = -Infinity;
  let mean = 0;
  for (const k of idx) {
    emin = Math.min(emin, E[k]);
    emax = Math.max(emax, E[k]);
    mean += (p[k] / total) * k;
  }
  const spread = emax - emin;
  if (!(spread > 0)) return null;
  const dt = (2 * Math.PI) / spread / 16;
  // Horizon from the curvature of E_n near the mean level.
  const m = Math.min(Math.max(1, Math.round(mean)), basis.count - 2);
  let horizon = options.horizon;
  if (horizon === undefined) {
    const e1 = basis.count >= 3 ? E[m + 1] - E[m - 1] : spread;
    const e2 = basis.count >= 3 ? E[m + 1] - 2 * E[m] + E[m - 1] : 0;
    const period = (2 * Math.PI * 2) / Math.max(Math.abs(e1), 1e-300);
    const rev = Math.abs(e2) > 0 ? (4 * Math.PI) / Math.abs(e2) : 0;
    horizon = Math.max(4 * rev, 40 * period);
  }
  const maxSteps = Math.max(16, options.maxSteps ?? 200000);
  const steps = Math.min(maxSteps, Math.ceil(horizon / dt));
  const low = options.low ?? 0.5;
  const high = options.high ?? 0.9;
  const S = (t: number): number => {
    let sr = 0;
    let si = 0;
    for (const k of idx) {
      sr += p[k] * Math.cos(E[k] * t);
      si += p[k] * Math.sin(E[k] * t);
    }
    return (sr * sr + si * si) / (total * total);
  };
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
  let fallen = false;
  let s0 = S(0);
  let s1 = S(dt);
  for (let j = 1; j < steps; j++) {
    if ((j & 255) === 0 && options.cancelled?.()) return null;
    const s2 = S((j + 1) * dt);
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
      return 0.5 * (lo + hi);
    }
    s0 = s1;
    s1 = s2;
  }
  return null;
}
