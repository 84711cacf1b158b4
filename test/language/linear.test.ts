/**
 * The quick stage (scanner, parser, name and unit checks with their "did you mean" search) runs on every
 * keystroke and outside the time limit, so its work must grow about linearly with the file (issue 14).
 * Each shape below is built at a size and at twice that size; the operations counted on the work meter
 * per character of text may grow by at most a quarter (quadratic work would double it). Nothing is timed.
 */
import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { analyseStatic } from '../../server/src/analysis/index';
import { withQuickStage, workCounter } from '../../server/src/language/meter';

const HEAD = 'units nm, meV, ps\nmass 1 m_e\n';
const LIMITS = { maxFileBytes: 16 * 1024 * 1024, maxStatements: 100_000, maxExpressionLength: 1_000_000 };

/** Shapes of hostile text, each a function of a size k (roughly proportional to the length). */
const SHAPES: Record<string, (k: number) => string> = {
  'long let names and unknown names': (k) => {
    let t = HEAD;
    for (let i = 0; i < k; i++) t += `let ${'q'.repeat(40)}${i} = 1\n`;
    for (let i = 0; i < k; i++) t += `let u${i} = ${'q'.repeat(38)}z${i}\n`;
    return t;
  },
  'one long name and one long unknown name': (k) => `${HEAD}let ${'a'.repeat(100 * k)} = 1\nbasis ${'a'.repeat(4 * k)}\n`,
  'many short unknown names in one expression': (k) =>
    `${HEAD}${Array.from({ length: 50 }, (_, i) => `let v${i} = 1\n`).join('')}let w = ${Array.from({ length: k }, (_, i) => `v${i}x`).join(' + ')}\n`,
  'unknown statements': (k) => Array.from({ length: k }, (_, i) => `lett${i} a = 1\n`).join(''),
  'many top-level words of a potential': (k) => `${HEAD}system V(x) = x${' over x'.repeat(k)} over [0, 1]\n`,
  'many steps words': (k) => `${HEAD}evolve to 1 ps${' steps'.repeat(k)} steps 3\n`,
  'long continuation': (k) => `${HEAD}let a = 1${'\n  + 1 # c'.repeat(k)}\n`,
  'deep unclosed brackets': (k) => `${HEAD}state gaussian(${'('.repeat(Math.min(k, 200))}${' ,'.repeat(k)}\n`,
  'many units': (k) => `units ${Array.from({ length: k }, (_, i) => `u${i}`).join(', ')}\n`,
  'weight ranges': (k) => `${HEAD}${'expect weight 1..2 >= 0.5\n'.repeat(k)}`,
};

/** Work per character of the quick stage on `text`, counted on a fresh meter. */
function workPerChar(text: string): number {
  const meter = workCounter();
  withQuickStage({ meter, textLength: text.length }, () => analyseStatic(text, { limits: LIMITS }));
  expect(meter.ops).toBeGreaterThan(0);
  return meter.ops / text.length;
}

describe('the quick stage costs about linear work in the file size', () => {
  for (const [name, shape] of Object.entries(SHAPES)) {
    it(name, () => {
      fc.assert(
        fc.property(fc.integer({ min: 400, max: 1200 }), (k) => {
          const small = workPerChar(shape(k));
          const large = workPerChar(shape(2 * k));
          expect(large).toBeLessThanOrEqual(1.25 * small);
        }),
        { numRuns: 3, seed: 14 },
      );
    });
  }
});
