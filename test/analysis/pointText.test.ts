/**
 * The text of a file at one point of its sweep (analysis/sweep/pointText.ts): analysed as usual, it
 * gives that point's full result, with the findings mapped back to the file's own offsets.
 */
import { describe, expect, it } from 'vitest';
import { analyse } from '../../server/src/analysis/index';
import { pointText } from '../../server/src/analysis/sweep/pointText';
import { runSweep } from '../../server/src/analysis/sweep/index';

/** P_1 of the ground state of the box (0, a) in the box (0, L), r = a / L (derived in test/client/sweep.test.ts). */
const P1 = (r: number) => (4 * r * Math.sin(Math.PI * r) ** 2) / (Math.PI ** 2 * (1 - r * r) ** 2);

// Lengths in nm; the second sweep is logarithmic.
const TEXT = 'units nm, meV\nlet L = 1.2 nm\nlet a = 1 nm\nsystem box(0 nm, L)\nstate eigen(1) of box(0 nm, a)\nbasis 40\nexpect weight 1 >= 0.5\nsweep L from 1 nm to 2 nm steps 10\nsweep a from 0.5 nm to 1 nm steps 4 log\n';

describe('pointText', () => {
  it('sets both swept lets, on a log axis too, and the analysis gives the closed form there', () => {
    for (const [L, a] of [[2, 0.5], [1.5, 1], [1.3, Math.SQRT1_2]]) {
      const p = pointText(TEXT, [L!, a!])!;
      const r = analyse(p.text, { limits: { maxMillis: 60_000 } });
      expect(r.values!.find((v) => v.name === 'L')!.re).toBeCloseTo(L!, 12);
      expect(r.values!.find((v) => v.name === 'a')!.re).toBeCloseTo(a!, 12);
      expect(Math.abs(r.levels[0]!.weight - P1(a! / L!))).toBeLessThan(1e-9);
    }
  });

  it('gives the numbers of the sweep at its own points', () => {
    const sweep = runSweep(TEXT, {}, { maxMillis: 120_000 })!.result;
    for (const k of [0, 7, 23, 54]) {
      const pt = sweep.points[k]!;
      const r = analyse(pointText(TEXT, pt.at)!.text, { limits: { maxMillis: 60_000 } });
      expect(Math.abs(r.levels[0]!.weight - pt.levels[0]!.weight)).toBeLessThan(1e-12);
      expect(r.diagnostics.some((d) => d.code === 'expect')).toBe(!pt.expects[0]);
    }
  });

  it('maps findings back to the file, and refuses values off the sweep', () => {
    const p = pointText(TEXT, [2, 0.5])!;
    const failed = analyse(p.text, { limits: { maxMillis: 60_000 } }).diagnostics.find((d) => d.code === 'expect')!;
    const at = TEXT.indexOf('expect weight');
    expect([p.back(failed.start), p.back(failed.end)]).toEqual([at, TEXT.indexOf('\n', at)]);
    // An offset inside a replaced value maps to the start of the let's own value; before it, unchanged.
    expect(p.back(TEXT.indexOf('1.2 nm') + 3)).toBe(TEXT.indexOf('1.2 nm'));
    expect(p.back(3)).toBe(3);
    expect(pointText(TEXT, [2.5, 0.5])).toBeNull();
    expect(pointText(TEXT, [1.5, 0.4])).toBeNull();
    expect(pointText(TEXT, [1.5])).toBeNull();
    expect(pointText('system box(0, 1)\nstate eigen(1)\n', [1])).toBeNull();
  });
});
