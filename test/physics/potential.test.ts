import { describe, it, expect } from 'vitest';
import { potentialBasis, type PotentialFn } from '../../server/src/physics/potential';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import type { Eigenbasis } from '../../server/src/physics/types';
import { createBudget, manualClock } from '../../server/src/physics/budget';
import { sineDvrSolve, sineDvrWork } from '../../server/src/physics/dvr';
import { cosineMoments, interfaceGrid } from '../../server/src/physics/interfaces';
import { basisOrthonormalityError } from './helpers';
import { numbersIn } from '../hardening/helpers';

const pot = (f: (x: number) => number): PotentialFn => (xs) => xs.map(f);

/** Solves and checks the first levels against reference energies to a relative tolerance. */
function check(V: PotentialFn, a: number, b: number, mass: number, refs: number[], rel = 1e-9, levels = refs.length, options = {}) {
  const r = potentialBasis(V, a, b, mass, levels, options);
  expect(r.unresolved).toBeNull();
  expect(r.basis.count).toBe(levels);
  refs.forEach((e, k) => {
    const err = Math.abs(r.basis.energies[k] - e);
    expect(err).toBeLessThanOrEqual(rel * Math.abs(e));
    // The stated uncertainty is honest (never below the true error, never 0) and meets the tolerance.
    expect(err).toBeLessThanOrEqual(r.basis.uncertainty![k]);
    expect(r.basis.uncertainty![k]).toBeGreaterThan(0);
    expect(r.basis.uncertainty![k]).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(e), 1));
  });
  return r;
}

/**
 * The lowest level of a box [0, 1] (hbar = m = 1) with V = 0 on [0, s) and V0 on [s, 1], E < V0: phi = sin(k x)
 * on the left, sinh(q (1 - x)) on the right, k = sqrt(2 E), q = sqrt(2 (V0 - E)); continuity of phi and
 * phi' at s gives k cos(k s) sinh(q (1 - s)) + q cosh(q (1 - s)) sin(k s) = 0 (for s = 1/2 the issue's
 * k cot(k/2) = -q coth(q/2); derived in this comment). Bisection on (0, min(V0, pi^2/(2 s^2))) to 1e-14.
 */
function stepBoxLevel(s: number, V0: number): number {
  const f = (E: number) => {
    const k = Math.sqrt(2 * E);
    const q = Math.sqrt(2 * (V0 - E));
    return k * Math.cos(k * s) * Math.sinh(q * (1 - s)) + q * Math.cosh(q * (1 - s)) * Math.sin(k * s);
  };
  let lo = 1e-9;
  let hi = Math.min(V0, Math.PI ** 2 / (2 * s * s)) - 1e-12;
  expect(Math.sign(f(lo))).not.toBe(Math.sign(f(hi)));
  while (hi - lo > 1e-14) {
    const m = 0.5 * (lo + hi);
    if (m <= lo || m >= hi) break;
    if (Math.sign(f(m)) === Math.sign(f(lo))) lo = m;
    else hi = m;
  }
  return 0.5 * (lo + hi);
}

/** Least-squares slope of y against x. */
function slope(lx: number[], ly: number[]): number {
  const mx = lx.reduce((p, q) => p + q) / lx.length;
  const my = ly.reduce((p, q) => p + q) / ly.length;
  let sxy = 0;
  let sxx = 0;
  lx.forEach((x, i) => {
    sxy += (x - mx) * (ly[i] - my);
    sxx += (x - mx) * (x - mx);
  });
  return sxy / sxx;
}

/** Largest deviation of <phi_j|phi_k> from delta_jk on a fine Gauss–Legendre grid over [a, b]. */
function orthonormalityError(basis: Eigenbasis, levels: number): number {
  const [a, b] = basis.walls!;
  return basisOrthonormalityError(basis, compositeGaussLegendre(a, b, { panels: 200, order: 20, breakpoints: basis.breakpoints }), levels);
}

describe('potentialBasis: exactly solvable potentials', () => {
  it('Morse D(1 - e^-x)^2, D = 12.5 on [-2.5, 45]', () => {
    // Morse, Phys. Rev. 34, 57 (1929): E_n = w (n + 1/2) - [w (n + 1/2)]^2/(4 D), w = 5.
    // [-2.5, 45]: V(-2.5) = 1.7e3 and the top level decays as e^{-x/2}, so the walls shift it by < 1e-12.
    const V = pot((x) => 12.5 * (1 - Math.exp(-x)) ** 2);
    const r = check(V, -2.5, 45, 1, [2.375, 6.375, 9.375, 11.375, 12.375]);
    expect(r.basis.center).toBeNull();
    expect(r.wallLevels).toEqual([]);
    expect(orthonormalityError(r.basis, 5)).toBeLessThan(1e-10);
    // A sixth level lies above D = V(b-): the wall at 45 quantises the continuum.
    const r6 = potentialBasis(V, -2.5, 45, 1, 6);
    expect(r6.wallLevels).toEqual([5]);
    expect(r6.wallEnds).toEqual(['right']);
    // Above V at the right wall only, so not wall-only by the documented rule (both walls).
    expect(r6.wallOnly).toEqual([]);
    expect(r6.notes.some((n) => n.kind === 'walls')).toBe(false);
    expect(r6.wallTrend).toEqual({ left: 'rises', right: 'levels' });
  });

  it('Pöschl–Teller -6 sech^2 x on [-20, 20] (symmetric blocks)', () => {
    // Pöschl & Teller, Z. Phys. 83, 143 (1933): E = -mu^2/2, mu = 3, 2, 1. The top level decays as e^{-|x|}.
    const r = check(pot((x) => -6 / Math.cosh(x) ** 2), -20, 20, 1, [-4.5, -2, -0.5]);
    expect(r.basis.center).toBe(0);
    expect(orthonormalityError(r.basis, 3)).toBeLessThan(1e-10);
  });

  it('wall at 0 with V = F x (F = m = 1) on [0, 20]', () => {
    // Abramowitz & Stegun, Table 10.13: E_n = -a_n (hbar^2 F^2/(2m))^(1/3). The level decays as
    // exp(-(2/3) sqrt(2) (x - E)^(3/2)), negligible at 20. V'(0) != 0: the wall correction is at work.
    const zeros = [-2.338107410459767, -4.087949444130971, -5.520559828095551];
    const r = check(pot((x) => x), 0, 20, 1, zeros.map((z) => -z * Math.cbrt(0.5)));
    expect(r.points).toBeLessThan(600);
    // Above V(0+) = 0 only: the left wall confines these levels.
    expect(r.wallEnds.every((e) => e === 'left')).toBe(true);
  });

  it('H = p^2 + x^4 (m = 1/2) on [-8, 8]', () => {
    // Hioe & Montroll, J. Math. Phys. 16, 1945 (1975) (from memory). [-8, 8]: the tails fall as e^{-|x|^3/3}.
    const r = check(pot((x) => x ** 4), -8, 8, 0.5, [1.060362090484183, 3.799673029801394, 7.455697937986738]);
    expect(orthonormalityError(r.basis, 3)).toBeLessThan(1e-10);
  });

  it('H = p^2 + x^2 + x^4 (m = 1/2) on [-8, 8]', () => {
    // Hioe & Montroll, J. Math. Phys. 16, 1945 (1975) (from memory).
    check(pot((x) => x * x + x ** 4), -8, 8, 0.5, [1.392351641530292, 4.648812704212078, 8.65504995775931]);
  });

  it('V = x^2/2 on [-12, 12] gives the oscillator n + 1/2, with exact derivatives off the grid', () => {
    // Griffiths, Introduction to Quantum Mechanics, harmonic oscillator section (from memory):
    // E_n = n + 1/2, phi_0 = pi^(-1/4) e^{-x^2/2}. The walls at +-12 shift level 9 by ~ e^{-144}.
    const refs = Array.from({ length: 10 }, (_, n) => n + 0.5);
    const r = check(pot((x) => x * x / 2), -12, 12, 1, refs);
    const xs = Float64Array.of(-2.345, -0.5, 0.123456, 1.7, 3.21);
    const f = new Float64Array(10 * xs.length);
    const d1 = new Float64Array(f.length);
    const d2 = new Float64Array(f.length);
    r.basis.table(xs, 10, f, d1, d2);
    xs.forEach((x, i) => {
      const g = Math.PI ** -0.25 * Math.exp(-x * x / 2);
      expect(Math.abs(f[i] - g)).toBeLessThan(1e-10);
      expect(Math.abs(d1[i] + x * g)).toBeLessThan(1e-10);
      expect(Math.abs(d2[i] - (x * x - 1) * g)).toBeLessThan(1e-9);
      // Schroedinger residual of every level at off-grid points.
      for (let k = 0; k < 10; k++) {
        const j = k * xs.length + i;
        expect(Math.abs(-0.5 * d2[j] + 0.5 * x * x * f[j] - refs[k] * f[j])).toBeLessThan(1e-8);
      }
    });
    expect(orthonormalityError(r.basis, 10)).toBeLessThan(1e-10);
  });

  it('V = x^2/2 on [0, 8], a half oscillator: E = 2n + 3/2, stated uncertainty above the true error', () => {
    // The wall at 0 keeps the odd states of the full oscillator, E = 2n + 3/2 = 1.5, 3.5, 5.5 (hbar = m =
    // omega = 1; derived). The wall at 8 shifts E = 5.5 by about |phi(8)|^2 ~ e^-60 (negligible).
    check(pot((x) => x * x / 2), 0, 8, 1, [1.5, 3.5, 5.5], 1e-12);
    // More levels asked for: a finer grid, where rounding dominates the first levels' error.
    const r = potentialBasis(pot((x) => x * x / 2), 0, 8, 1, 12);
    [1.5, 3.5, 5.5].forEach((e, k) => expect(Math.abs(r.basis.energies[k] - e)).toBeLessThanOrEqual(r.basis.uncertainty![k]));
  });

  it('V = 0 on [0, 1] gives the box n^2 pi^2/2', () => {
    // Griffiths, Introduction to Quantum Mechanics, infinite square well section (from memory).
    const r = check(pot(() => 0), 0, 1, 1, [1, 2, 3, 4, 5, 6].map((n) => (n * n * Math.PI * Math.PI) / 2), 1e-13);
    expect(r.basis.center).toBe(0.5);
  });
});

describe('potentialBasis: conventions and robustness', () => {
  it('signs: positive at the first point where |phi| exceeds 1e-6 of its maximum', () => {
    // FORMAT.md sign convention; checked on a grid much finer than the solver's.
    const r = potentialBasis(pot((x) => 12.5 * (1 - Math.exp(-x)) ** 2), -2.5, 45, 1, 5);
    const n = 20001;
    const xs = new Float64Array(n);
    for (let i = 0; i < n; i++) xs[i] = -2.5 + (47.5 * i) / (n - 1);
    const t = new Float64Array(5 * n);
    r.basis.table(xs, 5, t);
    for (let k = 0; k < 5; k++) {
      const row = t.subarray(k * n, (k + 1) * n);
      const mx = row.reduce((m, y) => Math.max(m, Math.abs(y)), 0);
      const first = row.find((y) => Math.abs(y) > 1e-6 * mx)!;
      expect(first).toBeGreaterThan(0);
    }
  });

  it('a step in a box: Galerkin energies over panels ending on the jump converge as N^-3 (measured)', () => {
    const s0 = 0.4321;
    const V0 = 50;
    const Eref = stepBoxLevel(s0, V0);
    const V = pot((x) => (x < s0 ? 0 : V0));
    const Ns = [64, 96, 128, 192, 256, 384, 512];
    const errs = Ns.map((N) => {
      const grid = interfaceGrid(0, 1, [s0], 2 * N);
      const sol = sineDvrSolve(new Float64Array(N - 1), 0, 1, 1, 1, { moments: cosineMoments(grid, V(grid.x), 2 * N) });
      // Variational: from above.
      expect(sol.energies[0]).toBeGreaterThan(Eref);
      return sol.energies[0] - Eref;
    });
    const order = -slope(Ns.map(Math.log), errs.map(Math.log));
    expect(order).toBeGreaterThan(2.9);
    expect(order).toBeLessThan(3.1);
    // The solver finds the jump by bisection and reports it.
    const auto = potentialBasis(V, 0, 1, 1, 1);
    expect(auto.basis.breakpoints.length).toBe(1);
    expect(Math.abs(auto.basis.breakpoints[0] - s0)).toBeLessThan(1e-12);
    expect(auto.notes.some((n) => n.kind === 'jumps')).toBe(true);
  });

  it('the step box V = x < 0.5 ? 0 : 20 over [0, 1]: E1 = 10.839106 to 1e-9, stated uncertainty above the true error', () => {
    const Eref = stepBoxLevel(0.5, 20);
    expect(Math.abs(Eref - 10.839106)).toBeLessThan(1e-6);
    const r = potentialBasis(pot((x) => (x < 0.5 ? 0 : 20)), 0, 1, 1, 1);
    expect(r.unresolved).toBeNull();
    expect(r.stopped).toBeNull();
    const err = Math.abs(r.basis.energies[0] - Eref);
    expect(err).toBeLessThanOrEqual(r.basis.uncertainty![0]);
    expect(r.basis.uncertainty![0]).toBeLessThanOrEqual(1e-9 * Eref);
    // A larger grid cap changes nothing: the tolerance, not the cap, decides.
    const big = potentialBasis(pot((x) => (x < 0.5 ? 0 : 20)), 0, 1, 1, 1, { maxPoints: 2097152 });
    expect(Array.from(big.basis.energies)).toEqual(Array.from(r.basis.energies));
  });

  it('the cap names the first unresolved level', () => {
    const r = potentialBasis(pot((x) => x ** 4), -8, 8, 0.5, 20, { maxPoints: 40 });
    expect(r.points).toBeLessThanOrEqual(40);
    expect(r.unresolved).not.toBeNull();
    expect(r.unresolved!).toBeGreaterThanOrEqual(1);
    expect(r.unresolved!).toBeLessThanOrEqual(20);
  });

  it('the work cap lowers the grid cap for a potential without symmetry', () => {
    // 4/3 n^3 <= 1e6 flops allows n = 90 for one block.
    const r = potentialBasis(pot((x) => x), 0, 20, 1, 3, { maxWork: 1e6 });
    expect(Math.max(...r.sizes)).toBeLessThanOrEqual(90);
    expect(r.unresolved).toBe(1);
    expect(r.notes.some((n) => n.kind === 'cap' && n.message.includes('work cap'))).toBe(true);
  });

  it('NaN, bad input and +Infinity never throw', () => {
    const nan = potentialBasis(pot((x) => (x > 0.3 ? NaN : 0)), 0, 1, 1, 3);
    expect(nan.basis.count).toBe(0);
    expect(nan.notes[0].kind).toBe('evaluation');
    expect(potentialBasis(pot(() => 0), 1, 0, 1, 3).notes[0].kind).toBe('input');
    expect(potentialBasis(pot(() => 0), 0, 1, -1, 3).notes[0].kind).toBe('input');
    expect(potentialBasis(() => { throw new Error('boom'); }, 0, 1, 1, 3).notes[0].kind).toBe('evaluation');
    // An infinite wall inside: [-1, 0) is forbidden, so the levels approach those of the box [0, 1].
    const inf = potentialBasis(pot((x) => (x < 0 ? Infinity : 0)), -1, 1, 1, 2, { maxPoints: 512 });
    expect(inf.notes.some((n) => n.kind === 'clamped')).toBe(true);
    expect(Math.abs(inf.basis.energies[0] - Math.PI ** 2 / 2) / (Math.PI ** 2 / 2)).toBeLessThan(0.05);
    expect(inf.basis.potential(-0.5)).toBe(Infinity);
    expect(inf.basis.potential(2)).toBe(Infinity);
  });
});

describe('potentialBasis: the budget', () => {
  const step = pot((x) => (x < 0.5 ? 0 : 20));

  it('two solves of the same potential give bit-identical energies, whatever the clock does short of the limit', () => {
    const quiet = potentialBasis(step, 0, 1, 1, 4);
    // A clock that jumps 1e6 ms per reading under a limit it never reaches: the grid must not notice.
    const busy = potentialBasis(step, 0, 1, 1, 4, { budget: createBudget({ limitMs: 1e300, clock: manualClock(1e6) }) });
    expect(busy.sizes).toEqual(quiet.sizes);
    expect(Array.from(busy.basis.energies)).toEqual(Array.from(quiet.basis.energies));
    expect(Array.from(busy.basis.uncertainty!)).toEqual(Array.from(quiet.basis.uncertainty!));
    expect(busy.stopped).toBe(quiet.stopped);
  });

  it('an expired budget stops before the next solve and says why, as data', () => {
    // The first poll (after the first solve) reads 2 ms past a 1 ms limit.
    const quartic = pot((x) => x ** 4);
    const budget = createBudget({ limitMs: 1, clock: manualClock(2) });
    const r = potentialBasis(quartic, -8, 8, 0.5, 10, { budget });
    expect(r.sizes.length).toBe(1);
    expect(r.stopped).toBe('time');
    expect(r.unresolved).toBe(1);
    expect(r.notes.some((n) => n.kind === 'cap')).toBe(true);
    // Work: one symmetric solve of the first size, counted in flops as it goes (the reduction's
    // 4/3 n^3 per block and the moments' 2 N^2 of sineDvrWork, plus bisection, inverse iteration and the
    // back-transform) and in grid points.
    expect(budget.work.ops).toBeGreaterThanOrEqual(sineDvrWork(r.sizes[0], true));
    expect(budget.work.points).toBe(r.sizes[0] - 1);
    const cancelled = potentialBasis(quartic, -8, 8, 0.5, 10, { budget: createBudget({ cancelled: () => true }) });
    expect(cancelled.stopped).toBe('cancelled');
    // Unlimited: the same potential resolves every level and counts every solve.
    const full = createBudget();
    const done = potentialBasis(quartic, -8, 8, 0.5, 10, { budget: full });
    expect(done.stopped).toBeNull();
    expect(done.unresolved).toBeNull();
    expect(full.work.ops).toBeGreaterThanOrEqual(done.sizes.reduce((s, N) => s + sineDvrWork(N, true), 0));
    // Counted, not timed: the same solve counts the same work on a clock that races.
    const racing = createBudget({ limitMs: 1e300, clock: manualClock(1e6) });
    potentialBasis(quartic, -8, 8, 0.5, 10, { budget: racing });
    expect(racing.work.ops).toBe(full.work.ops);
  });

  it('double precision is a stop reason too: a tolerance below the rounding floor', () => {
    // The box is exact at any size (dvr.ts), so only rounding stands between it and a tolerance of 1e-18.
    const r = potentialBasis(pot(() => 0), 0, 1, 1, 3, { tolerance: 1e-18 });
    expect(r.unresolved).toBe(1);
    expect(r.stopped).toBe('cap');
    expect(r.notes.some((n) => n.kind === 'cap' && n.message.includes('Double precision'))).toBe(true);
    expect(r.basis.uncertainty![0]).toBeGreaterThan(1e-18 * r.basis.energies[0]);
  });

  it('a step whose tolerance is out of reach stops once past algebraicPoints, with the cap as reason', () => {
    const r = potentialBasis(pot((x) => (x < 0.5 ? 0 : 20)), 0, 1, 1, 1, { tolerance: 1e-14, maxPoints: 200, algebraicPoints: 100 });
    expect(r.stopped).toBe('cap');
    expect(Math.max(...r.sizes)).toBeLessThan(200);
    expect(Math.max(...r.sizes)).toBeGreaterThanOrEqual(100);
    expect(Math.abs(r.basis.energies[0] - stepBoxLevel(0.5, 20))).toBeLessThanOrEqual(r.basis.uncertainty![0]);
  });

  it('the grid cap is a stop reason too', () => {
    const r = potentialBasis(pot((x) => x ** 4), -8, 8, 0.5, 20, { maxPoints: 40 });
    expect(r.stopped).toBe('cap');
  });
});

describe('potentialBasis: wall-only levels (docs/format.md, README: above the potential at both walls)', () => {
  it('the step box: levels below V = 20 at the right wall are not wall-only, levels above 20 are', () => {
    // Box levels of [0, 1] are n^2 pi^2 / 2 = 4.93, 19.7, 44.4 before the step: the first lies
    // below V(1-) = 20, and the step only raises levels, by less than 20 (derived in this comment).
    const r = potentialBasis(pot((x) => (x < 0.5 ? 0 : 20)), 0, 1, 1, 6);
    const E = r.basis.energies;
    expect(E[0]).toBeLessThan(20);
    expect(r.wallOnly).not.toContain(0);
    const above = Array.from(E).flatMap((e, k) => (e > 20 ? [k] : []));
    expect(above.length).toBeGreaterThan(0);
    expect(r.wallOnly).toEqual(above);
    // The note names the first level that feels only the walls (1-based).
    expect(numbersIn(r.notes.find((n) => n.kind === 'walls')!.message)).toContain(above[0] + 1);
    expect(r.wallTrend).toEqual({ left: 'levels', right: 'levels' });
  });

  it('a quartic gets none: its levels lie far below V at the walls', () => {
    // H = p^2 + x^4 on [-6, 6]: V(+-6) = 1296; the 12th level is about 70 (WKB, from memory).
    const r = potentialBasis(pot((x) => x ** 4), -6, 6, 0.5, 12);
    expect(r.wallOnly).toEqual([]);
    expect(r.wallLevels).toEqual([]);
    expect(r.notes.some((n) => n.kind === 'walls')).toBe(false);
    expect(r.wallTrend).toEqual({ left: 'rises', right: 'rises' });
  });

  it('a double well cut at its rim: levels above V at both walls are wall-only', () => {
    // V = (x^2 - 1)^2 on [-1.5, 1.5]: V(+-1.5) = 1.5625 at both walls; the barrier at 0 is 1.
    const r = potentialBasis(pot((x) => (x * x - 1) ** 2), -1.5, 1.5, 1, 8);
    const E = Array.from(r.basis.energies);
    const above = E.flatMap((e, k) => (e > 1.5625 ? [k] : []));
    expect(above.length).toBeGreaterThan(2);
    expect(above[0]).toBeGreaterThan(0);
    expect(r.wallOnly).toEqual(above);
    expect(r.wallEnds.every((e) => e === 'both')).toBe(true);
  });
});
