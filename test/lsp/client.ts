/**
 * A real LSP client for the tests: spawns the BUILT server (`node dist/server.js --stdio`, or the test
 * build dist/test/server.js for tests that use the worker's test hooks) and talks
 * to it over the child's stdio with `vscode-languageserver-protocol/node`. Notifications are waited for
 * with promises, never with fixed sleeps.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import {
  createProtocolConnection,
  StreamMessageReader,
  StreamMessageWriter,
  type ClientCapabilities,
  type Diagnostic,
  type ProtocolConnection,
  type PublishDiagnosticsParams,
} from 'vscode-languageserver-protocol/node';

/** The built server; `EIGENSPAN_SERVER` may point elsewhere. */
export const SERVER = resolve(process.env.EIGENSPAN_SERVER ?? 'dist/server.js');
/** The test build of the server (scripts/build.mjs), whose worker honours the test hooks; `EIGENSPAN_TEST_SERVER` may point elsewhere. */
export const TEST_SERVER = resolve(process.env.EIGENSPAN_TEST_SERVER ?? 'dist/test/server.js');

/** Client capabilities of a capable editor (push diagnostics, snippets, prepare rename, inlay hints). */
export const CAPABILITIES: ClientCapabilities = {
  workspace: { configuration: true, didChangeConfiguration: { dynamicRegistration: false }, codeLens: { refreshSupport: false } },
  textDocument: {
    synchronization: { dynamicRegistration: false },
    publishDiagnostics: { versionSupport: true, relatedInformation: false },
    hover: { contentFormat: ['markdown', 'plaintext'] },
    completion: { completionItem: { snippetSupport: true } },
    signatureHelp: { signatureInformation: { parameterInformation: { labelOffsetSupport: true } } },
    codeAction: { codeActionLiteralSupport: { codeActionKind: { valueSet: ['quickfix'] } } },
    rename: { prepareSupport: true },
    inlayHint: {},
    documentSymbol: { hierarchicalDocumentSymbolSupport: true },
  },
};

/** Options of `startClient`. */
export interface ClientOptions {
  capabilities?: ClientCapabilities;
  initializationOptions?: Record<string, unknown>;
  /** What the client answers to `workspace/configuration` for section `eigenspan`. */
  settings?: Record<string, unknown>;
  /** Run the test build with its hooks on (`# eigenspan-test: ...`); default: the shipped build. */
  hooks?: boolean;
  /** Extra environment. */
  env?: Record<string, string>;
  /** Working folder of the server process (default: the test's). */
  cwd?: string;
}

/** A connected client. */
export interface TestClient {
  child: ChildProcess;
  connection: ProtocolConnection;
  /** Every publish received, in order. */
  publishes: PublishDiagnosticsParams[];
  /** Every `eigenspan/result` received, in order. */
  results: { uri: string; version: number; result: Record<string, unknown> }[];
  /** Server log lines (window/logMessage). */
  logs: string[];
  /** Resolves with the first publish for `uri` (already received or future) that satisfies `accept`. */
  diagnostics(uri: string, accept?: (p: PublishDiagnosticsParams) => boolean, timeoutMs?: number): Promise<PublishDiagnosticsParams>;
  /** Resolves with the first `eigenspan/result` for `uri` satisfying `accept`. */
  result(uri: string, accept?: (r: { version: number }) => boolean, timeoutMs?: number): Promise<{ uri: string; version: number; result: Record<string, unknown> }>;
  /** Resolves with the first log line matching `re`. */
  log(re: RegExp, timeoutMs?: number): Promise<string>;
  open(uri: string, text: string, version?: number): void;
  change(uri: string, version: number, text: string): void;
  close(uri: string): void;
  /** Resolves when the server process has exited. */
  exited: Promise<number | null>;
  stop(): Promise<void>;
}

type Waiter<T> = { accept: (v: T) => boolean; resolve: (v: T) => void };

function waitFor<T>(seen: T[], waiters: Set<Waiter<T>>, accept: (v: T) => boolean, timeoutMs: number, what: string): Promise<T> {
  const hit = seen.find(accept);
  if (hit) return Promise.resolve(hit);
  return new Promise((resolveP, reject) => {
    const w: Waiter<T> = {
      accept,
      resolve: (v) => {
        clearTimeout(timer);
        resolveP(v);
      },
    };
    // A guard against hanging forever, not a sleep: the test fails with a message.
    const timer = setTimeout(() => {
      waiters.delete(w);
      reject(new Error(`timed out waiting for ${what}`));
    }, timeoutMs);
    waiters.add(w);
  });
}

function deliver<T>(v: T, waiters: Set<Waiter<T>>): void {
  for (const w of [...waiters]) {
    if (w.accept(v)) {
      waiters.delete(w);
      w.resolve(v);
    }
  }
}

/** Spawns the server, initializes it and returns a client. */
export async function startClient(options: ClientOptions = {}): Promise<TestClient> {
  const server = options.hooks ? TEST_SERVER : SERVER;
  if (!existsSync(server)) throw new Error(`${server} is missing: run npm run build first`);
  const child = spawn(process.execPath, [server, '--stdio'], {
    stdio: ['pipe', 'pipe', 'pipe'],
    cwd: options.cwd,
    env: { ...process.env, EIGENSPAN_TEST_HOOKS: options.hooks ? '1' : '0', ...(options.env ?? {}) },
  });
  const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
  // A server that is gone makes writes fail; the tests look at exit codes instead.
  child.stdin!.on('error', () => undefined);
  const connection = createProtocolConnection(new StreamMessageReader(child.stdout!), new StreamMessageWriter(child.stdin!));
  const publishes: PublishDiagnosticsParams[] = [];
  const results: TestClient['results'] = [];
  const logs: string[] = [];
  const pw = new Set<Waiter<PublishDiagnosticsParams>>();
  const rw = new Set<Waiter<TestClient['results'][number]>>();
  const lw = new Set<Waiter<string>>();
  connection.onNotification('textDocument/publishDiagnostics', (p: PublishDiagnosticsParams) => {
    publishes.push(p);
    deliver(p, pw);
  });
  connection.onNotification('eigenspan/result', (p: TestClient['results'][number]) => {
    results.push(p);
    deliver(p, rw);
  });
  connection.onNotification('window/logMessage', (p: { message: string }) => {
    logs.push(p.message);
    deliver(p.message, lw);
  });
  connection.onRequest('workspace/configuration', (p: { items: { section?: string }[] }) => p.items.map((i) => (i.section === 'eigenspan' ? (options.settings ?? {}) : null)));
  connection.onRequest('client/registerCapability', () => null);
  connection.onRequest('workspace/codeLens/refresh', () => null);
  connection.onRequest('workspace/inlayHint/refresh', () => null);
  connection.onRequest('workspace/diagnostic/refresh', () => null);
  connection.listen();
  await connection.sendRequest('initialize', {
    processId: process.pid,
    rootUri: null,
    capabilities: options.capabilities ?? CAPABILITIES,
    // The tests follow the full analysis through eigenspan/result, which a client must ask for.
    initializationOptions: { results: true, ...(options.initializationOptions ?? {}) },
  });
  connection.sendNotification('initialized', {});
  const client: TestClient = {
    child,
    connection,
    publishes,
    results,
    logs,
    exited,
    diagnostics: (uri, accept = () => true, timeoutMs = 15_000) => waitFor(publishes, pw, (p) => p.uri === uri && accept(p), timeoutMs, `diagnostics for ${uri}`),
    result: (uri, accept = () => true, timeoutMs = 15_000) => waitFor(results, rw, (p) => p.uri === uri && accept(p), timeoutMs, `eigenspan/result for ${uri}`),
    log: (re, timeoutMs = 15_000) => waitFor(logs, lw, (l) => re.test(l), timeoutMs, `a log line matching ${re}`),
    open: (uri, text, version = 1) => connection.sendNotification('textDocument/didOpen', { textDocument: { uri, languageId: 'qstate', version, text } }),
    change: (uri, version, text) => connection.sendNotification('textDocument/didChange', { textDocument: { uri, version }, contentChanges: [{ text }] }),
    close: (uri) => connection.sendNotification('textDocument/didClose', { textDocument: { uri } }),
    stop: async () => {
      if (child.exitCode === null && !child.stdin!.writableEnded) {
        try {
          await Promise.race([connection.sendRequest('shutdown'), exited]);
          connection.sendNotification('exit');
        } catch {
          // The server may already be gone.
        }
      }
      const timer = setTimeout(() => child.kill('SIGKILL'), 3000);
      await exited;
      clearTimeout(timer);
      connection.dispose();
    },
  };
  return client;
}

/** The codes of a publish, in order. */
export function codes(list: Diagnostic[]): string[] {
  return list.map((d) => String(d.code));
}

/** Applies LSP text edits (non-overlapping, any order) to `text`. */
export function applyEdits(text: string, edits: { range: { start: { line: number; character: number }; end: { line: number; character: number } }; newText: string }[]): string {
  const starts = [0];
  for (let i = 0; i < text.length; i++) if (text[i] === '\n') starts.push(i + 1);
  const off = (p: { line: number; character: number }): number => Math.min((starts[p.line] ?? text.length) + p.character, text.length);
  const sorted = [...edits].sort((a, b) => off(b.range.start) - off(a.range.start));
  let out = text;
  for (const e of sorted) out = out.slice(0, off(e.range.start)) + e.newText + out.slice(off(e.range.end));
  return out;
}
