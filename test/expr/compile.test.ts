import { describe, it, expect } from 'vitest';
import { all, create } from 'mathjs';
import { compiled, parse, points, scopeFor } from './helpers';
import { evaluateConstant, findBadPoint } from '../../server/src/expr/compile';

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

describe('real or complex compilation', () => {
  it('chooses the real path only for provably real expressions', () => {
    expect(compiled('exp(-x^2/2) * cos(3 x)').complex).toBe(false);
    expect(compiled('sqrt(abs(x)) + x^2').complex).toBe(false);
    expect(compiled('(1 + x^2)^1.5').complex).toBe(false);
    expect(compiled('sqrt(x)').complex).toBe(true);
    expect(compiled('exp(i x)').complex).toBe(true);
    expect(compiled('x^0.5').complex).toBe(true);
    expect(compiled('re(sqrt(x))').complex).toBe(true);
  });
  it('gives the principal value of sqrt and log of negative numbers (from memory: sqrt(-4) = 2i, log(-1) = i pi)', () => {
    const xs = Float64Array.of(-4, -1);
    const s = compiled('sqrt(x)').evaluate(xs);
    expect(s.re[0]).toBe(0);
    expect(s.im[0]).toBe(2);
    const l = compiled('log(x)').evaluate(xs);
    expect(l.re[1]).toBe(0);
    expect(l.im[1]).toBeCloseTo(Math.PI, 15);
  });
});

/** Central second-order finite differences (common practice) of the compiled value. */
function finiteDifferences(text: string, x: number, h: number): { d1re: number; d1im: number; d2re: number; d2im: number } {
  const f = compiled(text);
  const v = f.evaluate(Float64Array.of(x - 2 * h, x - h, x, x + h, x + 2 * h));
  const d1 = (a: Float64Array) => (a[0]! - 8 * a[1]! + 8 * a[3]! - a[4]!) / (12 * h);
  const d2 = (a: Float64Array) => (-a[0]! + 16 * a[1]! - 30 * a[2]! + 16 * a[3]! - a[4]!) / (12 * h * h);
  return { d1re: d1(v.re), d1im: d1(v.im), d2re: d2(v.re), d2im: d2(v.im) };
}

describe('forward-mode derivatives', () => {
  it('match closed forms (calculus, from memory)', () => {
    const xs = points(50, -2, 2, 7);
    const cases: [string, (x: number) => number, (x: number) => number][] = [
      // d/dx exp(-x^2) = -2x exp(-x^2); d2 = (4x^2 - 2) exp(-x^2)
      ['exp(-x^2)', (x) => -2 * x * Math.exp(-x * x), (x) => (4 * x * x - 2) * Math.exp(-x * x)],
      // d/dx sin(3x)/x^... : use x^3 sin(x): 3x^2 sin x + x^3 cos x; 6x sin x + 6x^2 cos x - x^3 sin x
      ['x^3 sin(x)', (x) => 3 * x * x * Math.sin(x) + x ** 3 * Math.cos(x), (x) => 6 * x * Math.sin(x) + 6 * x * x * Math.cos(x) - x ** 3 * Math.sin(x)],
      // 1/(1+x^2): -2x/(1+x^2)^2; (6x^2 - 2)/(1+x^2)^3
      ['1/(1 + x^2)', (x) => (-2 * x) / (1 + x * x) ** 2, (x) => (6 * x * x - 2) / (1 + x * x) ** 3],
      // sech(x)^2 = 1 - tanh^2: -2 sech^2 tanh; sech^2 (4 tanh^2 - 2 sech^2)
      ['sech(x)^2', (x) => -2 * Math.tanh(x) / Math.cosh(x) ** 2, (x) => (4 * Math.tanh(x) ** 2 - 2 / Math.cosh(x) ** 2) / Math.cosh(x) ** 2],
      // atan(x): 1/(1+x^2); -2x/(1+x^2)^2
      ['atan(x)', (x) => 1 / (1 + x * x), (x) => (-2 * x) / (1 + x * x) ** 2],
      // (2 + x)^x = exp(x log(2+x)): y (log(2+x) + x/(2+x)); y ((log(2+x) + x/(2+x))^2 + 1/(2+x) + 2/(2+x)^2 ... ) via g' = 1/(2+x) + 2/(2+x)^2 - ... computed below
      ['(3 + x)^x', (x) => (3 + x) ** x * (Math.log(3 + x) + x / (3 + x)), (x) => {
        const g = Math.log(3 + x) + x / (3 + x);
        const gp = 1 / (3 + x) + 3 / (3 + x) ** 2;
        return (3 + x) ** x * (g * g + gp);
      }],
    ];
    for (const [text, d1, d2] of cases) {
      const v = compiled(text).evaluate(xs, 2);
      for (let k = 0; k < xs.length; k++) {
        const x = xs[k]!;
        expect(v.d1re![k]).toBeCloseTo(d1(x), 12);
        expect(v.d2re![k]).toBeCloseTo(d2(x), 11);
      }
    }
  });

  it('match finite differences for complex expressions (common practice: 4th-order central differences)', () => {
    const cases = ['exp(-x^2 + 2 i x)', '(x + i)^2.5', 'sqrt(x + 2i) * log(x - i)', 'tan(x + i/2)', 'sech(x + i)', 'atan(x + i)', 'asin(x/3 + i)', 'acos(2x + i)', 'abs(x + i x^2)', '(x + 2 + i)^(x/3)', 'conj(exp(i x)) / (x + 3i)', 'tanh(x + i) - cosh(x) sinh(i x)'];
    for (const text of cases) {
      const f = compiled(text);
      const xs = points(20, -1.5, 1.5, 99);
      const v = f.evaluate(xs, 2);
      for (let k = 0; k < xs.length; k++) {
        const fd = finiteDifferences(text, xs[k]!, 1e-3);
        const scale1 = 1 + Math.hypot(v.d1re![k]!, v.d1im![k]!);
        const scale2 = 1 + Math.hypot(v.d2re![k]!, v.d2im![k]!);
        expect(Math.hypot(v.d1re![k]! - fd.d1re, v.d1im![k]! - fd.d1im) / scale1, `${text} d1 at ${xs[k]}`).toBeLessThan(1e-8);
        expect(Math.hypot(v.d2re![k]! - fd.d2re, v.d2im![k]! - fd.d2im) / scale2, `${text} d2 at ${xs[k]}`).toBeLessThan(1e-5);
      }
    }
  });

  it('passes phi(n, x) derivatives through the chain rule', () => {
    // A provider of the box eigenfunctions on [0, 1], phi_n = sqrt(2) sin(n pi x).
    // Source: Griffiths, Introduction to Quantum Mechanics (from memory).
    const phi = (n: number, xs: Float64Array, out: Float64Array, d1?: Float64Array, d2?: Float64Array) => {
      for (let k = 0; k < xs.length; k++) {
        const a = n * Math.PI;
        out[k] = Math.SQRT2 * Math.sin(a * xs[k]!);
        if (d1) d1[k] = Math.SQRT2 * a * Math.cos(a * xs[k]!);
        if (d2) d2[k] = -Math.SQRT2 * a * a * Math.sin(a * xs[k]!);
      }
    };
    const f = compiled('phi(2, x/2) + 3', { units: { mode: 'natural' }, values: new Map(), hasX: true, hasPhi: true });
    const xs = Float64Array.of(0.1, 0.4, 0.9);
    const v = f.evaluate(xs, 2, phi);
    for (let k = 0; k < xs.length; k++) {
      const x = xs[k]!;
      expect(v.re[k]).toBeCloseTo(Math.SQRT2 * Math.sin(Math.PI * x) + 3, 14);
      expect(v.d1re![k]).toBeCloseTo(Math.SQRT2 * Math.PI * Math.cos(Math.PI * x), 13);
      expect(v.d2re![k]).toBeCloseTo(-Math.SQRT2 * Math.PI ** 2 * Math.sin(Math.PI * x), 12);
    }
    // Without a provider the values are NaN, which findBadPoint reports.
    expect(findBadPoint(f.evaluate(xs), xs)).toBe(0.1);
  });
});

describe('breakpoints', () => {
  it('finds the jumps of abs(x) < 1 ? 1 : 0 (common practice: the indicator of |x| < 1 jumps at -1 and 1)', () => {
    const b = compiled('abs(x) < 1 ? 1 : 0').breakpoints(-3, 2);
    expect(b.length).toBe(2);
    expect(Math.abs(b[0]! + 1)).toBeLessThan(1e-14);
    expect(Math.abs(b[1]! - 1)).toBeLessThan(1e-14);
  });
  it('finds the kink of x > 0.3 ? x : 0.3 at 0.3', () => {
    const b = compiled('x > 0.3 ? x : 0.3').breakpoints(0, 1);
    expect(b.length).toBe(1);
    expect(Math.abs(b[0]! - 0.3) / 0.3).toBeLessThan(1e-14);
  });
  it('finds kinks of abs, max and the jumps of floor', () => {
    const a = compiled('abs(x - 0.25) + max(x, 0.7)').breakpoints(0, 1);
    expect(a.length).toBe(2);
    expect(a[0]).toBeCloseTo(0.25, 14);
    expect(a[1]).toBeCloseTo(0.7, 14);
    const f = compiled('floor(2x)').breakpoints(0.1, 2.9);
    expect(f.map((x) => Math.round(x * 2))).toEqual([1, 2, 3, 4, 5]);
    for (const x of f) expect(Math.abs(2 * x - Math.round(2 * x))).toBeLessThan(1e-13);
  });
  it('is empty for a smooth expression', () => {
    expect(compiled('exp(-x^2) cos(3 x)').breakpoints(-5, 5)).toEqual([]);
  });
});

describe('evaluation problems are detectable', () => {
  it('reports the first non-finite point', () => {
    const xs = Float64Array.of(-1, 0, 1, 2);
    expect(findBadPoint(compiled('1/x').evaluate(xs), xs)).toBe(0);
    expect(findBadPoint(compiled('log(abs(x - 1))').evaluate(xs), xs)).toBe(1);
    expect(findBadPoint(compiled('exp(1000 x)').evaluate(xs), xs)).toBe(1);
    expect(findBadPoint(compiled('x^2').evaluate(xs), xs)).toBeNull();
  });
});

describe('performance', () => {
  it('agrees with mathjs compiled evaluation on 10^4 points to 1e-15 (speed ratio printed; the target lives in the benchmark)', () => {
    const text = 'exp(-(x - 0.3)^2 / 0.02) * cos(40 x) + 0.5 x^2';
    const xs = new Float64Array(10_000);
    for (let k = 0; k < xs.length; k++) xs[k] = -1 + (2 * k) / (xs.length - 1);
    const f = compiled(text);
    const code = reference.compile(text);
    const scope = { x: 0 };
    const ref = new Float64Array(xs.length);
    // Warm both up, then compare the medians of several timed runs of each. (Alternating single runs
    // would charge mathjs's garbage to the next compiled run.)
    const time = (g: () => void) => {
      for (let r = 0; r < 5; r++) g();
      const runs: number[] = [];
      for (let r = 0; r < 9; r++) {
        const t0 = performance.now();
        g();
        runs.push(performance.now() - t0);
      }
      return runs.sort((a, b) => a - b)[4]!;
    };
    let ours = f.evaluate(xs);
    const tOurs = time(() => {
      ours = f.evaluate(xs);
    });
    const tRef = time(() => {
      for (let k = 0; k < xs.length; k++) {
        scope.x = xs[k]!;
        ref[k] = code.evaluate(scope) as number;
      }
    });
    const ratio = tRef / tOurs;
    for (let k = 0; k < xs.length; k++) expect(Math.abs(ours.re[k]! - ref[k]!)).toBeLessThanOrEqual(1e-15 * Math.max(1, Math.abs(ref[k]!)));
    // The speed target (5x) is reported by `npm run bench` (item 5), not asserted: timings on a shared
    // machine are not a test.
    console.log(`ours ${tOurs.toFixed(3)} ms, mathjs ${tRef.toFixed(3)} ms, median ratio ${ratio.toFixed(1)}`);
  });
});

describe('physical units in compiled functions', () => {
  it('fold units and constants to internal units (units nm, meV; hbar = 1)', () => {
    const scope = { ...scopeFor(['nm', 'meV']), hasX: true };
    // V = m_e w^2 x^2 / 2 with hbar w = 10 meV. In nm and meV, hbar^2/m_e = 2 x 38.0998211 meV nm^2
    // (CODATA 2018 recommended values (NIST), derived), so V = 100 x^2 / (4 x 38.0998211) meV.
    const f = compiled('0.5 m_e * (10 meV / hbar)^2 x^2', scope);
    expect(f.complex).toBe(false);
    const xs = Float64Array.of(0.5, 1, 3);
    const v = f.evaluate(xs, 2);
    for (let k = 0; k < xs.length; k++) {
      const want = (100 * xs[k]! ** 2) / (4 * 38.0998211);
      expect(Math.abs(v.re[k]! - want) / want).toBeLessThan(3e-9);
      expect(Math.abs(v.d2re![k]! - (2 * 100) / (4 * 38.0998211)) / v.d2re![k]!).toBeLessThan(3e-9);
    }
  });
});

describe('constant evaluation', () => {
  const scope = scopeFor(['nm', 'eV']);
  it('returns the value and dimension', () => {
    const e = evaluateConstant(parse('2 nm + 30 \u00C5'), scope);
    expect(e.result!.value.re).toBeCloseTo(5, 14);
    expect(e.result!.dimension).toEqual([1, 0, 0, 0]);
    expect(evaluateConstant(parse('sqrt(-4)'), scope).result!.value).toEqual({ re: 0, im: 2 });
  });
  it('reports values that are not finite, and dependence on x', () => {
    expect(evaluateConstant(parse('1/0'), scope).diagnostics.map((d) => d.code)).toEqual(['evaluation']);
    expect(evaluateConstant(parse('log(0)'), scope).diagnostics.map((d) => d.code)).toEqual(['evaluation']);
    expect(evaluateConstant(parse('x + 1 nm'), { ...scope, hasX: true }).diagnostics.map((d) => d.code)).toEqual(['name']);
  });
});

describe('buffers', () => {
  it('are never shared between calls (invariant: a result stays valid after later calls)', () => {
    const f = compiled('x > 0 ? exp(-x^2) : 2 x + 1');
    const a = Float64Array.of(-1, 0.5, 2);
    const b = Float64Array.of(3, -2, 0.25, 1);
    const first = f.evaluate(a, 2);
    const copy = Array.from(first.re);
    const d2 = Array.from(first.d2re!);
    f.evaluate(b, 0);
    f.evaluate(a, 1);
    f.evaluate(b, 2);
    expect(Array.from(first.re)).toEqual(copy);
    expect(Array.from(first.d2re!)).toEqual(d2);
    // exp(-x^2) at 0.5 and 2 x + 1 at -1 (direct calculation).
    expect(first.re[0]).toBe(-1);
    expect(first.re[1]).toBe(Math.exp(-0.25));
  });
  it('give zero imaginary parts of a real function as ordinary writable arrays', () => {
    const v = compiled('x^2').evaluate(Float64Array.of(1, 2), 2);
    expect(Array.from(v.im)).toEqual([0, 0]);
    expect(Array.from(v.d1im!)).toEqual([0, 0]);
    v.im[0] = 5;
    expect(v.im[0]).toBe(5);
    expect(Array.from(v.d2re!)).toEqual([2, 2]);
  });
});
