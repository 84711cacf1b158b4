/**
 * VS Code entry point. Glue only: it starts the language client and hands the real `vscode` module to
 * the plain modules that hold the logic (panel, commands, status, trust, formatting).
 */
import * as vscode from 'vscode';
import { CloseAction, ErrorAction, LanguageClient, TransportKind, type LanguageClientOptions, type ServerOptions } from 'vscode-languageclient/node';
import { RESULT_NOTIFICATION } from '../../server/src/protocol';
import { COMMANDS, copyLevels, exportCoefficients, normaliseState } from './commands';
import type { VscodeApi } from './host';
import { PANEL_VIEW_TYPE, plotScaleSetting, SpectrumPanelController } from './panel';
import { RestartPolicy } from './restart';
import { ResultStore } from './results';
import { SweepStore } from './sweeps';
import { sweepFrame } from './sweepFrame';
import { SWEEP_POINT_NOTIFICATION, SWEEP_POINT_RESULT_REQUEST, SWEEP_RESULT_NOTIFICATION } from '../../server/src/lsp/sweepMessages';
import { StatusController } from './status';
import { forwardTrust, initializationOptions } from './trust';

let client: LanguageClient | undefined;

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  const api: VscodeApi = vscode;
  const store = new ResultStore();
  const sweeps = new SweepStore();
  // A running sweep's points carry only values: the document's sweep lines name its axes.
  const frame = (uri: string) => sweepFrame(vscode.workspace.textDocuments.find((d) => d.uri.toString() === uri)?.getText() ?? '', store.get(uri)?.result.values);
  const module = context.asAbsolutePath('dist/server.js');
  const serverOptions: ServerOptions = {
    run: { module, transport: TransportKind.ipc },
    debug: { module, transport: TransportKind.ipc, options: { execArgv: ['--nolazy', '--inspect=6011'] } },
  };
  const policy = new RestartPolicy();
  const clientOptions: LanguageClientOptions = {
    documentSelector: [{ language: 'qstate' }],
    synchronize: { configurationSection: 'eigenspan' },
    initializationOptions: initializationOptions(api),
    errorHandler: {
      error: () => ({ action: ErrorAction.Continue }),
      closed: () =>
        policy.shouldRestart(Date.now())
          ? { action: CloseAction.Restart }
          : { action: CloseAction.DoNotRestart, message: 'The Eigenspan language server stopped five times in three minutes and will not be restarted. Reload the window to try again.' },
    },
  };
  client = new LanguageClient('eigenspan', 'Eigenspan', serverOptions, clientOptions);
  const config = () => vscode.workspace.getConfiguration('eigenspan');
  const panel = new SpectrumPanelController({
    api,
    extensionUri: context.extensionUri,
    store,
    plotScale: () => plotScaleSetting(config().inspect('plotScale')),
    trusted: () => vscode.workspace.isTrusted,
    sweeps,
    pointResult: (uri, at) => client?.sendRequest(SWEEP_POINT_RESULT_REQUEST, { textDocument: { uri }, at }) ?? Promise.resolve(null),
  });
  const status = new StatusController(api, store, COMMANDS.showPanel);
  context.subscriptions.push(
    client.onNotification(RESULT_NOTIFICATION, (params: unknown) => void store.set(params)),
    client.onNotification(SWEEP_POINT_NOTIFICATION, (params: unknown) => void sweeps.point(params, frame)),
    client.onNotification(SWEEP_RESULT_NOTIFICATION, (params: unknown) => void sweeps.result(params)),
    vscode.window.registerWebviewPanelSerializer(PANEL_VIEW_TYPE, { deserializeWebviewPanel: async (p) => panel.restore(p) }),
    vscode.commands.registerCommand(COMMANDS.showPanel, () => panel.show()),
    vscode.commands.registerCommand(COMMANDS.exportCoefficients, () => exportCoefficients(api, store)),
    vscode.commands.registerCommand(COMMANDS.copyLevels, () => copyLevels(api, store)),
    vscode.commands.registerCommand(COMMANDS.normaliseState, () => normaliseState(api)),
    vscode.window.onDidChangeActiveTextEditor((ed) => (panel.follow(ed), status.update())),
    vscode.window.onDidChangeActiveColorTheme((t) => panel.theme(t.kind)),
    vscode.workspace.onDidChangeConfiguration((e) => e.affectsConfiguration('eigenspan.plotScale') && panel.settings()),
    forwardTrust(api, (method, params) => client?.sendNotification(method, params), () => panel.push()),
    panel,
    status,
  );
  await client.start();
}

export function deactivate(): Thenable<void> | undefined {
  return client?.stop();
}
