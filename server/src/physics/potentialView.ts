/**
 * The Eigenbasis view of a sine-DVR solution of a numerical potential (potential.ts): levels as sine
 * series, V evaluated on demand, and the sign convention.
 */
import type { Eigenbasis } from './types';
import type { PotentialFn } from './potential';
import { evalV } from './potentialScan';
import type { Budget } from './budget';
import { sineLadder } from './sines';
import { sineDvrGrid, sineSeriesMatrixElements, sineSeriesTable, sineSeriesWeightedSums, type SineDvrSolution } from './dvr';

/** A basis with no levels (bad input or a bad V). */
export function emptyBasis(a: number, b: number, mass: number, V: PotentialFn): Eigenbasis {
  return makeBasis(null, a, b, mass, V, null, [], new Float64Array(0), new Float64Array(0));
}

/** The basis of a solution (or of none). */
export function makeBasis(
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
    matrixElements(levels: number, budget?: Budget) {
      const K = Math.min(levels, energies.length);
      return sol ? sineSeriesMatrixElements(sol, K, budget) : { x: new Float64Array(K * K), d: new Float64Array(K * K) };
    },
    weightedSums(xs, wRe, wIm, levels, outRe, outIm, budget) {
      if (!sol) return;
      sineSeriesWeightedSums(sol, xs, wRe, wIm, Math.min(levels, energies.length), outRe, outIm, budget);
    },
  };
}

/**
 * Flips each level so that it is positive at the first grid point where |phi| exceeds ~1e-6 of its
 * maximum. Each grid point evaluates only the levels not yet settled, each over a short head of its
 * series: the first `head` terms, where the tail beyond them sums (in absolute value) to at most 1e-3 of
 * the threshold. The head's value differs from the full series by at most that tail, so wherever it is
 * farther than the tail from the threshold, the decision (settled or not, and the sign) is the full
 * series' own (a margin of 1e-9 of the threshold covers the rounding of the two sums); only the rare
 * points that close to the threshold are evaluated in full (the ladder's sin(k theta) does not depend
 * on how many terms it is asked for, so the values are those of the full series). The result
 * is the same as evaluating every level's whole series at every point, at a cost of about the sum over
 * levels of (points until settled) x (terms until the coefficients have decayed), which for the low
 * levels of a fine grid is a small part of the significant terms (`terms`, which rounding noise in the
 * high coefficients keeps near the grid size). Its work is counted on `budget` (it never stops: it is cheap).
 */
export function fixSigns(sol: SineDvrSolution, budget?: Budget): void {
  const count = sol.energies.length;
  const n = sol.intervals - 1;
  const c = sol.coefficients;
  // Read once: optimised code entered inside the scan (on-stack replacement) that meets a property read
  // its branch never ran before is thrown away (node --trace-deopt).
  const terms = sol.terms;
  const a = sol.a;
  const threshold = new Float64Array(count);
  const tail = new Float64Array(count);
  const head = new Int32Array(count);
  const norm = Math.sqrt(2 / (sol.b - sol.a));
  for (let k = 0; k < count; k++) {
    let s = 0;
    for (let t = 0; t < n; t++) s += Math.abs(c[k * n + t]);
    threshold[k] = 1e-6 * norm * s;
    // The shortest head whose tail sum (times the normalisation) stays within 1e-3 of the threshold.
    const allowed = 1e-3 * threshold[k];
    let acc = 0;
    let h = terms[k];
    while (h > 1 && acc + norm * Math.abs(c[k * n + h - 1]) <= allowed) {
      acc += norm * Math.abs(c[k * n + h - 1]);
      h--;
    }
    head[k] = h;
    tail[k] = acc;
  }
  budget?.count(2 * count * n);
  // The unsettled levels, compacted as they settle.
  const open = Int32Array.from({ length: count }, (_, k) => k);
  let left = count;
  const S = new Float64Array(n + 1);
  const C = new Float64Array(n + 1);
  const kf = Math.PI / (sol.b - a);
  const grid = sineDvrGrid(a, sol.b, sol.intervals);
  for (let i = 0; i < grid.length && left > 0; i++) {
    let kTop = 0;
    for (let r = 0; r < left; r++) kTop = Math.max(kTop, head[open[r]]);
    sineLadder(kf * (grid[i] - a), kTop, S, C);
    let ops = kTop;
    let kept = 0;
    for (let r = 0; r < left; r++) {
      const j = open[r];
      let y = norm * seriesAt(sol, S, j, head[j]);
      ops += head[j];
      if (Math.abs(Math.abs(y) - threshold[j]) <= tail[j] + 1e-9 * threshold[j] && head[j] < terms[j]) {
        // Too close to the threshold to decide from the head: the whole series at this point.
        sineLadder(kf * (grid[i] - a), terms[j], S, C);
        y = norm * seriesAt(sol, S, j, terms[j]);
        ops += 2 * terms[j];
      }
      if (!(Math.abs(y) > threshold[j])) {
        open[kept++] = j;
        continue;
      }
      if (y < 0) for (let t = 0; t < n; t++) c[j * n + t] *= -1;
    }
    left = kept;
    budget?.count(ops);
  }
}

/**
 * sum_k c_jk S[k] over the terms k <= top of level j's parity. A module function, not a closure made per
 * call: the compiler's inlined call of a closure stops matching at the next solve.
 */
function seriesAt(sol: SineDvrSolution, S: Float64Array, j: number, top: number): number {
  const c = sol.coefficients;
  const p = sol.parity[j];
  const step = p === 0 ? 1 : 2;
  const off = j * (sol.intervals - 1) - 1;
  let f = 0;
  for (let k = p === 2 ? 2 : 1; k <= top; k += step) f += c[off + k] * S[k];
  return f;
}
