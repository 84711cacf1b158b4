/**
 * Grid refinement of the potential solver (potential.ts): solves at growing sizes until two agree on
 * every level, with a Richardson step when convergence is algebraic. Every size follows from V, the
 * levels and the options alone (flop counts against the work cap, never a measured time); the budget
 * is polled before each solve, and only an expired budget stops the climb early (`stopped`).
 */
import type { Budget, StopReason } from './budget';
import type { PotentialFn } from './potential';
import { evalV, type PotentialScan } from './potentialScan';
import { sineDvrGrid, sineDvrSolve, sineDvrWork, type SineDvrSolution } from './dvr';

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
}

/** Order of the energy error for a V with jumps in the sine DVR with exact jump cells (measured, test/physics/potential.test.ts). */
const JUMP_ORDER = 2;

/** The potential on the solver grid of N intervals, ready for `sineDvrSolve`; null when V fails there. */
function solveAt(s: RefineSetup, N: number): SineDvrSolution | null {
  const { a, b, mass, scan } = s;
  const L = b - a;
  const xs = sineDvrGrid(a, b, N);
  const vv = evalV(s.V, xs);
  if (!vv) return null;
  const h = L / N;
  const wall = Math.max(scan.vmaxFinite, scan.vmin + (4 * (Math.PI * N) ** 2) / (2 * mass * L * L));
  for (let i = 0; i < vv.length; i++) {
    if (vv[i] === Infinity) vv[i] = wall;
    else if (!Number.isFinite(vv[i])) return null;
  }
  const cells: { index: number; at: number; left: number; right: number }[] = [];
  for (const jp of scan.jumps) {
    // The cell [x_i - h/2, x_i + h/2] holding the jump is integrated exactly (dvr.ts, `jumps`).
    const i = Math.round((jp.x - a) / h);
    if (i < 1 || i > vv.length) continue;
    cells.push({ index: i, at: jp.x, left: jp.left === Infinity ? wall : jp.left, right: jp.right === Infinity ? wall : jp.right });
  }
  if (scan.symmetric) {
    for (let i = 0, j = vv.length - 1; i < j; i++, j--) {
      const m = 0.5 * (vv[i] + vv[j]);
      vv[i] = m;
      vv[j] = m;
    }
  }
  s.budget.count(sineDvrWork(N, scan.symmetric), N - 1);
  const sol = sineDvrSolve(vv, a, b, mass, s.K, { symmetric: scan.symmetric, jumps: cells, wallSlopes: scan.slopes });
  // Values near the floating-point limit overflow the matrix: report, do not return NaN levels.
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
 * Algebraic convergence (a steady measured order p, or the known order of a V with jumps, or a cap out
 * of reach) ends it with one solve at the size N_f the order predicts, whose uncertainty is twice
 * Richardson's |E_f - E_N| / ((N_f / N)^p - 1) (twice because p is measured); when the prediction
 * exceeds the cap, N_f = min(cap, max(2 N, algebraicPoints)).
 */
export function refine(s: RefineSetup, N0: number): Refined {
  const first = solveAt(s, N0);
  if (!first) return { sol: null, diffs: new Float64Array(0), sizes: [N0], capped: false, expired: null, capNote: null };
  const c: Climb = { N: N0, cur: first, diffs: new Float64Array(0), sizes: [N0], capped: N0 >= s.cap, expired: null, capNote: null, failed: false };
  let prev = first;
  let prevWorst: { ratio: number; N: number } | null = null;
  let prevOrder: number | null = null;
  let prevN = N0;
  while (c.N < s.cap) {
    if (s.budget.expired()) {
      c.expired = s.budget.reason;
      break;
    }
    const N1 = Math.min(s.cap, Math.ceil(c.N * s.growth));
    const next = solveAt(s, N1);
    if (!next) return { ...c, sol: null };
    c.sizes.push(N1);
    const { diffs, worst } = compare(s, prev, next);
    c.diffs = diffs;
    c.cur = next;
    c.N = N1;
    if (worst <= 1) break;
    if (c.N >= s.cap) {
      c.capped = true;
      break;
    }
    const jumps = s.scan.jumps.length > 0;
    if ((prevWorst && worst < prevWorst.ratio) || jumps) {
      const p = jumps ? JUMP_ORDER : Math.log(prevWorst!.ratio / worst) / Math.log(c.N / prevWorst!.N);
      const steady = jumps || (prevOrder !== null && Math.abs(p - prevOrder) <= 0.15 * p);
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

/** The last solve of an algebraic climb at the predicted size, with Richardson's uncertainty. */
function richardsonStep(s: RefineSetup, c: Climb, p: number, need: number, outOfReach: boolean): void {
  const Nf = outOfReach ? Math.min(s.cap, Math.max(2 * c.N, Math.floor(s.algebraicPoints))) : Math.min(s.cap, Math.max(Math.ceil(need), Math.ceil(1.25 * c.N)));
  if (outOfReach) {
    c.capped = true;
    c.capNote = `Energies converge as about N^-${p.toFixed(1)}; the tolerance would need about ${Math.ceil(need)} grid points, over ${s.capWhy}; stopped at ${Math.max(c.N, Nf)}.`;
  }
  if (!(Nf > c.N)) return;
  if (s.budget.expired()) {
    c.expired = s.budget.reason;
    return;
  }
  const fin = solveAt(s, Nf);
  if (!fin) {
    c.failed = true;
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
