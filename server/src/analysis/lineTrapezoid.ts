/**
 * Oscillator coefficients of a state on the whole line by the trapezoid rule on a uniform grid, with
 * the error from the nested half grid (every other node: no new evaluations, no second projection).
 *
 * For an integrand f = phi_n psi that decays at both ends of the window, the trapezoid rule of step h
 * has the error sum over j != 0 of F(2 pi j / h), F the Fourier transform of f (the Poisson summation
 * formula; common practice): it converges faster than any power once 2 pi / h passes the edge of f's
 * spectrum, and it beats composite Gauss-Legendre there (no crowding at panel ends). The spectrum of
 * phi_n ends near sqrt(2 m E_n) (the Hermite functions are their own Fourier transforms), so the grid
 * starts at pi / h = 1.3 times the highest level's wave number at the centre: the half grid (step 2 h)
 * then already resolves the basis, and the fine grid (step h) is twice oversampled. The half grid keeps
 * exactly the terms F(2 pi j / (2h)) with even j of the fine grid's error plus those with odd j, so
 * |fine - half| is led by F(pi / h), which bounds the fine grid's error whenever f's spectrum falls off
 * beyond pi / h (the premise the box's nested transforms use); the estimate is twice that difference
 * plus the floors. A state whose spectrum has a line the half grid cannot see (a component aliasing
 * alike on both grids) breaks the premise; the caller checks the lowest levels and the norm on its
 * Gauss-Legendre grid, whose nodes share nothing with this one (`lineCheck`).
 */
import type { Eigenbasis, Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';
import { Stopped, charge } from '../physics/budget';
import { project } from '../physics/project';
import { compositeGaussLegendre } from '../physics/quadrature';
import type { Budget } from './context';
import type { StateFunction } from './systems';

/** The coefficients with a per-coefficient error estimate (unnormalised, like the state as written). */
export interface LineTrapezoidResult {
  re: Float64Array;
  im: Float64Array;
  error: Float64Array;
  /** Trapezoid norm of the state on the fine grid. */
  norm: number;
  /** Intervals of the fine grid. */
  intervals: number;
  /** The first and last node summed (the rest hold together at most negligible^2 of the norm). */
  span: [number, number];
}

/** pi / h over the highest level's wave number at the centre (derived in the file comment). */
const OVERSAMPLE = 1.3;

/** Fewest intervals, and how many doublings are tried before the Gauss-Legendre path takes over. */
const MIN_INTERVALS = 64;
const DOUBLINGS = 2;

/**
 * The first `levels` oscillator coefficients over `window` (which holds essentially all of |psi|^2), or
 * null when the basis is not the oscillator, the state is not finite on the grid, the budget runs out,
 * or the estimate does not settle within `maxNodes` (the caller then projects by quadrature). Nodes
 * holding together at most negligible^2 of the norm are left out of the sums (project.ts's rule).
 */
export function lineTrapezoid(
  state: StateFunction,
  basis: Eigenbasis,
  levels: number,
  window: [number, number],
  waveNumber: number,
  options: { maxNodes: number; negligible: number; budget: Budget },
): LineTrapezoidResult | null {
  if (basis.kind !== 'oscillator' || !basis.weightedSums || basis.walls || basis.masses || basis.center === null || levels < 1) return null;
  const [a, b] = window;
  const W = b - a;
  if (!(W > 0) || !Number.isFinite(W) || !(waveNumber > 0)) return null;
  let N = MIN_INTERVALS;
  while (N * Math.PI < OVERSAMPLE * waveNumber * W && N <= options.maxNodes) N *= 2;
  // Cramer's inequality (from memory): every normalised Hermite function is at most 1.09 pi^(-1/4) in size,
  // which is 1.09 phi_0 at the centre; it scales the rounding floor of the sums.
  const row = new Float64Array(1);
  basis.table(Float64Array.of(basis.center), 1, row);
  const phiMax = 1.09 * Math.abs(row[0]!);
  try {
    for (let t = 0; t <= DOUBLINGS && N + 1 <= options.maxNodes; t++, N *= 2) {
      const r = onGrid(state, basis, levels, a, W, N, phiMax, options);
      if (r === null) return null;
      if (r !== 'unsettled') return r;
    }
  } catch (err) {
    if (err instanceof Stopped) return null;
    throw err;
  }
  return null;
}

/** One grid of N intervals: the coefficients when the estimate settles, 'unsettled' when not, null when unusable. */
function onGrid(
  state: StateFunction,
  basis: Eigenbasis,
  levels: number,
  a: number,
  W: number,
  N: number,
  phiMax: number,
  options: { negligible: number; budget: Budget },
): LineTrapezoidResult | 'unsettled' | null {
  const h = W / N;
  const xs = new Float64Array(N + 1);
  for (let j = 0; j <= N; j++) xs[j] = a + (W * j) / N;
  const v = state.evaluate(xs, 0);
  charge(options.budget, N + 1, N + 1);
  let norm = 0;
  let absSum = 0;
  for (let j = 0; j <= N; j++) {
    const r = v.re[j]!;
    const i = v.im[j]!;
    if (!Number.isFinite(r) || !Number.isFinite(i)) return null;
    const e = j === 0 || j === N ? 0.5 : 1;
    norm += e * h * (r * r + i * i);
    absSum += e * h * (Math.abs(r) + Math.abs(i));
  }
  if (!(norm > 0) || !Number.isFinite(norm)) return null;
  const nodes = splitNodes(xs, v, h, (options.negligible * options.negligible * norm) / (N + 1));
  if (nodes === null) return null;
  const { ex, er, ei, ox, or, oi, first, last } = nodes;
  const evenRe = new Float64Array(levels);
  const evenIm = new Float64Array(levels);
  const oddRe = new Float64Array(levels);
  const oddIm = new Float64Array(levels);
  basis.weightedSums!(ex, er, ei, levels, evenRe, evenIm, options.budget);
  basis.weightedSums!(ox, or, oi, levels, oddRe, oddIm, options.budget);
  const re = new Float64Array(levels);
  const im = new Float64Array(levels);
  const error = new Float64Array(levels);
  const tol = Math.max(1e-12 * Math.sqrt(norm), 1e-13 * norm);
  // Rounding: about eps (log2 N + sqrt n) times the sum of the terms' sizes (the recurrence loses about
  // sqrt n eps relative); the nodes left out move no coefficient by more than negligible sqrt(norm).
  const floor = options.negligible * Math.sqrt(norm);
  const roundBase = 4e-16 * absSum * phiMax;
  let worst = 0;
  for (let k = 0; k < levels; k++) {
    re[k] = h * (evenRe[k]! + oddRe[k]!);
    im[k] = h * (evenIm[k]! + oddIm[k]!);
    const dr = re[k]! - 2 * h * evenRe[k]!;
    const di = im[k]! - 2 * h * evenIm[k]!;
    const e = 2 * Math.hypot(dr, di) + floor + roundBase * (Math.log2(N) + Math.sqrt(k + 1));
    error[k] = e;
    if (e > worst) worst = e;
  }
  if (worst > tol) return 'unsettled';
  return { re, im, error, norm, intervals: N, span: [xs[first]!, xs[last]!] };
}

/**
 * Even and odd nodes apart, each with weights psi_j (the ends halved), so fine = h (E + O) and half = 2 h E;
 * nodes with h |psi_j|^2 below `below` get zero weights (left out of the sums). Null when none is kept.
 */
function splitNodes(xs: Float64Array, v: GridValues, h: number, below: number) {
  const N = xs.length - 1;
  const half = Math.floor(N / 2) + 1;
  const ex = new Float64Array(half);
  const er = new Float64Array(half);
  const ei = new Float64Array(half);
  const ox = new Float64Array(N + 1 - half);
  const or = new Float64Array(ox.length);
  const oi = new Float64Array(ox.length);
  let first = -1;
  let last = -1;
  for (let j = 0; j <= N; j++) {
    const r = v.re[j]!;
    const i = v.im[j]!;
    const e = j === 0 || j === N ? 0.5 : 1;
    const keep = e * h * (r * r + i * i) >= below;
    if (keep) {
      if (first < 0) first = j;
      last = j;
    }
    if (j % 2 === 0) {
      ex[j >> 1] = xs[j]!;
      er[j >> 1] = keep ? e * r : 0;
      ei[j >> 1] = keep ? e * i : 0;
    } else {
      ox[j >> 1] = xs[j]!;
      or[j >> 1] = keep ? r : 0;
      oi[j >> 1] = keep ? i : 0;
    }
  }
  return first < 0 ? null : { ex, er, ei, ox, or, oi, first, last };
}

/**
 * The trapezoid's lowest levels (up to four) and its norm against the Gauss-Legendre grid of the caller,
 * which shares no nodes with it: true when each coefficient differs by at most the tolerance of two grids
 * plus its own estimate and the nodes left out (negligible sqrt(norm), as in project.ts), and the norms by
 * the tolerance. The lowest levels cost a few recurrence steps a node, and a component of the state that
 * aliases alike on both nested grids shows in them.
 */
export function lineCheck(basis: Eigenbasis, q: Quadrature, values: GridValues, fast: LineTrapezoidResult, norm: number, negligible: number): boolean {
  const tol = Math.max(1e-12 * Math.sqrt(norm), 1e-13 * norm);
  if (!(Math.abs(fast.norm - norm) <= tol)) return false;
  const m = Math.min(4, fast.re.length);
  const c = project(basis, q, values.re, values.im, m, { negligible });
  const left = negligible * Math.sqrt(norm);
  for (let k = 0; k < m; k++) if (!(Math.hypot(c.re[k]! - fast.re[k]!, c.im[k]! - fast.im[k]!) <= tol + left + fast.error[k]!)) return false;
  return true;
}

/**
 * The Gauss-Legendre grid that serves the norm, the energy integrals, the parity and the check above once
 * the trapezoid has settled: only where the state lives (its span, two of the fine grid's steps wider, within
 * the window) and the mirror image of that about the centre (the parity needs a region symmetric about
 * it), with panels sized to the highest level's wave number there (`panelPhase` for the k h of a panel).
 * A span that reaches the centre gives one interval symmetric about it.
 */
export function lineGrid(basis: Eigenbasis, fast: LineTrapezoidResult, window: [number, number], grid: { order: number; panelPhase: number; waveNumber: (span: [number, number]) => number }): Quadrature {
  const c = basis.center ?? (window[0] + window[1]) / 2;
  const h = (window[1] - window[0]) / fast.intervals;
  const lo = Math.max(window[0], fast.span[0] - 2 * h);
  const hi = Math.min(window[1], fast.span[1] + 2 * h);
  const reach = Math.max(Math.abs(lo - c), Math.abs(hi - c));
  // One interval [c - reach, c + reach] when the span holds the centre, else the span and its mirror.
  const near = lo <= c && hi >= c ? 0 : Math.min(Math.abs(lo - c), Math.abs(hi - c));
  const right: [number, number] = [c + near, c + reach];
  const k = grid.waveNumber(near === 0 ? [c - reach, c + reach] : lo > c ? [lo, hi] : [2 * c - hi, 2 * c - lo]);
  const panels = Math.max(near === 0 ? 2 : 1, Math.ceil((k * (right[1] - right[0])) / (2 * grid.panelPhase)));
  const half = compositeGaussLegendre(right[0], right[1], { panels, order: grid.order });
  const n = half.x.length;
  // The left half is the right half mirrored (exactly negated about 0, so the parity finds its nodes).
  const x = new Float64Array(2 * n);
  const w = new Float64Array(2 * n);
  for (let j = 0; j < n; j++) {
    x[n - 1 - j] = 2 * c - half.x[j]!;
    w[n - 1 - j] = half.w[j]!;
    x[n + j] = half.x[j]!;
    w[n + j] = half.w[j]!;
  }
  return { x, w };
}
