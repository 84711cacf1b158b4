import { describe, it, expect } from 'vitest';
import { maxAbs } from '../../server/src/analysis/measure';

/** The definition the shortcut must reproduce bit for bit: max_j hypot(re_j, im_j). */
function plain(re: Float64Array, im: Float64Array): number {
  let m = 0;
  for (let j = 0; j < re.length; j++) m = Math.max(m, Math.hypot(re[j]!, im[j]!));
  return m;
}

/** A small linear congruential generator (Numerical Recipes' constants, from memory): reproducible cases. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

describe('maxAbs (largest modulus on a grid)', () => {
  it('equals the hypot loop exactly on random, tied, tiny, huge and non-finite values', () => {
    const rnd = lcg(20261202);
    const cases: [Float64Array, Float64Array][] = [];
    for (let c = 0; c < 300; c++) {
      const n = 1 + Math.floor(rnd() * 50);
      const scale = 10 ** Math.floor(rnd() * 700 - 350);
      const re = Float64Array.from({ length: n }, () => (rnd() - 0.5) * scale);
      const im = Float64Array.from({ length: n }, () => (rnd() < 0.3 ? 0 : (rnd() - 0.5) * scale));
      // Near ties: the same modulus split differently between the parts.
      if (c % 3 === 0 && n > 2) {
        const r = Math.hypot(re[0]!, im[0]!);
        re[1] = r * Math.cos(0.3);
        im[1] = r * Math.sin(0.3);
      }
      cases.push([re, im]);
    }
    cases.push([new Float64Array([3, NaN, 1]), new Float64Array([4, 0, 0])]);
    cases.push([new Float64Array([Infinity, 1]), new Float64Array([NaN, 0])]);
    cases.push([new Float64Array([1e-170, 0]), new Float64Array([1e-170, 0])]);
    cases.push([new Float64Array([1e200, -1e200]), new Float64Array([1e200, 0])]);
    cases.push([new Float64Array(0), new Float64Array(0)]);
    cases.push([new Float64Array(4), new Float64Array(4)]);
    for (const [re, im] of cases) expect(Object.is(maxAbs(re, im), plain(re, im))).toBe(true);
  });
  it('is 5 for 3 + 4i among smaller values (common practice: the 3-4-5 triangle)', () => {
    expect(maxAbs(new Float64Array([1, 3, -2]), new Float64Array([1, -4, 0]))).toBe(5);
  });
});
