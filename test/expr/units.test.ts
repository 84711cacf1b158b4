import { describe, it, expect } from 'vitest';
import { A0_SI, CONSTANTS, H_SI, HARTREE_SI, HBAR_SI, ME_SI, MP_SI, QE_SI, U_SI, UNITS } from '../../server/src/expr/constants';
import { formatDimension, fromInternal, makeUnitSystem, timeToDisplay, timeUnitName, toInternal } from '../../server/src/expr/units';
import { checkExpression } from '../../server/src/expr/check';
import { evaluateConstant } from '../../server/src/expr/compile';
import type { Dimension, UnitSystem } from '../../server/src/expr/types';
import { constant, parse, points, scopeFor } from './helpers';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('constants', () => {
  it('are the CODATA 2018 values', () => {
    // Source: CODATA 2018 recommended values (NIST); hbar = h/(2 pi) = 1.0545718176461565e-34 (derived).
    expect(HBAR_SI).toBe(6.62607015e-34 / (2 * Math.PI));
    expect(QE_SI).toBe(1.602176634e-19);
    expect(ME_SI).toBe(9.1093837015e-31);
    expect(MP_SI).toBe(1.67262192369e-27);
    expect(U_SI).toBe(1.6605390666e-27);
    expect(A0_SI).toBe(5.29177210903e-11);
    expect(H_SI).toBe(6.62607015e-34);
    expect(UNITS.get('eV')!.si).toBe(1.602176634e-19);
    expect(CONSTANTS.get('hbar')!.si).toBe(HBAR_SI);
  });
  it('are consistent with each other (invariant: h = 2 pi hbar to rounding)', () => {
    expect(rel(H_SI / (2 * Math.PI), HBAR_SI)).toBeLessThan(1e-15);
    // Hartree = 2 Rydberg; Hartree = 27.211386245988 eV. Source: CODATA 2018 recommended values (NIST).
    expect(rel(HARTREE_SI / QE_SI, 27.211386245988)).toBeLessThan(1e-12);
    expect(UNITS.get('Ry')!.si * 2).toBe(HARTREE_SI);
  });
});

describe('internal units of a file with units nm, eV', () => {
  const scope = scopeFor(['nm', 'eV']);
  it('give hbar = 1', () => {
    expect(constant('hbar', scope).re).toBeCloseTo(1, 14);
  });
  it('give hbar^2/(2 m_e) = 0.0380998211 eV nm^2', () => {
    // Source: CODATA 2018 recommended values (NIST); hbar^2/(2 m_e) = 0.0380998211 eV nm^2 (derived).
    const v = constant('hbar^2 / (2 m_e)', scope).re;
    expect(rel(v, 0.0380998211)).toBeLessThan(3e-9);
    const c = checkExpression(parse('hbar^2 / (2 m_e)'), scope, null, 'the value');
    expect(formatDimension(c.dimension!)).toBe('energy·length^2');
  });
  it('convert lengths, energies and frequencies', () => {
    const meV = scopeFor(['meV', 'nm']);
    expect(constant('1 eV', meV).re).toBeCloseTo(1000, 10);
    expect(constant('10 \u00C5', meV).re).toBeCloseTo(1, 14);
    expect(constant('1 bohr', meV).re).toBeCloseTo(0.0529177210903, 15);
    expect(constant('2.5 \u00B5m + 500 nm', meV).re).toBeCloseTo(3000, 10);
    // h x 1 THz = 4.135667696 meV. Source: CODATA 2018 recommended values (NIST) (derived: h/e in eV s).
    expect(rel(constant('h * 1 THz', meV).re, 4.135667696)).toBeLessThan(1e-9);
    // 1 Ha in eV: 27.211386245988. Source: CODATA 2018 recommended values (NIST).
    expect(rel(constant('1 Ha', scope).re, 27.211386245988)).toBeLessThan(1e-12);
  });
  it('show internal times in the file time unit', () => {
    const u = makeUnitSystem([
      { name: 'nm', span: { start: 0, end: 2 } },
      { name: 'eV', span: { start: 4, end: 6 } },
      { name: 'fs', span: { start: 8, end: 10 } },
    ]).result!;
    // hbar/eV = 6.582119569e-16 s. Source: CODATA 2018 recommended values (NIST) (derived: hbar in eV s).
    expect(rel(timeToDisplay(1, u), 0.6582119569)).toBeLessThan(1e-9);
    expect(timeUnitName(u)).toBe('fs');
    expect(rel(constant('1 fs', scopeFor(['nm', 'eV'])).re, 1 / 0.6582119569)).toBeLessThan(1e-9);
    expect(timeUnitName(scopeFor(['nm', 'eV']).units)).toBe('hbar/eV');
  });
  it('round-trip (invariant: fromInternal(toInternal(v)) = v)', () => {
    const systems: UnitSystem[] = [scopeFor(['nm', 'meV']).units, scopeFor(['bohr', 'Ha', 'as']).units, scopeFor(null).units];
    const dims: Dimension[] = [[1, 0, 0, 0], [2, 1, -2, 0], [0, 0, 1, 0], [0, 1, 0, 0], [-0.5, 0, 0, 0], [2, 1, -1, 0], [0, 0, 0, 1], [-3, 2, 1, 1]];
    const vs = points(20, 1e-3, 1e3);
    for (const u of systems) for (const d of dims) for (const v of vs) expect(rel(fromInternal(toInternal(v, d, u), d, u), v)).toBeLessThan(1e-14);
  });
});

describe('the units line', () => {
  const line = (...names: string[]) => {
    let at = 6;
    return names.map((name) => {
      const span = { start: at, end: at + name.length };
      at += name.length + 2;
      return { name, span };
    });
  };
  it('accepts a length, an energy and a time in any order', () => {
    const u = makeUnitSystem(line('ps', 'meV', 'nm'));
    expect(u.diagnostics).toEqual([]);
    expect(u.result).toMatchObject({ mode: 'physical', length: { name: 'nm' }, energy: { name: 'meV' }, time: { name: 'ps' } });
    expect(makeUnitSystem(null).result).toEqual({ mode: 'natural' });
  });
  it('refuses unknown names with a suggestion, on the name', () => {
    const u = makeUnitSystem(line('nm', 'mev'));
    expect(u.result).toBeNull();
    expect(u.diagnostics.map((d) => [d.code, d.start, d.end])).toEqual([['units', 10, 13]]);
    // Wording on purpose: this suggestion comes without a quick fix, so the sentence is where it lives.
    expect(u.diagnostics[0]!.message).toContain("Did you mean 'meV'?");
  });
  it('refuses repeats, other kinds and missing kinds', () => {
    const twice = makeUnitSystem(line('nm', 'eV', 'pm'));
    expect(twice.diagnostics.map((d) => [d.code, d.start])).toEqual([['units', 14]]);
    expect(makeUnitSystem(line('nm', 'kg')).diagnostics.map((d) => d.code)).toEqual(['units', 'units']);
    const noEnergy = makeUnitSystem(line('nm', 'fs'));
    expect(noEnergy.result).toBeNull();
    // On the whole list of names (from the first to the last).
    expect(noEnergy.diagnostics.map((d) => [d.code, d.start, d.end])).toEqual([['units', 6, 12]]);
  });
});

describe('dimension words', () => {
  it('read naturally', () => {
    const cases: [Dimension, string][] = [
      [[0, 0, 0, 0], 'dimensionless'],
      [[1, 0, 0, 0], 'length'],
      [[2, 1, -2, 0], 'energy'],
      [[0, 0, 1, 0], 'time'],
      [[-1, 0, 0, 0], '1/length'],
      [[0, 1, 0, 0], 'mass'],
      [[2, 0, 0, 0], 'length^2'],
      [[2, 1, -1, 0], 'energy·time'],
      [[-0.5, 0, 0, 0], '1/length^(1/2)'],
      [[0, 0, -1, 0], '1/time'],
    ];
    for (const [d, w] of cases) expect(formatDimension(d)).toBe(w);
  });
});

describe('natural units', () => {
  it('refuse units and dimensional constants', () => {
    const scope = scopeFor(null, { hasX: true });
    // Each on the unit or constant itself.
    for (const [text, word] of [['2 nm', 'nm'], ['hbar', 'hbar'], ['x + 1 eV', 'eV'], ['m_e', 'm_e']] as const) {
      const c = checkExpression(parse(text), scope, null, 'the value');
      expect(c.diagnostics.map((d) => [d.code, d.start, d.end])).toEqual([['units', text.indexOf(word), text.indexOf(word) + word.length]]);
      expect(evaluateConstant(parse(text.replace('x + ', '')), scope).result).toBeNull();
    }
    expect(constant('2 pi', scope).re).toBe(2 * Math.PI);
  });
});
