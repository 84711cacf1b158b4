/**
 * The blocked Householder reduction (tridiagBlocked.ts) and the compact WY back-transform
 * (backTransformBlocked.ts) against the unblocked ones (householder.ts, `backTransformInterleaved`) and
 * against closed forms. Both are similarity transforms by orthogonal Q, so T has A's eigenvalues to about
 * eps n ||A|| (Golub & Van Loan, Matrix Computations, 4th ed., 8.3.1, the backward error of Householder
 * tridiagonalisation, from memory) and Q^T Q = I to rounding. Work is counted, never timed.
 */
import { describe, it, expect } from 'vitest';
import {
  householderTridiagonalize,
  lowestEigenvalues,
  backTransformAll,
  backTransformInterleaved,
  symmetricLowest,
  BLOCKED_FROM,
  PANEL_WIDTH,
  type TridiagonalReduction,
} from '../../server/src/physics/tridiag';
import { backTransformBlocked } from '../../server/src/physics/backTransformBlocked';
import { createBudget } from '../../server/src/physics/budget';
import { sineDvrGrid, sineDvrSolve } from '../../server/src/physics/dvr';
import { orthonormalityError, lowerPairs } from './helpers';

const EPS = 2.220446049250313e-16;

/** Deterministic pseudo-random numbers in [-0.5, 0.5). */
function rng(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648 - 0.5;
  };
}

function randomSymmetric(n: number, seed: number): Float64Array {
  const r = rng(seed);
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) A[i * n + j] = A[j * n + i] = r();
  return A;
}

/**
 * The sine-DVR Hamiltonian of p^2 + x^2 (m = 1/2) on [-L/2, L/2] with N intervals, odd-k block
 * (k = 1, 3, ...): H_kl = (k pi / L)^2 delta_kl + C(k - l) - C(k + l), C(q) = (1/N) sum_i V_i cos(q pi i / N)
 * (Colbert & Miller, J. Chem. Phys. 96, 1982 (1992), appendix A, in the sine basis; derived in dvr.ts).
 * Its lowest eigenvalues are E_n = 2 n + 1 for even n (closed form) once the grid resolves them.
 */
function dvrOddBlock(N: number, L: number): { H: Float64Array; m: number } {
  const C = new Float64Array(2 * N);
  for (let q = 0; q < 2 * N; q++) {
    let s = 0;
    for (let i = 1; i < N; i++) {
      const x = -L / 2 + (i * L) / N;
      s += x * x * Math.cos((q * Math.PI * i) / N);
    }
    C[q] = s / N;
  }
  const ks: number[] = [];
  for (let k = 1; k < N; k += 2) ks.push(k);
  const m = ks.length;
  const H = new Float64Array(m * m);
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      const k = ks[r]!;
      const l = ks[c]!;
      H[r * m + c] = (r === c ? ((k * Math.PI) / L) ** 2 : 0) + C[Math.abs(k - l)]! - C[k + l]!;
    }
  }
  return { H, m };
}

function frobenius(A: Float64Array): number {
  return Math.sqrt(A.reduce((s, x) => s + x * x, 0));
}

/** Every eigenvalue of the two reductions' tridiagonals (bisection), the largest difference. */
function spectraDiff(a: TridiagonalReduction, b: TridiagonalReduction, n: number): number {
  const ea = lowestEigenvalues(a, n);
  const eb = lowestEigenvalues(b, n);
  let worst = 0;
  for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(ea[i]! - eb[i]!));
  return worst;
}

/** The columns of Q (row j = Q e_j) from a reduction, by a back-transform of the identity. */
function columnsOfQ(red: TridiagonalReduction, n: number, back: typeof backTransformAll): Float64Array {
  const Q = new Float64Array(n * n);
  for (let j = 0; j < n; j++) Q[j * n + j] = 1;
  back(red, Q, n);
  return Q;
}

/** max |(A Q - Q T)_ij| with T = tridiag(d, e), Q's columns as rows. */
function similarityResidual(A: Float64Array, Q: Float64Array, red: TridiagonalReduction, n: number): number {
  let worst = 0;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      let aq = 0;
      for (let k = 0; k < n; k++) aq += A[i * n + k]! * Q[j * n + k]!;
      // (Q T)_ij = Q_i,j-1 e_(j-1) + Q_ij d_j + Q_i,j+1 e_j.
      let qt = Q[j * n + i]! * red.d[j]!;
      if (j > 0) qt += Q[(j - 1) * n + i]! * red.e[j - 1]!;
      if (j < n - 1) qt += Q[(j + 1) * n + i]! * red.e[j]!;
      worst = Math.max(worst, Math.abs(aq - qt));
    }
  }
  return worst;
}

// Panel widths that make every size take several panels and a partial last one (the defaults only block from 160 rows).
const cases: [number, number][] = [
  [5, 1],
  [31, 4],
  [64, 8],
  [65, 8],
  [200, PANEL_WIDTH],
  [513, PANEL_WIDTH],
];

describe('blocked against unblocked reduction', () => {
  it.each(cases)('random symmetric n = %i, panel %i: same spectrum to a few eps ||A||', (n, panel) => {
    const A = randomSymmetric(n, 17 + n);
    const norm = frobenius(A);
    const blocked = householderTridiagonalize(A.slice(), n, undefined, { panel, tail: 3 });
    const plain = householderTridiagonalize(A.slice(), n, undefined, { panel: 0 });
    expect(spectraDiff(blocked, plain, n)).toBeLessThan(8 * EPS * norm);
    // The trace is kept by any similarity (invariant).
    let trace = 0;
    for (let i = 0; i < n; i++) trace += A[i * n + i]!;
    expect(Math.abs(blocked.d.reduce((s, x) => s + x, 0) - trace)).toBeLessThan(8 * EPS * n * norm);
  });

  it.each(cases)('sine-DVR block of p^2 + x^2, about %i rows, panel %i: same spectrum', (n, panel) => {
    const { H, m } = dvrOddBlock(2 * n + 1, 2 * Math.max(6, Math.sqrt(2 * n)));
    expect(m).toBe(n);
    const norm = frobenius(H);
    const blocked = householderTridiagonalize(H.slice(), m, undefined, { panel, tail: 3 });
    const plain = householderTridiagonalize(H.slice(), m, undefined, { panel: 0 });
    expect(spectraDiff(blocked, plain, m)).toBeLessThan(8 * EPS * norm);
  });

  it.each(cases.filter(([n]) => n <= 200))('n = %i, panel %i: Q orthogonal to 1e-13 and A Q = Q T', (n, panel) => {
    const A = randomSymmetric(n, 5 + n);
    const red = householderTridiagonalize(A.slice(), n, undefined, { panel, tail: 3 });
    for (const back of [backTransformInterleaved, (r: TridiagonalReduction, y: Float64Array, k: number) => backTransformBlocked(r, y, k, undefined, Math.max(1, panel))]) {
      const Q = columnsOfQ(red, n, back);
      expect(orthonormalityError(Q, n, null, lowerPairs(n))).toBeLessThan(1e-13);
      expect(similarityResidual(A, Q, red, n)).toBeLessThan(16 * EPS * n * frobenius(A) + 1e-300);
    }
  });

  it('n = 513, panel 32: Q orthogonal to 1e-13 through the WY back-transform', () => {
    const n = 513;
    const red = householderTridiagonalize(randomSymmetric(n, 3), n, undefined, { panel: PANEL_WIDTH, tail: 3 });
    const Q = columnsOfQ(red, n, (r, y, k) => backTransformBlocked(r, y, k));
    const pairs: [number, number][] = [];
    // Every column against the first, the middle and the last ten (a full check is n^2 / 2 dot products).
    for (let i = 0; i < n; i++) for (const k of [0, 1, 2, 255, 256, ...Array.from({ length: 10 }, (_, t) => n - 1 - t)]) if (k <= i) pairs.push([i, k]);
    expect(orthonormalityError(Q, n, null, pairs)).toBeLessThan(1e-13);
  });

  it('the WY back-transform agrees with the interleaved one on 37 vectors (odd count, partial group)', () => {
    const n = 300;
    const red = householderTridiagonalize(randomSymmetric(n, 41), n);
    const Y = randomSymmetric(n, 43).subarray(0, 37 * n);
    const a = Y.slice();
    const b = Y.slice();
    backTransformInterleaved(red, a, 37);
    backTransformBlocked(red, b, 37);
    let worst = 0;
    for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i]! - b[i]!));
    // Entries of Q y are at most ||y|| (about 10 here); rounding of n reflectors of length n.
    expect(worst).toBeLessThan(1e-12);
  });

  it('counted work: 4/3 n^3 for the unblocked reduction, plus at most the panels\' O(n^2 nb) for the blocked one', () => {
    const n = 400;
    const A = randomSymmetric(n, 9);
    const bb = createBudget();
    const pb = createBudget();
    householderTridiagonalize(A.slice(), n, bb, { panel: PANEL_WIDTH, tail: 3 });
    householderTridiagonalize(A.slice(), n, pb, { panel: 0 });
    const flops = (4 / 3) * n ** 3;
    expect(Math.abs(pb.work.ops / flops - 1)).toBeLessThan(0.02);
    // Each panel column also updates its own column and corrects S v with the panel so far: 12 jj flops
    // per row, about 3 nb n^2 in all (derived in this comment), 2.25 nb / n of 4/3 n^3.
    expect(bb.work.ops).toBeGreaterThan(pb.work.ops);
    expect(bb.work.ops / flops - 1).toBeLessThan((2.25 * PANEL_WIDTH) / n);
  });
});

describe('closed forms through the blocked paths', () => {
  it('known spectrum 1..n of H diag H (n = 1,050, the default blocked paths): the lowest 200 eigenvalues to 1e-11', () => {
    // A = H diag(1, ..., n) H with one random reflector H: its eigenvalues are exactly 1..n (derived in this comment).
    const n = 1050;
    expect(n).toBeGreaterThanOrEqual(BLOCKED_FROM);
    const r = rng(29);
    const u = Array.from({ length: n }, r);
    const uu = u.reduce((s, x) => s + x * x, 0);
    let s = 0;
    for (let k = 0; k < n; k++) s += (k + 1) * u[k]! * u[k]!;
    const A = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        // (H D H)_ij = D_i delta_ij - 2 u_i u_j (D_i + D_j) / uu + 4 u_i u_j (sum_k D_k u_k^2) / uu^2.
        A[i * n + j] = (i === j ? i + 1 : 0) - (2 * u[i]! * u[j]! * (i + 1 + j + 1)) / uu + (4 * u[i]! * u[j]! * s) / (uu * uu);
      }
    }
    const { values, vectors } = symmetricLowest(A, n, 200);
    for (let k = 0; k < 200; k++) expect(Math.abs(values[k]! - (k + 1))).toBeLessThan(1e-11);
    expect(orthonormalityError(vectors, n, null, lowerPairs(40))).toBeLessThan(1e-12);
  });

  it('a matrix already tridiagonal, (-1, 2, -1) with n = 1,050 (every reflector the identity): lambda_k = 2 - 2 cos(k pi/(n+1))', () => {
    // Closed form of the second-difference matrix (Golub & Van Loan, Matrix Computations, 4th ed., 4.8.3
    // (from memory)), eigenvectors sqrt(2/(n+1)) sin(i k pi/(n+1)).
    const n = 1050;
    expect(n).toBeGreaterThanOrEqual(BLOCKED_FROM);
    const A = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      A[i * n + i] = 2;
      if (i > 0) A[i * n + i - 1] = A[(i - 1) * n + i] = -1;
    }
    const { values, vectors } = symmetricLowest(A, n, 10);
    for (let k = 1; k <= 10; k++) {
      expect(Math.abs(values[k - 1]! - (2 - 2 * Math.cos((k * Math.PI) / (n + 1))))).toBeLessThan(1e-14);
      const sign = Math.sign(vectors[(k - 1) * n]!);
      let worst = 0;
      for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(sign * vectors[(k - 1) * n + i]! - Math.sqrt(2 / (n + 1)) * Math.sin(((i + 1) * k * Math.PI) / (n + 1))));
      expect(worst).toBeLessThan(1e-9);
    }
  });

  it('p^2 + x^2, sine DVR of 2,101 intervals (both blocks from BLOCKED_FROM rows): the lowest 120 levels are 2 n + 1', () => {
    // E_n = 2 n + 1 for H = p^2 + x^2 (hbar = 1, m = 1/2; closed form). On [-20, 20] with h = 0.019 the
    // DVR resolves these levels far below 1e-9 (level 119's turning point is 15.5; the wall shifts it by
    // far less than 1e-12), so what is left is the eigen-solver's rounding, about eps ||H|| n (||H|| about 2.7e4).
    const N = 2101;
    const xs = sineDvrGrid(-20, 20, N);
    const sol = sineDvrSolve(xs.map((x) => x * x), -20, 20, 0.5, 120, { symmetric: true });
    expect(Math.floor((N - 1) / 2)).toBeGreaterThanOrEqual(BLOCKED_FROM);
    for (let n = 0; n < 120; n++) expect(Math.abs(sol.energies[n]! - (2 * n + 1))).toBeLessThan(1e-9 * (2 * n + 1));
    // The sine-series coefficients of each level are orthonormal (invariant of the orthogonal Q).
    expect(orthonormalityError(sol.coefficients, N - 1, null, lowerPairs(120))).toBeLessThan(1e-12);
  });
});
