// The server's pure pieces, tested in process with one check helper per feature: the cursor is
// marked `|` in each input. Completion and hover run on the real engine's static parse.
import { describe, it, expect } from 'vitest';
import { analyse, analyseStatic } from '../../server/src/analysis/index';
import { lineTable } from '../../server/src/lsp/positions';
import type { DocView } from '../../server/src/lsp/view';
import { openCallAt } from '../../server/src/lsp/calls';
import { completeAt } from '../../server/src/lsp/completion';
import { signatureAt } from '../../server/src/lsp/signature';
import { namesIn, occurrences } from '../../server/src/lsp/syntax';
import { readSettings, DEFAULT_SETTINGS } from '../../server/src/lsp/settings';
import { fmt, fmtPhase } from '../../server/src/lsp/format';
import { quickFixes } from '../../server/src/lsp/actions';
import { toLspDiagnostics } from '../../server/src/lsp/diagnostics';

function cursor(marked: string): { text: string; at: number } {
  const at = marked.indexOf('|');
  return { text: marked.slice(0, at) + marked.slice(at + 1), at };
}

function view(text: string, full = false): DocView {
  const s = analyseStatic(text);
  const r = full ? analyse(text) : null;
  return { uri: 'file:///t.qstate', version: 1, text, lines: lineTable(text), file: s.file, diagnostics: r?.diagnostics ?? s.diagnostics, result: r, evaluate: true };
}

describe('open calls', () => {
  const check = (marked: string, expected: { name: string; index: number; named: string[] } | null): void => {
    const { text, at } = cursor(marked);
    const c = openCallAt(text, at);
    expect(c === null ? null : { name: c.name, index: c.index, named: c.named }).toEqual(expected);
  };
  it('finds the innermost open constructor call', () => {
    check('system well(depth = 1, |', { name: 'well', index: 1, named: ['depth'] });
    check('system box(0, sqrt(2|', { name: 'sqrt', index: 0, named: [] });
    check('system box(0, sqrt(2), |', { name: 'box', index: 2, named: [] });
    check('system box(0, 1)|', null);
    check('state psi(x) = x # box(|', null);
    check('system oscillator(\n  omega = 2,\n  |', { name: 'oscillator', index: 1, named: ['omega'] });
    check('system V(x) = x^2 over [-1, |', null);
  });
});

describe('completion', () => {
  const labels = (marked: string): string[] => {
    const { text, at } = cursor(marked);
    return completeAt(view(text), at, { snippets: true }).map((i) => i.label);
  };
  it('follows the statement being written', () => {
    expect(labels('|')).toContain('system');
    expect(labels('state |')).toEqual(expect.arrayContaining(['psi', 'eigen', 'gaussian']));
    expect(labels('state eigen(1) of |')).toEqual(expect.arrayContaining(['box', 'well', 'oscillator']));
    expect(labels('expect |')).toEqual(['norm', 'parity', 'weight', 'energy', 'spread', 'level', 'continuum', 'revival', 'mean']);
    expect(labels('expect parity |')).toEqual(['even', 'odd', 'mixed']);
    expect(labels('units nm, |')).toEqual(expect.arrayContaining(['nm', 'meV', 'ps']));
    // A frequency may stand for the energy unit (E = h f); a mass or a temperature may not.
    expect(labels('units nm, |')).toContain('MHz');
    expect(labels('units nm, |')).not.toContain('m_e');
    expect(labels('units nm, |')).not.toContain('K');
    expect(labels('state psi(x) = 1 # |')).toEqual([]);
    // After a potential's interval: its mass profile (common practice: BenDaniel-Duke form of the format).
    expect(labels('system V(x) = x^2 over [-5, 5] |')).toEqual(['with mass(x) =']);
    expect(labels('system V(x) = x^2 over [-5, 5] w|')).toEqual(['with mass(x) =']);
    expect(labels('system V(x) = x^2 over [-5, 5] with mass(x) = 1 |')).not.toContain('with mass(x) =');
  });
  it('offers let names only after their definition, and units only in physical mode', () => {
    expect(labels('let a = 1\nsystem box(0, |)\nlet b = 2\n')).toContain('a');
    expect(labels('let a = 1\nsystem box(0, |)\nlet b = 2\n')).not.toContain('b');
    expect(labels('system box(0, |)')).not.toContain('nm');
    expect(labels('units nm, meV\nsystem box(0, 1 |)')).toContain('nm');
  });
  it('inserts plain text when the client has no snippets', () => {
    const { text, at } = cursor('system |');
    const well = completeAt(view(text), at, { snippets: false }).find((i) => i.label === 'well')!;
    expect(well.insertTextFormat).toBe(1);
    expect(well.insertText).not.toMatch(/\$/);
  });
});

describe('signature help', () => {
  const active = (marked: string): number | null => {
    const { text, at } = cursor(marked);
    return signatureAt(text, at)?.activeParameter ?? null;
  };
  it('tracks the parameter by position or by name', () => {
    expect(active('system box(|')).toBe(0);
    expect(active('system box(0, |')).toBe(1);
    expect(active('system well(width = 2, |')).toBe(0);
    expect(active('system well(center = 1|')).toBe(2);
    expect(active('state gaussian(center = 0, width = 1, |')).toBe(2);
    expect(active('state psi(x) = exp(|')).toBeNull();
  });
});

describe('name occurrences', () => {
  it('skips numbers, comments and longer names', () => {
    const text = 'let e5 = 2\nlet k = 1e5 + e5 * k2 # e5';
    const s = view(text).file;
    expect(occurrences(s, 'e5').uses.map((u) => text.slice(u.start, u.end))).toEqual(['e5']);
    expect(occurrences(s, 'e5').definition).toEqual([{ start: 4, end: 6 }]);
  });
  it('falls back to the word scan on an expression that does not parse', () => {
    const expr = { text: 'w * (1 + w', start: 10, end: 20 };
    expect(namesIn(expr).map((u) => [u.name, u.start])).toEqual([['w', 10], ['w', 19]]);
  });
});

describe('quick fixes', () => {
  it('turns engine fixes into edits attached to their diagnostic, only for the version they belong to', () => {
    const v = view('system well(depth = 5, widht = 2)\n');
    const lsp = toLspDiagnostics(v.lines, v.version, v.diagnostics);
    const fixable = lsp.filter((d) => d.data);
    expect(fixable.length).toBe(1);
    const [a] = quickFixes(v, fixable);
    expect(a!.edit!.changes![v.uri]).toEqual([{ range: fixable[0]!.range, newText: 'width' }]);
    // A diagnostic from an older version whose range no longer matches gets no fix.
    const stale = { ...fixable[0]!, data: { version: 0, fixes: [] }, range: { start: { line: 0, character: 0 }, end: { line: 0, character: 1 } } };
    expect(quickFixes(v, [stale])).toEqual([]);
  });
});

describe('let values and formatting', () => {
  it('shows lengths in the file unit, energies in the energy unit, inverse lengths as powers of the length unit', () => {
    const vals = analyse('units nm, meV\nlet w = 2 nm\nlet d = 0.3 eV\nlet k = 2 / nm\nlet r = 3\n').values!;
    // 0.3 eV = 300 meV (SI prefixes, common practice).
    expect(vals.map((v) => [v.name, Number(v.re.toPrecision(12)), v.unit])).toEqual([['w', 2, 'nm'], ['d', 300, 'meV'], ['k', 2, 'nm^-1'], ['r', 3, null]]);
  });
  it('formats numbers and phases', () => {
    expect(fmt(4.934802200544679)).toBe('4.9348');
    expect(fmt(1.5e-9)).toBe('1.5e-9');
    expect(fmt(null)).toBe('—');
    expect(fmtPhase(-1, 0)).toBe('π');
    expect(fmtPhase(0, -1)).toBe('-0.5π');
  });
  it('reads settings defensively', () => {
    expect(readSettings(undefined)).toEqual(DEFAULT_SETTINGS);
    expect(readSettings({ debounceMs: 250, timeBudgetMs: 'x', defaultBasis: 80.4 })).toEqual({ debounceMs: 250, timeBudgetMs: 2000, defaultBasis: 80, limits: {}, limitProblems: [], sweepTimeLimitMs: 60000, sweepInBackground: true });
    expect(readSettings({ debounceMs: -5 }).debounceMs).toBe(100);
    // Limits: whole numbers inside their ranges are kept; others keep the default and are named.
    const s = readSettings({ limits: { maxBasis: 8000, maxNesting: 5000, maxGridPoints: '65536', maxStatements: 12.5, constructor: 1, maxMillis: 1 } });
    expect(s.limits).toEqual({ maxBasis: 8000, maxGridPoints: 65536 });
    expect(s.limitProblems).toHaveLength(4);
    expect(s.limitProblems.join(' ')).toMatch(/maxNesting must be a whole number from 10 to 250/);
    expect(s.limitProblems.join(' ')).toMatch(/'constructor' is not a limit/);
    expect(s.limitProblems.join(' ')).toMatch(/'maxMillis' is not a limit/);
    expect(readSettings({ limits: 'big' }).limitProblems).toEqual(['the limits must be an object of names and numbers']);
  });
});
