/**
 * Data files in the editor, through the built server and a real LSP client over stdio: a document
 * naming `samples("data/p.csv")` is analysed with the file's samples, the server asks the client to
 * watch that file (workspace/didChangeWatchedFiles, dynamic registration), and a change reported by the
 * client analyses the document again; an untrusted workspace reads no data file until it is trusted.
 *
 * Expected physics: sqrt(2) sin(n pi x) sampled on the box (0, 1) is level n, so its weight is 1
 * (infinite square well levels, from memory); the spline's error at 64 intervals is below 1e-6.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { startClient, CAPABILITIES, type TestClient } from './client';
import { tempDir } from '../hardening/tree';

function level(n: number): string {
  const rows = ['# level ' + n, 'x, re'];
  for (let i = 0; i <= 64; i++) rows.push(`${i / 64}, ${Math.SQRT2 * Math.sin((n * Math.PI * i) / 64)}`);
  return rows.join('\n') + '\n';
}

const caps = { ...CAPABILITIES, workspace: { ...CAPABILITIES.workspace, didChangeWatchedFiles: { dynamicRegistration: true, relativePatternSupport: false } } };

let clients: TestClient[] = [];
afterEach(async () => {
  await Promise.all(clients.map((c) => c.stop()));
  clients = [];
});

/** A client that records the watchers the server registers. */
async function watchingClient(evaluate = true, relative = false): Promise<{ c: TestClient; watched: () => Promise<string[]> }> {
  const capabilities = relative ? { ...caps, workspace: { ...caps.workspace, didChangeWatchedFiles: { dynamicRegistration: true, relativePatternSupport: true } } } : caps;
  const c = await startClient({ capabilities, settings: { debounceMs: 0 }, initializationOptions: { evaluate } });
  clients.push(c);
  const seen: string[][] = [];
  let wake: (() => void) | null = null;
  c.connection.onRequest('client/registerCapability', (p: { registrations: { method: string; registerOptions?: { watchers?: { globPattern: unknown }[] } }[] }) => {
    for (const r of p.registrations) {
      if (r.method === 'workspace/didChangeWatchedFiles') seen.push((r.registerOptions?.watchers ?? []).map((w) => (typeof w.globPattern === 'string' ? w.globPattern : JSON.stringify(w.globPattern))));
    }
    wake?.();
    return null;
  });
  c.connection.onRequest('client/unregisterCapability', () => null);
  const watched = (): Promise<string[]> =>
    seen.length > 0 ? Promise.resolve(seen[seen.length - 1]!) : new Promise((r) => (wake = () => seen.length > 0 && r(seen[seen.length - 1]!)));
  return { c, watched };
}

function workspace(): { dir: string; file: string; uri: string } {
  const dir = tempDir('eigenspan-lsp-data-');
  mkdirSync(join(dir, 'data'));
  const file = join(dir, 'data', 'p.csv');
  writeFileSync(file, level(1));
  return { dir, file, uri: pathToFileURL(join(dir, 'relaxed.qstate')).href };
}

const TEXT = 'system box(0, 1)\nstate samples("data/p.csv")\nbasis 10\n';
const weightOf = (r: { result: Record<string, unknown> }, n: number): number => ((r.result.levels as { n: number; weight: number }[]).find((l) => l.n === n)?.weight ?? 0);

describe('data files in the editor', () => {
  it('reads the samples, watches the file and analyses again when it changes', async () => {
    const { c, watched } = await watchingClient();
    const w = workspace();
    c.open(w.uri, TEXT);
    const first = await c.result(w.uri, (r) => weightOf(r as never, 1) > 0.999999);
    expect(weightOf(first, 1)).toBeCloseTo(1, 6);
    expect(await watched()).toEqual([w.file]);
    // The file now holds level 2; the client reports the change.
    writeFileSync(w.file, level(2));
    c.connection.sendNotification('workspace/didChangeWatchedFiles', { changes: [{ uri: pathToFileURL(w.file).href, type: 2 }] });
    const second = await c.result(w.uri, (r) => weightOf(r as never, 2) > 0.999999);
    expect(weightOf(second, 1)).toBeLessThan(1e-12);
  });

  it('watches with a relative pattern when the client supports one (as VS Code does)', async () => {
    const { c, watched } = await watchingClient(true, true);
    const w = workspace();
    c.open(w.uri, TEXT);
    await c.result(w.uri);
    expect(await watched()).toEqual([JSON.stringify({ baseUri: pathToFileURL(join(w.dir, 'data')).href, pattern: 'p.csv' })]);
  });

  it('a missing data file is watched too: creating it analyses the document again', async () => {
    const { c, watched } = await watchingClient();
    const w = workspace();
    const later = join(w.dir, 'data', 'later.csv');
    c.open(w.uri, 'system box(0, 1)\nstate samples("data/later.csv")\n');
    await c.diagnostics(w.uri, (q) => q.diagnostics.some((d) => d.code === 'data'));
    expect(await watched()).toEqual([later]);
    writeFileSync(later, level(3));
    c.connection.sendNotification('workspace/didChangeWatchedFiles', { changes: [{ uri: pathToFileURL(later).href, type: 1 }] });
    const r = await c.result(w.uri, (q) => weightOf(q as never, 3) > 0.999999);
    expect(weightOf(r, 3)).toBeCloseTo(1, 6);
  });

  it('a path out of the workspace is one data finding on the path', async () => {
    const { c } = await watchingClient();
    const w = workspace();
    c.open(w.uri, 'system box(0, 1)\nstate samples("../p.csv")\n');
    const p = await c.diagnostics(w.uri, (q) => q.diagnostics.some((d) => d.code === 'data'));
    const d = p.diagnostics.filter((x) => x.code === 'data');
    expect(d).toHaveLength(1);
    expect(d[0]!.range).toEqual({ start: { line: 1, character: 14 }, end: { line: 1, character: 24 } });
  });

  it('an untrusted workspace reads no data file until it is trusted', async () => {
    const { c, watched } = await watchingClient(false);
    const w = workspace();
    c.open(w.uri, TEXT);
    await c.diagnostics(w.uri, (q) => q.version === 1);
    expect(c.results).toEqual([]);
    c.connection.sendNotification('eigenspan/setTrust', { trusted: true });
    const r = await c.result(w.uri);
    expect(weightOf(r, 1)).toBeCloseTo(1, 6);
    expect(await watched()).toEqual([w.file]);
  });
});
