// Offsets to LSP positions: LSP 3.17 counts characters in UTF-16 code units and accepts \n, \r\n and
// \r as line ends (Language Server Protocol specification 3.17, "Position" and "Text Documents").
import { describe, it, expect } from 'vitest';
import { lineTable, positionAt, offsetAt, rangeOf } from '../../server/src/lsp/positions';

function check(text: string, offset: number, line: number, character: number): void {
  const t = lineTable(text);
  expect(positionAt(t, offset)).toEqual({ line, character });
  expect(offsetAt(t, { line, character })).toBe(offset);
}

describe('positions', () => {
  it('counts lines for \\n, \\r\\n and lone \\r', () => {
    check('ab\ncd', 4, 1, 1);
    check('ab\r\ncd', 5, 1, 1);
    check('ab\rcd', 4, 1, 1);
    check('a\n\nb', 3, 2, 0);
  });

  it('counts UTF-16 code units, so a character outside the BMP takes two columns', () => {
    // U+1D713 (mathematical italic psi) is a surrogate pair in UTF-16.
    const text = 'let \u{1D713} = 1\nx';
    expect('\u{1D713}'.length).toBe(2);
    check(text, 7, 0, 7);
    check(text, text.indexOf('x'), 1, 0);
  });

  it('clamps out-of-range input instead of throwing', () => {
    const t = lineTable('abc\ndef');
    expect(positionAt(t, -5)).toEqual({ line: 0, character: 0 });
    expect(positionAt(t, 99)).toEqual({ line: 1, character: 3 });
    expect(positionAt(t, Number.NaN)).toEqual({ line: 0, character: 0 });
    expect(offsetAt(t, { line: 0, character: 99 })).toBe(3);
    expect(offsetAt(t, { line: 9, character: 0 })).toBe(7);
    expect(rangeOf(t, 5, 2)).toEqual({ start: { line: 1, character: 1 }, end: { line: 1, character: 1 } });
  });

  it('round-trips every offset of a mixed text', () => {
    const text = 'units nm, meV\r\nlet w = 2 \u00C5\rstate psi(x) = exp(-x^2)\n\n# \u{1F600}\n';
    const t = lineTable(text);
    for (let o = 0; o <= text.length; o++) {
      const p = positionAt(t, o);
      const back = offsetAt(t, p);
      // Offsets inside a \r\n pair map to the end of the line.
      if (text[o - 1] === '\r' && text[o] === '\n') expect(back).toBe(o - 1);
      else expect(back).toBe(o);
    }
  });
});
