/**
 * The protocol's lifecycle (LSP 3.17 "Server lifecycle") over stdio: requests before `initialize` get
 * ServerNotInitialized (-32002), requests after `shutdown` (a second `shutdown` too) InvalidRequest
 * (-32600), and `exit` after `shutdown` ends the process with code 0. And a `didChange` whose version
 * goes backwards: the text is taken and the version sequence restarts there, so diagnostics, results
 * and hovers describe the same text.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { ErrorCodes, type Hover } from 'vscode-languageserver-protocol';
import { codes, startClient, type TestClient } from './client';
import { INIT, rawServer, type RawServer } from './raw';

const servers: RawServer[] = [];
const clients: TestClient[] = [];
afterEach(async () => {
  await Promise.all([...servers.splice(0).map((s) => s.kill()), ...clients.splice(0).map((c) => c.stop())]);
});

const hover = { textDocument: { uri: 'file:///life/none.qstate' }, position: { line: 0, character: 0 } };

describe('before initialize', () => {
  it('answers a request with ServerNotInitialized and drops notifications, then initializes normally', async () => {
    const s = rawServer();
    servers.push(s);
    const early = await s.request(1, 'textDocument/hover', hover);
    expect(early.error?.code).toBe(ErrorCodes.ServerNotInitialized);
    const unknown = await s.request(2, 'eigenspan/noSuchRequest', {});
    expect(unknown.error?.code).toBe(ErrorCodes.ServerNotInitialized);
    // A didOpen before initialize is dropped: after initialize the document is unknown (hover null, no publish).
    s.send({ jsonrpc: '2.0', method: 'textDocument/didOpen', params: { textDocument: { uri: hover.textDocument.uri, languageId: 'qstate', version: 1, text: 'system box(0, 1\n' } } });
    const init = await s.request(3, 'initialize', INIT);
    expect(init.error).toBeUndefined();
    expect((init.result as { capabilities: { hoverProvider?: boolean } }).capabilities.hoverProvider).toBe(true);
    const again = await s.request(4, 'initialize', INIT);
    expect(again.error?.code).toBe(ErrorCodes.InvalidRequest);
    const h = await s.request(5, 'textDocument/hover', hover);
    expect(h.error).toBeUndefined();
    expect(h.result).toBeNull();
  });
});

describe('after shutdown', () => {
  it('refuses every request with InvalidRequest, a second shutdown too, and exits with 0 on exit', async () => {
    const s = rawServer();
    servers.push(s);
    await s.request(1, 'initialize', INIT);
    s.send({ jsonrpc: '2.0', method: 'initialized', params: {} });
    const first = await s.request(2, 'shutdown');
    expect(first.error).toBeUndefined();
    expect(first.result).toBeNull();
    expect((await s.request(3, 'textDocument/hover', hover)).error?.code).toBe(ErrorCodes.InvalidRequest);
    expect((await s.request(4, 'shutdown')).error?.code).toBe(ErrorCodes.InvalidRequest);
    s.send({ jsonrpc: '2.0', method: 'exit' });
    expect(await s.exited).toBe(0);
  });
});

describe('a version that goes backwards', () => {
  it('takes the new text: its diagnostics, result and hover are published under the lower version', async () => {
    const c = await startClient({ settings: { debounceMs: 0 } });
    clients.push(c);
    const u = 'file:///life/regress.qstate';
    c.open(u, 'system box(0, 1\nstate psi(x) = x\n', 5);
    const broken = await c.diagnostics(u, (p) => p.version === 5);
    expect(codes(broken.diagnostics)).toContain('syntax');
    // 2 sin(pi x) on [0, 1] has norm 2 (integral of 4 sin^2 over [0, 1] = 2, derived in this comment).
    c.change(u, 3, 'system box(0, 1)\nstate psi(x) = 2 sin(pi x)\n');
    const fixed = await c.diagnostics(u, (p) => p.version === 3 && codes(p.diagnostics).includes('norm'));
    expect(codes(fixed.diagnostics)).not.toContain('syntax');
    expect(fixed.diagnostics.find((d) => d.code === 'norm')!.range.start.line).toBe(1);
    const r = await c.result(u, (q) => q.version === 3);
    expect(r.result.norm as number).toBeCloseTo(2, 6);
    await c.log(/version went back from 5 to 3/);
    const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: u }, position: { line: 1, character: 2 } });
    expect(h).not.toBeNull();
    // The sequence goes on from 3.
    c.change(u, 4, 'system box(0, 1)\nstate psi(x) = sqrt(2) sin(pi x)\n');
    const next = await c.result(u, (q) => q.version === 4);
    expect(next.result.norm as number).toBeCloseTo(1, 6);
    await c.diagnostics(u, (p) => p.version === 4 && !codes(p.diagnostics).includes('norm'));
  });
});
