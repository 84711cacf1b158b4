import { describe, it, expect } from 'vitest';
import { anchorRows, boxPacketReference, coherentReference, kinkReference, morseExact } from '../../bench/anchor';
import { checkExpects, formatAnchorTable, ratio, type SideBySide } from '../../bench/anchor-report';
import { summarise } from '../../bench/stats';

// The engine's side of the side-by-side benchmark at tiny sizes, one run each, without python
// (scripts/bench-python.mjs runs the python side; the tests never need python). No timing asserted.
describe('side-by-side benchmark, engine side (tiny sizes)', () => {
  const rows = anchorRows(true);

  it('has the rows of the performance table, each reaching its closed form or reference', () => {
    expect(rows.map((r) => r.id)).toEqual(['box-packet-analyse', 'box-packet-kernel', 'box-kink', 'oscillator', 'quartic', 'morse', 'evolution', 'harmonic', 'harmonic-raised']);
    // Loose bounds: a broken job misses by orders of magnitude, a working one reaches 1e-12 or better.
    const bound: Record<string, number> = { 'box-packet-analyse': 1e-10, 'box-packet-kernel': 1e-10, 'box-kink': 1e-8, oscillator: 1e-10, quartic: 1e-9, morse: 1e-9, evolution: 1e-10, harmonic: 1e-8, 'harmonic-raised': 1e-8 };
    for (const row of rows) {
      const acc = row.accuracy(row.run(), {});
      expect(acc.value, row.id).toBeLessThan(bound[row.id]!);
      expect(acc.note.length).toBeGreaterThan(0);
    }
  });

  it('references agree with values known independently', () => {
    // Plucked triangle peaked at 0.3: |c_1|^2 = 6 sin^2(0.3 pi) / (pi^4 0.21^2) = 0.91417314526078 (derived
    // in this comment from the formula in bench/anchor.ts, evaluated by hand with a calculator), the weight
    // examples/plucked-box.qstate expects; and the weights of all levels add up to 1 (Parseval).
    expect(kinkReference(1)[0]! ** 2).toBeCloseTo(0.91417314526078, 12);
    expect(kinkReference(100_000).reduce((s, c) => s + c * c, 0)).toBeCloseTo(1, 9);
    // Coherent state: sum of |c_n|^2 = 1 (Poisson weights, Glauber 1963).
    expect(coherentReference(200, 10 / Math.SQRT2).reduce((s, c) => s + c * c, 0)).toBeCloseTo(1, 13);
    // The box packet is normalised and lies inside the box: its weights add up to 1.
    const b = boxPacketReference(400);
    let w = 0;
    for (let k = 0; k < 400; k++) w += b.re[k]! ** 2 + b.im[k]! ** 2;
    expect(w).toBeCloseTo(1, 12);
    // Morse levels: spacing E_1 - E_0 = w - alpha^2 / m = 20 - 1 for D = 200, alpha = m = 1 (Morse 1929).
    const m = morseExact(2);
    expect(m[1]! - m[0]!).toBeCloseTo(19, 12);
  });
});

describe('side-by-side report', () => {
  it('checks expect lines of weight, norm and energy against a result', () => {
    const text = ['expect weight 1..2 >= 0.9', 'expect weight 1 0.5 +- 1e-3', 'expect norm 1 +- 1e-9', 'expect energy 2 meV +- 0.1 meV', 'expect parity even', 'expect weight 3 <= 0.01'].join('\n');
    const json = { levels: [{ n: 1, weight: 0.5004 }, { n: 2, weight: 0.45 }, { n: 3, weight: 0.02 }], norm: 1, energy: { mean: 2.05, spread: null } };
    expect(checkExpects(text, json)).toEqual({ checked: 5, met: 4 });
    expect(checkExpects(text, { ...json, norm: 1.1 })).toEqual({ checked: 5, met: 3 });
  });

  it('prints the ratio engine / python for each row', () => {
    const side = (t: number[], acc: number) => ({ method: 'm', timing: summarise(t), accuracy: acc, note: '' });
    const row: SideBySide = { id: 'x', job: 'a job', engine: side([4, 6, 5], 1e-14), python: side([2, 2, 3], 2e-14) };
    expect(ratio(row)).toBeCloseTo(2.5, 12);
    const text = formatAnchorTable(['header'], [row]);
    expect(text).toContain('| a job | 5.0 [4.5-5.5] (3) | 1.0e-14 | 2.0 [2.0-2.5] (3) | 2.0e-14 | 2.50x |');
  });
});
