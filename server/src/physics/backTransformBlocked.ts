/**
 * The back-transform z = Q y of many eigenvectors at once with the reflectors grouped in the compact WY
 * form: H_a H_(a+1) ... H_(a+nb-1) = I - V T V^T with T upper triangular, T[p][p] = beta_p and
 * T[0:p, p] = -beta_p T[0:p, 0:p] V[:, 0:p]^T v_p (Schreiber & Van Loan, "A storage-efficient WY
 * representation for products of Householder transformations", SIAM J. Sci. Stat. Comput. 10, 53 (1989);
 * Golub & Van Loan, Matrix Computations, 4th ed., 5.1.7; both from memory).
 *
 * Why: applied one reflector at a time (tridiag.ts, `backTransformAll`), every reflector is a pass over
 * the vectors with two flops per load. With the vectors as the rows of Y, a group of nb reflectors is
 * Y <- Y - ((Y V) T^T) V^T: two matrix products whose entries are dot products of length n and nb, done
 * in register tiles of 2 x 4 (each loaded entry serves two or four products), with V's panel (n x nb)
 * held in the cache while every vector passes through it. The flops are the same (about 2 n^2 per vector)
 * plus O(n nb^2) per group for T.
 */
import { charge, type Budget } from './budget';
import type { TridiagonalReduction } from './tridiag';

/** Reflectors per group (the panel of V: n x 32 doubles, 400 KiB at n = 1,600, within the L2 cache). */
export const WY_GROUP = 32;

/**
 * Maps the m eigenvectors of T in `vectors` (row by row, vector j at [j * n, (j + 1) * n)) back to A,
 * in place: z = H_0 H_1 ... H_(n-3) y, the groups applied from the last to the first. Charged 2 n^2 per vector.
 */
export function backTransformBlocked(r: TridiagonalReduction, vectors: Float64Array, m: number, budget?: Budget, nb = WY_GROUP): void {
  const { n } = r;
  const count = n - 2;
  if (count <= 0 || m === 0) return;
  const Vt = new Float64Array(n * nb);
  const T = new Float64Array(nb * nb);
  const W = new Float64Array(2 * nb);
  const last = Math.floor((count - 1) / nb) * nb;
  for (let a = last; a >= 0; a -= nb) {
    const g = Math.min(nb, count - a);
    packGroup(r, a, g, nb, Vt, T);
    const len = n - a - 1;
    let j = 0;
    for (; j + 1 < m; j += 2) {
      charge(budget, 8 * g * len);
      applyPair(vectors, r.v, n, a, j * n, (j + 1) * n, g, nb, Vt, T, W);
    }
    if (j < m) {
      charge(budget, 4 * g * len);
      applyPair(vectors, r.v, n, a, j * n, -1, g, nb, Vt, T, W);
    }
  }
}

/**
 * Vt[i * nb + p] = v_(a+p)[i] for i in a + 1 .. n - 1 (zero above each reflector's first entry, as `red.v`
 * stores it), and T of the group (row-major nb x nb, the first g x g used).
 */
function packGroup(r: TridiagonalReduction, a: number, g: number, nb: number, Vt: Float64Array, T: Float64Array): void {
  const { n, v, beta } = r;
  Vt.fill(0);
  for (let p = 0; p < g; p++) {
    const vo = (a + p) * n;
    for (let i = a + 1; i < n; i++) Vt[i * nb + p] = v[vo + i];
  }
  T.fill(0);
  for (let p = 0; p < g; p++) {
    const bp = beta[a + p];
    T[p * nb + p] = bp;
    if (p === 0 || bp === 0) continue;
    // gq = v_q . v_p for q < p (v_p is zero before row a + p + 1).
    const vp = (a + p) * n;
    for (let q = 0; q < p; q++) {
      const vq = (a + q) * n;
      let s = 0;
      for (let i = a + p + 1; i < n; i++) s += v[vq + i] * v[vp + i];
      // Stored in column p for now; turned into T[0:p, p] below.
      T[q * nb + p] = s;
    }
    // T[0:p, p] = -beta_p T[0:p, 0:p] g (T[0:p, 0:p] upper triangular, g held in column p).
    for (let q = 0; q < p; q++) {
      let s = 0;
      for (let c = q; c < p; c++) s += T[q * nb + c] * T[c * nb + p];
      T[q * nb + p] = -bp * s;
    }
  }
}

/**
 * Applies I - V T V^T to the vectors at offsets o0 and o1 (o1 = -1: o0 alone), rows from.. :
 * w = V^T y (dot products with the reflectors' rows of `v`, 2 vectors x 4 reflectors a tile), w <- T w,
 * y -= V w (dot products with the rows of Vt, 2 vectors x 4 rows a tile).
 */
function applyPair(Y: Float64Array, v: Float64Array, n: number, a: number, o0: number, o1: number, g: number, nb: number, Vt: Float64Array, T: Float64Array, W: Float64Array): void {
  const two = o1 >= 0;
  const from = a + 1;
  const p1 = two ? o1 : o0;
  let p = 0;
  for (; p + 3 < g; p += 4) tileDots(Y, v, n, (a + p) * n, o0, p1, from, p, nb, W);
  for (; p < g; p++) {
    const vo = (a + p) * n;
    let s0 = 0;
    let s1 = 0;
    for (let i = from; i < n; i++) {
      s0 += v[vo + i] * Y[o0 + i];
      s1 += v[vo + i] * Y[p1 + i];
    }
    W[p] = s0;
    W[nb + p] = s1;
  }
  // w <- T w (T upper triangular: row q needs w[q..] only, so in place from the top).
  for (let q = 0; q < g; q++) {
    let s0 = 0;
    let s1 = 0;
    for (let c = q; c < g; c++) {
      const t = T[q * nb + c];
      s0 += t * W[c];
      s1 += t * W[nb + c];
    }
    W[q] = s0;
    W[nb + q] = s1;
  }
  let i = from;
  for (; i + 3 < n; i += 4) tileUpdate(Y, o0, o1, i, g, nb, Vt, W);
  for (; i < n; i++) {
    const vi = i * nb;
    let s0 = 0;
    let s1 = 0;
    for (let p = 0; p < g; p++) {
      s0 += Vt[vi + p] * W[p];
      s1 += Vt[vi + p] * W[nb + p];
    }
    Y[o0 + i] -= s0;
    if (two) Y[o1 + i] -= s1;
  }
}

/** W[p + c] = v_(p+c) . y0 and W[nb + p + c] = v_(p+c) . y1 over rows from.., c = 0..3 (v_(p+c) at vo + c n). */
function tileDots(Y: Float64Array, v: Float64Array, n: number, vo: number, o0: number, o1: number, from: number, p: number, nb: number, W: Float64Array): void {
  const q0 = vo;
  const q1 = q0 + n;
  const q2 = q1 + n;
  const q3 = q2 + n;
  let a0 = 0, a1 = 0, a2 = 0, a3 = 0, b0 = 0, b1 = 0, b2 = 0, b3 = 0;
  for (let i = from; i < n; i++) {
    const y0 = Y[o0 + i];
    const y1 = Y[o1 + i];
    const v0 = v[q0 + i];
    const v1 = v[q1 + i];
    const v2 = v[q2 + i];
    const v3 = v[q3 + i];
    a0 += v0 * y0;
    a1 += v1 * y0;
    a2 += v2 * y0;
    a3 += v3 * y0;
    b0 += v0 * y1;
    b1 += v1 * y1;
    b2 += v2 * y1;
    b3 += v3 * y1;
  }
  W[p] = a0;
  W[p + 1] = a1;
  W[p + 2] = a2;
  W[p + 3] = a3;
  W[nb + p] = b0;
  W[nb + p + 1] = b1;
  W[nb + p + 2] = b2;
  W[nb + p + 3] = b3;
}

/** y0[i..i+3] -= Vt[i..i+3] . w0 and y1[i..i+3] -= Vt[i..i+3] . w1 (y1 skipped when o1 < 0). */
function tileUpdate(Y: Float64Array, o0: number, o1: number, i: number, g: number, nb: number, Vt: Float64Array, W: Float64Array): void {
  const r0 = i * nb;
  const r1 = r0 + nb;
  const r2 = r1 + nb;
  const r3 = r2 + nb;
  let a0 = 0, a1 = 0, a2 = 0, a3 = 0, b0 = 0, b1 = 0, b2 = 0, b3 = 0;
  for (let p = 0; p < g; p++) {
    const w0 = W[p];
    const w1 = W[nb + p];
    const v0 = Vt[r0 + p];
    const v1 = Vt[r1 + p];
    const v2 = Vt[r2 + p];
    const v3 = Vt[r3 + p];
    a0 += v0 * w0;
    a1 += v1 * w0;
    a2 += v2 * w0;
    a3 += v3 * w0;
    b0 += v0 * w1;
    b1 += v1 * w1;
    b2 += v2 * w1;
    b3 += v3 * w1;
  }
  Y[o0 + i] -= a0;
  Y[o0 + i + 1] -= a1;
  Y[o0 + i + 2] -= a2;
  Y[o0 + i + 3] -= a3;
  if (o1 >= 0) {
    Y[o1 + i] -= b0;
    Y[o1 + i + 1] -= b1;
    Y[o1 + i + 2] -= b2;
    Y[o1 + i + 3] -= b3;
  }
}
