/**
 * A plain second-order finite-difference solver, the baseline the spectral solver (potential.ts) is
 * benchmarked against. Same hard walls at a and b.
 */
import { lowestEigenvalues, tridiagonalEigenvectors } from './tridiag';
import type { PotentialFn } from './potential';

/** Options of `fdLevels`. */
export interface FdOptions {
  /** Also return the eigenvectors on the grid (unit 2-norm rows). Default false. */
  vectors?: boolean;
}

/** The result of `fdLevels`. */
export interface FdResult {
  /** Interior grid x_i = a + i h, i = 1..N-1, h = (b - a)/N. */
  x: Float64Array;
  energies: Float64Array;
  /** Level j at [j * (N-1), (j + 1) * (N-1)), when asked for. */
  vectors?: Float64Array;
}

/**
 * Lowest `levels` energies of H = -1/(2m) d^2/dx^2 + V(x) with phi(a) = phi(b) = 0, from the
 * three-point stencil phi'' ~ (phi_{i-1} - 2 phi_i + phi_{i+1}) / h^2 on N intervals: the symmetric
 * tridiagonal matrix with diagonal 1/(m h^2) + V(x_i) and off-diagonal -1/(2 m h^2), solved by
 * Sturm bisection (tridiag.ts). The error is O(h^2), about E (k h)^2 / 12 for a level of local wave
 * number k (Taylor expansion of the stencil; common practice).
 * Returns empty arrays for invalid input or a non-finite V (never throws).
 */
export function fdLevels(V: PotentialFn, a: number, b: number, mass: number, intervals: number, levels: number, options: FdOptions = {}): FdResult {
  const N = Math.floor(intervals);
  const empty: FdResult = { x: new Float64Array(0), energies: new Float64Array(0) };
  if (!(N >= 2) || !(b > a) || !(mass > 0) || !Number.isFinite(a + b + mass)) return empty;
  const n = N - 1;
  const h = (b - a) / N;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = a + (i + 1) * h;
  let v: Float64Array;
  try {
    v = V(x);
  } catch {
    return empty;
  }
  if (!v || v.length !== n) return empty;
  const d = new Float64Array(n);
  const e = new Float64Array(Math.max(0, n - 1));
  const t = 1 / (2 * mass * h * h);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(v[i])) return empty;
    d[i] = 2 * t + v[i];
  }
  e.fill(-t);
  const energies = lowestEigenvalues({ d, e }, levels);
  const out: FdResult = { x, energies };
  if (options.vectors) out.vectors = tridiagonalEigenvectors({ d, e }, energies);
  return out;
}
