import { describe, it, expect } from 'vitest';
import { boxBasis } from '../../server/src/physics/box';
import { project } from '../../server/src/physics/project';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import type { Eigenbasis, Quadrature } from '../../server/src/physics/types';
import { basisOrthonormalityError } from './helpers';

/** Samples a real state on a rule and projects it; returns normalised weights and coefficients. */
function expand(basis: Eigenbasis, quad: Quadrature, psi: (x: number) => number, levels: number) {
  const re = Float64Array.from(quad.x, psi);
  let norm = 0;
  for (let j = 0; j < re.length; j++) norm += quad.w[j] * re[j] * re[j];
  const c = project(basis, quad, re, null, levels);
  const s = 1 / Math.sqrt(norm);
  const coef = Float64Array.from(c.re, (v) => v * s);
  const weight = Float64Array.from(coef, (v) => v * v);
  return { coef, weight, norm };
}

describe('boxBasis', () => {
  it('has E_n = n^2 pi^2 / (2 m L^2), the centre and the walls', () => {
    const b = boxBasis(-1, 3, 2, 5);
    // Griffiths, Introduction to Quantum Mechanics, infinite square well section (from memory).
    for (let n = 1; n <= 5; n++) expect(b.energies[n - 1]).toBeCloseTo((n * n * Math.PI * Math.PI) / (2 * 2 * 16), 14);
    expect(b.center).toBe(1);
    expect(b.walls).toEqual([-1, 3]);
    expect(b.potential(0)).toBe(0);
    expect(b.potential(3.5)).toBe(Infinity);
  });

  it('is orthonormal by quadrature up to n = 300 and vanishes outside', () => {
    const b = boxBasis(0, 2, 1, 300);
    const q = compositeGaussLegendre(0, 2, { panels: 80, order: 24 });
    const pairs = [0, 1, 7, 99, 150, 299].flatMap((i) => Array.from({ length: 300 }, (_, k) => [i, k] as const));
    expect(basisOrthonormalityError(b, q, 300, pairs)).toBeLessThan(1e-12);
    const out = new Float64Array(3);
    b.table(Float64Array.of(-0.1, 2.1, 1), 3, out);
    expect(out[0]).toBe(0);
    expect(out[1]).toBe(0);
  });

  it('gives exact derivatives at level 1000 matching direct formulas', () => {
    const b = boxBasis(0, 1, 1, 1000);
    const xs = Float64Array.of(1e-7, 0.123456, 0.5, 0.9999);
    const v = new Float64Array(1000 * 4);
    const d1 = new Float64Array(1000 * 4);
    const d2 = new Float64Array(1000 * 4);
    b.table(xs, 1000, v, d1, d2);
    for (const n of [1, 31, 32, 33, 999, 1000]) {
      for (let j = 0; j < 4; j++) {
        const k = n * Math.PI;
        const i = (n - 1) * 4 + j;
        expect(Math.abs(v[i] - Math.SQRT2 * Math.sin(k * xs[j]))).toBeLessThan(1e-12);
        expect(Math.abs(d1[i] - Math.SQRT2 * k * Math.cos(k * xs[j]))).toBeLessThan(1e-12 * k);
        expect(Math.abs(d2[i] + k * k * Math.SQRT2 * Math.sin(k * xs[j]))).toBeLessThan(1e-12 * k * k);
      }
    }
  });

  it('returns count 0 for an empty box', () => {
    expect(boxBasis(1, 1, 1, 10).count).toBe(0);
    expect(boxBasis(0, 1, -1, 10).count).toBe(0);
  });
});

describe('box expansions by quadrature', () => {
  const L = 1.7;
  const basis = boxBasis(0, L, 1, 60);
  const quad = compositeGaussLegendre(0, L, { panels: 32, order: 24 });

  it('parabola x(L - x): c_n = 8 sqrt(15)/(n pi)^3 for odd n, 0 for even', () => {
    const r = expand(basis, quad, (x) => x * (L - x), 60);
    for (let n = 1; n <= 60; n++) {
      // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory)
      const expected = n % 2 ? (8 * Math.sqrt(15)) / Math.pow(n * Math.PI, 3) : 0;
      if (n % 2) expect(Math.abs(r.coef[n - 1] - expected)).toBeLessThan(1e-12);
      else expect(Math.abs(r.coef[n - 1])).toBeLessThan(1e-14); // parity zero
    }
    // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory)
    expect(Math.abs(r.weight[0] - 0.998555014364018)).toBeLessThan(1e-13);
    // Energy mean <E> = (10/pi^2) E_1 (same source). Truncated at n = 60 the series misses
    // sum over odd n > 60 of 960/(pi^6 n^4) ~ 7.3e-7 (derived), so it must fall short by about that much.
    let e = 0;
    for (let k = 0; k < 60; k++) e += r.weight[k] * basis.energies[k];
    const short = 10 / (Math.PI * Math.PI) - e / basis.energies[0];
    expect(short).toBeGreaterThan(6e-7);
    expect(short).toBeLessThan(9e-7);
  });

  it('sin^3(pi x/L): P_1 = 0.9, P_3 = 0.1, nothing else', () => {
    const r = expand(basis, quad, (x) => Math.pow(Math.sin((Math.PI * x) / L), 3), 20);
    // Griffiths, Introduction to Quantum Mechanics, problem on the sin^3 state (from memory)
    expect(Math.abs(r.weight[0] - 0.9)).toBeLessThan(1e-13);
    expect(Math.abs(r.weight[2] - 0.1)).toBeLessThan(1e-13);
    for (let k = 0; k < 20; k++) if (k !== 0 && k !== 2) expect(Math.abs(r.coef[k])).toBeLessThan(1e-14);
    let e = 0;
    for (let k = 0; k < 20; k++) e += r.weight[k] * basis.energies[k];
    // Same source: <E> = 1.8 E_1.
    expect(Math.abs(e / basis.energies[0] - 1.8)).toBeLessThan(1e-12);
  });

  it('constant 1/sqrt(L): |c_n|^2 = 8/(n pi)^2 for odd n', () => {
    const r = expand(basis, quad, () => 1 / Math.sqrt(L), 60);
    // Derived from the Fourier sine series of a constant.
    expect(Math.abs(r.weight[0] - 0.810569469138702)).toBeLessThan(1e-13);
    expect(Math.abs(r.weight[2] - 0.090063274348745)).toBeLessThan(1e-13);
    for (let n = 1; n <= 60; n += 2) expect(Math.abs(r.weight[n - 1] - 8 / Math.pow(n * Math.PI, 2))).toBeLessThan(1e-12);
    for (let n = 2; n <= 60; n += 2) expect(Math.abs(r.coef[n - 1])).toBeLessThan(1e-14);
    // Invariant: the weights add up to at most 1 and approach it like 4/(pi^2 N) (common practice).
    const sum = r.weight.reduce((s, v) => s + v, 0);
    expect(sum).toBeLessThan(1);
    expect(1 - sum).toBeGreaterThan(0.5 * 4 / (Math.PI * Math.PI * 60));
    expect(1 - sum).toBeLessThan(2 * 4 / (Math.PI * Math.PI * 60));
  });

  it('ground state of [0, L] released into [0, 2L]', () => {
    const wide = boxBasis(0, 2 * L, 1, 3);
    const q = compositeGaussLegendre(0, 2 * L, { breakpoints: [L], panels: 8, order: 30 });
    const r = expand(wide, q, (x) => (x < L ? Math.sqrt(2 / L) * Math.sin((Math.PI * x) / L) : 0), 3);
    // Griffiths, Introduction to Quantum Mechanics, problem on the suddenly widened well (from memory)
    expect(Math.abs(r.weight[0] - 32 / (9 * Math.PI * Math.PI))).toBeLessThan(1e-13);
    expect(Math.abs(r.weight[0] - 0.360253097394979)).toBeLessThan(1e-13);
    expect(Math.abs(r.weight[1] - 0.5)).toBeLessThan(1e-13);
    expect(Math.abs(r.weight[2] - 32 / (25 * Math.PI * Math.PI))).toBeLessThan(1e-13);
    expect(Math.abs(r.norm - 1)).toBeLessThan(1e-13);
  });

  it('ground state of [-L/2, L/2] released into [-L, L]', () => {
    const wide = boxBasis(-L, L, 1, 4);
    const q = compositeGaussLegendre(-L, L, { breakpoints: [-L / 2, L / 2], panels: 8, order: 30 });
    const r = expand(wide, q, (x) => (Math.abs(x) < L / 2 ? Math.sqrt(2 / L) * Math.cos((Math.PI * x) / L) : 0), 4);
    // Shankar, Principles of Quantum Mechanics, exercise on the expanding well (from memory)
    expect(Math.abs(r.weight[0] - 64 / (9 * Math.PI * Math.PI))).toBeLessThan(1e-13);
    expect(Math.abs(r.weight[0] - 0.720506194789957)).toBeLessThan(1e-13);
    // The even state has no weight on the odd levels n = 2, 4 (parity zeros).
    expect(Math.abs(r.coef[1])).toBeLessThan(1e-14);
    expect(Math.abs(r.coef[3])).toBeLessThan(1e-14);
  });
});
