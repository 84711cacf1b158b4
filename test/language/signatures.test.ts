import { describe, it, expect } from 'vitest';
import type { Arg } from '../../server/src/language/ast';
import { KEYWORDS, KEYWORD_NAMES } from '../../server/src/language/keywords';
import { parse } from '../../server/src/language/parser';
import { bindArguments, SIGNATURES } from '../../server/src/language/signatures';

/** A bare or named argument with dummy offsets (k-th argument at 10k). */
function arg(k: number, name: string | null, text = '1'): Arg {
  return {
    start: 10 * k,
    end: 10 * k + 5,
    name,
    nameSpan: name === null ? null : { start: 10 * k, end: 10 * k + name.length },
    value: { start: 10 * k + 4, end: 10 * k + 5, text },
  };
}

describe('SIGNATURES', () => {
  it('lists the parameters of FORMAT.md with kinds, defaults and docs', () => {
    const table = Object.values(SIGNATURES).map((s) => [s.name, s.params.map((p) => `${p.name}:${p.kind}${p.required ? '!' : ''}${p.defaultText ? `=${p.defaultText}` : ''}`)]);
    expect(table).toEqual([
      ['box', ['left:length!', 'right:length!']],
      ['well', ['depth:energy!', 'width:length!', 'center:length=0', 'barrier_mass:mass']],
      ['oscillator', ['omega:angularFrequency', 'frequency:frequency', 'quantum:energy', 'center:length=0']],
      ['gaussian', ['center:length!', 'width:length!', 'momentum:wavenumber=0']],
      ['thermal', ['nbar:dimensionless', 'temperature:temperature']],
    ]);
    expect(SIGNATURES.oscillator.oneOf).toEqual([['omega', 'frequency', 'quantum']]);
    for (const s of Object.values(SIGNATURES)) {
      expect(s.doc).toMatch(/\S/);
      for (const p of s.params) expect(p.doc, `${s.name}.${p.name}`).toMatch(/^[A-Z].*\.$/);
    }
  });
});

describe('bindArguments', () => {
  const call = { start: 0, end: 100 };

  it('binds positional box arguments in order and named ones by name', () => {
    const b = bindArguments(SIGNATURES.box, [arg(0, null, 'a'), arg(1, null, 'b')], call);
    expect(b.diagnostics).toEqual([]);
    expect([...b.values].map(([k, v]) => [k, v.value.text])).toEqual([
      ['left', 'a'],
      ['right', 'b'],
    ]);
    const n = bindArguments(SIGNATURES.box, [arg(0, 'right', 'b'), arg(1, 'left', 'a')], call);
    expect(n.diagnostics).toEqual([]);
    expect(n.values.get('left')!.value.text).toBe('a');
  });

  it('reports each kind of mistake with its code and range', () => {
    const cases: [keyof typeof SIGNATURES, Arg[], [string, number, number][]][] = [
      ['well', [arg(0, 'depht'), arg(1, 'width')], [['name', 0, 5]]],
      ['well', [arg(0, 'depth'), arg(1, 'width'), arg(2, 'depth')], [['name', 20, 25]]],
      ['well', [arg(0, null), arg(1, null)], [['syntax', 0, 5]]],
      ['well', [arg(0, 'depth')], [['syntax', 0, 100]]],
      ['box', [arg(0, null), arg(1, null), arg(2, null)], [['syntax', 20, 25]]],
      ['box', [arg(0, 'left'), arg(1, null)], [['syntax', 10, 15]]],
      ['oscillator', [arg(0, 'center')], [['syntax', 0, 100]]],
      ['oscillator', [arg(0, 'frequency'), arg(1, 'omega')], [['syntax', 10, 15]]],
      ['gaussian', [arg(0, 'center'), arg(1, 'width'), arg(2, 'momentum')], []],
      ['gaussian', [arg(0, 'centre'), arg(1, 'width')], [['name', 0, 6]]],
    ];
    for (const [name, args, want] of cases) {
      const got = bindArguments(SIGNATURES[name], args, call).diagnostics.map((d) => [d.code, d.start, d.end]);
      expect(got, `${name}(${args.map((a) => a.name).join(', ')})`).toEqual(want);
    }
  });

  it('suggests the closest parameter name', () => {
    const d = bindArguments(SIGNATURES.gaussian, [arg(0, 'centre'), arg(1, 'width')], call).diagnostics[0]!;
    expect(d.fixes?.[0]).toMatchObject({ kind: 'replace', start: d.start, end: d.end, text: 'center' });
  });
});

describe('KEYWORDS', () => {
  /** A snippet with each placeholder replaced by its default (the first choice of a choice list). */
  function expand(snippet: string): string {
    return snippet.replace(/\$\{\d+\|([^,|]*)[^}]*\}/g, '$1').replace(/\$\{\d+:([^}]*)\}/g, '$1');
  }

  it('covers every statement keyword once, with docs', () => {
    expect([...KEYWORD_NAMES].sort()).toEqual(['basis', 'evolve', 'expect', 'let', 'mass', 'state', 'sweep', 'system', 'units']);
    for (const k of KEYWORDS) {
      expect(k.doc).toMatch(/\.$/);
      expect(k.forms.length).toBeGreaterThan(0);
    }
  });

  it('every snippet, with its defaults filled in, is a statement the parser accepts', () => {
    for (const k of KEYWORDS) {
      for (const f of k.forms) {
        const text = expand(f.snippet);
        const r = parse(text);
        expect(r.diagnostics, text).toEqual([]);
        expect(r.file.statements.map((s) => s.kind), text).toEqual([k.keyword]);
      }
    }
  });
});
