/**
 * Complex scalar arithmetic, following the formulas of complex.js (the complex type mathjs uses) so that
 * results agree with mathjs to rounding. Every helper that returns a complex number writes its real part
 * to `o[k]` and its imaginary part to `o[k + 1]` of a buffer the caller passes, so evaluation allocates
 * nothing per point and no module-level scratch state exists. Inputs are read before the output is
 * written, so a helper may overwrite the slots its own arguments came from.
 */

type F64 = Float64Array;

/** log |a + ib| as complex.js computes it (halved log of the square below 3000, scaled above). */
function logHypot(a: number, b: number): number {
  const aa = Math.abs(a);
  const bb = Math.abs(b);
  if (a === 0) return Math.log(bb);
  if (b === 0) return Math.log(aa);
  if (aa < 3000 && bb < 3000) return Math.log(a * a + b * b) * 0.5;
  const ha = a * 0.5;
  const hb = b * 0.5;
  return 0.5 * Math.log(ha * ha + hb * hb) + Math.LN2;
}

/** |a + ib| as complex.js computes it (plain formula below 3000, scaled above). */
export function chypot(x: number, y: number): number {
  let a = Math.abs(x);
  let b = Math.abs(y);
  if (a < 3000 && b < 3000) return Math.sqrt(a * a + b * b);
  if (a < b) {
    a = b;
    b = x / y;
  } else b = y / x;
  return a * Math.sqrt(1 + b * b);
}

/** (a + ib)(c + id) into o[k], o[k + 1]. */
export function cmul(a: number, b: number, c: number, d: number, o: F64, k: number): void {
  o[k] = a * c - b * d;
  o[k + 1] = a * d + b * c;
}

/** (a + ib)/(c + id) into o[k], o[k + 1], scaled by the larger part of the divisor (Smith's rule). */
export function cdiv(a: number, b: number, c: number, d: number, o: F64, k: number): void {
  if (d === 0) {
    o[k] = a / c;
    o[k + 1] = b / c;
  } else if (Math.abs(c) < Math.abs(d)) {
    const x = c / d;
    const t = c * x + d;
    o[k] = (a * x + b) / t;
    o[k + 1] = (b * x - a) / t;
  } else {
    const x = d / c;
    const t = d * x + c;
    o[k] = (a + b * x) / t;
    o[k + 1] = (b - a * x) / t;
  }
}

/** e^(a + ib) into o[k], o[k + 1]. */
export function cexp(a: number, b: number, o: F64, k: number): void {
  const t = Math.exp(a);
  if (b === 0) {
    o[k] = t;
    o[k + 1] = 0;
  } else {
    o[k] = t * Math.cos(b);
    o[k + 1] = t * Math.sin(b);
  }
}

/** Principal log(a + ib) into o[k], o[k + 1]. */
export function clog(a: number, b: number, o: F64, k: number): void {
  if (b === 0 && a > 0) {
    o[k] = Math.log(a);
    o[k + 1] = 0;
  } else {
    o[k] = logHypot(a, b);
    o[k + 1] = Math.atan2(b, a);
  }
}

/** Principal sqrt(a + ib) into o[k], o[k + 1]. */
export function csqrt(a: number, b: number, o: F64, k: number): void {
  const r = chypot(a, b);
  let re: number;
  let im: number;
  if (a >= 0) {
    if (b === 0) {
      o[k] = Math.sqrt(a);
      o[k + 1] = 0;
      return;
    }
    re = 0.5 * Math.sqrt(2 * (r + a));
  } else re = Math.abs(b) / Math.sqrt(2 * (r - a));
  if (a <= 0) im = 0.5 * Math.sqrt(2 * (r - a));
  else im = Math.abs(b) / Math.sqrt(2 * (r + a));
  o[k] = re;
  o[k + 1] = b < 0 ? -im : im;
}

/** (a + ib)^p for a real p and a zero base or a real one: complex.js's special cases, or false. */
function realExponentCase(a: number, b: number, p: number, o: F64, k: number): boolean {
  if (b === 0 && (a >= 0 || Number.isInteger(p))) {
    // A real base with an integer exponent stays with real numbers, as in mathjs.
    o[k] = Math.pow(a, p);
    o[k + 1] = 0;
    return true;
  }
  if (a !== 0) return false;
  const t = Math.pow(b, p);
  const quarter = ((p % 4) + 4) % 4;
  if (quarter !== 0 && quarter !== 1 && quarter !== 2 && quarter !== 3) return false;
  o[k] = quarter === 0 ? t : quarter === 2 ? -t : 0;
  o[k + 1] = quarter === 1 ? t : quarter === 3 ? -t : 0;
  return true;
}

/** Principal power (a + ib)^(p + iq) into o[k], o[k + 1], with complex.js's special cases for real exponents. */
export function cpow(a: number, b: number, p: number, q: number, o: F64, k: number): void {
  if (p === 0 && q === 0) {
    o[k] = 1;
    o[k + 1] = 0;
    return;
  }
  if (q === 0 && realExponentCase(a, b, p, o, k)) return;
  if (a === 0 && b === 0 && p > 0 && q >= 0) {
    o[k] = 0;
    o[k + 1] = 0;
    return;
  }
  const arg = Math.atan2(b, a);
  const loh = logHypot(a, b);
  const m = Math.exp(p * loh - q * arg);
  const ph = q * loh + p * arg;
  o[k] = m * Math.cos(ph);
  o[k + 1] = m * Math.sin(ph);
}
