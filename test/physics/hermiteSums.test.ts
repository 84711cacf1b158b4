/**
 * The four-node kernel of the oscillator's fused projection (physics/hermiteSums.ts) gives the sums of
 * the node-by-node kernel (physics/hermite.ts) bit for bit, and Glauber's coherent-state coefficients.
 */
import { describe, it, expect } from 'vitest';
import { hermiteWeightedSums } from '../../server/src/physics/hermite';
import { hermiteSums } from '../../server/src/physics/hermiteSums';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';

/** A fixed pseudo-random sequence in [0, 1) (a linear congruential generator, common practice). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

function both(xi: Float64Array, wRe: Float64Array, wIm: Float64Array | null, levels: number) {
  const a = { re: new Float64Array(levels), im: new Float64Array(levels), calls: 0 };
  const b = { re: new Float64Array(levels), im: new Float64Array(levels), calls: 0 };
  hermiteWeightedSums(xi, wRe, wIm, levels, a.re, a.im, () => a.calls++);
  hermiteSums(xi, wRe, wIm, levels, b.re, b.im, () => b.calls++);
  return { a, b };
}

describe('hermiteSums', () => {
  it('equals the node-by-node kernel bit for bit (real and complex weights, zero weights, rescalings)', () => {
    const rand = lcg(15);
    for (const [nodes, levels, complex] of [
      [1, 1, false],
      [3, 7, true],
      [4, 2, false],
      [37, 1000, false],
      [41, 1200, true],
      [8, 3000, true],
      [13, 500, 'zeros'],
    ] as const) {
      // Nodes out to |xi| = 60, where the Gaussian underflows alone and the recurrence rescales often.
      const xi = Float64Array.from({ length: nodes }, () => 120 * rand() - 60);
      const wRe = Float64Array.from({ length: nodes }, (_, j) => (j % 5 === 2 ? 0 : rand() - 0.5));
      // 'zeros': an imaginary part that is all zeros (a real state as the grid holds it).
      const wIm = complex === 'zeros' ? new Float64Array(nodes) : complex ? Float64Array.from({ length: nodes }, (_, j) => (j % 7 === 3 ? 0 : rand() - 0.5)) : null;
      const { a, b } = both(xi, wRe, wIm, levels);
      expect(Array.from(b.re)).toEqual(Array.from(a.re));
      expect(Array.from(b.im)).toEqual(Array.from(a.im));
      // The budget is charged once per node summed, as before.
      expect(b.calls).toBe(a.calls);
    }
  });

  it("gives Glauber's coefficients of the ground state displaced by d = 30 (Phys. Rev. 131, 2766 (1963))", () => {
    // c_n = e^{-a^2/2} a^n / sqrt(n!), a = d / sqrt 2 (m = omega = hbar = 1), for the state
    // pi^{-1/4} e^{-(x - d)^2 / 2}, on 30 Gauss-Legendre panels of 20 nodes over [d - 10, d + 10].
    const d = 30;
    const levels = 1000;
    const q = compositeGaussLegendre(d - 10, d + 10, { panels: 30, order: 20 });
    const wRe = q.w.map((w, j) => w * Math.pow(Math.PI, -0.25) * Math.exp(-0.5 * (q.x[j]! - d) ** 2));
    const re = new Float64Array(levels);
    const im = new Float64Array(levels);
    hermiteSums(q.x, wRe, null, levels, re, im);
    const a = d / Math.SQRT2;
    let c = Math.exp(-0.5 * a * a);
    let worst = 0;
    for (let n = 0; n < levels; n++) {
      if (n > 0) c *= a / Math.sqrt(n);
      worst = Math.max(worst, Math.abs(re[n]! - c));
      expect(im[n]).toBe(0);
    }
    expect(worst).toBeLessThan(1e-13);
  });
});
