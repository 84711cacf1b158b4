import { describe, it, expect } from 'vitest';
import { fdLevels } from '../../server/src/physics/fd';

describe('finite-difference baseline', () => {
  it('V = 0: the discrete box levels (2/(m h^2)) sin^2(k pi/(2N)) exactly', () => {
    // Closed form of the second-difference matrix (Golub & Van Loan, Matrix Computations, 4th ed., 4.8.3 (from memory)).
    const N = 500;
    const h = 2 / N;
    const r = fdLevels((xs) => new Float64Array(xs.length), 0, 2, 1.5, N, 6);
    r.energies.forEach((e, k) => {
      const ref = (2 / (1.5 * h * h)) * Math.sin(((k + 1) * Math.PI) / (2 * N)) ** 2;
      // Bisection's stated accuracy: a few eps ||T||, ||T|| <= 2/(m h^2).
      expect(Math.abs(e - ref)).toBeLessThan(8 * 2.2e-16 * (2 / (1.5 * h * h)));
    });
  });

  it('V = x^2/2: second order toward n + 1/2 (measured)', () => {
    // Griffiths, Introduction to Quantum Mechanics, harmonic oscillator section (from memory): E_n = n + 1/2.
    const V = (xs: Float64Array) => xs.map((x) => x * x / 2);
    const e1 = fdLevels(V, -10, 10, 1, 400, 5).energies;
    const e2 = fdLevels(V, -10, 10, 1, 800, 5).energies;
    for (let n = 0; n < 5; n++) {
      const order = Math.log2(Math.abs(e1[n] - (n + 0.5)) / Math.abs(e2[n] - (n + 0.5)));
      expect(order).toBeGreaterThan(1.9);
      expect(order).toBeLessThan(2.1);
    }
    const withVectors = fdLevels(V, -10, 10, 1, 400, 2, { vectors: true });
    expect(withVectors.vectors!.length).toBe(2 * 399);
  });

  it('bad input gives empty results', () => {
    expect(fdLevels((xs) => xs, 1, 0, 1, 10, 2).energies.length).toBe(0);
    expect(fdLevels((xs) => xs.map(() => NaN), 0, 1, 1, 10, 2).energies.length).toBe(0);
  });
});
