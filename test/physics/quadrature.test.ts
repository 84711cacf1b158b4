import { describe, it, expect } from 'vitest';
import { gaussLegendre, compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { gaussHermite } from './gaussHermite';

describe('gaussLegendre', () => {
  it('integrates monomials up to degree 2n - 1 exactly on [-1, 1]', () => {
    for (const n of [1, 2, 5, 12, 40]) {
      const q = gaussLegendre(n);
      for (let d = 0; d <= 2 * n - 1 && d <= 60; d++) {
        let s = 0;
        for (let i = 0; i < n; i++) s += q.w[i] * Math.pow(q.x[i], d);
        // Exact moment of x^d on [-1, 1] (common practice): 2/(d+1) for even d, 0 for odd d.
        const exact = d % 2 === 0 ? 2 / (d + 1) : 0;
        expect(Math.abs(s - exact)).toBeLessThan(1e-14);
      }
    }
  });

  it('is not exact at degree 2n (the rule is not over-claimed)', () => {
    const n = 5;
    const q = gaussLegendre(n);
    let s = 0;
    for (let i = 0; i < n; i++) s += q.w[i] * Math.pow(q.x[i], 2 * n);
    expect(Math.abs(s - 2 / (2 * n + 1))).toBeGreaterThan(1e-6);
  });

  it('has ascending, symmetric nodes and weights summing to 2 for large n', () => {
    const q = gaussLegendre(500);
    let sum = 0;
    for (let i = 0; i < 500; i++) {
      sum += q.w[i];
      if (i > 0) expect(q.x[i]).toBeGreaterThan(q.x[i - 1]);
      expect(q.x[i] + q.x[499 - i]).toBe(0);
    }
    expect(Math.abs(sum - 2)).toBeLessThan(1e-13);
  });

  it('returns an empty rule for n < 1', () => {
    expect(gaussLegendre(0).x.length).toBe(0);
    expect(gaussLegendre(NaN).x.length).toBe(0);
  });
});

describe('compositeGaussLegendre', () => {
  it('integrates |x - 0.3| exactly when the kink is a breakpoint, and not otherwise', () => {
    const f = (x: number) => Math.abs(x - 0.3);
    // Exact integral over [-1, 2] (common practice): (1.3^2 + 1.7^2)/2.
    const exact = (1.3 * 1.3 + 1.7 * 1.7) / 2;
    const split = compositeGaussLegendre(-1, 2, { breakpoints: [0.3, 5, -4], panels: 3, order: 4 });
    const plain = compositeGaussLegendre(-1, 2, { panels: 3, order: 4 });
    const sum = (q: { x: Float64Array; w: Float64Array }) => q.x.reduce((s, x, i) => s + q.w[i] * f(x), 0);
    expect(Math.abs(sum(split) - exact)).toBeLessThan(1e-14);
    expect(Math.abs(sum(plain) - exact)).toBeGreaterThan(1e-6);
  });

  it('integrates a step function exactly and keeps nodes inside the interval', () => {
    const q = compositeGaussLegendre(0, 1, { breakpoints: [1 / 3], panels: 2, order: 3 });
    let s = 0;
    for (let i = 0; i < q.x.length; i++) {
      expect(q.x[i]).toBeGreaterThan(0);
      expect(q.x[i]).toBeLessThan(1);
      s += q.w[i] * (q.x[i] < 1 / 3 ? 1 : 0);
    }
    expect(Math.abs(s - 1 / 3)).toBeLessThan(1e-15);
  });

  it('returns an empty rule for an empty interval', () => {
    expect(compositeGaussLegendre(1, 1).x.length).toBe(0);
    expect(compositeGaussLegendre(0, Infinity).x.length).toBe(0);
  });
});

describe('gaussHermite', () => {
  it('matches the 5-point nodes and weights', () => {
    const q = gaussHermite(5);
    // Abramowitz & Stegun, Table 25.10
    const nodes = [-2.020182870456086, -0.9585724646138185, 0, 0.9585724646138185, 2.020182870456086];
    const weights = [0.01995324205904592, 0.3936193231522411, 0.9453087204829419, 0.3936193231522411, 0.01995324205904592];
    for (let i = 0; i < 5; i++) {
      expect(Math.abs(q.x[i] - nodes[i])).toBeLessThan(1e-13);
      expect(Math.abs(q.w[i] - weights[i])).toBeLessThan(1e-13);
    }
  });

  it('integrates x^d e^{-x^2} exactly up to degree 2n - 1', () => {
    for (const n of [1, 3, 8, 20]) {
      const q = gaussHermite(n);
      // Exact moments (common practice): integral x^{2k} e^{-x^2} = Gamma(k + 1/2) = sqrt(pi) (2k-1)!!/2^k.
      let moment = Math.sqrt(Math.PI);
      for (let d = 0; d <= 2 * n - 1 && d <= 30; d++) {
        let s = 0;
        let size = 0;
        for (let i = 0; i < n; i++) {
          s += q.w[i] * Math.pow(q.x[i], d);
          size += Math.abs(q.w[i] * Math.pow(q.x[i], d));
        }
        const exact = d % 2 === 0 ? moment : 0;
        // Rounding scales with the sum of the terms' sizes.
        expect(Math.abs(s - exact)).toBeLessThan(1e-14 * Math.max(1, size));
        if (d % 2 === 0) moment *= (d + 1) / 2;
      }
    }
  });

  it('keeps weights consistent with scaled weights and finds every node for n = 300', () => {
    const n = 300;
    const q = gaussHermite(n);
    let sum = 0;
    for (let i = 0; i < n; i++) {
      if (i > 0) expect(q.x[i]).toBeGreaterThan(q.x[i - 1]);
      expect(Number.isFinite(q.ws[i]) && q.ws[i] > 0).toBe(true);
      sum += q.w[i];
    }
    // Integral of e^{-x^2} is sqrt(pi) (common practice).
    expect(Math.abs(sum - Math.sqrt(Math.PI))).toBeLessThan(1e-13);
    // Integral of the plain function e^{-x^2/2} with the scaled weights: sqrt(2 pi).
    let g = 0;
    for (let i = 0; i < n; i++) g += q.ws[i] * Math.exp(-q.x[i] * q.x[i] / 2);
    expect(Math.abs(g - Math.sqrt(2 * Math.PI))).toBeLessThan(1e-12);
  });
});
