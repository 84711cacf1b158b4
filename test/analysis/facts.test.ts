/**
 * One source per fact: wall-only levels come from the solver by one rule, level numbers from the basis,
 * `let` values from the analysis's own model (with the caller's caps), the file's size in bytes; and a
 * reserved name is refused once, where it is defined.
 */
import { describe, expect, it } from 'vitest';
import { analyse, analyseUntrusted } from '../../server/src/analysis/index';
import { manualClock } from '../../server/src/physics/budget';

const range = (text: string, piece: string, from = 0): [number, number] => {
  const at = text.indexOf(piece, from);
  return [at, at + piece.length];
};
const findings = (r: { diagnostics: { code: string; start: number; end: number }[] }, code: string): [number, number][] =>
  r.diagnostics.filter((d) => d.code === code).map((d) => [d.start, d.end]);

describe('wall-only levels: above the potential at both truncating walls', () => {
  it('a Morse curve cut at 30 has levels above D at its open side only: not wall-only by the rule', () => {
    // Morse, Phys. Rev. 34, 57 (1929): D = 12.5, a = m = hbar = 1 holds 5 bound levels, E_4 = 12.375 < D.
    // Levels 6 to 8 lie above V(30-) = D but far below V(-2.5+) = 12.5 (1 - e^2.5)^2 = 1.6e3 (derived).
    const text = 'system V(x) = 12.5 * (1 - exp(-x))^2 over [-2.5, 30]\nstate gaussian(center = 0, width = 0.3)\nbasis 8\n';
    const r = analyse(text);
    expect(r.levels[4]!.energy).toBeLessThan(12.5);
    expect(r.levels[5]!.energy).toBeGreaterThan(12.5);
    expect(r.levels[7]!.energy).toBeLessThan(1500);
    expect(findings(r, 'continuum')).toEqual([]);
  });

  it('a Gaussian dip in a wide interval has levels above V at both walls: one continuum note on the system', () => {
    // V -> 0 at both walls of [-6, 6]; in a box of width 12 the 30th level lies near (30 pi / 12)^2 / 2 = 31 > 0
    // (box levels, common practice), so the high levels are above V at both walls.
    const text = 'system V(x) = -5 exp(-x^2) over [-6, 6]\nstate gaussian(center = 0, width = 0.5)\nbasis 30\n';
    const r = analyse(text);
    expect(r.levels[29]!.energy).toBeGreaterThan(0);
    const notes = r.diagnostics.filter((d) => d.code === 'continuum');
    expect(notes.map((d) => [d.start, d.end, d.severity])).toEqual([[...range(text, 'system V(x) = -5 exp(-x^2) over [-6, 6]'), 'info']]);
  });
});

describe('level numbers come from the basis', () => {
  it('eigen(0) exists for the oscillator (labels from 0) and not for a box (labels from 1)', () => {
    // Labels: oscillator n = 0, 1, ...; box n = 1, 2, ... (common practice).
    const osc = analyse('system oscillator(omega = 1)\nstate eigen(0) of oscillator(omega = 1)\n');
    expect(osc.levels[0]!.n).toBe(0);
    expect(Math.abs(osc.levels[0]!.weight - 1)).toBeLessThan(1e-12);
    const text = 'system box(0, 1)\nstate eigen(0) of box(0, 1)\n';
    const box = analyse(text);
    expect(findings(box, 'evaluation')).toEqual([range(text, '0', text.indexOf('eigen'))]);
    expect(box.levels).toEqual([]);
  });
});

describe('let values in the result', () => {
  it('gives each value in the file units, computed with the caller caps', () => {
    const long = Array.from({ length: 40 }, () => '1 nm').join(' + ');
    const text = `units nm, eV\nlet L = 2 nm\nlet E = 3 meV\nlet far = ${long}\n`;
    const r = analyse(text, { limits: { maxExpressionLength: 100 } });
    // 3 meV = 0.003 eV (SI prefixes, common practice), to the rounding of one unit conversion.
    expect(r.values!.map((v) => [v.name, v.unit, v.im])).toEqual([
      ['L', 'nm', 0],
      ['E', 'eV', 0],
    ]);
    expect(r.values![0]!.re).toBeCloseTo(2, 14);
    expect(Math.abs(r.values![1]!.re / 0.003 - 1)).toBeLessThan(4e-16);
    expect(findings(r, 'limits')).toHaveLength(1);
    expect(analyse(text).values!.map((v) => v.name)).toEqual(['L', 'E', 'far']);
  });
});

describe('maxFileBytes counts UTF-8 bytes', () => {
  // UTF-8 (RFC 3629): U+00E9 takes 2 bytes, U+1F600 4 bytes (2 UTF-16 code units).
  const cases: [string, string, number][] = [
    ['two-byte', '\u00e9', 2],
    ['four-byte', '\u{1F600}', 4],
  ];
  it.each(cases)('a %s comment just under the limit passes, just over it is refused', (_what, ch, bytes) => {
    const limit = 1024;
    const under = `# ${ch.repeat(Math.floor((limit - 2) / bytes))}`;
    const over = `${under}${ch}`;
    expect(2 + bytes * Math.floor((limit - 2) / bytes)).toBeLessThanOrEqual(limit);
    // Both are far shorter than 1024 UTF-16 code units: only a byte count refuses the second.
    expect(over.length).toBeLessThan(limit);
    expect(findings(analyse(under, { limits: { maxFileBytes: limit } }), 'limits')).toEqual([]);
    expect(findings(analyse(over, { limits: { maxFileBytes: limit } }), 'limits')).toEqual([[0, 1]]);
    expect(findings(analyseUntrusted(over, { limits: { maxFileBytes: limit } }), 'limits')).toEqual([[0, 1]]);
  });
});

describe('reserved names', () => {
  it.each(['__proto__', 'constructor', 'valueOf', 'hasOwnProperty', 'evaluate'])('let %s is refused once, on its name, in both pipelines', (name) => {
    const text = `let ${name} = 1\nlet y = ${name} * 2\nsystem box(0, 1)\nstate psi(x) = sin(pi x) * ${name}\n`;
    const at = range(text, name);
    for (const r of [analyse(text), analyseUntrusted(text)]) {
      const errors = r.diagnostics.filter((d) => d.severity === 'error');
      expect(errors.map((d) => [d.code, d.start, d.end])).toEqual([['name', ...at]]);
    }
  });
});

describe('limits findings name how to raise the cap', () => {
  // The words are the feature here (issue 13): each limits finding names the editor setting and the
  // command-line option that set its cap, as package.json and docs/format.md spell them.
  it.each([
    ['system box(0, 1)\nstate psi(x) = x * (1 - x)\nbasis 999999\n', 'eigenspan.limits.maxBasis', '--limit maxBasis=N'],
    ['system box(0, 1)\nstate psi(x) = x * (1 - x)\nevolve to 1 steps 999999\n', 'eigenspan.limits.maxEvolveSteps', '--limit maxEvolveSteps=N'],
    [`let a = ${'1 + '.repeat(3000)}1\n`, 'eigenspan.limits.maxExpressionLength', '--limit maxExpressionLength=N'],
  ])('%#: names %s and %s', (text, setting, option) => {
    const limits = analyse(text).diagnostics.filter((d) => d.code === 'limits');
    expect(limits).toHaveLength(1);
    expect(limits[0]!.message).toContain(setting);
    expect(limits[0]!.message).toContain(option);
  });
  it('the time limit names the editor setting and the command-line option', () => {
    const text = 'system box(0, 1)\nstate psi(x) = x * (1 - x)\nbasis 3000\n';
    const r = analyse(text, { clock: manualClock(1000), limits: { maxMillis: 500 } });
    const limits = r.diagnostics.filter((d) => d.code === 'limits');
    expect(limits.length).toBeGreaterThan(0);
    for (const d of limits) expect(d.message).toContain('--time-limit MS');
  });
});
