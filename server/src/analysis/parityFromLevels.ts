/**
 * The parity of a state settled from its coefficients, when they decide it, instead of from the state at
 * the mirrored grid nodes (measure.ts): about the centre of a symmetric basis, level index 0, 2, ... is
 * even and 1, 3, ... odd, so the even part's weight is the sum of the even-index weights plus at most the
 * weight the levels computed leave out (the basis is complete). With the coefficients' stated errors that
 * brackets both parts; when the smaller part is certainly above `MIXED_FLOOR` (twice the largest share the
 * parity check calls "almost" symmetric, physics/parity.ts), the state is mixed and no finding follows, so
 * the mirror evaluation would change nothing a reader sees.
 */
import type { ParityMeasurements } from './measure';

/** Twice the largest minor share `nearlySymmetric` reports (1e-3): above it a state is plainly mixed. */
export const MIXED_FLOOR = 2e-3;

/**
 * 'mixed' with the minor share from the coefficients, or null when they do not decide it. `re`, `im` and
 * `error` are the coefficients as written and their stated errors, `norm` the integral of |psi|^2.
 */
export function parityFromLevels(re: Float64Array, im: Float64Array, error: Float64Array, norm: number, center: number): ParityMeasurements | null {
  if (!(norm > 0) || !Number.isFinite(norm)) return null;
  let even = 0;
  let odd = 0;
  // |w_k - w_k(exact)| <= 2 |c_k| e_k + e_k^2 for a weight w = |c|^2 (derived in this comment).
  let slack = 0;
  for (let k = 0; k < re.length; k++) {
    const w = re[k]! * re[k]! + im[k]! * im[k]!;
    if (k % 2 === 0) even += w;
    else odd += w;
    const e = error[k]!;
    if (!Number.isFinite(e)) return null;
    slack += 2 * Math.sqrt(w) * e + e * e;
  }
  // The weight the levels leave out may belong to either part; the grid's norm is good to about 1e-12.
  const left = Math.max(0, norm - even - odd) + slack + 1e-10 * norm;
  const lowEven = even - slack;
  const lowOdd = odd - slack;
  if (!(Math.min(lowEven, lowOdd) > MIXED_FLOOR * (norm + left))) return null;
  const total = even + odd;
  return { center, parity: 'mixed', minor: Math.min(even, odd) / total, major: odd <= even ? 'even' : 'odd' };
}
