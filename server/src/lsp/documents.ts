/**
 * The document store: one state per open document (its text, static parse, full analysis and the few
 * analysed texts it remembers), the static stage run on every change, the full analysis handed to the
 * scheduler, and publishing (push diagnostics, pull refreshes, `eigenspan/result`, view refreshes).
 *
 * Every change gets a new internal revision, which only grows; the scheduler and the waiters work by
 * revision, so a result of an older text is never taken. The version published is the client's: when
 * a change's version goes backwards, the text is taken, the version sequence restarts from it, and the
 * regression is logged, so diagnostics and hovers always describe the same text.
 */
import { CodeLensRefreshRequest, type CancellationToken, type Connection, type TextDocuments } from 'vscode-languageserver';
import type { TextDocument } from 'vscode-languageserver-textdocument';
import { analyseStatic } from '../analysis/index';
import { mergeSweepFindings } from '../analysis/sweep/merge';
import type { AnalysisResult } from '../analysis/types';
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';
import { RESULT_NOTIFICATION, type ResultParams } from '../protocol';
import { lineTable, type LineTable } from './positions';
import { toCarriedLspDiagnostics, toLspDiagnostics, withCarried } from './diagnostics';
import { carryOver } from './carry';
import type { AnalysisScheduler, Outcome } from './scheduler';
import type { Session } from './session';
import type { DocView } from './view';

/** How many analysed texts each document remembers (undo and redo then need no new analysis). */
const TEXT_CACHE = 4;
/** A request waiting for the full analysis waits at most the budget and debounce plus this slack... */
const WAIT_SLACK_MS = 250;
/** ...and never longer than this. */
const WAIT_CAP_MS = 3000;

/** One open document. */
export interface DocState {
  uri: string;
  /** The client's version of the current text. */
  version: number;
  /** Internal, only growing: one per change of the text (or of what its analysis depends on). */
  revision: number;
  text: string;
  lines: LineTable;
  file: QFile;
  staticDiagnostics: EngineDiagnostic[];
  /** The full analysis of the current revision: a result, or only diagnostics when it was stopped. */
  full: { result: AnalysisResult | null; diagnostics: EngineDiagnostic[] } | null;
  byText: Map<string, AnalysisResult>;
  waiters: Set<() => void>;
  /** While `full` is null: the last full analysis's numerical findings, mapped into this text (carry.ts). */
  carried?: EngineDiagnostic[];
}

/** What the store works with. */
export interface StoreOptions {
  connection: Connection;
  session: Session;
  /** Late-bound: the scheduler calls the store back with its outcomes. */
  scheduler: () => AnalysisScheduler;
  log: (message: string) => void;
  logError: (message: string) => void;
  /** The findings of the current revision's finished design sweep (lsp/sweepRuns.ts), merged into what is published. */
  sweepFindings?: (st: DocState) => EngineDiagnostic[] | null;
}

/** A result without its plot data (samples and the density frames of the evolution). */
function withoutPlots(r: AnalysisResult): AnalysisResult {
  if (!r.samples && !r.evolution?.density) return r;
  const evolution = r.evolution ? { ...r.evolution } : null;
  if (evolution) delete evolution.density;
  return { ...r, samples: null, evolution };
}

/** Where a `limits` finding about the whole analysis goes: the state line, else the system line, else the start. */
function anchor(st: DocState): { start: number; end: number } {
  const s = st.file.statements.find((x) => x.kind === 'state') ?? st.file.statements.find((x) => x.kind === 'system');
  if (s) return { start: s.keywordSpan.start, end: s.keywordSpan.end };
  const nl = st.text.indexOf('\n');
  return { start: 0, end: nl < 0 ? st.text.length : nl };
}

/** The open documents and everything that happens to them. */
export class DocumentStore {
  private readonly docs = new Map<string, DocState>();
  private revisions = 0;

  constructor(private readonly o: StoreOptions) {}

  get(uri: string): DocState | undefined {
    return this.docs.get(uri);
  }

  /** Follows the library's document list: changes run the static stage, closes forget. */
  listen(documents: TextDocuments<TextDocument>): void {
    documents.onDidChangeContent((e) => {
      try {
        this.update(e.document);
      } catch (err) {
        this.o.logError(`updating ${e.document.uri} failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
      }
    });
    documents.onDidClose((e) => this.close(e.document.uri));
  }

  /** The snapshot the features work from. */
  view(st: DocState): DocView {
    return {
      uri: st.uri,
      version: st.version,
      text: st.text,
      lines: st.lines,
      file: st.file,
      diagnostics: this.best(st),
      result: st.full?.result ?? null,
      evaluate: this.o.session.evaluate,
    };
  }

  /** The best diagnostics of the current text, as LSP diagnostics. */
  lspDiagnostics(st: DocState): ReturnType<typeof toLspDiagnostics> {
    const best = toLspDiagnostics(st.lines, st.version, this.best(st));
    return st.full || !st.carried?.length ? best : withCarried(best, toCarriedLspDiagnostics(st.lines, st.carried));
  }

  /** The findings of the current text: the full analysis's (with its sweep's, once both are in), else the quick stage's. */
  private best(st: DocState): EngineDiagnostic[] {
    const sweep = st.full ? this.o.sweepFindings?.(st) : null;
    return st.full ? (sweep ? mergeSweepFindings(st.full.diagnostics, sweep) : st.full.diagnostics) : st.staticDiagnostics;
  }

  /** Publishes the current findings of `st` again (its sweep ended). */
  republish(st: DocState): void {
    this.publish(st);
  }

  private runStatic(text: string): { file: QFile; diagnostics: EngineDiagnostic[] } {
    const { settings, evaluate } = this.o.session;
    try {
      return analyseStatic(text, { defaultBasis: settings.defaultBasis, evaluate, limits: settings.limits });
    } catch (e) {
      this.o.logError(`static analysis threw: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      return { file: { text, statements: [] }, diagnostics: [] };
    }
  }

  /** A new text of `doc`: static stage and publish at once, full analysis (or a remembered one) after. */
  update(doc: TextDocument): void {
    const text = doc.getText();
    const s = this.runStatic(text);
    const fresh = { version: doc.version, revision: ++this.revisions, text, lines: lineTable(text), file: s.file, staticDiagnostics: s.diagnostics, full: null };
    let st = this.docs.get(doc.uri);
    if (!st) {
      st = { uri: doc.uri, ...fresh, byText: new Map(), waiters: new Set() };
      this.docs.set(doc.uri, st);
    } else {
      if (doc.version < st.version) this.o.log(`${doc.uri}: version went back from ${st.version} to ${doc.version}; taking the new text and restarting the version sequence there`);
      const carried = !this.o.session.evaluate ? [] : st.full?.result ? carryOver(st.full.diagnostics, st.staticDiagnostics, s.diagnostics, st.text, text) : st.full ? [] : carryOver(st.carried ?? [], [], s.diagnostics, st.text, text);
      Object.assign(st, fresh, { carried });
    }
    this.wake(st);
    const session = this.o.session;
    // Kept results carry no plot samples, so a client with the panel gets a fresh analysis instead.
    const cached = session.evaluate && !session.samples ? st.byText.get(text) : undefined;
    if (cached) {
      this.o.scheduler().forget(st.uri);
      this.accept(st, cached);
      return;
    }
    this.publish(st);
    if (!session.evaluate) return;
    // The first analyses wait for the client's settings (debounce, budget, default basis).
    const revision = st.revision;
    const target = st;
    void session.settingsLoaded.then(() => {
      if (this.docs.get(target.uri) === target && target.revision === revision && !target.full) this.o.scheduler().schedule(target.uri, revision, text);
    });
  }

  /** The document was closed: forget it and clear its diagnostics. */
  close(uri: string): void {
    this.o.scheduler().forget(uri);
    const st = this.docs.get(uri);
    if (st) this.wake(st);
    this.docs.delete(uri);
    if (!this.o.session.pull) void this.o.connection.sendDiagnostics({ uri, diagnostics: [] });
  }

  /** Forgets every result and analyses every open document again (the default basis or the limits changed). */
  reanalyseAll(): void {
    for (const st of this.docs.values()) {
      st.byText.clear();
      st.full = null;
      st.revision = ++this.revisions;
      if (this.o.session.evaluate) this.o.scheduler().schedule(st.uri, st.revision, st.text, true);
    }
  }

  /** Analyses the documents `uris` again, forgetting their remembered results (a data file they use changed). */
  reanalyse(uris: readonly string[]): void {
    for (const uri of uris) {
      const st = this.docs.get(uri);
      if (!st) continue;
      st.byText.clear();
      st.full = null;
      st.revision = ++this.revisions;
      if (this.o.session.evaluate) this.o.scheduler().schedule(st.uri, st.revision, st.text, true);
    }
  }

  /** Evaluation was switched on or off: republish the static findings and, when on, analyse again. */
  trustChanged(): void {
    const on = this.o.session.evaluate;
    for (const st of this.docs.values()) {
      this.o.scheduler().forget(st.uri);
      st.full = null;
      st.carried = undefined;
      st.revision = ++this.revisions;
      this.wake(st);
      this.publish(st);
      if (on) this.o.scheduler().schedule(st.uri, st.revision, st.text, true);
    }
    this.refreshViews();
  }

  /** The scheduler's outcome for `revision` of `uri`. */
  onOutcome(uri: string, revision: number, outcome: Outcome): void {
    const st = this.docs.get(uri);
    // Results for a closed document or an older text are never published.
    if (!st || st.revision !== revision || !this.o.session.evaluate) return;
    if (outcome.kind === 'done') this.accept(st, outcome.result);
    else {
      const a = anchor(st);
      const message =
        outcome.kind === 'timeout'
          ? `The analysis took longer than the time budget (${outcome.budgetMs} ms, setting eigenspan.timeBudgetMs) and was stopped.`
          : `The analysis stopped unexpectedly (${outcome.message}); only syntax, name and unit checks are shown.`;
      st.full = { result: null, diagnostics: [...st.staticDiagnostics, diagnostic('limits', a.start, a.end, message)] };
      this.publish(st);
    }
    this.wake(st);
  }

  /** Waits (bounded) for the full analysis of the current text when one is on its way. */
  settled(st: DocState, token: CancellationToken): Promise<void> {
    const { session } = this.o;
    if (st.full || !session.evaluate || !this.o.scheduler().busy(st.uri)) return Promise.resolve();
    const limit = Math.min(session.settings.timeBudgetMs + session.settings.debounceMs + WAIT_SLACK_MS, WAIT_CAP_MS);
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

  private accept(st: DocState, result: AnalysisResult): void {
    // Plot samples (0.5 to 3 MB a result) go to the panel once and are not kept: hovers, lenses and
    // fixes need only the numbers, and memory then stays flat with many open documents.
    const kept = withoutPlots(result);
    st.full = { result: kept, diagnostics: result.diagnostics };
    st.byText.delete(st.text);
    st.byText.set(st.text, kept);
    while (st.byText.size > TEXT_CACHE) st.byText.delete(st.byText.keys().next().value as string);
    this.publish(st);
    if (this.o.session.results) {
      const { file: _file, ...rest } = result;
      const params: ResultParams = { uri: st.uri, version: st.version, result: rest };
      void this.o.connection.sendNotification(RESULT_NOTIFICATION, params);
    }
    this.refreshViews();
  }

  private publish(st: DocState): void {
    const { connection, session } = this.o;
    if (session.pull) {
      if (session.caps.workspace?.diagnostics?.refreshSupport) void connection.languages.diagnostics.refresh().catch(() => undefined);
      return;
    }
    void connection.sendDiagnostics({ uri: st.uri, version: st.version, diagnostics: this.lspDiagnostics(st) });
  }

  private refreshViews(): void {
    const { connection, session } = this.o;
    if (session.caps.workspace?.codeLens?.refreshSupport) void connection.sendRequest(CodeLensRefreshRequest.type).catch(() => undefined);
    if (session.caps.workspace?.inlayHint?.refreshSupport) void connection.languages.inlayHint.refresh().catch(() => undefined);
  }

  private wake(st: DocState): void {
    for (const w of st.waiters) w();
    st.waiters.clear();
  }
}
