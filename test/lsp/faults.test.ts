/**
 * Fault injection against the built server: a worker that throws, one that runs out of memory,
 * malformed protocol messages and unknown methods. After each, the server keeps serving and the next
 * edit is analysed normally. Faults are injected through the test hooks of the test build
 * (dist/test/server.js with EIGENSPAN_TEST_HOOKS=1); the shipped build ignores them.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { ErrorCodes, type Hover } from 'vscode-languageserver-protocol';
import { startClient, codes, type TestClient } from './client';

const GOOD = 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n';
const clients: TestClient[] = [];

async function client(): Promise<TestClient> {
  const c = await startClient({ settings: { debounceMs: 0, timeBudgetMs: 20_000 }, hooks: true });
  clients.push(c);
  return c;
}

afterEach(async () => {
  while (clients.length > 0) await clients.pop()!.stop();
});

/** After a fault, a fresh document still gets its full analysis and hovers answer. */
async function stillServing(c: TestClient, name: string): Promise<void> {
  const uri = `file:///faults/${name}.qstate`;
  c.open(uri, GOOD);
  const r = await c.result(uri, (q) => q.version === 1, 60_000);
  expect(r.version).toBe(1);
  const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri }, position: { line: 1, character: 2 } });
  expect(h).not.toBeNull();
}

describe('worker faults', () => {
  it('a worker whose analysis throws: the document gets a diagnostic and the next edit analyses normally', { timeout: 120_000 }, async () => {
    const c = await client();
    const uri = 'file:///faults/throws.qstate';
    c.open(uri, GOOD + '# eigenspan-test: throw\n');
    const p = await c.diagnostics(uri, (q) => q.version === 1 && codes(q.diagnostics).includes('limits'), 60_000);
    expect(p.diagnostics.length).toBeGreaterThan(0);
    c.change(uri, 2, GOOD);
    const r = await c.result(uri, (q) => q.version === 2, 60_000);
    expect(r.version).toBe(2);
    await stillServing(c, 'after-throw');
  });

  it('a worker that runs out of memory is replaced and the server keeps serving', { timeout: 180_000 }, async () => {
    const c = await client();
    const uri = 'file:///faults/oom.qstate';
    c.open(uri, GOOD + '# eigenspan-test: oom\n');
    const p = await c.diagnostics(uri, (q) => codes(q.diagnostics).includes('limits'), 150_000);
    expect(p.diagnostics.find((d) => d.code === 'limits')).toBeDefined();
    await stillServing(c, 'after-oom');
  });
});

describe('the shipped build', () => {
  it('ignores the test hooks even with EIGENSPAN_TEST_HOOKS=1: a crash hook is analysed as a comment', async () => {
    const c = await startClient({ settings: { debounceMs: 0 }, env: { EIGENSPAN_TEST_HOOKS: '1' } });
    clients.push(c);
    const uri = 'file:///faults/shipped.qstate';
    c.open(uri, GOOD + '# eigenspan-test: crash\n');
    const r = await c.result(uri, (q) => q.version === 1);
    // sqrt(30) x (1 - x) has norm 1 on [0, 1] (the integral of 30 x^2 (1 - x)^2 is 1, derived in this comment).
    expect(r.result.norm as number).toBeCloseTo(1, 6);
    expect(c.logs.some((l) => /test hook/.test(l))).toBe(false);
  });
});

describe('protocol faults', () => {
  it('answers an unknown request with MethodNotFound and ignores an unknown notification', async () => {
    const c = await client();
    c.connection.sendNotification('eigenspan/noSuchThing', { x: 1 });
    await expect(c.connection.sendRequest('eigenspan/noSuchRequest', {})).rejects.toMatchObject({ code: ErrorCodes.MethodNotFound });
    await stillServing(c, 'after-unknown');
  });

  it('survives malformed messages: bad JSON, a wrong shape and invalid parameters', async () => {
    const c = await client();
    const raw = (body: string): void => {
      c.child.stdin!.write(`Content-Length: ${Buffer.byteLength(body, 'utf8')}\r\n\r\n${body}`);
    };
    raw('{this is not json');
    raw(JSON.stringify({ jsonrpc: '2.0', id: 'x', method: 'textDocument/hover', params: { textDocument: 42 } }));
    raw(JSON.stringify({ jsonrpc: '2.0', method: 'textDocument/didOpen', params: { textDocument: { uri: 7, text: null } } }));
    raw(JSON.stringify({ jsonrpc: '2.0', method: 'textDocument/didChange', params: null }));
    raw(JSON.stringify([1, 2, 3]));
    await stillServing(c, 'after-malformed');
    expect(c.child.exitCode).toBeNull();
  });
});
