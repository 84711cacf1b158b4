/**
 * The spectrum panel's lifecycle on the extension side: one webview panel beside the editor that
 * follows the active `.qstate` file, gets each new result, survives reloads (through a serializer)
 * and saves the plots it exports.
 */
import type * as vscode from 'vscode';
import type { HostMessage } from './messages';
import { parsePanelMessage } from './messages';
import { buildPanelHtml, makeNonce } from './panelHtml';
import { baseName, LANGUAGE_ID, stem, type VscodeApi } from './host';
import type { ResultStore } from './results';
import type { SweepStore } from './sweeps';
import { isPanelResult } from './messages';
import { dataUrlBytes, saveWithDialog, type SaveOutcome } from './save';

/** The webview panel type, also named in package.json's activation events. */
export const PANEL_VIEW_TYPE = 'eigenspan.spectrum';

/** What the panel controller needs. */
export interface PanelDeps {
  api: VscodeApi;
  /** The extension's install folder. */
  extensionUri: vscode.Uri;
  store: ResultStore;
  /** Current `eigenspan.plotScale` setting, 'auto' when the user has not set it (see `plotScaleSetting`). */
  plotScale: () => 'linear' | 'log' | 'auto';
  /** Whether expressions may be evaluated (workspace trust). */
  trusted: () => boolean;
  /** Nonce source (default `makeNonce`). */
  nonce?: () => string;
  /** The documents' sweeps, forwarded to the panel's sweep view (none: the view gets no sweep). */
  sweeps?: SweepStore;
  /** Asks the server for one sweep point's full result (`eigenspan/sweepPointResult`), for the state view. */
  pointResult?: (uri: string, at: number[]) => Promise<unknown>;
}

/** Maps VS Code's colour theme kind (1 light, 2 dark, 3 high contrast, 4 high contrast light) to the panel's. */
export function themeKindName(kind: number): 'light' | 'dark' | 'high-contrast' | 'high-contrast-light' {
  return kind === 1 ? 'light' : kind === 3 ? 'high-contrast' : kind === 4 ? 'high-contrast-light' : 'dark';
}

/** What `inspect('plotScale')` of the `eigenspan` configuration tells (VS Code's WorkspaceConfiguration). */
interface ScaleInspection {
  globalValue?: unknown;
  workspaceValue?: unknown;
  workspaceFolderValue?: unknown;
}

/** The scale the user set for the spectrum, most specific scope first, or 'auto' when none is set. */
export function plotScaleSetting(inspected: ScaleInspection | undefined): 'linear' | 'log' | 'auto' {
  for (const v of [inspected?.workspaceFolderValue, inspected?.workspaceValue, inspected?.globalValue]) if (v === 'linear' || v === 'log') return v;
  return 'auto';
}

/** Owns at most one spectrum panel. */
export class SpectrumPanelController {
  private panel: vscode.WebviewPanel | undefined;
  private ready = false;
  private uri: string | undefined;
  private readonly disposables: { dispose(): unknown }[] = [];
  /** The outcome of the last export, for tests and for the status message. */
  lastExport: SaveOutcome | undefined;

  constructor(private readonly deps: PanelDeps) {
    this.disposables.push({ dispose: deps.store.onChange((u) => u === this.uri && this.push()) });
    if (deps.sweeps) this.disposables.push({ dispose: deps.sweeps.onMessage((u, m) => u === this.uri && this.deps.trusted() && this.post(m)) });
  }

  /** The folder the webview may load from: dist/webview and nothing else. */
  private webviewRoot(): vscode.Uri {
    return this.deps.api.Uri.joinPath(this.deps.extensionUri, 'dist', 'webview');
  }

  /** Options every panel gets, new or restored. */
  webviewOptions(): vscode.WebviewOptions & vscode.WebviewPanelOptions {
    return { enableScripts: true, localResourceRoots: [this.webviewRoot()], enableCommandUris: false };
  }

  /** Opens the panel beside the active editor, or reveals it. */
  show(): void {
    const { api } = this.deps;
    this.follow(api.window.activeTextEditor);
    if (this.panel) {
      this.panel.reveal(api.ViewColumn.Beside, true);
      return;
    }
    const panel = api.window.createWebviewPanel(PANEL_VIEW_TYPE, 'Spectrum', { viewColumn: api.ViewColumn.Beside, preserveFocus: true }, this.webviewOptions());
    this.attach(panel);
  }

  /** Adopts a panel VS Code restored after a reload (see the serializer in extension.ts). */
  restore(panel: vscode.WebviewPanel): void {
    if (this.panel && this.panel !== panel) this.panel.dispose();
    panel.webview.options = this.webviewOptions();
    this.follow(this.deps.api.window.activeTextEditor);
    this.attach(panel);
  }

  get isOpen(): boolean {
    return this.panel !== undefined;
  }

  /** The document the panel is showing. */
  get currentUri(): string | undefined {
    return this.uri;
  }

  private attach(panel: vscode.WebviewPanel): void {
    this.panel = panel;
    this.ready = false;
    const base = panel.webview.asWebviewUri(this.webviewRoot()).toString();
    panel.webview.html = buildPanelHtml({ webviewBase: base, nonce: (this.deps.nonce ?? makeNonce)() });
    const subs = [
      panel.webview.onDidReceiveMessage((m: unknown) => void this.receive(m)),
      panel.onDidDispose(() => {
        for (const s of subs) s.dispose();
        if (this.panel === panel) ((this.panel = undefined), (this.ready = false));
      }),
    ];
  }

  /** Follows an editor if it shows a `.qstate` file; other editors leave the panel as it is. */
  follow(editor: vscode.TextEditor | undefined): void {
    if (!editor || editor.document.languageId !== LANGUAGE_ID) return;
    const uri = editor.document.uri.toString();
    if (uri === this.uri) return;
    this.uri = uri;
    this.push();
  }

  /** Tells the panel the theme changed. */
  theme(kind: number): void {
    this.post({ type: 'theme', kind: themeKindName(kind) });
  }

  /** Sends the settings the panel uses. */
  settings(): void {
    this.post({ type: 'settings', plotScale: this.deps.plotScale() });
  }

  private post(msg: HostMessage): void {
    if (this.panel && this.ready) void this.panel.webview.postMessage(msg);
  }

  private document(uri: string): vscode.TextDocument | undefined {
    return this.deps.api.workspace.textDocuments.find((d) => d.uri.toString() === uri);
  }

  /** Sends the current document's latest result, or says why there is none. */
  push(): void {
    if (!this.panel || !this.ready) return;
    if (!this.uri) return this.post({ type: 'empty', reason: 'Open a .qstate file to see its spectrum.' });
    const doc = this.document(this.uri);
    const name = doc ? baseName(doc.uri) : this.uri.slice(this.uri.lastIndexOf('/') + 1);
    if (!this.deps.trusted()) {
      return this.post({ type: 'empty', reason: `${name}: this workspace is not trusted, so states and potentials are not evaluated. Trust the workspace to see the spectrum.` });
    }
    const stored = this.deps.store.get(this.uri);
    if (!stored) return this.post({ type: 'empty', reason: `Waiting for the first analysis of ${name}…` });
    const lines = doc ? stored.result.diagnostics.map((d) => doc.positionAt(d.start).line) : undefined;
    this.post({ type: 'result', uri: stored.uri, version: stored.version, fileName: name, result: stored.result, ...(lines ? { diagnosticLines: lines } : {}) });
    const sweep = this.deps.sweeps?.snapshot(this.uri);
    if (sweep) this.post(sweep);
  }

  /** Asks for a sweep point's full result and hands it to the panel's state view (or says why there is none). */
  private async pick(at: number[]): Promise<void> {
    const uri = this.uri;
    if (!uri || !this.deps.pointResult || !this.deps.trusted()) return;
    let answer: unknown = null;
    let reason: string | null = null;
    try {
      answer = await this.deps.pointResult(uri, at);
    } catch (e) {
      reason = `the language server could not analyse it (${e instanceof Error ? e.message : String(e)})`;
    }
    if (answer !== null && !isPanelResult(answer)) ((answer = null), (reason = 'the language server sent a result the panel cannot read'));
    if (answer === null) reason ??= 'the point is no longer on the sweep, or its analysis did not finish within the time budget';
    if (uri === this.uri) this.post({ type: 'pointResult', uri, at, result: answer as Extract<HostMessage, { type: 'pointResult' }>['result'], reason });
  }

  /** Handles one message from the panel; malformed ones are dropped. */
  async receive(raw: unknown): Promise<void> {
    const msg = parsePanelMessage(raw);
    if (!msg) return;
    const { api } = this.deps;
    switch (msg.type) {
      case 'ready':
        this.ready = true;
        this.settings();
        this.theme(api.window.activeColorTheme.kind);
        this.push();
        return;
      case 'reveal': {
        const doc = this.uri ? this.document(this.uri) : undefined;
        if (!doc || msg.line >= doc.lineCount) return;
        const pos = new api.Selection(msg.line, 0, msg.line, 0);
        await api.window.showTextDocument(doc, { selection: pos, viewColumn: api.ViewColumn.One, preserveFocus: false });
        return;
      }
      case 'export': {
        const doc = this.uri ? this.document(this.uri) : undefined;
        const name = `${doc ? stem(doc.uri) : 'spectrum'}-${msg.view}.${msg.format}`;
        const near = doc ? api.Uri.joinPath(doc.uri, '..', name) : api.Uri.joinPath(this.deps.extensionUri, name);
        const data = msg.format === 'png' ? dataUrlBytes(msg.data) : new TextEncoder().encode(msg.data);
        const filters: Record<string, string[]> = msg.format === 'png' ? { 'PNG image': ['png'] } : { 'SVG drawing': ['svg'] };
        this.lastExport = await saveWithDialog(api, { defaultUri: near, filters, data, saveLabel: 'Save plot' });
        if (this.lastExport.kind === 'failed') void api.window.showErrorMessage(`Could not save the plot: ${this.lastExport.message}`);
        return;
      }
      case 'pickPoint':
        return this.pick(msg.at);
    }
  }

  dispose(): void {
    this.panel?.dispose();
    for (const d of this.disposables) d.dispose();
  }
}
