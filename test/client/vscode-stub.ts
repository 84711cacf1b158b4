/**
 * A small stand-in for the parts of the `vscode` module the client uses (see client/src/host.ts).
 * It records what the code under test does and lets a test script the user's answers.
 */
import { posix } from 'node:path';
import type { VscodeApi } from '../../client/src/host';

type Listener<T> = (v: T) => unknown;

/** A minimal event emitter with the `vscode.Event` call shape. */
export class Emitter<T> {
  private readonly ls = new Set<Listener<T>>();
  readonly event = (l: Listener<T>) => {
    this.ls.add(l);
    return { dispose: () => this.ls.delete(l) };
  };
  fire(v: T): void {
    for (const l of [...this.ls]) l(v);
  }
  get count(): number {
    return this.ls.size;
  }
}

/** URIs with a scheme and a POSIX path; joinPath normalises `..` as VS Code's does. */
export class FakeUri {
  constructor(readonly scheme: string, readonly path: string, readonly authority = '') {}
  static file(p: string): FakeUri {
    return new FakeUri('file', posix.normalize(p));
  }
  static parse(s: string): FakeUri {
    const m = /^([a-z][\w+.-]*):\/\/[^/]*(\/.*)?$/i.exec(s);
    const a = /^[a-z][\w+.-]*:\/\/([^/]*)/i.exec(s)?.[1] ?? '';
    return m ? new FakeUri(m[1]!, m[2] ?? '/', a) : new FakeUri('file', s);
  }
  static joinPath(base: FakeUri, ...segs: string[]): FakeUri {
    return new FakeUri(base.scheme, posix.join(base.path, ...segs), base.authority);
  }
  get fsPath(): string {
    return this.path;
  }
  toString(): string {
    return `${this.scheme}://${this.authority}${this.path}`;
  }
}

export class FakePosition {
  constructor(readonly line: number, readonly character: number) {}
}

export class FakeRange {
  readonly start: FakePosition;
  readonly end: FakePosition;
  constructor(a: number, b: number, c: number, d: number) {
    this.start = new FakePosition(a, b);
    this.end = new FakePosition(c, d);
  }
}

export class FakeSelection extends FakeRange {}

/** A text document with offsets turned into positions the usual way. */
export function makeDocument(path: string, text: string, languageId = 'qstate') {
  const starts = [0];
  for (let i = 0; i < text.length; i++) if (text[i] === '\n') starts.push(i + 1);
  return {
    uri: FakeUri.file(path),
    languageId,
    lineCount: starts.length,
    getText: () => text,
    positionAt(offset: number) {
      let line = 0;
      while (line + 1 < starts.length && starts[line + 1]! <= offset) line++;
      return new FakePosition(line, offset - starts[line]!);
    },
  };
}

export type FakeDocument = ReturnType<typeof makeDocument>;

/** A webview panel that records the messages posted to it. */
export class FakePanel {
  readonly posted: unknown[] = [];
  readonly received = new Emitter<unknown>();
  readonly disposed = new Emitter<void>();
  revealed = 0;
  isDisposed = false;
  readonly webview: {
    html: string;
    options: unknown;
    cspSource: string;
    postMessage: (m: unknown) => Promise<boolean>;
    asWebviewUri: (u: FakeUri) => FakeUri;
    onDidReceiveMessage: Emitter<unknown>['event'];
  };
  constructor(readonly viewType: string, readonly title: string, readonly showOptions: unknown, options: unknown) {
    this.webview = {
      html: '',
      options,
      cspSource: 'https://webview.test',
      postMessage: async (m) => (this.posted.push(JSON.parse(JSON.stringify(m))), true),
      asWebviewUri: (u) => new FakeUri('https', u.path, 'webview.test'),
      onDidReceiveMessage: this.received.event,
    };
  }
  readonly onDidDispose = this.disposed.event;
  reveal(): void {
    this.revealed++;
  }
  dispose(): void {
    if (this.isDisposed) return;
    this.isDisposed = true;
    this.disposed.fire();
  }
  /** The messages of one type posted so far. */
  ofType(type: string): Record<string, unknown>[] {
    return this.posted.filter((m) => (m as { type: string }).type === type) as Record<string, unknown>[];
  }
}

/** Builds a fresh stand-in; the returned `api` is what the client modules receive. */
export function makeVscode() {
  const activeEditorChanged = new Emitter<unknown>();
  const themeChanged = new Emitter<{ kind: number }>();
  const trustGranted = new Emitter<void>();
  const configChanged = new Emitter<{ affectsConfiguration(s: string): boolean }>();
  const files = new Map<string, Uint8Array>();
  const panels: FakePanel[] = [];
  const info: string[] = [];
  const warnings: { message: string; options: unknown; items: string[] }[] = [];
  const errors: string[] = [];
  const shown: { doc: FakeDocument; options: unknown }[] = [];
  const edits: unknown[] = [];
  const executed: { command: string; args: unknown[] }[] = [];
  const commandHandlers = new Map<string, (...args: unknown[]) => unknown>();
  const diagnostics = new Map<string, unknown[]>();
  const statusItems: Record<string, unknown>[] = [];
  const serializers = new Map<string, unknown>();
  const config: Record<string, unknown> = { plotScale: 'linear', debounceMs: 100, timeBudgetMs: 2000, defaultBasis: 40 };
  const answers = {
    save: [] as (FakeUri | undefined)[],
    quickPick: [] as (string | undefined)[],
    warning: [] as (string | undefined)[],
  };
  let clipboard = '';
  const state = {
    activeTextEditor: undefined as { document: FakeDocument } | undefined,
    isTrusted: true,
    themeKind: 2,
    textDocuments: [] as FakeDocument[],
  };

  const window = {
    createWebviewPanel: (viewType: string, title: string, showOptions: unknown, options: unknown) => {
      const p = new FakePanel(viewType, title, showOptions, options);
      panels.push(p);
      return p;
    },
    showSaveDialog: async (options: unknown) => {
      void options;
      return answers.save.shift();
    },
    showQuickPick: async (items: { label: string }[]) => {
      const want = answers.quickPick.shift();
      return items.find((i) => i.label === want);
    },
    showWarningMessage: async (message: string, options: unknown, ...items: string[]) => {
      warnings.push({ message, options, items });
      return answers.warning.shift();
    },
    showInformationMessage: async (m: string) => void info.push(m),
    showErrorMessage: async (m: string) => void errors.push(m),
    createStatusBarItem: (id: string, alignment: number, priority: number) => {
      const item: Record<string, unknown> = { id, alignment, priority, text: '', visible: false };
      item.show = () => (item.visible = true);
      item.hide = () => (item.visible = false);
      item.dispose = () => (item.disposed = true);
      statusItems.push(item);
      return item;
    },
    get activeTextEditor() {
      return state.activeTextEditor;
    },
    onDidChangeActiveTextEditor: activeEditorChanged.event,
    showTextDocument: async (doc: FakeDocument, options: unknown) => void shown.push({ doc, options }),
    get activeColorTheme() {
      return { kind: state.themeKind };
    },
    onDidChangeActiveColorTheme: themeChanged.event,
    registerWebviewPanelSerializer: (viewType: string, s: unknown) => {
      serializers.set(viewType, s);
      return { dispose: () => serializers.delete(viewType) };
    },
  };

  const workspace = {
    get isTrusted() {
      return state.isTrusted;
    },
    onDidGrantWorkspaceTrust: trustGranted.event,
    getConfiguration: () => ({ get: (k: string) => config[k], inspect: (k: string) => (k in config ? { key: k, globalValue: config[k] } : undefined) }),
    onDidChangeConfiguration: configChanged.event,
    fs: {
      stat: async (u: FakeUri) => {
        if (!files.has(u.toString())) throw new Error(`no such file ${u.path}`);
        return { type: 1, size: files.get(u.toString())!.length };
      },
      writeFile: async (u: FakeUri, data: Uint8Array) => void files.set(u.toString(), data),
      readFile: async (u: FakeUri) => files.get(u.toString())!,
    },
    applyEdit: async (e: unknown) => (edits.push(e), true),
    get textDocuments() {
      return state.textDocuments;
    },
  };

  const api = {
    window,
    workspace,
    commands: {
      executeCommand: async (command: string, ...args: unknown[]) => {
        executed.push({ command, args });
        return commandHandlers.get(command)?.(...args);
      },
      registerCommand: (command: string, fn: (...a: unknown[]) => unknown) => {
        commandHandlers.set(command, fn);
        return { dispose: () => commandHandlers.delete(command) };
      },
    },
    env: { clipboard: { writeText: async (t: string) => void (clipboard = t), readText: async () => clipboard } },
    languages: { getDiagnostics: (u: FakeUri) => diagnostics.get(u.toString()) ?? [] },
    Uri: FakeUri,
    Range: FakeRange,
    Selection: FakeSelection,
    ViewColumn: { Active: -1, Beside: -2, One: 1, Two: 2 },
    StatusBarAlignment: { Left: 1, Right: 2 },
    ColorThemeKind: { Light: 1, Dark: 2, HighContrast: 3, HighContrastLight: 4 },
    TextEditorRevealType: { Default: 0, InCenter: 1 },
  } as unknown as VscodeApi;

  /** Makes `doc` the active editor's document and fires the change event. */
  function openEditor(doc: FakeDocument): void {
    if (!state.textDocuments.includes(doc)) state.textDocuments.push(doc);
    state.activeTextEditor = { document: doc };
    activeEditorChanged.fire(state.activeTextEditor);
  }

  return {
    api,
    state,
    config,
    answers,
    files,
    panels,
    info,
    warnings,
    errors,
    shown,
    edits,
    executed,
    commandHandlers,
    diagnostics,
    statusItems,
    serializers,
    clipboard: () => clipboard,
    openEditor,
    fire: { activeEditorChanged, themeChanged, trustGranted, configChanged },
  };
}
