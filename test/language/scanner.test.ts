import { describe, it, expect } from 'vitest';
import { scan } from '../../server/src/language/scanner';
import { lineTable, positionAt } from '../../server/src/language/positions';

/** The code of each logical statement, with comments masked. */
function pieces(text: string): string[] {
  const r = scan(text);
  return r.statements.map((s) => r.masked.slice(s.start, s.end));
}

describe('scan', () => {
  it('keeps one statement per line and ignores blank and comment lines', () => {
    expect(pieces('units nm, meV\n\n# only a comment\n   # indented comment\nmass 1 m_e\n')).toEqual(['units nm, meV', 'mass 1 m_e']);
  });

  it('joins an indented line to the statement above, across blank and comment lines', () => {
    const text = 'state psi(x) = x\n  * (1 - x)\n\n# note\n\t+ 0\nbasis 5';
    expect(pieces(text)).toEqual([`state psi(x) = x\n  * (1 - x)\n\n${' '.repeat(6)}\n\t+ 0`, 'basis 5']);
  });

  it('masks comments with spaces of the same length, keeping offsets', () => {
    const text = 'mass 2 # heavy\nbasis 3#x';
    const r = scan(text);
    expect(r.masked.length).toBe(text.length);
    expect(r.masked).toBe('mass 2 ' + ' '.repeat(7) + '\nbasis 3  ');
    expect(r.comments.map((c) => text.slice(c.start, c.end))).toEqual(['# heavy', '#x']);
    expect(r.statements.map((s) => text.slice(s.start, s.end))).toEqual(['mass 2', 'basis 3']);
  });

  it('handles CRLF and a lone CR as line ends', () => {
    const text = 'mass 1\r\n  + 1\r\nbasis 2\rlet a = 1';
    const r = scan(text);
    // The scanner's statement lines agree with the one offset-to-line table (language/positions.ts).
    const table = lineTable(text);
    expect(Array.from(table.starts)).toEqual([0, 8, 15, 23]);
    expect(r.statements.map((s) => positionAt(table, s.start).line)).toEqual(r.statements.map((s) => s.line));
    expect(r.statements.map((s) => r.masked.slice(s.start, s.end))).toEqual(['mass 1\r\n  + 1', 'basis 2', 'let a = 1']);
    expect(r.statements.map((s) => s.line)).toEqual([0, 2, 3]);
  });

  it('skips a byte order mark without treating the first line as a continuation', () => {
    const r = scan('\ufeffunits nm, meV\nmass 1 m_e');
    expect(r.statements.map((s) => [s.start, s.indented])).toEqual([
      [1, false],
      [15, false],
    ]);
  });

  it('measures offsets in UTF-16 code units with non-ASCII text', () => {
    const text = 'units µm, neV # Å and ± here\nlet 𝛼 = 1\n  ± 2';
    const r = scan(text);
    expect(r.statements.map((s) => text.slice(s.start, s.end))).toEqual(['units µm, neV', 'let 𝛼 = 1\n  ± 2']);
    expect(r.statements[1]!.start).toBe(text.indexOf('let'));
  });

  it('marks an indented first statement (nothing to continue)', () => {
    const r = scan('  mass 1\nbasis 2');
    expect(r.statements.map((s) => [s.start, s.indented])).toEqual([
      [2, true],
      [9, false],
    ]);
  });

  it('copes with empty text, a lone BOM and trailing white space', () => {
    expect(scan('').statements).toEqual([]);
    expect(scan('\ufeff').statements).toEqual([]);
    expect(scan(' \t \n\r\n').statements).toEqual([]);
  });
});
