/**
 * The system line's hover numbers its levels from the basis's first label (the result's
 * `system.firstLabel`), also where the file has no state and so no levels. Expected (common practice,
 * the closed forms of FORMAT.md): an oscillator's levels are n = 0, 1, ... with E_n = (n + 1/2) omega;
 * a box's and a numerical potential's n = 1, 2, ..., the box on [0, 1] with E_n = n^2 pi^2 / 2.
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseStatic } from '../../server/src/analysis/index';
import { lineTable } from '../../server/src/lsp/positions';
import type { DocView } from '../../server/src/lsp/view';
import { hoverAt } from '../../server/src/lsp/hover';

/** The first row of the hover's level table as [n, E_n]. */
function firstRow(text: string): [number, number] {
  const s = analyseStatic(text);
  const result = analyse(text);
  const view: DocView = { uri: 'file:///labels.qstate', version: 1, text, lines: lineTable(text), file: s.file, diagnostics: s.diagnostics, result, evaluate: true };
  const h = hoverAt(view, text.indexOf('system') + 2);
  const value = h ? (h.contents as { value: string }).value : '';
  const row = /^\| (\d+) \| ([-\d.e+]+) \|/m.exec(value);
  expect(row, value).not.toBeNull();
  expect(result.system?.firstLabel).toBe(Number(row![1]));
  return [Number(row![1]), Number(row![2])];
}

describe('the system hover numbers levels from the basis', () => {
  it.each([
    ['an oscillator without a state', 'system oscillator(omega = 1)\n', 0, 0.5],
    ['an oscillator with a state', 'system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1)\n', 0, 0.5],
    ['a box without a state', 'system box(0, 1)\n', 1, Math.PI ** 2 / 2],
    ['a numerical potential without a state', 'system V(x) = 0 over [0, 1]\n', 1, Math.PI ** 2 / 2],
  ])('%s', (_label, text, n, energy) => {
    const [first, e] = firstRow(text);
    expect(first).toBe(n);
    expect(Math.abs(e - energy) / energy).toBeLessThan(1e-3);
  });
});
