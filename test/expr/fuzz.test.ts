import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parseExpression } from '../../server/src/expr/sandbox';
import { checkExpression } from '../../server/src/expr/check';
import { compileFunction } from '../../server/src/expr/compile';
import type { Expr } from '../../server/src/expr/types';
import { scopeFor } from './helpers';

const FRAGMENTS = [
  'x', '2', '.5', '1e3', '2.5e-2', '0x1F', 'pi', 'e', 'i', 'nm', 'meV', '\u00B5m', 'x2', ' ', ' ', '+', '-', '*', '/', '^',
  '(', ')', '(', ')', ',', '?', ':', '<', '>=', '==', ' and ', ' or ', 'not ', 'sin', 'sqrt', 'abs', 'phi', 'min',
  '[', ']', '{', '}', '"a"', "'", '!', '%', ';', '.', '=', 'constructor', '#', '\n', 'mod', ' to ', '?.', '??', '..',
];

const AT = 7;

function leaves(e: Expr, out: Expr[] = []): Expr[] {
  if (e.type === 'number' || e.type === 'symbol') out.push(e);
  if (e.type === 'unary') leaves(e.arg, out);
  if (e.type === 'binary') {
    leaves(e.left, out);
    leaves(e.right, out);
  }
  if (e.type === 'call') e.args.forEach((a) => leaves(a, out));
  if (e.type === 'conditional') [e.test, e.then, e.otherwise].forEach((a) => leaves(a, out));
  return out;
}

describe('arbitrary input never throws (invariant: the layer returns diagnostics instead)', () => {
  it('through parse, check, compile, evaluate and breakpoints', () => {
    const natural = scopeFor(null, { hasX: true, hasPhi: true });
    const physical = scopeFor(['nm', 'meV'], { hasX: true, hasPhi: true });
    const xs = Float64Array.of(-1.5, -0.25, 0, 0.5, 2);
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...FRAGMENTS), { maxLength: 14 }), (parts) => {
        const text = parts.join('');
        const p = parseExpression({ text, start: AT, end: AT + text.length });
        for (const d of p.diagnostics) {
          expect(d.start).toBeGreaterThanOrEqual(AT);
          expect(d.end).toBeLessThanOrEqual(AT + text.length);
        }
        expect(p.result === null).toBe(p.diagnostics.some((d) => d.severity === 'error'));
        if (!p.result) return;
        // Every leaf's range reads back its own text.
        for (const leaf of leaves(p.result)) {
          const slice = text.slice(leaf.start - AT, leaf.end - AT);
          if (leaf.type === 'symbol') expect(slice).toBe(leaf.name);
          else if (leaf.type === 'number' && /^[0-9.][0-9.eE+-]*$/.test(slice)) expect(Number(slice)).toBe(leaf.value);
        }
        for (const scope of [natural, physical]) {
          const c = checkExpression(p.result, scope, null, 'the test');
          if (c.dimension === null) continue;
          const f = compileFunction(p.result, scope);
          if (!f.result) continue;
          const v = f.result.evaluate(xs, 2);
          expect(v.re.length).toBe(xs.length);
          expect(v.im.length).toBe(xs.length);
          expect(Array.isArray(f.result.breakpoints(-2, 2))).toBe(true);
        }
      }),
      { numRuns: 1500, seed: 42 },
    );
  });
});
