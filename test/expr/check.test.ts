import { describe, it, expect } from 'vitest';
import { checkExpression } from '../../server/src/expr/check';
import { DIM } from '../../server/src/expr/constants';
import type { Dimension, Scope } from '../../server/src/expr/types';
import { parse, scopeFor } from './helpers';

const AT = 40;
const phys = (extra: Partial<Scope> = {}) => {
  const s = scopeFor(['nm', 'meV'], { hasX: true, ...extra });
  // A `let L = 10 nm` and a `let omega = ...` as the file's model would add them.
  s.values.set('L', { value: { re: 10, im: 0 }, dimension: DIM.length });
  s.values.set('omega', { value: { re: 2, im: 0 }, dimension: DIM.frequency });
  return s;
};

/** Checks `text` and returns the dimension and [code, covered text] of each diagnostic. */
function check(text: string, scope: Scope, expected: Dimension | null = null, what = 'the value') {
  const c = checkExpression(parse(text, AT), scope, expected, what);
  return {
    dimension: c.dimension,
    found: c.diagnostics.map((d) => [d.code, text.slice(d.start - AT, d.end - AT)]),
    messages: c.diagnostics.map((d) => d.message),
  };
}

describe('dimension analysis (physical mode, units nm, meV)', () => {
  it('infers dimensions', () => {
    const s = phys();
    const cases: [string, Dimension][] = [
      ['x', DIM.length],
      ['L/2 + x', DIM.length],
      ['sqrt(x^2 + L^2)', DIM.length],
      ['hbar omega', DIM.energy],
      ['hbar^2/(2 m_e L^2)', DIM.energy],
      ['exp(-x^2/L^2)', DIM.none],
      ['x > L/2 ? 1 meV : 0', DIM.energy],
      ['0.5 m_e omega^2 x^2', DIM.energy],
      ['1/sqrt(L)', [-0.5, 0, 0, 0]],
      ['abs(x - L) < 1 nm', DIM.none],
      ['min(x, L)', DIM.length],
      ['2 pi * 1.5 THz', DIM.frequency],
    ];
    for (const [text, d] of cases) {
      const r = check(text, s);
      expect(r.found, text).toEqual([]);
      expect(r.dimension, text).toEqual(d.map((v) => v! + 0));
    }
  });

  it('names both dimensions on the range of the expression', () => {
    const r = check('2 nm', phys(), DIM.energy, 'the potential');
    expect(r.found).toEqual([['units', '2 nm']]);
    // Wording on purpose: naming both dimensions in words is the feature under test.
    expect(r.messages[0]).toContain('expected an energy, found a length');
  });

  it('says a bare number needs a unit', () => {
    const r = check('5', phys(), DIM.length, "the box's left end");
    expect(r.found).toEqual([['units', '5']]);
    // Wording on purpose: the sentence names the quantity that needs the unit.
    expect(r.messages[0]).toContain('needs a unit');
    expect(r.messages[0]).toContain("The box's left end");
  });

  it('lets a literal 0 fit any dimension', () => {
    expect(check('0', phys(), DIM.energy).found).toEqual([]);
    expect(check('0', phys(), DIM.energy).dimension).toEqual(DIM.energy);
    expect(check('x + 0', phys(), DIM.length).found).toEqual([]);
    expect(check('x > 0 ? 2 meV : 0', phys(), DIM.energy).found).toEqual([]);
  });

  it('refuses sums, comparisons and branches of different dimensions, on the offending node', () => {
    expect(check('x^2 + 3 nm', phys()).found).toEqual([['units', 'x^2 + 3 nm']]);
    expect(check('1 + (x < 2 meV)', phys()).found).toEqual([['units', 'x < 2 meV']]);
    expect(check('x > 1 nm ? 1 nm : 1 meV', phys()).found).toEqual([['units', 'x > 1 nm ? 1 nm : 1 meV']]);
    expect(check('x + 2', phys()).found).toEqual([['units', 'x + 2']]);
  });

  it('needs dimensionless arguments for exp, sin and friends', () => {
    expect(check('exp(x)', phys()).found).toEqual([['units', 'x']]);
    expect(check('3 + sin(2 x / 1 meV)', phys()).found).toEqual([['units', '2 x / 1 meV']]);
  });

  it('needs a constant dimensionless exponent for a dimensional base', () => {
    expect(check('x^x', phys()).found.map((f) => f[0])).toEqual(['units']);
    expect(check('L^(x/L)', phys()).found).toEqual([['units', 'x/L']]);
    expect(check('2^(x/L)', phys()).found).toEqual([]);
    expect(check('x^(3/2)', phys()).dimension).toEqual([1.5, 0, 0, 0]);
  });
});

describe('name resolution', () => {
  it('suggests close names', () => {
    const r = check('omga x', phys());
    expect(r.found).toEqual([['name', 'omga']]);
    expect(r.messages[0]).toContain("Did you mean 'omega'?");
    expect(check('hbarr', phys()).messages[0]).toContain("Did you mean 'hbar'?");
  });
  it('allows x only inside psi(x) and V(x)', () => {
    expect(check('x', phys({ hasX: false })).found).toEqual([['name', 'x']]);
  });
  it('allows phi(n, x) only with a system', () => {
    expect(check('phi(1, x)', phys()).found).toEqual([['name', 'phi']]);
    const ok = check('phi(1, x) + phi(2, x)', phys({ hasPhi: true }));
    expect(ok.found).toEqual([]);
    expect(ok.dimension).toEqual([-0.5, 0, 0, 0]);
    expect(check('phi(1.5, x)', phys({ hasPhi: true })).found).toEqual([['syntax', '1.5']]);
    expect(check('phi(1, 2 meV)', phys({ hasPhi: true })).found).toEqual([['units', '2 meV']]);
  });
  it('checks the number of arguments', () => {
    expect(check('sin(x/L, 2)', phys()).found).toEqual([['syntax', 'sin(x/L, 2)']]);
    expect(check('atan2(x)', phys()).found).toEqual([['syntax', 'atan2(x)']]);
    expect(check('phi(1)', phys({ hasPhi: true })).found).toEqual([['syntax', 'phi(1)']]);
  });
  it('refuses a function used as a value', () => {
    expect(check('sin + 1', phys()).found).toEqual([['name', 'sin']]);
  });
});

describe('natural mode', () => {
  it('makes every value dimensionless and does not compare with an expected dimension', () => {
    const s = scopeFor(null, { hasX: true });
    const r = check('x^2/2 + 3', s, DIM.energy);
    expect(r.found).toEqual([]);
    expect(r.dimension).toEqual(DIM.none);
  });
});
