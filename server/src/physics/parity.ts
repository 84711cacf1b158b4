/**
 * Parity of a state about a centre c, measured from samples at mirrored points: the one home of the
 * even/odd split and its thresholds. The analysis measures every state's parity with it
 * (analysis/measure.ts) and words the finding from `nearlySymmetric` (analysis/checks.ts).
 */

/** Samples of psi at nodes x_j and at their mirror images 2c - x_j, with quadrature weights w_j. */
export interface MirrorSamples {
  re: Float64Array;
  im: Float64Array | null;
  /** psi(2c - x_j). */
  mirrorRe: Float64Array;
  mirrorIm: Float64Array | null;
  /** Quadrature weights of the nodes x_j (a rule over a region symmetric about c). */
  w: Float64Array;
}

/** Options of {@link parityOf}. */
export interface ParityOptions {
  /** A part whose weight is at most this fraction of the total counts as absent (default 1e-10). */
  tolerance?: number;
}

/** The even and odd weights of a state and its classification. */
export interface ParityResult {
  /** Weight of the even part (psi(x) + psi(2c - x))/2. */
  even: number;
  /** Weight of the odd part (psi(x) - psi(2c - x))/2. */
  odd: number;
  /** even + odd: the norm over the symmetric region. */
  total: number;
  classification: 'even' | 'odd' | 'mixed';
  /** The smaller part's share of the total (0 for a zero state). */
  minor: number;
  /** The larger part ('even' when they are equal). */
  major: 'even' | 'odd';
}

/**
 * Splits psi into its even and odd parts about c, psi_e(x) = (psi(x) + psi(2c - x))/2 and
 * psi_o(x) = (psi(x) - psi(2c - x))/2, and returns their weights sum_j w_j |psi_e(x_j)|^2 and
 * sum_j w_j |psi_o(x_j)|^2. The cross term integrates to zero over a symmetric region, so
 * even + odd = (||psi||^2 + ||psi(2c - .)||^2)/2, the norm (common practice). The state is 'even'
 * (or 'odd') when the other part holds at most `tolerance` of the total, else 'mixed'. A zero state
 * is reported even with total 0. Lengths are taken as the shortest of the arrays.
 */
export function parityOf(s: MirrorSamples, options: ParityOptions = {}): ParityResult {
  const tol = options.tolerance ?? 1e-10;
  const n = Math.min(s.re.length, s.mirrorRe.length, s.w.length);
  let even = 0;
  let odd = 0;
  for (let j = 0; j < n; j++) {
    const ar = s.re[j];
    const ai = s.im ? s.im[j] : 0;
    const br = s.mirrorRe[j];
    const bi = s.mirrorIm ? s.mirrorIm[j] : 0;
    const er = 0.5 * (ar + br);
    const ei = 0.5 * (ai + bi);
    const or = 0.5 * (ar - br);
    const oi = 0.5 * (ai - bi);
    even += s.w[j] * (er * er + ei * ei);
    odd += s.w[j] * (or * or + oi * oi);
  }
  const total = even + odd;
  let classification: ParityResult['classification'] = 'mixed';
  if (!(total > 0) || odd <= tol * total) classification = 'even';
  else if (even <= tol * total) classification = 'odd';
  return { even, odd, total, classification, minor: total > 0 ? Math.min(even, odd) / total : 0, major: odd <= even ? 'even' : 'odd' };
}

/** Options of {@link nearlySymmetric}. */
export interface NearOptions {
  /** Smallest minor-part fraction that counts as a visible asymmetry (default 1e-10). */
  lower?: number;
  /** Largest minor-part fraction still called "almost" symmetric (default 1e-3). */
  upper?: number;
}

/**
 * Tells whether a state is almost but not quite symmetric: the minor part (odd for a mostly even
 * state, even for a mostly odd one) holds a fraction of the weight in (lower, upper]. Returns the
 * parity it almost has and that fraction, or null (exactly symmetric within `lower`, or clearly
 * mixed). Used to warn about a small slip such as a centre off by a little (common practice). Takes
 * the share and the larger part only, so a mixed state's combined parity (analysis/mixed.ts) is
 * judged by the same rule.
 */
export function nearlySymmetric(
  p: Pick<ParityResult, 'minor' | 'major'>,
  options: NearOptions = {},
): { almost: 'even' | 'odd'; fraction: number } | null {
  const lower = options.lower ?? 1e-10;
  const upper = options.upper ?? 1e-3;
  if (p.minor > lower && p.minor <= upper) return { almost: p.major, fraction: p.minor };
  return null;
}
