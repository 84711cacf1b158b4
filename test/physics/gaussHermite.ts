/**
 * The Gauss–Hermite rule, a reference for the tests: it integrates oscillator eigenfunctions (which
 * carry their own Gaussian) independently of the composite Gauss–Legendre rule the engine uses.
 */
import type { Quadrature } from '../../server/src/physics/types';

/** A Gauss–Hermite rule; `ws[i] = w[i] * exp(x[i]^2)` integrates plain functions (no weight). */
export interface HermiteQuadrature extends Quadrature {
  ws: Float64Array;
}

/**
 * Counts the eigenvalues below `lam` of the Jacobi matrix of the Hermite weight (zero diagonal,
 * off-diagonal b_k = sqrt(k / 2)) by the Sturm sequence of its LDL^T factorisation (common practice).
 */
function sturmCount(n: number, lam: number): number {
  let count = 0;
  let q = -lam;
  if (q < 0) count++;
  for (let k = 1; k < n; k++) {
    const qq = q === 0 ? 1e-300 : q;
    q = -lam - k / 2 / qq;
    if (q < 0) count++;
  }
  return count;
}

/**
 * Ratio form of the orthonormal Hermite recurrence at x: returns p_n / p_{n-1} and
 * log|p_{n-1}| (the polynomials p_k = H_k / sqrt(2^k k! sqrt(pi)), orthonormal for e^{-x^2}).
 */
function hermiteRatio(n: number, x: number): { ratio: number; logPrev: number; signPrev: number } {
  // p_0 = pi^{-1/4}; p_{k+1} = sqrt(2/(k+1)) x p_k - sqrt(k/(k+1)) p_{k-1}.
  let pm = 0;
  let p = Math.pow(Math.PI, -0.25);
  let logScale = 0;
  for (let k = 0; k < n - 1; k++) {
    const pn = Math.sqrt(2 / (k + 1)) * x * p - Math.sqrt(k / (k + 1)) * pm;
    pm = p;
    p = pn;
    const a = Math.abs(p);
    if (a > 1e150 || (a < 1e-150 && a > 0)) {
      const s = Math.log(a);
      logScale += s;
      const f = Math.exp(-s);
      p *= f;
      pm *= f;
    }
  }
  // Now p = p_{n-1} (scaled), pm = p_{n-2}.
  const pn = Math.sqrt(2 / n) * x * p - Math.sqrt((n - 1) / n) * pm;
  return { ratio: pn / p, logPrev: Math.log(Math.abs(p)) + logScale, signPrev: Math.sign(p) };
}

/**
 * The n-point Gauss–Hermite rule for the weight e^{-x^2} on the whole line: nodes are the zeros of
 * H_n, weights w_i = 1 / (n p_{n-1}(x_i)^2) with p_k the orthonormal Hermite polynomials
 * (Golub & Welsch, Math. Comp. 23, 221 (1969) (from memory)). Every node is bracketed by bisection
 * on the Sturm count of the Jacobi matrix (so none is lost or found twice), then polished by Newton
 * steps x -= p_n / (sqrt(2n) p_{n-1}). Exact for p(x) e^{-x^2} with deg p <= 2n - 1.
 * `ws` are the weights times e^{x_i^2}, for integrating functions that carry their own Gaussian;
 * computed in log space so they stay finite even where `w` underflows. Nodes ascend.
 */
export function gaussHermite(n: number): HermiteQuadrature {
  n = Math.floor(n);
  if (!(n >= 1)) return { x: new Float64Array(0), w: new Float64Array(0), ws: new Float64Array(0) };
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  const ws = new Float64Array(n);
  // Gershgorin bound on the spectrum of the Jacobi matrix.
  const bound = 2 * Math.sqrt(n / 2) + 1;
  const half = Math.floor(n / 2);
  // Upper end of the bracket: the node found just before (nodes are found from the largest down).
  let upper = bound;
  for (let i = 0; i < n - half; i++) {
    // The node with index n - 1 - i (ascending) has exactly n - 1 - i eigenvalues below it.
    const idx = n - 1 - i;
    let lo = 0;
    let hi = upper;
    if (n % 2 === 1 && idx === half) {
      lo = hi = 0;
    } else {
      // Bisection far enough for Newton's method to converge quadratically from the midpoint.
      for (let it = 0; it < 200 && hi - lo > 1e-9 * Math.max(1, hi); it++) {
        const mid = 0.5 * (lo + hi);
        if (sturmCount(n, mid) > idx) hi = mid;
        else lo = mid;
      }
    }
    let t = 0.5 * (lo + hi);
    for (let it = 0; it < 6 && t !== 0; it++) {
      const r = hermiteRatio(n, t);
      const dt = r.ratio / Math.sqrt(2 * n);
      // A step leaving the bracket means rounding noise: keep the bisection's value.
      if (!Number.isFinite(dt) || t - dt < lo - 1e-12 || t - dt > hi + 1e-12) break;
      t -= dt;
      if (Math.abs(dt) <= 1e-16 * Math.abs(t)) break;
    }
    upper = t;
    const { logPrev } = hermiteRatio(n, t);
    const logW = -Math.log(n) - 2 * logPrev;
    x[idx] = t;
    x[n - 1 - idx] = -t;
    w[idx] = w[n - 1 - idx] = Math.exp(logW);
    ws[idx] = ws[n - 1 - idx] = Math.exp(logW + t * t);
  }
  return { x, w, ws };
}
