/**
 * The hover of `expect revival` and `expect mean x(T)` shows what was measured.
 * Expected values (closed forms, common practice): an oscillator's revival is its period 2 pi / omega;
 * a coherent state displaced by d from the centre has <x>(t) = d cos(omega t), so <x>(pi / omega) = -d.
 */
import { describe, it, expect } from 'vitest';
import { analyse, analyseStatic } from '../../server/src/analysis/index';
import { lineTable } from '../../server/src/lsp/positions';
import type { DocView } from '../../server/src/lsp/view';
import { hoverAt } from '../../server/src/lsp/hover';

function hoverText(text: string, at: number): string {
  const s = analyseStatic(text);
  const view: DocView = { uri: 'file:///t.qstate', version: 1, text, lines: lineTable(text), file: s.file, diagnostics: s.diagnostics, result: analyse(text), evaluate: true };
  const h = hoverAt(view, at);
  return h ? (h.contents as { value: string }).value : '';
}

const ION = 'units um, MHz\nmass 40 u\nsystem oscillator(frequency = 1 MHz)\nstate eigen(0) of oscillator(frequency = 1 MHz, center = 0.02 um)\nevolve to 2 us steps 200\n';

describe('the hover of dynamic expect lines', () => {
  it('gives the measured revival time with its unit', () => {
    const text = `${ION}expect revival 1 us +- 1e-6 us\n`;
    const v = hoverText(text, text.indexOf('expect revival') + 8);
    const m = /measured ([\d.e-]+) us/.exec(v);
    expect(m, v).not.toBeNull();
    // The period 1 / f = 1 us.
    expect(Number(m![1])).toBeCloseTo(1, 6);
  });

  it('gives the measured <x>(T) with its unit, natural units without one', () => {
    const text = `${ION}expect mean x(0.5 us) -0.02 um +- 1e-6 um\n`;
    const v = hoverText(text, text.indexOf('expect mean') + 8);
    const m = /measured (-?[\d.e-]+) um/.exec(v);
    expect(m, v).not.toBeNull();
    expect(Number(m![1])).toBeCloseTo(-0.02, 8);
    const nat = 'system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1, center = 1.5)\nexpect mean x(pi) -1.5 +- 1e-6\n';
    const w = hoverText(nat, nat.indexOf('expect mean') + 8);
    expect(Number(/measured (-?[\d.e-]+)/.exec(w)![1])).toBeCloseTo(-1.5, 8);
  });
});
