// Editor features of the built language server, driven by a real LSP client over stdio.
// Expected physics: box [0, 1] in natural units (hbar = m = 1) has E_n = n^2 pi^2 / 2, so
// E_1 = 4.934802, E_2 = 19.739209 (infinite square well energies, from memory); and
// the integral of |2 sin(pi x)|^2 over [0, 1] is 2 (derived: the mean of sin^2 over a period is 1/2).
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type { CodeAction, CompletionItem, Diagnostic, DocumentSymbol, Hover, Location, SignatureHelp, WorkspaceEdit, CodeLens, InlayHint } from 'vscode-languageserver-protocol';
import { ErrorCodes } from 'vscode-languageserver-protocol';
import { startClient, codes, applyEdits, type TestClient } from './client';

const INVALID_PARAMS = ErrorCodes.InvalidParams;

let c: TestClient;
let n = 0;
const uri = (name: string): string => `file:///features/${name}-${++n}.qstate`;

beforeAll(async () => {
  c = await startClient({ initializationOptions: { panel: true } });
});
afterAll(async () => {
  await c?.stop();
});

const NORM2 = 'system box(0, 1)\nstate psi(x) = 2 sin(pi x)\n';

function hoverText(h: Hover | null): string {
  if (!h) return '';
  const v = h.contents as { value?: string } | string;
  return typeof v === 'string' ? v : (v.value ?? '');
}

/** Opens `text` and waits for the full analysis of version 1. */
async function openAnalysed(text: string, name = 'doc'): Promise<string> {
  const u = uri(name);
  c.open(u, text);
  await c.result(u, (r) => r.version === 1);
  return u;
}

/** The labels of the completion items at (line, character) of a new document holding `text`. */
async function complete(text: string, line: number, character: number): Promise<string[]> {
  const u = uri('complete');
  c.open(u, text);
  const r = await c.connection.sendRequest<CompletionItem[] | null>('textDocument/completion', { textDocument: { uri: u }, position: { line, character } });
  return (r ?? []).map((i) => i.label);
}

describe('diagnostics', () => {
  it('publishes a syntax error at once, with the catalogue code, source and version', async () => {
    const u = uri('syntax');
    c.open(u, 'system box(0, 1\nstate psi(x) = x\n', 7);
    const p = await c.diagnostics(u, (q) => q.version === 7 && codes(q.diagnostics).includes('syntax'));
    const d = p.diagnostics.find((x) => x.code === 'syntax')!;
    expect(d.source).toBe('eigenspan');
    expect(d.severity).toBe(1);
    // The unclosed bracket of `box(` sits at line 0, column 10.
    expect(d.range.start).toEqual({ line: 0, character: 10 });
  });

  it('reports the norm of 2 sin(pi x) on [0, 1] as a warning on the state line, and the result carries norm 2', async () => {
    const u = uri('norm');
    c.open(u, NORM2);
    const p = await c.diagnostics(u, (q) => codes(q.diagnostics).includes('norm'));
    const d = p.diagnostics.find((x) => x.code === 'norm')!;
    expect(d.severity).toBe(2);
    expect(d.range.start.line).toBe(1);
    const r = await c.result(u, (q) => q.version === 1);
    expect(r.result.norm as number).toBeCloseTo(2, 6);
    expect('file' in r.result).toBe(false);
    // This client has the panel, so the result carries plot samples.
    expect(((r.result.samples as { x: number[] } | null)?.x ?? []).length).toBeGreaterThan(0);
  });

  it('clears the diagnostics of a closed document', async () => {
    const u = uri('close');
    c.open(u, 'system box(0, 1\n');
    await c.diagnostics(u, (q) => q.diagnostics.length > 0);
    const before = c.publishes.length;
    c.close(u);
    await c.diagnostics(u, (q) => q.diagnostics.length === 0 && c.publishes.indexOf(q) >= before);
  });
});

describe('hover', () => {
  it('shows norm, captured weight, energy and the level table on the state line', async () => {
    const u = await openAnalysed(NORM2);
    const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: u }, position: { line: 1, character: 3 } });
    const t = hoverText(h);
    expect(t).toMatch(/norm/);
    expect(t).toMatch(/captured/);
    expect(t).toMatch(/⟨E⟩ = 4\.9348/);
    // The spread has its own line and never reads as an error bar on the mean (issue 13).
    expect(t).toMatch(/energy spread ΔE = /);
    expect(t).not.toMatch(/⟨E⟩ = [^\n]*±/);
    expect(t).toMatch(/\| n \| E_n/);
    expect(t).toMatch(/\| 1 \| 4\.9348\d* \| 1 \| 0 \|/);
  });

  it('lists the first energies on the system line', async () => {
    const u = await openAnalysed(NORM2);
    const t = hoverText(await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: u }, position: { line: 0, character: 2 } }));
    expect(t).toMatch(/box/);
    expect(t).toMatch(/\| 1 \| 4\.9348/);
    expect(t).toMatch(/\| 2 \| 19\.7392/);
  });

  it('shows the value of a let name where it is used', async () => {
    const u = await openAnalysed('let L = 2 * 1.5\nsystem box(0, L)\nstate psi(x) = sin(pi x / L)\n');
    const t = hoverText(await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: u }, position: { line: 1, character: 14 } }));
    expect(t).toMatch(/L = 2 \* 1\.5/);
    expect(t).toMatch(/= 3\b/);
  });

  it('compares measured and expected on an expect line', async () => {
    const u = await openAnalysed(NORM2 + 'expect norm 1 +- 1e-6\n');
    const t = hoverText(await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: u }, position: { line: 2, character: 8 } }));
    // Wording on purpose: the hover's text is the feature under test.
    expect(t).toMatch(/expected 1 ± 1e-6/);
    expect(t).toMatch(/measured 2\b/);
    expect(t).toMatch(/does not hold/);
  });
});

describe('completion and signature help', () => {

  it('offers statement keywords at the start of a line', async () => {
    const labels = await complete('sy', 0, 2);
    for (const k of ['units', 'mass', 'let', 'system', 'state', 'basis', 'expect']) expect(labels).toContain(k);
  });

  it('offers system kinds after system, with snippets', async () => {
    const u = uri('snip');
    c.open(u, 'system ');
    const r = await c.connection.sendRequest<CompletionItem[]>('textDocument/completion', { textDocument: { uri: u }, position: { line: 0, character: 7 } });
    expect(r.map((i) => i.label)).toEqual(expect.arrayContaining(['box', 'well', 'oscillator', 'V']));
    const well = r.find((i) => i.label === 'well')!;
    expect(well.insertTextFormat).toBe(2);
    expect(well.insertText).toMatch(/^well\(depth = \$\{1/);
  });

  it('offers the named arguments not given yet inside well(', async () => {
    const labels = await complete('system well(depth = 1, ', 0, 23);
    expect(labels).toContain('width =');
    expect(labels).toContain('center =');
    expect(labels).not.toContain('depth =');
  });

  it('offers let names, constants and allowed functions inside an expression', async () => {
    const labels = await complete('let a0 = 2\nlet w = 1\nsystem box(0, w)\nstate psi(x) = ', 3, 15);
    expect(labels).toEqual(expect.arrayContaining(['w', 'pi', 'exp', 'sqrt', 'x', 'phi']));
  });

  it('gives signature help inside well( with the active parameter', async () => {
    const u = uri('sig');
    c.open(u, 'system well(depth = 1, wi');
    const s = await c.connection.sendRequest<SignatureHelp | null>('textDocument/signatureHelp', { textDocument: { uri: u }, position: { line: 0, character: 25 } });
    expect(s!.signatures[0]!.label).toMatch(/^well\(depth/);
    expect(s!.activeParameter).toBe(1);
    const b = await c.connection.sendRequest<SignatureHelp | null>('textDocument/signatureHelp', { textDocument: { uri: u }, position: { line: 0, character: 12 } });
    expect(b!.activeParameter).toBe(0);
  });

  it('gives signature help in box(, oscillator( and gaussian(', async () => {
    for (const [text, name] of [['system box(0, ', 'box'], ['system oscillator(', 'oscillator'], ['state gaussian(center = 0, ', 'gaussian']] as const) {
      const u = uri('sig');
      c.open(u, text);
      const s = await c.connection.sendRequest<SignatureHelp | null>('textDocument/signatureHelp', { textDocument: { uri: u }, position: { line: 0, character: text.length } });
      expect(s?.signatures[0]?.label.startsWith(`${name}(`)).toBe(true);
    }
  });
});

describe('quick fixes', () => {
  it('applies every offered fix and the finding it addressed is gone after re-analysis', async () => {
    const text = 'system well(depth = 5, widht = 2)\nstate gaussian(centre = 0, width = 0.5)\n';
    const u = uri('fix');
    c.open(u, text);
    const first = await c.diagnostics(u, (q) => q.version === 1 && q.diagnostics.some((d) => d.data));
    const fixable = first.diagnostics.filter((d) => (d.data as { fixes?: unknown[] } | undefined)?.fixes?.length);
    expect(fixable.length).toBeGreaterThanOrEqual(2);
    let version = 1;
    for (const d of fixable) {
      const actions = await c.connection.sendRequest<CodeAction[]>('textDocument/codeAction', {
        textDocument: { uri: u },
        range: d.range,
        context: { diagnostics: [d], only: ['quickfix'] },
      });
      expect(actions.length).toBeGreaterThan(0);
      const a = actions[0]!;
      expect(a.kind).toBe('quickfix');
      expect(a.diagnostics).toEqual([d]);
      const fixedText = applyEdits(text, a.edit!.changes![u]!);
      const v = ++version;
      c.change(u, v, fixedText);
      // The full analysis of the fixed text: its publish is the last one for this version.
      await c.result(u, (q) => q.version === v);
      const after = c.publishes.filter((q) => q.uri === u && q.version === v).at(-1)!;
      const same = (x: Diagnostic): boolean => x.code === d.code && x.range.start.line === d.range.start.line && x.range.start.character === d.range.start.character;
      expect(after.diagnostics.filter(same)).toEqual([]);
    }
  });
});

describe('names', () => {
  const TEXT = 'let a = 1\nlet b = 2 a\nsystem box(0, a)\nstate psi(x) = sin(pi x / a) # a here is a comment\n';

  it('goes to the definition and finds references of a let name', async () => {
    const u = uri('names');
    c.open(u, TEXT);
    const def = await c.connection.sendRequest<Location | null>('textDocument/definition', { textDocument: { uri: u }, position: { line: 2, character: 14 } });
    expect(def!.range).toEqual({ start: { line: 0, character: 4 }, end: { line: 0, character: 5 } });
    const refs = await c.connection.sendRequest<Location[]>('textDocument/references', { textDocument: { uri: u }, position: { line: 0, character: 4 }, context: { includeDeclaration: true } });
    expect(refs.map((r) => [r.range.start.line, r.range.start.character])).toEqual([[0, 4], [1, 10], [2, 14], [3, 26]]);
  });

  it('renames a let name everywhere but in comments, and refuses a built-in name', async () => {
    const u = uri('rename');
    c.open(u, TEXT);
    const prep = await c.connection.sendRequest<{ range: unknown; placeholder: string } | null>('textDocument/prepareRename', { textDocument: { uri: u }, position: { line: 1, character: 10 } });
    expect(prep!.placeholder).toBe('a');
    const none = await c.connection.sendRequest('textDocument/prepareRename', { textDocument: { uri: u }, position: { line: 2, character: 2 } });
    expect(none).toBeNull();
    const edit = await c.connection.sendRequest<WorkspaceEdit>('textDocument/rename', { textDocument: { uri: u }, position: { line: 1, character: 10 }, newName: 'len' });
    const renamed = applyEdits(TEXT, edit.changes![u]!);
    expect(renamed).toBe('let len = 1\nlet b = 2 len\nsystem box(0, len)\nstate psi(x) = sin(pi x / len) # a here is a comment\n');
    // A built-in name and a name already defined are refused as invalid parameters (JSON-RPC -32602).
    for (const newName of ['pi', 'b', '2x']) {
      await expect(c.connection.sendRequest('textDocument/rename', { textDocument: { uri: u }, position: { line: 0, character: 4 }, newName })).rejects.toMatchObject({ code: INVALID_PARAMS });
    }
  });

  it('never offers a reserved name in completion and never accepts one as a new name', async () => {
    const text = 'let __proto__ = 1\nlet constructor = 2\nlet valueOf = 3\nlet ok = 4\nsystem box(0, 1)\nstate psi(x) = ';
    const labels = await complete(text, 5, 15);
    expect(labels).toContain('ok');
    for (const name of ['__proto__', 'constructor', 'valueOf']) expect(labels).not.toContain(name);
    const u = uri('reserved');
    c.open(u, text);
    for (const newName of ['__proto__', 'constructor', 'valueOf', 'hasOwnProperty', 'evaluate']) {
      await expect(c.connection.sendRequest('textDocument/rename', { textDocument: { uri: u }, position: { line: 3, character: 4 }, newName })).rejects.toMatchObject({ code: INVALID_PARAMS });
    }
    const fine = await c.connection.sendRequest<WorkspaceEdit>('textDocument/rename', { textDocument: { uri: u }, position: { line: 3, character: 4 }, newName: 'fine' });
    expect(applyEdits(text, fine.changes![u]!).split('\n')[3]).toBe('let fine = 4');
  });

  it('lists one document symbol per statement', async () => {
    const u = uri('symbols');
    c.open(u, TEXT);
    const syms = await c.connection.sendRequest<DocumentSymbol[]>('textDocument/documentSymbol', { textDocument: { uri: u } });
    expect(syms.map((s) => s.name)).toEqual(['a', 'b', 'system box', 'state psi']);
  });
});

describe('lenses and hints', () => {
  it('puts the energy mean, levels for 99.9% and Show spectrum on the state line', async () => {
    const u = await openAnalysed(NORM2);
    const lenses = await c.connection.sendRequest<CodeLens[]>('textDocument/codeLens', { textDocument: { uri: u } });
    const titles = lenses.map((l) => l.command?.title ?? '');
    expect(lenses.every((l) => l.range.start.line === 1)).toBe(true);
    expect(titles.some((t) => /⟨E⟩ = 4\.9348/.test(t))).toBe(true);
    expect(titles).toContain('99.9% in 1 level');
    expect(lenses.find((l) => l.command?.title === 'Show spectrum')?.command?.command).toBe('eigenspan.showPanel');
  });

  it('shows let values as inlay hints', async () => {
    const u = await openAnalysed('let L = 2 * 1.5\nsystem box(0, L)\nstate psi(x) = sin(pi x / L)\n');
    const hints = await c.connection.sendRequest<InlayHint[]>('textDocument/inlayHint', { textDocument: { uri: u }, range: { start: { line: 0, character: 0 }, end: { line: 3, character: 0 } } });
    expect(hints.map((h) => [h.position.line, h.label])).toEqual([[0, '= 3']]);
  });
});

describe('robustness', () => {
  it('answers requests on unknown documents and odd positions with fallbacks', async () => {
    const h = await c.connection.sendRequest('textDocument/hover', { textDocument: { uri: 'file:///nowhere.qstate' }, position: { line: 0, character: 0 } });
    expect(h).toBeNull();
    const u = uri('odd');
    c.open(u, 'state psi(x) = 1\n');
    const far = await c.connection.sendRequest('textDocument/completion', { textDocument: { uri: u }, position: { line: 99, character: 99 } });
    expect(Array.isArray(far)).toBe(true);
  });
});
