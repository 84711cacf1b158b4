/**
 * The numerical stage: the state on a quadrature grid fine enough for both the state and the basis,
 * its norm, its coefficients, its energy (two independent ways), parity, decay, and the physics
 * diagnostics that follow from them.
 */
import type { Eigenbasis, Quadrature } from '../physics/types';
import type { GridValues } from '../expr/types';
import { compositeGaussLegendre } from '../physics/quadrature';
import { project } from '../physics/project';
import { Stopped } from '../physics/budget';
import { boxTransform } from './boxTransform';
import type { PacketSpec } from './packetPremise';
import { lineCheck, lineGrid, lineTrapezoid } from './lineTrapezoid';
import { transformGrids } from './transformGrids';
import { fitDecay } from '../physics/decay';
import type { StateFunction } from './systems';
import type { DecayResult } from './types';
import type { Budget, StopReason } from './context';
import { growthAt, type Singularity } from './singular';
import { massGridEnergy } from '../physics/massEnergy';

/** Options of `expandState`. */
export interface ExpandOptions {
  /** The grid cap: refinement stops (reason `cap`) before a grid of more nodes. */
  maxGridPoints: number;
  /** The analysis's budget: polled between grids and between chunks of the projection. */
  budget: Budget;
  /** The state is this Gaussian packet (its closed form can prove the box transform's premise; packetPremise.ts). */
  packet?: PacketSpec;
}

/** The state projected on one grid. */
export interface Expanded {
  q: Quadrature;
  /** Values of the state (not normalised) on the quadrature nodes, with two derivatives. */
  values: GridValues;
  /** Coefficients <phi_k|psi> of the state as written, by level index (empty when the budget ran out on the first grid). */
  re: Float64Array;
  im: Float64Array;
  /** Integral of |psi|^2 on the grid. */
  norm: number;
  /**
   * Estimated |c_k - c_k(exact)| of each coefficient as written (not normalised): the tail and the
   * interpolant's miss of the box's sine transform (boxTransform.ts), else the difference from the previous quadrature grid
   * (Infinity when there was none).
   */
  error: Float64Array;
  /** Why refinement stopped before two grids agreed: the grid cap, the time limit or a cancellation. */
  stopped: StopReason | null;
  /** The largest |psi| on the sine transform's samples, when it gave the coefficients (boxTransform.ts). */
  samplePeak?: number;
}

const ORDER = 20;

/**
 * k h of the highest level on a panel of half-width h: Gauss-Legendre with 20 points integrates
 * e^{i k x} over such a panel to about (e k h / 4n)^(2n) ~ 1e-19 (common practice), with room for the
 * state's own oscillation; about 6 nodes a wavelength.
 */
const PANEL_PHASE = 10;

/** k h of the coarser grid that checks the first one: (e 13 / 80)^40 ~ 6e-15 (expandState). */
const COARSE_PHASE = 13;

/**
 * Nodes holding together at most NEGLIGIBLE^2 of the norm are left out of the fused projections
 * (project.ts), moving no coefficient by more than NEGLIGIBLE sqrt(norm) (Cauchy-Schwarz): the tails of
 * a state far inside the basis's support cost nothing.
 */
const NEGLIGIBLE = 1e-14;

/**
 * Entries (levels x nodes) of one chunk of a projection: the budget is polled between chunks, so a
 * projection of any size stops within about one chunk's work of the deadline (2^18 entries, at least
 * 64 nodes: measured about 3 ms for box sines and 25 ms for oscillator levels, whose tables cost about
 * 90 ns an entry). A fixed size, so results never depend on the clock.
 */
const CHUNK_ENTRIES = 1 << 18;

/**
 * Counted operations per entry of a table projection (one level at one node): the table's recurrence or
 * closed form and the weighted sum (measured about 30-110 ns an entry for Hermite functions and 10-20 ns
 * for the well, against about 1 ns per counted operation of the eigen-solver), so the counted work tracks
 * the time the projection takes.
 */
const TABLE_ENTRY_OPS = 32;

/** A point inside [a, b] where the state cannot be evaluated. */
export class BadValue extends Error {
  /** How the state grows towards x, when the analysis could tell (a pole, a power-law spike). */
  growth: Singularity | null = null;
  constructor(
    readonly x: number,
    readonly value: number,
  ) {
    super(`bad value ${value} at ${x}`);
  }
}

function checkFinite(xs: Float64Array, v: GridValues): void {
  for (let j = 0; j < xs.length; j++) {
    const r = v.re[j]!;
    const i = v.im[j]!;
    if (!Number.isFinite(r) || !Number.isFinite(i)) throw new BadValue(xs[j]!, Number.isFinite(r) ? i : r);
  }
}

function integrateAbs2(q: Quadrature, v: GridValues): number {
  let s = 0;
  for (let j = 0; j < q.x.length; j++) s += q.w[j]! * (v.re[j]! * v.re[j]! + v.im[j]! * v.im[j]!);
  return s;
}

/**
 * Finds a window that holds essentially all of |psi|^2 for a state on the whole line, by scanning
 * outward from the basis's support. Returns null when the state does not fall off (not normalisable).
 */
export function findWindow(state: StateFunction, basis: Eigenbasis): [number, number] | null {
  const [s0, s1] = basis.support;
  const c = basis.center ?? (s0 + s1) / 2;
  let lo = s0;
  let hi = s1;
  if (state.window) {
    lo = Math.min(lo, state.window[0]);
    hi = Math.max(hi, state.window[1]);
  }
  const w = Math.max(hi - lo, 1e-300);
  // Scan a wide range with a coarse grid to find where |psi|^2 becomes negligible.
  for (const span of [4, 16, 64, 256]) {
    const a = lo - span * w;
    const b = hi + span * w;
    const n = 4001;
    const xs = new Float64Array(n);
    for (let j = 0; j < n; j++) xs[j] = a + ((b - a) * j) / (n - 1);
    const v = state.evaluate(xs, 0);
    // A scan point that lands on an integrable spike (|x|^-1/4 at x = 0) is skipped: the quadrature
    // nodes never sit on it. Any other non-finite value stops the analysis as usual.
    for (let j = 0; j < n; j++) {
      if (Number.isFinite(v.re[j]!) && Number.isFinite(v.im[j]!)) continue;
      const g = growthAt(state, xs[j]!, [a, b]);
      if (g && g.integrable) {
        v.re[j] = 0;
        v.im[j] = 0;
      }
    }
    checkFinite(xs, v);
    let max = 0;
    for (let j = 0; j < n; j++) max = Math.max(max, v.re[j]! ** 2 + v.im[j]! ** 2);
    if (max === 0) return [lo, hi];
    const thr = max * 1e-24;
    let first = -1;
    let last = -1;
    for (let j = 0; j < n; j++) {
      if (v.re[j]! ** 2 + v.im[j]! ** 2 > thr) {
        if (first < 0) first = j;
        last = j;
      }
    }
    if (first > 0 && last < n - 1) {
      const x0 = Math.min(lo, xs[first - 1]!);
      const x1 = Math.max(hi, xs[last + 1]!);
      if (basis.center !== null) {
        const r = Math.max(c - x0, x1 - c);
        return [c - r, c + r];
      }
      return [x0, x1];
    }
  }
  return null;
}

/** The largest local wave number of the basis levels (sets the panel width). */
export function maxWaveNumber(basis: Eigenbasis, levels: number, window: [number, number]): number {
  const eMax = basis.energies[Math.min(levels, basis.count) - 1] ?? 0;
  let vMin = Infinity;
  const n = 257;
  const xs = new Float64Array(n);
  for (let j = 0; j < n; j++) xs[j] = window[0] + ((window[1] - window[0]) * (j + 0.5)) / n;
  const pot = basis.potentials ? basis.potentials(xs) : null;
  for (let j = 0; j < n; j++) {
    const v = pot ? pot[j]! : basis.potential(xs[j]!);
    if (Number.isFinite(v)) vMin = Math.min(vMin, v);
  }
  if (!Number.isFinite(vMin)) vMin = 0;
  // A mass that depends on x: the largest one sets the shortest wavelength.
  const mass = basis.masses ? Math.max(basis.mass, ...basis.masses(xs)) : basis.mass;
  return Math.sqrt(Math.max(0, 2 * mass * (eMax - vMin)));
}

/**
 * The composite rule of `panels` nominal panels with every piece between breakpoints cut into `refine`
 * times its first grid's panels, so a doubling really halves every panel (a short piece next to a spike
 * holds one panel until the nominal count reaches its share, and two such grids would agree falsely).
 */
function quadratureFor(window: [number, number], breakpoints: number[], panels: number, refine: number): Quadrature {
  const memo = breakpoints.length <= GRID_MEMO_BREAKPOINTS;
  const key = memo ? `${window[0]} ${window[1]} ${panels} ${refine} ${breakpoints.join(' ')}` : '';
  const hit = memo ? GRID_MEMO.get(key) : undefined;
  if (hit) return hit;
  const q = compositeGaussLegendre(window[0], window[1], { breakpoints, panels, order: ORDER, refine });
  if (memo && q.x.length <= GRID_MEMO_NODES) {
    if (GRID_MEMO.size >= GRID_MEMO_SIZE) GRID_MEMO.delete(GRID_MEMO.keys().next().value!);
    GRID_MEMO.set(key, q);
  }
  return q;
}

/**
 * The last few quadrature grids by their parameters (numbers print as round-trip decimals, so equal keys
 * mean equal inputs): a file analysed again, or edited without touching its system and its levels, gets
 * the same grid without rebuilding it. Grids are read, never written, by everything downstream. Only
 * grids of at most 2^16 nodes (1 MiB) and 64 breakpoints are kept.
 */
const GRID_MEMO = new Map<string, Quadrature>();
const GRID_MEMO_SIZE = 8;
const GRID_MEMO_NODES = 1 << 16;
const GRID_MEMO_BREAKPOINTS = 64;

/**
 * The coefficients of the state on the first `levels` levels, projected chunk by chunk of nodes (the
 * sums are linear in the nodes), polling the budget between chunks; null when it ran out first.
 */
function projectWithin(basis: Eigenbasis, q: Quadrature, values: GridValues, levels: number, budget: Budget): { re: Float64Array; im: Float64Array } | null {
  const n = q.x.length;
  if (basis.weightedSums) {
    // Fused sums in one call (a sine series combines its sums with each level once, so chunks would
    // repeat that), charged on the budget node by node: it stops within a poll of the deadline.
    if (budget.expired()) return null;
    try {
      return project(basis, q, values.re, values.im, levels, { budget, negligible: NEGLIGIBLE });
    } catch (err) {
      if (err instanceof Stopped) return null;
      throw err;
    }
  }
  const chunk = Math.max(64, Math.floor(CHUNK_ENTRIES / Math.max(1, levels)));
  const re = new Float64Array(levels);
  const im = new Float64Array(levels);
  for (let start = 0; start < n; start += chunk) {
    if (budget.expired()) return null;
    const end = Math.min(n, start + chunk);
    const part = { x: q.x.subarray(start, end), w: q.w.subarray(start, end) };
    const c = project(basis, part, values.re.subarray(start, end), values.im.subarray(start, end), levels);
    for (let k = 0; k < levels; k++) {
      re[k]! += c.re[k]!;
      im[k]! += c.im[k]!;
    }
    budget.count(TABLE_ENTRY_OPS * levels * (end - start), 0);
  }
  return { re, im };
}

/**
 * state.breakpoints(a, b), kept for the last interval asked of each state: the expansion and the jump and
 * kink search ask the same state for the same window (a formula's breakpoints are found by walking and
 * solving its conditions, which is not free). A fresh copy each time: callers may add to it.
 */
function stateBreakpoints(state: StateFunction, a: number, b: number): number[] {
  const hit = BREAKPOINTS.get(state);
  if (hit && hit.a === a && hit.b === b) return [...hit.points];
  const points = state.breakpoints(a, b);
  BREAKPOINTS.set(state, { a, b, points: [...points] });
  return points;
}
const BREAKPOINTS = new WeakMap<StateFunction, { a: number; b: number; points: number[] }>();

/** The breakpoints of the state, the basis and the state's old walls inside the window, sorted. */
function allBreakpoints(state: StateFunction, basis: Eigenbasis, window: [number, number]): number[] {
  const bps = new Set<number>();
  for (const x of stateBreakpoints(state, window[0], window[1])) bps.add(x);
  for (const x of basis.breakpoints) if (x > window[0] && x < window[1]) bps.add(x);
  if (state.walls) for (const x of state.walls) if (x > window[0] && x < window[1]) bps.add(x);
  return [...bps].sort((a, b) => a - b);
}

/**
 * Projects the state on the first `levels` levels of `basis` over `window`, refining the grid until
 * the coefficients agree between two grids to 1e-12 of the norm. Stops short on the grid cap or when
 * the budget runs out (`stopped` says which), with the last grid's values; the grid sizes depend only
 * on the state, the basis and the caps, never on the clock.
 */
export function expandState(state: StateFunction, basis: Eigenbasis, levels: number, window: [number, number], options: ExpandOptions): Expanded {
  const breakpoints = allBreakpoints(state, basis, window);
  // The sine transform, when it settles, replaces the projection: a grid then serves the norm and the
  // energy integrals, and the transform's own samples check that grid's norm (boxTransform.ts).
  const fast = boxTransform(state, basis, levels, breakpoints, Math.min(options.maxGridPoints, 1 << 18), options.budget, options.packet);
  // Samples that resolve the state's integrals too are the grid: no Gauss-Legendre grid is built.
  if (fast?.grid) return { q: fast.grid.q, values: fast.grid.values, re: fast.re, im: fast.im, norm: fast.norm, error: fast.error, stopped: null, samplePeak: fast.peak };
  const k = maxWaveNumber(basis, levels, window);
  const width = window[1] - window[0];
  // k h = PANEL_PHASE for the highest level on each 20-point panel; the doubling below confirms it.
  let panels = Math.max(16, Math.ceil((k * width) / (2 * PANEL_PHASE)), breakpoints.length + 1);
  const maxPanels = Math.max(16, Math.floor(options.maxGridPoints / ORDER));
  // A first grid already above the cap is capped too, and says so.
  const wanted = panels;
  panels = Math.min(panels, maxPanels);
  const first = panels;
  // After the transform (its coefficients checked against the state between its samples, boxTransform.ts)
  // a grid serves only the norm, the energy integrals, the parity and the peaks: one sized to the state,
  // not to the basis (transformGrids.ts).
  const served = fast && transformGrids(state, window, breakpoints, first, options.budget, { quadrature: quadratureFor, checkFinite, integrateAbs2 });
  if (fast && served) return { ...served, re: fast.re, im: fast.im, error: fast.error, stopped: null, samplePeak: fast.peak };
  // A smooth state on the whole line (the oscillator): the trapezoid rule with its nested half grid
  // (lineTrapezoid.ts) replaces the projection and its check grid; the first grid checks it, then serves the rest.
  let line = fast || breakpoints.length > 0 ? null : lineTrapezoid(state, basis, levels, window, k, { maxNodes: Math.min(options.maxGridPoints, 1 << 18), negligible: NEGLIGIBLE, budget: options.budget });
  const budget = options.budget;
  let prev: Expanded | null = null;
  const timed = Number.isFinite(budget.limitMs);
  for (;;) {
    const t0 = timed ? budget.clock.now() : 0;
    const q = line ? lineGrid(basis, line, window, { order: ORDER, panelPhase: PANEL_PHASE, waveNumber: (span) => maxWaveNumber(basis, levels, span) }) : quadratureFor(window, breakpoints, first, panels / first);
    const values = state.evaluate(q.x, 2);
    checkFinite(q.x, values);
    budget.count(q.x.length, q.x.length);
    const norm = integrateAbs2(q, values);
    if (line) {
      if (lineCheck(basis, q, values, line, norm, NEGLIGIBLE)) return { q, values, re: line.re, im: line.im, norm, error: line.error, stopped: null };
      // The check failed: project on the whole window's grid as before.
      line = null;
      continue;
    }
    const c = fast ?? projectWithin(basis, q, values, levels, budget);
    if (c === null) return prev ? { ...prev, stopped: budget.reason } : { q, values, re: new Float64Array(0), im: new Float64Array(0), norm, error: new Float64Array(0), stopped: budget.reason };
    const cur: Expanded = { q, values, re: c.re, im: c.im, norm, error: fast ? fast.error : differences(prev, c, levels, NEGLIGIBLE * Math.sqrt(norm)), stopped: null };
    // The trapezoid norm of the transform's samples (other points, another rule) confirms the first grid as a second grid would.
    if (fast && prev === null && normsAgree(fast.norm, norm)) return { ...cur, samplePeak: fast.peak };
    if (prev && agree(prev, cur, levels)) return cur;
    if (prev === null && !fast && wanted <= maxPanels) {
      const checked = coarseCheck(state, basis, levels, window, breakpoints, first, budget, cur);
      if (checked) return checked;
    }
    if (panels * 2 > maxPanels) return { ...cur, stopped: (prev !== null || (fast === null && wanted > maxPanels)) ? 'cap' : null };
    if (budget.expired()) return { ...cur, stopped: budget.reason };
    // The next grid has twice the nodes, so about twice this one's work: when that would end past the
    // deadline it is not started (the result then says 'time'); a result not stopped has the same grids
    // on any machine.
    if (timed && 2 * (budget.clock.now() - t0) > budget.remaining()) return { ...cur, stopped: 'time' };
    prev = cur;
    panels *= 2;
  }
}

/**
 * The first grid checked against a coarser one (k h = COARSE_PHASE instead of PANEL_PHASE, about 0.77 of
 * its nodes) rather than a doubled one (twice its nodes): Gauss-Legendre converges faster than any power
 * here, so the coarse grid's error bounds the first's, and their difference is the estimate. The first
 * grid with that estimate when the two agree as two grids must; null otherwise (the doubling goes on).
 */
function coarseCheck(
  state: StateFunction,
  basis: Eigenbasis,
  levels: number,
  window: [number, number],
  breakpoints: number[],
  first: number,
  budget: Budget,
  cur: Expanded,
): Expanded | null {
  const panels = Math.max(1, Math.floor((first * PANEL_PHASE) / COARSE_PHASE));
  const q = quadratureFor(window, breakpoints, panels, 1);
  // A piece with as many nodes on both grids (one panel next to a spike) would agree with itself.
  if (!fewerOnEveryPiece(q.x, cur.q.x, breakpoints)) return null;
  const values = state.evaluate(q.x, 0);
  checkFinite(q.x, values);
  budget.count(q.x.length, q.x.length);
  const c = projectWithin(basis, q, values, levels, budget);
  if (c === null) return null;
  const coarse = { ...cur, q, values, re: c.re, im: c.im, norm: integrateAbs2(q, values) };
  if (!agree(coarse, cur, levels)) return null;
  return { ...cur, error: differences(coarse, cur, levels, NEGLIGIBLE * Math.sqrt(cur.norm)) };
}

/** True when the coarse nodes are fewer than the fine ones between every two breakpoints (both ascending). */
function fewerOnEveryPiece(coarse: Float64Array, fine: Float64Array, breakpoints: number[]): boolean {
  let i = 0;
  let j = 0;
  for (let piece = 0; piece <= breakpoints.length; piece++) {
    const end = piece < breakpoints.length ? breakpoints[piece]! : Infinity;
    let nc = 0;
    let nf = 0;
    while (i < coarse.length && coarse[i]! < end) (i++, nc++);
    while (j < fine.length && fine[j]! < end) (j++, nf++);
    if (nf > 0 && nc >= nf) return false;
  }
  return true;
}

/**
 * |c_k(this grid) - c_k(previous grid)| + floor for each level (Infinity without a previous grid); the
 * floor covers the nodes left out (NEGLIGIBLE sqrt(norm)) and the rounding of the sums.
 */
function differences(prev: Expanded | null, c: { re: Float64Array; im: Float64Array }, levels: number, floor: number): Float64Array {
  const out = new Float64Array(levels).fill(Infinity);
  if (prev) for (let j = 0; j < levels; j++) out[j] = Math.hypot(prev.re[j]! - c.re[j]!, prev.im[j]! - c.im[j]!) + floor;
  return out;
}

/** Two grids agree when every coefficient and the norm differ by at most 1e-12 of sqrt(norm) (or 1e-13 of the norm). */
function agree(prev: Expanded, cur: Expanded, levels: number): boolean {
  let diff = Math.abs(prev.norm - cur.norm);
  for (let j = 0; j < levels; j++) diff = Math.max(diff, Math.hypot(prev.re[j]! - cur.re[j]!, prev.im[j]! - cur.im[j]!));
  const norm = Math.max(cur.norm, 1e-300);
  return diff <= 1e-12 * norm ** 0.5 || diff <= 1e-13 * norm;
}

/** Two norms agree as two grids must (`agree`): within 1e-12 of sqrt(norm) or 1e-13 of the norm. */
function normsAgree(a: number, b: number): boolean {
  const d = Math.abs(a - b);
  const norm = Math.max(b, 1e-300);
  return d <= 1e-12 * norm ** 0.5 || d <= 1e-13 * norm;
}

/** Left and right values and slopes of the state at interior breakpoints: jumps and kinks. */
export function classifyBreakpoints(
  state: StateFunction,
  window: [number, number],
  scale: { psi: number; dpsi: number },
): { jumps: number[]; kinks: number[] } {
  const jumps: number[] = [];
  const kinks: number[] = [];
  const pts = state.jumpCandidates ? state.jumpCandidates(window[0], window[1]) : stateBreakpoints(state, window[0], window[1]);
  if (state.walls) for (const w of state.walls) if (w > window[0] && w < window[1]) pts.push(w);
  if (pts.length === 0) return { jumps, kinks };
  const h = 1e-7 * (window[1] - window[0]);
  const xs = new Float64Array(pts.length * 2);
  pts.forEach((x, i) => {
    xs[2 * i] = x - h;
    xs[2 * i + 1] = x + h;
  });
  const v = state.evaluate(xs, 1);
  pts.forEach((x, i) => {
    // The change across the point less what the one-sided slopes account for over 2h (trapezoid), so a
    // kink (psi' jumping, as at an interface of two masses) in a wide window is not taken for a jump.
    const dv = Math.hypot(
      v.re[2 * i + 1]! - v.re[2 * i]! - h * (v.d1re![2 * i + 1]! + v.d1re![2 * i]!),
      v.im[2 * i + 1]! - v.im[2 * i]! - h * (v.d1im![2 * i + 1]! + v.d1im![2 * i]!),
    );
    const dd = Math.hypot(v.d1re![2 * i + 1]! - v.d1re![2 * i]!, v.d1im![2 * i + 1]! - v.d1im![2 * i]!);
    if (dv > 1e-5 * scale.psi) jumps.push(x);
    else if (dd > 1e-4 * scale.dpsi) kinks.push(x);
  });
  return { jumps, kinks };
}

/**
 * <H> and <H^2> of the state on the grid: <H> = integral of |psi'|^2/(2m) + V |psi|^2,
 * <H^2> = integral of |-psi''/(2m) + V psi|^2 (valid for states in the operator's domain; the caller
 * decides divergence from jumps, kinks and wall values). Divided by the norm.
 */
export function gridEnergy(basis: Eigenbasis, q: Quadrature, v: GridValues, norm: number): { mean: number; meanSquare: number } {
  // A mass that depends on x (physics/massEnergy.ts).
  if (basis.masses) return massGridEnergy(basis, q, v, norm);
  let t = 0;
  let h2 = 0;
  const m = basis.mass;
  // Numerical systems evaluate V once for the whole grid instead of once per node.
  const pot = basis.potentials ? basis.potentials(q.x) : null;
  for (let j = 0; j < q.x.length; j++) {
    let V = pot ? pot[j]! : basis.potential(q.x[j]!);
    if (!Number.isFinite(V)) V = 0;
    const w = q.w[j]!;
    const r = v.re[j]!;
    const i = v.im[j]!;
    t += w * ((v.d1re![j]! ** 2 + v.d1im![j]! ** 2) / (2 * m) + V * (r * r + i * i));
    const hr = -v.d2re![j]! / (2 * m) + V * r;
    const hi = -v.d2im![j]! / (2 * m) + V * i;
    h2 += w * (hr * hr + hi * hi);
  }
  return { mean: t / norm, meanSquare: h2 / norm };
}

/**
 * Decay of |c_n| fitted over the tail, for systems whose levels are sine-like (box, potential).
 * `unresolved` is a thermal sum's share left out, which bounds the error of every P_n: only weights
 * a hundred times larger (resolved to about 1 %) are fitted.
 */
export function decayOf(basis: Eigenbasis, weights: Float64Array, unresolved = 0): DecayResult | null {
  if (basis.kind === 'well' || weights.length < 12) return null;
  const labels = new Float64Array(weights.length);
  for (let k = 0; k < labels.length; k++) labels[k] = k + basis.firstLabel;
  const f = fitDecay(labels, weights, { block: 4, floor: Math.max(1e-28, 100 * unresolved) });
  let classification = f.classification as 'jump' | 'kink' | 'smooth' | 'algebraic' | 'unknown';
  // Weights that grow along the tail (a box-quantised continuum, say) have no decay law to report.
  if (f.exponent !== null && !(f.exponent > 0)) return { exponent: null, classification: 'unknown', at: null, rate: null, range: null };
  // The jump and kink laws (1/n, 1/n^2) are those of sine-like levels between hard walls; on the line
  // (the oscillator) a slow decay is only algebraic.
  if (basis.walls === null && (classification === 'jump' || classification === 'kink')) classification = 'algebraic';
  return { exponent: f.exponent ?? null, classification, at: null, rate: f.rate, range: f.range };
}
