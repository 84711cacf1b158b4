/**
 * Gaussian quadrature rules: Gauss–Legendre on [-1, 1], composite Gauss–Legendre on [a, b] split at
 * breakpoints, and Gauss–Hermite for the weight e^{-x^2}.
 */
import type { Quadrature } from './types';

/** A Gauss–Hermite rule; `ws[i] = w[i] * exp(x[i]^2)` integrates plain functions (no weight). */
export interface HermiteQuadrature extends Quadrature {
  ws: Float64Array;
}

/**
 * Evaluates the Legendre polynomial P_n and its derivative at t by the three-term recurrence
 * (k + 1) P_{k+1} = (2k + 1) t P_k - k P_{k-1} (Abramowitz & Stegun 22.7.10 (from memory)).
 */
function legendre(n: number, t: number): { p: number; dp: number } {
  let p0 = 1;
  let p1 = t;
  if (n === 0) return { p: 1, dp: 0 };
  for (let k = 1; k < n; k++) {
    const p2 = ((2 * k + 1) * t * p1 - k * p0) / (k + 1);
    p0 = p1;
    p1 = p2;
  }
  // P_n' = n (t P_n - P_{n-1}) / (t^2 - 1), valid away from t = +-1 (nodes never reach the ends).
  const dp = (n * (t * p1 - p0)) / (t * t - 1);
  return { p: p1, dp };
}

/**
 * The n-point Gauss–Legendre rule on [-1, 1]: nodes are the zeros of P_n, weights
 * w_i = 2 / ((1 - x_i^2) P_n'(x_i)^2) (Abramowitz & Stegun 25.4.29 (from memory)).
 * Exact for polynomials of degree <= 2n - 1. Nodes by Newton's method from the asymptotic guess
 * cos(pi (i + 3/4) / (n + 1/2)), iterated to machine precision. Nodes ascend.
 * Returns an empty rule for n < 1 (never throws).
 */
export function gaussLegendre(n: number): Quadrature {
  n = Math.floor(n);
  if (!(n >= 1)) return { x: new Float64Array(0), w: new Float64Array(0) };
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  const half = Math.floor((n + 1) / 2);
  for (let i = 0; i < half; i++) {
    let t = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 1;
    for (let it = 0; it < 100; it++) {
      const r = legendre(n, t);
      dp = r.dp;
      const dt = r.p / r.dp;
      t -= dt;
      if (Math.abs(dt) <= 1e-16 * Math.max(1, Math.abs(t))) break;
    }
    dp = legendre(n, t).dp;
    const wi = 2 / ((1 - t * t) * dp * dp);
    // Descending t from the guess; store ascending and mirrored so the rule is exactly symmetric.
    x[n - 1 - i] = t;
    x[i] = -t;
    w[n - 1 - i] = wi;
    w[i] = wi;
  }
  if (n % 2 === 1) x[(n - 1) / 2] = 0;
  return { x, w };
}

/** Options of {@link compositeGaussLegendre}. */
export interface CompositeOptions {
  /** Points where the integrand may be non-smooth; each one inside (a, b) becomes a panel edge. Default none. */
  breakpoints?: number[];
  /** Number of equal panels over [a, b] before splitting at breakpoints (default 16). */
  panels?: number;
  /** Gauss–Legendre order on each panel (default 20). */
  order?: number;
}

/**
 * Composite Gauss–Legendre on [a, b]: the interval is cut at every breakpoint strictly inside (a, b),
 * and each piece into ceil(panels * length / (b - a)) equal panels carrying an `order`-point rule
 * mapped by x = m + h t (m the panel centre, h its half-width). An integrand smooth on every piece
 * is thus integrated to the accuracy of the rule however it jumps or kinks at the breakpoints
 * (common practice). Returns an empty rule when the interval is empty or not finite.
 */
export function compositeGaussLegendre(a: number, b: number, options: CompositeOptions = {}): Quadrature {
  const panels = Math.max(1, Math.floor(options.panels ?? 16));
  const order = Math.max(1, Math.floor(options.order ?? 20));
  if (!(Number.isFinite(a) && Number.isFinite(b) && b > a)) return { x: new Float64Array(0), w: new Float64Array(0) };
  const cuts = [a];
  const inner = (options.breakpoints ?? []).filter((p) => Number.isFinite(p) && p > a && p < b).sort((p, q) => p - q);
  for (const p of inner) if (p > cuts[cuts.length - 1]) cuts.push(p);
  cuts.push(b);
  const base = gaussLegendre(order);
  const pieces: Array<[number, number]> = [];
  for (let s = 0; s + 1 < cuts.length; s++) {
    const lo = cuts[s];
    const hi = cuts[s + 1];
    // The fraction first: panels * (hi - lo) overflows for intervals near the largest double.
    const m = Math.max(1, Math.ceil(panels * ((hi - lo) / (b - a)) - 1e-12));
    for (let k = 0; k < m; k++) {
      const p0 = lo + (hi - lo) * (k / m);
      const p1 = k === m - 1 ? hi : lo + (hi - lo) * ((k + 1) / m);
      pieces.push([p0, p1]);
    }
  }
  const x = new Float64Array(pieces.length * order);
  const w = new Float64Array(pieces.length * order);
  let j = 0;
  for (const [p0, p1] of pieces) {
    const mid = 0.5 * (p0 + p1);
    const h = 0.5 * (p1 - p0);
    for (let i = 0; i < order; i++, j++) {
      x[j] = mid + h * base.x[i];
      w[j] = h * base.w[i];
    }
  }
  return { x, w };
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
