// The hover's reminder of which mass holds where, on the real engine's result.
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

describe('mass in the system hover', () => {
  it('names the mass inside and outside a well with a barrier mass', () => {
    const text = 'units nm, meV\nmass 0.067 m_e\nsystem well(depth = 250 meV, width = 8 nm, barrier_mass = 0.092 m_e)\nstate gaussian(center = 0 nm, width = 1 nm)\n';
    const v = hoverText(text, text.indexOf('well('));
    expect(v).toContain('mass 0.092 m_e for x < -4 nm');
    expect(v).toContain('mass 0.067 m_e for -4 < x < 4 nm');
    expect(v).toContain('mass 0.092 m_e for x > 4 nm');
  });

  it('gives the range of a smooth profile and says nothing for a constant mass', () => {
    const text = 'system V(x) = x^2/2 over [-6, 6] with mass(x) = 1 + x^2/100\nstate gaussian(center = 0, width = 1)\nbasis 6\n';
    const v = hoverText(text, text.indexOf('V(x)'));
    expect(v).toMatch(/mass 1(\.0+)? to 1\.3\d* for -6 < x < 6/);
    const plain = 'system well(depth = 10, width = 2)\nstate gaussian(center = 0, width = 0.3)\n';
    expect(hoverText(plain, plain.indexOf('well('))).not.toContain('mass');
  });
});
