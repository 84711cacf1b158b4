/**
 * The panel's plot grid. Equally spaced points over a finite well's whole support (+-89.5 nm for a 9 nm
 * GaAs well) put only a tenth of them where the state and its levels live, the part the state view
 * shows, so the curves came out jagged and V's walls slanted. This grid puts most points over that
 * part, keeps a coarse grid over the rest of the extent (so the samples still span all of it), and adds
 * exact points at the potential's jumps, the mass's interfaces and the state's kinks: at a jump of V or
 * m a point on each side as well, 1e-9 of the extent away, so a wall is drawn vertical, on its place.
 */
import type { Eigenbasis } from '../physics/types';
import type { LevelResult } from './types';
import type { StateFunction } from './systems';

/** Points of the probe grid that finds where the state lives. */
const PROBE = 801;

/**
 * A point belongs to the state's range where |psi|^2 reaches this share of its peak (a bound level's
 * density 6.9 decay lengths into a barrier, exp(-2 kappa d) = 1e-6): wider than the 1e-3 the view
 * clips to (client/webview/charts/xrange.ts), so the view's window lies inside the dense part.
 */
const DENSE_FLOOR = 1e-6;

/** Room added on each side of the state's range, as a share of its width. */
const PAD = 0.15;

/** A range wider than this share of the extent makes the whole extent dense (an evenly spaced grid). */
const WHOLE = 0.85;

/** Share of the points kept for the coarse grid over the whole extent. */
const COARSE = 0.25;

/** Most state kinks given a point of their own (a sampled state's knots are not kinks: see jumpCandidates). */
const MAX_KINKS = 200;

/** Evenly spaced points from a to b, both ends included. */
function even(a: number, b: number, n: number): number[] {
  const out: number[] = [];
  for (let j = 0; j < n; j++) out.push(n === 1 ? a : a + ((b - a) * j) / (n - 1));
  return out;
}

/** The highest energy of the largest-weight levels that hold 99 % of the expanded weight, or -Infinity. */
function topRelevantEnergy(levels: LevelResult[]): number {
  const sorted = levels.filter((l) => (l.weight ?? 0) > 0 && Number.isFinite(l.energy)).sort((p, q) => q.weight - p.weight);
  let total = 0;
  for (const l of sorted) total += l.weight;
  let acc = 0;
  let top = -Infinity;
  for (const l of sorted) {
    top = Math.max(top, l.energy);
    acc += l.weight;
    if (acc >= 0.99 * total) break;
  }
  return top;
}

/**
 * Where the state lives on [a, b]: the probe points where |psi|^2 reaches DENSE_FLOOR of its peak or
 * V lies at or below the highest relevant level (where those levels oscillate, and a packet moves),
 * widened by one probe step and PAD; null when nothing is found.
 */
export function stateRange(basis: Eigenbasis, state: StateFunction, levels: LevelResult[], a: number, b: number): [number, number] | null {
  const xs = Float64Array.from(even(a, b, PROBE));
  const v = state.evaluate(xs, 0);
  const density = Float64Array.from(v.re, (r, j) => r * r + (v.im[j] ?? 0) ** 2);
  let peak = 0;
  for (const d of density) if (Number.isFinite(d)) peak = Math.max(peak, d);
  const top = topRelevantEnergy(levels);
  const pot = basis.potentials ? basis.potentials(xs) : Float64Array.from(xs, (x) => basis.potential(x));
  let lo = -1;
  let hi = -1;
  for (let j = 0; j < PROBE; j++) {
    const inside = (peak > 0 && density[j]! >= DENSE_FLOOR * peak) || pot[j]! <= top;
    if (inside) ((lo = lo < 0 ? j : lo), (hi = j));
  }
  if (lo < 0) return null;
  const from = xs[Math.max(0, lo - 1)]!;
  const to = xs[Math.min(PROBE - 1, hi + 1)]!;
  const pad = PAD * (to - from);
  return [Math.max(a, from - pad), Math.min(b, to + pad)];
}

/**
 * The grid over [a, b] (the walls or the integration window): `points` evenly spaced points over the
 * state's range (the whole extent when that range covers most of it), a quarter as many over the whole
 * extent, and the exact points at the jumps and kinks (see the header). Ascending, no repeated value.
 */
export function viewGrid(basis: Eigenbasis, window: [number, number], state: StateFunction, levels: LevelResult[], points: number): Float64Array {
  const [a, b] = basis.walls ?? window;
  const range = stateRange(basis, state, levels, a, b);
  const whole = range === null || range[1] - range[0] >= WHOLE * (b - a);
  const xs = whole ? even(a, b, points) : [...even(range[0], range[1], points), ...even(a, b, Math.max(2, Math.round(COARSE * points))).filter((x) => x < range[0] || x > range[1])];
  const delta = 1e-9 * (b - a);
  const jumps = [...basis.breakpoints, ...(basis.massJumps ?? [])];
  for (const c of jumps) if (c > a && c < b) xs.push(c - delta, c, c + delta);
  const kinks = (state.jumpCandidates ? state.jumpCandidates(a, b) : state.breakpoints(a, b)).slice(0, MAX_KINKS);
  for (const c of kinks) if (c > a && c < b) xs.push(c);
  xs.sort((p, q) => p - q);
  const out: number[] = [];
  for (const x of xs) if (out.length === 0 || x > out[out.length - 1]!) out.push(x);
  return Float64Array.from(out);
}
