/**
 * The sine-basis discrete variable representation (DVR) of H = -1/(2m) d^2/dx^2 + V(x) on [a, b] with
 * hard walls at a and b (Colbert & Miller, J. Chem. Phys. 96, 1982 (1992), appendix A, the
 * "(a, b) interval" DVR), solved in its spectral form.
 *
 * Why this method (and not Chebyshev collocation): the walls are built into every basis function
 * sin(k pi (x - a)/L), so phi(a) = phi(b) = 0 exactly; the kinetic energy is exact and diagonal,
 * k^2 pi^2 / (2 m L^2); the Hamiltonian matrix is real symmetric (collocation gives a non-symmetric one);
 * a potential symmetric about the centre splits it into odd-k and even-k blocks, each a quarter of the
 * cost of one; and the eigenvectors are sine series, so eigenfunctions and their exact first and
 * second derivatives can be evaluated at any x, not only on grid points. The price is a uniform grid:
 * the point count must follow the shortest local wavelength, which `potential.ts` chooses.
 *
 * With N intervals (grid x_i = a + i L/N, i = 1..N-1) and U_ki = sqrt(2/N) sin(k pi i/N), the DVR
 * potential matrix in the sine basis is U diag(V_i) U^T, whose entries reduce to a Toeplitz-plus-Hankel
 * form V_kl = C(k - l) - C(k + l) with C(q) = (1/N) sum_i V_i cos(q pi i/N) (product-to-sum identity);
 * so the matrix is built in O(N^2), and the eigensolver (tridiag.ts) dominates the cost.
 */
import { sineLadder } from './sines';
import { symmetricLowest } from './tridiag';
import { charge, type Budget } from './budget';

/** The interior grid of the sine DVR with N intervals on [a, b]: x_i = a + i (b - a)/N, i = 1..N-1. */
export function sineDvrGrid(a: number, b: number, intervals: number): Float64Array {
  const n = Math.max(0, intervals - 1);
  const h = (b - a) / intervals;
  const xs = new Float64Array(n);
  for (let i = 0; i < n; i++) xs[i] = a + (i + 1) * h;
  return xs;
}

/** Eigenpairs of the sine DVR, as sine-series coefficients. */
export interface SineDvrSolution {
  a: number;
  b: number;
  mass: number;
  /** Number of intervals N; the series has N - 1 terms. */
  intervals: number;
  /** Energies, ascending. */
  energies: Float64Array;
  /** Level j has phi_j(x) = sqrt(2/L) sum_k coefficients[j * (N-1) + k - 1] sin(k pi (x - a)/L). */
  coefficients: Float64Array;
  /** Per level: 0 = all k, 1 = odd k only (even about the centre), 2 = even k only (odd about the centre). */
  parity: Uint8Array;
  /**
   * Per level: the highest k whose coefficient exceeds 1e-15 of the level's largest; the terms above are
   * rounding noise and are skipped when the series is evaluated.
   */
  terms: Int32Array;
  /**
   * An upper bound on the 2-norm of the Hamiltonian matrix solved: the largest kinetic term
   * (n pi / L)^2 / (2 m) plus the largest |V| on the grid (||T + V|| <= ||T|| + ||V||, and the sine-basis
   * matrix of V has norm at most max |V|). The scale of its rounding errors.
   */
  normBound: number;
}

/** Options of `sineDvrSolve`. */
export interface SineDvrOptions {
  /** Treat V as symmetric about (a + b)/2 and solve the odd-k and even-k blocks apart. Default false. */
  symmetric?: boolean;
  /**
   * Grid cells whose potential jumps from `left` to `right` at `at` inside the cell [x_i - h/2, x_i + h/2]
   * (`index` i = 1..N-1). Their point term (1/N) V_i cos(q pi i/N) in C(q) is replaced by the exact cell
   * integral (1/L) integral V cos(q pi (x - a)/L) dx of the two-sided constant. Default none.
   */
  jumps?: { index: number; at: number; left: number; right: number }[];
  /**
   * V'(a) and V'(b). When given, the Euler–Maclaurin endpoint term of the DVR's trapezoid-type quadrature,
   * which is O(h^4) when V' is nonzero at a wall (f = V u_k u_l has f''' = 6 V' u_k' u_l' there), is
   * removed: H_kl += (h^4/120) (2/L) (pi/L)^2 k l [V'(b) (-1)^(k+l) - V'(a)]
   * (Euler–Maclaurin summation formula, Abramowitz & Stegun 23.1.30 (from memory)). Default none.
   */
  wallSlopes?: [number, number];
  /**
   * The moments C(q), q = 0..2N-1, computed elsewhere (interfaces.ts: exact integrals over panels that
   * end on every jump of V). They replace the DVR's point sums, which turns the DVR into a Galerkin
   * solve in the sine basis; `jumps` and `wallSlopes` are then ignored (the integrals are exact).
   */
  moments?: Float64Array;
  /** With `moments`: the largest |V| they were integrated from (for `normBound`; default: max |v|). */
  potentialBound?: number;
  /**
   * Charged with the solve's flops as it goes (the moments, the matrix, every stage of the eigen-solver);
   * once it runs out the solve throws `Stopped` (budget.ts), for the caller to turn into a stop reason.
   * Default none.
   */
  budget?: Budget;
  /**
   * Only the energies (no eigenvectors: `coefficients` is empty and `terms` all zero): the cost of the
   * eigenvectors and their back-transform is saved on a grid solved only to check another. Default false.
   */
  valuesOnly?: boolean;
}

/**
 * Lowest `levels` eigenpairs of the sine DVR Hamiltonian
 * H_kl = k^2 pi^2/(2 m L^2) delta_kl + C(k - l) - C(k + l), k, l = 1..N-1, C(q) = (1/N) sum_i V_i cos(q pi i/N)
 * (Colbert & Miller, J. Chem. Phys. 96, 1982 (1992), appendix A, transformed to the sine basis).
 * `v` holds V at `sineDvrGrid(a, b, N)` (length N - 1). Energies are exact for V = const (the box).
 * With `options.moments` the C(q) are given instead (a Galerkin solve, see interfaces.ts).
 */
export function sineDvrSolve(
  v: Float64Array,
  a: number,
  b: number,
  mass: number,
  levels: number,
  options: SineDvrOptions = {},
): SineDvrSolution {
  const n = v.length;
  const N = n + 1;
  const L = b - a;
  const want = Math.max(0, Math.min(levels, n));
  const budget = options.budget;
  const valuesOnly = options.valuesOnly === true;
  if (!options.moments) charge(budget, 2 * N * N);
  const C = options.moments ?? dvrMoments(v, a, L, options.jumps ?? []);
  const kin = (Math.PI * Math.PI) / (2 * mass * L * L);
  const blocks = parityBlocks(n, want, options.symmetric === true);
  const slopes = options.moments ? undefined : options.wallSlopes;
  const found: { e: number; block: number; vec: Float64Array }[] = [];
  blocks.forEach((blk, bi) => {
    const m = blk.ks.length;
    if (m === 0 || blk.want === 0) return;
    charge(budget, m * m);
    const H = blockMatrix(blk.ks, C, kin, slopes ? { slopes, f: wallFactor(L, N) } : null);
    const eig = symmetricLowest(H, m, blk.want, budget, !valuesOnly);
    for (let j = 0; j < eig.values.length; j++) {
      found.push({ e: eig.values[j], block: bi, vec: valuesOnly ? eig.vectors : eig.vectors.slice(j * m, (j + 1) * m) });
    }
  });
  found.sort((p, q) => p.e - q.e);
  const count = Math.min(want, found.length);
  const energies = new Float64Array(count);
  const coefficients = new Float64Array(valuesOnly ? 0 : count * n);
  const parity = new Uint8Array(count);
  for (let j = 0; j < count; j++) {
    const f = found[j];
    const blk = blocks[f.block];
    energies[j] = f.e;
    parity[j] = blk.parity;
    if (!valuesOnly) for (let r = 0; r < blk.ks.length; r++) coefficients[j * n + blk.ks[r] - 1] = f.vec[r];
  }
  let vabs = options.potentialBound ?? 0;
  if (options.potentialBound === undefined) for (let i = 0; i < n; i++) vabs = Math.max(vabs, Math.abs(v[i]));
  const normBound = kin * n * n + vabs;
  return { a, b, mass, intervals: N, energies, coefficients, parity, terms: valuesOnly ? new Int32Array(count) : significantTerms(coefficients, count, n), normBound };
}

/**
 * Flops of one `sineDvrSolve` of N intervals (4/3 n^3 per block of size n for the reduction, with the
 * moments' 2 N^2): the deterministic cost the refinement budgets with.
 */
export function sineDvrWork(intervals: number, symmetric: boolean): number {
  const n = Math.max(0, intervals - 1);
  const blocks = symmetric ? 2 * (4 / 3) * (n / 2) ** 3 : (4 / 3) * n ** 3;
  return blocks + 2 * intervals * intervals;
}

/** C(q), q = 0..2N-1, of the DVR quadrature (with the exact cell integral of each jump's cell). */
function dvrMoments(v: Float64Array, a: number, L: number, jumps: NonNullable<SineDvrOptions['jumps']>): Float64Array {
  const C = pointMoments(v);
  if (jumps.length > 0) jumpCells(C, v, a, L, jumps);
  return C;
}

/**
 * C(q) = (1/N) sum_i V_i cos(q pi i/N), q = 0..2N-1, from a cosine table indexed by (q i) mod 2N. Its
 * own function ending with its loop: optimised code entered inside the loop (on-stack replacement) was
 * thrown away at every solve when code it had no feedback for followed the loop (node --trace-deopt).
 */
function pointMoments(v: Float64Array): Float64Array {
  const n = v.length;
  const N = n + 1;
  const twoN = 2 * N;
  const ct = new Float64Array(twoN);
  for (let j = 0; j < twoN; j++) ct[j] = Math.cos((Math.PI * j) / N);
  const C = new Float64Array(twoN);
  for (let q = 0; q < twoN; q++) {
    let s = 0;
    let idx = 0;
    for (let i = 1; i <= n; i++) {
      idx += q;
      if (idx >= twoN) idx -= twoN;
      s += v[i - 1] * ct[idx];
    }
    C[q] = s / N;
  }
  return C;
}

/** Replaces each jump cell's point term in C by the exact cell integral of its two-sided constant. */
function jumpCells(C: Float64Array, v: Float64Array, a: number, L: number, jumps: NonNullable<SineDvrOptions['jumps']>): void {
  const n = v.length;
  const N = n + 1;
  const twoN = 2 * N;
  for (const j of jumps) {
    if (!(j.index >= 1 && j.index <= n)) continue;
    const h = L / N;
    const lo = j.index * h - h / 2;
    const hi = j.index * h + h / 2;
    const at = Math.min(Math.max(j.at - a, lo), hi);
    for (let q = 0; q < twoN; q++) {
      const w = (q * Math.PI) / L;
      // integral of cos(w u) du over [u0, u1], with the q = 0 limit.
      const seg = (u0: number, u1: number): number => (q === 0 ? u1 - u0 : (Math.sin(w * u1) - Math.sin(w * u0)) / w);
      C[q] += (j.left * seg(lo, at) + j.right * seg(at, hi)) / L - (v[j.index - 1] * Math.cos((Math.PI * ((q * j.index) % twoN)) / N)) / N;
    }
  }
}

interface ParityBlock {
  ks: Int32Array;
  parity: number;
  want: number;
}

/** The sine indices solved together: all k, or odd k and even k apart for a symmetric V. */
function parityBlocks(n: number, want: number, symmetric: boolean): ParityBlock[] {
  if (!symmetric) return [{ ks: Int32Array.from({ length: n }, (_, r) => r + 1), parity: 0, want }];
  const odd = Int32Array.from({ length: Math.ceil(n / 2) }, (_, r) => 2 * r + 1);
  const even = Int32Array.from({ length: Math.floor(n / 2) }, (_, r) => 2 * r + 2);
  // Levels alternate even, odd, even, ... (node theorem); one spare per block guards the merge.
  return [
    { ks: odd, parity: 1, want: Math.min(odd.length, Math.ceil(want / 2) + 1) },
    { ks: even, parity: 2, want: Math.min(even.length, Math.floor(want / 2) + 1) },
  ];
}

/** The Euler–Maclaurin wall term's prefactor (h^4/120) (2/L) (pi/L)^2 (see `wallSlopes`). */
function wallFactor(L: number, N: number): number {
  const h = L / N;
  return ((h * h * h * h) / 120) * (2 / L) * (Math.PI / L) ** 2;
}

/** The lower triangle of one block of H (row-major m x m), with the wall-slope term when given. */
function blockMatrix(ks: Int32Array, C: Float64Array, kin: number, wall: { slopes: [number, number]; f: number } | null): Float64Array {
  const m = ks.length;
  const H = new Float64Array(m * m);
  for (let r = 0; r < m; r++) {
    const k = ks[r];
    const row = r * m;
    for (let s = 0; s <= r; s++) {
      const l = ks[s];
      H[row + s] = C[k - l] - C[k + l];
    }
    H[row + r] += kin * k * k;
  }
  if (wall) {
    const [sa, sb] = wall.slopes;
    for (let r = 0; r < m; r++) {
      const k = ks[r];
      for (let s2 = 0; s2 <= r; s2++) {
        const l = ks[s2];
        H[r * m + s2] += wall.f * k * l * (((k + l) & 1 ? -sb : sb) - sa);
      }
    }
  }
  return H;
}

/** Per level, the highest k whose coefficient exceeds 1e-15 of the level's largest (see `terms`). */
function significantTerms(coefficients: Float64Array, count: number, n: number): Int32Array {
  const terms = new Int32Array(count);
  for (let j = 0; j < count; j++) {
    let mx = 0;
    for (let k = 0; k < n; k++) mx = Math.max(mx, Math.abs(coefficients[j * n + k]));
    let last = n;
    while (last > 1 && !(Math.abs(coefficients[j * n + last - 1]) > 1e-15 * mx)) last--;
    terms[j] = last;
  }
  return terms;
}

/**
 * Evaluates the sine series phi_j(x) = sqrt(2/L) sum_k c_jk sin(k pi (x - a)/L) of the first `levels`
 * levels at every x (zero outside [a, b]), with the exact term-by-term derivatives
 * phi' = sqrt(2/L) sum c_jk (k pi/L) cos(...) and phi'' = -sqrt(2/L) sum c_jk (k pi/L)^2 sin(...).
 * out[(j - from) * xs.length + i] = phi_j(xs[i]) for from <= j < levels; d1, d2 likewise when given. sin(k theta), cos(k theta) come from
 * the angle-addition recurrence (`sineLadder`).
 */
export function sineSeriesTable(
  sol: SineDvrSolution,
  xs: Float64Array,
  levels: number,
  out: Float64Array,
  d1?: Float64Array,
  d2?: Float64Array,
  from = 0,
): void {
  const n = sol.intervals - 1;
  const j0 = Math.max(0, Math.floor(from));
  const L = sol.b - sol.a;
  const m = xs.length;
  const count = Math.min(levels, sol.energies.length);
  const norm = Math.sqrt(2 / L);
  const S = new Float64Array(n + 1);
  const Cc = new Float64Array(n + 1);
  const kf = Math.PI / L;
  let kTop = 0;
  for (let j = j0; j < count; j++) kTop = Math.max(kTop, sol.terms[j]);
  for (let i = 0; i < m; i++) {
    const x = xs[i];
    if (!(x >= sol.a && x <= sol.b)) {
      for (let j = j0; j < count; j++) {
        out[(j - j0) * m + i] = 0;
        if (d1) d1[(j - j0) * m + i] = 0;
        if (d2) d2[(j - j0) * m + i] = 0;
      }
      continue;
    }
    sineLadder(kf * (x - sol.a), kTop, S, Cc);
    for (let j = j0; j < count; j++) {
      const p = sol.parity[j];
      const start = p === 2 ? 2 : 1;
      const step = p === 0 ? 1 : 2;
      const off = j * n - 1;
      const top = sol.terms[j];
      let f = 0;
      let g = 0;
      let h = 0;
      // Separate loops keep the hot path free of branches when no derivative is asked for.
      if (!d1 && !d2) {
        for (let k = start; k <= top; k += step) f += sol.coefficients[off + k] * S[k];
      } else {
        for (let k = start; k <= top; k += step) {
          const ck = sol.coefficients[off + k];
          f += ck * S[k];
          g += ck * k * Cc[k];
          h += ck * k * k * S[k];
        }
      }
      out[(j - j0) * m + i] = norm * f;
      if (d1) d1[(j - j0) * m + i] = norm * kf * g;
      if (d2) d2[(j - j0) * m + i] = -norm * kf * kf * h;
    }
  }
}

/**
 * Projection sums of the sine-series levels without their table: with the box sums
 * S_k = sum_i w_i sin(k pi (x_i - a)/L) over the points inside [a, b],
 * sum_i w_i phi_j(x_i) = sqrt(2/L) sum_k c_jk S_k (the order of the two sums exchanged). Adds the result
 * for wRe to outRe[j] and for wIm (when given) to outIm[j], j < levels. The cost is
 * (points + levels) x terms instead of points x levels x terms. sin(k theta) as in {@link sineSeriesTable}.
 * With a budget, charged point by point (and throws `Stopped` once it runs out).
 */
export function sineSeriesWeightedSums(
  sol: SineDvrSolution,
  xs: Float64Array,
  wRe: Float64Array,
  wIm: Float64Array | null,
  levels: number,
  outRe: Float64Array,
  outIm: Float64Array,
  budget?: Budget,
): void {
  const n = sol.intervals - 1;
  const L = sol.b - sol.a;
  const count = Math.min(levels, sol.energies.length);
  const terms = sol.terms;
  const coefficients = sol.coefficients;
  const sRe = new Float64Array(n + 1);
  const sIm = new Float64Array(n + 1);
  // Only the terms some level uses (see `terms`).
  let kTop = 0;
  for (let j = 0; j < count; j++) kTop = Math.max(kTop, terms ? terms[j] : n);
  boxSums(sol, xs, wRe, wIm, kTop, sRe, sIm, budget);
  const norm = Math.sqrt(2 / L);
  for (let j = 0; j < count; j++) {
    const off = j * n - 1;
    const top = terms ? terms[j] : n;
    charge(budget, top);
    let fr = 0;
    let fi = 0;
    for (let k = 1; k <= top; k++) {
      const ck = coefficients[off + k];
      fr += ck * sRe[k];
      fi += ck * sIm[k];
    }
    outRe[j] += norm * fr;
    if (wIm) outIm[j] += norm * fi;
  }
}

/**
 * The box sums S_k = sum_i w_i sin(k pi (x_i - a)/L), k <= kTop, of `sineSeriesWeightedSums`, added to
 * sRe (and sIm). Its own function, so that the optimised code entered in the middle of its loop
 * (on-stack replacement) ends with the loop: code after a loop that the compiler has no feedback for
 * threw that code away at every call (node --trace-deopt).
 */
function boxSums(sol: SineDvrSolution, xs: Float64Array, wRe: Float64Array, wIm: Float64Array | null, kTop: number, sRe: Float64Array, sIm: Float64Array, budget?: Budget): void {
  const a = sol.a;
  const b = sol.b;
  const kf = Math.PI / (b - a);
  const ladS = new Float64Array(kTop + 1);
  const ladC = new Float64Array(kTop + 1);
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    if (!(x >= a && x <= b)) continue;
    // The ladder's rotation and the two sums: about 8 flops a term.
    charge(budget, 8 * kTop);
    sineLadder(kf * (x - a), kTop, ladS, ladC);
    const wr = wRe[i];
    const wi = wIm ? wIm[i] : 0;
    for (let k = 1; k <= kTop; k++) {
      sRe[k] += ladS[k] * wr;
      sIm[k] += ladS[k] * wi;
    }
  }
}

/**
 * Position and derivative matrix elements of the first `levels` sine-series levels, in closed form:
 * X_jk = integral phi_j x phi_k dx and D_jk = integral phi_j phi_k' dx over [a, b]. In the sine basis
 * s_p = sqrt(2/L) sin(p pi (x - a)/L), <s_p|x|s_p> = a + L/2 and, for p + q odd,
 * <s_p|x|s_q> = -8 p q L / (pi^2 (p^2 - q^2)^2) and <s_p|d/dx|s_q> = 4 p q / (L (p^2 - q^2)); both vanish
 * for p != q with p + q even (elementary integrals of u sin sin and sin cos on [0, 1]; derived).
 * Then X = C x C^T and D = C d C^T with C the levels' coefficients. Returns row-major K x K arrays.
 * With a budget, charged per row (and throws `Stopped` once it runs out).
 */
export function sineSeriesMatrixElements(sol: SineDvrSolution, levels: number, budget?: Budget): { x: Float64Array; d: Float64Array } {
  const n = sol.intervals - 1;
  const L = sol.b - sol.a;
  const K = Math.max(0, Math.min(levels, sol.energies.length));
  const coefficients = sol.coefficients;
  const terms = sol.terms;
  const X = new Float64Array(K * K);
  const D = new Float64Array(K * K);
  let top = 0;
  for (let j = 0; j < K; j++) top = Math.max(top, terms ? terms[j] : n);
  if (K === 0 || top === 0) return { x: X, d: D };
  // T = C M for both M = x and M = d: row j, column q (1-based q stored at q - 1).
  const tx = new Float64Array(K * top);
  const td = new Float64Array(K * top);
  basisTimesSineMatrices(coefficients, n, K, top, sol.a, L, tx, td, budget);
  for (let j = 0; j < K; j++) {
    charge(budget, 4 * K * top);
    for (let k = 0; k < K; k++) {
      const off = k * n - 1;
      let sx = 0;
      let sd = 0;
      for (let q = 1; q <= top; q++) {
        const c = coefficients[off + q];
        sx += tx[j * top + q - 1] * c;
        sd += td[j * top + q - 1] * c;
      }
      X[j * K + k] = sx;
      D[j * K + k] = sd;
    }
  }
  return { x: X, d: D };
}

/**
 * Rows T_jq = sum_p c_jp M_pq of `sineSeriesMatrixElements` for M = x (into tx) and M = d (into td).
 * The off-diagonal entries of M (p + q odd) do not depend on the level, so they are tabulated once
 * (top^2 / 2 divisions instead of K top^2), and each level's row is then a product with the table.
 * Its own function so that the optimised code entered in its loop (on-stack replacement) ends with it
 * (see `boxSums`).
 */
function basisTimesSineMatrices(coefficients: Float64Array, n: number, K: number, top: number, a: number, L: number, tx: Float64Array, td: Float64Array, budget?: Budget): void {
  const diag = a + L / 2;
  const cx = (-8 * L) / (Math.PI * Math.PI);
  const cd = 4 / L;
  // Column q - 1 of the tables holds M_pq for the p of the other parity, p = first(q), first(q) + 2, ...
  const half = Math.ceil(top / 2);
  const mx = new Float64Array(top * half);
  const md = new Float64Array(top * half);
  charge(budget, 2 * top * half);
  for (let q = 1; q <= top; q++) {
    const col = (q - 1) * half;
    for (let p = q % 2 === 0 ? 1 : 2, r = 0; p <= top; p += 2, r++) {
      const pq = p * q;
      const diff = p * p - q * q;
      mx[col + r] = (cx * pq) / (diff * diff);
      md[col + r] = (cd * pq) / diff;
    }
  }
  for (let j = 0; j < K; j++) {
    charge(budget, 2 * top * half);
    const off = j * n - 1;
    for (let q = 1; q <= top; q++) {
      const col = (q - 1) * half;
      let sx = 0;
      let sd = 0;
      for (let p = q % 2 === 0 ? 1 : 2, r = col; p <= top; p += 2, r++) {
        const c = coefficients[off + p];
        sx += c * mx[r];
        sd += c * md[r];
      }
      tx[j * top + q - 1] = diag * coefficients[off + q] + sx;
      td[j * top + q - 1] = sd;
    }
  }
}
