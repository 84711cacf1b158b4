/**
 * The energy spread keeps full precision: an exact eigenstate of any system has Delta H = 0 to 1e-9,
 * where sqrt(<H^2> - <H>^2) left 1e-7 (half the digits of double precision).
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';

const codes = (r: { diagnostics: { code: string }[] }): string[] => r.diagnostics.map((d) => d.code);

describe('an eigenstate has zero energy spread', () => {
  // An eigenstate of H has Delta H = 0 exactly (common practice); each mean is checked against its level.
  const cases: [string, string][] = [
    ['finite well, level 2', 'well(depth = 20, width = 2)'],
    ['quartic, level 3', 'V(x) = x^4 over [-4, 4]'],
    ['box, level 3', 'box(0, 1)'],
    ['oscillator, level 3', 'oscillator(omega = 1)'],
    ['half oscillator, level 1', 'V(x) = x^2/2 over [0, 8]'],
  ];
  for (const [name, sys] of cases) {
    it(`${name}: expect spread 0 +- 1e-9 holds`, () => {
      const level = name.endsWith('1') ? 1 : name.endsWith('2') ? 2 : 3;
      const r = analyse(`system ${sys}\nstate eigen(${level}) of ${sys}\nbasis 10\nexpect spread 0 +- 1e-9\n`);
      expect(codes(r)).not.toContain('expect');
      expect(codes(r)).not.toContain('convergence');
      const lv = r.levels.find((l) => l.n === level)!;
      expect(Math.abs(r.energy!.mean! - lv.energy)).toBeLessThan(1e-9 * Math.max(1, lv.energy));
      expect(r.energy!.spread!).toBeLessThan(1e-9);
    });
  }

  it('the oscillator level 3 mean is 3.5 hbar omega', () => {
    // E_n = (n + 1/2) hbar omega (common practice).
    const r = analyse('system oscillator(omega = 1)\nstate eigen(3) of oscillator(omega = 1)\n');
    expect(Math.abs(r.energy!.mean! - 3.5)).toBeLessThan(1e-12);
  });

  it('a two-level superposition: Delta H = |E_3 - E_1| / 2 for equal weights', () => {
    // Derived: weights 1/2 and 1/2 give Delta H = (E_3 - E_1)/2; box E_n = n^2 pi^2 / 2 (m = hbar = 1, L = 1).
    const r = analyse('system box(0, 1)\nstate psi(x) = phi(1, x) + phi(3, x)\n');
    expect(Math.abs(r.energy!.spread! - (8 * Math.PI ** 2) / 4)).toBeLessThan(1e-10);
  });
});
