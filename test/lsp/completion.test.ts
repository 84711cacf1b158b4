// Completion over LSP, for a client with snippet support and one without: every template accepted as
// it comes (placeholders left as they are) gives text the static checks accept in the file's own units,
// with no unknown names; plain clients never get snippet syntax; keywords add no space of their own.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CompletionItem } from 'vscode-languageserver-protocol';
import { CAPABILITIES, startClient, type TestClient } from './client';
import { analyseStatic } from '../../server/src/analysis/index';

const PLAIN_CAPABILITIES = { ...CAPABILITIES, textDocument: { ...CAPABILITIES.textDocument, completion: { completionItem: { snippetSupport: false } } } };

let snippet: TestClient;
let plain: TestClient;
let n = 0;

beforeAll(async () => {
  [snippet, plain] = await Promise.all([startClient(), startClient({ capabilities: PLAIN_CAPABILITIES })]);
});
afterAll(async () => {
  await Promise.all([snippet?.stop(), plain?.stop()]);
});

/** The items at the end of `text` (a new document), optionally as asked for by a trigger character. */
async function itemsAt(c: TestClient, text: string, trigger?: string): Promise<CompletionItem[]> {
  const uri = `file:///completion/doc-${++n}.qstate`;
  c.open(uri, text);
  const lines = text.split('\n');
  const position = { line: lines.length - 1, character: lines[lines.length - 1]!.length };
  const context = trigger ? { triggerKind: 2, triggerCharacter: trigger } : { triggerKind: 1 };
  const r = await c.connection.sendRequest<CompletionItem[] | null>('textDocument/completion', { textDocument: { uri }, position, context });
  c.close(uri);
  return r ?? [];
}

/**
 * What accepting an item inserts with its placeholders left as they are, by the LSP snippet grammar
 * (`${1:text}` its text, `${1|a,b|}` its first choice, `$1` and `${1}` nothing); written here on its own,
 * independent of the server's conversion.
 */
function accepted(i: CompletionItem): string {
  const t = i.insertText ?? i.label;
  if (i.insertTextFormat !== 2) return t;
  let s = t;
  for (let k = 0; k < 3; k++) s = s.replace(/\$\{\d+:([^${}]*)\}/g, '$1');
  return s.replace(/\$\{\d+\|([^,|]*)[^}]*\|\}/g, '$1').replace(/\$\{\d+\}|\$\d+/g, '');
}

/** `text` with the word before its end replaced by the accepted item. */
const accept = (text: string, i: CompletionItem) => text.replace(/[A-Za-z_]*$/, '') + accepted(i);

/** The static findings that make a file wrong as written: syntax, unknown names, units. */
function wrong(text: string): string[] {
  return analyseStatic(text)
    .diagnostics.filter((d) => d.severity === 'error' && ['syntax', 'name', 'units'].includes(d.code))
    .map((d) => `${d.code} at ${JSON.stringify(text.slice(d.start, d.end))}: ${d.message}`);
}

const FILES = {
  natural: 'system box(0, 1)\n',
  'nm, meV, ps': 'units nm, meV, ps\n',
  'angstrom, eV (no time unit)': 'units angstrom, eV\n',
  'um, MHz (a frequency for the energy, no time unit)': 'units um, MHz\n',
};

/** Documents ending where a list is asked for, each with what it should become once an item is accepted. */
const PLACES: [string, (base: string) => string][] = [
  ['after system', (b) => b.replace(/system.*\n/, '') + 'system '],
  ['after state', (b) => b + 'state '],
  ['after of', (b) => b + 'state eigen(2) of '],
  ['after expect', (b) => b + 'expect '],
  ['after evolve', (b) => b + 'evolve '],
  ['a keyword', (b) => b],
];

describe.each([
  ['snippet', () => snippet],
  ['plain', () => plain],
] as const)('completion in a %s client', (kind, client) => {
  it.each(Object.entries(FILES))('every template accepted as it comes is valid text in a %s file', async (_units, base) => {
    for (const [where, make] of PLACES) {
      const text = make(base);
      const items = await itemsAt(client(), text);
      expect(items.length, where).toBeGreaterThan(0);
      for (const i of items) {
        if (i.kind === 14 && ['system', 'state', 'expect', 'units'].includes(i.label)) continue;
        const after = accept(text, i);
        // The keyword table's `units` would switch a natural file to physical units; it is checked alone below.
        expect(wrong(after), `${where}: ${i.label} -> ${JSON.stringify(after)}`).toEqual([]);
      }
    }
  });

  it('never inserts snippet syntax into a plain client, and snippets only into a snippet client', async () => {
    for (const text of ['', 'system ', 'state ', 'expect ', 'evolve ', 'system box(0, 1)\nstate psi(x) = ', 'system well(', 'units nm, meV\nsystem well(depth = 1 meV, ']) {
      for (const i of await itemsAt(client(), text)) {
        if (kind === 'plain') {
          expect(i.insertTextFormat ?? 1, `${JSON.stringify(text)} ${i.label}`).toBe(1);
          expect(i.insertText ?? i.label, `${JSON.stringify(text)} ${i.label}`).not.toMatch(/\$\{?\d/);
        } else if (i.insertText?.includes('$')) expect(i.insertTextFormat).toBe(2);
      }
    }
  });

  it('offers to after evolve, and steps after its time', async () => {
    const to = (await itemsAt(client(), 'units nm, meV, ps\nevolve ')).find((i) => i.label === 'to')!;
    expect(accepted(to)).toBe('to 1 ps steps 200');
    expect((await itemsAt(client(), 'evolve to 10 ')).map((i) => i.label)).toContain('steps');
    expect((await itemsAt(client(), 'evolve to 10 steps ')).map((i) => i.label)).not.toContain('steps');
  });

  it('completes a keyword with several forms to the bare keyword; the space typed next asks for the forms', async () => {
    const items = await itemsAt(client(), 'sy');
    for (const k of ['system', 'state', 'expect']) expect(accepted(items.find((i) => i.label === k)!)).toBe(k);
    expect((await itemsAt(client(), 'system ', ' ')).map((i) => i.label)).toEqual(expect.arrayContaining(['box', 'well', 'oscillator', 'V']));
    expect((await itemsAt(client(), 'evolve ', ' ')).map((i) => i.label)).toEqual(['to']);
    // A space inside a formula asks for nothing.
    expect(await itemsAt(client(), 'system box(0, 1)\nstate psi(x) = x ', ' ')).toEqual([]);
  });

  it('gives templates in the units of the units line', async () => {
    const well = (await itemsAt(client(), 'units nm, meV\nsystem ')).find((i) => i.label === 'well')!;
    expect(accepted(well)).toBe('well(depth = 1 meV, width = 1 nm)');
    const natural = (await itemsAt(client(), 'system ')).find((i) => i.label === 'well')!;
    expect(accepted(natural)).toBe('well(depth = 10, width = 2)');
    const mass = (await itemsAt(client(), 'ma')).find((i) => i.label === 'mass')!;
    expect(accepted(mass)).toBe('mass 1');
  });
});
