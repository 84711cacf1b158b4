import { describe, expect, it } from 'vitest';
import { parseExpression } from '../../server/src/expr/sandbox';

// The parse memo: a pure function of (text, offset, caps), so a repeated parse gives the same tree,
// frozen, and a fresh diagnostics list; another offset or other caps are another parse.
const at = (text: string, start: number) => ({ text, start, end: start + text.length });

describe('parse memo', () => {
  it('returns the same frozen tree for the same text at the same offset, and a fresh diagnostics array', () => {
    const a = parseExpression(at('exp(-(x - 0.3)^2 / 0.02) * cos(40 x)', 17));
    const b = parseExpression(at('exp(-(x - 0.3)^2 / 0.02) * cos(40 x)', 17));
    expect(a.result).not.toBeNull();
    expect(b.result).toBe(a.result);
    expect(Object.isFrozen(a.result)).toBe(true);
    expect(b.diagnostics).not.toBe(a.diagnostics);
    expect(b.diagnostics).toEqual(a.diagnostics);
  });

  it('keys on the offset: spans are document offsets', () => {
    const a = parseExpression(at('x^2 + 1', 0));
    const b = parseExpression(at('x^2 + 1', 40));
    expect(b.result).not.toBe(a.result);
    expect(b.result!.start - a.result!.start).toBe(40);
    expect(b.result!.end - a.result!.end).toBe(40);
  });

  it('keys on the caps: a tighter depth limit is its own parse with its own verdict', () => {
    const text = '((((((x))))))';
    const loose = parseExpression(at(text, 0));
    const tight = parseExpression(at(text, 0), { maxDepth: 3 });
    expect(loose.diagnostics).toEqual([]);
    expect(tight.result).toBeNull();
    expect(tight.diagnostics.map((d) => d.code)).toContain('limits');
    expect(parseExpression(at(text, 0)).diagnostics).toEqual([]);
  });

  it('a caller appending to the diagnostics does not change the next parse of the same text', () => {
    const text = 'sin(x) +';
    const first = parseExpression(at(text, 3));
    const n = first.diagnostics.length;
    expect(n).toBeGreaterThan(0);
    first.diagnostics.push(first.diagnostics[0]!);
    expect(parseExpression(at(text, 3)).diagnostics).toHaveLength(n);
  });
});
