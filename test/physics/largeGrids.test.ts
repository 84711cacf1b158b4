/**
 * The fast paths of the eigen-solver against closed forms: the twisted-factorization eigenvectors
 * (twisted.ts), the coarser check grid (potentialRefine.ts, `downwardCheck`), the
 * sign decisions from a short head of each series (potentialView.ts) and the caps a raised time limit
 * lifts (potential.ts, `capRaise`). Work is counted, never timed.
 */
import { describe, it, expect } from 'vitest';
import { potentialBasis, capRaise, type PotentialFn } from '../../server/src/physics/potential';
import { createBudget } from '../../server/src/physics/budget';
import { sineDvrGrid, sineDvrSolve, sineDvrWork, type SineDvrSolution } from '../../server/src/physics/dvr';
import { fixSigns } from '../../server/src/physics/potentialView';
import { lowestEigenvalues, tridiagonalEigenvectors, inverseIteration } from '../../server/src/physics/tridiag';
import { CHECK_RATIO } from '../../server/src/physics/potentialRefine';
import { orthonormalityError } from './helpers';

const pot = (f: (x: number) => number): PotentialFn => (xs) => xs.map(f);

/** Every level's true error lies within its stated uncertainty (the contract), and the level meets `rel`. */
function honest(energies: Float64Array, uncertainty: Float64Array, exact: (n: number) => number, count: number, rel: number): void {
  for (let n = 0; n < count; n++) {
    const err = Math.abs(energies[n]! - exact(n));
    expect(err).toBeLessThanOrEqual(uncertainty[n]!);
    expect(err).toBeLessThanOrEqual(rel * Math.abs(exact(n)));
  }
}

describe('closed forms through the fast paths', () => {
  it('p^2 + x^2 with 520 levels: E_n = 2 n + 1, checked on a coarser grid solved for energies only', () => {
    // H = p^2 + x^2 (hbar = 1, m = 1/2, omega = 2): E_n = 2 n + 1 (closed form). On [-40, 40] the top
    // level's turning point is at sqrt(1041) = 32.3; the walls move it by far less than 1e-15.
    const K = 520;
    const budget = createBudget();
    const r = potentialBasis(pot((x) => x * x), -40, 40, 0.5, K, { budget });
    expect(r.unresolved).toBeNull();
    expect(r.stopped).toBeNull();
    const [Nc, N0] = r.sizes as [number, number];
    expect(r.sizes.length).toBe(2);
    expect(Nc).toBe(Math.ceil(N0 / CHECK_RATIO));
    expect(r.points).toBe(N0);
    honest(r.basis.energies, r.basis.uncertainty!, (n) => 2 * n + 1, K, 1e-9);
    // Counted work, everything included (the first grid with its vectors, the check grid's reduction and
    // bisection): below the reductions alone of a climb from N0 to 1.5 N0 (4/3 n^3 per block: sineDvrWork).
    expect(budget.work.ops).toBeLessThan(sineDvrWork(N0, true) + sineDvrWork(Math.ceil(1.5 * N0), true));
  });

  it('Morse D = 200, alpha = 1, m = 1: the lowest 15 levels (Phys. Rev. 34, 57 (1929))', () => {
    // V = D (1 - exp(-alpha x))^2, E_n = w (n + 1/2) - w^2 (n + 1/2)^2 / (4 D), w = alpha sqrt(2 D / m)
    // (Morse, Phys. Rev. 34, 57 (1929), hbar = 1).
    const D = 200;
    const w = Math.sqrt(2 * D);
    const exact = (n: number) => w * (n + 0.5) - (w * w * (n + 0.5) ** 2) / (4 * D);
    const r = potentialBasis(pot((x) => D * (1 - Math.exp(-x)) ** 2), -1.5, 12, 1, 15, { tolerance: 1e-10 });
    expect(r.unresolved).toBeNull();
    honest(r.basis.energies, r.basis.uncertainty!, exact, 15, 1e-10);
  });

  it('p^2 + x^4: E_0, E_1, E_2 of Hioe and Montroll', () => {
    // Hioe & Montroll, J. Math. Phys. 16, 1945 (1975), from memory: 1.0603620904841829,
    // 3.7996730298013941, 7.4556979379867383 for H = p^2 + x^4 (m = 1/2).
    const refs = [1.0603620904841829, 3.7996730298013941, 7.4556979379867383];
    const r = potentialBasis(pot((x) => x ** 4), -7, 7, 0.5, 50, { tolerance: 1e-10 });
    expect(r.unresolved).toBeNull();
    honest(r.basis.energies, r.basis.uncertainty!, (n) => refs[n]!, 3, 1e-10);
  });
});

describe('twisted-factorization eigenvectors', () => {
  it('a tridiagonal whose levels all lie within 1e-3 ||T||: orthonormal, small residuals, O(n k) work', () => {
    // T = tridiag(-1, 2 + c i^2 ..., -1): an oscillator-like spectrum, ||T|| set by the top of the
    // diagonal, so plain inverse iteration treats all wanted levels as one cluster.
    const n = 800;
    const k = 200;
    const d = Float64Array.from({ length: n }, (_, i) => 2 + 1e-2 * i * i);
    const e = new Float64Array(n - 1).fill(-1);
    const values = lowestEigenvalues({ d, e }, k);
    const tnorm = d[n - 1]! + 2;
    // Every gap is below 1e-3 ||T||: the classic criterion chains all k levels into one cluster.
    for (let j = 1; j < k; j++) expect(values[j]! - values[j - 1]!).toBeLessThan(1e-3 * tnorm);
    const budget = createBudget();
    const z = tridiagonalEigenvectors({ d, e }, values, budget);
    // Orthonormality is an invariant of the eigenvectors of a symmetric matrix (common practice).
    const pairs: [number, number][] = [];
    for (let i = 0; i < k; i += 3) for (let j = 0; j <= i; j += 2) pairs.push([i, j]);
    expect(orthonormalityError(z, n, null, pairs)).toBeLessThan(1e-12);
    let res = 0;
    for (let j = 0; j < k; j++) {
      for (let i = 0; i < n; i++) {
        let s = (d[i]! - values[j]!) * z[j * n + i]!;
        if (i > 0) s += e[i - 1]! * z[j * n + i - 1]!;
        if (i < n - 1) s += e[i]! * z[j * n + i + 1]!;
        res = Math.max(res, Math.abs(s));
      }
    }
    expect(res).toBeLessThan(1e-13 * tnorm);
    // Linear in k: bisection on the representation and one twisted solve per level, no Gram-Schmidt
    // across levels (plain inverse iteration would count about 6 n k^2 = 1.9e8 here).
    expect(budget.work.ops).toBeLessThan(500 * n * k);
    // The same vectors as plain inverse iteration, up to sign, to the accuracy eps ||T|| / gap allows.
    const ref = inverseIteration({ d, e }, values);
    for (let j = 0; j < k; j += 17) {
      let dot = 0;
      for (let i = 0; i < n; i++) dot += z[j * n + i]! * ref[j * n + i]!;
      expect(Math.abs(Math.abs(dot) - 1)).toBeLessThan(1e-10);
    }
  });

  it('a near-degenerate pair (a double well doublet) is still separated into orthogonal vectors', () => {
    const r = potentialBasis(pot((x) => 0.5 * (x * x - 9) ** 2), -7, 7, 1, 8);
    expect(r.unresolved).toBeNull();
    // Tunnelling doublets: E_1 - E_0 far below the level spacing.
    expect(r.basis.energies[1]! - r.basis.energies[0]!).toBeLessThan(1e-3 * (r.basis.energies[2]! - r.basis.energies[0]!));
    const xs = sineDvrGrid(-7, 7, 4000);
    const t = new Float64Array(8 * xs.length);
    r.basis.table(xs, 8, t);
    const h = 14 / 4000;
    const pairs: [number, number][] = [];
    for (let i = 0; i < 8; i++) for (let j = 0; j <= i; j++) pairs.push([i, j]);
    // The trapezoid rule on the interior points of a function vanishing at both walls (spectrally accurate).
    expect(orthonormalityError(t, xs.length, new Float64Array(xs.length).fill(h), pairs)).toBeLessThan(1e-10);
  });
});

/** The sign convention by its definition: every level's whole series at every grid point until settled. */
function signsByDefinition(sol: SineDvrSolution): number[] {
  const n = sol.intervals - 1;
  const L = sol.b - sol.a;
  const norm = Math.sqrt(2 / L);
  const grid = sineDvrGrid(sol.a, sol.b, sol.intervals);
  const out: number[] = [];
  for (let j = 0; j < sol.energies.length; j++) {
    let s = 0;
    for (let t = 0; t < n; t++) s += Math.abs(sol.coefficients[j * n + t]!);
    const thr = 1e-6 * norm * s;
    let sign = 0;
    for (let i = 0; i < grid.length && sign === 0; i++) {
      let y = 0;
      for (let k = 1; k <= sol.terms[j]!; k++) y += sol.coefficients[j * n + k - 1]! * Math.sin((k * Math.PI * (grid[i]! - sol.a)) / L);
      y *= norm;
      if (Math.abs(y) > thr) sign = y < 0 ? -1 : 1;
    }
    out.push(sign);
  }
  return out;
}

describe('signs from the head of each series', () => {
  it('flips exactly the levels the definition flips (double well, 60 levels; quartic, 80 levels)', () => {
    const cases: [PotentialFn, number, number, number, number, number][] = [
      [pot((x) => 0.5 * (x * x - 9) ** 2), -7, 7, 1, 60, 301],
      [pot((x) => x ** 4 + 0.3 * x), -6, 6, 0.5, 80, 257],
    ];
    for (const [V, a, b, mass, levels, N] of cases) {
      const sol = sineDvrSolve(V(sineDvrGrid(a, b, N)), a, b, mass, levels);
      const before = signsByDefinition(sol);
      expect(before.every((s) => s !== 0)).toBe(true);
      const copy = { ...sol, coefficients: sol.coefficients.slice() };
      fixSigns(copy);
      const n = N - 1;
      for (let j = 0; j < levels; j++) {
        // Flipped exactly when the definition found the level negative first (read at its largest coefficient).
        let at = j * n;
        for (let t = j * n; t < (j + 1) * n; t++) if (Math.abs(sol.coefficients[t]!) > Math.abs(sol.coefficients[at]!)) at = t;
        const flipped = copy.coefficients[at]! === -sol.coefficients[at]!;
        expect(flipped).toBe(before[j] === -1);
      }
      expect(signsByDefinition(copy).every((s) => s === 1)).toBe(true);
    }
  });
});

describe('a raised time limit lifts the caps', () => {
  it('by limit / 10 s for the work cap, never for no limit or the default', () => {
    expect(capRaise(createBudget())).toBe(1);
    expect(capRaise(createBudget({ limitMs: 10_000 }))).toBe(1);
    expect(capRaise(createBudget({ limitMs: 600_000 }))).toBe(60);
    // A grid the default work cap refuses (the cap note), allowed under a 10 times longer limit.
    const tight = potentialBasis(pot((x) => x), 0, 20, 1, 3, { maxWork: 1e6 });
    expect(tight.notes.some((nt) => nt.kind === 'cap' && nt.message.includes('work cap'))).toBe(true);
    const raised = potentialBasis(pot((x) => x), 0, 20, 1, 3, { maxWork: 1e6, budget: createBudget({ limitMs: 1e7 }) });
    expect(Math.max(...raised.sizes)).toBeGreaterThan(Math.max(...tight.sizes));
  });
});
