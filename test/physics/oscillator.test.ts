import { describe, it, expect } from 'vitest';
import { oscillatorBasis } from '../../server/src/physics/oscillator';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { gaussHermite } from './gaussHermite';
import { project } from '../../server/src/physics/project';
import { basisOrthonormalityError } from './helpers';

describe('oscillatorBasis', () => {
  const omega = 1.7;
  const mass = 0.6;
  const c = -0.4;
  const len = 1 / Math.sqrt(mass * omega);

  it('has E_n = omega (n + 1/2), the potential and the centre', () => {
    const b = oscillatorBasis(omega, c, mass, 10);
    // Sakurai, Modern Quantum Mechanics (from memory)
    for (let n = 0; n < 10; n++) expect(b.energies[n]).toBeCloseTo(omega * (n + 0.5), 14);
    expect(b.firstLabel).toBe(0);
    expect(b.center).toBe(c);
    expect(b.potential(c + 2)).toBeCloseTo(0.5 * mass * omega * omega * 4, 14);
  });

  it('is orthonormal for n < 200 by Gauss-Hermite quadrature', () => {
    const levels = 200;
    const gh = gaussHermite(260);
    const xs = Float64Array.from(gh.x, (t) => c + len * t);
    const b = oscillatorBasis(omega, c, mass, levels);
    // The rule's weights times e^{t^2}, scaled to x = c + len t: the eigenfunctions carry their own Gaussian.
    const rule = { x: xs, w: Float64Array.from(gh.ws, (w) => len * w) };
    const pairs: [number, number][] = [];
    for (let i = 0; i < levels; i++) for (let k = i; k < levels; k += i % 7 === 0 ? 1 : 13) pairs.push([i, k]);
    // Invariant: orthonormality (exact for this rule, degree 398 < 2 * 260).
    expect(basisOrthonormalityError(b, rule, levels, pairs)).toBeLessThan(1e-12);
  });

  it('satisfies the oscillator equation with its exact derivatives and is positive for large x', () => {
    const levels = 300;
    const b = oscillatorBasis(omega, c, mass, levels);
    const xs = Float64Array.from({ length: 41 }, (_, j) => c + len * (-20 + j));
    const v = new Float64Array(levels * 41);
    const d1 = new Float64Array(levels * 41);
    const d2 = new Float64Array(levels * 41);
    b.table(xs, levels, v, d1, d2);
    for (let n = 0; n < levels; n += 17) {
      for (let j = 0; j < 41; j++) {
        const i = n * 41 + j;
        const res = -d2[i] / (2 * mass) + b.potential(xs[j]) * v[i] - b.energies[n] * v[i];
        const scale = Math.abs(d2[i] / mass) + Math.abs(b.potential(xs[j]) * v[i]) + 1e-300;
        expect(Math.abs(res)).toBeLessThanOrEqual(1e-12 * scale);
      }
      // FORMAT.md sign convention: positive for large positive x (checked beyond the turning point).
      if (Math.sqrt(2 * n + 1) < 19) expect(v[n * 41 + 40]).toBeGreaterThan(0);
    }
    // First derivative of the ground state: phi_0' = -(x - c)/len^2 phi_0 (common practice).
    for (let j = 0; j < 41; j++) expect(Math.abs(d1[j] + ((xs[j] - c) / (len * len)) * v[j])).toBeLessThan(1e-14);
    // d1 against a centred difference of the table at a few levels.
    const h = 1e-5 * len;
    const probe = Float64Array.of(c + 0.37 * len - h, c + 0.37 * len + h, c + 0.37 * len);
    const pv = new Float64Array(levels * 3);
    const pd = new Float64Array(levels * 3);
    b.table(probe, levels, pv, pd);
    for (const n of [1, 5, 50, 299]) {
      const fd = (pv[n * 3 + 1] - pv[n * 3]) / (2 * h);
      expect(Math.abs(fd - pd[n * 3 + 2])).toBeLessThan(1e-5 * Math.max(1, Math.abs(pd[n * 3 + 2])));
    }
  });

  it('has a support holding all but 1e-16 of every level', () => {
    const levels = 50;
    const b = oscillatorBasis(1, 0, 1, levels);
    const q = compositeGaussLegendre(b.support[1], b.support[1] + 30, { panels: 30, order: 20 });
    const t = new Float64Array(levels * q.x.length);
    b.table(q.x, levels, t);
    for (let n = 0; n < levels; n++) {
      let s = 0;
      for (let j = 0; j < q.x.length; j++) s += q.w[j] * t[n * q.x.length + j] ** 2;
      expect(s).toBeLessThan(0.5e-16);
    }
  });

  it('returns no levels for invalid input', () => {
    expect(oscillatorBasis(0, 0, 1, 10).count).toBe(0);
    expect(oscillatorBasis(1, NaN, 1, 10).count).toBe(0);
  });
});

describe('oscillator expansions', () => {
  const omega = 1.3;
  const mass = 2;
  const c = 0.5;
  const len = 1 / Math.sqrt(mass * omega);

  /** Projects a real state sampled on a dense rule; returns the normalised weights. */
  const weights = (psi: (x: number) => number, levels: number, w = omega) => {
    const b = oscillatorBasis(w, c, mass, levels);
    const q = compositeGaussLegendre(c - 25 * len, c + 25 * len, { panels: 80, order: 24 });
    const re = Float64Array.from(q.x, psi);
    let norm = 0;
    for (let j = 0; j < re.length; j++) norm += q.w[j] * re[j] * re[j];
    const r = project(b, q, re, null, levels);
    return { c: Float64Array.from(r.re, (v) => v / Math.sqrt(norm)), w: Float64Array.from(r.re, (v) => (v * v) / norm), norm };
  };

  it('displaced ground state: |c_n|^2 = e^-L L^n / n!', () => {
    for (const L of [1, 2.5]) {
      const d = Math.sqrt((2 * L) / (mass * omega));
      const psi = (x: number) => Math.pow((mass * omega) / Math.PI, 0.25) * Math.exp((-mass * omega * (x - c - d) ** 2) / 2);
      const r = weights(psi, 40);
      expect(Math.abs(r.norm - 1)).toBeLessThan(1e-13);
      let p = Math.exp(-L);
      for (let n = 0; n < 40; n++) {
        // Glauber, Phys. Rev. 131, 2766 (1963); Sakurai, Modern Quantum Mechanics (from memory)
        expect(Math.abs(r.w[n] - p)).toBeLessThan(1e-12);
        // All coefficients positive for a displacement to the right (physicists' sign convention).
        if (p > 1e-10) expect(r.c[n]).toBeGreaterThan(0);
        p *= L / (n + 1);
      }
      if (L === 1) {
        // Same source: 0.367879441171442, 0.367879441171442, 0.183939720585721.
        expect(Math.abs(r.w[0] - 0.367879441171442)).toBeLessThan(1e-13);
        expect(Math.abs(r.w[1] - 0.367879441171442)).toBeLessThan(1e-13);
        expect(Math.abs(r.w[2] - 0.183939720585721)).toBeLessThan(1e-13);
      }
    }
  });

  it('ground state of omega_1 = 2 omega_2 onto omega_2: P_0 = sqrt(8)/3 and odd levels vanish', () => {
    const w1 = 2 * omega;
    const psi = (x: number) => Math.pow((mass * w1) / Math.PI, 0.25) * Math.exp((-mass * w1 * (x - c) ** 2) / 2);
    const r = weights(psi, 60);
    // Gerry & Knight, Introductory Quantum Optics, squeezed vacuum (from memory)
    expect(Math.abs(r.w[0] - Math.sqrt(8) / 3)).toBeLessThan(1e-13);
    expect(Math.abs(r.w[0] - 0.942809041582063)).toBeLessThan(1e-13);
    const rr = (w1 - omega) / (w1 + omega);
    let term = Math.sqrt(1 - rr * rr);
    for (let k = 0; 2 * k < 60; k++) {
      // Same source: |c_2k|^2 = sqrt(1 - r^2) (2k)!/(4^k k!^2) r^2k.
      expect(Math.abs(r.w[2 * k] - term)).toBeLessThan(1e-13);
      expect(Math.abs(r.c[2 * k + 1])).toBeLessThan(1e-14);
      term *= (((2 * k + 1) * (2 * k + 2)) / (4 * (k + 1) * (k + 1))) * rr * rr;
    }
    // Invariant: the weights add up to the norm.
    expect(Math.abs(r.w.reduce((s, v) => s + v, 0) - 1)).toBeLessThan(1e-12);
  });
});
