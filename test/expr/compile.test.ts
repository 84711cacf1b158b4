import { describe, it, expect } from 'vitest';
import { all, create } from 'mathjs';
import { compiled, points } from './helpers';
import { findBadPoint } from '../../server/src/expr/compile';

// A separate, ordinary mathjs instance: the reference the compiled closures are compared with.
const reference = create(all, {});

function mathjsAt(text: string, x: number): { re: number; im: number } {
  const v = reference.evaluate(text, { x }) as unknown;
  if (typeof v === 'number') return { re: v, im: 0 };
  if (typeof v === 'boolean') return { re: v ? 1 : 0, im: 0 };
  const c = v as { re: number; im: number };
  return { re: c.re, im: c.im };
}

/** Relative closeness |a - b| <= tol * max(|a|, |b|), per component pair as a complex modulus. */
function close(ar: number, ai: number, br: number, bi: number, tol: number): boolean {
  const d = Math.hypot(ar - br, ai - bi);
  const m = Math.max(Math.hypot(ar, ai), Math.hypot(br, bi));
  return d <= tol * m || d === 0;
}

const CASES: string[] = [
  'x^2 + 3x - 1',
  'exp(-x^2/2) * cos(3 x)',
  'sin(x)^3',
  'sqrt(abs(x)) + log(1 + x^2)',
  'tanh(x) / cosh(x)',
  'sech(x)^2',
  '1 / (1 + x^2)',
  'x > 0.3 ? x : 0.3',
  'abs(x) < 1 ? 1 : 0',
  '2 pi x',
  'atan(x) + atan2(x, 2)',
  'exp(i x)',
  'exp(-x^2 + 2 i x)',
  'sqrt(x)',
  'log(x)',
  '(x + i)^2.5',
  'x^0.5',
  '(1 + x^2)^1.5',
  'asin(x/3) + acos(x/4)',
  'asin(2x)',
  'acos(2x + i)',
  'min(x, 1) + max(x, -1)',
  'floor(x) + ceil(x) + round(x)',
  'sign(x) * x',
  're(exp(i x)) + im(exp(i x))',
  'conj(exp(i x)) * 2',
  'sinh(x) + tan(x/4)',
  'log10(1 + x^2)',
  'cos(x + i) + sin(x - 2i)',
  'tan(x + i/2)',
  'tanh(x + i)',
  'sech(x + i)',
  'atan(x + i)',
  '(x + 2)^(x/3)',
  'not (x > 0)',
  'x > 0 and x < 1',
  'x < -1 or x > 1',
  '0 < x < 1 ? x : -x',
  '(x - 1)/(x + i)',
  'x^-3 + 2^x',
  'sqrt(x + 2i) * log(x - i)',
  'abs(x + i x^2)',
  'e^x - pi',
];

describe('compiled closures agree with mathjs evaluate', () => {
  // Reference: mathjs 15.2 evaluate on a separate instance (reference library); agreement to 1e-14 relative.
  const xs = points(200, -3, 3);
  for (const text of CASES) {
    it(text, () => {
      const f = compiled(text);
      const v = f.evaluate(xs, 0);
      let worst = 0;
      for (let k = 0; k < xs.length; k++) {
        const r = mathjsAt(text, xs[k]!);
        const ok = close(v.re[k]!, v.im[k]!, r.re, r.im, 1e-14);
        if (!ok) worst = Math.max(worst, Math.hypot(v.re[k]! - r.re, v.im[k]! - r.im) / Math.max(1e-300, Math.hypot(r.re, r.im)));
        expect(ok, `${text} at x = ${xs[k]}: ${v.re[k]} + ${v.im[k]}i vs ${r.re} + ${r.im}i`).toBe(true);
      }
      expect(worst).toBe(0);
    });
  }
});
