/**
 * Wavenumbers as energies under their own unit name, `invcm` = h c / (1 cm), while `1 / cm` stays a
 * 1/length. Expected: 1 cm^-1 = 1.239841984e-4 eV (CODATA 2018 energy conversion factors; h and c
 * exact in the SI), so 8065.543937 invcm = 1 eV.
 */
import { describe, expect, it } from 'vitest';
import { UNITS } from '../../server/src/expr/constants';
import { analyse } from '../../server/src/analysis/index';

describe('invcm', () => {
  it('is the energy h c / (1 cm)', () => {
    const u = UNITS.get('invcm')!;
    expect(u.kind).toBe('energy');
    expect(u.si / 1.602176634e-19).toBeCloseTo(1.239841984e-4, 12);
  });

  it('gives energies in a file, and shows them in a units line that names it', () => {
    const r = analyse('units angstrom, eV\nlet E = 8065.543937 invcm\nsystem oscillator(quantum = E)\nstate eigen(0) of oscillator(quantum = E)\n');
    expect(r.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(r.system!.energies[1]! - r.system!.energies[0]!).toBeCloseTo(1, 8);
    const s = analyse('units angstrom, invcm\nsystem oscillator(quantum = 2000 invcm)\nstate eigen(1) of oscillator(quantum = 2000 invcm)\n');
    expect(s.units.energy).toBe('invcm');
    // E_1 = 3/2 hbar omega = 3000 invcm (common practice).
    expect(s.energy!.mean!).toBeCloseTo(3000, 6);
  });

  it('keeps 1 / cm a 1/length: a momentum takes it, an energy slot refuses it', () => {
    const codes = (t: string) => analyse(t).diagnostics.filter((d) => d.severity === 'error').map((d) => d.code);
    expect(codes('units nm, meV\nsystem box(0, 10 nm)\nstate gaussian(center = 5 nm, width = 1 nm, momentum = 1e6 / cm)\n')).toEqual([]);
    expect(codes('units nm, meV\nsystem oscillator(quantum = 2000 / cm)\nstate eigen(0) of oscillator(quantum = 1 meV)\n')).toEqual(['units']);
    expect(codes('units nm, meV\nsystem box(0, 10 nm)\nstate gaussian(center = 5 nm, width = 1 nm, momentum = 1 invcm)\n')).toEqual(['units']);
  });
});
