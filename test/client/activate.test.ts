/**
 * Activation wiring: bundles client/src/extension.ts as the build does, but with `vscode` bound to the
 * stand-in and `vscode-languageclient/node` bound to a recording fake, then activates it.
 */
import { describe, it, expect, beforeAll } from 'vitest';
import { build } from 'esbuild';
import { createRequire } from 'node:module';
import { makeVscode, makeDocument, FakeUri } from './vscode-stub';
import { parabolaResult } from './fixtures';

/** Records what the extension does with its language client. */
class FakeLanguageClient {
  static last: FakeLanguageClient | undefined;
  readonly handlers = new Map<string, (p: unknown) => void>();
  readonly sent: [string, unknown][] = [];
  started = false;
  stopped = false;
  constructor(readonly id: string, readonly name: string, readonly serverOptions: Record<string, { module: string; transport: number }>, readonly clientOptions: Record<string, unknown>) {
    FakeLanguageClient.last = this;
  }
  onNotification(method: string, h: (p: unknown) => void) {
    this.handlers.set(method, h);
    return { dispose: () => this.handlers.delete(method) };
  }
  sendNotification(method: string, params: unknown) {
    this.sent.push([method, params]);
    return Promise.resolve();
  }
  async start() {
    this.started = true;
  }
  async stop() {
    this.stopped = true;
  }
}

const LC = { LanguageClient: FakeLanguageClient, TransportKind: { stdio: 0, ipc: 1 }, ErrorAction: { Continue: 1, Shutdown: 2 }, CloseAction: { DoNotRestart: 1, Restart: 2 } };

const VSCODE_KEYS = ['window', 'workspace', 'commands', 'env', 'languages', 'Uri', 'Range', 'Selection', 'ViewColumn', 'StatusBarAlignment', 'ColorThemeKind', 'TextEditorRevealType'];

let extension: { activate(ctx: unknown): Promise<void>; deactivate(): unknown };

beforeAll(async () => {
  const out = await build({
    entryPoints: ['client/src/extension.ts'],
    bundle: true,
    platform: 'node',
    format: 'cjs',
    write: false,
    logLevel: 'silent',
    plugins: [
      {
        name: 'stand-ins',
        setup(b) {
          b.onResolve({ filter: /^vscode$|^vscode-languageclient\/node$/ }, (a) => ({ path: a.path, namespace: 'stand-in' }));
          b.onLoad({ filter: /.*/, namespace: 'stand-in' }, (a) => ({
            // Getters, so each test's fresh stand-in is seen through the same bundled module.
            contents: `for (const n of ${JSON.stringify(a.path === 'vscode' ? VSCODE_KEYS : Object.keys(LC))}) Object.defineProperty(exports, n, { enumerable: true, get: () => globalThis.${a.path === 'vscode' ? '__eigenspanVscode' : '__eigenspanLanguageClient'}[n] });`,
            loader: 'js',
          }));
        },
      },
    ],
  });
  const mod = { exports: {} as typeof extension };
  new Function('module', 'exports', 'require', out.outputFiles[0]!.text)(mod, mod.exports, createRequire(import.meta.url));
  extension = mod.exports;
});

async function activate(trusted: boolean) {
  const vs = makeVscode();
  vs.state.isTrusted = trusted;
  (globalThis as Record<string, unknown>).__eigenspanVscode = vs.api;
  (globalThis as Record<string, unknown>).__eigenspanLanguageClient = LC;
  const context = { subscriptions: [] as { dispose(): unknown }[], extensionUri: FakeUri.file('/ext'), asAbsolutePath: (p: string) => `/ext/${p}` };
  await extension.activate(context);
  return { vs, context, client: FakeLanguageClient.last! };
}

describe('extension activation', () => {
  it('starts dist/server.js over node IPC with trust-aware initialization options and settings sync', async () => {
    const { client, context } = await activate(false);
    expect(client.started).toBe(true);
    expect(client.serverOptions.run).toEqual({ module: '/ext/dist/server.js', transport: 1 });
    expect(client.clientOptions.documentSelector).toEqual([{ language: 'qstate' }]);
    expect(client.clientOptions.initializationOptions).toEqual({ evaluate: false, panel: true });
    expect(client.clientOptions.synchronize).toEqual({ configurationSection: 'eigenspan' });
    expect(context.subscriptions.length).toBeGreaterThan(8);
  });

  it('restarts a dead server five times, then gives up with a message', async () => {
    const { client } = await activate(true);
    const handler = client.clientOptions.errorHandler as { closed(): { action: number; message?: string }; error(): { action: number } };
    expect(handler.error().action).toBe(LC.ErrorAction.Continue);
    const actions = Array.from({ length: 6 }, () => handler.closed());
    expect(actions.slice(0, 5).every((a) => a.action === LC.CloseAction.Restart)).toBe(true);
    expect(actions[5]!.action).toBe(LC.CloseAction.DoNotRestart);
    expect(actions[5]!.message).toMatch(/will not be restarted/);
  });

  it('registers the commands and the panel serializer, and feeds results to the status bar', async () => {
    const { vs, client } = await activate(true);
    expect([...vs.commandHandlers.keys()].sort()).toEqual(['eigenspan.copyLevels', 'eigenspan.exportCoefficients', 'eigenspan.normaliseState', 'eigenspan.showPanel']);
    expect([...vs.serializers.keys()]).toEqual(['eigenspan.spectrum']);
    const doc = makeDocument('/ws/p.qstate', 'system box(0, 1)\n');
    vs.openEditor(doc);
    client.handlers.get('eigenspan/result')!({ uri: doc.uri.toString(), version: 1, result: parabolaResult(5) });
    expect(vs.statusItems[0]!.text).toMatch(/^\$\(graph\) ⟨E⟩ 5 · /);
    await vs.commandHandlers.get('eigenspan.showPanel')!();
    expect(vs.panels).toHaveLength(1);
  });

  it('tells the server when the workspace becomes trusted, without a reload', async () => {
    const { vs, client } = await activate(false);
    expect(client.sent).toEqual([]);
    vs.fire.trustGranted.fire();
    expect(client.sent).toEqual([['eigenspan/setTrust', { trusted: true }]]);
    await extension.deactivate();
    expect(client.stopped).toBe(true);
  });
});
