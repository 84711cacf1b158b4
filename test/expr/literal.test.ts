import { describe, it, expect } from 'vitest';
import { parseExpression, parseThroughMathjs } from '../../server/src/expr/sandbox';

const AT = 40; // every expression sits at document offset 40, so ranges are checked as document offsets

const both = (text: string, maxLength?: number) => {
  const src = { text, start: AT, end: AT + text.length };
  const opts = maxLength === undefined ? {} : { maxLength };
  return { fast: parseExpression(src, opts), full: parseThroughMathjs(src, opts) };
};

// Plain decimal literals take the shortcut; the tree and diagnostics must be those of the full path
// (mathjs's number token read as Number(text)), values and ranges included.
const LITERALS = [
  '0', '1', '0.5', '0.04', '150', '200', '3.14159265358979323846', '1e-10', '2.5E+3', '6.62607015e-34', '1e308',
  '1e-400', '1e309', '0.1', '123456789012345678901', '9007199254740993', '0.30000000000000004', '7e0', '1e-320',
];
// Not plain: these go through mathjs (hexadecimal, a trailing or leading mark, leading zeros, spaces,
// signs, names, a dangling exponent).
const OTHERS = ['0x10', '1.', '.5', '007', ' 1', '1 ', '-1', '+2', '1e', '1e+', 'e1', '1_000', '1.2.3', '١'];

describe('plain number literals', () => {
  it('read as the full path reads them (value, range, diagnostics)', () => {
    for (const text of [...LITERALS, ...OTHERS]) {
      const { fast, full } = both(text);
      expect(fast, text).toEqual(full);
    }
  });
  it('a literal over the length cap gets the cap finding, as on the full path', () => {
    const { fast, full } = both('123456', 3);
    expect(fast.result).toBeNull();
    expect(fast.diagnostics.map((d) => d.code)).toEqual(['limits']);
    expect(fast).toEqual(full);
  });
  it('values are the correctly rounded doubles (common practice: IEEE 754 round to nearest)', () => {
    const v = (t: string) => {
      const r = parseExpression({ text: t, start: 0, end: t.length }).result;
      return r && r.type === 'number' ? r.value : NaN;
    };
    expect(v('0.04')).toBe(0.04);
    expect(v('9007199254740993')).toBe(9007199254740992);
    expect(v('1e-400')).toBe(0);
    // 1e309 overflows: no number, a syntax finding on the literal.
    expect(parseExpression({ text: '1e309', start: AT, end: AT + 5 }).diagnostics.map((d) => [d.code, d.start, d.end])).toEqual([['syntax', AT, AT + 5]]);
  });
});
