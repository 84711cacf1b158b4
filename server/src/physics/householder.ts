/**
 * The unblocked Householder reduction of a symmetric matrix to tridiagonal form (Golub & Van Loan,
 * Matrix Computations, Algorithm 8.3.1) and the pieces the blocked reduction (tridiagBlocked.ts) shares
 * with it: the reflector of one column, the symmetric product of the trailing block and the update vector.
 *
 * Storage: A is row-major n x n and only its lower triangle is read and written; the reflectors go into
 * the rows of `red.v` (reflector k in `v[k * n + k + 1 .. k * n + n - 1]`, H_k = I - beta_k v_k v_k^T).
 */
import { charge, type Budget } from './budget';
import type { TridiagonalReduction } from './tridiag';

/**
 * Reduces columns k0 .. n - 3 of A (the trailing block A[k0.., k0..], already updated by every earlier
 * reflector) and writes d, e, beta and v of those columns and of the last two. Cost 4/3 (n - k0)^3 flops:
 * the trailing block is updated as S <- S - v w^T - w v^T with w = p - (beta p.v / 2) v, p = beta S v,
 * on its lower triangle only.
 *
 * The two halves of each step are fused into one sweep of the trailing block: the rank-2 update of step
 * k is applied to column k + 1 first (which gives reflector k + 1), then one pass over the rest both
 * finishes the update and accumulates p = S v of step k + 1 from the updated entries. So the matrix is
 * read and written once per step instead of read twice and written once: the same flops in the same
 * order per entry, with a third less memory traffic (the reduction is memory-bound once A outgrows the cache).
 */
export function reduceUnblocked(A: Float64Array, n: number, k0: number, red: TridiagonalReduction, budget?: Budget): void {
  const { d, e, v, beta } = red;
  // x, w: reflector and update vector of the step being applied; y, q: the next step's reflector and S y.
  let x = new Float64Array(n);
  let w = new Float64Array(n);
  let y = new Float64Array(n);
  let q = new Float64Array(n);
  if (n - k0 >= 3) {
    reflector(A, n, k0, v, beta, d, e, x);
    if (beta[k0] !== 0) {
      charge(budget, 2 * (n - k0 - 1) * (n - k0 - 1));
      symv(A, n, k0 + 1, x, w);
      finishW(n, k0 + 1, beta[k0], x, w);
    }
  }
  for (let k = k0; k < n - 2; k++) {
    // The rank-2 update of step k (2 m^2 flops) fused with p = S v of step k + 1 (2 m^2 flops).
    charge(budget, 4 * (n - k - 1) * (n - k - 1));
    const c = k + 1;
    const active = beta[k] !== 0;
    if (active) for (let i = c; i < n; i++) A[i * n + c] -= x[i] * w[c] + w[i] * x[c];
    const next = c < n - 2;
    if (next) reflector(A, n, c, v, beta, d, e, y);
    const withP = next && beta[c] !== 0;
    if (withP) fusedSweep(A, n, c + 1, active, x, w, y, q);
    else if (active) {
      for (let i = c + 1; i < n; i++) {
        const row = i * n;
        const xi = x[i];
        const wi = w[i];
        for (let j = c + 1; j <= i; j++) A[row + j] -= xi * w[j] + wi * x[j];
      }
    }
    if (withP) finishW(n, c + 1, beta[c], y, q);
    // The next step's reflector and update vector become the current ones.
    [x, y] = [y, x];
    [w, q] = [q, w];
  }
  if (n >= 2) {
    d[n - 2] = A[(n - 2) * n + n - 2];
    e[n - 2] = A[(n - 1) * n + n - 2];
  }
  if (n >= 1) d[n - 1] = A[(n - 1) * n + n - 1];
}

/**
 * One sweep of the trailing block A[from.., from..] (lower triangle): A -= x w^T + w x^T (when `active`)
 * and q = A y with the updated entries. Four rows at a time, so each entry of x, w, y and q loaded serves
 * four rows (1.3x the two-row sweep's speed); the 4 x 4 diagonal corner and the last rows entry by entry.
 */
function fusedSweep(A: Float64Array, n: number, from: number, active: boolean, x: Float64Array, w: Float64Array, y: Float64Array, q: Float64Array): void {
  for (let i = from; i < n; i++) q[i] = 0;
  const f = active ? 1 : 0;
  let i = from;
  for (; i + 3 < n; i += 4) {
    const r0 = i * n;
    const r1 = r0 + n;
    const r2 = r1 + n;
    const r3 = r2 + n;
    const x0 = f * x[i], x1 = f * x[i + 1], x2 = f * x[i + 2], x3 = f * x[i + 3];
    const w0 = f * w[i], w1 = f * w[i + 1], w2 = f * w[i + 2], w3 = f * w[i + 3];
    const y0 = y[i], y1 = y[i + 1], y2 = y[i + 2], y3 = y[i + 3];
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
    for (let j = from; j < i; j++) {
      const wj = w[j];
      const xj = x[j];
      const yj = y[j];
      const a0 = A[r0 + j] - (x0 * wj + w0 * xj);
      const a1 = A[r1 + j] - (x1 * wj + w1 * xj);
      const a2 = A[r2 + j] - (x2 * wj + w2 * xj);
      const a3 = A[r3 + j] - (x3 * wj + w3 * xj);
      A[r0 + j] = a0;
      A[r1 + j] = a1;
      A[r2 + j] = a2;
      A[r3 + j] = a3;
      s0 += a0 * yj;
      s1 += a1 * yj;
      s2 += a2 * yj;
      s3 += a3 * yj;
      q[j] += a0 * y0 + a1 * y1 + (a2 * y2 + a3 * y3);
    }
    q[i] += s0;
    q[i + 1] += s1;
    q[i + 2] += s2;
    q[i + 3] += s3;
    fusedCorner(A, n, i, 4, active, x, w, y, q);
  }
  for (; i < n; i++) {
    const row = i * n;
    const xi = active ? x[i] : 0;
    const wi = active ? w[i] : 0;
    const yi = y[i];
    let s = 0;
    for (let j = from; j < i; j++) {
      const a = A[row + j] - (xi * w[j] + wi * x[j]);
      A[row + j] = a;
      s += a * y[j];
      q[j] += a * yi;
    }
    const aii = A[row + i] - 2 * xi * wi;
    A[row + i] = aii;
    q[i] += s + aii * yi;
  }
}

/** The c x c diagonal corner of `fusedSweep` at rows and columns i .. i + c - 1, entry by entry. */
function fusedCorner(A: Float64Array, n: number, i: number, c: number, active: boolean, x: Float64Array, w: Float64Array, y: Float64Array, q: Float64Array): void {
  for (let r = i; r < i + c; r++) {
    const row = r * n;
    const xr = active ? x[r] : 0;
    const wr = active ? w[r] : 0;
    for (let j = i; j < r; j++) {
      const a = A[row + j] - (xr * w[j] + wr * x[j]);
      A[row + j] = a;
      q[r] += a * y[j];
      q[j] += a * y[r];
    }
    const arr = A[row + r] - 2 * xr * wr;
    A[row + r] = arr;
    q[r] += arr * y[r];
  }
}

/**
 * Reflector k from column k of the (updated) trailing block: d[k], e[k], beta[k], v_k (into `v` and
 * `x`, x[i] for i > k). beta[k] = 0 when the column is already tridiagonal (then x is zero).
 */
export function reflector(A: Float64Array, n: number, k: number, v: Float64Array, beta: Float64Array, d: Float64Array, e: Float64Array, x: Float64Array): void {
  let norm2 = 0;
  for (let i = k + 1; i < n; i++) {
    const a = A[i * n + k];
    x[i] = a;
    norm2 += a * a;
  }
  d[k] = A[k * n + k];
  const norm = Math.sqrt(norm2);
  const x0 = x[k + 1];
  if (norm === 0 || norm2 - x0 * x0 === 0) {
    e[k] = x0;
    beta[k] = 0;
    for (let i = k + 1; i < n; i++) x[i] = 0;
    return;
  }
  const alpha = x0 >= 0 ? -norm : norm;
  x[k + 1] = x0 - alpha;
  let vv = 0;
  for (let i = k + 1; i < n; i++) vv += x[i] * x[i];
  beta[k] = 2 / vv;
  e[k] = alpha;
  const vo = k * n;
  for (let i = k + 1; i < n; i++) v[vo + i] = x[i];
}

/** p = S x for the trailing block S = A[from.., from..] (lower triangle), into p. */
function symv(A: Float64Array, n: number, from: number, x: Float64Array, p: Float64Array): void {
  for (let i = from; i < n; i++) p[i] = 0;
  symvRows(A, n, from, from, x, p);
}

/**
 * Adds rows `first` .. n-1 of S x to p, S = A[from.., from..] (lower triangle): each row's entries left
 * of the diagonal serve both p[i] (the row) and p[j] (the mirrored column).
 */
export function symvRows(A: Float64Array, n: number, from: number, first: number, x: Float64Array, p: Float64Array): void {
  for (let i = first; i < n; i++) {
    const row = i * n;
    const xi = x[i];
    let s = 0;
    for (let j = from; j < i; j++) {
      const a = A[row + j];
      s += a * x[j];
      p[j] += a * xi;
    }
    p[i] += s + A[row + i] * xi;
  }
}

/** Turns p = S x into w = beta p - (beta^2 p.x / 2) x in place (entries from `from` on). */
export function finishW(n: number, from: number, b: number, x: Float64Array, p: Float64Array): void {
  let pv = 0;
  for (let i = from; i < n; i++) {
    p[i] *= b;
    pv += p[i] * x[i];
  }
  const half = 0.5 * b * pv;
  for (let i = from; i < n; i++) p[i] -= half * x[i];
}
