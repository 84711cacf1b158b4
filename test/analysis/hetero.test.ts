/**
 * Position-dependent mass through the whole analysis: the finite well with a barrier mass, its energy
 * and its sudden changes.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { EV_SI, HBAR_SI, ME_SI } from '../../server/src/expr/constants';
import { erf, fromDecimal, toNumber } from '../physics/fixedPoint';

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
