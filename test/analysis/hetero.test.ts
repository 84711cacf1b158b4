/**
 * Position-dependent mass through the whole analysis: the finite well with a barrier mass, its energy
 * and its sudden changes.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { EV_SI, HBAR_SI, ME_SI } from '../../server/src/expr/constants';
import { erf, fromDecimal, toNumber } from '../physics/fixedPoint';
import { compositeGaussLegendre } from '../../server/src/physics/quadrature';

const HEAD = 'units nm, meV\nmass 0.067 m_e\n';
const WELL = 'well(depth = 250 meV, width = 8 nm, barrier_mass = 0.092 m_e)';

describe('finite well with a barrier mass in a file', () => {
  it('gives the BenDaniel-Duke levels and keeps the constant-mass well without the argument', () => {
    // CHECKS.md, "Position-dependent mass": 41.9494836359 and 161.7405425666 meV; equal masses 45.41964039014, 168.601400714 meV.
    const r = analyse(`${HEAD}system ${WELL}\nstate eigen(1) of ${WELL}\n`);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(Math.abs(r.levels[0]!.energy / 41.9494836359 - 1)).toBeLessThan(1e-10);
    expect(Math.abs(r.levels[1]!.energy / 161.7405425666 - 1)).toBeLessThan(1e-10);
    // Its own ground state: weight 1 (orthonormality, an invariant), energy the level's.
    expect(Math.abs(r.levels[0]!.weight - 1)).toBeLessThan(1e-10);
    expect(Math.abs(r.energy!.mean! / 41.9494836359 - 1)).toBeLessThan(1e-8);
    const plain = analyse(`${HEAD}system well(depth = 250 meV, width = 8 nm)\nstate eigen(1) of well(depth = 250 meV, width = 8 nm)\n`);
    expect(Math.abs(plain.levels[0]!.energy / 45.41964039014 - 1)).toBeLessThan(1e-10);
    expect(Math.abs(plain.levels[1]!.energy / 168.601400714 - 1)).toBeLessThan(1e-10);
  });

  it('measures <H> with the mass of each region', () => {
    // A real Gaussian of position spread s centred in the well (half-width a, t = a/s): with
    // |psi'|^2 = x^2/(4 s^4) |psi|^2 and the standard normal's integral of u^2 phi(u) over u > t,
    // t phi(t) + Q(t), the share outside is P = 2 (t phi(t) + Q(t)) and
    // <H> = (1/(4 s^2)) [(1 - P)/(2 m_w) + P/(2 m_b)] + V0 2 Q(t) (hbar = 1; derived in this comment),
    // Q(t) = erfc(t/sqrt 2)/2 from a 50-digit series (test/physics/fixedPoint.ts).
    const M = (ME_SI * 1e-18 * EV_SI * 1e-3) / (HBAR_SI * HBAR_SI);
    for (const s of [1, 2]) {
      const t = 4 / s;
      const Q = 0.5 * (1 - toNumber(erf(fromDecimal(String(t / Math.SQRT2)))));
      const P = 2 * ((t * Math.exp(-t * t / 2)) / Math.sqrt(2 * Math.PI) + Q);
      const expected = (1 / (4 * s * s)) * ((1 - P) / (2 * 0.067 * M) + P / (2 * 0.092 * M)) + 250 * 2 * Q;
      const r = analyse(`${HEAD}system ${WELL}\nstate gaussian(center = 0 nm, width = ${s} nm)\n`);
      expect(Math.abs(r.energy!.mean! / expected - 1)).toBeLessThan(1e-9);
      // The spread with a mass jump is not finite for a packet whose psi'/m jumps (a delta in H psi).
      expect(r.energy!.spread).toBeNull();
    }
  });

  it('rejects a barrier mass that is not a positive mass', () => {
    const bad = analyse(`${HEAD}system well(depth = 250 meV, width = 8 nm, barrier_mass = -0.1 m_e)\nstate gaussian(center = 0 nm, width = 1 nm)\n`);
    expect(bad.diagnostics.some((d) => d.code === 'evaluation' && d.severity === 'error')).toBe(true);
    const units = analyse(`${HEAD}system well(depth = 250 meV, width = 8 nm, barrier_mass = 0.1 nm)\nstate gaussian(center = 0 nm, width = 1 nm)\n`);
    expect(units.diagnostics.some((d) => d.code === 'units')).toBe(true);
  });
});

/**
 * A smooth mass with a closed form (the change of variables of test/physics/massProfile.test.ts, derived
 * there): s = 1 + tanh(x)/2, m = s^2, y = x + ln(cosh x)/2 and V = y^2/2 - U with
 * U = -(1/4) s_xx/s^3 + (5/8) s_x^2/s^4 has E_n = n + 1/2 and psi_n = s^(1/2) phi_n(y), phi_n the
 * oscillator's levels (hbar = m = omega = 1).
 */
const S = '(1 + tanh(x)/2)';
const SX = '(sech(x)^2/2)';
const SXX = '(-sech(x)^2 tanh(x))';
const SMOOTH = `V(x) = (x + log(cosh(x))/2)^2/2 + ${SXX}/(4 ${S}^3) - 5 ${SX}^2/(8 ${S}^4) over [-16, 12] with mass(x) = ${S}^2`;

describe('V(x) with mass(x) in a file', () => {
  it('solves a smooth mass profile to its closed form, and the energy of a superposition with m(x)', () => {
    // psi = phi_1 + phi_3: <H> = (E_1 + E_3)/2 = 1.5 and the spread (E_3 - E_1)/2 = 1, the grid's
    // integrals of |psi'|^2/(2 m(x)) + V |psi|^2 and |H psi|^2 with the chain-rule derivatives of the levels.
    const r = analyse(`system ${SMOOTH}\nstate psi(x) = phi(1, x) + phi(3, x)\nbasis 8\n`);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    for (let n = 0; n < 8; n++) {
      const lv = r.levels[n]!;
      expect(Math.abs(lv.energy - (n + 0.5))).toBeLessThan(1e-9);
      expect(Math.abs(lv.energy - (n + 0.5))).toBeLessThanOrEqual(lv.uncertainty!);
    }
    expect(Math.abs(r.energy!.mean! - 1.5)).toBeLessThan(1e-9);
    expect(Math.abs(r.energy!.spread! - 1)).toBeLessThan(1e-8);
  });

  it('a sudden change between two mass profiles: the overlap is the plain inner product', () => {
    // The ground state of the smooth-mass system, psi_1 = s^(1/2) pi^(-1/4) exp(-y^2/2), released into
    // the constant-mass oscillator: weight |<phi_0|psi_1>|^2 with the plain inner product, computed here
    // by quadrature of the two closed forms.
    const r = analyse(`system oscillator(omega = 1)\nstate eigen(1) of ${SMOOTH}\nbasis 40\n`);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    const rule = compositeGaussLegendre(-16, 12, { panels: 200, order: 20 });
    let overlap = 0;
    for (let j = 0; j < rule.x.length; j++) {
      const x = rule.x[j]!;
      const s = 1 + Math.tanh(x) / 2;
      const y = x + Math.log(Math.cosh(x)) / 2;
      overlap += rule.w[j]! * Math.PI ** -0.5 * Math.sqrt(s) * Math.exp(-(y * y) / 2 - (x * x) / 2);
    }
    expect(Math.abs(r.levels[0]!.weight - overlap * overlap)).toBeLessThan(1e-9);
    expect(overlap * overlap).toBeLessThan(0.99);
    expect(Math.abs(r.norm! - 1)).toBeLessThan(1e-9);
  });

  it('reports a mass that is not positive, with the x, on the mass formula', () => {
    const text = `${HEAD}system V(x) = 0 meV over [0 nm, 10 nm] with mass(x) = (x - 6 nm) * 0.1 m_e / nm\nstate gaussian(center = 5 nm, width = 1 nm)\n`;
    const r = analyse(text);
    const d = r.diagnostics.find((x) => x.code === 'evaluation')!;
    expect(d).toBeDefined();
    expect(text.slice(d.start, d.end)).toBe('(x - 6 nm) * 0.1 m_e / nm');
    expect(d.message).toMatch(/not positive at x = /);
    const units = analyse(`${HEAD}system V(x) = 0 meV over [0 nm, 10 nm] with mass(x) = 0.1 meV\nstate gaussian(center = 5 nm, width = 1 nm)\n`);
    expect(units.diagnostics.some((x) => x.code === 'units')).toBe(true);
  });
});

describe('mass profiles in an untrusted workspace', () => {
  it('checks the names and dimensions of barrier_mass and mass(x) without evaluating them', () => {
    const good = analyse(`${HEAD}system V(x) = 0 meV over [0 nm, 10 nm] with mass(x) = x < 5 nm ? 0.067 m_e : 0.092 m_e\nstate gaussian(center = 5 nm, width = 1 nm)\n`, { evaluate: false });
    expect(good.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    const text = `${HEAD}system V(x) = 0 meV over [0 nm, 10 nm] with mass(x) = 0.1 meV\nstate eigen(1) of well(depth = 1 meV, width = 1 nm, barrier_mass = 2 nm)\n`;
    const bad = analyse(text, { evaluate: false });
    const units = bad.diagnostics.filter((d) => d.code === 'units').map((d) => text.slice(d.start, d.end));
    expect(units).toEqual(['0.1 meV', '2 nm']);
    const syntax = analyse('system V(x) = x^2 over [-1, 1] with mas(x) = 1\nstate gaussian(center = 0, width = 0.2)\n', { evaluate: false });
    expect(syntax.diagnostics.some((d) => d.code === 'syntax' && /mass\(x\) = \.\.\./.test(d.message))).toBe(true);
  });
});
