import { describe, it, expect } from 'vitest';
import { CONSTANTS, EV_SI, KB_SI, UNITS, DIM } from '../../server/src/expr/constants';
import { formatDimension, sameDimension } from '../../server/src/expr/units';
import { checkExpression } from '../../server/src/expr/check';
import { constant, parse, scopeFor } from '../expr/helpers';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('the kelvin and the Boltzmann constant', () => {
  it('k_B is the exact SI value (CODATA 2018)', () => {
    // SI brochure 9th ed. / CODATA 2018: k = 1.380649e-23 J/K exactly (7 significant digits, all exact).
    expect(KB_SI).toBe(1.380649e-23);
    expect(CONSTANTS.get('k_B')!.si).toBe(1.380649e-23);
    // CODATA 2018: k in eV/K = 8.617333262...e-5 (exact, printed with "..."): the printed digits are a prefix.
    const evPerK = KB_SI / EV_SI;
    expect(evPerK - 8.617333262e-5).toBeGreaterThanOrEqual(0);
    expect(evPerK - 8.617333262e-5).toBeLessThan(1e-14);
    // CODATA 2018: k/h = 2.083661912...e10 Hz/K (exact, printed with "..."; the last printed digit is 10 Hz/K).
    const hzPerK = KB_SI / 6.62607015e-34;
    expect(hzPerK - 2.083661912e10).toBeGreaterThanOrEqual(0);
    expect(hzPerK - 2.083661912e10).toBeLessThan(10);
  });

  it('K is a temperature unit of its own dimension, not a units-line unit', () => {
    const k = UNITS.get('K')!;
    expect(k.kind).toBe('temperature');
    expect(k.si).toBe(1);
    expect(sameDimension(k.dimension, DIM.temperature)).toBe(true);
    expect(sameDimension(k.dimension, DIM.none)).toBe(false);
    expect(formatDimension(DIM.temperature)).toBe('temperature');
    // No other unit or constant is spelled K or k_B (a collision would silently replace one of them).
    expect([...UNITS.keys()].filter((n) => n === 'K')).toHaveLength(1);
    expect(UNITS.has('k_B')).toBe(false);
  });

  it('k_B * 300 K is 25.852... meV in a file with units nm, meV', () => {
    // Derived in this comment: 1.380649e-23 * 300 / 1.602176634e-22 = 25.851999786435... meV.
    const v = constant('k_B * 300 K', scopeFor(['nm', 'meV'])).re;
    expect(rel(v, (1.380649e-23 * 300) / 1.602176634e-22)).toBeLessThan(1e-15);
    expect(Math.abs(v - 25.851999786435)).toBeLessThan(1e-11);
  });

  it('a temperature is not an energy: the checker says so', () => {
    const scope = scopeFor(['nm', 'meV']);
    const bad = checkExpression(parse('300 K'), scope, DIM.energy, 'the depth');
    expect(bad.diagnostics.map((d) => d.code)).toEqual(['units']);
    expect(bad.diagnostics[0]!.message).toContain('temperature');
    const good = checkExpression(parse('k_B * 300 K'), scope, DIM.energy, 'the depth');
    expect(good.diagnostics).toEqual([]);
    expect(checkExpression(parse('(300 K)^2 / K'), scope, DIM.temperature, 'a temperature').diagnostics).toEqual([]);
  });

  it('K on a units line is refused as a temperature unit', async () => {
    const { makeUnitSystem } = await import('../../server/src/expr/units');
    const u = makeUnitSystem([
      { name: 'nm', span: { start: 0, end: 2 } },
      { name: 'meV', span: { start: 4, end: 7 } },
      { name: 'K', span: { start: 9, end: 10 } },
    ]);
    expect(u.result).toBeNull();
    expect(u.diagnostics.map((d) => [d.code, d.start])).toEqual([['units', 9]]);
  });
});
