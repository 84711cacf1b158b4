/**
 * The whole engine (file text in, expansion out) against published values.
 * Each check names its source as listed in the project's table of outside check values.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { codes, weightOf } from './helpers';

const PI = Math.PI;

function near(actual: number | null | undefined, expected: number, tol: number): void {
  expect(actual).not.toBeNull();
  expect(actual).toBeDefined();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(tol);
}

describe('infinite square well', () => {
  it('parabola x(L - x): c_n = 8 sqrt(15)/(n pi)^3 for odd n, 0 for even, <E> = (10/pi^2) E_1', () => {
    // Griffiths, Introduction to Quantum Mechanics, worked example on the parabola state (from memory).
    const r = analyse('system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\nbasis 41\n');
    near(weightOf(r, 1), 960 / PI ** 6, 1e-12);
    near(weightOf(r, 1), 0.998555014364018, 1e-12);
    for (const l of r.levels) {
      const exact = l.n % 2 === 1 ? (8 * Math.sqrt(15)) / (l.n * PI) ** 3 : 0;
      expect(Math.abs(l.re! - exact)).toBeLessThan(1e-12);
      expect(Math.abs(l.im!)).toBeLessThan(1e-14);
      if (l.n % 2 === 0) expect(Math.abs(l.re!)).toBeLessThanOrEqual(1e-14); // parity zeros
    }
    const E1 = PI ** 2 / 2;
    near(r.energy?.mean, (10 / PI ** 2) * E1, 1e-10);
    // Sum over odd n of 1/n^6 = pi^6/960: the weights add up to 1 up to the tail beyond n = 41.
    let tail = 0;
    for (let n = 43; n < 20001; n += 2) tail += 960 / PI ** 6 / n ** 6;
    near(r.captured, 1 - tail, 1e-12);
    expect(r.parity).toBe('even');
    expect(r.norm).toBeCloseTo(1, 12);
  });

  it('sin^3: P_1 = 0.9, P_3 = 0.1, <E> = 1.8 E_1', () => {
    // Griffiths, Introduction to Quantum Mechanics, problem on the sin^3 state (from memory).
    const r = analyse('system box(0, 1)\nstate psi(x) = sin(pi x)^3\n');
    near(weightOf(r, 1), 0.9, 1e-12);
    near(weightOf(r, 3), 0.1, 1e-12);
    near(r.energy?.mean, 1.8 * (PI ** 2 / 2), 1e-10);
    near(r.captured, 1, 1e-12);
    // Only levels 1 and 3 are populated: the spread is exact too, sqrt(<E^2> - <E>^2) with E_3 = 9 E_1.
    const E1 = PI ** 2 / 2;
    near(r.energy?.spread, Math.sqrt(0.9 * E1 ** 2 + 0.1 * 81 * E1 ** 2 - (1.8 * E1) ** 2), 1e-9);
  });

  it('constant state: |c_n|^2 = 8/(n pi)^2 for odd n, and the energy mean diverges', () => {
    // Derived from the Fourier sine series of a constant.
    const r = analyse('system box(0, 1)\nstate psi(x) = 1\n');
    near(weightOf(r, 1), 0.810569469138702, 1e-12);
    near(weightOf(r, 3), 0.090063274348745, 1e-12);
    near(weightOf(r, 2), 0, 1e-14);
    expect(r.energy?.mean).toBeNull();
    expect(r.energy?.spread).toBeNull();
    expect(codes(r)).toContain('boundary');
    // Boyd, Chebyshev and Fourier Spectral Methods, ch. 2 (from memory): a jump (psi(0) != 0) gives 1/n.
    expect(r.decay?.classification).toBe('jump');
    expect(r.decay?.exponent).toBeGreaterThan(0.9);
    expect(r.decay?.exponent).toBeLessThan(1.1);
  });

  it('ground state of [0, L] released into [0, 2L]', () => {
    // Griffiths, Introduction to Quantum Mechanics, problem on the suddenly widened well (from memory).
    const r = analyse('system box(0, 2)\nstate eigen(1) of box(0, 1)\n');
    near(weightOf(r, 1), 32 / (9 * PI ** 2), 1e-12);
    near(weightOf(r, 1), 0.360253097394979, 1e-12);
    near(weightOf(r, 2), 0.5, 1e-12);
    near(weightOf(r, 3), 32 / (25 * PI ** 2), 1e-12);
    // The old wall at x = 1 is a kink inside the new box: finite mean (the old E_1), infinite spread.
    near(r.energy?.mean, PI ** 2 / 2, 1e-9);
    expect(r.energy?.spread).toBeNull();
  });

  it('ground state of [-L/2, L/2] released into [-L, L]', () => {
    // Shankar, Principles of Quantum Mechanics, exercise on the expanding well (from memory).
    const r = analyse('system box(-1, 1)\nstate eigen(1) of box(-0.5, 0.5)\n');
    near(weightOf(r, 1), 64 / (9 * PI ** 2), 1e-12);
    near(weightOf(r, 1), 0.720506194789957, 1e-12);
    expect(r.parity).toBe('even');
  });

  it('a kink gives |c_n| ~ 1/n^2', () => {
    // Boyd, Chebyshev and Fourier Spectral Methods, ch. 2 (from memory).
    const r = analyse('system box(0, 1)\nstate psi(x) = x < 0.5 ? x : 1 - x\nbasis 200\n');
    expect(r.decay?.classification).toBe('kink');
    expect(r.energy?.mean).not.toBeNull();
    expect(r.energy?.spread).toBeNull();
    // Tent peaked at 1/2: <H> = (1/2) integral of psi'^2 / norm = (1/2)(1)/(1/12) = 6 (derived).
    near(r.energy?.mean, 6, 1e-9);
  });
});

describe('harmonic oscillator (hbar = m = omega = 1)', () => {
  it('ground state displaced by d: Poisson weights e^-L L^n/n!, L = m omega d^2/(2 hbar)', () => {
    // Glauber, Phys. Rev. 131, 2766 (1963); Sakurai, Modern Quantum Mechanics (from memory).
    const r = analyse('system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1, center = sqrt(2))\n');
    near(weightOf(r, 0), 0.367879441171442, 1e-12);
    near(weightOf(r, 1), 0.367879441171442, 1e-12);
    near(weightOf(r, 2), 0.183939720585721, 1e-12);
    for (let n = 0; n < 20; n++) {
      let f = 1;
      for (let k = 2; k <= n; k++) f *= k;
      near(weightOf(r, n), Math.exp(-1) / f, 1e-12);
    }
    // Coherent state: <H> = omega (L + 1/2), Delta H = omega sqrt(L) (derived from the Poisson weights).
    near(r.energy?.mean, 1.5, 1e-10);
    near(r.energy?.spread, 1, 1e-9);
    expect(r.parity).toBe('mixed');
  });

  it('ground state of omega_1 = 2 omega_2: P_0 = sqrt(8)/3 and odd levels vanish', () => {
    // Gerry & Knight, Introductory Quantum Optics, squeezed vacuum (from memory).
    const r = analyse('system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 2)\n');
    near(weightOf(r, 0), Math.sqrt(8) / 3, 1e-12);
    near(weightOf(r, 0), 0.942809041582063, 1e-12);
    const rr = 1 / 3;
    for (let k = 0; k < 10; k++) {
      let f2k = 1;
      for (let j = 2; j <= 2 * k; j++) f2k *= j;
      let fk = 1;
      for (let j = 2; j <= k; j++) fk *= j;
      const exact = (Math.sqrt(1 - rr * rr) * f2k) / (4 ** k * fk * fk) * rr ** (2 * k);
      near(weightOf(r, 2 * k), exact, 1e-12);
      near(weightOf(r, 2 * k + 1), 0, 1e-14);
    }
    expect(r.parity).toBe('even');
  });
});

describe('finite square well (half-width a, z0 = a sqrt(2 m V0)/hbar)', () => {
  it('z0 = 1 holds one even state at z = 0.739085133215161', () => {
    // OEIS A003957 (the Dottie number, solution of cos z = z).
    const r = analyse('system well(depth = 0.5, width = 2)\nstate gaussian(center = 0, width = 0.5)\n');
    expect(r.system?.boundCount).toBe(1);
    const z = 0.739085133215161;
    near(r.system?.energies[0], (z * z) / 2, 1e-13);
    expect(r.continuum).toBeDefined();
    expect(r.continuum! + r.captured!).toBeCloseTo(1, 12);
  });

  it('number of bound states is ceil(2 z0 / pi)', () => {
    // Griffiths, Introduction to Quantum Mechanics, finite square well section (from memory).
    for (const z0 of [0.3, 1.5, 1.6, 3.2, 7.9, 20]) {
      // a = 1, m = 1: V0 = z0^2 / 2.
      const r = analyse(`system well(depth = ${(z0 * z0) / 2}, width = 2)\nstate gaussian(center = 0, width = 0.3)\n`);
      expect(r.system?.boundCount).toBe(Math.ceil((2 * z0) / PI));
    }
  });
});

describe('constants (CODATA 2018)', () => {
  it('hbar^2/(2 m_e) = 0.0380998211 eV nm^2 sets the box energies', () => {
    // CODATA 2018 recommended values (NIST); the combination is derived.
    const r = analyse('units nm, eV\nsystem box(0 nm, 1 nm)\nstate psi(x) = sin(pi x / (1 nm))\n');
    near(r.system?.energies[0], PI ** 2 * 0.0380998211, PI ** 2 * 0.0380998211 * 2e-9);
    near(r.energy?.mean, PI ** 2 * 0.0380998211, PI ** 2 * 0.0380998211 * 2e-9);
  });
});
