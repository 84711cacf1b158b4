import { describe, it, expect } from 'vitest';
import { symmetricLowest, lowestEigenvalues, tridiagonalEigenvectors, householderTridiagonalize } from '../../server/src/physics/tridiag';
import { lowerPairs, orthonormalityError } from './helpers';

/** Deterministic pseudo-random numbers in [-0.5, 0.5). */
function rng(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648 - 0.5;
  };
}

/** A = Q diag(lambda) Q^T with Q a product of three random reflectors, so the spectrum is known exactly. */
function withSpectrum(lambda: number[], seed: number): Float64Array {
  const n = lambda.length;
  const r = rng(seed);
  const A = new Float64Array(n * n);
  for (let i = 0; i < n; i++) A[i * n + i] = lambda[i];
  for (let t = 0; t < 3; t++) {
    const v = Array.from({ length: n }, r);
    const vv = v.reduce((s, x) => s + x * x, 0);
    // A <- H A H with H = I - 2 v v^T / v.v.
    const Av = new Float64Array(n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) Av[i] += A[i * n + j] * v[j];
    const vAv = v.reduce((s, x, i) => s + x * Av[i], 0);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        A[i * n + j] += (-2 * (v[i] * Av[j] + Av[i] * v[j])) / vv + (4 * vAv * v[i] * v[j]) / (vv * vv);
      }
    }
  }
  return A;
}

describe('symmetric eigensolver', () => {
  it('tridiagonal (-1, 2, -1): lambda_k = 2 - 2 cos(k pi/(n+1)), with eigenvectors sin(i k pi/(n+1))', () => {
    // Closed form of the second-difference matrix (Golub & Van Loan, Matrix Computations, 4th ed., 4.8.3 (from memory)).
    const n = 200;
    const d = new Float64Array(n).fill(2);
    const e = new Float64Array(n - 1).fill(-1);
    const vals = lowestEigenvalues({ d, e }, 10);
    const vecs = tridiagonalEigenvectors({ d, e }, vals);
    for (let k = 1; k <= 10; k++) {
      expect(Math.abs(vals[k - 1] - (2 - 2 * Math.cos((k * Math.PI) / (n + 1))))).toBeLessThan(1e-14);
      const norm = Math.sqrt(2 / (n + 1));
      const sign = Math.sign(vecs[(k - 1) * n]);
      for (let i = 0; i < n; i++) {
        expect(Math.abs(sign * vecs[(k - 1) * n + i] - norm * Math.sin(((i + 1) * k * Math.PI) / (n + 1)))).toBeLessThan(1e-10);
      }
    }
  });

  it('dense matrix with a known spectrum, including a near-degenerate pair', () => {
    const lambda = [-3, 0.5, 0.5 + 1e-11, 1, 2, 7, 7.25, 9, 11, 30];
    const n = lambda.length;
    const A = withSpectrum(lambda, 7);
    const keep = A.slice();
    const { values, vectors } = symmetricLowest(A, n, 8);
    values.forEach((v, i) => expect(Math.abs(v - lambda[i])).toBeLessThan(1e-13 * 30));
    // Residuals ||A v - lambda v|| and orthonormality (invariants).
    for (let j = 0; j < 8; j++) {
      let res = 0;
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += keep[i * n + k] * vectors[j * n + k];
        res = Math.max(res, Math.abs(s - values[j] * vectors[j * n + i]));
      }
      expect(res).toBeLessThan(1e-12 * 30);
    }
    expect(orthonormalityError(vectors, n, null, lowerPairs(8))).toBeLessThan(1e-10);
  });

  it('random symmetric 120 x 120: trace = sum of eigenvalues, residuals small', () => {
    const n = 120;
    const r = rng(99);
    const A = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) A[i * n + j] = A[j * n + i] = r();
    const keep = A.slice();
    const trace = Array.from({ length: n }, (_, i) => A[i * n + i]).reduce((s, x) => s + x, 0);
    const red = householderTridiagonalize(A.slice(), n);
    // Similarity keeps the trace (invariant).
    expect(Math.abs(red.d.reduce((s, x) => s + x, 0) - trace)).toBeLessThan(1e-11);
    const { values, vectors } = symmetricLowest(A, n, n);
    expect(Math.abs(values.reduce((s, x) => s + x, 0) - trace)).toBeLessThan(1e-11);
    for (let j = 1; j < n; j++) expect(values[j]).toBeGreaterThanOrEqual(values[j - 1]);
    for (let j = 0; j < n; j += 17) {
      let res = 0;
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let k = 0; k < n; k++) s += keep[i * n + k] * vectors[j * n + k];
        res = Math.max(res, Math.abs(s - values[j] * vectors[j * n + i]));
      }
      expect(res).toBeLessThan(1e-12);
    }
  });
});
