/**
 * The fast path for box coefficients: a discrete sine transform of equally spaced samples.
 */
import { fftInPlace } from './fft';

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
 * length 2N of the odd extension, real and imaginary parts packed together: for odd real sequences
 * the transform is -2i times the sine sum (common practice; Press et al., Numerical Recipes, sine
 * transform section (from memory)).
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
  const M = 2 * N;
  const zr = new Float64Array(M);
  const zi = new Float64Array(M);
  for (let j = 1; j < N; j++) {
    const r = samplesRe[j];
    const i = samplesIm ? samplesIm[j] : 0;
    zr[j] = r;
    zi[j] = i;
    zr[M - j] = -r;
    zi[M - j] = -i;
  }
  fftInPlace(zr, zi);
  // Z_n = -2i S^re_n + 2 S^im_n, so S^re = -Im Z / 2 and S^im = Re Z / 2.
  const scale = Math.sqrt(2 / L) * (L / N) * 0.5;
  const re = new Float64Array(m);
  const im = new Float64Array(m);
  for (let n = 1; n <= m; n++) {
    re[n - 1] = -zi[n] * scale;
    im[n - 1] = zr[n] * scale;
  }
  return { re, im, ok: true };
}
