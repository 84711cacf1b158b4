import { describe, it, expect } from 'vitest';
import { evolve, revival, revivalTime, evolutionQuadrature, matrixElements } from '../../server/src/physics/evolution';
import { createBudget, manualClock } from '../../server/src/physics/budget';
import { boxBasis } from '../../server/src/physics/box';
import { oscillatorBasis } from '../../server/src/physics/oscillator';
import { potentialBasis } from '../../server/src/physics/potential';
import { wellBasis } from '../../server/src/physics/well';
import type { Eigenbasis } from '../../server/src/physics/types';

/** c_k = <phi_k|psi> for a real psi, by the evolution quadrature. */
function coefficients(basis: Eigenbasis, psi: (x: number) => number, levels: number): Float64Array {
  const q = evolutionQuadrature(basis, Math.max(levels, 60));
  const n = q.x.length;
  const t = new Float64Array(levels * n);
  basis.table(q.x, levels, t);
  const c = new Float64Array(levels);
  for (let k = 0; k < levels; k++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += q.w[i] * t[k * n + i] * psi(q.x[i]);
    c[k] = s;
  }
  return c;
}

const times = (T: number, n: number) => Float64Array.from({ length: n }, (_, j) => (T * j) / (n - 1));

describe('evolution: expectation values', () => {
  const L = 2.5;
  const m = 1.3;
  const E1 = Math.PI ** 2 / (2 * m * L * L);
  const cRe = Float64Array.of(Math.SQRT1_2, Math.SQRT1_2, 0, 0);
  const cIm = new Float64Array(4);
  const ts = times(10, 41);

  it.each([
    ['closed-form box', boxBasis(0, L, m, 4)],
    ['solver with V = 0', potentialBasis((xs) => new Float64Array(xs.length), 0, L, m, 4).basis],
  ])('(phi_1 + phi_2)/sqrt 2 in a box (%s): <x>(t) = L/2 - (16 L/(9 pi^2)) cos(3 E_1 t)', (_name, basis) => {
    // Griffiths, Introduction to Quantum Mechanics (from memory); <p> = m d<x>/dt (Ehrenfest; common practice).
    const r = evolve(basis, cRe, cIm, ts);
    ts.forEach((t, j) => {
      const A = (16 * L) / (9 * Math.PI ** 2);
      expect(Math.abs(r.meanX[j] - (L / 2 - A * Math.cos(3 * E1 * t)))).toBeLessThan(1e-10);
      expect(Math.abs(r.meanP[j] - m * A * 3 * E1 * Math.sin(3 * E1 * t))).toBeLessThan(1e-9);
      // Two levels: survival = (1 + cos(Delta E t))/2 (common practice).
      expect(Math.abs(r.survival[j] - 0.5 * (1 + Math.cos(3 * E1 * t)))).toBeLessThan(1e-12);
    });
  });

  it.each([
    ['closed-form oscillator', oscillatorBasis(1, 0, 1, 40)],
    ['solver with V = x^2/2 on [-12, 12]', potentialBasis((xs) => xs.map((x) => x * x / 2), -12, 12, 1, 40).basis],
  ])('displaced ground state (%s): <x>(t) = d cos(omega t)', (_name, basis) => {
    // Glauber, Phys. Rev. 131, 2766 (1963): a coherent state follows the classical orbit,
    // <x> = d cos(omega t), <p> = -m omega d sin(omega t); with d = sqrt 2, |c_n|^2 = e^-1 / n!.
    const d = Math.SQRT2;
    const c = coefficients(basis, (x) => Math.PI ** -0.25 * Math.exp(-((x - d) ** 2) / 2), 40);
    [0.367879441171442, 0.367879441171442, 0.183939720585721].forEach((w, n) => expect(Math.abs(c[n] * c[n] - w)).toBeLessThan(1e-10));
    const ts2 = times(4 * Math.PI, 57);
    const r = evolve(basis, c, new Float64Array(40), ts2);
    ts2.forEach((t, j) => {
      expect(Math.abs(r.meanX[j] - d * Math.cos(t))).toBeLessThan(1e-9);
      expect(Math.abs(r.meanP[j] + d * Math.sin(t))).toBeLessThan(1e-9);
    });
    // The period 2 pi / omega is the revival of the survival probability too.
    const rev = revivalTime(basis, c, new Float64Array(40));
    expect(Math.abs(rev! - 2 * Math.PI)).toBeLessThan(1e-11);
  });

  it('matrix elements: X symmetric, D antisymmetric, box values in closed form', () => {
    // <1|x|2> = -16 L/(9 pi^2) on [0, L] (Griffiths, Introduction to Quantum Mechanics (from memory));
    // <1|d/dx|2> = (4/L) integral_0^pi sin u cos 2u du = -8/(3 L) (derived by integration).
    const me = matrixElements(boxBasis(0, L, m, 3), 3);
    expect(Math.abs(me.x[1] + (16 * L) / (9 * Math.PI ** 2))).toBeLessThan(1e-13);
    expect(Math.abs(me.d[1] + 8 / (3 * L))).toBeLessThan(1e-12);
    expect(me.x[0]).toBeCloseTo(L / 2, 13);
    expect(me.d[3]).toBe(-me.d[1]);
  });

  it.each([
    ['box on [0.3, 2.8]', boxBasis(0.3, 2.8, 1.3, 40)],
    ['oscillator centred at -0.4', oscillatorBasis(1.7, -0.4, 0.9, 40)],
  ])('closed-form matrix elements of the %s agree with the quadrature of the tables', (_name, basis) => {
    // Two independent routes: the basis's own formulas (Griffiths / Sakurai, from memory) and
    // Gauss-Legendre quadrature of phi_j x phi_k and phi_j phi_k' over the tables (common practice).
    const K = 40;
    const closed = matrixElements(basis, K);
    const quad = matrixElements({ ...basis, matrixElements: undefined }, K);
    let worstX = 0;
    let worstD = 0;
    for (let i = 0; i < K * K; i++) {
      worstX = Math.max(worstX, Math.abs(closed.x[i] - quad.x[i]));
      worstD = Math.max(worstD, Math.abs(closed.d[i] - quad.d[i]));
    }
    expect(worstX).toBeLessThan(1e-10);
    expect(worstD).toBeLessThan(1e-8);
    // The quadrature is not trivially equal: the matrices are not mostly zero.
    expect(Math.abs(closed.x[1])).toBeGreaterThan(0.1);
    expect(Math.abs(closed.d[1])).toBeGreaterThan(0.1);
  });

  it('a cancelled evolution stops and keeps only the times it finished', () => {
    const basis = oscillatorBasis(1, 0, 1, 30);
    const c = new Float64Array(30);
    c[0] = Math.SQRT1_2;
    c[1] = Math.SQRT1_2;
    let polls = 0;
    const r = evolve(basis, c, new Float64Array(30), times(5, 100), { budget: createBudget({ cancelled: () => ++polls > 10 }) });
    expect(r.complete).toBe(false);
    expect(r.stopped).toBe('cancelled');
    expect(r.survival.length).toBe(10);
    expect(r.meanX.length).toBe(r.survival.length);
    const full = evolve(basis, c, new Float64Array(30), times(5, 100));
    expect(full.complete).toBe(true);
    expect(full.stopped).toBeNull();
    expect(Array.from(r.meanX)).toEqual(Array.from(full.meanX.subarray(0, r.meanX.length)));
  });

  it('the time limit stops an evolution after a known number of polls (manual clock), and work is counted', () => {
    const basis = oscillatorBasis(1, 0, 1, 30);
    const c = new Float64Array(30);
    c[0] = 0.6;
    c[2] = 0.8;
    // Each poll reads the clock once and advances it by 1 ms; the limit of 10 ms passes on the 11th poll.
    const budget = createBudget({ limitMs: 10, clock: manualClock(1) });
    const r = evolve(basis, c, new Float64Array(30), times(5, 100), { budget });
    expect(r.stopped).toBe('time');
    expect(r.survival.length).toBe(10);
    // Kept levels K = 3: 4 (K + nnz) operations per time, plus the phases of the n = 30 levels in the
    // survival: the times are equally spaced, so the first time's are a cosine and sine each (32
    // operations, TRIG_OPS in evolutionPhases.ts) and the next nine's a rotation each (8, ROTATE_OPS).
    // Only the diagonal of X and the strict upper triangles are read (X symmetric, D antisymmetric); those of the oscillator centred at 0
    // are nonzero only next to the diagonal (ladder operators), 2 of the 3 entries above it, which are
    // read as every other entry of each row (parity): 2 entries.
    expect(budget.work.ops).toBe(10 * 4 * (3 + 2) + 32 * 30 + 9 * 8 * 30);
    // The quadrature of a basis without closed forms polls too, row by row.
    const rows = createBudget({ limitMs: 3, clock: manualClock(1) });
    const me = matrixElements({ ...basis, matrixElements: undefined }, 30, { budget: rows });
    expect(me.stopped).toBe('time');
    expect(rows.work.points).toBeGreaterThan(0);
    expect(matrixElements(basis, 30).stopped).toBeNull();
  });

  it('a revival search stopped by the budget says so', () => {
    // Levels E = 0, 1, sqrt(2): incommensurate, so S(t) never returns to 1 within a short horizon.
    const num = { ...boxBasis(0, 1, 1, 3), kind: 'potential' as const, energies: Float64Array.of(0, 1, Math.SQRT2) };
    const c = Float64Array.of(0.6, 0.6, Math.sqrt(1 - 0.72));
    const budget = createBudget({ limitMs: 2, clock: manualClock(1) });
    const r = revival(num, c, new Float64Array(3), { budget, high: 0.999999, horizon: 1e6 });
    expect(r).toEqual({ time: null, stopped: 'time' });
  });
});

describe('tables from a given level', () => {
  it.each([
    ['box', boxBasis(-1, 2, 1, 60)],
    ['oscillator', oscillatorBasis(2, 0.3, 1, 60)],
    ['finite well', wellBasis(400, 2, 0.2, 1)],
    ['solver', potentialBasis((xs) => xs.map((x) => x * x * x * x), -3, 3, 1, 20).basis],
  ])('the %s rows from level k on equal those of the whole table', (_name, basis) => {
    const xs = Float64Array.from({ length: 31 }, (_, j) => -1 + (3 * j) / 30);
    const K = basis.count;
    const n = xs.length;
    const whole = new Float64Array(K * n);
    const w1 = new Float64Array(K * n);
    const w2 = new Float64Array(K * n);
    basis.table(xs, K, whole, w1, w2);
    for (const from of [K - 1, Math.floor(K / 2)]) {
      const part = new Float64Array((K - from) * n);
      const p1 = new Float64Array((K - from) * n);
      const p2 = new Float64Array((K - from) * n);
      basis.table(xs, K, part, p1, p2, from);
      for (let i = 0; i < part.length; i++) {
        const scale = 1 + Math.abs(whole[from * n + i]);
        expect(Math.abs(part[i] - whole[from * n + i])).toBeLessThan(1e-12 * scale);
        expect(Math.abs(p1[i] - w1[from * n + i])).toBeLessThan(1e-10 * (1 + Math.abs(w1[from * n + i])));
        expect(Math.abs(p2[i] - w2[from * n + i])).toBeLessThan(1e-9 * (1 + Math.abs(w2[from * n + i])));
      }
    }
  });
});

describe('evolution: revivals and psi(x, t)', () => {
  const L = 1.7;
  const m = 0.8;
  const basis = boxBasis(0, L, m, 6);
  const cRe = Float64Array.of(0.5, -0.3, 0.4, 0.2, 0.1, 0.25);
  const cIm = Float64Array.of(0.1, 0.35, -0.2, 0.3, 0, -0.15);
  const w = Math.sqrt(cRe.reduce((s, x, k) => s + x * x + cIm[k] * cIm[k], 0));
  const c = { re: cRe.map((x) => x / w), im: cIm.map((x) => x / w) };

  it('box revival time 4 m L^2/pi; at T_rev/2 the state is mirrored, |psi(x)|^2 -> |psi(L - x)|^2', () => {
    // Styer, Am. J. Phys. 69, 56 (2001) (from memory): psi(x, T/2) = -psi(L - x, 0), psi(x, T) = psi(x, 0).
    const T = revivalTime(basis, c.re, c.im)!;
    expect(Math.abs(T - (4 * m * L * L) / Math.PI)).toBeLessThan(1e-12);
    const xs = Float64Array.from({ length: 37 }, (_, j) => 0.01 + (j * (L - 0.02)) / 36);
    const mirror = xs.map((x) => L - x);
    const at = Float64Array.of(0, T / 2, T);
    const here = evolve(basis, c.re, c.im, at, { density: xs, weightCutoff: 0 }).density!;
    const there = evolve(basis, c.re, c.im, at, { density: mirror, weightCutoff: 0 }).density!;
    // The state is not symmetric, so the mirror test can fail.
    expect(Math.max(...xs.map((_, j) => Math.abs(here[0]![j]! - there[0]![j]!)))).toBeGreaterThan(0.1);
    xs.forEach((_, j) => {
      expect(Math.abs(here[1]![j]! - there[0]![j]!)).toBeLessThan(1e-12);
      expect(Math.abs(here[2]![j]! - here[0]![j]!)).toBeLessThan(1e-11);
    });
  });

  it('the survival-based revival of a numerical box finds the same 4 m L^2/pi', () => {
    // Styer, Am. J. Phys. 69, 56 (2001) (from memory); the solver's V = 0 basis has kind 'potential'.
    const num = potentialBasis((xs) => new Float64Array(xs.length), 0, L, m, 6).basis;
    const T = revivalTime(num, c.re, c.im);
    expect(T).not.toBeNull();
    expect(Math.abs(T! - (4 * m * L * L) / Math.PI) / T!).toBeLessThan(1e-13);
    // A single level never decays: no revival.
    expect(revivalTime(num, Float64Array.of(1, 0, 0), new Float64Array(3))).toBeNull();
  });

  it('norm of psi(t) and of the density stay 1 (invariant)', () => {
    const n = 2001;
    const xs = Float64Array.from({ length: n }, (_, j) => (L * j) / (n - 1));
    const r = evolve(basis, c.re, c.im, Float64Array.of(0, 0.37, 2.9), { density: xs });
    expect(r.density!.length).toBe(3);
    for (const dens of r.density!) {
      // Trapezoid rule; the integrand vanishes at both walls with its derivative's periodic extension smooth enough.
      let s = 0;
      for (let j = 0; j < n; j++) s += (j === 0 || j === n - 1 ? 0.5 : 1) * dens[j];
      expect(Math.abs(s * (L / (n - 1)) - 1)).toBeLessThan(1e-10);
    }
    expect(r.survival[0]).toBeCloseTo(1, 14);
    expect(evolve(basis, new Float64Array(6), new Float64Array(6), Float64Array.of(0)).meanX[0]).toBeNaN();
  });
});
