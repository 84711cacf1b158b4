// The built-in table: every record is consistent with itself, with the sandbox, the checker, the
// compiler, completion and hover, and with mathjs, a general-purpose reference library (its full
// instance evaluates each function at sample points; our engine never evaluates user text with it).
import { describe, it, expect } from 'vitest';
import { all, create } from 'mathjs';
import { BUILTINS, builtin, type Builtin } from '../../server/src/expr/builtins/table';
import { KERNEL_BUFFER } from '../../server/src/expr/builtins/kernels';
import { parseExpression } from '../../server/src/expr/sandbox';
import { checkExpression } from '../../server/src/expr/check';
import { formatDimension } from '../../server/src/expr/units';
import { FUNCTIONS } from '../../server/src/lsp/vocabulary';
import { hoverAt } from '../../server/src/lsp/hover';
import { lineTable } from '../../server/src/lsp/positions';
import { analyseStatic } from '../../server/src/analysis/index';
import { compiled, scopeFor } from './helpers';

const math = create(all, {});
type MathValue = number | { re: number; im: number };
const call = (name: string, ...args: unknown[]): MathValue => (math as unknown as Record<string, (...a: unknown[]) => MathValue>)[name]!(...args);
const parts = (v: MathValue) => (typeof v === 'number' ? { re: v, im: 0 } : { re: v.re, im: v.im });
const close = (a: number, b: number, tol: number) => Math.abs(a - b) <= tol * Math.max(1, Math.abs(b));

const holomorphic = BUILTINS.filter((b) => b.form === 'holomorphic');
/** Real sample points inside a record's real domain, away from poles of tan and the ends of asin/acos. */
function realSamples(b: Builtin): number[] {
  const [lo, hi] = b.realDomain ?? [-Infinity, Infinity];
  const base = [-2.7, -1.3, -0.61, -0.2, 0.05, 0.37, 0.93, 1.4, 2.2, 3.1];
  return base.map((u) => (lo === -1 && hi === 1 ? u / 3.2 : lo === 0 ? Math.abs(u) + 0.01 : u));
}
const complexSamples: [number, number][] = [
  [0.3, 0.4],
  [-1.2, 0.7],
  [2.1, -0.5],
  [-0.4, -1.9],
  [0.8, 2.3],
];

describe('the built-in table', () => {
  it('has one well-formed record per name', () => {
    const names = BUILTINS.map((b) => b.name);
    expect(new Set(names).size).toBe(names.length);
    for (const b of BUILTINS) {
      expect(builtin(b.name)).toBe(b);
      expect(b.minArgs).toBeLessThanOrEqual(b.maxArgs);
      expect(b.doc.startsWith(`${b.name}(`)).toBe(true);
      if (b.form === 'holomorphic') expect(b.real && b.complex && b.realDomain).toBeTruthy();
      if (b.form === 'step') expect(b.step && b.jumpsAt && b.breaks === 'jump').toBeTruthy();
      if (b.breaks === 'jump') expect(b.form).toBe('step');
    }
    // Completion and hover read the same docs (phi is offered only inside psi(x)).
    expect(FUNCTIONS).toEqual(BUILTINS.filter((b) => b.name !== 'phi').map((b) => ({ name: b.name, doc: b.doc, arity: b.minArgs })));
  });

  it('real kernels agree with mathjs, and their derivatives with central differences of it', () => {
    const o = new Float64Array(KERNEL_BUFFER);
    for (const b of holomorphic) {
      for (const u of realSamples(b)) {
        b.real!(u, o);
        const v = parts(call(b.name, u));
        expect(v.im, `${b.name}(${u}) is real in mathjs`).toBe(0);
        expect(close(o[0]!, v.re, 1e-14), `${b.name}(${u})`).toBe(true);
        // Central differences of mathjs's values (common practice): errors about h^2 f''' and eps/h.
        const h1 = 1e-5;
        const d1 = (parts(call(b.name, u + h1)).re - parts(call(b.name, u - h1)).re) / (2 * h1);
        expect(close(o[1]!, d1, 1e-7), `${b.name}'(${u})`).toBe(true);
        const h2 = 1e-4;
        const d2 = (parts(call(b.name, u + h2)).re - 2 * v.re + parts(call(b.name, u - h2)).re) / (h2 * h2);
        expect(close(o[2]!, d2, 1e-5), `${b.name}''(${u})`).toBe(true);
      }
    }
  });

  it('complex kernels agree with mathjs, and their derivatives with the real-direction difference', () => {
    const o = new Float64Array(KERNEL_BUFFER);
    for (const b of holomorphic) {
      for (const [a, c] of complexSamples) {
        b.complex!(a, c, o);
        const v = parts(call(b.name, math.complex(a, c)));
        expect(close(o[0]!, v.re, 1e-13) && close(o[1]!, v.im, 1e-13), `${b.name}(${a} + ${c}i)`).toBe(true);
        const h = 1e-5;
        const p = parts(call(b.name, math.complex(a + h, c)));
        const m = parts(call(b.name, math.complex(a - h, c)));
        expect(close(o[2]!, (p.re - m.re) / (2 * h), 1e-7) && close(o[3]!, (p.im - m.im) / (2 * h), 1e-7), `${b.name}'(${a} + ${c}i)`).toBe(true);
        const f1 = { re: o[2]!, im: o[3]! };
        const f2 = { re: o[4]!, im: o[5]! };
        // f'' from differences of the kernel's own f' (holomorphic, so any direction will do).
        b.complex!(a + h, c, o);
        const q = { re: o[2]!, im: o[3]! };
        b.complex!(a - h, c, o);
        expect(close(f2.re, (q.re - o[2]!) / (2 * h), 1e-6) && close(f2.im, (q.im - o[3]!) / (2 * h), 1e-6), `${b.name}''`).toBe(true);
        expect(Number.isFinite(f1.re)).toBe(true);
      }
    }
  });

  it('real domains and complex forcing match where mathjs leaves the real numbers', () => {
    for (const b of holomorphic) {
      const [lo, hi] = b.realDomain!;
      const outside = [lo - 0.5, hi + 0.5].filter(Number.isFinite);
      for (const u of outside) expect(parts(call(b.name, u)).im, `${b.name}(${u}) is complex in mathjs`).not.toBe(0);
      expect(outside.length > 0).toBe(b.forcesComplex !== 'never');
      // 'negative' means a non-negative argument keeps the value real: the domain starts at 0.
      if (b.forcesComplex === 'negative') expect(lo).toBe(0);
      // A real argument gives a real result everywhere in the domain, also through the compiler.
      if (b.forcesComplex === 'never') expect(compiled(`${b.name}(x / 3)`).complex).toBe(false);
      else expect(compiled(`${b.name}(x / 3)`).complex).toBe(true);
      if (b.forcesComplex === 'negative') expect(compiled(`${b.name}(x^2 + 1)`).complex).toBe(false);
    }
  });

  it('non-negativity claims hold at sample points, and the compiler uses them', () => {
    const o = new Float64Array(KERNEL_BUFFER);
    for (const b of holomorphic.filter((r) => r.nonneg === 'real')) {
      for (const u of realSamples(b)) {
        b.real!(u, o);
        expect(o[0]!, `${b.name}(${u}) >= 0`).toBeGreaterThanOrEqual(0);
      }
      // A provably non-negative argument keeps sqrt real: sqrt(f(x)) stays on the real path (acos is
      // complex for a non-constant argument anyway, so it cannot show this).
      if (b.forcesComplex === 'always') continue;
      const arg = b.forcesComplex === 'negative' ? 'x^2 + 1' : 'x / 4';
      expect(compiled(`sqrt(${b.name}(${arg}))`).complex, b.name).toBe(false);
      expect(compiled(`sqrt(sin(${b.name}(${arg})))`).complex, b.name).toBe(true);
    }
    for (const b of BUILTINS.filter((r) => r.nonneg === 'always')) {
      expect(compiled(`sqrt(${b.name}(x - 0.2))`).complex).toBe(false);
      for (const u of [-3, -0.5, 0, 2]) expect(parts(call(b.name, u)).re).toBeGreaterThanOrEqual(0);
    }
    for (const b of BUILTINS.filter((r) => r.nonneg === 'args' && r.minArgs === 1)) expect(compiled(`sqrt(${b.name}(x^2))`).complex).toBe(false);
  });

  it('step functions agree with mathjs and jump where the record says, which the compiler finds', () => {
    for (const b of BUILTINS.filter((r) => r.form === 'step')) {
      for (const u of [-2.5, -1.7, -0.5, -0.2, 0, 0.3, 0.5, 1.5, 2.49]) expect(b.step!(u), `${b.name}(${u})`).toBe(parts(call(b.name, u)).re);
      for (const p of b.jumpsAt!) expect(b.step!(p - 1e-9)).not.toBe(b.step!(p + 1e-9));
      const found = compiled(`${b.name}(x)`).breakpoints(-2.2, 2.3);
      const inside = b.jumpsAt!.filter((p) => p > -2.2 && p < 2.3);
      expect(found.length).toBe(inside.length);
      inside.forEach((p, k) => expect(Math.abs(found[k]! - p)).toBeLessThan(1e-12));
    }
  });

  it('kinks are found where the record says, and smooth functions report none', () => {
    // abs kinks where its argument changes sign; min and max where the arguments cross (derived).
    expect(compiled('abs(x - 0.3)').breakpoints(-1, 1).map((p) => +p.toFixed(12))).toEqual([0.3]);
    expect(compiled('min(x, 0.2)').breakpoints(-1, 1).map((p) => +p.toFixed(12))).toEqual([0.2]);
    expect(compiled('max(2 x, 0.5)').breakpoints(-1, 1).map((p) => +p.toFixed(12))).toEqual([0.25]);
    for (const b of BUILTINS.filter((r) => r.breaks === 'none' && r.minArgs === 1 && r.form !== 'phi')) {
      const lo = b.realDomain?.[0] === -1 ? -0.9 : b.realDomain?.[0] === 0 ? 0.1 : -1.2;
      expect(compiled(`${b.name}(x)`).breakpoints(lo, 0.9), b.name).toEqual([]);
    }
    for (const b of BUILTINS.filter((r) => r.breaks === 'kink' && r.minArgs === 1)) expect(compiled(`${b.name}(x)`).breakpoints(-1, 1).length).toBe(1);
  });

  it('arity: the sandbox and the checker accept exactly the record range, as mathjs does', () => {
    const scope = scopeFor(null, { hasX: true, hasPhi: true });
    for (const b of BUILTINS) {
      for (let k = Math.max(0, b.minArgs - 1); k <= b.maxArgs + 1; k++) {
        const text = `${b.name}(${Array.from({ length: k }, (_, j) => (j === 0 && b.name === 'phi' ? '1' : `0.${j + 3}`)).join(', ')})`;
        const p = parseExpression({ text, start: 0, end: text.length });
        const ok = p.result !== null && checkExpression(p.result, scope, null, 'the test').diagnostics.length === 0;
        expect(ok, text).toBe(k >= b.minArgs && k <= b.maxArgs);
      }
      if (b.name !== 'phi') expect(() => call(b.name, ...Array.from({ length: b.minArgs }, () => 0.4))).not.toThrow();
    }
  });

  it('dimension rules: the checker gives each record its documented result', () => {
    const scope = scopeFor(['nm', 'eV'], { hasX: true });
    const want: Record<string, string | null> = { dimensionless: null, half: 'length^(1/2)', same: 'length', none: 'dimensionless', equal: 'length', 'equal-none': 'dimensionless' };
    for (const b of BUILTINS.filter((r) => r.dimensions !== 'phi')) {
      const text = `${b.name}(${Array.from({ length: b.minArgs }, () => 'x').join(', ')})`;
      const c = checkExpression(parseExpression({ text, start: 0, end: text.length }).result!, scope, null, 'the test');
      const expected = want[b.dimensions]!;
      if (expected === null) expect(c.diagnostics.map((d) => d.code), text).toEqual(['units']);
      else expect(formatDimension(c.dimension!), text).toBe(expected);
      if (b.minArgs === 2) {
        const mixed = `${b.name}(x, 1 eV)`;
        expect(checkExpression(parseExpression({ text: mixed, start: 0, end: mixed.length }).result!, scope, null, 'the test').diagnostics.map((d) => d.code)).toEqual(['units']);
      }
      if (b.dimensions === 'dimensionless') {
        const fine = `${b.name}(x / (1 nm) / 7)`;
        expect(checkExpression(parseExpression({ text: fine, start: 0, end: fine.length }).result!, scope, null, 'the test').diagnostics).toEqual([]);
      }
    }
  });

  it('hover on a called built-in shows its record doc', () => {
    const text = 'system box(0, 1)\nstate psi(x) = sech(3 (x - 0.5)) + exp (x)\n';
    const view = { uri: 'file:///t.qstate', version: 1, text, lines: lineTable(text), file: analyseStatic(text).file, diagnostics: [], result: null, evaluate: true };
    for (const name of ['sech', 'exp']) {
      const at = text.indexOf(name) + 1;
      const h = hoverAt(view, at)!;
      expect((h.contents as { value: string }).value).toBe(builtin(name)!.doc);
    }
  });
});
