/**
 * Gaussian quadrature rules: Gauss–Legendre on [-1, 1] and composite Gauss–Legendre on [a, b] split at
 * breakpoints.
 */
import type { Quadrature } from './types';

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
  /** Each piece's panel count (from `panels`) is multiplied by this whole number (default 1). */
  refine?: number;
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
  const refine = Math.max(1, Math.floor(options.refine ?? 1));
  if (!(Number.isFinite(a) && Number.isFinite(b) && b > a)) return { x: new Float64Array(0), w: new Float64Array(0) };
  const cuts = [a];
  const inner = (options.breakpoints ?? []).filter((p) => Number.isFinite(p) && p > a && p < b).sort((p, q) => p - q);
  // A cut within 64 eps of the last one is dropped: a piece a few ulps wide puts its nodes on a point
  // (a spike one ulp beside a graded breakpoint) that no node should reach.
  const apart = (p: number, q: number): boolean => p - q > 64 * Number.EPSILON * Math.max(Math.abs(p), Math.abs(q));
  for (const p of inner) if (apart(p, cuts[cuts.length - 1]) && apart(b, p)) cuts.push(p);
  cuts.push(b);
  const base = gaussLegendre(order);
  const pieces: Array<[number, number]> = [];
  for (let s = 0; s + 1 < cuts.length; s++) {
    const lo = cuts[s];
    const hi = cuts[s + 1];
    // The fraction first: panels * (hi - lo) overflows for intervals near the largest double.
    const base = Math.max(1, Math.ceil(panels * ((hi - lo) / (b - a)) - 1e-12));
    // Refined, a piece keeps panels wider than 2^16 eps |x|: narrower ones put nodes within a few ulps
    // of its ends, where a spike one ulp off a graded breakpoint sits.
    const finest = Math.max(1, Math.floor((hi - lo) / (65536 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi), Number.MIN_VALUE))));
    const m = Math.max(base, Math.min(refine * base, finest));
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
