/**
 * Points where the state itself is infinite: a pole or a power-law spike such as 1/(x - x0) or
 * |x - x0|^(-1/4), inside the system or at a wall. Such a state defeats the grid refinement (its
 * integrals never settle), so the analysis asks here what kind of infinity it is:
 *
 * - |psi| ~ |x - x0|^-p with p >= 1/2: |psi|^2 ~ |x - x0|^-2p is not integrable at x0 (the integral of
 *   |x|^-s near 0 diverges for s >= 1; common practice), so the state has no normalisation at all;
 * - 0 < p < 1/2: |psi|^2 is integrable but |psi'|^2 ~ |x - x0|^(-2p-2) is not, so the state is
 *   normalisable with an infinite energy mean.
 *
 * The growth law is read off the state: log|psi| at distances h = 10^-2 ... 10^-10 of the interval from
 * x0 on each side, whose slopes against log h must agree over the last decades for a power law to be
 * declared (a narrow smooth peak has slope 0 there). Growth slower than any power is recognised as
 * logarithmic when |psi| rises by the same amount each decade (|psi| ~ A + B log(1/|x - x0|)): |psi|^2 is
 * then integrable and the energy infinite, as for small powers.
 */
import type { StateFunction } from './systems';
import type { Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';

/** A point where the state grows without bound like |x - x| ^ -power. */
export interface Singularity {
  x: number;
  power: number;
  /** Whether |psi|^2 can be integrated across the point (power < 1/2, or logarithmic growth). */
  integrable: boolean;
  /** Growth like log(1/|x - x0|), slower than any power (power is then 0). */
  logarithmic?: boolean;
}

/** Slopes of neighbouring decades must agree to this for a power law. */
const SLOPE_AGREEMENT = 0.02;
/** A power below this is taken as no growth (a flat top, rounding). */
const MIN_POWER = 0.05;
/**
 * Powers this close below 1/2 count as 1/2 (|psi|^2 ~ 1/|x - x0|, a logarithmic divergence): the
 * measured slope of a power law is exact to about 1e-10, and an offset (|x - x0|^-1/2 + 1) lowers it
 * by less than 1e-4 at the distances read, so 0.49 stays integrable as documented (p >= 1/2 is not).
 */
const HALF_TOLERANCE = 1e-3;

function abs2At(state: StateFunction, x: number): number {
  const v = state.evaluate(Float64Array.of(x), 0);
  const r = v.re[0]!;
  const i = v.im[0]!;
  const a = r * r + i * i;
  return Number.isNaN(a) ? Infinity : a;
}

/**
 * The growth exponent p of |psi| ~ |x - x0|^-p approaching x0 from the points inside `window`, or null
 * when neither side follows a power law with p > 0.05. Never throws on infinite values.
 */
export function growthAt(state: StateFunction, x0: number, window: [number, number]): Singularity | null {
  const width = window[1] - window[0];
  if (!(width > 0) || !Number.isFinite(x0)) return null;
  let best: number | null = null;
  let logarithmic = false;
  for (const side of [-1, 1]) {
    const room = side < 0 ? x0 - window[0] : window[1] - x0;
    if (!(room > 0)) continue;
    const H = Math.min(1e-2 * width, 0.5 * room);
    const xs = new Float64Array(9);
    for (let i = 0; i < xs.length; i++) xs[i] = x0 + side * H * Math.pow(10, -i);
    const v = state.evaluate(xs, 0);
    const logs: number[] = [];
    const mags: number[] = [];
    for (let i = 0; i < xs.length; i++) {
      const a = Math.hypot(v.re[i]!, v.im[i]!);
      // Distances below rounding of x0 carry no information.
      if (Math.abs(xs[i]! - x0) < 1e4 * Number.EPSILON * Math.max(Math.abs(x0), width)) break;
      if (!(a > 0) || !Number.isFinite(a)) break;
      logs.push(Math.log(a));
      mags.push(a);
    }
    if (logs.length < 5) continue;
    const slopes: number[] = [];
    for (let i = 1; i < logs.length; i++) slopes.push((logs[i]! - logs[i - 1]!) / Math.LN10);
    const tail = slopes.slice(-3);
    const p = tail[tail.length - 1]!;
    if (p > MIN_POWER && !tail.some((s) => Math.abs(s - p) > SLOPE_AGREEMENT)) {
      if (best === null || p > best) best = p;
      continue;
    }
    // Slower than any power: |psi| ~ A + B log(1/|x - x0|) grows by the same amount B ln 10 per decade.
    const steps = mags.slice(1).map((a, i) => a - mags[i]!);
    const last = steps.slice(-4);
    const b = last[last.length - 1]!;
    if (b > 0 && b > 1e-3 * mags[mags.length - 1]! && last.every((d) => Math.abs(d - b) <= 0.02 * b)) logarithmic = true;
  }
  if (best !== null) return { x: x0, power: best, integrable: best < 0.5 - HALF_TOLERANCE };
  // |psi|^2 ~ log^2 is integrable; |psi'|^2 ~ 1/|x - x0|^2 is not.
  if (logarithmic) return { x: x0, power: 0, integrable: true, logarithmic: true };
  return null;
}

/**
 * Looks for a singularity of the state near the grid node where |psi| is largest: the maximum is
 * located between the node's neighbours by golden-section search (a pole lies between them), then its
 * growth law is read by {@link growthAt}. Null when |psi| stays bounded there.
 */
export function findSingularity(state: StateFunction, q: Quadrature, values: GridValues, window: [number, number]): Singularity | null {
  const n = q.x.length;
  if (n === 0) return null;
  let m = 0;
  let top = -1;
  for (let j = 0; j < n; j++) {
    const a = values.re[j]! * values.re[j]! + values.im[j]! * values.im[j]!;
    if (a > top) {
      top = a;
      m = j;
    }
  }
  let lo = m > 0 ? q.x[m - 1]! : window[0];
  let hi = m < n - 1 ? q.x[m + 1]! : window[1];
  // A wall (or the window's end) next to the largest node may be the singular point itself.
  for (const end of [window[0], window[1]]) {
    if ((end === lo || end === hi) && abs2At(state, end) === Infinity) return growthAt(state, end, window) ?? null;
  }
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = hi - g * (hi - lo);
  let x2 = lo + g * (hi - lo);
  let f1 = abs2At(state, x1);
  let f2 = abs2At(state, x2);
  for (let it = 0; it < 200 && hi - lo > 4 * Number.EPSILON * Math.max(Math.abs(lo), Math.abs(hi), 1e-300); it++) {
    if (f1 === Infinity) return growthAt(state, x1, window);
    if (f2 === Infinity) return growthAt(state, x2, window);
    if (f1 >= f2) {
      hi = x2;
      x2 = x1;
      f2 = f1;
      x1 = hi - g * (hi - lo);
      f1 = abs2At(state, x1);
    } else {
      lo = x1;
      x1 = x2;
      f1 = f2;
      x2 = lo + g * (hi - lo);
      f2 = abs2At(state, x2);
    }
  }
  // A spike found within rounding of the origin is at the origin (1/x^2 searched down to 1e-30).
  const x0 = 0.5 * (lo + hi);
  const width = window[1] - window[0];
  return growthAt(state, Math.abs(x0) < 1e-12 * width && window[0] <= 0 && window[1] >= 0 ? 0 : x0, window);
}

/**
 * The state with breakpoints graded geometrically towards an integrable spike, at x0 +- d 2^-k with d a
 * quarter of the window, so a Gauss–Legendre grid integrates |x - x0|^-2p far better than a uniform
 * refinement can. The grading stops at `closest`, where the nodes of a 20-point panel would round onto
 * x0 itself (about 4096 eps |x0| away; down to 1e-290 at the origin).
 */
export function gradedTowards(state: StateFunction, spike: Singularity, window: [number, number]): { state: StateFunction; closest: number } {
  const d = 0.25 * (window[1] - window[0]);
  const x0 = spike.x;
  const floor = Math.max(4096 * Number.EPSILON * Math.abs(x0), 1e-290, 1e-280 * d);
  const points: number[] = [x0];
  let closest = d;
  for (let k = 0; k < 1100; k++) {
    const h = d * Math.pow(2, -k);
    if (h < floor) break;
    closest = h;
    points.push(x0 - h, x0 + h);
  }
  const inner = points.filter((x) => x > window[0] && x < window[1]);
  return { state: { ...state, breakpoints: (a, b) => [...state.breakpoints(a, b), ...inner.filter((x) => x > a && x < b)] }, closest };
}

/**
 * About how much of |psi|^2 (not normalised) lies within h of the spike inside the window: with
 * |psi|^2 ~ A s^-2p near it, A h^(1-2p) / (1 - 2p) on each side, A read off |psi(x0 +- h)|^2.
 */
export function weightWithin(state: StateFunction, spike: Singularity, h: number, window: [number, number]): number {
  const x0 = spike.x;
  const v = state.evaluate(Float64Array.of(x0 - h, x0 + h), 0);
  let w = 0;
  for (let j = 0; j < 2; j++) {
    const side = j === 0 ? x0 - h : x0 + h;
    if (side <= window[0] || side >= window[1]) continue;
    const a2 = v.re[j]! ** 2 + v.im[j]! ** 2;
    if (Number.isFinite(a2)) w += (a2 * h) / (1 - 2 * spike.power);
  }
  return w;
}

/** |x - x0| written for a message: |x|, |x - 0.3| or |x + 0.3|. */
export function distanceText(x0: number, fmt: (v: number) => string): string {
  if (x0 === 0) return '|x|';
  return x0 > 0 ? `|x - ${fmt(x0)}|` : `|x + ${fmt(-x0)}|`;
}
