/**
 * The lowest eigenvalues of a symmetric tridiagonal T by bisection on Sturm counts (Golub & Van Loan,
 * Matrix Computations, 4th ed., 8.4.1), four eigenvalues at a time.
 *
 * Why four at a time: one Sturm count is a chain of n dependent divisions, so a single count runs at the
 * division's latency, not its throughput. Four counts at four different shifts in one loop are four
 * independent chains that the processor overlaps (the idea of LAPACK's vectorised bisection, dlaebz, from
 * memory). Each count is the same recurrence, bit for bit, as `sturmCount` (tridiag.ts); every count
 * still tightens the brackets of all later eigenvalues, so the work per eigenvalue stays about the same.
 */
import { charge, type Budget } from './budget';

const EPS = 2.220446049250313e-16;

/** Eigenvalues bisected together. */
const GROUP = 4;

/**
 * The lowest m eigenvalues of T (diagonal d, squared off-diagonal e2), ascending, each to about
 * 2 eps max(|lo|, |hi|) + pivmin, inside the bracket [glo, ghi] that holds every eigenvalue.
 */
export function bisectLowest(d: Float64Array, e2: Float64Array, m: number, glo: number, ghi: number, pivmin: number, budget?: Budget): Float64Array {
  const n = d.length;
  const out = new Float64Array(m);
  const scale = Math.max(Math.abs(glo), Math.abs(ghi), Number.MIN_VALUE);
  // Brackets shared between eigenvalues: every Sturm count at x tightens the bounds of all later ones.
  const lower = new Float64Array(m).fill(glo - EPS * scale * 4 - pivmin);
  const upper = new Float64Array(m).fill(ghi + EPS * scale * 4 + pivmin);
  const mids = new Float64Array(GROUP);
  const counts = new Int32Array(GROUP);
  const iters = new Int32Array(GROUP);
  for (let j0 = 0; j0 < m; j0 += GROUP) {
    const g = Math.min(GROUP, m - j0);
    iters.fill(0);
    for (;;) {
      let active = 0;
      for (let q = 0; q < GROUP; q++) {
        const j = j0 + q;
        mids[q] = NaN;
        if (q >= g || iters[q] < 0) continue;
        const lo = lower[j];
        const hi = upper[j];
        const mid = 0.5 * (lo + hi);
        if (iters[q] >= 200 || hi - lo <= 2 * EPS * Math.max(Math.abs(lo), Math.abs(hi)) + pivmin || mid === lo || mid === hi) {
          out[j] = mid;
          iters[q] = -1;
          continue;
        }
        mids[q] = mid;
        iters[q]++;
        active++;
      }
      if (active === 0) break;
      charge(budget, 5 * n * active);
      sturmCounts4(d, e2, mids, pivmin, counts);
      for (let q = 0; q < GROUP; q++) {
        const x = mids[q];
        if (Number.isNaN(x)) continue;
        const c = counts[q];
        for (let i = j0; i < m; i++) {
          if (i < c) {
            if (x < upper[i]) upper[i] = x;
          } else if (x > lower[i]) lower[i] = x;
        }
      }
    }
  }
  return out;
}

/**
 * counts[q] = number of eigenvalues of T strictly below mids[q], q = 0..3, by the Sturm recurrence of the
 * L D L^T pivots (a NaN shift gives a meaningless count, ignored by the caller).
 */
function sturmCounts4(d: Float64Array, e2: Float64Array, mids: Float64Array, pivmin: number, counts: Int32Array): void {
  const n = d.length;
  const x0 = mids[0];
  const x1 = mids[1];
  const x2 = mids[2];
  const x3 = mids[3];
  let c0 = 0, c1 = 0, c2 = 0, c3 = 0;
  let q0 = d[0] - x0;
  let q1 = d[0] - x1;
  let q2 = d[0] - x2;
  let q3 = d[0] - x3;
  if (Math.abs(q0) < pivmin) q0 = -pivmin;
  if (Math.abs(q1) < pivmin) q1 = -pivmin;
  if (Math.abs(q2) < pivmin) q2 = -pivmin;
  if (Math.abs(q3) < pivmin) q3 = -pivmin;
  if (q0 < 0) c0++;
  if (q1 < 0) c1++;
  if (q2 < 0) c2++;
  if (q3 < 0) c3++;
  for (let i = 1; i < n; i++) {
    const di = d[i];
    const f = e2[i - 1];
    q0 = di - x0 - f / q0;
    q1 = di - x1 - f / q1;
    q2 = di - x2 - f / q2;
    q3 = di - x3 - f / q3;
    if (Math.abs(q0) < pivmin) q0 = -pivmin;
    if (Math.abs(q1) < pivmin) q1 = -pivmin;
    if (Math.abs(q2) < pivmin) q2 = -pivmin;
    if (Math.abs(q3) < pivmin) q3 = -pivmin;
    if (q0 < 0) c0++;
    if (q1 < 0) c1++;
    if (q2 < 0) c2++;
    if (q3 < 0) c3++;
  }
  counts[0] = c0;
  counts[1] = c1;
  counts[2] = c2;
  counts[3] = c3;
}
