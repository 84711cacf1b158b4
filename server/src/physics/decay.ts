/**
 * How fast expansion coefficients fall off with the level number, and what that says about the state.
 */

/** Options of {@link fitDecay}; defaults in brackets. */
export interface DecayOptions {
  /** Weights below floor * (largest weight) are skipped: parity zeros and rounding noise [1e-28]. */
  floor?: number;
  /** Fraction of the usable levels, from the top, that forms the tail fitted [0.5]. */
  tailFraction?: number;
  /** Fewest tail points needed for a fit [6]. */
  minPoints?: number;
  /**
   * Block length in labels for the upper envelope: the largest |c_n| of each block is fitted, so
   * |sin(n pi x0 / L)| factors from a jump or kink at x0 do not bias the fit [1 = no envelope].
   */
  block?: number;
}

/** |c_n|^2 of the last levels at or above this share of the largest (|c_n| within a factor 10): the tail has not started to fall. */
const NOT_FALLING = 1e-2;

/**
 * Whether the tail has not started to fall: the last `count` levels still hold a tenth or more of the
 * largest |c_n| (a displaced high level whose weights peak near the top of the basis). Such a tail has
 * no decay law to fit; extrapolating one would call a rising tail algebraic.
 */
function notFalling(weights: Float64Array, n: number, count: number, max: number): boolean {
  let last = 0;
  for (let i = Math.max(0, n - count); i < n; i++) if (Number.isFinite(weights[i]) && weights[i] > last) last = weights[i];
  return last >= NOT_FALLING * max;
}

/** A power at least this steep is 'smooth'; it stays a power only when it fits clearly better than a geometric fall. */
const STEEP = 3.5;

/** The fitted tail law. */
export interface DecayFit {
  /** p in |c_n| ~ A n^-p, or null when the decay is geometric (faster than any power). */
  exponent: number | null;
  /** A in |c_n| ~ A n^-p (or B in |c_n| ~ B e^{-r n} when geometric); NaN when unknown. */
  amplitude: number;
  /** r in |c_n| ~ B e^{-r n} when the decay is geometric, else null. */
  rate: number | null;
  /**
   * 'jump' (p ~ 1: psi jumps, or is nonzero at a wall), 'kink' (p ~ 2), 'algebraic' (another power,
   * p ~ 3 being a jump in psi''), 'smooth' (p >= 3.5 or geometric), 'unknown' (too few points).
   */
  classification: 'jump' | 'kink' | 'algebraic' | 'smooth' | 'unknown';
  /** Order of the lowest derivative that jumps: 0 (psi), 1 (psi'), 2 (psi''), or null. */
  derivativeJump: 0 | 1 | 2 | null;
  /** Fraction of the tail's labels that carry weight above the floor (1/2 for parity zeros). */
  density: number;
  /** Points used in the fit. */
  points: number;
  /** First and last level label of the tail fitted, or null when nothing was fitted. */
  range: [number, number] | null;
  /** RMS residuals of log|c| fitted against log n (power) and against n (geometric). */
  residual: { power: number; geometric: number };
}

/** Least-squares line y = c0 + c1 t; returns the coefficients and the RMS residual. */
function line(t: number[], y: number[]): { c0: number; c1: number; rms: number } {
  const n = t.length;
  let st = 0;
  let sy = 0;
  for (let i = 0; i < n; i++) {
    st += t[i];
    sy += y[i];
  }
  const mt = st / n;
  const my = sy / n;
  let stt = 0;
  let sty = 0;
  for (let i = 0; i < n; i++) {
    stt += (t[i] - mt) * (t[i] - mt);
    sty += (t[i] - mt) * (y[i] - my);
  }
  const c1 = stt > 0 ? sty / stt : 0;
  const c0 = my - c1 * mt;
  let ss = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i] - c0 - c1 * t[i];
    ss += r * r;
  }
  return { c0, c1, rms: Math.sqrt(ss / n) };
}

/**
 * Fits the tail of the coefficients, weights[i] = |c_n|^2 at n = labels[i] (labels ascending, >= 1),
 * to |c_n| ~ A n^-p by least squares on log|c_n| against log n, and to |c_n| ~ B e^{-r n} on log|c_n|
 * against n. Levels below the floor are skipped. The decay is geometric (smooth, exponent null)
 * when the exponential fit is clearly better (residual under half the power fit's), or when the power
 * is at least 3.5 and the power fit is not clearly better (its residual under half the exponential's);
 * a clear steep power stays a power ('smooth', p >= 3.5). Otherwise p near 1 means a jump, near 2 a kink, near 3 a jump in psi''
 * (Boyd, Chebyshev and Fourier Spectral Methods, ch. 2 (from memory)). A state whose weight stops
 * entirely after a few levels (a finite combination) is smooth. Never throws.
 */
export function fitDecay(labels: Float64Array, weights: Float64Array, options: DecayOptions = {}): DecayFit {
  const floor = options.floor ?? 1e-28;
  const tailFraction = Math.min(1, Math.max(0.05, options.tailFraction ?? 0.5));
  const minPoints = Math.max(3, Math.floor(options.minPoints ?? 6));
  const block = Math.max(1, Math.floor(options.block ?? 1));
  const n = Math.min(labels.length, weights.length);
  const unknown: DecayFit = {
    exponent: null,
    amplitude: NaN,
    rate: null,
    classification: 'unknown',
    derivativeJump: null,
    density: 0,
    points: 0,
    range: null,
    residual: { power: NaN, geometric: NaN },
  };
  let max = 0;
  for (let i = 0; i < n; i++) if (Number.isFinite(weights[i]) && weights[i] > max) max = weights[i];
  if (!(max > 0) || notFalling(weights, n, minPoints, max)) return unknown;
  const keep: number[] = [];
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(weights[i]) && weights[i] > floor * max && labels[i] >= 1) keep.push(i);
  }
  if (keep.length < minPoints) {
    // A finite combination: nothing above the floor over a stretch of at least minPoints levels.
    const last = keep.length ? keep[keep.length - 1] : -1;
    const range: [number, number] | null = keep.length ? [labels[keep[0]!]!, labels[last]!] : null;
    if (n - 1 - last >= minPoints) return { ...unknown, classification: 'smooth', density: 0, points: keep.length, range };
    return { ...unknown, points: keep.length };
  }
  const tailCount = Math.max(minPoints, Math.ceil(keep.length * tailFraction));
  const tail = keep.slice(keep.length - Math.min(tailCount, keep.length));
  const firstLabel = labels[tail[0]];
  const lastLabel = labels[tail[tail.length - 1]];
  // Labels in the tail range, counted among all given levels, for the density of nonzero weights.
  let span = 0;
  for (let i = 0; i < n; i++) if (labels[i] >= firstLabel && labels[i] <= lastLabel) span++;
  const density = span > 0 ? tail.length / span : 1;
  // Upper envelope by blocks of labels.
  let pts = tail;
  if (block > 1) {
    const env: number[] = [];
    let cur = -1;
    let curBlock = NaN;
    for (const i of tail) {
      const b = Math.floor((labels[i] - firstLabel) / block);
      if (b !== curBlock) {
        if (cur >= 0) env.push(cur);
        cur = i;
        curBlock = b;
      } else if (weights[i] > weights[cur]) cur = i;
    }
    if (cur >= 0) env.push(cur);
    if (env.length >= minPoints) pts = env;
  }
  const logN = pts.map((i) => Math.log(labels[i]));
  const nn = pts.map((i) => labels[i]);
  const logC = pts.map((i) => 0.5 * Math.log(weights[i]));
  const pow = line(logN, logC);
  const geo = line(nn, logC);
  const p = -pow.c1;
  const residual = { power: pow.rms, geometric: geo.rms };
  const base = { density, points: pts.length, range: [firstLabel, lastLabel] as [number, number], residual };
  // A steep power (p >= 3.5) that does not fit clearly better than a geometric fall is that fall seen
  // through the wrong model: over a short range of n a geometric tail fits any large p (29.8 was seen).
  const steepButNotPower = p >= STEEP && !(pow.rms < 0.5 * geo.rms);
  const geometric = (geo.rms < 0.5 * pow.rms || steepButNotPower) && geo.c1 < 0;
  if (geometric) {
    return { ...base, exponent: null, amplitude: Math.exp(geo.c0), rate: -geo.c1, classification: 'smooth', derivativeJump: null };
  }
  return { ...base, exponent: p, amplitude: Math.exp(pow.c0), rate: null, ...powerClass(p) };
}

/** The class of a power law |c_n| ~ n^-p and the lowest derivative that jumps (see {@link fitDecay}). */
function powerClass(p: number): Pick<DecayFit, 'classification' | 'derivativeJump'> {
  if (p >= STEEP) return { classification: 'smooth', derivativeJump: null };
  if (p >= 2.5) return { classification: 'algebraic', derivativeJump: 2 };
  if (p >= 1.5) return { classification: 'kink', derivativeJump: 1 };
  if (p >= 0.5) return { classification: 'jump', derivativeJump: 0 };
  return { classification: 'algebraic', derivativeJump: null };
}
