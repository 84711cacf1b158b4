/**
 * The not-a-knot cubic spline through samples (x_i, y_i): the interpolant of sampled states.
 *
 * On each interval [x_i, x_{i+1}] of length h_i the spline is the cubic
 *   S(x) = M_i (x_{i+1} - x)^3 / (6 h_i) + M_{i+1} (x - x_i)^3 / (6 h_i)
 *        + (y_i / h_i - M_i h_i / 6) (x_{i+1} - x) + (y_{i+1} / h_i - M_{i+1} h_i / 6) (x - x_i),
 * with second derivatives M_i from continuity of S' at the inner knots,
 *   h_{i-1} M_{i-1} + 2 (h_{i-1} + h_i) M_i + h_i M_{i+1} = 6 ((y_{i+1} - y_i) / h_i - (y_i - y_{i-1}) / h_{i-1}),
 * and the not-a-knot ends: S''' is continuous at x_1 and at x_{n-2} (common practice; de Boor,
 * "A Practical Guide to Splines", ch. IV, from memory). The two end conditions are eliminated into the
 * first and last inner rows, leaving a tridiagonal system solved by the Thomas algorithm.
 * The spline reproduces every cubic exactly; for a smooth function its error is O(h^4) in the values,
 * O(h^3) in the slope and O(h^2) in the second derivative (same source). It is C2, so it adds no kink
 * or jump of its own, and it does not need end slopes that samples do not carry.
 */

/** A spline of n >= 4 samples: the knots, the values and the second derivatives at the knots. */
export interface Spline {
  x: Float64Array;
  y: Float64Array;
  m: Float64Array;
}

/** The not-a-knot spline through (x, y); `x` strictly increasing, at least 4 points (the caller checks both). */
export function notAKnotSpline(x: Float64Array, y: Float64Array): Spline {
  const n = x.length;
  const h = new Float64Array(n - 1);
  for (let i = 0; i + 1 < n; i++) h[i] = x[i + 1]! - x[i]!;
  // Unknowns M_1 .. M_{n-2}: row r (0-based) is knot i = r + 1.
  const k = n - 2;
  const sub = new Float64Array(k);
  const diag = new Float64Array(k);
  const sup = new Float64Array(k);
  const rhs = new Float64Array(k);
  for (let r = 0; r < k; r++) {
    const i = r + 1;
    sub[r] = h[i - 1]!;
    diag[r] = 2 * (h[i - 1]! + h[i]!);
    sup[r] = h[i]!;
    rhs[r] = 6 * ((y[i + 1]! - y[i]!) / h[i]! - (y[i]! - y[i - 1]!) / h[i - 1]!);
  }
  // Left end: M_0 = ((h0 + h1) M_1 - h0 M_2) / h1, folded into row 0.
  const h0 = h[0]!;
  const h1 = h[1]!;
  diag[0] = diag[0]! + (h0 * (h0 + h1)) / h1;
  sup[0] = sup[0]! - (h0 * h0) / h1;
  // Right end: M_{n-1} = ((a + b) M_{n-2} - b M_{n-3}) / a with a = h_{n-3}, b = h_{n-2}, folded into the last row.
  const a = h[n - 3]!;
  const b = h[n - 2]!;
  diag[k - 1] = diag[k - 1]! + (b * (a + b)) / a;
  sub[k - 1] = sub[k - 1]! - (b * b) / a;
  const inner = thomas(sub, diag, sup, rhs);
  const m = new Float64Array(n);
  m.set(inner, 1);
  m[0] = ((h0 + h1) * m[1]! - h0 * m[2]!) / h1;
  m[n - 1] = ((a + b) * m[n - 2]! - b * m[n - 3]!) / a;
  return { x, y, m };
}

/** Solves the tridiagonal system (sub[0] and sup[k-1] unused) by forward elimination and back substitution. */
function thomas(sub: Float64Array, diag: Float64Array, sup: Float64Array, rhs: Float64Array): Float64Array {
  const k = diag.length;
  const c = new Float64Array(k);
  const d = new Float64Array(k);
  c[0] = sup[0]! / diag[0]!;
  d[0] = rhs[0]! / diag[0]!;
  for (let r = 1; r < k; r++) {
    const den = diag[r]! - sub[r]! * c[r - 1]!;
    c[r] = sup[r]! / den;
    d[r] = (rhs[r]! - sub[r]! * d[r - 1]!) / den;
  }
  const out = new Float64Array(k);
  out[k - 1] = d[k - 1]!;
  for (let r = k - 2; r >= 0; r--) out[r] = d[r]! - c[r]! * out[r + 1]!;
  return out;
}

/** Index i of the interval [x_i, x_{i+1}] holding t (t inside [x_0, x_{n-1}]), starting the search at `hint`. */
function intervalOf(x: Float64Array, t: number, hint: number): number {
  const last = x.length - 2;
  let i = Math.min(Math.max(hint, 0), last);
  // Grids are visited mostly in order: try the hint and its neighbour before bisecting.
  if (t >= x[i]! && t <= x[i + 1]!) return i;
  if (i < last && t >= x[i + 1]! && t <= x[i + 2]!) return i + 1;
  let lo = 0;
  let hi = last;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (x[mid]! <= t) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Values of the spline at `ts` into `out`, with first and second derivatives into `d1` and `d2` when
 * given; zero (and zero derivatives) outside [x_0, x_{n-1}], where the sampled state is taken to vanish.
 */
export function evaluateSpline(s: Spline, ts: Float64Array, out: Float64Array, d1?: Float64Array, d2?: Float64Array): void {
  const { x, y, m } = s;
  const x0 = x[0]!;
  const xn = x[x.length - 1]!;
  let hint = 0;
  for (let j = 0; j < ts.length; j++) {
    const t = ts[j]!;
    if (!(t >= x0 && t <= xn)) {
      out[j] = 0;
      if (d1) d1[j] = 0;
      if (d2) d2[j] = 0;
      continue;
    }
    const i = intervalOf(x, t, hint);
    hint = i;
    const h = x[i + 1]! - x[i]!;
    const u = x[i + 1]! - t;
    const v = t - x[i]!;
    const mi = m[i]!;
    const mj = m[i + 1]!;
    const ai = y[i]! / h - (mi * h) / 6;
    const aj = y[i + 1]! / h - (mj * h) / 6;
    out[j] = (mi * u * u * u + mj * v * v * v) / (6 * h) + ai * u + aj * v;
    if (d1) d1[j] = (-mi * u * u + mj * v * v) / (2 * h) - ai + aj;
    if (d2) d2[j] = (mi * u + mj * v) / h;
  }
}
