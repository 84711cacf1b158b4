/**
 * The language server: wires the session's configuration, the document store, the analysis scheduler
 * and the request handlers to a connection; `main.ts` creates the connection (and its transport).
 */
import { DidChangeConfigurationNotification, TextDocuments, type Connection } from 'vscode-languageserver';
import { TextDocument } from 'vscode-languageserver-textdocument';
import { SET_TRUST_NOTIFICATION, type SetTrustParams } from '../protocol';
import { AnalysisScheduler } from './scheduler';
import { Session } from './session';
import { DocumentStore } from './documents';
import { registerHandlers } from './handlers';
import { registerSweep } from './sweep';
import { SweepRuns } from './sweepRuns';
import { DataFiles } from './dataWatch';
import { registerSweepDetail } from './sweepDetail';

/** Options of `startServer`. */
export interface ServerOptions {
  /** The bundled worker script. */
  workerPath: string;
  /** The bundled sweep worker script (`eigenspan/sweep`, lsp/sweep.ts). */
  sweepWorkerPath?: string;
}

/** Serves one client over `connection` until it goes away. */
export function startServer(connection: Connection, options: ServerOptions): void {
  const log = (m: string): void => connection.console.log(m);
  const logError = (m: string): void => connection.console.error(m);
  const session = new Session(connection, logError);
  const scheduler: AnalysisScheduler = new AnalysisScheduler({
    workerPath: options.workerPath,
    log,
    timing: () => session.settings,
    get samples() {
      return session.samples;
    },
    onOutcome: (uri, revision, outcome) => {
      store.onOutcome(uri, revision, outcome);
      // A full analysis that ended (also by its time budget) may start the document's background sweep.
      if (outcome.kind !== 'crashed' && store.get(uri)?.revision === revision) sweeps?.analysed(uri);
    },
    data: (uri, text) => dataFiles.read(uri, text),
  });
  const dataFiles = new DataFiles({ connection, session, changed: (uris) => store.reanalyse(uris), logError });
  const sweeps: SweepRuns | null = options.sweepWorkerPath
    ? new SweepRuns({ connection, session, store: (): DocumentStore => store, workerPath: options.sweepWorkerPath, data: (uri, text) => dataFiles.read(uri, text), log })
    : null;
  const store: DocumentStore = new DocumentStore({ connection, session, scheduler: () => scheduler, log, logError, sweepFindings: (st) => sweeps?.findings(st) ?? null });

  /** Reads the settings; a change of what results depend on analyses every document again (not on the first read). */
  async function loadSettings(raw: unknown, first: boolean): Promise<void> {
    const changed = await session.load(raw);
    if (first || !changed) return;
    log(`default basis ${session.settings.defaultBasis}, limits ${JSON.stringify(session.settings.limits)}; analysing open documents again`);
    store.reanalyseAll();
  }

  connection.onInitialize((params) => {
    dataFiles.initialize(params);
    return session.initialize(params);
  });
  connection.onDidChangeWatchedFiles((p) => dataFiles.onChange(p));
  connection.onInitialized(() => {
    if (session.evaluate) scheduler.warmUp();
    if (session.caps.workspace?.didChangeConfiguration?.dynamicRegistration) {
      void connection.client.register(DidChangeConfigurationNotification.type, { section: 'eigenspan' }).catch(() => undefined);
    }
    session.settingsLoaded = loadSettings(undefined, true);
  });
  connection.onDidChangeConfiguration((p) => loadSettings(p.settings, false));
  connection.onNotification(SET_TRUST_NOTIFICATION, (p: SetTrustParams) => {
    const on = p?.trusted === true;
    if (on === session.evaluate) return;
    session.evaluate = on;
    log(`evaluation ${on ? 'on' : 'off'}`);
    if (!on) sweeps?.forgetAll();
    store.trustChanged();
  });
  connection.onShutdown(() => {
    scheduler.dispose();
    sweeps?.forgetAll();
  });

  registerHandlers(connection, store, session, logError);
  registerSweepDetail(connection, store, session, logError, (uri, text) => dataFiles.read(uri, text));
  if (sweeps) registerSweep(connection, store, session, sweeps);
  const documents = new TextDocuments(TextDocument);
  store.listen(documents);
  if (sweeps) {
    // After the store took the new text: a run of the old text stops; a remembered analysis counts as ended.
    documents.onDidChangeContent((e) => {
      sweeps.changed(e.document.uri);
      if (store.get(e.document.uri)?.full) sweeps.analysed(e.document.uri);
    });
    documents.onDidClose((e) => sweeps.forget(e.document.uri));
  }
  documents.onDidClose((e) => dataFiles.forget(e.document.uri));
  documents.listen(connection);
  connection.listen();
}
