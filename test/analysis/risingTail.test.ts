/**
 * A displaced high oscillator level in a 40-level basis: its weights peak near the top of the basis,
 * so the tail has not started to fall and no decay law may be extrapolated from it. The basis finding
 * must then search for the levels that capture all but 1e-6, not claim that no basis does.
 * Checked by invariants: the number it names captures all but 1e-6 and one fewer does not.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { fitDecay } from '../../server/src/physics/decay';

const file = (n: number, c: number, basis?: number) => `system oscillator(omega = 1)\nstate eigen(${n}) of oscillator(omega = 1, center = ${c})\n${basis ? `basis ${basis}\n` : ''}`;

describe('a tail that is still rising at the top of the basis', () => {
  it('has no fitted decay law', () => {
    // |c_n|^2 rising to n = 40: no power law describes what lies beyond.
    const labels = Float64Array.from({ length: 40 }, (_, k) => k + 1);
    const weights = Float64Array.from(labels, (n) => Math.exp(-((n - 38) ** 2) / 50));
    expect(fitDecay(labels, weights).classification).toBe('unknown');
    // A real algebraic tail keeps its law: |c_n| = n^-2 (a kink; common practice).
    expect(fitDecay(labels, Float64Array.from(labels, (n) => n ** -4)).classification).toBe('kink');
  });

  it.each([
    [29, 1],
    [29, 2],
    [35, 2],
  ])('eigen(%i) displaced by %f: the basis finding names a basis that captures all but 1e-6', (n, c) => {
    const r = analyse(file(n, c));
    expect(r.decay?.classification).not.toBe('algebraic');
    const basis = r.diagnostics.find((d) => d.code === 'basis')!;
    expect(basis.message).not.toMatch(/Even the largest basis/);
    const need = Number(/ (\d+) levels capture all but 1e-6/.exec(basis.message)![1]);
    expect(analyse(file(n, c, need)).captured!).toBeGreaterThanOrEqual(1 - 1e-6);
    expect(analyse(file(n, c, need - 1)).captured!).toBeLessThan(1 - 1e-6);
  });
});
