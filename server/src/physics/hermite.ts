/**
 * Hermite polynomials and normalised Hermite functions, evaluated without overflow or underflow.
 */

/** Cody–Waite split of ln 2: the high part has few bits, so q * LN2_HI is exact for |q| < 2^20. */
const LN2_HI = 0.693145751953125;
const LN2_LO = 1.4286068203094173e-6;
export const PI_M14 = Math.pow(Math.PI, -0.25);
export const TWO64 = 18446744073709551616;
const TWOM64 = 1 / TWO64;

/** m * 2^e without intermediate overflow or premature underflow (exact unless the result is subnormal). */
function ldexp(m: number, e: number): number {
  // Past +-2200 every double saturates; without this an exponent like -1e300 (from xi = 1e150) loops forever.
  if (e > 2200) return m === 0 ? 0 : m * Infinity;
  if (e < -2200 || Number.isNaN(e)) return Number.isNaN(e) ? NaN : m * 0;
  while (e > 1000) {
    m *= Math.pow(2, 1000);
    e -= 1000;
  }
  while (e < -1000) {
    m *= Math.pow(2, -1000);
    e += 1000;
    if (m === 0) return 0;
  }
  return m * Math.pow(2, e);
}

/**
 * Splits e^{-xi^2/2} as base * 2^q with base in about [0.7, 1.5], q an integer, with xi^2 formed
 * exactly (Dekker's two-product) so the Gaussian keeps full relative precision even at |xi| = 50.
 */
export function gaussianSplit(xi: number): { base: number; q: number } {
  const sq = xi * xi;
  // Veltkamp split of xi for the exact error of xi * xi.
  const t = 134217729 * xi;
  const hi = t - (t - xi);
  const lo = xi - hi;
  const err = hi * hi - sq + 2 * hi * lo + lo * lo;
  const h = -0.5 * sq;
  const hl = -0.5 * err;
  const q = Math.round(h / Math.LN2);
  const r = h - q * LN2_HI - q * LN2_LO + hl;
  return { base: Math.exp(r), q };
}

/**
 * Fills out[k * xs.length + j] with the normalised Hermite function
 * psi_k(xi) = H_k(xi) e^{-xi^2/2} / sqrt(2^k k! sqrt(pi)), k < levels, at every xi = xs[j], by the
 * three-term recurrence psi_{k+1} = sqrt(2/(k+1)) xi psi_k - sqrt(k/(k+1)) psi_{k-1}, psi_0 =
 * pi^{-1/4} e^{-xi^2/2} (Abramowitz & Stegun 22.7.13 normalised (from memory); stable upward in k).
 * The Gaussian is applied as an exact power of two times a factor near 1, and the recurrence carries
 * a binary exponent (rescaled by 2^64 whenever the mantissa grows past it), so k up to several
 * thousand and |xi| up to 50 and beyond neither overflow nor underflow except where the true value
 * is below the smallest double. With d1: psi_k' = sqrt(2k) psi_{k-1} - xi psi_k (ladder relation);
 * with d2: psi_k'' = (xi^2 - 2k - 1) psi_k (the oscillator equation).
 * With `from`, only the rows from <= k < levels are written, at out[(k - from) * xs.length + j]: the
 * recurrence still runs from k = 0, but one high level needs one row of memory.
 */
export function hermiteFunctionTable(
  xs: Float64Array,
  levels: number,
  out: Float64Array,
  d1?: Float64Array,
  d2?: Float64Array,
  from = 0,
): void {
  const nx = xs.length;
  for (let j = 0; j < nx; j++) {
    const xi = xs[j];
    const g = gaussianSplit(xi);
    let e = g.q;
    let scale = e >= -1022 && e <= 1023 ? Math.pow(2, e) : NaN;
    let mPrev = 0;
    let m = PI_M14 * g.base;
    for (let k = 0; k < levels; k++) {
      if (k > 0) {
        const next = Math.sqrt(2 / k) * xi * m - Math.sqrt((k - 1) / k) * mPrev;
        mPrev = m;
        m = next;
        if (Math.abs(m) > TWO64) {
          m *= TWOM64;
          mPrev *= TWOM64;
          e += 64;
          scale = e >= -1022 && e <= 1023 ? Math.pow(2, e) : NaN;
        }
      }
      if (k < from) continue;
      const v = Number.isNaN(scale) ? ldexp(m, e) : m * scale;
      const idx = (k - from) * nx + j;
      out[idx] = v;
      if (d1) {
        const vp = Number.isNaN(scale) ? ldexp(mPrev, e) : mPrev * scale;
        d1[idx] = Math.sqrt(2 * k) * vp - xi * v;
      }
      if (d2) d2[idx] = (xi * xi - 2 * k - 1) * v;
    }
  }
}

/** The normalised Hermite function psi_n(xi) (see {@link hermiteFunctionTable}); NaN for bad n. */
export function hermiteFunction(n: number, xi: number): number {
  if (!(Number.isInteger(n) && n >= 0)) return NaN;
  const out = new Float64Array(n + 1);
  hermiteFunctionTable(Float64Array.of(xi), n + 1, out);
  return out[n];
}

/** 2^e for e = -1100 ... 1100 (0 and subnormals at the low end), index e + 1100. */
let pow2: Float64Array | null = null;
/** w 2^e: exact while in range, 0 or subnormal below (a weight that small adds nothing the sums keep). */
export function scaled(w: number, e: number): number {
  if (e < -1100 || e > 1100) return ldexp(w, e);
  if (!pow2) {
    pow2 = new Float64Array(2201);
    for (let k = 0; k < pow2.length; k++) pow2[k] = ldexp(1, k - 1100);
  }
  return w * pow2[e + 1100]!;
}

/** sqrt(2/k) and sqrt((k-1)/k) of the recurrence for k < length, cached for the largest length asked. */
let recurrence: { a: Float64Array; b: Float64Array } | null = null;
export function recurrenceFactors(levels: number): { a: Float64Array; b: Float64Array } {
  if (recurrence && recurrence.a.length >= levels) return recurrence;
  const a = new Float64Array(levels);
  const b = new Float64Array(levels);
  for (let k = 1; k < levels; k++) {
    a[k] = Math.sqrt(2 / k);
    b[k] = Math.sqrt((k - 1) / k);
  }
  recurrence = { a, b };
  return recurrence;
}

/**
 * outRe[k] += sum_j psi_k(xi_j) wRe[j] (and the same for wIm, which may be null), k < levels: the
 * recurrence of {@link hermiteFunctionTable} run node by node and accumulated straight into the sums, so
 * no table is written. The binary exponent the recurrence carries is folded into the weights (w 2^e,
 * recomputed at each rescaling), so each level costs one recurrence step and two multiply-adds. A node
 * whose weights are both zero is skipped. `onNode(levels)` is called once per node that is summed (the
 * caller's budget charge).
 */
export function hermiteWeightedSums(
  xi: Float64Array,
  wRe: Float64Array,
  wIm: Float64Array | null,
  levels: number,
  outRe: Float64Array,
  outIm: Float64Array,
  onNode?: (levels: number) => void,
): void {
  if (levels < 1) return;
  const { a, b } = recurrenceFactors(levels);
  for (let j = 0; j < xi.length; j++) {
    const wr0 = wRe[j]!;
    const wi0 = wIm ? wIm[j]! : 0;
    if (wr0 === 0 && wi0 === 0) continue;
    onNode?.(levels);
    const x = xi[j]!;
    const g = gaussianSplit(x);
    let e = g.q;
    let wr = scaled(wr0, e);
    let wi = scaled(wi0, e);
    let mPrev = 0;
    let m = PI_M14 * g.base;
    outRe[0]! += m * wr;
    outIm[0]! += m * wi;
    for (let k = 1; k < levels; k++) {
      const next = a[k]! * x * m - b[k]! * mPrev;
      mPrev = m;
      m = next;
      if (Math.abs(m) > TWO64) {
        m *= TWOM64;
        mPrev *= TWOM64;
        e += 64;
        wr = scaled(wr0, e);
        wi = scaled(wi0, e);
      }
      outRe[k]! += m * wr;
      outIm[k]! += m * wi;
    }
  }
}
