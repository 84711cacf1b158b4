import { describe, it, expect } from 'vitest';
import * as mathjs from 'mathjs';
import { BUILTINS } from '../../server/src/expr/builtins/table';
import { DEFAULT_PARSE_OPTIONS, parseExpression, sandboxConfig } from '../../server/src/expr/sandbox';
import type { Expr } from '../../server/src/expr/types';
import { numbersIn } from '../hardening/helpers';

/** The configuration of mathjs's default instance (its declared types omit the function). */
const globalConfig = () => (mathjs as unknown as { config: () => Record<string, unknown> }).config();

const AT = 100; // every expression sits at document offset 100, so ranges are checked as document offsets

function run(text: string) {
  return parseExpression({ text, start: AT, end: AT + text.length });
}

/** The document range of the first occurrence of `part` in `text` (or the whole text). */
function range(text: string, part: string = text): [number, number] {
  const k = text.indexOf(part);
  if (k < 0) throw new Error(`'${part}' not in '${text}'`);
  return [AT + k, AT + k + part.length];
}

// Escape attempts. The functions named by mathjs's security guidance (common practice: import, createUnit,
// evaluate, parse, simplify, derivative, plus compile, resolve, reviver, config), constructor and
// prototype chains, assignments, accessors, strings, objects, matrices, ranges and unit creation.
// Each entry: text, the part that must be refused (whole text when omitted).
const ATTEMPTS: [string, string?][] = [
  ['import({cos: 1}, {override: true})'],
  ['createUnit("knot", "0.514444 m/s")'],
  ['evaluate("1 + 1")'],
  ['parse("x")'],
  ['compile("x")'],
  ['simplify("x + x")'],
  ['derivative("x^2", "x")'],
  ['resolve(x, {x: 1})'],
  ['reviver("a", 1)'],
  ['config({number: "BigNumber"})'],
  ['typed("f", {})'],
  ['chain(3).add(4).done()'],
  ['cos.constructor("return process")'],
  ['sin["constructor"]'],
  ['x.constructor'],
  ['x + __proto__', '__proto__'],
  ['2 * constructor', 'constructor'],
  ['f(x) = 1'],
  ['a = 2'],
  ['x.y = 3'],
  ['x[1]'],
  ['a?.b'],
  ['"abc"'],
  ["x + 'abc'", "'abc'"],
  ['{a: 1}'],
  ['[1, 2, 3]'],
  ['[1, 2; 3, 4] * x', '[1, 2; 3, 4]'],
  ['1:3'],
  ['x + (1:3)', '1:3'],
  ['5 inch to cm'],
  ['3!'],
  ["x'"],
  ['5 mod 3'],
  ['5 % 3'],
  ['a ?? b'],
  ['x .* 2'],
  ['1; 2'],
  ['true'],
  ['map([1, 2], sin)'],
  ['help(sin)'],
  ['sin(x) + evaluate("2")', 'evaluate("2")'],
];

describe('the sandbox refuses escape attempts on their exact range', () => {
  const before = sandboxConfig();
  const globalBefore = JSON.stringify(globalConfig());
  for (const [text, part] of ATTEMPTS) {
    it(text, () => {
      const r = run(text);
      expect(r.result).toBeNull();
      const refused = r.diagnostics.filter((d) => d.code === 'forbidden');
      expect(refused.length).toBe(1);
      expect([refused[0]!.start, refused[0]!.end]).toEqual(range(text, part));
      expect(refused[0]!.severity).toBe('error');
    });
  }

  it('names the dangerous parts of escape attempts that also fail to parse', () => {
    const t1 = 'cos.constructor("return process")()';
    const d1 = run(t1).diagnostics;
    expect(d1.some((d) => d.code === 'syntax')).toBe(true);
    expect(d1.filter((d) => d.code === 'forbidden').map((d) => [d.start, d.end])).toEqual([range(t1, 'constructor'), range(t1, '"return process"')]);
    const t2 = '[].map.constructor("return this")()';
    const d2 = run(t2).diagnostics;
    expect(d2.filter((d) => d.code === 'forbidden').map((d) => [d.start, d.end])).toContainEqual(range(t2, 'constructor'));
  });

  it('caps the length of an expression', () => {
    const text = 'x + '.repeat(2600) + 'x';
    const r = run(text);
    expect(r.result).toBeNull();
    expect(r.diagnostics.map((d) => [d.code, d.start, d.end])).toEqual([['limits', AT, AT + text.length]]);
    expect(text.length).toBeGreaterThan(DEFAULT_PARSE_OPTIONS.maxLength);
  });

  it('caps bracket nesting at the first bracket too deep', () => {
    const text = '('.repeat(250) + 'x' + ')'.repeat(250);
    const r = run(text);
    expect(r.diagnostics.map((d) => [d.code, d.start, d.end])).toEqual([['limits', AT + 200, AT + 201]]);
  });

  it('caps other nesting (unary and power chains)', () => {
    for (const text of ['-'.repeat(300) + 'x', Array(260).fill('2').join('^')]) {
      const r = run(text);
      expect(r.result).toBeNull();
      expect(r.diagnostics.map((d) => d.code)).toEqual(['limits']);
    }
    // A long flat sum, even with mixed operators, is not deep nesting; its length has its own cap.
    expect(run(Array(1500).fill('x').join(' + ')).result).not.toBeNull();
    expect(run(Array(600).fill('x').join(' + 2 x - ')).result).not.toBeNull();
    const long = run(Array(1700).fill('x').join('+'));
    expect(long.diagnostics.map((d) => d.code)).toEqual(['limits']);
    // The message names the cap (DEFAULT_PARSE_OPTIONS.maxChain operations in one chain).
    expect(numbersIn(long.diagnostics[0]!.message)).toContain(DEFAULT_PARSE_OPTIONS.maxChain);
  });

  it('honours smaller caps given as options', () => {
    const r = parseExpression({ text: 'sin(sin(sin(x)))', start: 0, end: 16 }, { maxDepth: 2 });
    expect(r.diagnostics[0]!.code).toBe('limits');
    expect(parseExpression({ text: 'x + 1', start: 0, end: 5 }, { maxLength: 3 }).diagnostics[0]!.code).toBe('limits');
  });

  it('leaves the library configuration unchanged', () => {
    expect(sandboxConfig()).toEqual(before);
    expect(JSON.stringify(globalConfig())).toBe(globalBefore);
    // The private instance keeps mathjs's defaults (mathjs documentation: number type 'number').
    expect(before['number']).toBe('number');
    expect(before['predictable']).toBe(false);
  });
});

describe('a name followed by brackets', () => {
  it('is a syntax error, not a sandbox refusal, with a fix that makes it a product', () => {
    const text = '0.5 m_e (w x)^2';
    const d = run(text).diagnostics;
    expect(d.map((x) => [x.code, x.start, x.end])).toEqual([['syntax', ...range(text, 'm_e (w x)')]]);
    expect(d[0]!.fixes).toEqual([{ kind: 'insert', title: "Insert '*' after 'm_e'", at: AT + 7, text: ' *' }]);
    expect(run('0.5 m_e * (w x)^2').result).not.toBeNull();
  });
  it('suggests the allowed function for a misspelt one', () => {
    const d = run('expp(x)').diagnostics[0]!;
    expect([d.code, d.start, d.end]).toEqual(['forbidden', AT, AT + 7]);
    // Wording on purpose: the sandbox's suggestion comes without a quick fix, so the sentence is where it lives.
    expect(d.message).toContain("Did you mean 'exp'?");
  });
});

describe('syntax errors point at the character mathjs reports', () => {
  const cases: [string, number][] = [
    // mathjs reports the 1-based character where it stopped; the diagnostic starts there (0-based).
    ['sin(x', 5],
    ['x + * 2', 4],
    ['2 +', 3],
    ['x ? 1', 5],
  ];
  for (const [text, at] of cases) {
    it(text, () => {
      const r = run(text);
      expect(r.result).toBeNull();
      expect(r.diagnostics[0]!.code).toBe('syntax');
      expect(r.diagnostics[0]!.start).toBe(AT + at);
    });
  }
  it('reports an empty expression', () => {
    expect(run('   ').diagnostics[0]!.code).toBe('syntax');
  });
});

/** Pre-order list of (type, text) of every node, read back from the document text. */
function nodes(e: Expr, text: string): [string, string][] {
  const out: [string, string][] = [];
  const walk = (n: Expr) => {
    const label = n.type === 'binary' || n.type === 'unary' ? `${n.type}${n.op}` : n.type;
    out.push([label, text.slice(n.start - AT, n.end - AT)]);
    if (n.type === 'unary') walk(n.arg);
    if (n.type === 'binary') {
      walk(n.left);
      walk(n.right);
    }
    if (n.type === 'call') n.args.forEach(walk);
    if (n.type === 'conditional') {
      walk(n.test);
      walk(n.then);
      walk(n.otherwise);
    }
  };
  walk(e);
  return out;
}

describe('ranges of the tree are exact', () => {
  it('for a mixed expression', () => {
    const text = '2 pi x + sin(3 x)^2 - (x > 1 ? 1 : 0)';
    const r = run(text);
    expect(nodes(r.result!, text)).toEqual([
      ['binary-', text],
      ['binary+', '2 pi x + sin(3 x)^2'],
      ['binary*', '2 pi x'],
      ['binary*', '2 pi'],
      ['number', '2'],
      ['symbol', 'pi'],
      ['symbol', 'x'],
      ['binary^', 'sin(3 x)^2'],
      ['call', 'sin(3 x)'],
      ['binary*', '3 x'],
      ['number', '3'],
      ['symbol', 'x'],
      ['number', '2'],
      ['conditional', 'x > 1 ? 1 : 0'],
      ['binary>', 'x > 1'],
      ['symbol', 'x'],
      ['number', '1'],
      ['number', '1'],
      ['number', '0'],
    ]);
  });

  it('across continuation lines, comments, unicode units and number forms', () => {
    const text = '0.5e-3 \u00B5m +\n   .25 nm # a comment\n   - 0x1F \u00C5';
    const r = run(text);
    expect(r.diagnostics).toEqual([]);
    const leaves = nodes(r.result!, text).filter(([t]) => t === 'number' || t === 'symbol').map(([, s]) => s);
    expect(leaves).toEqual(['0.5e-3', '\u00B5m', '.25', 'nm', '0x1F', '\u00C5']);
    const sym = nodes(r.result!, text).find(([, s]) => s === '\u00B5m');
    expect(sym).toBeDefined();
  });

  it('for a chained comparison, written as and', () => {
    const text = '0 < x <= 1';
    expect(nodes(run(text).result!, text)).toEqual([
      ['binaryand', '0 < x <= 1'],
      ['binary<', '0 < x'],
      ['number', '0'],
      ['symbol', 'x'],
      ['binary<=', 'x <= 1'],
      ['symbol', 'x'],
      ['number', '1'],
    ]);
  });

  it('for randomly generated expressions (invariant: every node range reads back its own text)', () => {
    let seed = 2024;
    const rnd = () => {
      seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
      return seed / 4294967296;
    };
    const atoms = ['x', 'pi', '3', '0.25', '1.5e-3', 'k_1', 'nm', '\u00B5m'];
    const fns = BUILTINS.filter((f) => f.minArgs === 1 && f.name !== 'phi').map((f) => f.name);
    // Builds text and the expected pre-order (type, text) list together; compound children are bracketed.
    const gen = (depth: number): { text: string; list: [string, string][] } => {
      if (depth === 0 || rnd() < 0.25) {
        const a = atoms[Math.floor(rnd() * atoms.length)]!;
        return { text: a, list: [[/^[0-9.]/.test(a) ? 'number' : 'symbol', a]] };
      }
      const wrap = (g: { text: string; list: [string, string][] }) => (g.list.length > 1 ? { text: `(${g.text})`, list: g.list } : g);
      const kind = Math.floor(rnd() * 4);
      if (kind === 0) {
        const ops = ['+', '-', '*', '/', '^', '<', '>=', '==', 'and', 'or'];
        const op = ops[Math.floor(rnd() * ops.length)]!;
        const l = wrap(gen(depth - 1));
        const r = wrap(gen(depth - 1));
        const text = `${l.text} ${op} ${r.text}`;
        return { text, list: [[`binary${op}`, text], ...l.list, ...r.list] };
      }
      if (kind === 1) {
        const a = wrap(gen(depth - 1));
        const text = `-${a.text}`;
        return { text, list: [['unary-', text], ...a.list] };
      }
      if (kind === 2) {
        const f = fns[Math.floor(rnd() * fns.length)]!;
        const a = gen(depth - 1);
        const text = `${f}(${a.text})`;
        return { text, list: [['call', text], ...a.list] };
      }
      const t = wrap(gen(depth - 1));
      const a = wrap(gen(depth - 1));
      const b = wrap(gen(depth - 1));
      const text = `${t.text} ? ${a.text} : ${b.text}`;
      return { text, list: [['conditional', text], ...t.list, ...a.list, ...b.list] };
    };
    let total = 0;
    for (let k = 0; k < 300; k++) {
      const g = gen(5);
      const r = run(g.text);
      expect(r.diagnostics, g.text).toEqual([]);
      // Parentheses are unwrapped, so a bracketed child's range is its inside.
      expect(nodes(r.result!, g.text), g.text).toEqual(g.list);
      total += g.list.length;
    }
    // The generator must produce real trees, not just atoms.
    expect(total).toBeGreaterThan(300 * 5);
  });
});
