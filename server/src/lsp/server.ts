/**
 * The language server: document lifecycle, scheduling of static and full analyses, publishing, and the
 * request handlers. `startServer` wires everything to a connection; `main.ts` only creates the
 * connection.
 */
import {
  CodeActionKind,
  CodeLensRefreshRequest,
  DidChangeConfigurationNotification,
  DocumentDiagnosticReportKind,
  LSPErrorCodes,
  ResponseError,
  TextDocumentSyncKind,
  TextDocuments,
  type CancellationToken,
  type ClientCapabilities,
  type Connection,
  type DocumentDiagnosticReport,
  type InitializeResult,
} from 'vscode-languageserver';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { analyseStatic } from '../analysis/index';
import type { AnalysisResult } from '../analysis/types';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';
import { RESULT_NOTIFICATION, SET_TRUST_NOTIFICATION, type ResultParams, type ServerInitializationOptions, type SetTrustParams } from '../protocol';
import { lineTable, offsetAt, type LineTable } from './positions';
import { toLspDiagnostics } from './diagnostics';
import { AnalysisScheduler, type Outcome } from './scheduler';
import { DEFAULT_SETTINGS, readSettings, type Settings } from './settings';
import type { DocView } from './view';
import { hoverAt } from './hover';
import { completeAt } from './completion';
import { signatureAt } from './signature';
import { quickFixes } from './actions';
import { lensesFor, letHints } from './lens';
import { definitionAt, documentSymbols, prepareRenameAt, referencesAt, renameAt } from './symbols';

/** Options of `startServer`. */
export interface ServerOptions {
  /** The bundled worker script. */
  workerPath: string;
}

/** How many analysed texts each document remembers (undo and redo then need no new analysis). */
const TEXT_CACHE = 4;

/** A result without its plot data (samples and the density frames of the evolution). */
function withoutPlots(r: AnalysisResult): AnalysisResult {
  if (!r.samples && !r.evolution?.density) return r;
  const evolution = r.evolution ? { ...r.evolution } : null;
  if (evolution) delete evolution.density;
  return { ...r, samples: null, evolution };
}

interface DocState {
  uri: string;
  version: number;
  text: string;
  lines: LineTable;
  file: QFile;
  staticDiagnostics: EngineDiagnostic[];
  /** The full analysis of the current version: a result, or only diagnostics when it was stopped. */
  full: { result: AnalysisResult | null; diagnostics: EngineDiagnostic[] } | null;
  /** The last version whose diagnostics were published (never goes back). */
  published: number;
  byText: Map<string, AnalysisResult>;
  waiters: Set<() => void>;
}

/** Serves one client over `connection` until it goes away. */
export function startServer(connection: Connection, options: ServerOptions): void {
  const documents = new TextDocuments(TextDocument);
  const docs = new Map<string, DocState>();
  let settings: Settings = { ...DEFAULT_SETTINGS };
  let caps: ClientCapabilities = {};
  let init: ServerInitializationOptions = {};
  let evaluate = true;
  let pull = false;
  /** Settles once the client's settings have been read (or could not be). */
  let settingsLoaded: Promise<void> = Promise.resolve();
  /** VS Code can reopen the suggestion list after a keyword through its own command; other clients cannot. */
  let retriggerCommand = false;

  const log = (m: string): void => connection.console.log(m);
  const logError = (m: string): void => connection.console.error(m);

  const scheduler = new AnalysisScheduler({
    workerPath: options.workerPath,
    log,
    timing: () => settings,
    get samples() {
      return init.samples ?? init.panel === true;
    },
    onOutcome: (uri, version, outcome) => onOutcome(uri, version, outcome),
  });

  function viewOf(st: DocState): DocView {
    return {
      uri: st.uri,
      version: st.version,
      text: st.text,
      lines: st.lines,
      file: st.file,
      diagnostics: st.full?.diagnostics ?? st.staticDiagnostics,
      result: st.full?.result ?? null,
      evaluate,
    };
  }

  function publish(st: DocState): void {
    if (pull) {
      if (caps.workspace?.diagnostics?.refreshSupport) void connection.languages.diagnostics.refresh().catch(() => undefined);
      return;
    }
    if (st.version < st.published) return;
    st.published = st.version;
    const list = st.full?.diagnostics ?? st.staticDiagnostics;
    void connection.sendDiagnostics({ uri: st.uri, version: st.version, diagnostics: toLspDiagnostics(st.lines, st.version, list) });
  }

  function refreshViews(): void {
    if (caps.workspace?.codeLens?.refreshSupport) void connection.sendRequest(CodeLensRefreshRequest.type).catch(() => undefined);
    if (caps.workspace?.inlayHint?.refreshSupport) void connection.languages.inlayHint.refresh().catch(() => undefined);
  }

  function wake(st: DocState): void {
    for (const w of st.waiters) w();
    st.waiters.clear();
  }

  function runStatic(text: string): { file: QFile; diagnostics: EngineDiagnostic[] } {
    try {
      return analyseStatic(text, { defaultBasis: settings.defaultBasis, evaluate, limits: settings.limits });
    } catch (e) {
      logError(`static analysis threw: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      return { file: { text, statements: [] }, diagnostics: [] };
    }
  }

  function accept(st: DocState, result: AnalysisResult): void {
    // Plot samples (0.5 to 3 MB a result) go to the panel once and are not kept: hovers, lenses and
    // fixes need only the numbers, and memory then stays flat with many open documents.
    const kept = withoutPlots(result);
    st.full = { result: kept, diagnostics: result.diagnostics };
    st.byText.delete(st.text);
    st.byText.set(st.text, kept);
    while (st.byText.size > TEXT_CACHE) st.byText.delete(st.byText.keys().next().value as string);
    publish(st);
    if (init.results ?? init.panel === true) {
      const { file: _file, ...rest } = result;
      const params: ResultParams = { uri: st.uri, version: st.version, result: rest };
      void connection.sendNotification(RESULT_NOTIFICATION, params);
    }
    refreshViews();
  }

  function update(doc: TextDocument): void {
    const text = doc.getText();
    const s = runStatic(text);
    let st = docs.get(doc.uri);
    if (!st) {
      st = { uri: doc.uri, version: doc.version, text, lines: lineTable(text), file: s.file, staticDiagnostics: s.diagnostics, full: null, published: -Infinity, byText: new Map(), waiters: new Set() };
      docs.set(doc.uri, st);
    } else {
      Object.assign(st, { version: doc.version, text, lines: lineTable(text), file: s.file, staticDiagnostics: s.diagnostics, full: null });
    }
    wake(st);
    // Kept results carry no plot samples, so a client with the panel gets a fresh analysis instead.
    const cached = evaluate && !(init.samples ?? init.panel === true) ? st.byText.get(text) : undefined;
    if (cached) {
      scheduler.forget(st.uri);
      accept(st, cached);
      return;
    }
    publish(st);
    if (!evaluate) return;
    // The first analyses wait for the client's settings (debounce, budget, default basis).
    const version = st.version;
    const target = st;
    void settingsLoaded.then(() => {
      if (docs.get(target.uri) === target && target.version === version && !target.full) scheduler.schedule(target.uri, version, text);
    });
  }

  /** Where a `limits` finding about the whole analysis goes: the state line, else the system line, else the start. */
  function anchor(st: DocState): { start: number; end: number } {
    const s = st.file.statements.find((x) => x.kind === 'state') ?? st.file.statements.find((x) => x.kind === 'system');
    if (s) return { start: s.keywordSpan.start, end: s.keywordSpan.end };
    const nl = st.text.indexOf('\n');
    return { start: 0, end: nl < 0 ? st.text.length : nl };
  }

  function onOutcome(uri: string, version: number, outcome: Outcome): void {
    const st = docs.get(uri);
    // Results for a closed document or an old version are never published.
    if (!st || st.version !== version || !evaluate) return;
    if (outcome.kind === 'done') accept(st, outcome.result);
    else {
      const a = anchor(st);
      const message =
        outcome.kind === 'timeout'
          ? `The analysis took longer than the time budget (${outcome.budgetMs} ms, setting eigenspan.timeBudgetMs) and was stopped.`
          : `The analysis stopped unexpectedly (${outcome.message}); only syntax, name and unit checks are shown.`;
      st.full = { result: null, diagnostics: [...st.staticDiagnostics, diagnostic('limits', a.start, a.end, message)] };
      publish(st);
    }
    wake(st);
  }

  /** Waits (bounded) for the full analysis of the current version when one is on its way. */
  function settled(st: DocState, token: CancellationToken): Promise<void> {
    if (st.full || !evaluate || !scheduler.busy(st.uri)) return Promise.resolve();
    const limit = Math.min(settings.timeBudgetMs + settings.debounceMs + 250, 3000);
    return new Promise((resolve) => {
      const done = (): void => {
        clearTimeout(timer);
        sub.dispose();
        st.waiters.delete(done);
        resolve();
      };
      const timer = setTimeout(done, limit);
      const sub = token.onCancellationRequested(done);
      st.waiters.add(done);
    });
  }

  /** Wraps a request handler: looks the document up, catches and logs failures, honours cancellation. */
  function handle<P extends { textDocument: { uri: string } }, R>(
    name: string,
    fallback: R,
    fn: (st: DocState, params: P, token: CancellationToken) => R | Promise<R>,
  ): (params: P, token: CancellationToken) => Promise<R | ResponseError<void>> {
    return async (params, token) => {
      const uri = params?.textDocument?.uri ?? '(no uri)';
      try {
        const st = docs.get(uri);
        if (!st) return fallback;
        if (token.isCancellationRequested) return new ResponseError(LSPErrorCodes.RequestCancelled, `${name} cancelled`);
        const r = await fn(st, params, token);
        if (token.isCancellationRequested) return new ResponseError(LSPErrorCodes.RequestCancelled, `${name} cancelled`);
        return r;
      } catch (e) {
        // A deliberate protocol error (for example an invalid new name) goes to the client as is.
        if (e instanceof ResponseError) return e as ResponseError<void>;
        logError(`${name} failed for ${uri}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
        return fallback;
      }
    };
  }

  connection.onInitialize((params): InitializeResult => {
    caps = params.capabilities ?? {};
    init = (params.initializationOptions ?? {}) as ServerInitializationOptions;
    evaluate = init.evaluate !== false;
    retriggerCommand = /visual studio code|vscode/i.test(params.clientInfo?.name ?? '');
    const mode = init.diagnostics ?? 'auto';
    pull = mode === 'pull' || (mode === 'auto' && !!caps.textDocument?.diagnostic && !!caps.workspace?.diagnostics?.refreshSupport);
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
      serverInfo: { name: 'eigenspan', version: '0.1.0' },
    };
    if (caps.textDocument?.inlayHint) result.capabilities.inlayHintProvider = true;
    if (pull) result.capabilities.diagnosticProvider = { interFileDependencies: false, workspaceDiagnostics: false };
    return result;
  });

  async function loadSettings(raw?: unknown, first = false): Promise<void> {
    const before = { basis: settings.defaultBasis, limits: JSON.stringify(settings.limits) };
    await readClientSettings(raw);
    for (const p of settings.limitProblems) logError(`setting eigenspan.limits: ${p}; keeping the default`);
    // Results depend on the default basis and the limits: forget them and analyse again (the first
    // load only releases the analyses that waited for it).
    if (!first && (settings.defaultBasis !== before.basis || JSON.stringify(settings.limits) !== before.limits)) {
      log(`default basis ${settings.defaultBasis}, limits ${JSON.stringify(settings.limits)}; analysing open documents again`);
      for (const st of docs.values()) {
        st.byText.clear();
        st.full = null;
        if (evaluate) scheduler.schedule(st.uri, st.version, st.text, true);
      }
    }
  }

  async function readClientSettings(raw?: unknown): Promise<void> {
    if (caps.workspace?.configuration) {
      try {
        // A client that never answers must not hold the analyses back for long.
        let timer: NodeJS.Timeout | undefined;
        const late = new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error('no answer within 2 s')), 2000)));
        const [v] = (await Promise.race([connection.workspace.getConfiguration([{ section: 'eigenspan' }]), late]).finally(() => clearTimeout(timer))) as unknown[];
        settings = readSettings(v);
      } catch (e) {
        logError(`reading settings failed: ${String(e)}; using defaults`);
        settings = { ...DEFAULT_SETTINGS };
      }
    } else if (raw !== undefined) {
      settings = readSettings((raw as { eigenspan?: unknown } | null)?.eigenspan);
    }
  }

  connection.onInitialized(() => {
    if (evaluate) scheduler.warmUp();
    if (caps.workspace?.didChangeConfiguration?.dynamicRegistration) {
      void connection.client.register(DidChangeConfigurationNotification.type, { section: 'eigenspan' }).catch(() => undefined);
    }
    settingsLoaded = loadSettings(undefined, true);
  });

  connection.onDidChangeConfiguration(async (p) => {
    await loadSettings(p.settings);
  });

  connection.onNotification(SET_TRUST_NOTIFICATION, (p: SetTrustParams) => {
    const on = p?.trusted === true;
    if (on === evaluate) return;
    evaluate = on;
    log(`evaluation ${on ? 'on' : 'off'}`);
    for (const st of docs.values()) {
      scheduler.forget(st.uri);
      st.full = null;
      wake(st);
      publish(st);
      if (on) scheduler.schedule(st.uri, st.version, st.text, true);
    }
    refreshViews();
  });

  documents.onDidChangeContent((e) => {
    try {
      update(e.document);
    } catch (err) {
      logError(`updating ${e.document.uri} failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
    }
  });

  documents.onDidClose((e) => {
    const uri = e.document.uri;
    scheduler.forget(uri);
    const st = docs.get(uri);
    if (st) wake(st);
    docs.delete(uri);
    if (!pull) void connection.sendDiagnostics({ uri, diagnostics: [] });
  });

  connection.onHover(
    handle('hover', null, async (st, p, token) => {
      await settled(st, token);
      const cur = docs.get(st.uri);
      if (!cur) return null;
      return hoverAt(viewOf(cur), offsetAt(cur.lines, p.position));
    }),
  );

  connection.onCompletion(
    handle('completion', [], (st, p) =>
      completeAt(viewOf(st), offsetAt(st.lines, p.position), { snippets: !!caps.textDocument?.completion?.completionItem?.snippetSupport, retrigger: retriggerCommand }),
    ),
  );

  connection.onSignatureHelp(handle('signatureHelp', null, (st, p) => signatureAt(st.text, offsetAt(st.lines, p.position))));

  connection.onCodeAction(handle('codeAction', [], (st, p) => quickFixes(viewOf(st), p.context.diagnostics)));

  connection.onCodeLens(
    handle('codeLens', [], async (st, _p, token) => {
      await settled(st, token);
      const cur = docs.get(st.uri);
      return cur ? lensesFor(viewOf(cur), init.panel === true) : [];
    }),
  );

  connection.languages.inlayHint.on(
    handle('inlayHint', [], (st, p) => letHints(viewOf(st), offsetAt(st.lines, p.range.start), offsetAt(st.lines, p.range.end))),
  );

  connection.onDocumentSymbol(handle('documentSymbol', [], (st) => documentSymbols(viewOf(st))));

  connection.onDefinition(handle('definition', null, (st, p) => definitionAt(viewOf(st), offsetAt(st.lines, p.position))));

  connection.onReferences(handle('references', [], (st, p) => referencesAt(viewOf(st), offsetAt(st.lines, p.position), p.context.includeDeclaration)));

  connection.onPrepareRename(handle('prepareRename', null, (st, p) => prepareRenameAt(viewOf(st), offsetAt(st.lines, p.position))));

  connection.onRenameRequest(
    handle('rename', null, (st, p) => {
      const r = renameAt(viewOf(st), offsetAt(st.lines, p.position), p.newName);
      if (r && 'error' in r) throw new ResponseError(-32602, r.error);
      return r;
    }),
  );

  // Pull answers at once with the best findings so far; a refresh follows when the full analysis lands.
  const pullHandler = handle('diagnostic', { kind: DocumentDiagnosticReportKind.Full, items: [] } as DocumentDiagnosticReport, (st) => {
    const cur = st;
    const report: DocumentDiagnosticReport = { kind: DocumentDiagnosticReportKind.Full, items: toLspDiagnostics(cur.lines, cur.version, cur.full?.diagnostics ?? cur.staticDiagnostics) };
    return report;
  });
  connection.languages.diagnostics.on(async (p, token) => {
    const r = await pullHandler(p, token);
    if (r instanceof ResponseError) throw r;
    return r;
  });

  connection.onShutdown(() => scheduler.dispose());

  documents.listen(connection);
  connection.listen();
}
