/**
 * Box coefficients of any piecewise-smooth state by the sine transform, with the state's jumps and kinks
 * (and its values at the walls) taken out first in closed form, so the transform only sees a remainder
 * whose odd periodic extension is continuous with a continuous slope.
 *
 * With u = x - a, q_n = n pi / L and c_n[f] = sqrt(2/L) integral_0^L sin(q_n u) f(u) du, the state is
 * split as psi = s + r with s a sum of piecewise-linear kernels whose coefficients are exact (derived in
 * this comment by integrating sin(q u) times a line by parts, using sin(q L) = 0):
 *   value jump of 1 at p:  g0(u) = H(u - p) - u/L,                c_n = sqrt(2/L) cos(q p) / q,
 *   slope jump of 1 at p:  g1(u) = (u - p)_+ - (L - p) u / L,      c_n = -sqrt(2/L) sin(q p) / q^2,
 *   value 1 at the wall a: w0(u) = 1 - u/L,                       c_n = sqrt(2/L) / q,
 *   value 1 at the wall b: wL(u) = u/L,                           c_n = -sqrt(2/L) (-1)^n / q.
 * All four vanish with every even derivative at both walls away from their own point, so the remainder r
 * keeps only jumps in psi'' and higher: its coefficients fall off at least like n^-3 and the transform's
 * aliasing error like N^-3 (dst.ts). The kernels need only rough one-sided values: an error in a jump
 * only leaves a small jump in r, which the transform then resolves like any other.
 *
 * One transform of N samples gives c_n for n < N, each carrying the aliases c_{2jN +- n} (j >= 1). The
 * error of the levels kept is estimated from the transform's own tail (no second transform): the
 * coefficients past the levels asked, between 0.7 N and 0.85 N, show the remainder's tail there, and a
 * level's leading alias, c_{2N - n} with 2N - n >= 1.15 N, lies further down that tail; the estimate is
 * the smaller of TAIL_FACTOR times the window's largest entry and PAIR_FACTOR n times its largest step of
 * two levels (the aliases pair up with opposite signs; the premise: the remainder's coefficients and their
 * steps fall off beyond the window at least like n^-2, which the kernels make true for n^-3 wherever the
 * state reports its breakpoints). Content far above N can alias onto a level inside while the window stays empty (a term
 * sin(412 pi x) lands on level 100 of 256 intervals): the samples' interpolant is then wrong between the
 * samples, so it is compared with the state at six midpoints of sample intervals, where an alias of size
 * e moves it by about e sqrt(2/L) (the alias and its image add with |sin(N pi u / L)| = 1 there), and the
 * largest difference enters the estimate too. A rounding floor of the sums is added. The samples start at
 * 8 on the shortest piece (a spline's knots), and N doubles until the estimate meets the tolerance.
 */
import type { Eigenbasis, Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';
import { boxCoefficientsFromSamples } from '../physics/dst';
import { sineLadder } from '../physics/sines';
import { packetAliasBound, type PacketSpec } from './packetPremise';
import { charge } from '../physics/budget';
import type { Budget } from './context';
import type { StateFunction } from './systems';

/** Box coefficients with a per-coefficient error estimate (both unnormalised, like the state as written). */
export interface BoxTransformResult {
  re: Float64Array;
  im: Float64Array;
  /** Estimated |c_n - c_n(exact)|: the tail, the interpolant's miss between samples and the sums' rounding. */
  error: Float64Array;
  /** Samples of the transform (N + 1 points). */
  samples: number;
  /** The trapezoid rule's integral of |psi|^2 on the samples (an independent check of a grid's norm). */
  norm: number;
  /** The samples as the grid of the norm and the energy integrals, when they resolve those (`trapezoidGrid`); else null. */
  grid: { q: Quadrature; values: GridValues } | null;
  /** The largest |psi| on the samples (a lower bound of the state's peak, as any grid's is). */
  peak: number;
}

/** Fewest samples of the transform. */
const MIN_SAMPLES = 64;

/**
 * The tail window: coefficients past the levels asked, from at least TAIL_FROM N up to TAIL_TO N, at least
 * TAIL_MIN of them. Below 0.85 N a coefficient's own alias c_{2N - m} is at most (0.85/1.15)^2 = 0.55 of
 * it for a tail falling off as n^-2 (0.4 as n^-3), so the window shows the tail rather than its cancellation.
 */
const TAIL_FROM = 0.7;
const TAIL_TO = 0.85;
const TAIL_MIN = 8;

/**
 * The leading alias of a level kept, c_{2N - n} with 2N - n >= 1.15 N, is at most (0.7/1.15)^2 = 0.37 of
 * the tail's envelope at the window's foot for a fall-off of n^-2, the further aliases add about 30 %, and
 * the window's largest entry is at least 0.45 of that envelope even where half the levels vanish and the
 * rest cancel against their aliases: 0.48 / 0.45 = 1.1, and 4 leaves room (derived in this comment).
 */
const TAIL_FACTOR = 4;

/**
 * What a smooth tail alone makes the interpolant miss by at a midpoint, as a multiple of sqrt(2/L) times the
 * window's largest entry: measured 0.003 to 0.3 on packets at and near a wall (their n^-3 tails, 128 to
 * 65,536 intervals), whose tails' terms nearly cancel there; 3 leaves room. A miss beyond it is content the
 * tail does not account for (an alias from far above N) and enters the estimate.
 */
const EXPLAINED = 3;

/**
 * A level's aliases come in pairs of opposite sign, c_{2jN + n} - c_{2jN - n}: n steps of two levels
 * (steps of two keep the parity, so a tail alternating between the walls' two laws is smooth in them).
 * Where the steps' sizes fall off beyond the window (at least like n^-2) the pairs add up to at most
 * n times the window's largest step, (0.85/1.15)^2 + ... < 1 of it; 2 leaves room (derived in this
 * comment). A smooth algebraic tail's pairs nearly cancel, so this bound is far below the tail's own.
 */
const PAIR_FACTOR = 2;

/** Sample intervals at whose midpoints the interpolant is compared with the state (spread by the golden ratio). */
const CHECK_POINTS = 6;

/**
 * An alias of size e moves the interpolant at a midpoint by 2 e sqrt(2/L) |cos(...)|; over six spread
 * midpoints the largest of those cosines is at least about 1/4, so e <= 2 sqrt(L/2) miss, doubled for room.
 */
const MISS_FACTOR = 4;

/** The kernels taken out of the state: its wall values and its breakpoints' sides. */
interface Kernels {
  w0: [number, number];
  wL: [number, number];
  sides: Sides[];
  pu: Float64Array;
}

/** One-sided limits of psi and psi' at a breakpoint, complex. */
interface Sides {
  p: number;
  jump: [number, number];
  kink: [number, number];
  /** The mean of the two one-sided values (what the remainder is continuous to at p). */
  mid: [number, number];
}

/** psi(p-), psi(p+), psi'(p-), psi'(p+) from a Taylor step back from p -+ delta (delta 1e-9 L). */
function sidesAt(state: StateFunction, points: number[], L: number): Sides[] {
  if (points.length === 0) return [];
  const d = 1e-9 * L;
  const xs = new Float64Array(points.length * 2);
  points.forEach((p, i) => {
    xs[2 * i] = p - d;
    xs[2 * i + 1] = p + d;
  });
  const v = state.evaluate(xs, 2);
  const one = (j: number, sign: number): [number, number, number, number] => {
    const re = v.re[j]! + sign * d * v.d1re![j]! + 0.5 * d * d * v.d2re![j]!;
    const im = v.im[j]! + sign * d * v.d1im![j]! + 0.5 * d * d * v.d2im![j]!;
    return [re, im, v.d1re![j]! + sign * d * v.d2re![j]!, v.d1im![j]! + sign * d * v.d2im![j]!];
  };
  return points.map((p, i) => {
    const l = one(2 * i, 1);
    const r = one(2 * i + 1, -1);
    return { p, jump: [r[0] - l[0], r[1] - l[1]], kink: [r[2] - l[2], r[3] - l[3]], mid: [(l[0] + r[0]) / 2, (l[1] + r[1]) / 2] };
  });
}

/** The kernels' sum s(u) at u (re, im), with H(0) = 1/2 so s is the mean of its sides at a breakpoint. */
function singularPart(u: number, L: number, w0: [number, number], wL: [number, number], sides: Sides[], pu: Float64Array): [number, number] {
  let re = w0[0] * (1 - u / L) + wL[0] * (u / L);
  let im = w0[1] * (1 - u / L) + wL[1] * (u / L);
  for (let i = 0; i < sides.length; i++) {
    const s = sides[i]!;
    const p = pu[i]!;
    const h = u > p ? 1 : u < p ? 0 : 0.5;
    const g0 = h - u / L;
    const g1 = (u > p ? u - p : 0) - ((L - p) * u) / L;
    re += s.jump[0] * g0 + s.kink[0] * g1;
    im += s.jump[1] * g0 + s.kink[1] * g1;
  }
  return [re, im];
}

/**
 * Adds the kernels' exact coefficients to re, im (n = 1 ... levels), and to `error` their rounding and
 * that of each sum and of its later normalisation: 16 eps times the sizes added.
 */
function addKernels(re: Float64Array, im: Float64Array, error: Float64Array, L: number, w0: [number, number], wL: [number, number], sides: Sides[], pu: Float64Array): void {
  const amp = Math.sqrt(2 / L);
  for (let k = 0; k < re.length; k++) {
    const n = k + 1;
    const q = (n * Math.PI) / L;
    const sign = n % 2 === 0 ? 1 : -1;
    let sr = (w0[0] - sign * wL[0]) / q;
    let si = (w0[1] - sign * wL[1]) / q;
    let size = Math.abs(sr) + Math.abs(si);
    for (let i = 0; i < sides.length; i++) {
      const s = sides[i]!;
      const c = Math.cos(q * pu[i]!) / q;
      const sn = Math.sin(q * pu[i]!) / (q * q);
      sr += s.jump[0] * c - s.kink[0] * sn;
      si += s.jump[1] * c - s.kink[1] * sn;
      // The rounding of q p moves the cosine and sine by about eps q p.
      size += (1 + q * pu[i]!) * ((Math.abs(s.jump[0]) + Math.abs(s.jump[1])) / q + (Math.abs(s.kink[0]) + Math.abs(s.kink[1])) / (q * q));
    }
    re[k]! += amp * sr;
    im[k]! += amp * si;
    error[k]! += 16 * Number.EPSILON * (amp * size + Math.abs(re[k]!) + Math.abs(im[k]!));
  }
}

/**
 * The first `levels` coefficients of the state in the box `basis` by the sine transform with the
 * breakpoints taken out, doubling the samples until the estimated error of every coefficient is within
 * 1e-12 of sqrt(norm) (or 1e-13 of the norm, as two grids must agree in expand.ts). Null when the box
 * does not apply (not a box, a mass that varies) or the estimate does not settle within `maxSamples`
 * (a spike, a breakpoint the state does not report): the caller then falls back to quadrature.
 */
export function boxTransform(state: StateFunction, basis: Eigenbasis, levels: number, breakpoints: number[], maxSamples: number, budget: Budget, packet?: PacketSpec): BoxTransformResult | null {
  if (basis.kind !== 'box' || !basis.walls || basis.masses || levels < 1) return null;
  const [a, b] = basis.walls;
  const L = b - a;
  const inner = breakpoints.filter((p) => p > a && p < b);
  const sides = sidesAt(state, inner, L);
  const pu = Float64Array.from(inner, (p) => p - a);
  const ends = state.evaluate(new Float64Array([a, b]), 0);
  const w0: [number, number] = [ends.re[0]!, ends.im[0]!];
  const wL: [number, number] = [ends.re[1]!, ends.im[1]!];
  if (![...w0, ...wL, ...sides.flatMap((s) => [...s.jump, ...s.kink])].every(Number.isFinite)) return null;
  const kernels = { w0, wL, sides, pu };
  // A tail window of TAIL_MIN levels past those asked, and 8 samples on the shortest smooth piece: a
  // remainder with structure at the pieces' scale (a spline's knots) is then resolved, not aliased.
  let shortest = L;
  for (let i = 0; i <= inner.length; i++) shortest = Math.min(shortest, (i < inner.length ? inner[i]! : b) - (i > 0 ? inner[i - 1]! : a));
  let N = MIN_SAMPLES;
  while ((tailWindow(N, levels)[1] - tailWindow(N, levels)[0] + 1 < TAIL_MIN || N * shortest < 8 * L) && N <= maxSamples) N *= 2;
  let lastWorst = Infinity;
  let hopeless = false;
  for (; N <= maxSamples; N *= 2) {
    // The first samples of a state without breakpoints come with two derivatives: they may serve as the grid too.
    const r = remainderSamples(state, a, L, N, kernels, inner.length === 0 && lastWorst === Infinity ? 2 : 0);
    if (!r) return null;
    charge(budget, 6 * N * Math.log2(N), N + 1);
    const all = boxCoefficientsFromSamples(r.re, r.im, a, b, N - 1);
    if (!all.ok || all.re.length < levels) return null;
    const [lo, hi] = tailWindow(N, levels);
    let tail = 0;
    let step = 0;
    for (let m = lo; m <= hi; m++) {
      tail = Math.max(tail, Math.hypot(all.re[m - 1]!, all.im[m - 1]!));
      if (m + 2 <= hi) step = Math.max(step, Math.hypot(all.re[m + 1]! - all.re[m - 1]!, all.im[m + 1]! - all.im[m - 1]!));
    }
    // A Gaussian packet whose closed form bounds its aliases below the tolerance's 1/100 needs no check
    // between the samples: the bound itself enters the estimate (packetPremise.ts).
    const bound = packet ? packetAliasBound(packet, [a, b], levels, N) : Infinity;
    const proven = bound <= 1e-14 * Math.sqrt(Math.max(r.norm, 1e-300));
    const miss = proven ? 0 : interpolantMiss(state, a, L, N, all, kernels, budget);
    if (miss === null) return null;
    // Rounding of the samples and sums: about eps (log2 N + sqrt n) times the sum of |psi_j| + |s_j|, times h sqrt(2/L).
    const roundBase = 4e-16 * r.absSum * (L / N) * Math.sqrt(2 / L);
    // The part of the miss a smooth tail explains is in the tail's term; only the rest can be a hidden alias.
    const explained = EXPLAINED * Math.sqrt(2 / L) * tail;
    const hidden = proven ? bound : MISS_FACTOR * Math.sqrt(L / 2) * Math.max(0, miss - explained);
    const error = new Float64Array(levels);
    let worst = 0;
    const tailBound = TAIL_FACTOR * tail;
    const floor = hidden + roundBase * Math.log2(N);
    for (let k = 0; k < levels; k++) {
      const pair = PAIR_FACTOR * (k + 1) * step;
      const e = (pair < tailBound ? pair : tailBound) + floor + roundBase * Math.sqrt(k + 1);
      error[k] = e;
      if (e > worst) worst = e;
    }
    const norm = Math.max(r.norm, 1e-300);
    if (worst <= 1e-12 * Math.sqrt(norm) || worst <= 1e-13 * norm) {
      const re = all.re.slice(0, levels);
      const im = all.im.slice(0, levels);
      addKernels(re, im, error, L, w0, wL, sides, pu);
      if (!r.complex) im.fill(0);
      const grid = r.values ? trapezoidGrid(r.xs, r.values, L, inner.length) : null;
      return { re, im, error, samples: N + 1, norm: r.norm, grid, peak: r.peak };
    }
    // Algebraic decay at the rate seen so far: give up when two doublings in a row say the cap cannot
    // reach the tolerance (the first doublings of a wall value's tail fall slower than its law).
    if (Number.isFinite(lastWorst) && worst > 0) {
      const rate = Math.log2(lastWorst / worst);
      const need = rate > 0.5 ? N * Math.pow(worst / (1e-12 * Math.sqrt(norm)), 1 / rate) : Infinity;
      if (need > 2 * maxSamples && hopeless) return null;
      hopeless = need > 2 * maxSamples;
    }
    lastWorst = worst;
  }
  return null;
}

/** The tail window [lo, hi] of levels (1-based) for N intervals and `levels` levels asked. */
function tailWindow(N: number, levels: number): [number, number] {
  return [Math.max(levels + 1, Math.ceil(TAIL_FROM * N)), Math.floor(TAIL_TO * N)];
}

/**
 * The largest |r(u) - sum_m c_m phi_m(u)| over CHECK_POINTS midpoints of sample intervals (its rounding
 * stays in: it only adds to the estimate); null when the state is not finite there.
 */
function interpolantMiss(state: StateFunction, a: number, L: number, N: number, c: { re: Float64Array; im: Float64Array }, k: Kernels, budget: Budget): number | null {
  const xs = new Float64Array(CHECK_POINTS);
  for (let p = 0; p < CHECK_POINTS; p++) {
    const frac = ((p + 1) * 0.6180339887498949) % 1;
    xs[p] = a + ((Math.min(N - 1, Math.floor(frac * N)) + 0.5) * L) / N;
  }
  const v = state.evaluate(xs, 0);
  const m = c.re.length;
  // The ladder and the sums: about 4 counted operations a level at each point.
  budget.count(CHECK_POINTS * 4 * m, CHECK_POINTS);
  const S = new Float64Array(m + 1);
  const C = new Float64Array(m + 1);
  const amp = Math.sqrt(2 / L);
  let worst = 0;
  for (let p = 0; p < CHECK_POINTS; p++) {
    const u = xs[p]! - a;
    sineLadder((Math.PI * u) / L, m, S, C);
    let sr = 0;
    let si = 0;
    for (let j = 0; j < m; j++) {
      sr += c.re[j]! * S[j + 1]!;
      si += c.im[j]! * S[j + 1]!;
    }
    const [kr, ki] = singularPart(u, L, k.w0, k.wL, k.sides, k.pu);
    const dr = v.re[p]! - kr - amp * sr;
    const di = v.im[p]! - ki - amp * si;
    if (!Number.isFinite(dr) || !Number.isFinite(di)) return null;
    worst = Math.max(worst, Math.hypot(dr, di));
  }
  return worst;
}

/**
 * r = psi - s at u_j = j L / N, j = 0 ... N, with the trapezoid norm of psi, the sum of |psi| + |s| and the
 * largest |psi| sampled; null when
 * a sample is not finite. A sample on a breakpoint takes the mean of psi's two sides, like s. With `order`
 * 2 the samples of psi with two derivatives are kept too (`values`), for the trapezoid grid.
 */
function remainderSamples(
  state: StateFunction,
  a: number,
  L: number,
  N: number,
  k: Kernels,
  order: 0 | 2,
): { re: Float64Array; im: Float64Array; norm: number; absSum: number; complex: boolean; xs: Float64Array; values: GridValues | null; peak: number } | null {
  const xs = new Float64Array(N + 1);
  for (let j = 0; j <= N; j++) xs[j] = a + (L * j) / N;
  const v = state.evaluate(xs, order);
  const values = order === 2 ? { ...v, re: v.re.slice(), im: v.im.slice() } : null;
  const re = v.re;
  const im = v.im;
  let norm = 0;
  let absSum = 0;
  let complex = false;
  const h = L / N;
  const plain = k.sides.length === 0;
  let peak2 = 0;
  let peak = 0;
  for (let j = 0; j <= N; j++) {
    let pr = re[j]!;
    let pi = im[j]!;
    if (!Number.isFinite(pr) || !Number.isFinite(pi)) return null;
    let u = (L * j) / N;
    for (let i = 0; i < k.sides.length; i++) {
      if (Math.abs(u - k.pu[i]!) <= 1e-12 * L) {
        u = k.pu[i]!;
        pr = k.sides[i]!.mid[0];
        pi = k.sides[i]!.mid[1];
      }
    }
    if (pi !== 0) complex = true;
    norm += (j === 0 || j === N ? 0.5 : 1) * h * (pr * pr + pi * pi);
    // Without breakpoints s is the line through the wall values (singularPart's first term).
    let sr: number;
    let si: number;
    if (plain) {
      sr = k.w0[0] * (1 - u / L) + k.wL[0] * (u / L);
      si = k.w0[1] * (1 - u / L) + k.wL[1] * (u / L);
    } else [sr, si] = singularPart(u, L, k.w0, k.wL, k.sides, k.pu);
    re[j] = pr - sr;
    im[j] = pi - si;
    // The sizes that enter the subtraction set its rounding, not the (often tiny) remainder.
    absSum += Math.abs(pr) + Math.abs(pi) + Math.abs(sr) + Math.abs(si);
    const p2 = pr * pr + pi * pi;
    if (p2 > peak2) {
      peak2 = p2;
      peak = Math.hypot(pr, pi);
    }
  }
  return { re, im, norm, absSum, complex, xs, values, peak };
}

/**
 * The samples as a quadrature grid (the trapezoid rule, weights h and h/2 at the walls) when they resolve
 * the state's integrals as well as its coefficients: no breakpoints inside, and psi, psi' and psi'' at both
 * walls below 1e-14 of their largest sampled sizes. Then |psi|^2, |psi'|^2 and |H psi|^2 have odd periodic
 * extensions whose jumps in the first derivatives (Euler-Maclaurin's h^2 terms, common practice) are products of
 * those wall values, and their content lies below the transform's N (the tail and the interpolant said so),
 * which the trapezoid rule integrates exactly. Null otherwise (the caller builds a Gauss-Legendre grid).
 */
function trapezoidGrid(xs: Float64Array, v: GridValues, L: number, inner: number): { q: Quadrature; values: GridValues } | null {
  if (inner > 0 || !v.d1re || !v.d1im || !v.d2re || !v.d2im) return null;
  const n = xs.length;
  const N = n - 1;
  const scale = [0, 0, 0];
  const parts = [
    [v.re, v.im],
    [v.d1re, v.d1im],
    [v.d2re, v.d2im],
  ] as const;
  for (let d = 0; d < 3; d++) {
    const [r, i] = parts[d]!;
    let m = 0;
    for (let j = 0; j < n; j++) m = Math.max(m, Math.abs(r[j]!) + Math.abs(i[j]!));
    scale[d] = m;
    const ends = Math.abs(r[0]!) + Math.abs(i[0]!) + Math.abs(r[N]!) + Math.abs(i[N]!);
    if (!(ends <= 1e-14 * m)) return null;
  }
  if (!(scale[0]! > 0)) return null;
  const w = new Float64Array(n).fill(L / N);
  w[0] = w[N] = L / (2 * N);
  return { q: { x: xs, w }, values: v };
}
