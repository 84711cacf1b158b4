/**
 * The session's configuration: what the client can do (its capabilities and initialization options),
 * whether expressions may be evaluated (workspace trust), push or pull diagnostics, and the user's
 * settings as read through `workspace/configuration`. One object, read by the document store and the
 * handlers; it changes only on `initialize`, a settings change and `eigenspan/setTrust`.
 */
import {
  CodeActionKind,
  TextDocumentSyncKind,
  type ClientCapabilities,
  type Connection,
  type InitializeParams,
  type InitializeResult,
} from 'vscode-languageserver';
import type { ServerInitializationOptions } from '../protocol';
import { DEFAULT_SETTINGS, readSettings, type Settings } from './settings';

/** How long the client may take to answer `workspace/configuration` before the defaults apply. */
const SETTINGS_ANSWER_MS = 2000;

/** The server's name and version in the `initialize` answer. */
const SERVER_INFO = { name: 'eigenspan', version: '0.1.0' };

/** The session's configuration. */
export class Session {
  settings: Settings = { ...DEFAULT_SETTINGS };
  caps: ClientCapabilities = {};
  init: ServerInitializationOptions = {};
  /** False in untrusted workspaces: only static checks run until `eigenspan/setTrust`. */
  evaluate = true;
  /** True when the client pulls diagnostics (`textDocument/diagnostic`) instead of receiving them. */
  pull = false;
  /** VS Code can reopen the suggestion list after a keyword through its own command; other clients cannot. */
  retrigger = false;
  /** Settles once the client's settings have been read (or could not be). */
  settingsLoaded: Promise<void> = Promise.resolve();

  constructor(
    private readonly connection: Connection,
    private readonly logError: (message: string) => void,
  ) {}

  /** Plot samples are computed only for a client with the panel (or one that asks for them). */
  get samples(): boolean {
    return this.init.samples ?? this.init.panel === true;
  }

  /** `eigenspan/result` goes only to a client with the panel (or one that asks for it). */
  get results(): boolean {
    return this.init.results ?? this.init.panel === true;
  }

  /** Takes the client's capabilities and options; answers with the server's capabilities. */
  initialize(params: InitializeParams): InitializeResult {
    const caps = (this.caps = params.capabilities ?? {});
    this.init = (params.initializationOptions ?? {}) as ServerInitializationOptions;
    this.evaluate = this.init.evaluate !== false;
    this.retrigger = /visual studio code|vscode/i.test(params.clientInfo?.name ?? '');
    const mode = this.init.diagnostics ?? 'auto';
    this.pull = mode === 'pull' || (mode === 'auto' && !!caps.textDocument?.diagnostic && !!caps.workspace?.diagnostics?.refreshSupport);
    const result: InitializeResult = {
      capabilities: {
        textDocumentSync: TextDocumentSyncKind.Incremental,
        hoverProvider: true,
        completionProvider: { triggerCharacters: [' ', '(', ','], resolveProvider: false },
        signatureHelpProvider: { triggerCharacters: ['(', ','], retriggerCharacters: [','] },
        codeActionProvider: { codeActionKinds: [CodeActionKind.QuickFix] },
        codeLensProvider: { resolveProvider: false },
        documentSymbolProvider: true,
        definitionProvider: true,
        referencesProvider: true,
        renameProvider: caps.textDocument?.rename?.prepareSupport ? { prepareProvider: true } : true,
      },
      serverInfo: SERVER_INFO,
    };
    if (caps.textDocument?.inlayHint) result.capabilities.inlayHintProvider = true;
    if (this.pull) result.capabilities.diagnosticProvider = { interFileDependencies: false, workspaceDiagnostics: false };
    return result;
  }

  /**
   * Reads the settings: from `workspace/configuration` when the client supports it (bounded by
   * SETTINGS_ANSWER_MS), else from the `didChangeConfiguration` payload `raw`. Returns true when the
   * settings that change results (default basis, limits) changed.
   */
  async load(raw?: unknown): Promise<boolean> {
    const before = resultKey(this.settings);
    if (this.caps.workspace?.configuration) {
      try {
        const [v] = (await withDeadline(this.connection.workspace.getConfiguration([{ section: 'eigenspan' }]), SETTINGS_ANSWER_MS)) as unknown[];
        this.settings = readSettings(v);
      } catch (e) {
        this.logError(`reading settings failed: ${String(e)}; using defaults`);
        this.settings = { ...DEFAULT_SETTINGS };
      }
    } else if (raw !== undefined) {
      this.settings = readSettings((raw as { eigenspan?: unknown } | null)?.eigenspan);
    }
    for (const p of this.settings.limitProblems) this.logError(`setting eigenspan.limits: ${p}; keeping the default`);
    return resultKey(this.settings) !== before;
  }
}

/** The part of the settings that results depend on. */
function resultKey(s: Settings): string {
  return JSON.stringify([s.defaultBasis, s.limits]);
}

/** `p`, or a rejection when it has not settled within `ms` (a client that never answers must not hold analyses back). */
async function withDeadline<T>(p: Promise<T>, ms: number): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const late = new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms)));
  try {
    return await Promise.race([p, late]);
  } finally {
    clearTimeout(timer);
  }
}
