/**
 * The energy eigenbasis of any potential V(x) between hard walls at a and b, solved with the sine DVR
 * (dvr.ts) on a grid chosen automatically and confirmed by solving at two sizes.
 */
import type { Eigenbasis } from './types';
import type { Budget, StopReason } from './budget';
import { freeBudget } from './freeBudget';
import { firstGridSize, scanPotential, evalV } from './potentialScan';
import { coarseFunctions, JUMP_ORDER, levelScale, refine, roundingFloor, type RefineSetup } from './potentialRefine';
import { emptyBasis, fixSigns, makeBasis } from './potentialView';
import type { SineDvrSolution } from './dvr';
import { fixMassSigns, massBasis, massSetup, type MassProfile, type MassSolution } from './massProfile';

/** A vectorised potential: V at every x of the array, in internal units. */
export type PotentialFn = (xs: Float64Array) => Float64Array;

/** Options of `potentialBasis`, with their defaults. */
export interface PotentialOptions {
  /** Relative energy tolerance each level must meet between two grid sizes (default 1e-9). */
  tolerance?: number;
  /** Cap on the number of grid intervals N (default 4096). */
  maxPoints?: number;
  /** Fewest grid intervals tried (default 32). */
  minPoints?: number;
  /** Grid points per shortest local wavelength for the first size (default 2.5; 2 is the sampling limit). */
  pointsPerWavelength?: number;
  /** Factor between successive grid sizes (default 1.5). */
  growth?: number;
  /** Relative tolerance of the mirror test V(a + b - x) = V(x) (default 1e-12). */
  symmetryTolerance?: number;
  /** Samples of V used to estimate wavelengths, find jumps and test symmetry (default 4096). */
  samples?: number;
  /** Size of the last grid when convergence is algebraic and the tolerance is out of reach (default 512, at least 2 N, at most the cap). */
  algebraicPoints?: number;
  /**
   * Cap on the eigensolver's work per solve, 4/3 n^3 flops summed over blocks (default 4e9, about 2-3 s on
   * an idle core): it lowers the grid cap to about 1440 points for a potential without symmetry, 2290 with it.
   * A budget with a time limit above 10 s raises this cap in proportion and `maxPoints` by the cube
   * root of the same factor (`capRaise`).
   */
  maxWork?: number;
  /**
   * The analysis's budget (default: unlimited). Polled before every solve after the first; once it has
   * expired no further solve starts, the levels not yet resolved are reported unresolved, and `stopped`
   * says why. Each solve's flops (`sineDvrWork`) and grid points are counted on it. Grid sizes never
   * depend on the clock: they follow from V, the levels and the options alone.
   */
  budget?: Budget;
  /**
   * A mass that depends on x (default none: the constant `mass`). The kinetic operator is then
   * -(1/2) d/dx (1/m(x)) d/dx, solved in the sines of the mass coordinate (massProfile.ts); the basis has
   * `masses`, and `mass` stays the file's default.
   */
  massProfile?: MassProfile;
}

/** What V does towards a wall (see `PotentialBasisResult.wallTrend`). */
export type WallTrend = 'rises' | 'levels' | 'falls';

/** Something the solver wants the analysis to know. */
export interface PotentialNote {
  /**
   * `evaluation`: V gave NaN, -Infinity or the wrong length (no basis built); `input`: bad a, b, mass or
   * levels; `cap`: the grid cap stopped refinement short; `clamped`: +Infinity values were replaced by a
   * wall far above the spectrum; `walls`: levels lie above V at both ends (wall-quantised continuum);
   * `jumps`: V jumps, so convergence is algebraic; `mass`: the mass profile is bad or not resolved
   * (massProfile.ts).
   */
  kind: 'evaluation' | 'input' | 'cap' | 'clamped' | 'walls' | 'jumps' | 'mass';
  message: string;
  /** A position the note is about (first bad x, first jump), if any. */
  at?: number;
}

/** The result of `potentialBasis`. */
export interface PotentialBasisResult {
  basis: Eigenbasis;
  /** Grid intervals N of the basis returned (N - 1 interior points, N - 1 sine terms). */
  points: number;
  /** Label n (1-based) of the first level not resolved to the tolerance, or null when all are. */
  unresolved: number | null;
  /** Indices (0-based) of levels above min(V(a+), V(b-)): artefacts of the walls, a box-quantised continuum. */
  wallLevels: number[];
  /**
   * For each entry of `wallLevels`, the end(s) whose potential the level exceeds. 'both': above V at both
   * walls, unbound on both sides without them. 'left' or 'right': above V only at that end, which is either
   * a deliberate wall (V = F x with a wall at 0) or a continuum open on that side (Morse above D); the
   * solver cannot tell which the user meant.
   */
  wallEnds: ('left' | 'right' | 'both')[];
  /**
   * The documented rule, in one place: indices (0-based, ascending) of the levels above the potential at
   * both walls, E_k > V(a+) and E_k > V(b-). Without the walls such a level would be unbound on both
   * sides (or, where V rises on, bound by V beyond the interval): either way the walls, not V, quantise
   * it. A level above V at one wall only (a deliberate wall under a ramp, Morse above D on one side) is
   * not wall-only; `wallEnds` tells those apart. The analysis labels these levels `continuum`.
   */
  wallOnly: number[];
  /**
   * What V does towards each wall, from V at the wall against V a tenth of the interval inside (relative
   * tolerance 1e-6 of the potential's scale): 'rises' (a quartic: the wall truncates a potential that
   * goes on rising), 'levels' (levels off: Morse towards dissociation, a flat step), 'falls' (V drops
   * towards the wall). For wording only; `wallOnly` does not depend on it.
   */
  wallTrend: { left: WallTrend; right: WallTrend };
  notes: PotentialNote[];
  /**
   * Grid sizes solved, ascending (for benchmarks and reports): the last is the grid of the basis returned
   * and the one before it the grid it was checked against.
   */
  sizes: number[];
  /**
   * The basis on the next-to-last grid of `sizes`, kept from the climb (absent with one size): the same
   * as a solve capped at that size, for the coefficients' uncertainties. Its `uncertainty` is not estimated (zeros).
   * Built on first read (a grid the climb solved for its energies only is solved again with its
   * functions then); undefined when the budget runs out inside that solve.
   */
  coarse?: Eigenbasis;
  /**
   * Why refinement stopped short of the tolerance: 'time' or 'cancelled' (the budget expired before a
   * solve the tolerance needed), 'cap' (the grid or work cap, or the rounding floor of double precision
   * above the tolerance), or null when every level asked for met the tolerance. The notes say the same
   * in words (kind 'cap').
   */
  stopped: StopReason | null;
  /**
   * The grid sizes behind `unresolved`, for its wording: `wanted`, the first grid the levels asked for
   * would get without the caps (`pointsPerWavelength` at the top level; null with a mass profile), and
   * the cap with its words (`capWhy`, e.g. "the work cap of 4e+9 flops (2289 points)"), and the first
   * note of kind 'cap' (null without one).
   */
  grid?: { wanted: number | null; cap: number; capWhy: string; note: string | null };
}

const DEFAULTS = {
  tolerance: 1e-9,
  maxPoints: 4096,
  minPoints: 32,
  pointsPerWavelength: 2.5,
  growth: 1.5,
  symmetryTolerance: 1e-12,
  samples: 4096,
  algebraicPoints: 512,
  maxWork: 4e9,
};

const BAD_GRID = 'The potential gave NaN or -Infinity on the solver grid, or values too large for the solver.';

/**
 * The lowest `levels` eigenpairs of H = -1/(2m) d^2/dx^2 + V(x) with hard walls at a and b (hbar = 1).
 *
 * Method: the sine DVR (Colbert & Miller, J. Chem. Phys. 96, 1982 (1992)). The first grid gives
 * `pointsPerWavelength` points per shortest local wavelength 2 pi / sqrt(2 m (E_K - V_min)) at the WKB
 * estimate of the highest level E_K; the grid then grows by `growth` until two successive sizes agree on
 * every level to `tolerance` relative (relative to max(|E|, 1e-3 (E_K - V_min)), so levels near E = 0 are
 * judged on the spectrum's scale). The finer solution is returned and the difference is each level's
 * `uncertainty` (a conservative bound while convergence is fast), floored at the rounding error double
 * precision allows for that grid, 4 eps ||H|| (more for blocks above 700: `roundingFloor`), so it is never 0 and never
 * below the true error where the two sizes agree to rounding. For smooth V the error falls
 * exponentially with N. When V jumps (steps, `?:` barriers) the jump is located by bisection and the
 * potential matrix is integrated exactly over panels that end on every jump (interfaces.ts), a Galerkin
 * solve in the same sine basis: the energy error is then O(N^-3) with a steady coefficient, from above
 * (variational; measured in test/physics/potential.test.ts). With the order known, the first comparison
 * predicts the size the tolerance needs; when that exceeds the cap, one last grid of
 * max(2 N, `algebraicPoints`) is solved and its uncertainty is twice the Richardson estimate
 * |E_f - E_c| / ((N_f / N_c)^3 - 1).
 * When V'(wall) != 0 with the level non-negligible at that wall (a wall at 0 with V = F x, a box in a
 * field), the DVR's quadrature has an O(N^-4) endpoint error; its Euler–Maclaurin term is removed with
 * V'(a), V'(b) from one-sided differences (dvr.ts, `wallSlopes`), leaving O(N^-6) (measured: the Airy
 * case reaches 1e-9 with about 300 points instead of 1400). Whenever two successive measured orders
 * agree (algebraic convergence), one predicted size is solved with a Richardson error estimate.
 * The grid is capped by `maxPoints` and by `maxWork` (flops of one solve); `unresolved` then names the
 * first level whose uncertainty exceeds the tolerance. No size depends on the clock; `budget` only
 * stops the climb when it really expires (`stopped`).
 * A symmetric V (mirror test on the samples to `symmetryTolerance`) is split into even and odd blocks.
 * Never throws: bad input or a bad V gives an empty basis and a note.
 */
export function potentialBasis(V: PotentialFn, a: number, b: number, mass: number, levels: number, options: PotentialOptions = {}): PotentialBasisResult {
  const o = { ...DEFAULTS, ...options };
  const budget = options.budget ?? freeBudget();
  const fail = (note: PotentialNote): PotentialBasisResult => failedBasis(V, a, b, mass, levels, note);
  if (!(Number.isFinite(a) && Number.isFinite(b) && b > a) || !(mass > 0 && Number.isFinite(mass))) {
    return fail({ kind: 'input', message: 'The interval must have finite ends a < b and the mass must be positive.' });
  }
  const K = Math.floor(levels);
  if (!(K >= 1)) return fail({ kind: 'input', message: 'At least one level must be asked for.' });
  const L = b - a;
  let scan = scanPotential(V, a, b, o.samples, o.symmetryTolerance);
  if ('kind' in scan) return fail(scan);
  const mp = options.massProfile ? massSetup(options.massProfile, a, b, scan, o.samples, o.symmetryTolerance) : null;
  if (mp && 'kind' in mp) return fail(mp);
  const raise = capRaise(budget);
  const { cap, capWhy } = gridCap(o.maxPoints * Math.cbrt(raise), o.maxWork * raise, scan.symmetric);
  const notes: PotentialNote[] = [];
  if (scan.jumps.length > 0) {
    notes.push({
      kind: 'jumps',
      message: `The potential jumps at ${scan.jumps.length} point(s); energies converge algebraically (about N^-${JUMP_ORDER}), not exponentially.`,
      at: scan.jumps[0].x,
    });
  }
  if (mp) {
    notes.push(...mp.notes);
    scan = mp.scan;
  }
  const N0 = mp ? mp.firstSize(K, o, cap) : firstGridSize(scan, L, mass, K, o, cap);
  const solve = mp ? { solve: (N: number, wall: number) => mp.solve(N, wall, K, V, budget) } : {};
  const setup: RefineSetup = { V, a, b, mass, K, scan, budget, tolerance: o.tolerance, growth: o.growth, algebraicPoints: o.algebraicPoints, cap, capWhy, ...solve };
  const r = refine(setup, N0);
  if (!r.sol && r.expired) {
    // The budget ran out inside the first solve: no levels, and why, as data.
    const grid = { wanted: mp ? null : firstGridSize(scan, L, mass, K, o, Infinity), cap, capWhy, note: null };
    return { ...fail({ kind: 'cap', message: 'The time limit stopped the solver before its first grid was solved.' }), sizes: r.sizes, stopped: r.expired, grid };
  }
  if (!r.sol) return fail({ kind: 'evaluation', message: BAD_GRID });
  const sol = r.sol;
  const count = sol.energies.length;
  const uncertainty = new Float64Array(count);
  let unresolved: number | null = null;
  // Never below what double precision can resolve for this grid (`roundingFloor`).
  const floor = roundingFloor(sol);
  for (let k = 0; k < count; k++) {
    uncertainty[k] = Math.max(k < r.diffs.length ? r.diffs[k] : Infinity, floor);
    if (unresolved === null && !(uncertainty[k] <= o.tolerance * levelScale(sol.energies, k, scan.vmin))) unresolved = k + 1;
  }
  if (count < K && unresolved === null) unresolved = count + 1;
  if (r.capNote) notes.push({ kind: 'cap', message: r.capNote });
  // Double precision itself can stop a level short of the tolerance: its floor is above it.
  const byRounding = unresolved !== null && unresolved <= count && floor > o.tolerance * levelScale(sol.energies, unresolved - 1, scan.vmin);
  const stopped: StopReason | null = unresolved === null ? null : r.expired ?? (r.capped || byRounding ? 'cap' : null);
  if (byRounding && !r.expired) {
    notes.push({ kind: 'cap', message: `Double precision resolves level ${unresolved} only to ${floor.toExponential(1)} on ${sol.intervals} grid intervals, above the tolerance.` });
  }
  if (stopped === 'time' || stopped === 'cancelled') {
    notes.push({ kind: 'cap', message: `The time limit stopped refinement before level ${unresolved} met the tolerance.` });
  } else if (stopped === 'cap' && !r.capNote && !byRounding) {
    notes.push({ kind: 'cap', message: `${capWhy.charAt(0).toUpperCase()}${capWhy.slice(1)} stopped refinement before level ${unresolved} met the tolerance.` });
  }
  if (scan.clamped) notes.push({ kind: 'clamped', message: 'The potential is +Infinity in places; those points act as walls.' });
  // Sign convention: positive at the first grid point where |phi| exceeds 1e-6 of its maximum.
  if (mp) notes.push(...mp.check(sol as MassSolution));
  if (mp) fixMassSigns(sol as MassSolution, options.massProfile!);
  else fixSigns(sol, budget);
  const walls = wallClassification(V, a, b, sol.energies);
  if (walls.note) notes.push(walls.note);
  const wallTrend = { left: trendTowards(scan.sv, 0, scan.vscale), right: trendTowards(scan.sv, scan.sv.length - 1, scan.vscale) };
  const center = scan.symmetric ? 0.5 * (a + b) : null;
  const basis = mp
    ? massBasis(sol as MassSolution, options.massProfile!, mp.jumps, { a, b, mass, V, center, breakpoints: scan.jumps.map((j) => j.x), energies: sol.energies, uncertainty })
    : makeBasis(sol, a, b, mass, V, center, scan.jumps.map((j) => j.x), sol.energies, uncertainty);
  const out: PotentialBasisResult = { basis, points: sol.intervals, unresolved, wallLevels: walls.wallLevels, wallEnds: walls.wallEnds, wallOnly: walls.wallOnly, wallTrend, notes, sizes: r.sizes, stopped };
  out.grid = { wanted: mp ? null : firstGridSize(scan, L, mass, K, o, Infinity), cap, capWhy, note: notes.find((nt) => nt.kind === 'cap')?.message ?? null };
  if (r.coarse) lazyCoarse(out, r.coarse, setup, { a, b, mass, V, center, breakpoints: scan.jumps.map((j) => j.x) }, budget, mp && { profile: options.massProfile!, jumps: mp.jumps });
  return out;
}

/**
 * `out.coarse` as a view built on first use: its sign fixing and view cost a solve's worth of small
 * work that a caller without coefficient uncertainties never needs. A coarse grid solved for its
 * energies only (the climb's downward check) is solved again with its functions then
 * (`coarseFunctions`: one solve, where a solve capped at that size would climb to it); undefined when
 * the budget runs out inside that solve.
 */
function lazyCoarse(out: PotentialBasisResult, c: SineDvrSolution, setup: RefineSetup, ...rest: [Parameters<typeof coarseView>[1], Budget, Parameters<typeof coarseView>[3]]): void {
  let view: Eigenbasis | undefined;
  let tried = false;
  const build = (): Eigenbasis | undefined => {
    if (tried) return view;
    tried = true;
    const sol = c.coefficients.length === 0 && c.energies.length > 0 ? coarseFunctions(setup, c.intervals) : c;
    view = sol ? coarseView(sol, ...rest) : undefined;
    return view;
  };
  Object.defineProperty(out, 'coarse', { get: build, enumerable: true, configurable: true });
}

/** The next-to-last grid's solution as a basis, with the sign convention and view of the fine one. */
function coarseView(
  c: SineDvrSolution,
  at: { a: number; b: number; mass: number; V: PotentialFn; center: number | null; breakpoints: number[] },
  budget: Budget,
  mass: { profile: MassProfile; jumps: Parameters<typeof massBasis>[2] } | null,
): Eigenbasis {
  const zeros = new Float64Array(c.energies.length);
  if (!mass) {
    fixSigns(c, budget);
    return makeBasis(c, at.a, at.b, at.mass, at.V, at.center, at.breakpoints, c.energies, zeros);
  }
  fixMassSigns(c as MassSolution, mass.profile);
  return massBasis(c as MassSolution, mass.profile, mass.jumps, { ...at, energies: c.energies, uncertainty: zeros });
}

/** The result of a solve that could not start or finish its first grid: an empty basis and why. */
function failedBasis(V: PotentialFn, a: number, b: number, mass: number, levels: number, note: PotentialNote): PotentialBasisResult {
  return {
    basis: emptyBasis(a, b, mass, V),
    points: 0,
    unresolved: levels >= 1 ? 1 : null,
    wallLevels: [],
    wallEnds: [],
    wallOnly: [],
    wallTrend: { left: 'levels', right: 'levels' },
    notes: [note],
    sizes: [],
    stopped: null,
  };
}

/**
 * The time limit the caps are sized for: the analysis's default of 10 s (`maxWork` is about 2-3 s of
 * one solve on an idle core).
 */
export const CAP_LIMIT_MS = 10_000;

/**
 * How far a raised time limit raises the caps: limit / `CAP_LIMIT_MS` for a finite limit above it (the
 * work cap by that factor, the point cap by its cube root, since a solve costs n^3), else 1. A function
 * of the limit the budget was made with, never of a clock reading, so a grid size still follows from V,
 * the levels and the options alone. Without a time limit the default caps hold.
 */
export function capRaise(budget: Budget): number {
  const limit = budget.limitMs;
  return Number.isFinite(limit) && limit > CAP_LIMIT_MS ? limit / CAP_LIMIT_MS : 1;
}

/**
 * The largest grid: `maxPoints`, lowered so one solve stays within `maxWork` flops (4/3 n^3 per block of
 * size n: N for one block, N/2 for each of two).
 */
function gridCap(maxPoints: number, maxWork: number, symmetric: boolean): { cap: number; capWhy: string } {
  const pointCap = Math.max(8, Math.floor(maxPoints));
  const workCap = symmetric ? Math.floor(2 * Math.cbrt((3 * maxWork) / 8)) : Math.floor(Math.cbrt((3 * maxWork) / 4));
  const cap = Math.max(8, Math.min(pointCap, workCap));
  const capWhy = cap < pointCap ? `the work cap of ${maxWork.toExponential(0)} flops (${cap} points)` : `the grid cap of ${cap} points`;
  return { cap, capWhy };
}

/**
 * Levels above the potential at one or both ends (`wallLevels`, `wallEnds`) and at both (`wallOnly`),
 * with the solver's note about the latter. V at the ends is read 1e-9 L inside each wall.
 */
function wallClassification(
  V: PotentialFn,
  a: number,
  b: number,
  energies: Float64Array,
): { wallLevels: number[]; wallEnds: ('left' | 'right' | 'both')[]; wallOnly: number[]; note: PotentialNote | null } {
  const L = b - a;
  const ends = evalV(V, Float64Array.of(a + 1e-9 * L, b - 1e-9 * L));
  const wallLevels: number[] = [];
  const wallEnds: ('left' | 'right' | 'both')[] = [];
  const wallOnly: number[] = [];
  if (!ends) return { wallLevels, wallEnds, wallOnly, note: null };
  const [va, vb] = [ends[0], ends[1]];
  for (let k = 0; k < energies.length; k++) {
    const e = energies[k];
    if (!(e > Math.min(va, vb))) continue;
    const both = e > va && e > vb;
    wallLevels.push(k);
    wallEnds.push(both ? 'both' : e > va ? 'left' : 'right');
    if (both) wallOnly.push(k);
  }
  const note: PotentialNote | null =
    wallOnly.length > 0
      ? {
          kind: 'walls',
          message: `${wallOnly.length} level(s) from n = ${wallOnly[0] + 1} lie above the potential at both walls (V = ${va} at the left, ${vb} at the right): the walls quantise them, not the potential.`,
        }
      : null;
  return { wallLevels, wallEnds, wallOnly, note };
}

/** What the samples do towards the wall at sample `end` (0 or the last): see `wallTrend`. */
function trendTowards(sv: Float64Array, end: number, vscale: number): WallTrend {
  const inner = end === 0 ? Math.floor(sv.length / 10) : sv.length - 1 - Math.floor(sv.length / 10);
  const tol = 1e-6 * Math.max(vscale, Number.MIN_VALUE);
  const d = sv[end] - sv[inner];
  if (!Number.isFinite(d)) return sv[end] === Infinity ? 'rises' : 'falls';
  return d > tol ? 'rises' : d < -tol ? 'falls' : 'levels';
}
