// Scheduling of the full analysis in the built server: debounce, latest version wins, cooperative
// cancellation, the time budget, crash recovery and exit when the client goes away. The worker's test
// hooks (`# eigenspan-test: ...`, honoured only with EIGENSPAN_TEST_HOOKS=1) make the slow cases
// deterministic; those tests run the test build (dist/test/server.js).
import { describe, it, expect, afterEach } from 'vitest';
import { spawn } from 'node:child_process';
import { LSPErrorCodes, type Hover } from 'vscode-languageserver-protocol';
import { CancellationTokenSource, createProtocolConnection, IPCMessageReader, IPCMessageWriter, StreamMessageReader, StreamMessageWriter } from 'vscode-languageserver-protocol/node';
import { startClient, codes, SERVER, type TestClient } from './client';

const clients: TestClient[] = [];
async function client(settings: Record<string, unknown> = {}, initializationOptions: Record<string, unknown> = {}): Promise<TestClient> {
  const c = await startClient({ settings, initializationOptions, hooks: true });
  clients.push(c);
  return c;
}
afterEach(async () => {
  await Promise.all(clients.splice(0).map((c) => c.stop()));
});

const GOOD = 'system box(0, 1)\nstate psi(x) = sqrt(30) * x * (1 - x)\n';

describe('latest version wins', () => {
  it('a burst of typed edits never publishes an older version, and the last version gets the full analysis', async () => {
    const c = await client({ debounceMs: 30 });
    const u = 'file:///sched/burst.qstate';
    let text = '';
    c.open(u, text, 0);
    let v = 0;
    for (const ch of GOOD) {
      text += ch;
      c.change(u, ++v, text);
    }
    const last = v;
    const r = await c.result(u, (q) => q.version === last);
    expect(r.version).toBe(last);
    await c.diagnostics(u, (q) => q.version === last && c.publishes.filter((p) => p.uri === u).at(-1) === q);
    const versions = c.publishes.filter((p) => p.uri === u).map((p) => p.version!);
    for (let k = 1; k < versions.length; k++) expect(versions[k]!).toBeGreaterThanOrEqual(versions[k - 1]!);
    // The debounce means far fewer full analyses than keystrokes.
    expect(c.results.filter((q) => q.uri === u).length).toBeLessThan(last / 2);
    // Every result published is for a version that was current when it arrived: never older than a publish before it.
    for (const q of c.results.filter((x) => x.uri === u)) expect(q.version).toBeLessThanOrEqual(last);
  });

  it('cancels a superseded analysis cooperatively and never publishes its result', async () => {
    const c = await client({ debounceMs: 0, timeBudgetMs: 20_000 });
    const u = 'file:///sched/cancel.qstate';
    c.open(u, GOOD + '# eigenspan-test: slow 15000\n', 1);
    // The worker prints the hook on its stdout; the server forwards it to the log, never to its own stdout.
    await c.log(/^\[worker stdout\] test hook slow/);
    c.change(u, 2, GOOD);
    await c.log(/cancel\.qstate \(revision \d+\) cancelled/);
    const r = await c.result(u, (q) => q.version === 2);
    expect(r.version).toBe(2);
    expect(c.results.some((q) => q.uri === u && q.version === 1)).toBe(false);
  });
});

describe('time budget and crashes', () => {
  it('terminates a runaway analysis with a limits diagnostic while other documents still get answers', async () => {
    const c = await client({ timeBudgetMs: 1500, debounceMs: 0 });
    const b = 'file:///sched/other.qstate';
    c.open(b, GOOD);
    await c.result(b, (q) => q.version === 1);
    const a = 'file:///sched/runaway.qstate';
    c.open(a, GOOD + '# eigenspan-test: hang\n');
    await c.log(/^\[worker stdout\] test hook hang/);
    // While the worker spins, hover on the other document is answered from its cached result: the
    // answer comes before the runaway's budget runs out (no limits finding for it has arrived yet).
    const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: b }, position: { line: 1, character: 2 } });
    expect(h).not.toBeNull();
    expect(c.publishes.some((q) => q.uri === a && codes(q.diagnostics).includes('limits'))).toBe(false);
    const p = await c.diagnostics(a, (q) => codes(q.diagnostics).includes('limits'));
    const d = p.diagnostics.find((x) => x.code === 'limits')!;
    // On the state keyword (line 1, columns 0-5).
    expect(d.range).toEqual({ start: { line: 1, character: 0 }, end: { line: 1, character: 5 } });
    await c.log(/runaway\.qstate \(revision \d+\) exceeded 1500 ms/);
    // The worker was restarted: a new edit is analysed again.
    c.change(b, 2, GOOD + '\n');
    const r = await c.result(b, (q) => q.version === 2);
    expect(r.version).toBe(2);
  });

  it('stops a genuinely slow analysis (a numerical potential with 1000 levels) within the budget without any test hook', async () => {
    const c = await startClient({ settings: { timeBudgetMs: 1000, debounceMs: 0 } });
    clients.push(c);
    const a = 'file:///sched/slow-potential.qstate';
    c.open(a, 'system V(x) = x^4 over [-6, 6]\nstate psi(x) = exp(-x^2)\nbasis 1000\n');
    // The engine runs under 3/4 of the budget and stops itself with a limits finding and partial
    // results; should it not, the worker is terminated at the budget. Either way a limits finding
    // comes, and a result (if any) has fewer than the 1000 levels asked for.
    const p = await c.diagnostics(a, (q) => q.diagnostics.some((d) => d.code === 'limits'));
    expect(p.version).toBe(1);
    for (const r of c.results.filter((q) => q.uri === a)) expect((r.result.levels as unknown[]).length).toBeLessThan(1000);
    const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: a }, position: { line: 0, character: 2 } });
    expect(h).not.toBeNull();
  });

  it('publishes name and unit findings at once, before the numerical analysis has finished', async () => {
    const c = await client({ debounceMs: 0, timeBudgetMs: 20_000 });
    const a = 'file:///sched/static-units.qstate';
    // The hang keeps the worker busy, so only the immediate (static) publish can carry these findings.
    c.open(a, 'units nm, meV\nsystem box(1, 2 nm)\nstate psi(x) = sin(pi x / widht)\n# eigenspan-test: hang\n');
    const p = await c.diagnostics(a, (q) => q.version === 1);
    expect(codes(p.diagnostics).sort()).toEqual(['name', 'units']);
  });

  it('restarts a crashed worker and keeps serving', async () => {
    const c = await client({ debounceMs: 0 });
    const a = 'file:///sched/crash.qstate';
    c.open(a, GOOD + '# eigenspan-test: crash\n');
    const p = await c.diagnostics(a, (q) => codes(q.diagnostics).includes('limits'));
    expect(p.diagnostics.find((x) => x.code === 'limits')!.range.start.line).toBe(1);
    await c.log(/exited unexpectedly/);
    const b = 'file:///sched/after-crash.qstate';
    c.open(b, GOOD);
    const r = await c.result(b, (q) => q.version === 1);
    expect(r.version).toBe(1);
    const h = await c.connection.sendRequest<Hover | null>('textDocument/hover', { textDocument: { uri: b }, position: { line: 1, character: 2 } });
    expect(h).not.toBeNull();
  });
});

describe('trust', () => {
  it('runs only static checks when evaluation is off, and switches on with eigenspan/setTrust', async () => {
    const c = await client({ debounceMs: 0 }, { evaluate: false });
    const u = 'file:///sched/untrusted.qstate';
    c.open(u, 'system box(0, 1)\nstate psi(x) = 2 sin(pi x)\n');
    const p = await c.diagnostics(u, (q) => q.version === 1);
    expect(codes(p.diagnostics)).not.toContain('norm');
    const lens = await c.connection.sendRequest<{ command?: { title: string } }[]>('textDocument/codeLens', { textDocument: { uri: u } });
    expect(lens).toEqual([]);
    expect(c.results).toEqual([]);
    c.connection.sendNotification('eigenspan/setTrust', { trusted: true });
    const r = await c.result(u, (q) => q.version === 1);
    expect(r.result.norm as number).toBeCloseTo(2, 6);
    await c.diagnostics(u, (q) => codes(q.diagnostics).includes('norm'));
  });
});

describe('request handlers', () => {
  it('log a failing handler with the document URI and answer a fallback', async () => {
    const c = await client();
    const u = 'file:///sched/bad-request.qstate';
    c.open(u, 'system box(0, 1)\n');
    const h = await c.connection.sendRequest('textDocument/hover', { textDocument: { uri: u }, position: null });
    expect(h).toBeNull();
    await c.log(/hover failed for file:\/\/\/sched\/bad-request\.qstate/);
    const symbols = await c.connection.sendRequest('textDocument/documentSymbol', { textDocument: { uri: u } });
    expect(Array.isArray(symbols)).toBe(true);
  });

  it('answer RequestCancelled when the client cancels a hover that waits for the analysis', async () => {
    const c = await client({ debounceMs: 0, timeBudgetMs: 20_000 });
    const u = 'file:///sched/cancel-hover.qstate';
    c.open(u, GOOD + '# eigenspan-test: slow 10000\n');
    await c.log(/^\[worker stdout\] test hook slow/);
    const source = new CancellationTokenSource();
    const pending = c.connection.sendRequest('textDocument/hover', { textDocument: { uri: u }, position: { line: 1, character: 2 } }, source.token);
    source.cancel();
    await expect(pending).rejects.toMatchObject({ code: LSPErrorCodes.RequestCancelled });
  });
});

describe('results notification', () => {
  it('is not sent to a client that neither has the panel nor asks for results', async () => {
    const c = await client({ debounceMs: 0 }, { results: false });
    const u = 'file:///sched/quiet.qstate';
    c.open(u, 'system box(0, 1)\nstate psi(x) = 2 sin(pi x)\n');
    await c.diagnostics(u, (q) => codes(q.diagnostics).includes('norm'));
    // A request answered after the publish orders the stream: a result sent before it would be here by now.
    await c.connection.sendRequest('textDocument/hover', { textDocument: { uri: u }, position: { line: 0, character: 0 } });
    expect(c.results).toEqual([]);
  });
});

describe('settings', () => {
  it('reads eigenspan.defaultBasis through workspace/configuration and re-analyses when it changes', async () => {
    // A large budget: under load the engine's own time limit (3/4 of it) must not cut the levels.
    const settings: Record<string, unknown> = { debounceMs: 0, defaultBasis: 12, timeBudgetMs: 20_000 };
    const c = await client(settings);
    const u = 'file:///sched/settings.qstate';
    c.open(u, 'system box(0, 1)\nstate psi(x) = x < 0.5 ? 1 : 0\n');
    const first = await c.result(u, (q) => q.version === 1);
    expect((first.result.levels as unknown[]).length).toBe(12);
    const seen = c.results.length;
    settings.defaultBasis = 7;
    c.connection.sendNotification('workspace/didChangeConfiguration', { settings: { eigenspan: settings } });
    const again = await c.result(u, (q) => c.results.indexOf(q as (typeof c.results)[number]) >= seen);
    expect((again.result.levels as unknown[]).length).toBe(7);
  });

  it('applies eigenspan.limits to the static stage and the worker, and again when they change', async () => {
    const settings: Record<string, unknown> = { debounceMs: 0, limits: { maxBasis: 20 } };
    const c = await client(settings);
    const u = 'file:///sched/limits.qstate';
    c.open(u, 'system box(0, 1)\nstate psi(x) = sqrt(2) * sin(pi * x)\nbasis 30\n');
    // basis 30 is over the set cap of 20: a limits error on the basis line.
    const capped = await c.diagnostics(u, (q) => codes(q.diagnostics).includes('limits'));
    expect(capped.diagnostics.find((d) => d.code === 'limits')!.range.start.line).toBe(2);
    await c.result(u, (q) => q.version === 1);
    const seen = c.results.length;
    settings.limits = { maxBasis: 40 };
    c.connection.sendNotification('workspace/didChangeConfiguration', { settings: { eigenspan: settings } });
    const again = await c.result(u, (q) => c.results.indexOf(q as (typeof c.results)[number]) >= seen);
    expect((again.result.levels as unknown[]).length).toBe(30);
    const after = await c.diagnostics(u, (q) => !codes(q.diagnostics).includes('limits'));
    expect(codes(after.diagnostics)).not.toContain('limits');
  });
});

describe('pull diagnostics', () => {
  it('serves textDocument/diagnostic when the client advertises pull with refresh', async () => {
    const c = await startClient({
      settings: { debounceMs: 0 },
      capabilities: { workspace: { configuration: true, diagnostics: { refreshSupport: true } }, textDocument: { diagnostic: { dynamicRegistration: false } } },
    });
    clients.push(c);
    const u = 'file:///sched/pull.qstate';
    c.open(u, 'system box(0, 1\nstate psi(x) = x\n');
    const report = await c.connection.sendRequest<{ kind: string; items: { code: string; range: { start: { line: number; character: number } } }[] }>('textDocument/diagnostic', { textDocument: { uri: u } });
    expect(report.kind).toBe('full');
    expect(report.items.map((d) => d.code)).toContain('syntax');
    expect(report.items.find((d) => d.code === 'syntax')!.range.start).toEqual({ line: 0, character: 10 });
    expect(c.publishes.filter((p) => p.uri === u)).toEqual([]);
  });
});

describe('no orphans', () => {
  it('exits when the client closes its end of stdio', async () => {
    const child = spawn(process.execPath, [SERVER, '--stdio'], { stdio: ['pipe', 'pipe', 'pipe'] });
    const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
    const conn = createProtocolConnection(new StreamMessageReader(child.stdout!), new StreamMessageWriter(child.stdin!));
    conn.listen();
    const init = await conn.sendRequest<{ capabilities: { hoverProvider?: boolean } }>('initialize', { processId: process.pid, rootUri: null, capabilities: {} });
    expect(init.capabilities.hoverProvider).toBe(true);
    conn.dispose();
    child.stdin!.end();
    // No shutdown request came first, so the server reports exit code 1 (LSP 3.17, "exit" notification).
    expect(await exited).toBe(1);
  });

  it('speaks node IPC and exits when the channel closes', async () => {
    const child = spawn(process.execPath, [SERVER, '--node-ipc'], { stdio: ['ignore', 'ignore', 'pipe', 'ipc'] });
    const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
    const conn = createProtocolConnection(new IPCMessageReader(child), new IPCMessageWriter(child));
    conn.listen();
    const init = await conn.sendRequest<{ capabilities: { hoverProvider?: boolean } }>('initialize', { processId: process.pid, rootUri: null, capabilities: {} });
    expect(init.capabilities.hoverProvider).toBe(true);
    child.disconnect();
    expect(await exited).toBe(1);
    conn.dispose();
  });
});
