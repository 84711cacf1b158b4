/**
 * The few numerical steps the panel does itself: reading the sampled state and building partial sums of the eigen-expansion. Pure; typed arrays.
 */
import type { PanelResult } from '../src/messages';

type Samples = NonNullable<PanelResult['samples']>;

/** Trapezoid rule on a (possibly uneven) grid: sum (x_{j+1}-x_j)(f_j+f_{j+1})/2 (common practice). */
export function trapezoid(x: ArrayLike<number | null>, f: ArrayLike<number>): number {
  let s = 0;
  for (let j = 0; j + 1 < x.length; j++) {
    const h = (x[j + 1] ?? 0) - (x[j] ?? 0);
    s += (h * (f[j]! + f[j + 1]!)) / 2;
  }
  return s;
}

/**
 * The sampled state as typed arrays with |psi|^2. The engine sends the normalised state (its samples
 * are scaled by 1/sqrt(norm) of the exact integral), so nothing is rescaled here.
 */
export function sampledState(samples: Samples): { re: Float64Array; im: Float64Array; density: Float64Array } {
  const n = samples.x.length;
  const re = Float64Array.from(samples.re, (v) => v ?? 0);
  const im = Float64Array.from(samples.im, (v) => v ?? 0);
  const density = new Float64Array(n);
  for (let j = 0; j < n; j++) density[j] = re[j]! * re[j]! + im[j]! * im[j]!;
  // A mixed state sends its density <x|rho|x> (and no wave function: re and im are 0).
  if (samples.density) for (let j = 0; j < n; j++) density[j] = samples.density[j] ?? 0;
  return { re, im, density };
}

/**
 * The partial sum psi_K(x) = sum_{k<K} c_k phi_k(x) over the first K levels that have sampled
 * eigenfunctions (phi real, c_k = re + i im). K is clamped to what is available.
 */
export function partialSum(samples: Samples, levels: PanelResult['levels'], K: number): { re: Float64Array; im: Float64Array; terms: number } {
  const n = samples.x.length;
  const terms = Math.max(0, Math.min(Math.floor(K), samples.phi.length, levels.length));
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let k = 0; k < terms; k++) {
    const phi = samples.phi[k]!;
    const cr = levels[k]!.re ?? 0;
    const ci = levels[k]!.im ?? 0;
    for (let j = 0; j < n; j++) {
      const p = phi[j] ?? 0;
      re[j] = re[j]! + cr * p;
      im[j] = im[j]! + ci * p;
    }
  }
  return { re, im, terms };
}

/** L2 distance between two sampled complex functions, sqrt(integral |f - g|^2 dx). */
export function l2Distance(x: ArrayLike<number | null>, fr: ArrayLike<number>, fi: ArrayLike<number>, gr: ArrayLike<number>, gi: ArrayLike<number>): number {
  const d = new Float64Array(x.length);
  for (let j = 0; j < x.length; j++) {
    const a = fr[j]! - gr[j]!;
    const b = fi[j]! - gi[j]!;
    d[j] = a * a + b * b;
  }
  return Math.sqrt(Math.max(0, trapezoid(x, d)));
}
