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
 * The error of each coefficient is estimated from the nested half grid (every other sample, no new
 * evaluations): the transform of N samples aliases c_n onto c_{2jN +- n}, and the transform of 2N samples
 * keeps exactly the terms with even j, so their difference is the odd-j terms, led by c_{2N - n}, which
 * bounds the error of the finer one whenever the coefficients fall off beyond N (the same premise as
 * comparing two grids); the estimate is twice that difference plus a rounding floor of the sums. A
 * state with structure that aliases alike onto both grids (periodic on the samples' own scale) breaks
 * the premise: the samples start at 8 on the shortest piece, and expand.ts checks a few levels against
 * quadrature on its own nodes.
 */
import type { Eigenbasis } from '../physics/types';
import { boxCoefficientsFromSamples } from '../physics/dst';
import { charge } from '../physics/budget';
import type { Budget } from './context';
import type { StateFunction } from './systems';

/** Box coefficients with a per-coefficient error estimate (both unnormalised, like the state as written). */
export interface BoxTransformResult {
  re: Float64Array;
  im: Float64Array;
  /** Estimated |c_n - c_n(exact)|, an upper bound whenever the remainder's coefficients fall off beyond N. */
  error: Float64Array;
  /** Samples of the finer transform (N + 1 points). */
  samples: number;
}

/** Fewest samples of the finer transform. */
const MIN_SAMPLES = 64;

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
export function boxTransform(state: StateFunction, basis: Eigenbasis, levels: number, breakpoints: number[], maxSamples: number, budget: Budget): BoxTransformResult | null {
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
  // At least twice the levels, and 8 samples on the shortest smooth piece: a remainder with structure
  // at the pieces' scale (a spline's knots) would otherwise alias alike onto both nested grids.
  let shortest = L;
  for (let i = 0; i <= inner.length; i++) shortest = Math.min(shortest, (i < inner.length ? inner[i]! : b) - (i > 0 ? inner[i - 1]! : a));
  let N = MIN_SAMPLES;
  while ((N < 2 * (levels + 1) || N * shortest < 8 * L) && N <= maxSamples) N *= 2;
  let lastWorst = Infinity;
  for (; N <= maxSamples; N *= 2) {
    const r = remainderSamples(state, a, L, N, { w0, wL, sides, pu });
    if (!r) return null;
    charge(budget, 6 * N * Math.log2(N), N + 1);
    const fine = boxCoefficientsFromSamples(r.re, r.im, a, b, levels);
    const half = boxCoefficientsFromSamples(everyOther(r.re), everyOther(r.im), a, b, levels);
    if (!fine.ok || !half.ok || fine.re.length < levels || half.re.length < levels) return null;
    const error = new Float64Array(levels);
    // Rounding of the samples and sums: about eps (log2 N + sqrt n) times the sum of |psi_j| + |s_j|, times h sqrt(2/L).
    const roundBase = 4e-16 * r.absSum * (L / N) * Math.sqrt(2 / L);
    let worst = 0;
    for (let k = 0; k < levels; k++) {
      const e = 2 * Math.hypot(fine.re[k]! - half.re[k]!, fine.im[k]! - half.im[k]!) + roundBase * (Math.log2(N) + Math.sqrt(k + 1));
      error[k] = e;
      if (e > worst) worst = e;
    }
    const norm = Math.max(r.norm, 1e-300);
    if (worst <= 1e-12 * Math.sqrt(norm) || worst <= 1e-13 * norm) {
      addKernels(fine.re, fine.im, error, L, w0, wL, sides, pu);
      if (!r.complex) fine.im.fill(0);
      return { re: fine.re, im: fine.im, error, samples: N + 1 };
    }
    // Algebraic decay at the rate seen so far: give up when the cap cannot reach the tolerance.
    if (Number.isFinite(lastWorst) && worst > 0) {
      const rate = Math.log2(lastWorst / worst);
      const need = rate > 0.5 ? N * Math.pow(worst / (1e-12 * Math.sqrt(norm)), 1 / rate) : Infinity;
      if (need > 2 * maxSamples) return null;
    }
    lastWorst = worst;
  }
  return null;
}

function everyOther(v: Float64Array): Float64Array {
  const out = new Float64Array((v.length + 1) >> 1);
  for (let j = 0; j < out.length; j++) out[j] = v[2 * j]!;
  return out;
}

/**
 * r = psi - s at u_j = j L / N, j = 0 ... N, with the trapezoid norm of psi and the sum of |psi| + |s|; null when
 * a sample is not finite. A sample on a breakpoint takes the mean of psi's two sides, like s.
 */
function remainderSamples(
  state: StateFunction,
  a: number,
  L: number,
  N: number,
  k: { w0: [number, number]; wL: [number, number]; sides: Sides[]; pu: Float64Array },
): { re: Float64Array; im: Float64Array; norm: number; absSum: number; complex: boolean } | null {
  const xs = new Float64Array(N + 1);
  for (let j = 0; j <= N; j++) xs[j] = a + (L * j) / N;
  const v = state.evaluate(xs, 0);
  const re = v.re;
  const im = v.im;
  let norm = 0;
  let absSum = 0;
  let complex = false;
  const h = L / N;
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
    const [sr, si] = singularPart(u, L, k.w0, k.wL, k.sides, k.pu);
    re[j] = pr - sr;
    im[j] = pi - si;
    // The sizes that enter the subtraction set its rounding, not the (often tiny) remainder.
    absSum += Math.abs(pr) + Math.abs(pi) + Math.abs(sr) + Math.abs(si);
  }
  return { re, im, norm, absSum, complex };
}
