import { describe, it, expect } from 'vitest';
import type { Comparison, Statement, SystemSpec } from '../../server/src/language/ast';
import { parse } from '../../server/src/language/parser';
import { at, clean } from './check';

/** The only statement of `text`, which must parse cleanly. */
function one(text: string): Statement {
  const s = clean(text);
  expect(s).toHaveLength(1);
  return s[0]!;
}

/** A comparison as [kind, value text, tolerance text]. */
function cmp(text: string, c: Comparison): [string, string, string | null] {
  expect(at(text, c.value)).toBe(c.value.text);
  return [c.kind, c.value.text, c.kind === 'tolerance' ? c.tolerance.text : null];
}

/** The arguments of a constructor as [name, value text] pairs. */
function args(s: SystemSpec | { args: { name: string | null; value: { text: string } }[] }): [string | null, string][] {
  if (!('args' in s)) throw new Error('no arguments');
  return s.args.map((a) => [a.name, a.value.text]);
}

describe('statement forms', () => {
  it('units: names with their spans', () => {
    const text = 'units nm, meV,ps';
    const s = one(text);
    if (s.kind !== 'units') throw new Error(s.kind);
    expect(s.units.map((u) => [u.name, at(text, u.span)])).toEqual([
      ['nm', 'nm'],
      ['meV', 'meV'],
      ['ps', 'ps'],
    ]);
    expect(at(text, s.keywordSpan)).toBe('units');
  });

  it('units: non-ASCII unit names', () => {
    const s = one('units Å, µeV');
    if (s.kind !== 'units') throw new Error(s.kind);
    expect(s.units.map((u) => u.name)).toEqual(['Å', 'µeV']);
  });

  it('mass, basis: the expression is kept verbatim and trimmed', () => {
    const text = 'mass   0.067 m_e   \nbasis 2 * 20';
    const s = clean(text);
    expect(s.map((x) => x.kind)).toEqual(['mass', 'basis']);
    const [m, b] = s as [Extract<Statement, { kind: 'mass' }>, Extract<Statement, { kind: 'basis' }>];
    expect(m.expr.text).toBe('0.067 m_e');
    expect(at(text, m.expr)).toBe('0.067 m_e');
    expect(b.expr.text).toBe('2 * 20');
    expect(m.span).toEqual({ start: 0, end: 16 });
  });

  it('let: name and value', () => {
    const text = 'let L0 = 10 nm == 10 nm ? 1 : 2';
    const s = one(text);
    if (s.kind !== 'let') throw new Error(s.kind);
    expect([s.name, at(text, s.nameSpan), s.expr.text]).toEqual(['L0', 'L0', '10 nm == 10 nm ? 1 : 2']);
  });

  it('let: identifiers may use letters outside the basic plane', () => {
    const text = 'let 𝛼2 = 1\nlet Δx = 𝛼2 / 2';
    const s = clean(text);
    expect(s.map((x) => (x.kind === 'let' ? [x.name, at(text, x.nameSpan)] : null))).toEqual([
      ['𝛼2', '𝛼2'],
      ['Δx', 'Δx'],
    ]);
  });

  it('system box: positional and named arguments', () => {
    const text = 'system box(-L/2, max(1, 2) * L)';
    const s = one(text);
    if (s.kind !== 'system' || s.system.kind !== 'box') throw new Error(s.kind);
    expect(args(s.system)).toEqual([
      [null, '-L/2'],
      [null, 'max(1, 2) * L'],
    ]);
    expect(at(text, s.system.keywordSpan)).toBe('box');
    const n = one('system box(left = 0, right = 2)');
    if (n.kind !== 'system') throw new Error(n.kind);
    expect(args(n.system)).toEqual([
      ['left', '0'],
      ['right', '2'],
    ]);
  });

  it('system well: named arguments, comparisons inside values are not names', () => {
    const text = 'system well(depth = d >= 1 ? d : 1, width = [1, 2][1], center = 0.5)';
    const s = one(text);
    if (s.kind !== 'system') throw new Error(s.kind);
    expect(args(s.system)).toEqual([
      ['depth', 'd >= 1 ? d : 1'],
      ['width', '[1, 2][1]'],
      ['center', '0.5'],
    ]);
    const a = (s.system as Extract<SystemSpec, { kind: 'well' }>).args[0]!;
    expect(at(text, a.nameSpan!)).toBe('depth');
    expect(at(text, a)).toBe('depth = d >= 1 ? d : 1');
  });

  it('system oscillator: each of omega, frequency and quantum', () => {
    for (const p of ['omega = 2', 'frequency = 1.5 MHz', 'quantum = 3 meV']) {
      const s = one(`system oscillator(${p}, center = 1 nm)`);
      if (s.kind !== 'system') throw new Error(s.kind);
      expect(args(s.system).map((x) => x[0])).toEqual([p.split(' ')[0], 'center']);
    }
  });

  it('system V(x): split at the last top-level over [', () => {
    const text = 'system V(x) = (x > 0 ? x : 0) + f([1, 2]) over\n  [-a, a]';
    const s = one(text);
    if (s.kind !== 'system' || s.system.kind !== 'potential') throw new Error(s.kind);
    expect([s.system.expr.text, s.system.from.text, s.system.to.text]).toEqual(['(x > 0 ? x : 0) + f([1, 2])', '-a', 'a']);
    expect(at(text, s.system.keywordSpan)).toBe('V(x)');
    const t = one('system V ( x ) = x over [0, 1] over [min(0, 1), 2]');
    if (t.kind !== 'system' || t.system.kind !== 'potential') throw new Error(t.kind);
    expect([t.system.expr.text, t.system.from.text, t.system.to.text]).toEqual(['x over [0, 1]', 'min(0, 1)', '2']);
  });

  it('state psi(x), complex and multi-line, with a comment in the middle', () => {
    const text = 'state psi(x) = exp(i * x)   # phase\n    * sin(pi * x)';
    const s = one(text);
    if (s.kind !== 'state' || s.state.kind !== 'psi') throw new Error(s.kind);
    expect(s.state.expr.text).toBe(`exp(i * x)   ${' '.repeat(7)}\n    * sin(pi * x)`);
    expect(s.state.expr.end).toBe(text.length);
    expect(s.span).toEqual({ start: 0, end: text.length });
  });

  it('state gaussian with the default momentum left out', () => {
    const s = one('state gaussian(width = 1, center = -2)');
    if (s.kind !== 'state' || s.state.kind !== 'gaussian') throw new Error(s.kind);
    expect(args(s.state)).toEqual([
      ['width', '1'],
      ['center', '-2'],
    ]);
  });

  it('state eigen(N) of each kind of system', () => {
    const text = 'state eigen(n + 1) of V(x) = x^2 over [-3, 3]';
    const s = one(text);
    if (s.kind !== 'state' || s.state.kind !== 'eigen') throw new Error(s.kind);
    expect(s.state.level.text).toBe('n + 1');
    expect(s.state.system.kind).toBe('potential');
    for (const sys of ['box(0, 1)', 'well(depth = 5, width = 2)', 'oscillator(quantum = 1)']) {
      const e = one(`state eigen(1) of ${sys}`);
      if (e.kind !== 'state' || e.state.kind !== 'eigen') throw new Error(e.kind);
      expect(e.state.system.kind).toBe(sys.split('(')[0]);
    }
  });

  it('expect norm, energy and spread with every comparison', () => {
    const text = [
      'expect norm 1 +- 1e-6',
      'expect norm 1 ± 1e-3',
      'expect energy 25 meV +- 0.5 meV',
      'expect spread <= 2 meV',
      'expect energy >= -1',
      'expect spread ≤ 3',
    ].join('\n');
    const s = clean(text);
    const got = s.map((x) => {
      if (x.kind !== 'expect' || x.expectation.kind === 'parity' || x.expectation.kind === 'weight' || x.expectation.kind === 'window') throw new Error(x.kind);
      return [x.expectation.kind, ...cmp(text, x.expectation.comparison)];
    });
    expect(got).toEqual([
      ['norm', 'tolerance', '1', '1e-6'],
      ['norm', 'tolerance', '1', '1e-3'],
      ['energy', 'tolerance', '25 meV', '0.5 meV'],
      ['spread', 'atMost', '2 meV', null],
      ['energy', 'atLeast', '-1', null],
      ['spread', 'atMost', '3', null],
    ]);
  });

  it('expect parity', () => {
    const text = 'expect parity even\nexpect parity odd\nexpect parity mixed';
    const s = clean(text);
    expect(s.map((x) => (x.kind === 'expect' && x.expectation.kind === 'parity' ? [x.expectation.value, at(text, x.expectation.valueSpan)] : null))).toEqual([
      ['even', 'even'],
      ['odd', 'odd'],
      ['mixed', 'mixed'],
    ]);
  });

  it('expect weight: one level, a range, spaces around .., each comparison', () => {
    const text = [
      'expect weight 1..20 >= 0.999',
      'expect weight 3 0.2 +- 0.01',
      'expect weight 2 .. (n + 1) <= 0.5',
      'expect weight 1..4>=0.9',
      'expect weight 0 ≥ 0.1',
    ].join('\n');
    const s = clean(text);
    const got = s.map((x) => {
      if (x.kind !== 'expect' || x.expectation.kind !== 'weight') throw new Error(x.kind);
      const w = x.expectation;
      return [w.from.text, w.to?.text ?? null, ...cmp(text, w.comparison)];
    });
    expect(got).toEqual([
      ['1', '20', 'atLeast', '0.999', null],
      ['3', null, 'tolerance', '0.2', '0.01'],
      ['2', '(n + 1)', 'atMost', '0.5', null],
      ['1', '4', 'atLeast', '0.9', null],
      ['0', null, 'atLeast', '0.1', null],
    ]);
  });

  it('evolve to T, with and without steps', () => {
    const text = 'evolve to 2 * T_rev steps 50 + 50';
    const s = one(text);
    if (s.kind !== 'evolve') throw new Error(s.kind);
    expect([s.to.text, s.steps?.text]).toEqual(['2 * T_rev', '50 + 50']);
    const t = one('evolve to 10 ps');
    if (t.kind !== 'evolve') throw new Error(t.kind);
    expect([t.to.text, t.steps]).toEqual(['10 ps', null]);
    const u = one('evolve to f(steps_x) steps\n  200');
    if (u.kind !== 'evolve') throw new Error(u.kind);
    expect([u.to.text, u.steps?.text]).toEqual(['f(steps_x)', '200']);
  });

  it('keeps statements in order and records the text', () => {
    const text = 'let a = 1\nsystem box(0, a)\nstate psi(x) = x * (a - x)\nexpect norm 1 +- 0.1';
    const r = parse(text);
    expect(r.file.text).toBe(text);
    expect(r.file.statements.map((s) => s.kind)).toEqual(['let', 'system', 'state', 'expect']);
    expect(r.file.rejected).toEqual([]);
  });
});

describe('line ends and encodings', () => {
  it('gives the same tree for LF and CRLF apart from offsets', () => {
    const lf = 'units nm, meV\nsystem V(x) = x\n  + 1 over [0, 1]\nstate psi(x) = 1 # flat\nbasis 3\n';
    const crlf = lf.replace(/\n/g, '\r\n');
    const a = parse(lf);
    const b = parse(crlf);
    expect(b.diagnostics).toEqual([]);
    expect(b.file.statements.map((s) => s.kind)).toEqual(a.file.statements.map((s) => s.kind));
    const sys = b.file.statements[1]!;
    if (sys.kind !== 'system' || sys.system.kind !== 'potential') throw new Error(sys.kind);
    expect(sys.system.expr.text).toBe('x\r\n  + 1');
    expect(at(crlf, sys.system.to)).toBe('1');
  });

  it('measures offsets after a BOM and tabs', () => {
    const text = '\ufeffmass\t2\nbasis\t\t7';
    const s = clean(text);
    expect(s.map((x) => ('expr' in x ? [x.expr.text, x.expr.start] : null))).toEqual([
      ['2', 6],
      ['7', 15],
    ]);
  });
});
