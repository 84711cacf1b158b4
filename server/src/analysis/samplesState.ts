/**
 * A sampled state as a state function: the not-a-knot cubic spline of its real and imaginary parts
 * (physics/spline.ts; error O(h^4) for a smooth state, no kink or jump of its own), zero outside the
 * samples; the findings on how the samples fit the system (its walls, or where a state on the line is
 * cut off), and how many levels the samples can resolve.
 *
 * Resolution: samples h apart carry no information about wave numbers above pi / h (the Nyquist limit
 * of the largest spacing; common practice). A level whose largest local wave number,
 * sqrt(2 m (E_n - min V)), is not below pi / h is past the samples' resolution: its coefficient would
 * be the interpolant's, not the state's, so it is not expanded and a `basis` finding says so. For a box
 * of width L sampled at N equal intervals wall to wall this keeps levels 1 .. N - 1, exactly the N - 1
 * sines the N - 1 inner samples determine (the sine transform of the samples).
 */
import type { Eigenbasis } from '../physics/types';
import { evaluateSpline, notAKnotSpline } from '../physics/spline';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { StateModel } from './model';
import type { StateFunction } from './systems';
import type { SamplesModel } from './samples';
import { maxWaveNumber } from './expand';
import { fmt, pct, plural } from './findings';

/** Relative slack of the coverage checks (samples written with a rounded x still reach a wall). */
const COVER_TOL = 1e-9;

/** An end value of a state on the line above this share of its largest |psi| means the samples cut it off. */
const CUT_OFF = 1e-4;

/** The state function of the samples, with the findings on how they fit `basis` pushed to `out`. */
export function samplesState(model: SamplesModel, basis: Eigenbasis | null, out: EngineDiagnostic[]): StateFunction {
  const { x, re, im } = model.table;
  const sRe = notAKnotSpline(x, re);
  const sIm = notAKnotSpline(x, im);
  const ends: [number, number] = [x[0]!, x[x.length - 1]!];
  if (basis) out.push(...fitFindings(model, basis));
  return {
    evaluate(xs, order) {
      const n = xs.length;
      const v = { re: new Float64Array(n), im: new Float64Array(n) } as ReturnType<StateFunction['evaluate']>;
      if (order >= 1) [v.d1re, v.d1im] = [new Float64Array(n), new Float64Array(n)];
      if (order >= 2) [v.d2re, v.d2im] = [new Float64Array(n), new Float64Array(n)];
      evaluateSpline(sRe, xs, v.re, v.d1re, v.d2re);
      evaluateSpline(sIm, xs, v.im, v.d1im, v.d2im);
      return v;
    },
    // Every knot: the spline is a cubic between knots, so panels between them integrate it to the rule's accuracy.
    breakpoints: (a, b) => {
      const pts: number[] = [];
      for (let k = 0; k < x.length; k++) if (x[k]! > a && x[k]! < b) pts.push(x[k]!);
      return pts;
    },
    // The spline is C2 inside: only its ends, where it drops to zero, can jump or kink.
    jumpCandidates: (a, b) => ends.filter((e) => e > a && e < b),
    support: ends,
    window: ends,
    walls: null,
  };
}

/** How the samples sit against the system: inside its walls and covering them, or fallen off on the line. */
function fitFindings(model: SamplesModel, basis: Eigenbasis): EngineDiagnostic[] {
  const { x, re, im, lines } = model.table;
  const at = model.pathSpan;
  const n = x.length;
  const abs = (k: number): number => Math.hypot(re[k]!, im[k]!);
  let peak = 0;
  for (let k = 0; k < n; k++) peak = Math.max(peak, abs(k));
  const warnAt = (message: string): EngineDiagnostic => diagnostic('data', at.start, at.end, `"${model.path}" ${message}`, { severity: 'warning' });
  const found: EngineDiagnostic[] = [];
  if (basis.walls) {
    const [a, b] = basis.walls;
    const tol = COVER_TOL * (b - a);
    if (x[0]! > a + tol || x[n - 1]! < b - tol) {
      found.push(warnAt(`covers x from ${fmt(x[0]!)} to ${fmt(x[n - 1]!)}, less than the system's interval from ${fmt(a)} to ${fmt(b)}; the state is taken as zero where there are no samples.`));
    }
    let outside = 0;
    let first = -1;
    for (let k = 0; k < n; k++) {
      if ((x[k]! < a - tol || x[k]! > b + tol) && abs(k) > 0) {
        outside++;
        if (first < 0) first = k;
      }
    }
    if (outside > 0) {
      found.push(warnAt(`has ${plural(outside, 'nonzero sample')} outside the walls at ${fmt(a)} and ${fmt(b)} (the first on line ${lines[first]}); the state is cut at the walls.`));
    }
  } else if (peak > 0) {
    const end = Math.max(abs(0), abs(n - 1));
    if (end > CUT_OFF * peak) {
      found.push(warnAt(`ends where |psi| is still ${pct(end / peak)} of its largest value (x from ${fmt(x[0]!)} to ${fmt(x[n - 1]!)}); the state is taken as zero beyond, which cuts it off.`));
    }
  }
  return found;
}

/** The largest spacing of the samples. */
export function largestSpacing(model: SamplesModel): number {
  const x = model.table.x;
  let h = 0;
  for (let k = 1; k < x.length; k++) h = Math.max(h, x[k]! - x[k - 1]!);
  return h;
}

/**
 * How many of the first `count` levels the state's samples resolve (all of them for a state that is
 * not sampled), with a `basis` finding on the path when that is fewer.
 */
export function resolvedCount(state: StateModel, basis: Eigenbasis, count: number, out: EngineDiagnostic[]): number {
  if (state.kind !== 'samples' || count < 1) return count;
  const h = largestSpacing(state);
  const window: [number, number] = [state.table.x[0]!, state.table.x[state.table.x.length - 1]!];
  const limit = Math.PI / h;
  const resolved = (levels: number): boolean => maxWaveNumber(basis, levels, window) < limit * (1 - 1e-9);
  // Wave numbers grow with the level: bisect for the most levels that are all resolved.
  let lo = 0;
  let hi = count;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (resolved(mid)) lo = mid;
    else hi = mid - 1;
  }
  if (lo < count) {
    const first = lo + basis.firstLabel;
    const kept = lo === 0 ? 'none is expanded' : `the expansion keeps the ${plural(lo, 'level')} below`;
    const msg = `The samples of "${state.path}" are up to ${fmt(h)} apart, which resolves wave numbers below pi/h = ${fmt(limit)}: levels from n = ${first} on are past their resolution and are not expanded (their coefficients would be the interpolant's, not the state's); ${kept}.`;
    out.push(diagnostic('basis', state.pathSpan.start, state.pathSpan.end, msg, { severity: lo === 0 ? 'error' : 'warning' }));
  }
  return lo;
}

/** The samples normalised as the plots are (divided by the square root of the norm), for the panel. */
export function samplePoints(model: SamplesModel, norm: number): { x: number[]; re: number[]; im: number[] } {
  const s = 1 / Math.sqrt(norm);
  const { x, re, im } = model.table;
  return { x: Array.from(x), re: Array.from(re, (v) => v * s), im: Array.from(im, (v) => v * s) };
}
