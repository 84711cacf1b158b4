/**
 * Oscillator results in units of the quantum: `meanQuantumNumber` in the JSON (energies there stay in
 * the file's unit), and the table's hbar omega column and lines.
 * Expected values (derived in this comment, hbar = m = omega = 1): a Gaussian of position spread
 * sigma = 1/sqrt(2) is a coherent state of the oscillator, alpha = x0 / (2 sigma) + i k sigma, so for
 * x0 = 2 and k = 1, <n> = |alpha|^2 = 2 + 0.5 = 2.5; the number state eigen(3) has <n> = 3 and
 * E_n = (n + 1/2) hbar omega (common practice).
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { renderTable, toJson } from '../../server/src/cli/render';

const COHERENT = `system oscillator(omega = 1)\nstate gaussian(center = 2, width = ${Math.SQRT1_2}, momentum = 1)\nbasis 60\n`;
const NUMBER = 'units nm, meV\nsystem oscillator(quantum = 2 meV)\nstate eigen(3) of oscillator(quantum = 2 meV)\n';

describe('the mean quantum number in the JSON', () => {
  it('is |alpha|^2 for a coherent state and n for a number state; energies stay in the file unit', () => {
    expect(toJson(analyse(COHERENT), COHERENT).meanQuantumNumber as number).toBeCloseTo(2.5, 8);
    const j = toJson(analyse(NUMBER), NUMBER);
    expect(j.meanQuantumNumber as number).toBeCloseTo(3, 8);
    // E_3 = 3.5 x 2 meV = 7 meV, in meV as before.
    expect((j.energy as { mean: number }).mean).toBeCloseTo(7, 8);
  });

  it('is absent for a system that is no oscillator', () => {
    const t = 'system box(0, 1)\nstate psi(x) = x * (1 - x)\n';
    expect('meanQuantumNumber' in toJson(analyse(t), t)).toBe(false);
  });
});

describe('the table of an oscillator', () => {
  it('gives E_n in hbar omega beside the file unit, <E> and Delta E in hbar omega and <n>', () => {
    const out = renderTable(analyse(NUMBER), NUMBER, 'number.qstate');
    expect(out).toMatch(/E_n \[meV\]\s+E_n \[hbar omega\]/);
    expect(out).toMatch(/^\s+3\s+7\s+3\.5\s/m);
    expect(out).toMatch(/energy mean: 7 meV \(3\.5 hbar omega\)/);
    expect(out).toMatch(/mean quantum number <n>: 3\b/);
    const box = 'system box(0, 1)\nstate psi(x) = x * (1 - x)\n';
    expect(renderTable(analyse(box), box, 'box.qstate')).not.toMatch(/hbar omega|quantum number/);
  });
});
