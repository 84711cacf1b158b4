/**
 * The few numerical steps the panel does itself: normalising the sampled state for display and
 * building partial sums of the eigen-expansion. Pure; typed arrays.
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

/** The sampled state scaled to unit integral of |psi|^2 (as the coefficients are), with |psi|^2. */
export function normalisedState(samples: Samples): { re: Float64Array; im: Float64Array; density: Float64Array; scale: number } {
  const n = samples.x.length;
  const re = Float64Array.from(samples.re, (v) => v ?? 0);
  const im = Float64Array.from(samples.im, (v) => v ?? 0);
  const dens = new Float64Array(n);
  for (let j = 0; j < n; j++) dens[j] = re[j]! * re[j]! + im[j]! * im[j]!;
  const norm = trapezoid(samples.x, dens);
  const scale = norm > 0 && Number.isFinite(norm) ? 1 / Math.sqrt(norm) : 1;
  for (let j = 0; j < n; j++) {
    re[j] = re[j]! * scale;
    im[j] = im[j]! * scale;
    dens[j] = dens[j]! * scale * scale;
  }
  return { re, im, density: dens, scale };
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

/** True when the sampled potential is mirror-symmetric about `center` (within 1e-6 of its range). */
export function isSymmetric(samples: Samples | null, center: number | null): boolean {
  if (!samples || center === null) return false;
  const { x, potential } = samples;
  const n = x.length;
  if (n < 3) return false;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of potential) if (v !== null && Number.isFinite(v)) ((lo = Math.min(lo, v)), (hi = Math.max(hi, v)));
  const tol = 1e-6 * Math.max(1e-300, hi - lo) + 1e-12;
  const tolX = 1e-6 * Math.abs((x[n - 1] ?? 0) - (x[0] ?? 0));
  for (let j = 0; j < n; j++) {
    const m = n - 1 - j;
    if (Math.abs((x[j] ?? 0) - center + ((x[m] ?? 0) - center)) > tolX) return false;
    if (Math.abs((potential[j] ?? 0) - (potential[m] ?? 0)) > tol) return false;
  }
  return true;
}
