import { describe, it, expect } from 'vitest';
import { boxBasis } from '../../server/src/physics/box';
import { project } from '../../server/src/physics/project';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { analyse } from '../../server/src/analysis/index';
import { potentialBasis } from '../../server/src/physics/potential';
import { matrixElements } from '../../server/src/physics/evolution';
import { clearBasisMemo } from '../../server/src/analysis/systems';
import { manualClock } from '../../server/src/physics/budget';

describe('fast paths give the same numbers as the plain paths', () => {
  it('box: fused weighted sums equal the table projection', () => {
    // Invariant: the two paths evaluate the same quadrature sum, so they agree to rounding.
    const basis = boxBasis(-1, 2, 1, 150);
    const plain = { ...basis, weightedSums: undefined };
    const q = compositeGaussLegendre(-1, 2, { panels: 100, order: 20 });
    const re = q.x.map((x) => (x + 1) * (2 - x) * Math.exp(x));
    const im = q.x.map((x) => (x + 1) * (2 - x) * Math.sin(5 * x));
    const a = project(plain, q, re, im, 150);
    const b = project(basis, q, re, im, 150);
    let diff = 0;
    let size = 0;
    for (let k = 0; k < 150; k++) {
      diff = Math.max(diff, Math.abs(a.re[k]! - b.re[k]!), Math.abs(a.im[k]! - b.im[k]!));
      size = Math.max(size, Math.abs(a.re[k]!));
    }
    expect(size).toBeGreaterThan(0.1);
    expect(diff).toBeLessThan(1e-14);
  });

  it('box: the fused path gives the parabola coefficients c_n = 8 sqrt(15)/(n pi)^3', () => {
    // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    const basis = boxBasis(0, 1, 1, 9);
    const q = compositeGaussLegendre(0, 1, { panels: 8, order: 20 });
    const psi = q.x.map((x) => Math.sqrt(30) * x * (1 - x));
    const c = project(basis, q, psi, null, 9);
    for (let n = 1; n <= 9; n++) {
      const expected = n % 2 === 1 ? (8 * Math.sqrt(15)) / (n * Math.PI) ** 3 : 0;
      expect(Math.abs(c.re[n - 1]! - expected)).toBeLessThan(1e-14);
      expect(c.im[n - 1]).toBe(0);
    }
  });
});

describe('closed-form matrix elements of numerical bases', () => {
  it('equal the quadrature X_jk = <phi_j|x|phi_k> and D_jk = <phi_j|phi_k\'>', () => {
    // Invariant: both compute the same integrals; an asymmetric double well exercises every parity.
    const V = (xs: Float64Array) => xs.map((x) => (x * x - 4) ** 2 / 16 + 0.1 * x);
    const basis = potentialBasis(V, -6, 6, 1, 20).basis;
    expect(basis.matrixElements).toBeDefined();
    const closed = matrixElements(basis, 20);
    const quad = matrixElements({ ...basis, matrixElements: undefined }, 20);
    let diff = 0;
    let size = 0;
    for (let i = 0; i < 400; i++) {
      diff = Math.max(diff, Math.abs(closed.x[i]! - quad.x[i]!), Math.abs(closed.d[i]! - quad.d[i]!));
      size = Math.max(size, Math.abs(quad.x[i]!));
    }
    expect(size).toBeGreaterThan(1);
    expect(diff).toBeLessThan(1e-12);
  });
});

describe('memo of numerical bases', () => {
  // Observed through the work an analysis counts on its budget (AnalysisResult.work): a remembered basis
  // is not solved again, so only the projection's work is counted. The clock stands still, so the time
  // limit never cuts a solve short and the counts depend on the memo alone.
  const frozen = () => ({ clock: manualClock(0) });
  const ops = (text: string) => analyse(text, frozen()).work!.ops;
  const file = (state: string, depth = 16) => `system V(x) = (x^2 - 4)^2 / ${depth} over [-6, 6]\nstate ${state}\nbasis 12\n`;

  it('reuses the basis when only the state changes, with the same results as a cold analysis', () => {
    clearBasisMemo();
    const cold = ops(file('gaussian(center = -2, width = 0.5)'));
    const warmText = file('gaussian(center = -1.5, width = 0.6)');
    const warmRun = analyse(warmText, frozen());
    const warm = warmRun.work!.ops;
    // The projection's work depends on the grid, not on the state: every reuse counts the same.
    expect(ops(file('gaussian(center = -2, width = 0.5)'))).toBe(warm);
    // The solve's work is gone (measured: 111,112 ops cold against 12,480 warm).
    expect(warm).toBeLessThan(cold);
    clearBasisMemo();
    const coldRun = analyse(warmText, frozen());
    // Cold again, the second state counts exactly the first one's cold work: the same solve and projection.
    expect(coldRun.work!.ops).toBe(cold);
    expect(warmRun.levels.length).toBe(12);
    expect(warmRun.levels.map((l) => [l.energy, l.re, l.im])).toEqual(coldRun.levels.map((l) => [l.energy, l.re, l.im]));
  });

  it('tells potentials apart by the values of the names they use, and stays bounded', () => {
    clearBasisMemo();
    const withLet = (d: number) => `let D = ${d}\nsystem V(x) = (x^2 - 4)^2 / D over [-6, 6]\nstate gaussian(center = -2, width = 0.5)\nbasis 6\n`;
    const a = analyse(withLet(16), frozen());
    const cold = a.work!.ops;
    // The same file again is a reuse; another value of D is a new potential, solved anew (measured: about
    // 3.1e8 ops cold against 3.2e7 warm, the fused projection counting 8 operations per sine term at each
    // node; this basis check solves larger bases too).
    const warm = ops(withLet(16));
    expect(warm).toBeLessThan(cold / 5);
    const b = analyse(withLet(8), frozen());
    expect(b.work!.ops).toBeGreaterThan(10 * warm);
    expect(a.levels[0]!.energy).not.toBe(b.levels[0]!.energy);
    // Ten more potentials: the memo (8 entries) forgets the oldest, so D = 16 is solved again and counts
    // its cold work exactly, while the most recent one is still remembered.
    for (let d = 1; d <= 10; d++) analyse(withLet(d + 20), frozen());
    // (Warm work is the projection's, which counts the terms of that basis's sine series.)
    const recent = analyse(withLet(30), frozen()).work!.ops;
    expect(ops(withLet(30))).toBe(recent);
    expect(recent).toBeLessThan(cold / 5);
    expect(ops(withLet(16))).toBe(cold);
  });
});
