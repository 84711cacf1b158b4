/**
 * Blocked Householder tridiagonalisation of a large symmetric matrix (Dongarra, Hammarling & Sorensen,
 * "Block reduction of matrices to condensed forms for eigenvalue computations", J. Comput. Appl. Math. 27
 * (1989) 215-227; the panel scheme LAPACK's dsytrd uses; Golub & Van Loan, Matrix Computations, 4th ed.,
 * 8.3.1 and 5.1, from memory).
 *
 * Why: the unblocked reduction (householder.ts) reads and writes the whole trailing block once per
 * column, so once the block no longer fits in the cache (1,000 rows and more) it slows down (measured
 * 3.1-3.8 Gflop/s at 400-800 rows, 2.3-2.7 at 1,600). Here a panel of `nb`
 * columns is reduced while the trailing block S stays as it was at the panel's start. Column c is first
 * brought up to date with the panel's earlier reflectors, A[c.., c] -= V W[c, :]^T + W V[c, :]^T; its
 * reflector v gives w = beta (S v - V (W^T v) - W (V^T v)) - (beta^2 p.v / 2) v, which is the unblocked
 * w of the updated matrix, from one read-only sweep of S. After the panel the trailing block is updated
 * once, S <- S - V W^T - W V^T, in register tiles of 2 rows x 4 columns over cache-sized column blocks, so
 * each entry of A is written once per panel instead of once per column. The flops are the unblocked
 * ones (4/3 n^3, half in the sweeps and half in the panel updates) plus O(n^2 nb).
 *
 * Storage as in householder.ts: A row-major, lower triangle only; reflector k in row k of `red.v`.
 * Panel rows: U[i * 2nb + p] = V(i, p), U[i * 2nb + nb + p] = W(i, p); Z holds the same rows swapped
 * ([W(i, :), V(i, :)]), so an entry of the update is one dot product of a row of U with a row of Z.
 */
import { charge, type Budget } from './budget';
import { finishW, reflector, symvRows } from './householder';
import type { TridiagonalReduction } from './tridiag';

/** Columns of the trailing block updated together (a column block of Z: 48 rows x 64 = 24 KiB, within L1). */
const COLUMN_BLOCK = 48;

/**
 * Reduces columns 0 .. k - 1 of A in panels of `nb` columns, leaving at least `tail` rows (>= 3) for the
 * unblocked reduction, and returns k (the first column not yet reduced; A[k.., k..] is then up to date).
 * Writes d, e, beta and v of the reduced columns.
 */
export function reduceBlocked(A: Float64Array, n: number, nb: number, tail: number, red: TridiagonalReduction, budget?: Budget): number {
  const rest = Math.max(3, tail);
  if (nb < 1 || n - nb < rest) return 0;
  const S = 2 * nb;
  const U = new Float64Array(n * S);
  const Z = new Float64Array(n * S);
  const x = new Float64Array(n);
  const q = new Float64Array(n);
  const t = new Float64Array(S);
  let k0 = 0;
  for (; n - k0 - nb >= rest; k0 += nb) {
    reducePanel(A, n, k0, nb, red, U, x, q, t, budget);
    const s = k0 + nb;
    for (let i = s; i < n; i++) {
      const o = i * S;
      for (let p = 0; p < nb; p++) {
        Z[o + p] = U[o + nb + p];
        Z[o + nb + p] = U[o + p];
      }
    }
    rank2kUpdate(A, n, s, S, U, Z, budget);
  }
  return k0;
}

/** Reduces columns k0 .. k0 + nb - 1 of A, filling rows k0.. of the panel U (V and W) on the way. */
function reducePanel(A: Float64Array, n: number, k0: number, nb: number, red: TridiagonalReduction, U: Float64Array, x: Float64Array, q: Float64Array, t: Float64Array, budget?: Budget): void {
  const S = 2 * nb;
  const { d, e, v, beta } = red;
  U.fill(0, k0 * S, n * S);
  for (let jj = 0; jj < nb; jj++) {
    const c = k0 + jj;
    if (jj > 0) {
      // Column c brought up to date with the panel's earlier reflectors (4 jj flops per entry).
      charge(budget, 4 * jj * (n - c));
      const uc = c * S;
      for (let i = c; i < n; i++) {
        const ui = i * S;
        let s = 0;
        for (let p = 0; p < jj; p++) s += U[ui + p] * U[uc + nb + p] + U[ui + nb + p] * U[uc + p];
        A[i * n + c] -= s;
      }
    }
    reflector(A, n, c, v, beta, d, e, x);
    const b = beta[c];
    // A column already tridiagonal: its V and W columns stay zero.
    if (b === 0) continue;
    const m = n - c - 1;
    // The sweep of S (2 m^2 flops) and the panel's corrections (8 jj m).
    charge(budget, 2 * m * m + 8 * jj * m);
    for (let i = c + 1; i < n; i++) U[i * S + jj] = x[i];
    symv8(A, n, c + 1, x, q);
    panelCorrection(n, c + 1, jj, nb, U, x, q, t);
    finishW(n, c + 1, b, x, q);
    for (let i = c + 1; i < n; i++) U[i * S + nb + jj] = q[i];
  }
}

/** q -= V (W^T x) + W (V^T x) over rows from.., with the panel's first jj columns of V and W. */
function panelCorrection(n: number, from: number, jj: number, nb: number, U: Float64Array, x: Float64Array, q: Float64Array, t: Float64Array): void {
  if (jj === 0) return;
  const S = 2 * nb;
  for (let p = 0; p < jj; p++) {
    t[p] = 0;
    t[nb + p] = 0;
  }
  for (let i = from; i < n; i++) {
    const ui = i * S;
    const xi = x[i];
    for (let p = 0; p < jj; p++) {
      t[p] += U[ui + nb + p] * xi;
      t[nb + p] += U[ui + p] * xi;
    }
  }
  for (let i = from; i < n; i++) {
    const ui = i * S;
    let s = 0;
    for (let p = 0; p < jj; p++) s += U[ui + p] * t[p] + U[ui + nb + p] * t[nb + p];
    q[i] -= s;
  }
}

/**
 * q = S x for the trailing block S = A[from.., from..] (lower triangle), read only. Eight rows at a time,
 * so each entry of x and q loaded serves eight rows (measured 4.4 Gflop/s against 3.3 for four rows and
 * 1.7 for two, n = 1,400, process CPU time); the 8 x 8 corner on the diagonal and the last rows entry by entry.
 */
function symv8(A: Float64Array, n: number, from: number, x: Float64Array, q: Float64Array): void {
  for (let i = from; i < n; i++) q[i] = 0;
  let i = from;
  for (; i + 7 < n; i += 8) {
    const r0 = i * n;
    const r1 = r0 + n;
    const r2 = r1 + n;
    const r3 = r2 + n;
    const r4 = r3 + n;
    const r5 = r4 + n;
    const r6 = r5 + n;
    const r7 = r6 + n;
    const x0 = x[i], x1 = x[i + 1], x2 = x[i + 2], x3 = x[i + 3];
    const x4 = x[i + 4], x5 = x[i + 5], x6 = x[i + 6], x7 = x[i + 7];
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0, s6 = 0, s7 = 0;
    for (let j = from; j < i; j++) {
      const xj = x[j];
      const a0 = A[r0 + j];
      const a1 = A[r1 + j];
      const a2 = A[r2 + j];
      const a3 = A[r3 + j];
      s0 += a0 * xj;
      s1 += a1 * xj;
      s2 += a2 * xj;
      s3 += a3 * xj;
      const a4 = A[r4 + j];
      const a5 = A[r5 + j];
      const a6 = A[r6 + j];
      const a7 = A[r7 + j];
      s4 += a4 * xj;
      s5 += a5 * xj;
      s6 += a6 * xj;
      s7 += a7 * xj;
      q[j] += a0 * x0 + a1 * x1 + a2 * x2 + a3 * x3 + (a4 * x4 + a5 * x5 + a6 * x6 + a7 * x7);
    }
    q[i] += s0;
    q[i + 1] += s1;
    q[i + 2] += s2;
    q[i + 3] += s3;
    q[i + 4] += s4;
    q[i + 5] += s5;
    q[i + 6] += s6;
    q[i + 7] += s7;
    symvCorner(A, n, i, 8, x, q);
  }
  symvRows(A, n, from, i, x, q);
}

/** The w x w diagonal corner of `symv8` at rows and columns i .. i + w - 1. */
function symvCorner(A: Float64Array, n: number, i: number, w: number, x: Float64Array, q: Float64Array): void {
  for (let r = 0; r < w; r++) {
    const row = (i + r) * n;
    for (let c = 0; c < r; c++) {
      const a = A[row + i + c];
      q[i + r] += a * x[i + c];
      q[i + c] += a * x[i + r];
    }
    q[i + r] += A[row + i + r] * x[i + r];
  }
}

/**
 * The trailing update A[i][j] -= U[i] . Z[j] (length S) for s <= j <= i < n: column blocks of
 * `COLUMN_BLOCK`, and within a block two rows by four columns per tile (eight sums in registers; each
 * loaded entry of U serves four products, each of Z two).
 */
function rank2kUpdate(A: Float64Array, n: number, s: number, S: number, U: Float64Array, Z: Float64Array, budget?: Budget): void {
  for (let jb = s; jb < n; jb += COLUMN_BLOCK) {
    const je = Math.min(n, jb + COLUMN_BLOCK);
    let i = jb;
    for (; i + 1 < n; i += 2) {
      // Columns jb .. min(je, i + 2) - 1 of rows i and i + 1 (row i stops at the diagonal).
      const top = Math.min(je, i + 1);
      charge(budget, 2 * S * (2 * (top - jb) + (i + 1 < je ? 1 : 0)));
      let j = jb;
      for (; j + 4 <= top; j += 4) tile2x4(A, n, i, j, S, U, Z);
      for (; j < top; j++) {
        dotInto(A, n, i, j, S, U, Z);
        dotInto(A, n, i + 1, j, S, U, Z);
      }
      if (i + 1 < je) dotInto(A, n, i + 1, i + 1, S, U, Z);
    }
    if (i < n) {
      const top = Math.min(je, i + 1);
      charge(budget, 2 * S * (top - jb));
      for (let j = jb; j < top; j++) dotInto(A, n, i, j, S, U, Z);
    }
  }
}

/** A[i][j] -= U[i] . Z[j]. */
function dotInto(A: Float64Array, n: number, i: number, j: number, S: number, U: Float64Array, Z: Float64Array): void {
  const u = i * S;
  const z = j * S;
  let s = 0;
  for (let p = 0; p < S; p++) s += U[u + p] * Z[z + p];
  A[i * n + j] -= s;
}

/** The tile A[i .. i + 1][j .. j + 3] -= U[i .. i + 1] Z[j .. j + 3]^T. */
function tile2x4(A: Float64Array, n: number, i: number, j: number, S: number, U: Float64Array, Z: Float64Array): void {
  const u0 = i * S;
  const u1 = u0 + S;
  const z0 = j * S;
  const z1 = z0 + S;
  const z2 = z1 + S;
  const z3 = z2 + S;
  let a00 = 0, a01 = 0, a02 = 0, a03 = 0, a10 = 0, a11 = 0, a12 = 0, a13 = 0;
  for (let p = 0; p < S; p++) {
    const x0 = U[u0 + p];
    const x1 = U[u1 + p];
    const y0 = Z[z0 + p];
    const y1 = Z[z1 + p];
    const y2 = Z[z2 + p];
    const y3 = Z[z3 + p];
    a00 += x0 * y0;
    a01 += x0 * y1;
    a02 += x0 * y2;
    a03 += x0 * y3;
    a10 += x1 * y0;
    a11 += x1 * y1;
    a12 += x1 * y2;
    a13 += x1 * y3;
  }
  const r0 = i * n + j;
  const r1 = r0 + n;
  A[r0] -= a00;
  A[r0 + 1] -= a01;
  A[r0 + 2] -= a02;
  A[r0 + 3] -= a03;
  A[r1] -= a10;
  A[r1 + 1] -= a11;
  A[r1 + 2] -= a12;
  A[r1 + 3] -= a13;
}
