import { describe, it, expect } from 'vitest';
import { potentialBasis, type PotentialFn } from '../../server/src/physics/potential';
import { wellBasis } from '../../server/src/physics/well';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';
import { buildMassMap, xiAt } from '../../server/src/physics/massMap';
import type { MassProfile } from '../../server/src/physics/massProfile';
import { EV_SI, HBAR_SI, ME_SI } from '../../server/src/expr/constants';
import { basisOrthonormalityError } from './helpers';

/** The electron mass in the internal units of a file in nm and meV (hbar = 1). */
const M_E = (ME_SI * 1e-18 * EV_SI * 1e-3) / (HBAR_SI * HBAR_SI);

const map = (f: (x: number) => number) => (xs: Float64Array) => xs.map(f);

/** A profile from a formula and its derivative, with known breaks. */
function profile(m: (x: number) => number, dm: (x: number) => number, breaks: number[] = []): MassProfile {
  return { at: map(m), slope: map(dm), breaks };
}

describe('mass coordinate', () => {
  it('integrates m exactly on panels that end on its jumps', () => {
    // xi(x) = integral of m: for m = 2 + sin x on x < 1 and 5 on x > 1 (closed form, derived).
    const m = (x: number) => (x < 1 ? 2 + Math.sin(x) : 5);
    const exact = (x: number) => (x < 1 ? 2 * x + 1 - Math.cos(x) : 2 + 1 - Math.cos(1) + 5 * (x - 1));
    const mm = buildMassMap(map(m), 0, 3, [1], 8)!;
    const xs = Float64Array.of(0.1, 0.5, 0.999, 1.0001, 2.2, 2.9999);
    const got = xiAt(mm, xs);
    xs.forEach((x, i) => expect(Math.abs(got[i]! - exact(x))).toBeLessThan(1e-14));
    expect(Math.abs(mm.total - exact(3))).toBeLessThan(1e-14);
  });
});

describe('potentialBasis with a mass profile', () => {
  it('a constant profile reproduces the constant-mass solver and the oscillator', () => {
    // E_n = n + 1/2 for V = x^2/2, m = 1 (common practice).
    const V: PotentialFn = map((x) => 0.5 * x * x);
    const plain = potentialBasis(V, -10, 10, 1, 8);
    const prof = potentialBasis(V, -10, 10, 1, 8, { massProfile: profile(() => 1, () => 0) });
    for (let n = 0; n < 8; n++) {
      expect(Math.abs(prof.basis.energies[n]! - (n + 0.5))).toBeLessThan(1e-10);
      expect(Math.abs(prof.basis.energies[n]! - plain.basis.energies[n]!)).toBeLessThan(1e-10);
    }
    // The box with m = 2: E_n = n^2 pi^2 / (2 m L^2) (common practice).
    const box = potentialBasis(map(() => 0), 0, 3, 1, 6, { massProfile: profile(() => 2, () => 0) });
    for (let n = 1; n <= 6; n++) expect(Math.abs(box.basis.energies[n - 1]! / ((n * n * Math.PI ** 2) / (2 * 2 * 9)) - 1)).toBeLessThan(1e-12);
  });

  it('the BenDaniel-Duke well as V(x) with a mass step agrees with the closed form within its stated uncertainty', () => {
    // Closed form: well.ts, itself checked against CHECKS.md and a 50-digit root finder (heteroWell.test.ts).
    // The walls at +-30 nm shift the levels by about e^{-2 kappa (30 - 4)} < 1e-10 relative (kappa >= 0.46/nm).
    const mw = 0.067 * M_E;
    const mb = 0.092 * M_E;
    const exact = wellBasis(250, 8, 0, mw, { barrierMass: mb });
    const V: PotentialFn = map((x) => (Math.abs(x) < 4 ? 0 : 250));
    const prof = profile((x) => (Math.abs(x) < 4 ? mw : mb), () => 0, [-4, 4]);
    for (const tolerance of [1e-5, 1e-6]) {
      const r = potentialBasis(V, -30, 30, mw, 2, { massProfile: prof, tolerance });
      expect(r.unresolved).toBeNull();
      expect(r.notes.some((n) => n.kind === 'jumps')).toBe(true);
      for (let k = 0; k < 2; k++) {
        const err = Math.abs(r.basis.energies[k]! - exact.energies[k]!);
        const unc = r.basis.uncertainty![k]!;
        expect(err).toBeLessThanOrEqual(unc);
        expect(unc).toBeLessThanOrEqual(tolerance * exact.energies[k]!);
      }
      expect(r.basis.masses).toBeDefined();
      expect(r.basis.massJumps).toEqual([-4, 4]);
    }
  });

  it('levels join psi and psi\'/m at the interfaces and are orthonormal in the plain inner product', () => {
    const V: PotentialFn = map((x) => (x < 1 ? 0.3 * x : 2));
    const prof = profile((x) => (x < 0 ? 1 : 3), () => 0, [0]);
    const r = potentialBasis(V, -4, 4, 1, 10, { massProfile: prof, tolerance: 1e-6 });
    const b = r.basis;
    expect(b.count).toBe(10);
    const h = 1e-7;
    const xs = Float64Array.of(-h, h);
    const v = new Float64Array(2 * 10);
    const d = new Float64Array(2 * 10);
    b.table(xs, 10, v, d);
    for (let k = 0; k < 10; k++) {
      // BenDaniel & Duke, Phys. Rev. 152, 683 (1966): psi and psi'/m continuous.
      const scale = Math.max(Math.abs(d[2 * k]!), Math.abs(d[2 * k + 1]! / 3), 1e-3);
      expect(Math.abs(v[2 * k]! - v[2 * k + 1]!)).toBeLessThan(1e-6);
      expect(Math.abs(d[2 * k]! / 1 - d[2 * k + 1]! / 3)).toBeLessThan(1e-5 * scale);
      // The slope itself jumps by the mass ratio (a kink), unless it vanishes.
    }
    const rule = compositeGaussLegendre(-4, 4, { breakpoints: [0, 1], panels: 80, order: 20 });
    // Orthonormality: common practice for a self-adjoint operator.
    expect(basisOrthonormalityError(b, rule, 10)).toBeLessThan(1e-10);
  });

  it('a smooth mass maps to the oscillator by a change of variables', () => {
    // Derived in this comment. With s = sqrt(m), y = integral s dx and psi = s^(1/2) phi(y),
    // d/dx = s d/dy gives (psi'/m)' = s^(1/2) [phi_yy + (s_yy/(2 s) - 3 s_y^2/(4 s^2)) phi] (the phi_y terms
    // cancel), so H psi = E psi becomes -(1/2) phi_yy + (V + U) phi = E phi with
    // U = -(1/4) s_yy/s + (3/8) (s_y/s)^2 = -(1/4) s_xx/s^3 + (5/8) s_x^2/s^4, and the plain norm of psi is
    // the norm of phi in y. V = y^2/2 - U therefore has E_n = n + 1/2 (the oscillator with m = omega = 1),
    // up to the walls, whose effect is below 1e-12 here (y from -8.35 to 17.65).
    // s = 1 + tanh(x)/2: s_x = sech^2(x)/2, s_xx = -sech^2(x) tanh(x), y = x + ln(cosh x)/2.
    const s = (x: number) => 1 + 0.5 * Math.tanh(x);
    const sx = (x: number) => 0.5 / Math.cosh(x) ** 2;
    const sxx = (x: number) => -Math.tanh(x) / Math.cosh(x) ** 2;
    const y = (x: number) => x + 0.5 * Math.log(Math.cosh(x));
    const U = (x: number) => -0.25 * (sxx(x) / s(x) ** 3) + 0.625 * (sx(x) ** 2 / s(x) ** 4);
    const V: PotentialFn = map((x) => 0.5 * y(x) ** 2 - U(x));
    const prof = profile((x) => s(x) ** 2, (x) => 2 * s(x) * sx(x));
    const r = potentialBasis(V, -16, 12, 1, 6, { massProfile: prof });
    expect(r.unresolved).toBeNull();
    for (let n = 0; n < 6; n++) {
      const err = Math.abs(r.basis.energies[n]! - (n + 0.5));
      expect(err).toBeLessThan(1e-11);
      expect(err).toBeLessThanOrEqual(r.basis.uncertainty![n]!);
    }
    // Spectral: on fixed grids 1.5 times apart the ground state's error falls by more than 10 each time
    // (measured 26 to 470, growing: exponential), where the N^-3 of a jump gives 1.5^3 = 3.4.
    let prev = Infinity;
    for (const N of [20, 30, 45, 68, 100]) {
      const fixed = potentialBasis(V, -16, 12, 1, 1, { massProfile: prof, minPoints: N, maxPoints: N, growth: 1.0001 });
      const err = Math.abs(fixed.basis.energies[0]! - 0.5);
      expect(err).toBeLessThan(prev / 10);
      prev = err;
    }
    expect(prev).toBeLessThan(1e-8);
  });

  it('reports a mass that is not positive or not finite, with the x', () => {
    const V: PotentialFn = map(() => 0);
    const neg = potentialBasis(V, 0, 1, 1, 3, { massProfile: profile((x) => (x < 0.6 ? 1 : -1), () => 0, [0.6]) });
    expect(neg.basis.count).toBe(0);
    expect(neg.notes[0]!.kind).toBe('mass');
    expect(neg.notes[0]!.at!).toBeGreaterThan(0.6);
    expect(neg.notes[0]!.at!).toBeLessThan(0.61);
    const nan = potentialBasis(V, 0, 1, 1, 3, { massProfile: profile((x) => (x < 0.3 ? 1 : NaN), () => 0) });
    expect(nan.basis.count).toBe(0);
    expect(nan.notes[0]!.message).toMatch(/not a number/);
  });

  it('notes a mass layer thinner than the grid and a step steeper than its panels', () => {
    const V: PotentialFn = map(() => 0);
    const thin = potentialBasis(V, 0, 10, 1, 3, { massProfile: profile((x) => (Math.abs(x - 5) < 5e-4 ? 8 : 1), () => 0, [5 - 5e-4, 5 + 5e-4]), tolerance: 1e-4 });
    expect(thin.notes.some((n) => n.kind === 'mass' && /thinner than two grid spacings/.test(n.message) && Math.abs(n.at! - (5 - 5e-4)) < 1e-12)).toBe(true);
    // A heavy bump of width 1e-4, far below the scan's sample spacing, that no breakpoint announces: the
    // halved panels move xi. (A steep step is found by the scan and becomes a panel end instead.)
    const steep = potentialBasis(V, 0, 10, 1, 3, { massProfile: profile((x) => 1 + 5 * Math.exp(-(((x - 5.123) / 1e-4) ** 2)), () => 0), tolerance: 1e-4 });
    expect(steep.notes.some((n) => n.kind === 'mass' && /faster than the solver's panels/.test(n.message))).toBe(true);
    // A resolved profile gets neither note.
    const fine = potentialBasis(V, 0, 10, 1, 3, { massProfile: profile((x) => (x < 5 ? 1 : 2), () => 0, [5]), tolerance: 1e-4 });
    expect(fine.notes.filter((n) => n.kind === 'mass')).toEqual([]);
  });
});
