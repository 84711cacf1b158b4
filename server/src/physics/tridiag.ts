/**
 * Dense symmetric eigenproblems for the lowest few levels: Householder reduction to tridiagonal form,
 * Sturm-sequence bisection for the eigenvalues and inverse iteration for the eigenvectors
 * (Golub & Van Loan, Matrix Computations, 4th ed., sections 8.3.1, 8.4.1 and 8.2.2).
 *
 * Why this route and not full QL with accumulated rotations: the solver needs only the lowest k of n
 * levels with k much smaller than n; bisection and inverse iteration cost O(n k) on the tridiagonal and
 * O(n^2 k) to map the vectors back, so the O(4/3 n^3) reduction dominates and nothing else grows as n^3.
 * Large matrices (from `BLOCKED_FROM` rows, where the unblocked sweeps no longer fit in the cache) are
 * reduced in panels (tridiagBlocked.ts) and mapped back with grouped reflectors (backTransformBlocked.ts).
 *
 * Every stage takes an optional budget and charges it its flops as it goes (`charge`: a poll of the
 * clock every `POLL_OPS`), so a solve of any size stops within a few milliseconds of the deadline by
 * throwing `Stopped`, which the solver's entry point turns into a stop reason.
 */
import { charge, type Budget } from './budget';
import { relativeEigenvectors } from './twisted';
import { reduceUnblocked } from './householder';
import { reduceBlocked } from './tridiagBlocked';
import { backTransformBlocked } from './backTransformBlocked';
import { bisectLowest } from './bisect';

/** A symmetric tridiagonal matrix: diagonal `d` (length n) and off-diagonal `e` (length n - 1, e[i] = T[i+1][i]). */
export interface Tridiagonal {
  d: Float64Array;
  e: Float64Array;
}

/** The output of `householderTridiagonalize`: the tridiagonal and the reflectors that map back. */
export interface TridiagonalReduction extends Tridiagonal {
  n: number;
  /** Reflector k is stored in `v[k * n + k + 1 .. k * n + n - 1]`, with factor `beta[k]` (H_k = I - beta v v^T). */
  v: Float64Array;
  beta: Float64Array;
}

/** Panel width of the blocked reduction (tridiagBlocked.ts). */
export const PANEL_WIDTH = 32;

/**
 * Order from which the blocked reduction is used, and the trailing rows it leaves to the unblocked one.
 * Measured (process CPU time, scripts/bench-tridiag.mjs and single runs, 2026-12-02): below about 900
 * rows the matrix stays in the cache and the unblocked sweep, eight flops per entry visited, is the
 * faster (n = 400-800: 3.1-3.8 Gflop/s against 2.3-3.3 blocked); at 1,100 rows it falls to 2.5 Gflop/s
 * against 2.9-3.5 blocked, at 1,600 to 2.3 against 3.1.
 */
export const BLOCKED_FROM = 1000;

/** Trailing rows the blocked reduction leaves to the unblocked one (where the latter is faster again). */
export const UNBLOCKED_TAIL = 800;

/** Options of `householderTridiagonalize` (for tests and benchmarks; the defaults are the measured choice). */
export interface ReductionOptions {
  /** Panel width; 0 reduces unblocked throughout. Default `PANEL_WIDTH` from order `BLOCKED_FROM`, else 0. */
  panel?: number;
  /** Trailing rows left to the unblocked reduction (at least 3). Default `UNBLOCKED_TAIL`. */
  tail?: number;
}

/**
 * Reduces a real symmetric matrix A (row-major, n x n, only the lower triangle read; destroyed) to
 * tridiagonal T = Q^T A Q with Q = H_0 H_1 ... H_{n-3}, H_k = I - beta_k v_k v_k^T
 * (Golub & Van Loan, Matrix Computations, Algorithm 8.3.1), in 4/3 n^3 flops: in panels
 * (tridiagBlocked.ts) while more than the tail is left, then unblocked (householder.ts).
 */
export function householderTridiagonalize(A: Float64Array, n: number, budget?: Budget, options: ReductionOptions = {}): TridiagonalReduction {
  const red: TridiagonalReduction = {
    n,
    d: new Float64Array(n),
    e: new Float64Array(Math.max(0, n - 1)),
    v: new Float64Array(n * n),
    beta: new Float64Array(Math.max(0, n)),
  };
  const panel = options.panel ?? (n >= BLOCKED_FROM ? PANEL_WIDTH : 0);
  const k0 = panel > 0 ? reduceBlocked(A, n, panel, options.tail ?? UNBLOCKED_TAIL, red, budget) : 0;
  reduceUnblocked(A, n, k0, red, budget);
  return red;
}

/** Number of eigenvalues of T strictly below `x` (Sturm sequence count of the LDL^T pivots; Golub & Van Loan 8.4.1). */
export function sturmCount(t: Tridiagonal, x: number, pivmin: number): number {
  const { d, e } = t;
  const n = d.length;
  let count = 0;
  let q = d[0] - x;
  if (Math.abs(q) < pivmin) q = -pivmin;
  if (q < 0) count++;
  for (let i = 1; i < n; i++) {
    q = d[i] - x - (e[i - 1] * e[i - 1]) / q;
    if (Math.abs(q) < pivmin) q = -pivmin;
    if (q < 0) count++;
  }
  return count;
}

/** Gershgorin interval [lo, hi] holding every eigenvalue of T. */
export function gershgorin(t: Tridiagonal): [number, number] {
  const { d, e } = t;
  const n = d.length;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.abs(e[i - 1]) : 0) + (i < n - 1 ? Math.abs(e[i]) : 0);
    lo = Math.min(lo, d[i] - r);
    hi = Math.max(hi, d[i] + r);
  }
  return [lo, hi];
}

/**
 * The lowest `k` eigenvalues of T, ascending, by bisection on the Sturm count (Golub & Van Loan 8.4.1),
 * each to about 2 eps max(|lo|, |hi|) + pivmin: the absolute accuracy eps ||T|| any backward-stable method has
 * (four eigenvalues at a time: bisect.ts).
 */
export function lowestEigenvalues(t: Tridiagonal, k: number, budget?: Budget): Float64Array {
  const n = t.d.length;
  const m = Math.max(0, Math.min(k, n));
  if (m === 0) return new Float64Array(0);
  const [glo, ghi] = gershgorin(t);
  const scale = Math.max(Math.abs(glo), Math.abs(ghi), Number.MIN_VALUE);
  const pivmin = Number.MIN_VALUE * 1e10 + scale * 1e-300;
  const e2 = new Float64Array(Math.max(0, n - 1));
  for (let i = 0; i < n - 1; i++) e2[i] = t.e[i] * t.e[i];
  return bisectLowest(t.d, e2, m, glo, ghi, pivmin, budget);
}

/**
 * Eigenvectors of T for the given eigenvalues (ascending, from `lowestEigenvalues`), row by row (vector j
 * at [j * n, (j + 1) * n)), unit length. First from one relatively robust representation with twisted
 * factorizations (twisted.ts: O(n) per vector, orthogonalised only within clusters of relative gap
 * below 1e-3); when that representation cannot be built, by `inverseIteration`.
 */
export function tridiagonalEigenvectors(t: Tridiagonal, values: Float64Array, budget?: Budget): Float64Array {
  const [glo, ghi] = gershgorin(t);
  const tnorm = Math.max(Math.abs(glo), Math.abs(ghi), Number.MIN_VALUE);
  return relativeEigenvectors(t.d, t.e, values, tnorm, budget) ?? inverseIteration(t, values, budget);
}

/**
 * Eigenvectors of T for the given eigenvalues by inverse iteration with a tridiagonal LU with partial
 * pivoting (Golub & Van Loan 8.2.2; Wilkinson, The Algebraic Eigenvalue Problem, ch. 9). Vectors of
 * eigenvalues closer than 1e-3 ||T|| are kept orthogonal by Gram-Schmidt within the cluster, as is usual
 * for inverse iteration (so its cost grows as n k^2 when all levels lie within 1e-3 ||T||).
 */
export function inverseIteration(t: Tridiagonal, values: Float64Array, budget?: Budget): Float64Array {
  const n = t.d.length;
  const m = values.length;
  const out = new Float64Array(m * n);
  if (n === 0) return out;
  const [glo, ghi] = gershgorin(t);
  const tnorm = Math.max(Math.abs(glo), Math.abs(ghi), Number.MIN_VALUE);
  const tiny = 2.220446049250313e-16 * tnorm;
  const lu: ShiftedLU = { U0: new Float64Array(n), U1: new Float64Array(n), U2: new Float64Array(n), mult: new Float64Array(n), swapped: new Uint8Array(n) };
  const b = new Float64Array(n);
  let clusterStart = 0;
  let seed = 12345;
  for (let j = 0; j < m; j++) {
    const lambda = values[j];
    if (j > 0 && Math.abs(lambda - values[j - 1]) > 1e-3 * tnorm) clusterStart = j;
    factorShifted(t, lambda, tiny, lu);
    // Pseudo-random start so that no eigenvector is missed by a zero component.
    for (let i = 0; i < n; i++) {
      seed = (seed * 1103515245 + 12345) % 2147483648;
      b[i] = seed / 2147483648 - 0.5;
    }
    for (let iter = 0; iter < 3; iter++) {
      // The factorisation and the solve (about 16 n), and 4 n per vector of the cluster.
      charge(budget, 16 * n + 4 * n * (j - clusterStart));
      solveShifted(lu, b);
      // Orthogonalise within the cluster.
      for (let q = clusterStart; q < j; q++) {
        const w = out.subarray(q * n, (q + 1) * n);
        let dot = 0;
        for (let i = 0; i < n; i++) dot += w[i] * b[i];
        for (let i = 0; i < n; i++) b[i] -= dot * w[i];
      }
      let nrm = 0;
      for (let i = 0; i < n; i++) nrm += b[i] * b[i];
      nrm = Math.sqrt(nrm);
      if (!(nrm > 0) || !Number.isFinite(nrm)) {
        for (let i = 0; i < n; i++) b[i] = i === j % n ? 1 : 0;
        continue;
      }
      for (let i = 0; i < n; i++) b[i] /= nrm;
      // Once a solve amplifies a unit vector by ~1/(eps ||T||) the vector is converged.
      if (iter >= 1 && nrm > 1e-4 / (tnorm * 2.220446049250313e-16)) break;
    }
    out.set(b, j * n);
  }
  return out;
}

/** T - lambda I = P L U of a tridiagonal: U's three diagonals, L's multipliers and the row swaps. */
interface ShiftedLU {
  U0: Float64Array;
  U1: Float64Array;
  U2: Float64Array;
  mult: Float64Array;
  swapped: Uint8Array;
}

/** Factors T - lambda I with partial pivoting into `lu`; pivots below `tiny` are lifted to it. */
function factorShifted(t: Tridiagonal, lambda: number, tiny: number, lu: ShiftedLU): void {
  const { d, e } = t;
  const n = d.length;
  const { U0, U1, U2, mult, swapped } = lu;
  let c0 = d[0] - lambda;
  let c1 = n > 1 ? e[0] : 0;
  for (let i = 0; i < n - 1; i++) {
    const n0 = e[i];
    const n1 = d[i + 1] - lambda;
    const n2 = i + 1 < n - 1 ? e[i + 1] : 0;
    if (Math.abs(c0) >= Math.abs(n0)) {
      if (c0 === 0) c0 = tiny;
      const mu = n0 / c0;
      U0[i] = c0;
      U1[i] = c1;
      U2[i] = 0;
      mult[i] = mu;
      swapped[i] = 0;
      c0 = n1 - mu * c1;
      c1 = n2;
    } else {
      const mu = c0 / n0;
      U0[i] = n0;
      U1[i] = n1;
      U2[i] = n2;
      mult[i] = mu;
      swapped[i] = 1;
      c0 = c1 - mu * n1;
      c1 = -mu * n2;
    }
    if (Math.abs(U0[i]) < tiny) U0[i] = U0[i] < 0 ? -tiny : tiny;
  }
  U0[n - 1] = Math.abs(c0) < tiny ? (c0 < 0 ? -tiny : tiny) : c0;
}

/** Solves (T - lambda I) x = b in place with the factors of `factorShifted`. */
function solveShifted(lu: ShiftedLU, b: Float64Array): void {
  const { U0, U1, U2, mult, swapped } = lu;
  const n = b.length;
  for (let i = 0; i < n - 1; i++) {
    if (swapped[i]) {
      const tmp = b[i];
      b[i] = b[i + 1];
      b[i + 1] = tmp;
    }
    b[i + 1] -= mult[i] * b[i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    if (i + 1 < n) s -= U1[i] * b[i + 1];
    if (i + 2 < n) s -= U2[i] * b[i + 2];
    b[i] = s / U0[i];
  }
}

/** Maps an eigenvector y of T back to A: z = Q y = H_0 (H_1 (... H_{n-3} y)), in place. */
export function backTransform(r: TridiagonalReduction, y: Float64Array): void {
  const { n, v, beta } = r;
  for (let k = n - 3; k >= 0; k--) {
    const bk = beta[k];
    if (bk === 0) continue;
    const vo = k * n;
    let dot = 0;
    for (let i = k + 1; i < n; i++) dot += v[vo + i] * y[i];
    dot *= bk;
    for (let i = k + 1; i < n; i++) y[i] -= dot * v[vo + i];
  }
}

/**
 * Order from which `backTransformAll` applies the reflectors in groups (backTransformBlocked.ts).
 * Measured as `BLOCKED_FROM` (process CPU time, n/2 vectors): even at n = 800 (2.9-3.0 Gflop/s both),
 * 1.36x faster at n = 1,600 (2.9 against 2.1 Gflop/s), slower below 400.
 */
export const WY_FROM = 1000;

/** Vectors mapped back together by `backTransformAll` (each reflector read once per group). */
const BACK_GROUP = 8;

/**
 * Maps the m eigenvectors of T in `vectors` (row by row) back to A, in place: from order `WY_FROM` with
 * at least `BACK_GROUP` vectors in groups of reflectors (compact WY, backTransformBlocked.ts), else with
 * `backTransformInterleaved`. Charged 2 n^2 per vector either way.
 */
export function backTransformAll(r: TridiagonalReduction, vectors: Float64Array, m: number, budget?: Budget): void {
  if (r.n >= WY_FROM && m >= BACK_GROUP) backTransformBlocked(r, vectors, m, budget);
  else backTransformInterleaved(r, vectors, m, budget);
}

/**
 * Maps the m eigenvectors of T in `vectors` (row by row) back to A, in place: groups of `BACK_GROUP`
 * vectors are interleaved (entry i of each vector side by side), and each reflector is applied to the
 * whole group in one pass, so the reflectors are streamed from memory m / 8 times instead of m times.
 * The same operations in the same order per vector as `backTransform`. Charged 2 n^2 per vector.
 */
export function backTransformInterleaved(r: TridiagonalReduction, vectors: Float64Array, m: number, budget?: Budget): void {
  const { n, v, beta } = r;
  const G = BACK_GROUP;
  const Y = new Float64Array(n * G);
  for (let g0 = 0; g0 < m; g0 += G) {
    const gs = Math.min(G, m - g0);
    charge(budget, 2 * n * n * gs);
    // Unused slots of a last, partial group stay zero (their results are not copied back).
    Y.fill(0);
    for (let g = 0; g < gs; g++) for (let i = 0; i < n; i++) Y[i * G + g] = vectors[(g0 + g) * n + i];
    for (let k = n - 3; k >= 0; k--) {
      const bk = beta[k];
      if (bk !== 0) applyReflector8(v, k * n, k + 1, n, bk, Y);
    }
    for (let g = 0; g < gs; g++) for (let i = 0; i < n; i++) vectors[(g0 + g) * n + i] = Y[i * G + g];
  }
}

/** Y <- (I - b u u^T) Y for 8 interleaved vectors Y[i * 8 + g], with u = v[vo + from .. vo + n - 1]. */
function applyReflector8(v: Float64Array, vo: number, from: number, n: number, b: number, Y: Float64Array): void {
  let d0 = 0, d1 = 0, d2 = 0, d3 = 0, d4 = 0, d5 = 0, d6 = 0, d7 = 0;
  for (let i = from; i < n; i++) {
    const u = v[vo + i];
    const o = i << 3;
    d0 += u * Y[o];
    d1 += u * Y[o + 1];
    d2 += u * Y[o + 2];
    d3 += u * Y[o + 3];
    d4 += u * Y[o + 4];
    d5 += u * Y[o + 5];
    d6 += u * Y[o + 6];
    d7 += u * Y[o + 7];
  }
  d0 *= b; d1 *= b; d2 *= b; d3 *= b; d4 *= b; d5 *= b; d6 *= b; d7 *= b;
  for (let i = from; i < n; i++) {
    const u = v[vo + i];
    const o = i << 3;
    Y[o] -= d0 * u;
    Y[o + 1] -= d1 * u;
    Y[o + 2] -= d2 * u;
    Y[o + 3] -= d3 * u;
    Y[o + 4] -= d4 * u;
    Y[o + 5] -= d5 * u;
    Y[o + 6] -= d6 * u;
    Y[o + 7] -= d7 * u;
  }
}

/** Result of `symmetricLowest`. */
export interface SymmetricEigen {
  values: Float64Array;
  /** Vector j (unit length) at [j * n, (j + 1) * n). */
  vectors: Float64Array;
}

/**
 * The lowest `k` eigenpairs of the real symmetric n x n matrix A (row-major; lower triangle read;
 * A is destroyed). Householder tridiagonalisation, bisection, inverse iteration and back-transformation
 * (Golub & Van Loan, Matrix Computations, 4th ed., ch. 8). Eigenvalues to about eps ||A|| absolute.
 * With a budget, throws `Stopped` (budget.ts) once it runs out. With `vectors` false only the values
 * are computed (`vectors` is then empty): a check grid whose functions are never used.
 */
export function symmetricLowest(A: Float64Array, n: number, k: number, budget?: Budget, vectors = true): SymmetricEigen {
  if (n === 1) {
    return { values: Float64Array.of(A[0]), vectors: vectors ? Float64Array.of(1) : new Float64Array(0) };
  }
  const red = householderTridiagonalize(A, n, budget);
  const values = lowestEigenvalues(red, k, budget);
  if (!vectors) return { values, vectors: new Float64Array(0) };
  const vecs = tridiagonalEigenvectors(red, values, budget);
  // 4 flops per entry of each reflector: about 2 n^2 per vector.
  backTransformAll(red, vecs, values.length, budget);
  return { values, vectors: vecs };
}
