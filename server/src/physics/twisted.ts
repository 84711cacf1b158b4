/**
 * Eigenvectors of a symmetric tridiagonal T in O(n) each, from one relatively robust representation
 * (Dhillon & Parlett, "Multiple representations to compute orthogonal eigenvectors of symmetric
 * tridiagonal matrices", Linear Algebra Appl. 387, 1 (2004); Parlett & Dhillon, "Fernando's solution to
 * Wilkinson's problem", Linear Algebra Appl. 267, 247 (1997); both from memory).
 *
 * Why: inverse iteration on T itself (tridiag.ts, the classic route) has residuals of eps ||T||, so the
 * vectors of two levels closer than about 1e-3 ||T|| must be re-orthogonalised against each other. In
 * a sine DVR ||T|| is set by the highest kinetic term, far above the low levels, so every level of an
 * oscillator falls into one such cluster and the cost grows as n k^2. Here T - sigma I = L D L^T with
 * sigma just below the lowest level is positive definite, and a positive definite L D L^T determines
 * its eigenvalues mu = lambda - sigma to high relative accuracy (Demmel & Kahan's bidiagonal result,
 * from memory). Each mu is refined by bisection on that representation (stationary qd transform counts)
 * to a few eps relative, and its vector is one solve with a twisted factorization
 * L D L^T - mu I = N_r Delta_r N_r^T, N_r^T z = e_r, at the twist r where |gamma_r| is least. Two such
 * vectors are orthogonal to about eps / relgap, relgap = |mu_i - mu_j| / max(mu_i, mu_j), so only
 * levels with relgap < 1e-3 (`MIN_RELGAP`, the threshold of the published algorithm) are treated as a
 * cluster: inverse iteration with twisted solves of random right-hand sides, re-orthogonalised within
 * the cluster only.
 *
 * Returns null when the representation cannot be built (no positive definite shift found, values out
 * of order, a non-finite vector): the caller then uses plain inverse iteration.
 */
import { charge, type Budget } from './budget';

/** Levels closer than this relative gap are orthogonalised against each other. */
export const MIN_RELGAP = 1e-3;

const EPS = 2.220446049250313e-16;

/** L D L^T: d (length n) and l (length n - 1). */
interface Ldl {
  d: Float64Array;
  l: Float64Array;
}

/** Work arrays of one twisted factorization. */
interface Twist {
  lp: Float64Array;
  dp: Float64Array;
  um: Float64Array;
  dm: Float64Array;
  s: Float64Array;
  p: Float64Array;
}

/** T - sigma I = L D L^T, or null when a pivot is not positive (the shift is not below the spectrum). */
function rootFactor(d: Float64Array, e: Float64Array, sigma: number): Ldl | null {
  const n = d.length;
  const D = new Float64Array(n);
  const l = new Float64Array(Math.max(0, n - 1));
  let piv = d[0] - sigma;
  for (let i = 0; i < n - 1; i++) {
    if (!(piv > 0) || !Number.isFinite(piv)) return null;
    D[i] = piv;
    l[i] = e[i] / piv;
    piv = d[i + 1] - sigma - l[i] * e[i];
  }
  if (!(piv > 0) || !Number.isFinite(piv)) return null;
  D[n - 1] = piv;
  return { d: D, l };
}

/** Number of eigenvalues of L D L^T below tau: negative pivots of L D L^T - tau I (stationary qd transform). */
function countBelow(r: Ldl, tau: number, pivmin: number): number {
  const { d, l } = r;
  const n = d.length;
  let count = 0;
  let s = -tau;
  for (let i = 0; i < n - 1; i++) {
    let dp = d[i] + s;
    if (Math.abs(dp) < pivmin) dp = -pivmin;
    if (dp < 0) count++;
    s = ((d[i] * l[i] * l[i]) / dp) * s - tau;
  }
  const last = d[n - 1] + s;
  if (last < 0 || Math.abs(last) < pivmin) count++;
  return count;
}

/**
 * The twisted factorization of L D L^T - mu I (stationary part top-down, progressive part bottom-up)
 * and the twist r where |gamma_r| is least; gamma_r is the residual of the vector with z_r = 1.
 */
function twist(r: Ldl, mu: number, pivmin: number, w: Twist): { at: number; gamma: number } {
  const { d, l } = r;
  const n = d.length;
  const { lp, dp, um, dm, s, p } = w;
  s[0] = -mu;
  for (let i = 0; i < n - 1; i++) {
    let x = d[i] + s[i];
    if (Math.abs(x) < pivmin) x = x < 0 ? -pivmin : pivmin;
    dp[i] = x;
    lp[i] = (d[i] * l[i]) / x;
    s[i + 1] = lp[i] * l[i] * s[i] - mu;
  }
  p[n - 1] = d[n - 1] - mu;
  for (let i = n - 2; i >= 0; i--) {
    let x = d[i] * l[i] * l[i] + p[i + 1];
    if (Math.abs(x) < pivmin) x = x < 0 ? -pivmin : pivmin;
    dm[i + 1] = x;
    const t = d[i] / x;
    um[i] = l[i] * t;
    p[i] = p[i + 1] * t - mu;
  }
  let at = 0;
  let gamma = Infinity;
  for (let k = 0; k < n; k++) {
    const g = s[k] + p[k] + mu;
    if (Math.abs(g) < Math.abs(gamma)) {
      gamma = g;
      at = k;
    }
  }
  if (Math.abs(gamma) < pivmin) gamma = gamma < 0 ? -pivmin : pivmin;
  return { at, gamma };
}

/** z with N_r^T z = e_r (the vector of a singleton), unit length, into `z`; false when it is not finite. */
function twistedVector(w: Twist, at: number, z: Float64Array): boolean {
  const n = z.length;
  z[at] = 1;
  for (let i = at - 1; i >= 0; i--) z[i] = -w.lp[i] * z[i + 1];
  for (let i = at + 1; i < n; i++) z[i] = -w.um[i - 1] * z[i - 1];
  return normalise(z);
}

/** Solves N_r Delta_r N_r^T x = b in place (one step of inverse iteration inside a cluster). */
function twistedSolve(w: Twist, at: number, gamma: number, b: Float64Array): void {
  const n = b.length;
  const { lp, dp, um, dm } = w;
  for (let i = 1; i < at; i++) b[i] -= lp[i - 1] * b[i - 1];
  for (let i = n - 2; i > at; i--) b[i] -= um[i] * b[i + 1];
  if (at > 0) b[at] -= lp[at - 1] * b[at - 1];
  if (at < n - 1) b[at] -= um[at] * b[at + 1];
  for (let i = 0; i < at; i++) b[i] /= dp[i];
  b[at] /= gamma;
  for (let i = at + 1; i < n; i++) b[i] /= dm[i];
  for (let i = at - 1; i >= 0; i--) b[i] -= lp[i] * b[i + 1];
  for (let i = at + 1; i < n; i++) b[i] -= um[i - 1] * b[i - 1];
}

/** 2^-600: the scale of a retried solve (a power of two, so the scaling itself is exact). */
const RETRY_SCALE = 2 ** -600;

/**
 * `twistedSolve` of b; when the result's squared norm is not finite (pivots near pivmin overflowed it:
 * seen in clusters of about 600 levels in blocks of 3,200 rows, 3,200 levels of x^2), the same solve of
 * b scaled by 2^-600. Inverse iteration needs only the direction; before this, the overflow made the
 * whole block fall back to plain inverse iteration (n k^2, 43% of that solve's time).
 */
function solveScaled(w: Twist, at: number, gamma: number, b: Float64Array, keep: Float64Array): void {
  keep.set(b);
  twistedSolve(w, at, gamma, b);
  let s = 0;
  for (let i = 0; i < b.length; i++) s += b[i] * b[i];
  if (Number.isFinite(s)) return;
  for (let i = 0; i < b.length; i++) b[i] = keep[i] * RETRY_SCALE;
  twistedSolve(w, at, gamma, b);
}

/** Scales z to unit length; false when its norm is not a positive finite number. */
function normalise(z: Float64Array): boolean {
  let s = 0;
  for (let i = 0; i < z.length; i++) s += z[i] * z[i];
  const nrm = Math.sqrt(s);
  if (!(nrm > 0) || !Number.isFinite(nrm)) return false;
  const inv = 1 / nrm;
  for (let i = 0; i < z.length; i++) z[i] *= inv;
  return true;
}

/**
 * mu = lambda - sigma refined by bisection on the representation, starting from `guess` (accurate to
 * about `slack` absolute), to 4 eps relative; NaN when the count does not bracket level j.
 */
function refine(r: Ldl, j: number, guess: number, slack: number, pivmin: number, budget: Budget | undefined): number {
  const n = r.d.length;
  let lo = Math.max(0, guess - slack);
  let hi = guess + slack;
  for (let widen = 0; countBelow(r, lo, pivmin) > j; widen++) {
    if (widen > 60) return NaN;
    lo = Math.max(0, lo - (hi - lo));
    if (lo === 0) break;
  }
  for (let widen = 0; countBelow(r, hi, pivmin) <= j; widen++) {
    if (widen > 60) return NaN;
    hi += hi - lo;
  }
  for (let it = 0; it < 200; it++) {
    const mid = 0.5 * (lo + hi);
    if (hi - lo <= 4 * EPS * hi || mid <= lo || mid >= hi) break;
    charge(budget, 6 * n);
    if (countBelow(r, mid, pivmin) > j) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * Unit eigenvectors of T (d, e) for its lowest eigenvalues `values` (ascending, from bisection on T,
 * each within `slack` of the true one), row by row; null when the representation fails (see the file's
 * comment). Work: O(n) per level for bisection and the twisted solve, plus n c^2 inside a cluster of c
 * levels.
 */
export function relativeEigenvectors(d: Float64Array, e: Float64Array, values: Float64Array, tnorm: number, budget?: Budget): Float64Array | null {
  const n = d.length;
  const m = values.length;
  if (n < 2 || m === 0) return null;
  for (let j = 1; j < m; j++) if (!(values[j] >= values[j - 1])) return null;
  const slack = 8 * EPS * tnorm + 1e-300;
  const pivmin = Number.MIN_VALUE * 1e10 + tnorm * 1e-300;
  // The root shift: below the lowest level by a quarter of its gap (at least a margin of rounding).
  let tau = Math.max(m > 1 ? 0.25 * (values[1] - values[0]) : 0, 64 * slack);
  let root: Ldl | null = null;
  let sigma = 0;
  for (let tries = 0; tries < 60 && !root; tries++) {
    sigma = values[0] - tau;
    root = rootFactor(d, e, sigma);
    tau *= 2;
  }
  if (!root) return null;
  charge(budget, 4 * n);
  const mu = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    mu[j] = refine(root, j, values[j] - sigma, slack, pivmin, budget);
    if (!Number.isFinite(mu[j]) || (j > 0 && mu[j] < mu[j - 1])) return null;
  }
  const w: Twist = {
    lp: new Float64Array(n),
    dp: new Float64Array(n),
    um: new Float64Array(n),
    dm: new Float64Array(n),
    s: new Float64Array(n),
    p: new Float64Array(n),
  };
  const out = new Float64Array(m * n);
  const keep = new Float64Array(n);
  let seed = 12345;
  for (let j = 0; j < m; ) {
    // The cluster starting at j: consecutive levels closer than MIN_RELGAP relative.
    let end = j + 1;
    while (end < m && mu[end] - mu[end - 1] < MIN_RELGAP * Math.max(mu[end], mu[end - 1])) end++;
    if (end === j + 1) {
      charge(budget, 24 * n);
      const { at } = twist(root, mu[j], pivmin, w);
      const z = out.subarray(j * n, (j + 1) * n);
      if (!twistedVector(w, at, z)) return null;
    } else {
      for (let q = j; q < end; q++) {
        const { at, gamma } = twist(root, mu[q], pivmin, w);
        const z = out.subarray(q * n, (q + 1) * n);
        for (let i = 0; i < n; i++) {
          seed = (seed * 1103515245 + 12345) % 2147483648;
          z[i] = seed / 2147483648 - 0.5;
        }
        for (let iter = 0; iter < 3; iter++) {
          charge(budget, 30 * n + 4 * n * (q - j));
          solveScaled(w, at, gamma, z, keep);
          for (let o = j; o < q; o++) {
            const y = out.subarray(o * n, (o + 1) * n);
            let dot = 0;
            for (let i = 0; i < n; i++) dot += y[i] * z[i];
            for (let i = 0; i < n; i++) z[i] -= dot * y[i];
          }
          if (!normalise(z)) return null;
        }
      }
    }
    j = end;
  }
  return out;
}
