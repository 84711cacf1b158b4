import { describe, it, expect } from 'vitest';
import { parse } from '../../server/src/language/parser';
import { check, checkEach } from './check';
import { numbersIn } from '../hardening/helpers';

describe('syntax errors: exact ranges', () => {
  it('statements that do not start with a keyword', () => {
    checkEach(`
42 nm
#^ syntax
`);
    // A one-character range at column 0 cannot be drawn under a '#', so it is given as its text.
    check('= 3', { extra: [{ code: 'syntax', text: '=' }] });
  });

  it('units', () => {
    checkEach(`
units
#^^^^ syntax
`);
    checkEach(`
units nm meV
#        ^^^ syntax
`);
    checkEach(`
units nm, , ps
#         ^ syntax
`);
    checkEach(`
units nm, 3 eV
#         ^^^^ syntax
`);
  });

  it('mass, basis and let without a value', () => {
    checkEach(`
mass
#^^^ syntax
basis   # nothing
#^^^^ syntax
let
#^^ syntax
let a
#   ^ syntax
let a 3
#     ^ syntax
let a == 3
#     ^ syntax
let b =
#     ^ syntax
let 3 = 4
#   ^ syntax
`);
  });

  it('system: missing parts of the constructors', () => {
    checkEach(`
system
#^^^^^ syntax
system box
#      ^^^ syntax
system box 0, 1
#          ^ syntax
system box(0, 1
#         ^ syntax
system box(0, 1) extra
#                ^^^^^ syntax
system box(0, , 1)
#             ^ syntax
system box(0,)
#           ^ syntax
system box(0, 1, 2)
#                ^ syntax
system box(0)
#      ^^^^^^ syntax
system box()
#      ^^^^^ syntax
`);
  });

  it('system: named-argument mistakes', () => {
    checkEach(`
system well(2, 3)
#           ^ syntax
system well(depth = 2)
#      ^^^^^^^^^^^^^^^ syntax
system well( = 2, width = 1)
#            ^ syntax
system well(depth =, width = 1)
#                 ^ syntax
system well(2 d = 2, width = 1)
#           ^^^ syntax
system box(left = 0, 1)
#                    ^ syntax
system oscillator(center = 1)
#      ^^^^^^^^^^^^^^^^^^^^^^ syntax
system oscillator(omega = 1, quantum = 2)
#                            ^^^^^^^ syntax
`);
  });

  it('system V(x): malformed heads, missing over, bad ends', () => {
    checkEach(`
system V(y) = y over [0, 1]
#        ^ syntax
system V(x = x over [0, 1]
#          ^ syntax
system V(x) x over [0, 1]
#           ^ syntax
system V(x) == x over [0, 1]
#           ^ syntax
system V(x) = over [0, 1]
#           ^ syntax
system V(x) = x^2
#             ^^^ syntax
system V(x) = x^2 over [0, 1
#                      ^ syntax
system V(x) = x^2 over [0, 1] more
#                             ^^^^ syntax
system V(x) = x^2 over [0, 1, 2]
#                      ^^^^^^^^^ syntax
system V(x) = x^2 over [0,]
#                      ^^^^ syntax
`);
  });

  it('state: malformed psi, eigen and gaussian', () => {
    checkEach(`
state
#^^^^ syntax
state psi = x
#         ^ syntax
state psi(x) =
#            ^ syntax
state eigen 1 of box(0, 1)
#           ^ syntax
state eigen() of box(0, 1)
#          ^^ syntax
state eigen(1) box(0, 1)
#              ^^^ syntax
state eigen(1) of
#              ^^ syntax
state eigen(1 of box(0, 1)
#          ^ syntax
state gaussian(center = 0)
#     ^^^^^^^^^^^^^^^^^^^^ syntax
state gaussian(0, 1)
#              ^ syntax
`);
  });

  it('expect: missing or malformed comparisons', () => {
    checkEach(`
expect
#^^^^^ syntax
expect norm
#      ^^^^ syntax
expect norm 1
#           ^ syntax
expect norm 1 +-
#             ^^ syntax
expect norm +- 1
#           ^^ syntax
expect norm > 1
#           ^ syntax
expect energy >=
#             ^^ syntax
expect parity
#      ^^^^^^ syntax
expect parity even odd
#                  ^^^ syntax
expect parity evn
#             ^^^ syntax
expect weight
#      ^^^^^^ syntax
expect weight 1..
#              ^^ syntax
expect weight 1..20
#                ^^ syntax
expect weight >= 2
#             ^ syntax
`);
  });

  it('evolve: missing parts', () => {
    checkEach(`
evolve
#^^^^^ syntax
evolve 10 ps
#      ^^ syntax
evolve to
#      ^^ syntax
evolve to 10 ps steps
#               ^^^^^ syntax
evolve to steps 3
#      ^^ syntax
`);
  });
});

describe('name errors', () => {
  it('unknown keywords, kinds and parameters, with a suggestion', () => {
    const r = check(`
sytem box(0, 1)
#^^^^ name
System box(0, 1)
#^^^^^ name
frobnicate 3
#^^^^^^^^^ name
system bx(0, 1)
#      ^^ name
state gausian(center = 0, width = 1)
#     ^^^^^^^ name
expect nrom 1 +- 1
#      ^^^^ name
`);
    const w = check(`
system well(dpeth = 1, width = 2)
#           ^^^^^ name
`);
    expect(w.diagnostics[0]!.fixes).toEqual([{ kind: 'replace', title: "Change to 'depth'", start: 12, end: 17, text: 'depth' }]);
    const byText = (word: string) => r.diagnostics.find((d) => r.text.slice(d.start, d.end) === word)!;
    expect(byText('sytem').fixes).toEqual([{ kind: 'replace', title: "Change to 'system'", start: 0, end: 5, text: 'system' }]);
    // Each suggestion is its quick fix's replacement text on the misspelt word.
    for (const [word, want] of [['System', 'system'], ['bx', 'box'], ['gausian', 'gaussian'], ['nrom', 'norm']] as const) {
      const d = byText(word);
      expect(d.fixes).toEqual([expect.objectContaining({ kind: 'replace', start: d.start, end: d.end, text: want })]);
    }
    expect(byText('frobnicate').fixes).toBeUndefined();
  });

  it("the word 'system' repeated after 'of'", () => {
    check(`
state eigen(1) of system box(0, 1)
#                 ^^^^^^ name
`);
  });

  it('a repeated named argument', () => {
    check(`
state gaussian(center = 0, width = 1, center = 2)
#                                     ^^^^^^ name
`);
  });

  it('a second units, mass, system, state, basis or evolve names the first line', () => {
    const r = check(`
units nm, meV
mass 1 m_e
system box(0 nm, 1 nm)
state psi(x) = x
basis 10
evolve to 1 ps
units nm, eV
#^^^^ name
mass 2 m_e
#^^^ name
system box(0 nm, 2 nm)
#^^^^^ name
state psi(x) = 1
#^^^^ name
basis 20
#^^^^ name
evolve to 2 ps
#^^^^^ name
expect norm 1 +- 1
expect norm 1 +- 2
`);
    const msgs = r.diagnostics.map((d) => d.message);
    expect(msgs[0]).toContain('line 1');
    expect(msgs[2]).toContain('line 3');
    expect(r.file.statements.map((s) => s.kind)).toEqual(['units', 'mass', 'system', 'state', 'basis', 'evolve', 'expect', 'expect']);
    expect(r.file.rejected!.map((s) => s.keyword)).toEqual(['units', 'mass', 'system', 'state', 'basis', 'evolve']);
  });

  it('a let name defined twice, a keyword or a reserved name', () => {
    const r = check(`
let a = 1
let b = 2
let a = 3
#   ^ name
let pi = 3
#   ^^ name
let x = 1
#   ^ name
let i = 1
#   ^ name
let e = 1
#   ^ name
let phi = 1
#   ^^^ name
let psi = 1
#   ^^^ name
let system = 1
#   ^^^^^^ name
let over = 1
#   ^^^^ name
let steps = 1
#   ^^^^^ name
`);
    // The message names the line of the first definition (a value, not wording).
    expect(numbersIn(r.diagnostics[0]!.message)).toContain(1);
    expect(r.file.statements.map((s) => (s.kind === 'let' ? s.expr.text : null))).toEqual(['1', '2']);
  });

  it('a let name that belongs to the expression machinery (issue 14): one finding where it is defined', () => {
    const r = check(`
let __proto__ = 1
#   ^^^^^^^^^ name
let constructor = 2
#   ^^^^^^^^^^^ name
let valueOf = 3
#   ^^^^^^^ name
let hasOwnProperty = 4
#   ^^^^^^^^^^^^^^ name
let evaluate = 5
#   ^^^^^^^^ name
let fine = 6
`);
    // Each refused definition is left out, so nothing later can use it as if it were defined.
    expect(r.file.statements.map((s) => (s.kind === 'let' ? s.name : null))).toEqual(['fine']);
  });

  it('units after a statement that uses values; mass after the model', () => {
    const r = check(`
let a = 1
units nm, meV
#^^^^ name
`);
    // The misplaced statement is still used, so later unit checks do not cascade.
    expect(r.file.statements.map((s) => s.kind)).toEqual(['let', 'units']);
    expect(numbersIn(r.diagnostics[0]!.message)).toContain(1);
    for (const first of ['mass 1 m_e', 'system box(0, 1)', 'state psi(x) = 1', 'basis 3', 'expect norm 1 +- 1', 'evolve to 1']) {
      check(`${first}\nunits nm, meV\n#^^^^ name`);
    }
    for (const first of ['system box(0, 1)', 'state psi(x) = 1', 'basis 3', 'expect norm 1 +- 1', 'evolve to 1']) {
      check(`${first}\nmass 2\n#^^^ name`);
    }
    check('units nm, meV\nlet a = 1 nm\nmass 2 m_e\nsystem box(0 nm, a)');
  });
});

describe('recovery', () => {
  it('one typo gives one diagnostic and the other statements survive', () => {
    const r = check(`
units nm, meV, ps
mass 0.067 m_e
let w = 10 nm
system well(depth = 100 meV, widht = w)
#                            ^^^^^ name
state gaussian(center = 0 nm, width = 1 nm)
basis 20
expect norm 1 +- 1e-6
`);
    expect(r.file.statements.map((s) => s.kind)).toEqual(['units', 'mass', 'let', 'state', 'basis', 'expect']);
    expect(r.file.rejected!.map((s) => [s.keyword, r.text.slice(s.span.start, s.span.end)])).toEqual([
      ['system', 'system well(depth = 100 meV, widht = w)'],
    ]);
  });

  it('an unclosed parenthesis stays inside its statement', () => {
    const r = check(`
state psi(x) = sin(x
system box(0, (1)
#         ^ syntax
basis 4
`);
    // The expression layer reports the unbalanced 'sin(' in the state; the parser keeps it verbatim.
    expect(r.file.statements.map((s) => s.kind)).toEqual(['state', 'basis']);
  });

  it('an error on a continued statement covers only its own text', () => {
    check(
      `
system V(x) = x^2
   + 1
state psi(x) = 1
`,
      { extra: [{ code: 'syntax', text: 'x^2\n   + 1' }] },
    );
  });

  it('an unknown keyword line is skipped whole, continuation included', () => {
    const r = check(`
sytem box(0,
#^^^^ name
   1)
basis 5
`);
    expect(r.file.statements.map((s) => s.kind)).toEqual(['basis']);
    expect(r.file.rejected).toEqual([]);
  });

  it('the same fixture with CRLF line ends gives the same ranges', () => {
    check(
      `
units nm
mass
#^^^ syntax
let a = 3
let a = 4
#   ^ name
system box(0 nm, a nm) x
#                      ^ syntax
`,
      { eol: '\r\n' },
    );
  });
});

describe('diagnostics carry catalogue severities', () => {
  it('syntax and name errors are errors', () => {
    const r = parse('sytem 1\nmass\n');
    expect(r.diagnostics.map((d) => [d.code, d.severity])).toEqual([
      ['name', 'error'],
      ['syntax', 'error'],
    ]);
  });
});
