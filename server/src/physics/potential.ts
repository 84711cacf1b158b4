/**
 * The energy eigenbasis of any potential V(x) between hard walls at a and b, solved with the sine DVR
 * (dvr.ts) on a grid chosen automatically and confirmed by solving at two sizes.
 */
import type { Eigenbasis } from './types';
import { sineDvrGrid, sineDvrSolve, sineSeriesMatrixElements, sineSeriesTable, sineSeriesWeightedSums, type SineDvrSolution } from './dvr';

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
   */
maxWork?: number;
  /**
   * A `performance.now()` time by which refinement must stop (default none). Before each larger solve
   * its cost is estimated from the last one (it grows as N^3); a solve that would end past the
   * deadline is not started, and the levels not yet resolved are reported as for a grid cap.
   */
  deadline?: number;
}

/** Something the solver wants the analysis to know. */
export interface PotentialNote {
  /**
   * `evaluation`: V gave NaN, -Infinity or the wrong length (no basis built); `input`: bad a, b, mass or
   * levels; `cap`: the grid cap stopped refinement short; `clamped`: +Infinity values were replaced by a
   * wall far above the spectrum; `walls`: levels lie above V at both ends (wall-quantised continuum);
   * `jumps`: V jumps, so convergence is algebraic.
   */
  kind: 'evaluation' | 'input' | 'cap' | 'clamped' | 'walls' | 'jumps';
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
  notes: PotentialNote[];
  /** Grid sizes solved, in order (for benchmarks and reports). */
  sizes: number[];
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

/** A jump of V located by bisection, with the one-sided values. */
interface Jump {
  x: number;
  left: number;
  right: number;
}

function evalV(V: PotentialFn, xs: Float64Array): Float64Array | null {
  try {
    const out = V(xs);
    if (!out || out.length !== xs.length) return null;
    return out instanceof Float64Array ? out : Float64Array.from(out as ArrayLike<number>);
  } catch {
    return null;
  }
}

function emptyBasis(a: number, b: number, mass: number, V: PotentialFn): Eigenbasis {
  return makeBasis(null, a, b, mass, V, null, [], new Float64Array(0), new Float64Array(0));
}

function makeBasis(
  sol: SineDvrSolution | null,
  a: number,
  b: number,
  mass: number,
  V: PotentialFn,
  center: number | null,
  breakpoints: number[],
  energies: Float64Array,
  uncertainty: Float64Array,
): Eigenbasis {
  return {
    kind: 'potential',
    count: energies.length,
    firstLabel: 1,
    energies,
    uncertainty,
    mass,
    center,
    walls: [a, b],
    support: [a, b],
    breakpoints,
    potential(x: number): number {
      if (!(x >= a && x <= b)) return Infinity;
      const r = evalV(V, Float64Array.of(x));
      return r ? r[0] : NaN;
    },
    potentials(xs: Float64Array): Float64Array {
      // One evaluation of V for all points inside the walls; +Infinity outside, NaN if V fails.
      const out = new Float64Array(xs.length);
      let inside = 0;
      for (let j = 0; j < xs.length; j++) if (xs[j] >= a && xs[j] <= b) inside++;
      const pts = new Float64Array(inside);
      for (let j = 0, i = 0; j < xs.length; j++) if (xs[j] >= a && xs[j] <= b) pts[i++] = xs[j];
      const r = inside > 0 ? evalV(V, pts) : new Float64Array(0);
      for (let j = 0, i = 0; j < xs.length; j++) {
        if (xs[j] >= a && xs[j] <= b) out[j] = r ? r[i++] : NaN;
        else out[j] = Infinity;
      }
      return out;
    },
    table(xs, levels, out, d1, d2, from = 0) {
      if (!sol) return;
      sineSeriesTable(sol, xs, Math.min(levels, energies.length), out, d1, d2, from);
    },
    matrixElements(levels: number) {
      const K = Math.min(levels, energies.length);
      return sol ? sineSeriesMatrixElements(sol, K) : { x: new Float64Array(K * K), d: new Float64Array(K * K) };
    },
    weightedSums(xs, wRe, wIm, levels, outRe, outIm) {
      if (!sol) return;
      sineSeriesWeightedSums(sol, xs, wRe, wIm, Math.min(levels, energies.length), outRe, outIm);
    },
  };
}

/**
 * V'(x0) from one side: the derivative at x0 of the cubic through V(x0 + dir j delta), j = 1..4,
 * delta = 1e-4 L (Lagrange interpolation; common practice). Null when V is not finite there.
 */
function wallSlope(V: PotentialFn, x0: number, dir: 1 | -1, L: number): number | null {
  const delta = 1e-4 * L;
  const xs = Float64Array.from([1, 2, 3, 4], (j) => x0 + dir * j * delta);
  const f = evalV(V, xs);
  if (!f || !f.every(Number.isFinite)) return null;
  // Weights L_j'(0) of the Lagrange basis on the nodes t = 1, 2, 3, 4.
  let d = 0;
  for (let j = 1; j <= 4; j++) {
    let lj0 = 1;
    let sum = 0;
    for (let m = 1; m <= 4; m++) {
      if (m === j) continue;
      lj0 *= -m / (j - m);
      sum += 1 / -m;
    }
    d += f[j - 1] * lj0 * sum;
  }
  return (dir * d) / delta;
}

/** Flips each level so that it is positive at the first grid point where |phi| exceeds ~1e-6 of its maximum. */
function fixSigns(sol: SineDvrSolution): void {
  const count = sol.energies.length;
  const n = sol.intervals - 1;
  const threshold = new Float64Array(count);
  const norm = Math.sqrt(2 / (sol.b - sol.a));
  for (let k = 0; k < count; k++) {
    let s = 0;
    for (let t = 0; t < n; t++) s += Math.abs(sol.coefficients[k * n + t]);
    threshold[k] = 1e-6 * norm * s;
  }
  const grid = sineDvrGrid(sol.a, sol.b, sol.intervals);
  const settled = new Uint8Array(count);
  let left = count;
  const one = new Float64Array(1);
  const vals = new Float64Array(count);
  for (let i = 0; i < grid.length && left > 0; i++) {
    one[0] = grid[i];
    sineSeriesTable(sol, one, count, vals);
    for (let k = 0; k < count; k++) {
      const y = vals[k];
      if (settled[k] || !(Math.abs(y) > threshold[k])) continue;
      if (y < 0) for (let t = 0; t < n; t++) sol.coefficients[k * n + t] *= -1;
      settled[k] = 1;
      left--;
    }
  }
}

/**
 * Finds the energy E_K of level K by the WKB count with hard walls,
 * n(E) = (1/pi) integral sqrt(2 m (E - V)_+) dx = K (Bohr-Sommerfeld; exact for the box), by bisection.
 * Used only to size the first grid, so a rough value is enough.
 */
function wkbEnergy(vs: Float64Array, h: number, mass: number, K: number, vmin: number, L: number): number {
  const count = (E: number): number => {
    let s = 0;
    for (let j = 0; j < vs.length; j++) if (E > vs[j]) s += Math.sqrt(2 * mass * (E - vs[j]));
    return (s * h) / Math.PI;
  };
  let lo = vmin;
  let hi = vmin + (Math.PI * Math.PI * K * K) / (2 * mass * L * L);
  for (let i = 0; i < 200 && count(hi) < K; i++) hi = vmin + 2 * (hi - vmin);
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (count(mid) < K) lo = mid;
    else hi = mid;
  }
  return hi;
}

/**
 * The lowest `levels` eigenpairs of H = -1/(2m) d^2/dx^2 + V(x) with hard walls at a and b (hbar = 1).
 *
 * Method: the sine DVR (Colbert & Miller, J. Chem. Phys. 96, 1982 (1992)). The first grid gives
 * `pointsPerWavelength` points per shortest local wavelength 2 pi / sqrt(2 m (E_K - V_min)) at the WKB
 * estimate of the highest level E_K; the grid then grows by `growth` until two successive sizes agree on
 * every level to `tolerance` relative (relative to max(|E|, 1e-3 (E_K - V_min)), so levels near E = 0 are
 * judged on the spectrum's scale). The finer solution is returned and the difference is each level's
 * `uncertainty` (a conservative bound while convergence is fast). For smooth V the error falls
 * exponentially with N. When V jumps (steps, `?:` barriers) the jump is located by bisection and the
 * grid cell holding it is integrated exactly in the DVR matrix (dvr.ts, `jumps`); the energy error is
 * then O(N^-2) with a steady coefficient (measured in test/physics/potential.test.ts: slope 2.0 for a
 * step in a box). With the order known, the first comparison predicts the size the tolerance needs;
 * when that exceeds the cap, one last grid of max(2 N, `algebraicPoints`) is solved and its uncertainty
 * is twice the Richardson estimate |E_f - E_c| / ((N_f / N_c)^2 - 1).
 * When V'(wall) != 0 with the level non-negligible at that wall (a wall at 0 with V = F x, a box in a
 * field), the DVR's quadrature has an O(N^-4) endpoint error; its Euler–Maclaurin term is removed with
 * V'(a), V'(b) from one-sided differences (dvr.ts, `wallSlopes`), leaving O(N^-6) (measured: the Airy
 * case reaches 1e-9 with about 300 points instead of 1400). Whenever two successive measured orders
 * agree (algebraic convergence), one predicted size is solved with a Richardson error estimate.
 * The grid is capped by `maxPoints` and by `maxWork` (flops of one solve); `unresolved` then names the
 * first level whose uncertainty exceeds the tolerance.
 * A symmetric V (mirror test on the samples to `symmetryTolerance`) is split into even and odd blocks.
 * Never throws: bad input or a bad V gives an empty basis and a note.
 */
export function potentialBasis(
  V: PotentialFn,
  a: number,
  b: number,
  mass: number,
  levels: number,
  options: PotentialOptions = {},
): PotentialBasisResult {
  const o = { ...DEFAULTS, ...options };
  const notes: PotentialNote[] = [];
  const fail = (note: PotentialNote): PotentialBasisResult => ({
    basis: emptyBasis(a, b, mass, V),
    points: 0,
    unresolved: levels >= 1 ? 1 : null,
    wallLevels: [],
    wallEnds: [],
    notes: [...notes, note],
    sizes: [],
  });
  if (!(Number.isFinite(a) && Number.isFinite(b) && b > a) || !(mass > 0 && Number.isFinite(mass))) {
    return fail({ kind: 'input', message: 'The interval must have finite ends a < b and the mass must be positive.' });
  }
  const K = Math.floor(levels);
  if (!(K >= 1)) return fail({ kind: 'input', message: 'At least one level must be asked for.' });
  const L = b - a;
  const pointCap = Math.max(8, Math.floor(o.maxPoints));

  // Samples: interior points a + j L/M, mirror pairs j <-> M - j.
  const M = Math.max(64, Math.floor(o.samples));
  const hs = L / M;
  const sx = new Float64Array(M - 1);
  for (let j = 1; j < M; j++) sx[j - 1] = a + j * hs;
  const sv = evalV(V, sx);
  if (!sv) return fail({ kind: 'evaluation', message: 'The potential could not be evaluated on the grid.' });
  let vmin = Infinity;
  let vmaxFinite = -Infinity;
  let clamped = false;
  for (let j = 0; j < sv.length; j++) {
    const y = sv[j];
    if (Number.isNaN(y) || y === -Infinity) {
      return fail({ kind: 'evaluation', message: `The potential is ${Number.isNaN(y) ? 'NaN' : '-Infinity'} at x = ${sx[j]}.`, at: sx[j] });
    }
    if (y === Infinity) {
      clamped = true;
      continue;
    }
    if (y < vmin) vmin = y;
    if (y > vmaxFinite) vmaxFinite = y;
  }
  if (!Number.isFinite(vmin)) {
    return fail({ kind: 'evaluation', message: 'The potential is +Infinity everywhere inside the walls.' });
  }
  const vscale = Math.max(Math.abs(vmin), Math.abs(vmaxFinite));
  // Mirror test V(a + b - x) = V(x).
  let symmetric = true;
  for (let j = 0; j < sv.length && symmetric; j++) {
    const p = sv[j];
    const q = sv[sv.length - 1 - j];
    if (p === q) continue;
    if (!(Math.abs(p - q) <= o.symmetryTolerance * Math.max(vscale, Number.MIN_VALUE))) symmetric = false;
  }
  const center = symmetric ? 0.5 * (a + b) : null;
  // The eigensolver costs 4/3 n^3 flops per block of size n: N for one block, N/2 for each of two.
  const workCap = symmetric ? Math.floor(2 * Math.cbrt((3 * o.maxWork) / 8)) : Math.floor(Math.cbrt((3 * o.maxWork) / 4));
  const cap = Math.max(8, Math.min(pointCap, workCap));
  const capWhy = cap < pointCap ? `the work cap of ${o.maxWork.toExponential(0)} flops (${cap} points)` : `the grid cap of ${cap} points`;

  // Jumps: a difference far above both neighbours, located by bisection.
  const jumps: Jump[] = [];
  const diff = (j: number): number => {
    if (j < 0 || j + 1 >= sv.length) return 0;
    const d = Math.abs(sv[j + 1] - sv[j]);
    return Number.isFinite(d) ? d : 0;
  };
  for (let j = 0; j + 1 < sv.length && jumps.length < 64; j++) {
    const dj = diff(j);
    if (!(dj > 1e-10 * vscale)) continue;
    const nb = Math.max(diff(j - 1), diff(j + 1), diff(j - 2), diff(j + 2));
    if (dj <= 20 * nb) continue;
    let lo = sx[j];
    let hi = sx[j + 1];
    let vlo = sv[j];
    let vhi = sv[j + 1];
    for (let it = 0; it < 60; it++) {
      const mid = 0.5 * (lo + hi);
      if (mid <= lo || mid >= hi) break;
      const r = evalV(V, Float64Array.of(mid));
      const vm = r ? r[0] : NaN;
      if (!Number.isFinite(vm)) break;
      if (Math.abs(vm - vlo) <= Math.abs(vm - vhi)) {
        lo = mid;
        vlo = vm;
      } else {
        hi = mid;
        vhi = vm;
      }
    }
    jumps.push({ x: 0.5 * (lo + hi), left: vlo, right: vhi });
  }
  if (jumps.length > 0) {
    notes.push({
      kind: 'jumps',
      message: `The potential jumps at ${jumps.length} point(s); energies converge algebraically (about N^-2), not exponentially.`,
      at: jumps[0].x,
    });
  }

  // Slopes at the walls for the Euler–Maclaurin correction (dvr.ts, `wallSlopes`), unless a jump sits
  // right at a wall.
  let slopes: [number, number] | undefined;
  {
    const nearWall = jumps.some((jp) => jp.x - a < 1e-3 * L || b - jp.x < 1e-3 * L);
    const sa = nearWall ? null : wallSlope(V, a, 1, L);
    const sb = nearWall ? null : wallSlope(V, b, -1, L);
    if (sa !== null && sb !== null) slopes = symmetric ? [sa, -sa] : [sa, sb];
  }

  // First grid from the shortest local wavelength at the WKB estimate of E_K.
  const EK = wkbEnergy(sv.map((y) => (y === Infinity ? vmaxFinite + 1e300 : y)), hs, mass, K, vmin, L);
  const kmax = Math.sqrt(2 * mass * Math.max(EK - vmin, 0));
  let N = Math.ceil((o.pointsPerWavelength * L * kmax) / (2 * Math.PI)) + 16;
  N = Math.max(N, Math.floor(o.minPoints), K + 8);
  // Even when the first estimate reaches the cap, a coarser solve comes first so that every level gets
  // a two-size uncertainty.
  if (N >= cap) N = Math.max(8, Math.floor(cap / o.growth));

  const solveAt = (Nn: number): SineDvrSolution | null => {
    const xs = sineDvrGrid(a, b, Nn);
    const vv = evalV(V, xs);
    if (!vv) return null;
    const h = L / Nn;
    const wall = Math.max(vmaxFinite, vmin + (4 * (Math.PI * Nn) ** 2) / (2 * mass * L * L));
    for (let i = 0; i < vv.length; i++) {
      if (vv[i] === Infinity) vv[i] = wall;
      else if (!Number.isFinite(vv[i])) return null;
    }
    const cells: { index: number; at: number; left: number; right: number }[] = [];
    for (const jp of jumps) {
      // The cell [x_i - h/2, x_i + h/2] holding the jump is integrated exactly (dvr.ts, `jumps`).
      const i = Math.round((jp.x - a) / h);
      if (i < 1 || i > vv.length) continue;
      const l = jp.left === Infinity ? wall : jp.left;
      const r = jp.right === Infinity ? wall : jp.right;
      cells.push({ index: i, at: jp.x, left: l, right: r });
    }
    if (symmetric) {
      for (let i = 0, j = vv.length - 1; i < j; i++, j--) {
        const m = 0.5 * (vv[i] + vv[j]);
        vv[i] = m;
        vv[j] = m;
      }
    }
    const sol = sineDvrSolve(vv, a, b, mass, K, { symmetric, jumps: cells, wallSlopes: slopes });
    // Values near the floating-point limit overflow the matrix: report, do not return NaN levels.
    return sol.energies.every(Number.isFinite) ? sol : null;
  };

  const sizes: number[] = [];
  // Time of the last solve and its size, to tell whether the next one fits before the deadline.
  let lastMs = 0;
  let lastN = N;
  const timedSolve = (Nn: number): SineDvrSolution | null => {
    const t0 = performance.now();
    const r = solveAt(Nn);
    lastMs = performance.now() - t0;
    lastN = Nn;
    return r;
  };
  const fits = (Nn: number): boolean =>
    o.deadline === undefined || performance.now() + lastMs * Math.pow(Nn / Math.max(1, lastN), 3) <= o.deadline;
  let stoppedByTime = false;
  // Under a deadline, a small timed solve tells how large a first grid fits the time left (the solve
  // costs about N^3); a first grid that would not is shrunk, and the levels it cannot hold are then
  // reported unresolved instead of the solve running on past the deadline.
  if (o.deadline !== undefined && N > 64) {
    const Np = 64;
    const t0 = performance.now();
    solveAt(Np);
    const tp = Math.max(performance.now() - t0, 0.05);
    const left = o.deadline - performance.now();
    const fitsN = Math.floor(Np * Math.cbrt(Math.max(left, 0) / (3 * tp)));
    if (fitsN < N) {
      N = Math.max(16, fitsN);
      stoppedByTime = true;
    }
  }
  let prev = timedSolve(N);
  if (!prev) return fail({ kind: 'evaluation', message: 'The potential gave NaN or -Infinity on the solver grid, or values too large for the solver.' });
  sizes.push(N);
  let cur = prev;
  let diffs = new Float64Array(0);
  let prevWorst: { ratio: number; N: number } | null = null;
  let prevOrder: number | null = null;
  let prevN = N;
  let stoppedByCap = N >= cap;
  const scaleOf = (E: Float64Array, k: number): number =>
    Math.max(Math.abs(E[k]), 1e-3 * Math.abs(E[E.length - 1] - vmin), Number.MIN_VALUE);
  while (N < cap) {
    const N1 = Math.min(cap, Math.ceil(N * o.growth));
    if (!fits(N1)) {
      stoppedByTime = true;
      break;
    }
    const next = timedSolve(N1);
    if (!next) return fail({ kind: 'evaluation', message: 'The potential gave NaN or -Infinity on the solver grid, or values too large for the solver.' });
    sizes.push(N1);
    const m = Math.min(prev.energies.length, next.energies.length);
    diffs = new Float64Array(next.energies.length).fill(Infinity);
    let worst = 0;
    for (let k = 0; k < m; k++) {
      diffs[k] = Math.abs(next.energies[k] - prev.energies[k]);
      worst = Math.max(worst, diffs[k] / (o.tolerance * scaleOf(next.energies, k)));
    }
    cur = next;
    N = N1;
    if (worst <= 1) break;
    if (N >= cap) {
      stoppedByCap = true;
      break;
    }
    // Algebraic convergence (the measured order p is finite and steady, or the cap is out of reach):
    // rather than climb in small, costly steps, solve once more at the size N_f the order predicts and
    // take Richardson's estimate 2 |E_f - E_N| / ((N_f / N)^p - 1) as the uncertainty (doubled because p
    // is measured). When the prediction exceeds the cap, N_f = min(cap, max(2 N, algebraicPoints)).
    // With jumps in V the order is known (2, see above), so the first comparison is enough to decide.
    if ((prevWorst && worst < prevWorst.ratio) || jumps.length > 0) {
      const p = jumps.length > 0 ? 2 : Math.log(prevWorst!.ratio / worst) / Math.log(N / prevWorst!.N);
      const steady = jumps.length > 0 || (prevOrder !== null && Math.abs(p - prevOrder) <= 0.15 * p);
      prevOrder = p;
      // worst ~ the error of the coarser size prevN in units of the tolerance.
      const need = prevN * Math.pow(4 * worst, 1 / p);
      const outOfReach = p > 0 && p < 12 && need > cap;
      if (p > 0 && p < 12 && (steady || outOfReach)) {
        const Nf = outOfReach ? Math.min(cap, Math.max(2 * N, Math.floor(o.algebraicPoints))) : Math.min(cap, Math.max(Math.ceil(need), Math.ceil(1.25 * N)));
        if (outOfReach) {
          stoppedByCap = true;
          notes.push({
            kind: 'cap',
            message: `Energies converge as about N^-${p.toFixed(1)}; the tolerance would need about ${Math.ceil(need)} grid points, over ${capWhy}; stopped at ${Math.max(N, Nf)}.`,
          });
        }
        if (Nf > N && fits(Nf)) {
          const fin = timedSolve(Nf);
          if (!fin) return fail({ kind: 'evaluation', message: 'The potential gave NaN or -Infinity on the solver grid, or values too large for the solver.' });
          sizes.push(Nf);
          const factor = Math.pow(Nf / N, p) - 1;
          const mm = Math.min(cur.energies.length, fin.energies.length);
          diffs = new Float64Array(fin.energies.length).fill(Infinity);
          for (let k = 0; k < mm; k++) diffs[k] = (2 * Math.abs(fin.energies[k] - cur.energies[k])) / factor;
          cur = fin;
          N = Nf;
        }
        break;
      }
    }
    prevN = N;
    prevWorst = { ratio: worst, N };
    prev = next;
  }
  const count = cur.energies.length;
  const uncertainty = new Float64Array(count);
  let unresolved: number | null = null;
  for (let k = 0; k < count; k++) {
    uncertainty[k] = k < diffs.length ? diffs[k] : Infinity;
    if (unresolved === null && !(uncertainty[k] <= o.tolerance * scaleOf(cur.energies, k))) unresolved = k + 1;
  }
  if (count < K && unresolved === null) unresolved = count + 1;
  if (stoppedByTime && unresolved !== null) {
    notes.push({ kind: 'cap', message: `The time limit stopped refinement before level ${unresolved} met the tolerance.` });
  } else if (stoppedByCap && unresolved !== null && !notes.some((n) => n.kind === 'cap')) {
    notes.push({ kind: 'cap', message: `${capWhy.charAt(0).toUpperCase()}${capWhy.slice(1)} stopped refinement before level ${unresolved} met the tolerance.` });
  }
  if (clamped) {
    notes.push({ kind: 'clamped', message: 'The potential is +Infinity in places; those points act as walls.' });
  }

  // Sign convention: positive at the first grid point where |phi| exceeds 1e-6 of its maximum. The scan
  // runs from the left and stops once every level is settled; the maximum is bounded above by
  // sqrt(2/L) sum |c_k|, so the threshold can only sit a little further in, still in the same lobe.
  fixSigns(cur);
  // Levels above the potential at both ends are quantised by the walls, not by V.
  const ends = evalV(V, Float64Array.of(a + 1e-9 * L, b - 1e-9 * L));
  const wallLevels: number[] = [];
  const wallEnds: ('left' | 'right' | 'both')[] = [];
  if (ends) {
    const vend = Math.min(ends[0], ends[1]);
    for (let k = 0; k < count; k++) {
      const e = cur.energies[k];
      if (!(e > vend)) continue;
      wallLevels.push(k);
      wallEnds.push(e > ends[0] && e > ends[1] ? 'both' : e > ends[0] ? 'left' : 'right');
    }
    if (wallLevels.length > 0) {
      notes.push({
        kind: 'walls',
        message: `${wallLevels.length} level(s) lie above the potential at both walls (${vend}); they belong to a continuum quantised by the walls.`,
      });
    }
  }
  const basis = makeBasis(cur, a, b, mass, V, center, jumps.map((j) => j.x), cur.energies, uncertainty);
  return { basis, points: cur.intervals, unresolved, wallLevels, wallEnds, notes, sizes };
}
