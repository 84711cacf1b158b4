/**
 * A radix-2 fast Fourier transform on split real/imaginary Float64Arrays.
 */
import { SizeTables } from './sizeTables';

/** Twiddle tables of the recent sizes; recomputing them is a large share of a transform's cost. */
const tables = new SizeTables((n: number) => {
  const half = n >> 1;
  const cosT = new Float64Array(half);
  const sinT = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    const ang = (-2 * Math.PI * k) / n;
    cosT[k] = Math.cos(ang);
    sinT[k] = Math.sin(ang);
  }
  return { cosT, sinT };
});

/** cos and sin of -2 pi k / n for k < n/2, each from the library (no recurrence drift). */
function twiddles(n: number): { cosT: Float64Array; sinT: Float64Array } {
  return tables.get(n);
}

/**
 * In-place forward discrete Fourier transform X_k = sum_j x_j exp(-2 pi i j k / N) of the complex
 * sequence (re, im), N a power of two, by the iterative Cooley–Tukey radix-2 algorithm with
 * bit-reversal permutation (Cooley & Tukey, Math. Comp. 19, 297 (1965)). Twiddle factors come from
 * Math.cos/Math.sin of each angle (not from a recurrence), so rounding grows like log2 N.
 * Returns false (and leaves the arrays untouched) when the lengths differ or are not a power of two.
 * Real input is transformed two at a time by packing one sequence into `im` (see dst.ts).
 */
export function fftInPlace(re: Float64Array, im: Float64Array): boolean {
  const n = re.length;
  if (im.length !== n || n === 0 || (n & (n - 1)) !== 0) return false;
  // Bit-reversal permutation.
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i];
      re[i] = re[j];
      re[j] = t;
      t = im[i];
      im[i] = im[j];
      im[j] = t;
    }
  }
  const { cosT, sinT } = twiddles(n);
  for (let size = 2; size <= n; size <<= 1) {
    const h = size >> 1;
    const step = n / size;
    for (let start = 0; start < n; start += size) {
      for (let k = 0, t = 0; k < h; k++, t += step) {
        const wr = cosT[t];
        const wi = sinT[t];
        const p = start + k;
        const q = p + h;
        const xr = re[q] * wr - im[q] * wi;
        const xi = re[q] * wi + im[q] * wr;
        re[q] = re[p] - xr;
        im[q] = im[p] - xi;
        re[p] += xr;
        im[p] += xi;
      }
    }
  }
  return true;
}
