/**
 * Prefixed kelvin (mK, uK, nK): temperatures of cold ions and atoms written as they are spoken.
 * Expected values: k_B / h = 2.083661912e10 Hz/K (CODATA 2018, exact), so k_B x 50 uK is h x 1.041830956 MHz.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { constant, scopeFor } from '../expr/helpers';

describe('prefixed kelvin', () => {
  it('k_B * 50 uK is 1.041830956 MHz in a file whose energy unit is MHz', () => {
    const scope = scopeFor(['um', 'MHz']);
    expect(constant('k_B * 50 uK', scope).re).toBeCloseTo(1.041830956, 8);
    expect(constant('k_B * 50 µK', scope).re).toBeCloseTo(1.041830956, 8);
    expect(constant('k_B * 0.05 mK', scope).re).toBeCloseTo(1.041830956, 8);
    expect(constant('k_B * 50000 nK', scope).re).toBeCloseTo(1.041830956, 8);
  });

  it('gives the same thermal state as the temperature in K', () => {
    const file = (t: string) => `units um, MHz\nmass 40 u\nsystem oscillator(frequency = 1 MHz)\nstate thermal(temperature = ${t}) of oscillator(frequency = 1 MHz)\n`;
    const a = analyse(file('50 uK'));
    const b = analyse(file('50e-6 K'));
    expect(a.diagnostics.filter((d) => d.severity === 'error')).toEqual([]);
    expect(a.levels.length).toBeGreaterThan(3);
    a.levels.forEach((l, k) => expect(l.weight).toBeCloseTo(b.levels[k]!.weight, 14));
  });
});
