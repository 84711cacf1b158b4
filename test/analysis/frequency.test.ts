/**
 * Energies given as frequencies where an energy is expected, E = h f, and nowhere else.
 * Expected values: h = 4.135667696e-15 eV s (exact, SI 2019), so h x 1.2 MHz = 4.962801235e-3 ueV and
 * the oscillator's ground level is half of it, 2.4814006e-3 ueV (E_0 = hbar omega / 2, common practice).
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';

const HEAD = 'units nm, ueV, us\nmass 40 u\n';
const codes = (t: string) => analyse(t).diagnostics.filter((d) => d.severity === 'error').map((d) => d.code);
const untrustedCodes = (t: string) => analyseUntrusted(t).diagnostics.filter((d) => d.severity === 'error').map((d) => d.code);

describe('a frequency where an energy is expected', () => {
  it('is the energy h f: the quantum 1.2 MHz is the oscillator of frequency 1.2 MHz', () => {
    const byQuantum = analyse(`${HEAD}system oscillator(quantum = 1.2 MHz)\nstate eigen(0) of oscillator(quantum = 1.2 MHz)\n`);
    const byFrequency = analyse(`${HEAD}system oscillator(frequency = 1.2 MHz)\nstate eigen(0) of oscillator(frequency = 1.2 MHz)\n`);
    expect(byQuantum.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(byQuantum.system!.energies[0]).toBeCloseTo(2.4814006e-3, 9);
    expect(byQuantum.system!.energies[1]! - byQuantum.system!.energies[0]!).toBeCloseTo(4.962801235e-3, 11);
    byQuantum.system!.energies.forEach((e, k) => expect(e).toBeCloseTo(byFrequency.system!.energies[k]!, 14));
  });

  it('converts expect energy values and tolerances, and a well depth', () => {
    const osc = `${HEAD}system oscillator(frequency = 1.2 MHz)\nstate eigen(0) of oscillator(frequency = 1.2 MHz)\n`;
    expect(codes(`${osc}expect energy 0.6 MHz +- 1 Hz\n`)).toEqual([]);
    expect(codes(`${osc}expect energy 0.61 MHz +- 1 kHz\n`)).toEqual(['expect']);
    expect(codes(`${HEAD}system well(depth = 10 GHz, width = 50 nm)\nstate gaussian(center = 0, width = 10 nm)\n`)).toEqual([]);
  });

  it('stays a frequency elsewhere: omega takes 2 pi f, a wave number or a formula takes no frequency', () => {
    const angular = analyse(`${HEAD}system oscillator(omega = 2 pi * 1.2 MHz)\nstate eigen(0) of oscillator(omega = 2 pi * 1.2 MHz)\n`);
    expect(angular.system!.energies[0]).toBeCloseTo(2.4814006e-3, 9);
    const momentum = `${HEAD}system box(0, 1 nm)\nstate gaussian(center = 0.5 nm, width = 0.1 nm, momentum = 1 MHz)\n`;
    expect(codes(momentum)).toEqual(['units']);
    expect(untrustedCodes(momentum)).toEqual(['units']);
    const formula = `${HEAD}system V(x) = 1 MHz * (x / nm)^2 over [-5 nm, 5 nm]\nstate gaussian(center = 0, width = 1 nm)\n`;
    expect(codes(formula)).toEqual(['units']);
    expect(untrustedCodes(formula)).toEqual(['units']);
  });

  it('is accepted alike by the untrusted checks', () => {
    expect(untrustedCodes(`${HEAD}system oscillator(quantum = 1.2 MHz)\nstate eigen(0) of oscillator(quantum = 1.2 MHz)\nexpect energy 0.6 MHz +- 1 Hz\n`)).toEqual([]);
    // In natural units every value is a plain number: nothing to convert.
    expect(codes('system oscillator(quantum = 1)\nstate eigen(0) of oscillator(quantum = 1)\nexpect energy 0.5 +- 1e-9\n')).toEqual([]);
  });
});
