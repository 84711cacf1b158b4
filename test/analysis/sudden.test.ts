/**
 * Sudden changes between systems of every kind, and numerical systems that must reproduce the
 * analytic ones.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { weightOf } from './helpers';

describe('numerical potentials reproduce the analytic systems', () => {
  it('V(x) = x^2/2 over [-12, 12] gives the oscillator and the Poisson weights of a displaced ground state', () => {
    // Glauber, Phys. Rev. 131, 2766 (1963): |c_n|^2 = e^-L L^n / n!, L = d^2/2 = 1/2 for d = 1.
    const numeric = analyse('system V(x) = x^2 / 2 over [-12, 12]\nstate gaussian(center = 1, width = sqrt(1/2))\nbasis 25\n');
    const exact = analyse('system oscillator(omega = 1)\nstate gaussian(center = 1, width = sqrt(1/2))\nbasis 25\n');
    let f = 1;
    for (let k = 0; k < 25; k++) {
      if (k > 0) f *= k;
      const lvNum = numeric.levels[k]!;
      const lvExact = exact.levels[k]!;
      expect(Math.abs(lvNum.energy - (k + 0.5))).toBeLessThan(1e-9);
      expect(Math.abs(lvNum.weight - Math.exp(-0.5) * 0.5 ** k / f)).toBeLessThan(1e-9);
      // The sign conventions differ (FORMAT: oscillator positive for large x, V(x) positive at the left).
      expect(Math.abs(Math.abs(lvNum.re!) - Math.abs(lvExact.re!))).toBeLessThan(1e-9);
      expect(lvNum.re! * lvExact.re! * (-1) ** k).toBeGreaterThanOrEqual(0);
    }
  });

  it('V(x) = 0 over [0, 1] gives the box', () => {
    // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    const r = analyse('system V(x) = 0 over [0, 1]\nstate psi(x) = sqrt(30) * x * (1 - x)\nbasis 9\n');
    for (let n = 1; n <= 9; n++) expect(Math.abs(r.levels[n - 1]!.energy - (n * n * Math.PI ** 2) / 2)).toBeLessThan(1e-9 * n * n);
    expect(Math.abs(weightOf(r, 1) - 960 / Math.PI ** 6)).toBeLessThan(1e-10);
    expect(Math.abs(weightOf(r, 3) - 960 / Math.PI ** 6 / 3 ** 6)).toBeLessThan(1e-10);
  });
});

describe('sudden changes between kinds', () => {
  it('harmonic ground state released into an anharmonic trap keeps <H> = 1/2 + lambda <x^4>', () => {
    // <x^4> = 3/(4 m^2 omega^2) in the oscillator ground state (hbar = 1; derived from the Gaussian's moments).
    const r = analyse('system V(x) = x^2 / 2 + 0.1 x^4 over [-8, 8]\nstate eigen(0) of oscillator(omega = 1)\nbasis 30\n');
    expect(Math.abs(r.energy!.mean! - (0.5 + 0.1 * 0.75))).toBeLessThan(1e-9);
    expect(r.parity).toBe('even');
    expect(r.captured).toBeGreaterThan(1 - 1e-9);
    for (const l of r.levels) if ((l.n - 1) % 2 === 1) expect(l.weight).toBe(0);
  });

  it('a numerical level overlaps itself fully and its neighbours not at all', () => {
    // Orthonormality of eigenfunctions (an invariant).
    const V = '12.5 * (1 - exp(-x))^2 over [-2.5, 30]';
    const r = analyse(`system V(x) = ${V}\nstate eigen(2) of V(x) = ${V}\nbasis 5\n`);
    expect(Math.abs(weightOf(r, 2) - 1)).toBeLessThan(1e-9);
    for (const n of [1, 3, 4, 5]) expect(weightOf(r, n)).toBeLessThan(1e-12);
  });

  it('a Morse level onto a displaced Morse curve spreads over neighbouring levels and keeps its norm', () => {
    const r = analyse('system V(x) = 12.5 * (1 - exp(-(x - 0.3)))^2 over [-2.5, 30]\nstate eigen(1) of V(x) = 12.5 * (1 - exp(-x))^2 over [-2.5, 30]\nbasis 60\n');
    // Morse, Phys. Rev. 34, 57 (1929): E_0 = 2.375 for D = 12.5, a = m = hbar = 1 (a shift leaves it).
    expect(Math.abs(r.levels[0]!.energy - 2.375)).toBeLessThan(1e-9);
    expect(Math.abs(r.norm! - 1)).toBeLessThan(1e-9);
    expect(weightOf(r, 1)).toBeGreaterThan(0.5);
    expect(weightOf(r, 1)).toBeLessThan(1);
    expect(r.decay === null || r.decay.exponent === null || r.decay.exponent > 0).toBe(true);
  });

  it('a box level released into a finite well reports the continuum weight', () => {
    const r = analyse('system well(depth = 10, width = 2)\nstate eigen(1) of box(-1, 1)\n');
    expect(r.continuum).toBeGreaterThan(0);
    expect(r.continuum! + r.captured!).toBeCloseTo(1, 10);
    expect(r.diagnostics.map((d) => d.code)).toContain('continuum');
  });
});
