import { describe, it, expect } from 'vitest';
import { A0_SI, CONSTANTS, EV_SI, H_SI, HARTREE_SI, HBAR_SI, ME_SI, MP_SI, QE_SI, RYDBERG_SI, U_SI, UNITS } from '../../server/src/expr/constants';
import { analyse } from '../../server/src/analysis/index';
import { constant, scopeFor } from './helpers';

/*
 * Source of every value typed below: CODATA 2018 recommended values (NIST); SI brochure 9th ed. for exact
 * ones. A value agrees "to its last published digit" when it differs from the table by at most half a
 * unit of that digit; `digits` is the number of significant digits the table prints.
 */
function unitOfLastDigit(published: number, digits: number): number {
  return Math.pow(10, Math.floor(Math.log10(Math.abs(published))) - (digits - 1));
}
/** `slack` adds the rounding carried in from a published input the value is derived from. */
function toLastDigit(value: number, published: number, digits: number, slack = 0): void {
  expect(Math.abs(value - published)).toBeLessThanOrEqual(0.5 * unitOfLastDigit(published, digits) + slack);
}
/** Exact values the table prints cut off with "...": the printed digits are a prefix of the value. */
function truncatedTo(value: number, printed: number, digits: number): void {
  const d = value - printed;
  expect(d).toBeGreaterThanOrEqual(-1e-15 * printed);
  expect(d).toBeLessThan(unitOfLastDigit(printed, digits));
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('constants against the CODATA 2018 table', () => {
  it('the exact defining constants are the SI values', () => {
    // SI brochure 9th ed.: h and e are exact by definition.
    expect(H_SI).toBe(6.62607015e-34);
    expect(QE_SI).toBe(1.602176634e-19);
    expect(EV_SI).toBe(1.602176634e-19);
    expect(UNITS.get('eV')!.si).toBe(1.602176634e-19);
  });

  it('hbar is h/(2 pi), not a truncated copy', () => {
    // CODATA 2018: hbar = 1.054571817... e-34 J s (exact; the table prints 10 digits and "...").
    truncatedTo(HBAR_SI, 1.054571817e-34, 10);
    // Derived: 6.62607015e-34 / (2 pi) = 1.0545718176461565e-34 (30-digit arithmetic, /work CHECKS list).
    expect(rel(HBAR_SI, 1.0545718176461565e-34)).toBeLessThan(2e-16);
    expect(rel(H_SI / HBAR_SI, 2 * Math.PI)).toBeLessThan(2e-16);
    expect(CONSTANTS.get('hbar')!.si).toBe(HBAR_SI);
    // CODATA 2018: hbar in eV s = 6.582119569... e-16 (exact), h in eV s = 4.135667696... e-15 (exact).
    truncatedTo(HBAR_SI / EV_SI, 6.582119569e-16, 10);
    truncatedTo(H_SI / EV_SI, 4.135667696e-15, 10);
  });

  it('the measured constants are the published ones', () => {
    toLastDigit(ME_SI, 9.1093837015e-31, 11);
    toLastDigit(MP_SI, 1.67262192369e-27, 12);
    toLastDigit(U_SI, 1.6605390666e-27, 12);
    toLastDigit(A0_SI, 5.29177210903e-11, 12);
    toLastDigit(HARTREE_SI, 4.3597447222071e-18, 14);
    expect(UNITS.get('m_e')!.si).toBe(ME_SI);
    expect(UNITS.get('m_p')!.si).toBe(MP_SI);
    expect(UNITS.get('u')!.si).toBe(U_SI);
    expect(UNITS.get('bohr')!.si).toBe(A0_SI);
  });

  it('derived energies agree with the table', () => {
    // CODATA 2018: hartree in eV 27.211386245988, Rydberg energy R_inf h c = 2.1798723611035e-18 J
    // = 13.605693122994 eV. The Rydberg energy is half the published hartree, so it also carries half of
    // the hartree's own rounding (0.5e-31 J / 2).
    toLastDigit(HARTREE_SI / EV_SI, 27.211386245988, 14);
    toLastDigit(RYDBERG_SI, 2.1798723611035e-18, 14, 0.25e-31);
    toLastDigit(RYDBERG_SI / EV_SI, 13.605693122994, 14);
    toLastDigit(UNITS.get('meV')!.si, 1.602176634e-22, 10);
    // The SI prefixes (SI brochure 9th ed.): 1 neV = 1e-9 eV, exactly the elementary charge times 1e-9 V.
    toLastDigit(UNITS.get('neV')!.si, 1.602176634e-28, 10);
    expect(UNITS.get('neV')!.kind).toBe('energy');
  });
});

describe('constants in a file with units nm, eV', () => {
  it('hbar^2/(2 m_e) = 0.0380998211615486 eV nm^2', () => {
    // Derived from h, e and m_e above in 30-digit arithmetic (the shared check list).
    const v = constant('hbar^2 / (2 m_e)', scopeFor(['nm', 'eV'])).re;
    expect(rel(v, 0.0380998211615486)).toBeLessThan(1e-14);
    expect(rel(constant('h / (2 pi)', scopeFor(['nm', 'eV'])).re, 1)).toBeLessThan(1e-15);
  });

  it('an electron in a 1 nm box has E1 = h^2/(8 m_e L^2) = 0.37603016262 eV', () => {
    // Derived in this comment: E1 = pi^2 hbar^2/(2 m_e L^2) = h^2/(8 m_e L^2) with L = 1e-9 m, in eV by
    // dividing by e: (6.62607015e-34)^2 / (8 * 9.1093837015e-31 * 1e-18) / 1.602176634e-19.
    const h = 6.62607015e-34;
    const me = 9.1093837015e-31;
    const e = 1.602176634e-19;
    const expected = (h * h) / (8 * me * 1e-18) / e;
    expect(rel(expected, 0.37603016262)).toBeLessThan(2e-11);
    const text = ['units nm, eV', 'mass 1 m_e', 'system box(0 nm, 1 nm)', 'state psi(x) = sin(pi x / (1 nm)) / sqrt(0.5 nm)', 'basis 3', ''].join('\n');
    const r = analyse(text);
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    const e1 = r.levels.find((l) => l.n === 1)!;
    expect(rel(e1.energy, expected)).toBeLessThan(1e-10);
    expect(rel(r.system!.energies[0]!, expected)).toBeLessThan(1e-10);
  });
});
