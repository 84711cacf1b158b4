/**
 * The fast path for box coefficients: a discrete sine transform of equally spaced samples.
 */
import { fftInPlace } from './fft';
import { SizeTables } from './sizeTables';

/** sin(pi j / N) for j <= N/2, kept for the recent N. */
const sineTables = new SizeTables((N: number) => {
  const s = new Float64Array((N >> 1) + 1);
  for (let j = 0; j < s.length; j++) s[j] = Math.sin((Math.PI * j) / N);
  return s;
});
function halfSines(N: number): Float64Array {
  return sineTables.get(N);
}

/**
 * The transform's work arrays of the recent sizes, filled anew by every call (each entry is written
 * before the FFT reads it): a fresh pair a call made large transforms mostly allocation and collection.
 * The engine runs one call at a time on a thread (a worker has its own module), and nothing is called
 * back while the arrays are in use.
 */
const workArrays = new SizeTables((N: number) => ({ zr: new Float64Array(N), zi: new Float64Array(N) }), 2);

/** Coefficients c_n = <phi_n|psi> of a box state, n = 1 ... count. */
export interface BoxCoefficients {
  re: Float64Array;
  im: Float64Array;
  /** False when the input was unusable (N not a power of two, lengths differ, b <= a); arrays are then empty. */
  ok: boolean;
}

/**
 * Box coefficients c_n = integral_a^b sqrt(2/L) sin(n pi (x - a)/L) psi(x) dx, n = 1 ... count, from
 * the N + 1 samples psi(a + j L/N), j = 0 ... N (ends included, N a power of two), by the trapezoid
 * rule, which is the type-I discrete sine transform
 * c_n ~ sqrt(2/L) (L/N) sum_{j=1}^{N-1} sin(pi j n / N) psi_j
 * (the end samples drop out because the sine vanishes there). It is evaluated with one complex FFT of
 * length N: each real sequence is folded into a length-N sequence whose cosine and sine sums give the
 * odd and even sine coefficients (Press et al., Numerical Recipes, sine transform section (from
 * memory)), and the real and imaginary parts share the transform as its real and imaginary inputs.
 * The odd coefficients come from a running sum, so their rounding grows like sqrt(n) eps.
 *
 * Accuracy, honestly: the trapezoid rule on the odd periodic extension is spectrally accurate only if
 * that extension is smooth, i.e. psi vanishes at both walls together with its even derivatives
 * psi'', psi'''', ... . If psi''^(2k) is the first even derivative not vanishing at a wall, c_n
 * carries an aliasing error of order N^{-(2k+3)} (for psi(x) = x(L-x), about (2N)^-3 relative).
 * A state that does not vanish at a wall, or jumps or kinks inside, converges only like 1/N..1/N^2,
 * and the transform then reproduces the sampled (not the true) state. Counts above N - 1 are
 * clamped: higher n alias onto lower ones. Parseval holds exactly: the sum over n <= N-1 of |c_n|^2
 * equals the trapezoid norm (L/N) sum |psi_j|^2.
 */
export function boxCoefficientsFromSamples(
  samplesRe: Float64Array,
  samplesIm: Float64Array | null,
  a: number,
  b: number,
  count: number,
): BoxCoefficients {
  const np1 = samplesRe.length;
  const N = np1 - 1;
  const bad = { re: new Float64Array(0), im: new Float64Array(0), ok: false };
  if (N < 2 || (N & (N - 1)) !== 0) return bad;
  if (samplesIm && samplesIm.length !== np1) return bad;
  if (!(Number.isFinite(a) && Number.isFinite(b) && b > a)) return bad;
  const m = Math.max(0, Math.min(Math.floor(count), N - 1));
  const L = b - a;
  // Pre-processing of the sine transform into a length-N DFT: y_j = sin(pi j/N) u_j + v_j / 2 with
  // u_j = x_j + x_{N-j}, v_j = x_j - x_{N-j}. Then sum_j y_j sin(2 pi j k/N) = S_{2k} and
  // sum_j y_j cos(2 pi j k/N) = S_{2k+1} - S_{2k-1} (Press et al., Numerical Recipes, sine transform
  // section (from memory); rederived here). Both real sequences share one complex FFT (z = y^re + i y^im).
  const { zr, zi } = workArrays.get(N);
  zr[0] = 0;
  zi[0] = 0;
  if (!samplesIm) zi.fill(0);
  const sines = halfSines(N);
  for (let j = 1; j < N; j++) {
    const s = sines[j < N - j ? j : N - j];
    const r1 = samplesRe[j];
    const r2 = samplesRe[N - j];
    zr[j] = s * (r1 + r2) + 0.5 * (r1 - r2);
    if (samplesIm) {
      const i1 = samplesIm[j];
      const i2 = samplesIm[N - j];
      zi[j] = s * (i1 + i2) + 0.5 * (i1 - i2);
    }
  }
  fftInPlace(zr, zi);
  const scale = Math.sqrt(2 / L) * (L / N);
  const re = new Float64Array(m);
  const im = new Float64Array(m);
  // Unpack: Y^re_k = (Z_k + conj Z_{N-k})/2, Y^im_k = (Z_k - conj Z_{N-k})/(2i); with Y = C - i D,
  // S_{2k} = D_k and S_{2k+1} = S_{2k-1} + C_k, S_{-1} = -S_1.
  let oddRe = 0;
  let oddIm = 0;
  for (let k = 0; 2 * k - 1 <= m; k++) {
    const nk = k === 0 ? 0 : N - k;
    const ar = zr[k];
    const ai = zi[k];
    const br = zr[nk];
    const bi = zi[nk];
    // Y^re = C^re - i D^re and Y^im = C^im - i D^im.
    const cRe = 0.5 * (ar + br);
    const dRe = -0.5 * (ai - bi);
    const cIm = 0.5 * (ai + bi);
    const dIm = 0.5 * (ar - br);
    if (k > 0 && 2 * k <= m) {
      re[2 * k - 1] = dRe * scale;
      im[2 * k - 1] = dIm * scale;
    }
    if (k === 0) {
      oddRe = 0.5 * cRe;
      oddIm = 0.5 * cIm;
    } else {
      oddRe += cRe;
      oddIm += cIm;
    }
    if (2 * k + 1 <= m) {
      re[2 * k] = oddRe * scale;
      im[2 * k] = samplesIm ? oddIm * scale : 0;
    }
  }
  if (!samplesIm) im.fill(0);
  return { re, im, ok: true };
}
