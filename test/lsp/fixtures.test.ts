/**
 * The diagnostic fixtures (test/fixtures/diagnostics, the caret dialect of test/analysis/helpers.ts)
 * opened in the built server: for every code a fixture marks, the published diagnostics are exactly
 * the marked ones, with the marked ranges as LSP positions (lines, UTF-16 columns; LSP 3.17
 * "Position"). The same fixtures and markers as the engine's own test, so both describe one truth.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Position } from 'vscode-languageserver-protocol';
import { markers } from '../analysis/helpers';
import { startClient, type TestClient } from './client';

const dir = join(__dirname, '..', 'fixtures', 'diagnostics');
const names = readdirSync(dir).filter((f) => f.endsWith('.qstate')).sort();

/** The LSP position of a UTF-16 offset (lines end at \n; a JavaScript string index is a UTF-16 unit). */
function position(text: string, offset: number): Position {
  const before = text.slice(0, offset);
  const line = before.split('\n').length - 1;
  return { line, character: offset - (before.lastIndexOf('\n') + 1) };
}

let c: TestClient;
beforeAll(async () => {
  // The largest budget the settings allow, so no fixture meets the server's time limit.
  c = await startClient({ settings: { debounceMs: 0, timeBudgetMs: 60_000 } });
});
afterAll(async () => {
  await c?.stop();
});

describe('diagnostic fixtures over LSP', () => {
  it.each(names)('%s', async (name) => {
    const text = readFileSync(join(dir, name), 'utf8');
    const uri = `file:///fixtures/${name}`;
    c.open(uri, text);
    await c.result(uri, (r) => r.version === 1, 60_000);
    // The full analysis is published before its result is sent: the last publish is the full one.
    const last = c.publishes.filter((p) => p.uri === uri).at(-1)!;
    expect(last.version).toBe(1);
    const expected = markers(text);
    const codes = last.diagnostics.map((d) => String(d.code));
    // `#! code`: somewhere in the file; a code with only caret markers: exactly those ranges.
    const anywhere = new Set(expected.filter((e) => e.start === undefined).map((e) => e.code));
    for (const code of anywhere) expect(codes).toContain(code);
    const ranged = new Set(expected.filter((e) => e.start !== undefined && !anywhere.has(e.code)).map((e) => e.code));
    const key = (code: string, start: Position, end: Position): string => `${code} ${start.line}:${start.character}-${end.line}:${end.character}`;
    const want = expected.filter((e) => ranged.has(e.code)).map((e) => key(e.code, position(text, e.start!), position(text, e.end!)));
    const have = last.diagnostics.filter((d) => ranged.has(String(d.code))).map((d) => key(String(d.code), d.range.start, d.range.end));
    expect(have.sort()).toEqual(want.sort());
  });
});
