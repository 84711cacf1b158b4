/**
 * Grid refinement of the potential solver (potential.ts): solves at growing sizes until two agree on
 * every level, with a Richardson step when convergence is algebraic. Every size follows from V, the
 * levels and the options alone (flop counts against the work cap, never a measured time). Before each
 * solve the budget is asked whether it has run out or would run out during that solve (its work at the
 * last solve's measured rate); only then does the climb stop early, and `stopped` says 'time'.
 */
import { charge, Stopped, type Budget, type StopReason } from './budget';
import type { PotentialFn } from './potential';
import { evalV, type PotentialScan } from './potentialScan';
import { sineDvrGrid, sineDvrSolve, sineDvrWork, type SineDvrSolution } from './dvr';
import { cosineMoments, cosineMomentsWork, interfaceGrid } from './interfaces';

/** What one refinement needs. */
export interface RefineSetup {
  V: PotentialFn;
  a: number;
  b: number;
  mass: number;
  /** Levels asked for. */
  K: number;
  scan: PotentialScan;
  budget: Budget;
  tolerance: number;
  growth: number;
  algebraicPoints: number;
  /** Largest grid allowed (grid cap and work cap), and the words for it. */
  cap: number;
  capWhy: string;
  /** A solve of N intervals that replaces the sine DVR and Galerkin ones (a position-dependent mass, massProfile.ts). */
  solve?: (N: number, wall: number) => SineDvrSolution | null;
  /** The last solve's cost on the budget's clock and in counted work (set by `solveAt`; see `wouldOverrun`). */
  lastSolve?: { ms: number; work: number };
  /** Set by `solveAt` when the budget ran out inside a solve (which then returns null). */
  stoppedBy?: StopReason;
  /** The last two finished solves, oldest first (set by `solveAt`; see `Refined.coarse`). */
  solved?: { N: number; sol: SineDvrSolution }[];
}

/** The outcome of `refine`. */
export interface Refined {
  /** The finest solution (null when V failed on a solver grid). */
  sol: SineDvrSolution | null;
  /** Per level of `sol`: the two-size (or Richardson) estimate of its error; Infinity where none exists. */
  diffs: Float64Array;
  sizes: number[];
  /** The grid cap ended the climb (whether or not every level met the tolerance). */
  capped: boolean;
  /** The budget ran out before a solve the tolerance needed. */
  expired: StopReason | null;
  /** A note on algebraic convergence stopped by the cap, when one applies. */
  capNote: string | null;
  /**
   * The solution at the next-to-last size of `sizes` (null with fewer than two), kept from the climb:
   * exactly what a solve capped at that size returns, so the coefficients' uncertainties
   * (analysis/coefficientErrors.ts) need no second climb.
   */
  coarse?: SineDvrSolution | null;
}

/**
 * Order of the energy error for a V with jumps, solved by Galerkin in the sine basis with exact moments
 * (`jumpSolve`): the level is C^1 with a jump in phi'' at each step, so its sine coefficients fall as
 * k^-3 and the variational energy error as sum_{k > N} k^2 k^-6 ~ N^-3 (derived; measured in
 * test/physics/potential.test.ts).
 */
export const JUMP_ORDER = 3;

/** V on xs with +Infinity replaced by `wall` (far above the spectrum of N intervals); null when V fails. */
function clampedV(s: RefineSetup, xs: Float64Array, wall: number): Float64Array | null {
  const vv = evalV(s.V, xs);
  if (!vv) return null;
  for (let i = 0; i < vv.length; i++) {
    if (vv[i] === Infinity) vv[i] = wall;
    else if (!Number.isFinite(vv[i])) return null;
  }
  return vv;
}

/**
 * One solve with N intervals: the sine DVR for a smooth V; for a V with jumps, a Galerkin solve in the
 * same sine basis whose potential matrix is integrated over panels ending on every jump
 * (interfaces.ts), so each jump is a grid point of the integration and no cell straddles it.
 * Null when V fails on the grid, or when the budget runs out inside the solve (which charges the budget
 * its flops as it goes, so it stops within a few milliseconds of the deadline): then `s.stoppedBy` says why.
 */
function solveAt(s: RefineSetup, N: number, valuesOnly = false): SineDvrSolution | null {
  const t0 = s.budget.clock.now();
  const w0 = s.budget.work.ops;
  let sol: SineDvrSolution | null = null;
  try {
    sol = solveOnce(s, N, valuesOnly);
  } catch (err) {
    if (!(err instanceof Stopped)) throw err;
    s.stoppedBy = err.reason;
    return null;
  }
  s.lastSolve = { ms: s.budget.clock.now() - t0, work: s.budget.work.ops - w0 };
  if (sol) s.solved = [...(s.solved ?? []).slice(-1), { N, sol }];
  return sol;
}

/**
 * True when the budget has run out, or when the solve of N intervals would end past the deadline: its
 * counted work scaled by the last solve's measured rate. The clock decides only whether to stop at the
 * time limit (and the result then says `stopped: 'time'`), never what size a finished solve has, so a
 * result that is not stopped is the same on any machine.
 */
function wouldOverrun(s: RefineSetup, N: number): boolean {
  if (s.budget.expired()) return true;
  const last = s.lastSolve;
  const left = s.budget.remaining();
  if (!last || !Number.isFinite(left) || last.work <= 0) return false;
  const work = sineDvrWork(N, s.scan.symmetric);
  return (last.ms * work) / last.work > left;
}

/** Why `wouldOverrun` stopped the climb: the budget's own reason, or the time limit it would have hit. */
function overrunReason(s: RefineSetup): StopReason {
  return s.budget.reason ?? 'time';
}

function solveOnce(s: RefineSetup, N: number, valuesOnly: boolean): SineDvrSolution | null {
  const { a, b, mass, scan } = s;
  const L = b - a;
  const wall = Math.max(scan.vmaxFinite, scan.vmin + (4 * (Math.PI * N) ** 2) / (2 * mass * L * L));
  if (s.solve) return s.solve(N, wall);
  if (scan.jumps.length > 0) return jumpSolve(s, N, wall);
  const vv = clampedV(s, sineDvrGrid(a, b, N), wall);
  if (!vv) return null;
  if (scan.symmetric) {
    for (let i = 0, j = vv.length - 1; i < j; i++, j--) {
      const m = 0.5 * (vv[i] + vv[j]);
      vv[i] = m;
      vv[j] = m;
    }
  }
  s.budget.count(0, N - 1);
  const sol = sineDvrSolve(vv, a, b, mass, s.K, { symmetric: scan.symmetric, wallSlopes: scan.slopes, budget: s.budget, valuesOnly });
  // Values near the floating-point limit overflow the matrix: report, do not return NaN levels.
  return sol.energies.every(Number.isFinite) ? sol : null;
}

/** The Galerkin solve of a V with jumps (see `solveAt`): moments C(q), q < 2N, from the interface grid. */
function jumpSolve(s: RefineSetup, N: number, wall: number): SineDvrSolution | null {
  const grid = interfaceGrid(s.a, s.b, s.scan.jumps.map((j) => j.x), 2 * N);
  const vg = clampedV(s, grid.x, wall);
  if (!vg) return null;
  charge(s.budget, cosineMomentsWork(grid, 2 * N), N - 1 + grid.x.length);
  const moments = cosineMoments(grid, vg, 2 * N);
  let potentialBound = 0;
  for (let i = 0; i < vg.length; i++) potentialBound = Math.max(potentialBound, Math.abs(vg[i]));
  const sol = sineDvrSolve(new Float64Array(N - 1), s.a, s.b, s.mass, s.K, { symmetric: s.scan.symmetric, moments, potentialBound, budget: s.budget });
  return sol.energies.every(Number.isFinite) ? sol : null;
}

/** The scale a level's tolerance is relative to: max(|E_k|, 1e-3 (E_top - V_min)), so levels near 0 are judged on the spectrum's scale. */
export function levelScale(E: Float64Array, k: number, vmin: number): number {
  return Math.max(Math.abs(E[k]), 1e-3 * Math.abs(E[E.length - 1] - vmin), Number.MIN_VALUE);
}

/** |E_fine - E_coarse| per level of `fine` (Infinity beyond the coarse one) and the worst in units of the tolerance. */
function compare(s: RefineSetup, coarse: SineDvrSolution, fine: SineDvrSolution): { diffs: Float64Array; worst: number } {
  const m = Math.min(coarse.energies.length, fine.energies.length);
  const diffs = new Float64Array(fine.energies.length).fill(Infinity);
  let worst = 0;
  for (let k = 0; k < m; k++) {
    diffs[k] = Math.abs(fine.energies[k] - coarse.energies[k]);
    worst = Math.max(worst, diffs[k] / (s.tolerance * levelScale(fine.energies, k, s.scan.vmin)));
  }
  return { diffs, worst };
}

/** Mutable state of the climb. */
interface Climb {
  N: number;
  cur: SineDvrSolution;
  diffs: Float64Array;
  sizes: number[];
  capped: boolean;
  expired: StopReason | null;
  capNote: string | null;
  failed: boolean;
}

/**
 * The climb: sizes grow by `growth` until two successive ones agree on every level to the tolerance.
 * A V with jumps climbs by `jumpClimb` instead. Algebraic convergence (a steady measured order p, or a
 * cap out of reach) ends it with one solve at the size N_f the order predicts, whose uncertainty is twice
 * Richardson's |E_f - E_N| / ((N_f / N)^p - 1) (twice because p is measured); when the prediction
 * exceeds the cap, N_f = min(cap, max(2 N, algebraicPoints)).
 */
export function refine(s: RefineSetup, N0: number): Refined {
  const r = s.scan.jumps.length > 0 ? jumpClimb(s, N0) : climb(s, N0);
  // The solve before the last, when it is the next-to-last size (every finished solve is one size).
  const [before, last] = s.solved ?? [];
  const n = r.sizes.length;
  r.coarse = r.sol && before && last && last.sol === r.sol && n >= 2 && before.N === r.sizes[n - 2] ? before.sol : null;
  // A downward check solved last, for its energies only (`coarseFunctions` adds the functions).
  if (r.sol && before && last && before.sol === r.sol && n >= 2 && last.N === r.sizes[n - 2] && last.sol.coefficients.length === 0) r.coarse = last.sol;
  return r;
}

/**
 * The solution at N with its functions, for a coarse grid the climb solved for its energies only
 * (`downwardCheck`): the same matrix, so the same energies, and exactly the solution a solve capped at
 * N returns. Null when V fails or the budget runs out inside the solve.
 */
export function coarseFunctions(s: RefineSetup, N: number): SineDvrSolution | null {
  return solveAt(s, N);
}

/** The climb of a smooth V (see `refine`). */
function climb(s: RefineSetup, N0: number): Refined {
  const first = solveAt(s, N0);
  if (!first) return { sol: null, diffs: new Float64Array(0), sizes: [N0], capped: false, expired: s.stoppedBy ?? null, capNote: null };
  const sizes = [N0];
  if (!s.solve && N0 >= DOWNWARD_FROM) {
    const down = downwardCheck(s, first, N0, sizes);
    if (down) return down;
  }
  const c: Climb = { N: N0, cur: first, diffs: new Float64Array(0), sizes, capped: N0 >= s.cap, expired: null, capNote: null, failed: false };
  let prev = first;
  let prevWorst: { ratio: number; N: number } | null = null;
  let prevOrder: number | null = null;
  let prevN = N0;
  while (c.N < s.cap) {
    const N1 = Math.min(s.cap, Math.ceil(c.N * s.growth));
    if (wouldOverrun(s, N1)) {
      c.expired = overrunReason(s);
      break;
    }
    const next = solveAt(s, N1);
    if (!next && s.stoppedBy) {
      c.expired = s.stoppedBy;
      break;
    }
    if (!next) return { ...c, sol: null };
    c.sizes.push(N1);
    c.sizes.sort((p, q) => p - q);
    const { diffs, worst } = compare(s, prev, next);
    c.diffs = diffs;
    c.cur = next;
    c.N = N1;
    if (worst <= 1) break;
    if (c.N >= s.cap) {
      c.capped = true;
      break;
    }
    if (!s.solve && worst <= CHECK_WORTH) {
      const down = downwardCheck(s, next, N1, c.sizes);
      if (down) return down;
    }
    if (prevWorst && worst < prevWorst.ratio) {
      const p = Math.log(prevWorst.ratio / worst) / Math.log(c.N / prevWorst.N);
      const steady = prevOrder !== null && Math.abs(p - prevOrder) <= 0.15 * p;
      prevOrder = p;
      // worst ~ the error of the coarser size prevN in units of the tolerance.
      const need = prevN * Math.pow(4 * worst, 1 / p);
      const outOfReach = p > 0 && p < 12 && need > s.cap;
      if (p > 0 && p < 12 && (steady || outOfReach)) {
        richardsonStep(s, c, p, need, outOfReach);
        break;
      }
    }
    prevN = c.N;
    prevWorst = { ratio: worst, N: c.N };
    prev = next;
  }
  return c.failed ? { ...c, sol: null } : { ...c, sol: c.cur };
}

/**
 * A first grid from this size on is checked downward (`downwardCheck`) before any finer grid: a climb
 * from it to 1.5 N0 would cost 3.4 first solves. Smaller first grids climb first (their first step
 * usually settles the levels, where a check grid at N0 / 1.2 would often miss the tolerance and add a
 * solve); a later grid is checked downward whenever its upward comparison fails.
 */
export const DOWNWARD_FROM = 1024;

/**
 * A grid whose upward comparison failed is checked downward only when that comparison missed the
 * tolerance by at most this factor. Measured (quartic, double well, two Morse wells, a tilted
 * oscillator; 10 to 200 levels, N = 40 to 1,264): the check's worst level, in units of the tolerance,
 * was 0.7 to 0.93 times the failed upward one, so a check after a miss by more than about 1.4 never
 * passed; each one cost a solve for nothing (three of eight solves in the double well of 30 levels).
 * Only the cost depends on it: a skipped check climbs, as every grid did before the check existed.
 */
export const CHECK_WORTH = 2;

/** The coarser grid of `downwardCheck`: the grid checked over this ratio. */
export const CHECK_RATIO = 1.2;

/**
 * The factor on |E(N) - E(N / CHECK_RATIO)| that `downwardCheck` states as the uncertainty: an error
 * falling as N^-p leaves err(N) = |E(N) - E(Nc)| / (1.2^p - 1), at most 4 |E(N) - E(Nc)| for every
 * order p >= 1.3 (exponential convergence included), where the climb's own finer grid (1.5 N, the
 * difference stated as it is) covers p >= 1.71 (derived in this comment).
 */
export const CHECK_FACTOR = 4;

/**
 * Checks the grid N just solved against the coarser Nc = N / `CHECK_RATIO`, solved for its energies
 * only, instead of climbing to the finer 1.5 N with its eigenvectors (3.4 times the cost of N: Nc costs
 * about 0.58 of it). When every level's stated uncertainty `CHECK_FACTOR` |E(N) - E(Nc)| (floored as
 * always at double precision's own limit, `roundingFloor`) meets the tolerance, the grid N is returned
 * with it. test/physics/gridContract.test.ts holds it to the contract (no level's true error above its
 * stated uncertainty) on closed forms, the oscillator, half oscillator, Poeschl-Teller, Morse and Airy
 * levels at tolerances 1e-6 to 1e-12, first grids on both sides of where the levels settle included:
 * measured: true errors at most 0.39 of the stated uncertainty on grids confirmed this way. Returns the result (or the budget's stop,
 * with N and its levels unresolved), or null when the climb must go on upward (Nc then stays in the
 * ascending `sizes`).
 */
function downwardCheck(s: RefineSetup, sol: SineDvrSolution, N: number, sizes: number[]): Refined | null {
  const Nc = Math.max(8, Math.ceil(N / CHECK_RATIO));
  if (!(Nc < N) || sizes.includes(Nc)) return null;
  const stop = (reason: StopReason): Refined => ({ sol, diffs: new Float64Array(0), sizes: [...sizes], capped: false, expired: reason, capNote: null });
  if (wouldOverrun(s, Nc)) return stop(overrunReason(s));
  const check = solveAt(s, Nc, true);
  if (!check) return s.stoppedBy ? stop(s.stoppedBy) : null;
  sizes.push(Nc);
  sizes.sort((p, q) => p - q);
  const { diffs } = compare(s, check, sol);
  let worst = 0;
  for (let k = 0; k < diffs.length; k++) {
    diffs[k] *= CHECK_FACTOR;
    worst = Math.max(worst, diffs[k] / (s.tolerance * levelScale(sol.energies, k, s.scan.vmin)));
  }
  // The returned grid is the last of the sizes, its check grid the one before it.
  if (worst <= 1) return { sol, diffs, sizes: [...sizes.filter((n) => n !== N), N], capped: false, expired: null, capNote: null };
  return null;
}

/** The last solve of an algebraic climb at the predicted size, with Richardson's uncertainty. */
function richardsonStep(s: RefineSetup, c: Climb, p: number, need: number, outOfReach: boolean): void {
  const Nf = outOfReach ? Math.min(s.cap, Math.max(2 * c.N, Math.floor(s.algebraicPoints))) : Math.min(s.cap, Math.max(Math.ceil(need), Math.ceil(1.25 * c.N)));
  if (outOfReach) {
    c.capped = true;
    c.capNote = `Energies converge as about N^-${p.toFixed(1)}; the tolerance would need about ${Math.ceil(need)} grid points, over ${s.capWhy}; stopped at ${Math.max(c.N, Nf)}.`;
  }
  if (!(Nf > c.N)) return;
  if (wouldOverrun(s, Nf)) {
    c.expired = overrunReason(s);
    return;
  }
  const fin = solveAt(s, Nf);
  if (!fin) {
    if (s.stoppedBy) c.expired = s.stoppedBy;
    else c.failed = true;
    return;
  }
  c.sizes.push(Nf);
  const factor = Math.pow(Nf / c.N, p) - 1;
  const mm = Math.min(c.cur.energies.length, fin.energies.length);
  c.diffs = new Float64Array(fin.energies.length).fill(Infinity);
  for (let k = 0; k < mm; k++) c.diffs[k] = (2 * Math.abs(fin.energies[k] - c.cur.energies[k])) / factor;
  c.cur = fin;
  c.N = Nf;
}

/**
 * The climb for a V with jumps, whose Galerkin energies converge as E(N) = E + A N^-3 + O(N^-4)
 * (`JUMP_ORDER`). Sizes grow by `growth`; from the second size on, each level's energy is Richardson's
 * extrapolation R = E_f + (E_f - E_c) / ((N_f / N_c)^3 - 1) of the last two sizes, whose error is
 * O(N^-4) with a coefficient that wanders with the jump's place among the grid's nodes (measured: the
 * error of R changes sign and is up to 1.4 times the last change of R). Its uncertainty is therefore
 * twice the larger of the last change of R and the change before, scaled down by growth^4 (the
 * envelope of an O(N^-4) sequence): measured 2.8 times the true error or more on steps at 0.3, 0.4321
 * and 0.5 of a box. With only two sizes (the cap), the energy is E_f and its
 * uncertainty twice Richardson's estimate of its own error. The climb stops when every level's
 * uncertainty meets the tolerance, at the cap, when the size the tolerance needs is predicted beyond
 * the cap (once past `algebraicPoints`), or when the budget expires. The levels' functions are
 * those of the finest size; only their energies are extrapolated.
 */
function jumpClimb(s: RefineSetup, N0: number): Refined {
  const sizes = [N0];
  let coarse = solveAt(s, N0);
  const none = { diffs: new Float64Array(0), sizes, capped: false, expired: null, capNote: null };
  if (!coarse) return { sol: null, ...none, expired: s.stoppedBy ?? null };
  let N = N0;
  let extrapolated: Float64Array | null = null;
  let lastChange: Float64Array | null = null;
  const envelope = Math.pow(s.growth, JUMP_ORDER + 1);
  let best: Refined = { sol: coarse, ...none, capped: N0 >= s.cap };
  while (N < s.cap) {
    const N1 = Math.min(s.cap, Math.ceil(N * s.growth));
    if (wouldOverrun(s, N1)) return { ...best, expired: overrunReason(s) };
    const fine = solveAt(s, N1);
    if (!fine && s.stoppedBy) return { ...best, expired: s.stoppedBy };
    if (!fine) return { ...best, sol: null };
    sizes.push(N1);
    const factor = Math.pow(N1 / N, JUMP_ORDER) - 1;
    const m = fine.energies.length;
    const R = new Float64Array(m);
    const diffs = new Float64Array(m).fill(Infinity);
    for (let k = 0; k < m; k++) {
      const change = k < coarse.energies.length ? (fine.energies[k] - coarse.energies[k]) / factor : NaN;
      R[k] = Number.isFinite(change) ? fine.energies[k] + change : fine.energies[k];
      if (extrapolated === null) diffs[k] = 2 * Math.abs(change);
      else if (k < extrapolated.length) diffs[k] = 2 * Math.max(Math.abs(R[k] - extrapolated[k]), lastChange && k < lastChange.length ? lastChange[k] / envelope : 0);
    }
    if (extrapolated !== null) lastChange = R.map((r, k) => (k < extrapolated!.length ? Math.abs(r - extrapolated![k]) : Infinity));
    const sol = extrapolated === null ? fine : { ...fine, energies: R };
    let worst = 0;
    for (let k = 0; k < m; k++) worst = Math.max(worst, diffs[k] / (s.tolerance * levelScale(sol.energies, k, s.scan.vmin)));
    best = { sol, diffs, sizes, capped: N1 >= s.cap && worst > 1, expired: null, capNote: null };
    if (!(worst > 1)) break;
    // Out of reach: the extrapolated energies' uncertainty falls as about N^-(order + 1); when the size it
    // predicts exceeds the cap, stop once past `algebraicPoints` rather than climb to the cap.
    const need = N1 * Math.pow(worst, 1 / (JUMP_ORDER + 1));
    if (extrapolated !== null && need > s.cap && N1 >= s.algebraicPoints) {
      best.capped = true;
      best.capNote = `Energies converge as about N^-${JUMP_ORDER + 1} after extrapolation; the tolerance would need about ${Math.ceil(need)} grid points, over ${s.capWhy}; stopped at ${N1}.`;
      break;
    }
    extrapolated = R;
    coarse = fine;
    N = N1;
  }
  return best;
}

/**
 * The smallest error double precision can promise for a level of `sol`:
 * eps (4 T + 16 W) max(1, n / 700), where ||H|| <= T + W is `normBound`, T = pi^2 n^2 / (2 m L^2) its
 * kinetic part, W = max |V| its potential part, and n the size of the largest block solved (a
 * position-dependent mass keeps 4 eps ||H|| max(1, n / 700)). Why: the eigensolver is backward stable,
 * so each computed level is exact for a matrix H + dH with ||dH|| at most a modest multiple of n eps ||H||
 * (the Householder reduction's bound grows linearly with n; Golub & Van Loan, Matrix Computations,
 * sections 8.3 and 8.4, from memory), and a level of a symmetric matrix moves by at most ||dH|| (Weyl's
 * inequality: every eigenvalue of a symmetric matrix has condition number 1). The potential's part is
 * larger because the matrix's moments C(q) are sums of n terms of size up to W (dvr.ts), rounded before
 * the reduction. Measured on exactly solvable cases (test/physics/potential.test.ts: half oscillator,
 * quartic, oscillator, Poeschl-Teller, 3 to 150 levels, n = 47 to 945: true errors up to 1.2 eps ||H||;
 * p^2 + x^2 with walls far outside the top turning point: 1.0 eps ||H|| at blocks of 394 and 704, 2.1
 * at 852, 4.5 at 1,516), and where W dominates (x^2 / 2 with walls at +-100 to +-300, T / W = 1e-3 to
 * 0.1, blocks of 350 to 1,000): up to 6.8 eps W, which broke the old 4 eps ||H|| in
 * test/physics/gridContract.test.ts; the factors keep a margin of about 2 over both.
 */
export function roundingFloor(sol: SineDvrSolution): number {
  const n = sol.intervals - 1;
  const block = sol.parity.some((p) => p !== 0) ? Math.ceil(n / 2) : n;
  const growth = Math.max(1, block / 700);
  if ('map' in sol) return 4 * Number.EPSILON * sol.normBound * growth;
  const L = sol.b - sol.a;
  const kinetic = Math.min(sol.normBound, (Math.PI * Math.PI * n * n) / (2 * sol.mass * L * L));
  return Number.EPSILON * (4 * kinetic + 16 * (sol.normBound - kinetic)) * growth;
}
