/**
 * Tokenises qstate text with the real TextMate engine (vscode-textmate + the Oniguruma wasm) and checks
 * the scope given to each construct. Expected scopes are this project's own naming (see the grammar).
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import * as oniguruma from 'vscode-oniguruma';
import * as vsctm from 'vscode-textmate';
import { BUILTINS, builtin } from '../../server/src/expr/builtins/table';
import { BUILTIN_NUMBERS, CONSTANTS, UNITS } from '../../server/src/expr/constants';

const require = createRequire(import.meta.url);
let grammar: vsctm.IGrammar;

beforeAll(async () => {
  const wasm = readFileSync(require.resolve('vscode-oniguruma/release/onig.wasm'));
  await oniguruma.loadWASM(wasm.buffer.slice(wasm.byteOffset, wasm.byteOffset + wasm.byteLength) as ArrayBuffer);
  const registry = new vsctm.Registry({
    onigLib: Promise.resolve({
      createOnigScanner: (patterns: string[]) => new oniguruma.OnigScanner(patterns),
      createOnigString: (s: string) => new oniguruma.OnigString(s),
    }),
    loadGrammar: async (scopeName: string) => {
      if (scopeName !== 'source.qstate') return null;
      const text = readFileSync('syntaxes/qstate.tmLanguage.json', 'utf8');
      return vsctm.parseRawGrammar(text, 'qstate.tmLanguage.json');
    },
  });
  const g = await registry.loadGrammar('source.qstate');
  if (!g) throw new Error('grammar did not load');
  grammar = g;
});

interface Tok {
  text: string;
  scopes: string[];
  line: number;
}

/** Tokenises a whole document, carrying the rule stack from line to line. */
function tokenise(text: string): Tok[] {
  const out: Tok[] = [];
  let stack = vsctm.INITIAL;
  text.split('\n').forEach((line, li) => {
    const r = grammar.tokenizeLine(line, stack);
    for (const t of r.tokens) out.push({ text: line.slice(t.startIndex, t.endIndex), scopes: t.scopes, line: li });
    stack = r.ruleStack;
  });
  return out;
}

/** The innermost scope of the first token whose text is `word` (on line `line` when given). */
function scopeOf(toks: Tok[], word: string, line?: number): string {
  const t = toks.find((k) => k.text.trim() === word && (line === undefined || k.line === line));
  if (!t) throw new Error(`no token '${word}'`);
  return t.scopes[t.scopes.length - 1]!;
}

/** Data-driven check: for each [word, expected innermost scope] pair on `text`. */
function check(text: string, expected: [string, string][], line?: number): void {
  const toks = tokenise(text);
  for (const [word, scope] of expected) expect([word, scopeOf(toks, word, line)]).toEqual([word, scope]);
}

const sample = [
  '# An electron trapped in a 12 nm box, prepared as a tilted plateau',
  'units nm, meV, ps',
  'mass 0.067 m_e',
  'let L = 12 nm',
  'system box(0 nm, L)',
  'state psi(x) = x < L/2 ? (1 + 0.2 i) * sqrt(x / nm) : 0   # a jump at the centre',
  'basis 120',
  'expect norm 1 +- 1e-6',
  'expect parity mixed',
  'expect weight 1..20 >= 0.999',
  'expect energy 25 meV ± 0.5 meV',
  'expect spread 4 meV +- 1 meV',
  'evolve to 5 ps steps 200',
].join('\n');

describe('qstate grammar', () => {
  it('scopes statement keywords, comments and units lines', () => {
    const toks = tokenise(sample);
    for (const kw of ['units', 'mass', 'let', 'system', 'state', 'basis', 'expect', 'evolve']) {
      const t = toks.find((k) => k.text === kw);
      expect(t?.scopes.at(-1)).toBe(`keyword.control.statement.${kw}.qstate`);
      expect(t?.scopes).toContain(`meta.statement.${kw}.qstate`);
    }
    expect(toks.find((k) => k.text.includes('An electron trapped'))?.scopes.at(-1)).toBe('comment.line.number-sign.qstate');
    expect(scopeOf(toks, '#', 0)).toBe('punctuation.definition.comment.qstate');
    expect(toks.find((k) => k.text.includes('a jump at the centre'))?.scopes.at(-1)).toBe('comment.line.number-sign.qstate');
    expect(scopeOf(toks, 'meV', 1)).toBe('support.constant.unit.qstate');
    expect(scopeOf(toks, 'ps', 1)).toBe('support.constant.unit.qstate');
  });

  it('scopes numbers with units and physical constants', () => {
    check(sample, [['0.067', 'constant.numeric.qstate'], ['m_e', 'constant.language.physical.qstate']], 2);
    check(sample, [['12', 'constant.numeric.qstate'], ['nm', 'support.constant.unit.qstate'], ['L', 'variable.other.definition.qstate']], 3);
    check(sample, [['1e-6', 'constant.numeric.qstate']], 7);
    check('let w = 2 pi * 1.5 MHz\nlet k = hbar * q_e / m_p + u', [
      ['pi', 'constant.language.physical.qstate'],
      ['1.5', 'constant.numeric.qstate'],
      ['MHz', 'support.constant.unit.qstate'],
      ['hbar', 'constant.language.physical.qstate'],
      ['q_e', 'constant.language.physical.qstate'],
      ['m_p', 'constant.language.physical.qstate'],
      ['u', 'constant.language.physical.qstate'],
    ]);
    check('state psi(x) = exp(i * x) * e', [
      ['i', 'constant.language.physical.qstate'],
      ['e', 'constant.language.physical.qstate'],
    ]);
  });

  it('scopes system kinds, the potential form and named arguments', () => {
    check(sample, [['box', 'entity.name.function.system.qstate']], 4);
    check('system well(depth = 0.3 eV, width = 4 nm, center = 0 nm)', [
      ['well', 'entity.name.function.system.qstate'],
      ['depth', 'variable.parameter.qstate'],
      ['width', 'variable.parameter.qstate'],
      ['center', 'variable.parameter.qstate'],
      ['eV', 'support.constant.unit.qstate'],
    ]);
    check('system oscillator(quantum = 3 meV)', [
      ['oscillator', 'entity.name.function.system.qstate'],
      ['quantum', 'variable.parameter.qstate'],
    ]);
    check('system V(x) = 0.5 * x^4 - sech(x)^2\n  over [-6, 6]', [
      ['V', 'entity.name.function.potential.qstate'],
      ['x', 'variable.language.position.qstate'],
      ['sech', 'support.function.math.qstate'],
      ['over', 'keyword.other.over.qstate'],
      ['[', 'punctuation.section.brackets.begin.qstate'],
    ]);
    check('system V(x) = 0 over [-6, 6] with mass(x) = x < 0 ? 1 : 2', [
      ['with', 'keyword.other.with.qstate'],
      ['mass', 'entity.name.function.mass.qstate'],
      ['?', 'keyword.operator.ternary.qstate'],
    ]);
    check('system V(x) = x^2 / 2 over [0, 8] walls hard open', [
      ['walls', 'keyword.other.walls.qstate'],
      ['hard', 'constant.language.wall.qstate'],
      ['open', 'constant.language.wall.qstate'],
    ]);
    check('expect revival 2 +- 0.1', [['revival', 'keyword.other.expectation.qstate']]);
    check('expect level 2 energy 4.5 +- 0.1', [['level', 'keyword.other.expectation.qstate']]);
  });

  it('scopes the state forms and functions', () => {
    check(sample, [
      ['psi', 'entity.name.function.state.qstate'],
      ['sqrt', 'support.function.math.qstate'],
      ['?', 'keyword.operator.ternary.qstate'],
      [':', 'keyword.operator.ternary.qstate'],
      ['<', 'keyword.operator.comparison.qstate'],
    ], 5);
    check('state eigen(1) of box(0, 2)', [
      ['eigen', 'entity.name.function.state.qstate'],
      ['of', 'keyword.other.of.qstate'],
      ['box', 'entity.name.function.system.qstate'],
    ]);
    check('state gaussian(center = -1, width = 0.4, momentum = 3)', [
      ['gaussian', 'entity.name.function.state.qstate'],
      ['momentum', 'variable.parameter.qstate'],
      ['-', 'keyword.operator.arithmetic.qstate'],
    ]);
    check('state psi(x) = phi(1, x) + 0.5 * phi(2, x) + bump(x)', [
      ['phi', 'support.function.eigen.qstate'],
      ['bump', 'entity.name.function.qstate'],
    ]);
  });

  it('scopes the expect forms', () => {
    check(sample, [['norm', 'keyword.other.expectation.qstate'], ['+-', 'keyword.operator.tolerance.qstate']], 7);
    check(sample, [['parity', 'keyword.other.expectation.qstate'], ['mixed', 'constant.language.parity.qstate']], 8);
    check(sample, [
      ['weight', 'keyword.other.expectation.qstate'],
      ['1', 'constant.numeric.qstate'],
      ['..', 'keyword.operator.range.qstate'],
      ['20', 'constant.numeric.qstate'],
      ['>=', 'keyword.operator.comparison.qstate'],
      ['0.999', 'constant.numeric.qstate'],
    ], 9);
    check(sample, [['energy', 'keyword.other.expectation.qstate'], ['±', 'keyword.operator.tolerance.qstate']], 10);
    check('expect weight 3 <= 0.01\nexpect parity odd', [['<=', 'keyword.operator.comparison.qstate'], ['odd', 'constant.language.parity.qstate']]);
    check(sample, [['to', 'keyword.other.evolve.qstate'], ['steps', 'keyword.other.evolve.qstate'], ['ps', 'support.constant.unit.qstate']], 12);
  });

  it('keeps an indented continuation line inside its statement and ends it at the next statement', () => {
    const toks = tokenise('system V(x) = x^2\n    + 0.1 * x^4 over [-4, 4]\nbasis 30');
    const over = toks.find((t) => t.text === 'over');
    expect(over?.scopes).toContain('meta.statement.system.qstate');
    const basis = toks.find((t) => t.text === 'basis');
    expect(basis?.scopes).not.toContain('meta.statement.system.qstate');
    expect(basis?.scopes.at(-1)).toBe('keyword.control.statement.basis.qstate');
  });

  it('does not take a keyword inside a name, nor a statement keyword that is not at the start of a line', () => {
    const toks = tokenise('let boxed = 2\nlet overlap = boxed');
    expect(toks.find((t) => t.text === 'overlap')?.scopes.at(-1)).toBe('variable.other.definition.qstate');
    expect(toks.filter((t) => t.scopes.includes('entity.name.function.system.qstate'))).toHaveLength(0);
    expect(toks.filter((t) => t.scopes.includes('keyword.other.over.qstate'))).toHaveLength(0);
  });
});

describe('qstate grammar on the example files', () => {
  it('gives every token of every example a construct scope (no bare statement text)', async () => {
    const { readdirSync } = await import('node:fs');
    const files = readdirSync('examples').filter((f) => f.endsWith('.qstate'));
    expect(files.length).toBeGreaterThan(0);
    for (const f of files) {
      const toks = tokenise(readFileSync(`examples/${f}`, 'utf8'));
      for (const t of toks) {
        if (t.text.trim() === '') continue;
        const inner = t.scopes.at(-1)!;
        expect([f, t.line + 1, t.text, inner.startsWith('meta.statement') || inner === 'source.qstate']).toEqual([f, t.line + 1, t.text, false]);
      }
      // Each line at column 0 that is not a comment opens a statement.
      readFileSync(`examples/${f}`, 'utf8')
        .split('\n')
        .forEach((line, i) => {
          if (/^[a-z]/.test(line)) expect(toks.find((t) => t.line === i)!.scopes.at(-1)).toMatch(/^keyword\.control\.statement\./);
        });
    }
  });
});

describe('function names', () => {
  /** The names of the grammar rule that gives `scope` to a name before `(`. */
  function namesOf(scope: string): string[] {
    const raw = JSON.parse(readFileSync('syntaxes/qstate.tmLanguage.json', 'utf8'));
    const rule = raw.repository['function-call'].patterns.find((p: { captures?: Record<string, { name: string }> }) => p.captures?.['1']?.name === scope);
    const m = /^\\b\(([^)]*)\)\\s\*\(\?=\\\(\)$/.exec(rule.match);
    if (!m) throw new Error(`unexpected pattern ${rule.match}`);
    return m[1]!.split('|').sort();
  }

  it('highlights exactly the built-in functions of the one table', () => {
    expect(namesOf('support.function.math.qstate')).toEqual(BUILTINS.filter((b) => b.form !== 'phi').map((b) => b.name).sort());
    expect(namesOf('support.function.eigen.qstate')).toEqual(BUILTINS.filter((b) => b.form === 'phi').map((b) => b.name));
  });

  it('gives every built-in its scope and a name the sandbox refuses the scope of a user function', () => {
    const line = `state psi(x) = ${BUILTINS.filter((b) => b.form !== 'phi').map((b) => `${b.name}(x)`).join(' + ')}`;
    check(line, BUILTINS.filter((b) => b.form !== 'phi').map((b) => [b.name, 'support.function.math.qstate']));
    // Names of common math libraries that are not built-ins here (the sandbox refuses them).
    for (const name of ['gamma', 'factorial', 'erf', 'pow', 'mod', 'ln', 'arg', 'cot']) {
      expect(builtin(name)).toBeUndefined();
      check(`state psi(x) = ${name}(x)`, [[name, 'entity.name.function.qstate']]);
    }
  });
});

describe('constant names', () => {
  it('highlights every named number and constant of the engine, and besides them only its particle-mass units', () => {
    const raw = JSON.parse(readFileSync('syntaxes/qstate.tmLanguage.json', 'utf8'));
    const m = /^\\b\(([^)]*)\)/.exec(raw.repository.constant.match);
    const names = m![1]!.split('|');
    const engine = [...BUILTIN_NUMBERS.keys(), ...CONSTANTS.keys()];
    expect(names.filter((n) => engine.includes(n)).sort()).toEqual([...engine].sort());
    const rest = names.filter((n) => !engine.includes(n));
    expect(rest.map((n) => UNITS.get(n)?.kind)).toEqual(rest.map(() => 'mass'));
    // Constants of nature only, not the SI's own kilogram and gram.
    expect(rest.filter((n) => n === 'kg' || n === 'g')).toEqual([]);
    check('let action = 2 h + hbar', [['h', 'constant.language.physical.qstate'], ['hbar', 'constant.language.physical.qstate']]);
  });
});

describe('language configuration', () => {
  it('toggles # comments and pairs the brackets the format uses', () => {
    const conf = JSON.parse(readFileSync('language-configuration.json', 'utf8'));
    expect(conf.comments).toEqual({ lineComment: '#' });
    expect(conf.brackets).toEqual([
      ['(', ')'],
      ['[', ']'],
    ]);
    const pairs = conf.autoClosingPairs.map((p: { open: string; close: string }) => p.open + p.close);
    expect(pairs).toContain('()');
    expect(pairs).toContain('[]');
    // The word pattern keeps names like m_e whole.
    expect(new RegExp(conf.wordPattern).exec('m_e')![0]).toBe('m_e');
  });
});
