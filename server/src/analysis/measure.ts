/**
 * Measuring a state in its system's basis: the integration window, the expansion, a singularity, the
 * norm, the levels, the walls, jumps and kinks, the energy, the decay, the parity and the capture. Pure
 * numbers: nothing here words a finding (checks.ts does that from these measurements). A measurement
 * that cannot go on (a state that does not fall off, that is zero, or not square-integrable) ends as
 * a `Stop` naming why, as data.
 */
import type { Eigenbasis } from '../physics/types';
import { compositeGaussLegendre } from '../physics/quadrature';
import type { DecayResult, LevelResult } from './types';
import type { Model } from './model';
import { buildBasis, MissingLevel, type BuiltBasis, type StateFunction } from './systems';
import { BadValue, classifyBreakpoints, decayOf, expandState, findWindow, gridEnergy, type Expanded } from './expand';
import { parityOf as splitParity } from '../physics/parity';
import { findSingularity, gradedTowards, weightWithin, type Singularity } from './singular';
import type { ComputeContext, StopReason } from './context';
import { wallLine, type WallLine } from './wallValues';
import { gridVariance } from './spread';
import { withPeaks, type NarrowPeak } from './narrow';
import { coefficientUncertainties } from './coefficientErrors';
import { ENERGY_POINT_OPS } from './charged';
import { parityFromLevels } from './parityFromLevels';
import type { PacketSpec } from './packetPremise';

/** Tolerance of the norm, capture and parity checks. */
export const TOL = 1e-6;

/** Why the measurement of a state could not go on. */
export type Stop =
  | { stop: 'noFalloff' }
  | { stop: 'missingLevel'; level: number }
  | { stop: 'noTime' }
  | { stop: 'notSquareIntegrable'; singular: Singularity }
  | { stop: 'overflow' }
  | { stop: 'underflow' }
  | { stop: 'tooNarrow'; window: [number, number] }
  | { stop: 'zero'; points?: number }
  | { stop: 'narrowPeak'; center: number; width: number }
  | { stop: 'notFinite'; norm: number };

/** The state at the hard walls: its values there and weight outside them. */
export interface WallMeasurements {
  walls: [number, number];
  /** |psi| at each wall (not normalised), and the level above which a value counts as nonzero. */
  values: [number, number];
  tolerance: number;
  /** sqrt of the norm, to quote normalised values. */
  rootNorm: number;
  /** The largest |psi| seen on the grid (not normalised), to quote a wall value against the peak; NaN next to a spike. */
  peak: number;
  /** Fraction of |psi|^2 outside the walls (dropped); 0 when the state has no extent beyond them. */
  outside: number;
  /**
   * Which walls are physics (a box's, or a `V(x)` wall declared `hard`): there a nonzero value means an
   * infinite energy, while at an open wall it means the interval cuts the state.
   */
  hard: [boolean, boolean];
  /** Nonzero wall values only: what the straight line through them accounts for (walls.ts). */
  line: WallLine | null;
  /** True when a value or the weight outside breaks the walls' boundary condition. */
  broken: boolean;
}

/** Parity of the state about the system's centre. */
export interface ParityMeasurements {
  center: number;
  parity: 'even' | 'odd' | 'mixed';
  /** Weight of the minor part relative to the norm. */
  minor: number;
  major: 'even' | 'odd';
}

/** Everything measured about a state that could be expanded. */
export interface StateMeasurements {
  basis: Eigenbasis;
  built: BuiltBasis;
  window: [number, number];
  /** Why the grid refinement stopped short (null when two grids agreed). */
  stopped: StopReason | null;
  /** Integral of |psi|^2 as written. */
  norm: number;
  levels: LevelResult[];
  /** Sum of the weights (after the levels that vanish by symmetry are zeroed). */
  captured: number;
  levelsFor999: number | null;
  /** An integrable spike, with how close double precision samples it and the weight that close. */
  singular: Singularity | null;
  closest: number;
  unresolvedNearSpike: number;
  walls: WallMeasurements | null;
  jumps: number[];
  kinks: number[];
  /** <H> and Delta H (null where they diverge), and sum E_n |c_n|^2 over the levels computed. */
  mean: number | null;
  spread: number | null;
  meanFromLevels: number;
  decay: DecayResult | null;
  parity: ParityMeasurements | null;
  /** Finite well: weight outside the bound states. */
  continuum: number | null;
  /** Levels that capture all but TOL, when the capture falls short (null when even the cap does not). */
  needed: number | null;
  /** The state as the projections saw it (graded towards a spike when there is one). */
  projected: StateFunction;
}

/** What `measureState` needs. */
export interface MeasureInput {
  model: Model;
  built: BuiltBasis;
  /** Levels asked for (at most the basis's count). */
  count: number;
  state: StateFunction;
  ctx: ComputeContext;
  /** Search for the levels that would capture all but TOL when the capture falls short (default true; a light part of a mixture skips it). */
  searchNeeded?: boolean;
}

/** Measures the state; a `Stop` when it cannot be expanded. Throws `BadValue` where the state is not finite. */
export function measureState(input: MeasureInput): StateMeasurements | Stop {
  const { built, state, ctx } = input;
  const basis = built.basis;
  const window: [number, number] | null = basis.walls ? [basis.walls[0], basis.walls[1]] : findWindow(state, basis);
  if (!window) return { stop: 'noFalloff' };
  // Narrow Gaussian factors the formula announces get panels of their own (narrow.ts).
  const sm = input.model.state?.model;
  const peaks = withPeaks(state, sm?.kind === 'psi' ? (sm.peaks ?? []) : [], window);
  const packet = sm?.kind === 'gaussian' ? { center: sm.center, width: sm.width, momentum: sm.momentum } : undefined;
  const expanded = expandWithSpike(peaks.state, basis, input.count, window, ctx, packet);
  if ('stop' in expanded) return expanded;
  const { ex, singular, closest, unresolvedNearSpike, projected } = expanded;
  const norm = ex.norm;
  const bad = badNorm(ex, state, window, peaks.narrow);
  if (bad) return bad;
  const count = ex.re.length;
  const { levels, weights, captured } = levelsOf(ex, basis, count);
  if (built.coarse && !ctx.budget.expired()) {
    const du = coefficientUncertainties(ex, built.coarse, projected, window, { maxGridPoints: ctx.limits.maxGridPoints, budget: ctx.budget });
    if (du) levels.forEach((l, k) => (l.coefficientUncertainty = du[k]!));
  }
  if (!Number.isFinite(captured) || levels.some((l) => !Number.isFinite(l.energy))) return { stop: 'notFinite', norm };
  // Next to a spike the largest values on the grid say nothing about the state's size: use its rms instead.
  const rms = Math.sqrt(norm / (window[1] - window[0]));
  // The transform's samples (equally spaced, the walls' midpoint among them) add to the grid's nodes.
  const peakPsi = singular ? NaN : Math.max(maxAbs(ex.values.re, ex.values.im), ex.samplePeak ?? 0);
  const scalePsi = singular ? rms : peakPsi || 1;
  const scaleD = singular ? rms / (window[1] - window[0]) : maxAbs(ex.values.d1re!, ex.values.d1im!) || scalePsi / (window[1] - window[0]);
  const walls = basis.walls ? measureWalls(state, ex, basis, { psi: scalePsi, peak: peakPsi }, hardWalls(input.model, input.built)) : null;
  const found = classifyBreakpoints(state, window, { psi: scalePsi, dpsi: scaleD });
  // A breakpoint at the singularity (the corner of abs(x - x0)) is the singularity, not a jump or kink.
  const apart = (x: number): boolean => !singular || Math.abs(x - singular.x) > 1e-6 * (window[1] - window[0]);
  const jumps = found.jumps.filter(apart);
  const kinks = found.kinks.filter(apart);
  ctx.budget.spend(ENERGY_POINT_OPS * ex.q.x.length);
  const energy = energyOf({ basis, built, ex, weights, count, jumps, kinks, wallBreak: walls?.broken ?? false, singular });
  // The coefficients settle a plainly mixed state without evaluating it at the mirrored nodes (parityFromLevels.ts).
  const parity = basis.center !== null ? (parityFromLevels(ex.re, ex.im, ex.error, norm, basis.center) ?? parityOf(state, ex, basis.center)) : null;
  const m: StateMeasurements = {
    basis, built, window, stopped: ex.stopped, norm, levels, captured, levelsFor999: levelsFor(weights, 0.999),
    singular, closest, unresolvedNearSpike, walls, jumps, kinks, ...energy, parity, continuum: null, needed: null, projected,
  };
  if (parity && parity.parity !== 'mixed') m.captured = zeroBySymmetry(levels, basis, parity.parity, captured);
  if (basis.kind === 'well') m.continuum = Math.max(0, 1 - m.captured);
  // A spike's coefficients fall off algebraically and its grids never settle: no basis within the cap
  // captures all but TOL, and the search would only spend the budget on grids that cannot agree.
  else if (input.searchNeeded !== false && m.captured < 1 - TOL && !singular && !beyondCap(levels.length, 1 - m.captured, energy.decay, ctx.limits.maxBasis)) {
    m.needed = levelsNeeded({ state: projected, basis, window, model: input.model, ctx });
  }
  return m;
}

/** The expansion, redone on a grid graded towards an integrable spike when the refinement found one. */
function expandWithSpike(
  state: StateFunction,
  basis: Eigenbasis,
  count: number,
  window: [number, number],
  ctx: ComputeContext,
  packet?: PacketSpec,
): { ex: Expanded; singular: Singularity | null; closest: number; unresolvedNearSpike: number; projected: StateFunction } | Stop {
  const options = { maxGridPoints: ctx.limits.maxGridPoints, budget: ctx.budget, packet };
  let ex: Expanded;
  try {
    ex = expandState(state, basis, count, window, options);
  } catch (err) {
    if (err instanceof MissingLevel) return { stop: 'missingLevel', level: err.level };
    throw err;
  }
  if (ex.re.length < count) return { stop: 'noTime' };
  // A refinement that never settles may be chasing a point where the state is infinite.
  const singular = ex.stopped === 'cap' ? findSingularity(state, ex.q, ex.values, window) : null;
  if (singular && !singular.integrable) return { stop: 'notSquareIntegrable', singular };
  let closest = 0;
  let unresolvedNearSpike = 0;
  let projected = state;
  if (singular && !ctx.budget.expired()) {
    // Expand again on a grid graded towards the spike, and measure what double precision cannot reach.
    const graded = gradedTowards(state, singular, window);
    closest = graded.closest;
    try {
      const again = expandState(graded.state, basis, count, window, { ...options, packet: undefined });
      if (again.re.length === count) {
        ex = again;
        projected = graded.state;
      }
    } catch (err) {
      if (!(err instanceof BadValue)) throw err;
    }
    unresolvedNearSpike = weightWithin(state, singular, closest, window) / (ex.norm > 0 ? ex.norm : 1);
  }
  return { ex, singular, closest, unresolvedNearSpike, projected };
}

/** A norm the expansion cannot be normalised by: overflowing, underflowing, missed by the grid, or zero. */
function badNorm(ex: Expanded, state: StateFunction, window: [number, number], narrow: NarrowPeak[]): Stop | null {
  const norm = ex.norm;
  if (norm === Infinity) return { stop: 'overflow' };
  if (norm > 0) return null;
  if (maxAbs(ex.values.re, ex.values.im) > 0) return { stop: 'underflow' };
  // A peak the formula announces, too narrow for double precision to place nodes on: never "zero".
  const peak = narrow[0];
  if (peak) return { stop: 'narrowPeak', center: peak.center, width: peak.width };
  // The grid over the system's extent may step over a state far narrower than the system.
  const mid = state.window ? state.evaluate(new Float64Array([(state.window[0] + state.window[1]) / 2]), 0) : null;
  if (mid && maxAbs(mid.re, mid.im) > 0) return { stop: 'tooNarrow', window };
  return { stop: 'zero', points: ex.q.x.length };
}

/** The levels of the normalised state, their weights and the weight captured. */
function levelsOf(ex: Expanded, basis: Eigenbasis, count: number): { levels: LevelResult[]; weights: Float64Array; captured: number } {
  const s = 1 / Math.sqrt(ex.norm);
  const levels: LevelResult[] = [];
  const weights = new Float64Array(count);
  let captured = 0;
  for (let k = 0; k < count; k++) {
    const re = ex.re[k]! * s;
    const im = ex.im[k]! * s;
    const w = re * re + im * im;
    weights[k] = w;
    captured += w;
    const lv: LevelResult = { n: k + basis.firstLabel, energy: basis.energies[k]!, re, im, weight: w };
    if (basis.uncertainty) lv.uncertainty = basis.uncertainty[k]!;
    levels.push(lv);
  }
  return { levels, weights, captured };
}

/** The walls that are physics: both of a box, the declared ones of a `V(x)` interval. */
function hardWalls(model: Model, built: BuiltBasis): [boolean, boolean] {
  if (model.system?.model.kind !== 'potential') return [true, true];
  return built.hardWalls ?? [false, false];
}

/** The smallest number of levels whose weights add up to `share`, or null. */
export function levelsFor(weights: Float64Array, share: number): number | null {
  let acc = 0;
  for (let k = 0; k < weights.length; k++) {
    acc += weights[k]!;
    if (acc >= share) return k + 1;
  }
  return null;
}

/**
 * The state's values at the walls and its weight outside them: the boundary condition is about the
 * state's value at and beyond the walls, never about weight near them (a state that vanishes at a
 * wall satisfies it wherever the wall is).
 */
function measureWalls(state: StateFunction, ex: Expanded, basis: Eigenbasis, scale: { psi: number; peak: number }, hard: [boolean, boolean]): WallMeasurements {
  const [a, b] = basis.walls!;
  const v = state.evaluate(new Float64Array([a, b]), 0);
  const values: [number, number] = [Math.hypot(v.re[0]!, v.im[0]!), Math.hypot(v.re[1]!, v.im[1]!)];
  const tolerance = 1e-6 * scale.psi;
  const outside = weightOutside(state, a, b, ex.norm);
  const valueBreak = values[0] > tolerance || values[1] > tolerance;
  // Next to a spike (no peak to quote) the rest's energy is as infinite as the state's.
  const found = valueBreak ? wallLine(basis, ex, [v.re[0]!, v.im[0]!], [v.re[1]!, v.im[1]!]) : null;
  const line = found && !Number.isFinite(scale.peak) ? { ...found, mean: null, spread: null } : found;
  return { walls: [a, b], values, tolerance, rootNorm: Math.sqrt(ex.norm), peak: scale.peak, outside, hard, line, broken: valueBreak || outside > 1e-9 };
}

/**
 * Weight outside the walls, which is dropped. Only states with an extent of their own (a packet, a
 * level of another system) can have such weight: a formula is read as the state inside the walls.
 */
function weightOutside(state: StateFunction, a: number, b: number, norm: number): number {
  const L = b - a;
  const extent = state.support ?? state.window;
  if (!extent || !(extent[0] < a - 1e-12 * L || extent[1] > b + 1e-12 * L)) return 0;
  const lo = Math.min(extent[0], a);
  const hi = Math.max(extent[1], b);
  let outside = 0;
  for (const [x0, x1] of [
    [lo, a],
    [b, hi],
  ] as const) {
    if (x1 - x0 <= 1e-12 * L) continue;
    const q = compositeGaussLegendre(x0, x1, { breakpoints: state.breakpoints(x0, x1), panels: 64, order: 20 });
    const w = state.evaluate(q.x, 0);
    for (let j = 0; j < q.x.length; j++) {
      const r = w.re[j]!;
      const i = w.im[j]!;
      if (Number.isFinite(r) && Number.isFinite(i)) outside += q.w[j]! * (r * r + i * i);
    }
  }
  return outside / (outside + norm);
}

/**
 * The energy from the grid, with divergence decided by jumps, kinks, wall values and a spike: a jump
 * (or a broken wall, or a spike) makes the mean infinite, a kink the spread; and the decay of the
 * coefficients over the resolved levels.
 */
function energyOf(m: {
  basis: Eigenbasis;
  built: BuiltBasis;
  ex: Expanded;
  weights: Float64Array;
  count: number;
  jumps: number[];
  kinks: number[];
  wallBreak: boolean;
  singular: Singularity | null;
}): { mean: number | null; spread: number | null; meanFromLevels: number; decay: DecayResult | null } {
  const { basis, ex, weights, count } = m;
  let meanFromLevels = 0;
  for (let k = 0; k < count; k++) meanFromLevels += weights[k]! * basis.energies[k]!;
  const g = gridEnergy(basis, ex.q, ex.values, ex.norm);
  let mean: number | null = g.mean;
  // ||(H - <H>) psi|| keeps the digits sqrt(<H^2> - <H>^2) cancels: an eigenstate's spread is ~1e-14, not 1e-7.
  // A mass that depends on x has its own <H^2> (physics/massEnergy.ts: not finite across a jump of m for a state whose psi'/m jumps).
  const variance = basis.masses ? g.meanSquare - g.mean * g.mean : gridVariance(basis, ex.q, ex.values, ex.norm, g.mean);
  let spread: number | null = Math.sqrt(Math.max(0, variance));
  if (!Number.isFinite(variance)) spread = null;
  // Levels the solver could not resolve say nothing about the state's smoothness.
  const unresolved = m.built.unresolved;
  const resolved = unresolved ? Math.max(0, Math.min(count, unresolved - basis.firstLabel)) : count;
  const decay = decayOf(basis, weights.subarray(0, resolved));
  if (decay) decay.at = m.jumps[0] ?? m.kinks[0] ?? null;
  if (m.wallBreak || m.jumps.length > 0 || decay?.classification === 'jump' || m.singular) {
    mean = null;
    spread = null;
  } else if (m.kinks.length > 0 || decay?.classification === 'kink') {
    spread = null;
  }
  // Overflowing integrals (a subnormal mass makes hbar^2 k^2 / 2m infinite) diverge like a jump: null.
  if (mean !== null && !Number.isFinite(mean)) mean = null;
  if (spread !== null && !Number.isFinite(spread)) spread = null;
  return { mean, spread, meanFromLevels, decay };
}

/** Even and odd parts of the state about `center` (physics/parity.ts), from its values at the mirrored nodes. */
function parityOf(state: StateFunction, ex: Expanded, center: number): ParityMeasurements {
  const mirror = mirrorValues(state, ex, center);
  const p = splitParity({ re: ex.values.re, im: ex.values.im, mirrorRe: mirror.re, mirrorIm: mirror.im, w: ex.q.w });
  return { center, parity: p.classification, minor: p.minor, major: p.major };
}

/**
 * psi(2c - x_j) at every node. Where the mirror image of a node is, bit for bit, the node at the other
 * end of the grid (about half the nodes of a grid symmetric about c, all of some), its value is already
 * known: evaluation is pointwise (charged.ts), so only the other images are evaluated.
 */
function mirrorValues(state: StateFunction, ex: Expanded, center: number): { re: Float64Array; im: Float64Array } {
  const x = ex.q.x;
  const n = x.length;
  const other: number[] = [];
  for (let j = 0; j < n; j++) if (2 * center - x[j]! !== x[n - 1 - j]) other.push(j);
  const mx = new Float64Array(other.length);
  other.forEach((j, i) => (mx[i] = 2 * center - x[j]!));
  const v = state.evaluate(mx, 0);
  if (other.length === n) return { re: v.re, im: v.im };
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    re[j] = ex.values.re[n - 1 - j]!;
    im[j] = ex.values.im[n - 1 - j]!;
  }
  other.forEach((j, i) => {
    re[j] = v.re[i]!;
    im[j] = v.im[i]!;
  });
  return { re, im };
}

/**
 * Levels of the other parity vanish by symmetry: their tiny weights (below 1e-20) become exact zeros.
 * Index 0 is even about the centre in every basis. Returns the captured weight without them.
 */
function zeroBySymmetry(levels: LevelResult[], basis: Eigenbasis, parity: 'even' | 'odd', captured: number): number {
  for (const lv of levels) {
    const levelEven = (lv.n - basis.firstLabel) % 2 === 0;
    if ((parity === 'even') !== levelEven && lv.weight < 1e-20) {
      captured -= lv.weight;
      lv.re = 0;
      lv.im = 0;
      lv.weight = 0;
    }
  }
  return captured;
}

/**
 * True when the coefficients' algebraic decay |c_n| ~ n^-p puts a basis that captures all but TOL
 * beyond the cap: the weights' tail from N on is about C N^(1-2p) (the sum of n^-2p; common practice),
 * so a shortfall s at `count` levels needs about count (s / TOL)^(1/(2p-1)) levels (and no finite
 * number when p <= 1/2). A jump (p = 1) short by 1e-3 at 200 levels needs about 2e5. The search would
 * only spend the budget on projections that cannot reach.
 */
function beyondCap(count: number, shortfall: number, decay: DecayResult | null, maxBasis: number): boolean {
  const p = decay?.exponent;
  if (p === null || p === undefined) return false;
  if (!(p > 0.5)) return true;
  return count * Math.pow(shortfall / TOL, 1 / (2 * p - 1)) > maxBasis;
}

/**
 * How many levels capture all but TOL of the state: projects on more levels (2 x, at least 100, then
 * 4 x twice, within the basis cap) until the captured weight reaches 1 - TOL. Null when the cap, the
 * budget or the basis runs out first.
 */
function levelsNeeded(input: { state: StateFunction; basis: Eigenbasis; window: [number, number]; model: Model; ctx: ComputeContext }): number | null {
  const { state, basis, window, model, ctx } = input;
  const limits = ctx.limits;
  const sys = model.system!.model;
  let n = Math.min(limits.maxBasis, Math.max(2 * basis.count, 100));
  for (let attempt = 0; attempt < 3; attempt++) {
    if (ctx.budget.expired()) return null;
    const b = n <= basis.count ? { basis } : buildBasis(sys, model.mass, n, [], { maxGridPoints: limits.maxGridPoints, budget: ctx.budget, coarse: false });
    if (!b) return null;
    const m = Math.min(n, b.basis.count);
    const ex = expandState(state, b.basis, m, window, { maxGridPoints: limits.maxGridPoints, budget: ctx.budget });
    let acc = 0;
    for (let k = 0; k < Math.min(m, ex.re.length); k++) {
      acc += (ex.re[k]! ** 2 + ex.im[k]! ** 2) / ex.norm;
      if (acc >= 1 - TOL) return k + 1;
    }
    if (n >= limits.maxBasis || m < n) return null;
    n = Math.min(limits.maxBasis, n * 4);
  }
  return null;
}

/**
 * max_j hypot(re_j, im_j), exactly as that loop gives it, at the cost of one pass of squares: the
 * squares find the largest modulus, and only the nodes within 1e-12 of it (the squares' rounding is a
 * few eps where they neither overflow nor underflow) are measured with hypot. Any other case (a
 * non-finite or a tiny square) takes the plain loop.
 */
export function maxAbs(re: Float64Array, im: Float64Array): number {
  let m2 = 0;
  for (let j = 0; j < re.length; j++) {
    const s = re[j]! * re[j]! + im[j]! * im[j]!;
    if (s > m2) m2 = s;
    else if (!(s <= m2)) return maxAbsPlain(re, im);
  }
  if (!(m2 > 1e-280 && m2 < Infinity)) return maxAbsPlain(re, im);
  const near = m2 * (1 - 1e-12);
  let m = 0;
  for (let j = 0; j < re.length; j++) if (re[j]! * re[j]! + im[j]! * im[j]! >= near) m = Math.max(m, Math.hypot(re[j]!, im[j]!));
  return m;
}

function maxAbsPlain(re: Float64Array, im: Float64Array): number {
  let m = 0;
  for (let j = 0; j < re.length; j++) m = Math.max(m, Math.hypot(re[j]!, im[j]!));
  return m;
}
