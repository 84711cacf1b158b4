/**
 * The quadratic forms and densities of `evolve` (evolution.ts), for a block of times at once.
 * Amplitudes a_k(t_b) = ar[b K + k] + i ai[b K + k] are stored time by time (each time's K levels
 * contiguous), so a row of X, D or the level table is read once per block and then swept B times over
 * contiguous memory. The sums for each time run in the same order as for a single time, so a block
 * gives the same bits as B single times.
 */
import type { MatrixElements } from './evolution';

/**
 * X and D for the quadratic forms of every time, using their symmetry: X is symmetric and D
 * antisymmetric, so with a_k = ar_k + i ai_k,
 * <x> W = sum_j X_jj |a_j|^2 + 2 sum_{j<k} X_jk (ar_j ar_k + ai_j ai_k) and
 * <p> W = 2 sum_{j<k} D_jk (ar_j ai_k - ai_j ar_k): only the diagonal of X and the strict upper
 * triangles are read (half of the K^2 entries). Then the triangle's structure: in compressed rows (the
 * entries where X or D is nonzero) when at most a quarter of it is nonzero (the oscillator's X and D
 * are tridiagonal, ladder operators); every other entry of each row (k = j + 1, j + 3, ...) when the
 * rest vanish, as between levels of equal parity in a box or any symmetric system, which halves the
 * triangle again; else the whole triangle, row by row.
 */
export interface TriangleForms {
  K: number;
  diag: Float64Array;
  /** 'rows': compressed rows; 'alternate': k - j odd only; 'dense': the whole strict upper triangle. */
  kind: 'rows' | 'alternate' | 'dense';
  start: Int32Array;
  col: Int32Array;
  x: Float64Array;
  d: Float64Array;
  /** Entries read per time (for the budget's count). */
  entries: number;
}

/**
 * Times per block of the dense and alternate forms and of densities: with 8 times, a row of X and D
 * (16 K bytes) is read from memory once per 8 times and the block's amplitudes (16 K bytes a time,
 * 51 KiB at K = 400) stay in the second-level cache. The sparse rows gain nothing from blocking (each
 * row holds about two entries), nor does anything below `BLOCK_MIN_LEVELS` levels (all in the first cache).
 */
export const DENSE_BLOCK = 8;
export const BLOCK_MIN_LEVELS = 16;

/** Times per block: `DENSE_BLOCK` for dense or alternate triangles or with a density from `BLOCK_MIN_LEVELS` levels, else 1. */
export function blockSize(t: TriangleForms, density: boolean): number {
  return t.K >= BLOCK_MIN_LEVELS && (density || t.kind !== 'rows') ? DENSE_BLOCK : 1;
}

export function triangleForms(me: MatrixElements, K: number): TriangleForms {
  const diag = new Float64Array(K);
  for (let j = 0; j < K; j++) diag[j] = me.x[j * K + j];
  let nnz = 0;
  let evenOffsets = 0;
  for (let j = 0; j < K; j++) {
    for (let k = j + 1; k < K; k++) {
      if (me.x[j * K + k] === 0 && me.d[j * K + k] === 0) continue;
      nnz++;
      if (((k - j) & 1) === 0) evenOffsets++;
    }
  }
  const triangle = (K * (K - 1)) / 2;
  const none = new Int32Array(0);
  if (nnz > 0.25 * triangle) {
    const kind = evenOffsets === 0 ? 'alternate' : 'dense';
    return { K, diag, kind, start: none, col: none, x: me.x, d: me.d, entries: K + (kind === 'alternate' ? Math.floor((K * K) / 4) : triangle) };
  }
  const start = new Int32Array(K + 1);
  const col = new Int32Array(nnz);
  const x = new Float64Array(nnz);
  const d = new Float64Array(nnz);
  let at = 0;
  for (let j = 0; j < K; j++) {
    start[j] = at;
    for (let k = j + 1; k < K; k++) {
      const i = j * K + k;
      if (me.x[i] === 0 && me.d[i] === 0) continue;
      col[at] = k;
      x[at] = me.x[i];
      d[at] = me.d[i];
      at++;
    }
  }
  start[K] = at;
  return { K, diag, kind: 'rows', start, col, x, d, entries: K + nnz };
}

/**
 * <x> W and <p> W of the block's B times (see `TriangleForms`) into outX[at + b] and outP[at + b].
 * For each row j the row's entries are loaded once and applied to two times at a time.
 */
export function blockQuadraticForms(t: TriangleForms, ar: Float64Array, ai: Float64Array, B: number, outX: Float64Array, outP: Float64Array, at: number): void {
  const K = t.K;
  const diag = new Float64Array(B);
  const mx = new Float64Array(B);
  const mp = new Float64Array(B);
  const step = t.kind === 'alternate' ? 2 : 1;
  for (let j = 0; j < K; j++) {
    const dj = t.diag[j];
    let b = 0;
    if (t.kind !== 'rows') {
      for (; b + 1 < B; b += 2) pairRow(t, ar, ai, j, step, b * K, diag, mx, mp, b);
    }
    for (; b < B; b++) {
      const o = b * K;
      const rj = ar[o + j];
      const ij = ai[o + j];
      diag[b] += dj * (rj * rj + ij * ij);
      const s = t.kind === 'rows' ? sparseRow(t, ar, ai, j, o) : denseRow(t, ar, ai, j, step, o);
      mx[b] += rj * s.xr + ij * s.xi;
      mp[b] += rj * s.di - ij * s.dr;
    }
  }
  for (let b = 0; b < B; b++) {
    outX[at + b] = diag[b] + 2 * mx[b];
    outP[at + b] = 2 * mp[b];
  }
}

/** Row j of a dense or alternate triangle for the times at offsets o and o + K, added into slots b and b + 1. */
function pairRow(t: TriangleForms, ar: Float64Array, ai: Float64Array, j: number, step: number, o: number, diag: Float64Array, mx: Float64Array, mp: Float64Array, b: number): void {
  const K = t.K;
  const row = j * K;
  const p = o + K;
  let xr0 = 0;
  let xi0 = 0;
  let dr0 = 0;
  let di0 = 0;
  let xr1 = 0;
  let xi1 = 0;
  let dr1 = 0;
  let di1 = 0;
  for (let k = j + 1; k < K; k += step) {
    const X = t.x[row + k];
    const D = t.d[row + k];
    const r0 = ar[o + k];
    const i0 = ai[o + k];
    const r1 = ar[p + k];
    const i1 = ai[p + k];
    xr0 += X * r0;
    xi0 += X * i0;
    dr0 += D * r0;
    di0 += D * i0;
    xr1 += X * r1;
    xi1 += X * i1;
    dr1 += D * r1;
    di1 += D * i1;
  }
  const dj = t.diag[j];
  const r0 = ar[o + j];
  const i0 = ai[o + j];
  const r1 = ar[p + j];
  const i1 = ai[p + j];
  diag[b] += dj * (r0 * r0 + i0 * i0);
  diag[b + 1] += dj * (r1 * r1 + i1 * i1);
  mx[b] += r0 * xr0 + i0 * xi0;
  mx[b + 1] += r1 * xr1 + i1 * xi1;
  mp[b] += r0 * di0 - i0 * dr0;
  mp[b + 1] += r1 * di1 - i1 * dr1;
}

interface RowSums {
  xr: number;
  xi: number;
  dr: number;
  di: number;
}

/** Row j of a dense or alternate triangle against the time at offset o. */
function denseRow(t: TriangleForms, ar: Float64Array, ai: Float64Array, j: number, step: number, o: number): RowSums {
  const K = t.K;
  const row = j * K;
  let xr = 0;
  let xi = 0;
  let dr = 0;
  let di = 0;
  for (let k = j + 1; k < K; k += step) {
    const X = t.x[row + k];
    const D = t.d[row + k];
    xr += X * ar[o + k];
    xi += X * ai[o + k];
    dr += D * ar[o + k];
    di += D * ai[o + k];
  }
  return { xr, xi, dr, di };
}

/** Row j of the compressed rows against the time at offset o. */
function sparseRow(t: TriangleForms, ar: Float64Array, ai: Float64Array, j: number, o: number): RowSums {
  let xr = 0;
  let xi = 0;
  let dr = 0;
  let di = 0;
  for (let e = t.start[j]; e < t.start[j + 1]; e++) {
    const k = o + t.col[e];
    const X = t.x[e];
    const D = t.d[e];
    xr += X * ar[k];
    xi += X * ai[k];
    dr += D * ar[k];
    di += D * ai[k];
  }
  return { xr, xi, dr, di };
}

/** The level table phi_k(x_j) (K rows of nx points) transposed to nx rows of K levels, for `blockDensity`. */
export function transposeTable(table: Float64Array, K: number, nx: number): Float64Array {
  const out = new Float64Array(K * nx);
  for (let k = 0; k < K; k++) for (let j = 0; j < nx; j++) out[j * K + k] = table[k * nx + j];
  return out;
}

/**
 * |sum_k a_k phi_k(x)|^2 / W on the nx points for each of the block's B times, from the transposed
 * table (`transposeTable`): each point's K values are read once per block and dotted with two times'
 * amplitudes at a time, the sums over k kept in registers and run from k = 0 up, as for a single time.
 */
export function blockDensity(tableT: Float64Array, ar: Float64Array, ai: Float64Array, K: number, B: number, nx: number, wK: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let b = 0; b < B; b++) out.push(new Float64Array(nx));
  for (let j = 0; j < nx; j++) {
    const row = j * K;
    let b = 0;
    for (; b + 1 < B; b += 2) {
      const o = b * K;
      const p = o + K;
      let pr0 = 0;
      let pi0 = 0;
      let pr1 = 0;
      let pi1 = 0;
      for (let k = 0; k < K; k++) {
        const f = tableT[row + k];
        pr0 += ar[o + k] * f;
        pi0 += ai[o + k] * f;
        pr1 += ar[p + k] * f;
        pi1 += ai[p + k] * f;
      }
      out[b][j] = (pr0 * pr0 + pi0 * pi0) / wK;
      out[b + 1][j] = (pr1 * pr1 + pi1 * pi1) / wK;
    }
    for (; b < B; b++) {
      const o = b * K;
      let pr = 0;
      let pi = 0;
      for (let k = 0; k < K; k++) {
        const f = tableT[row + k];
        pr += ar[o + k] * f;
        pi += ai[o + k] * f;
      }
      out[b][j] = (pr * pr + pi * pi) / wK;
    }
  }
  return out;
}
