/**
 * The design sweeps of open documents, one run per document revision at most (PROTO: background sweeps).
 *
 * After the full analysis of a revision whose text has a valid `sweep` line, and a quiet time of the
 * debounce setting, the sweep runs in the background on a sweep worker thread of its own (setting
 * `eigenspan.sweepInBackground`, default true), with server-initiated work-done progress and an
 * `eigenspan/sweepPoint` notification a finished point. The next edit cancels it without a word; when
 * it ends otherwise (finished, cut by its time limit, or cancelled by the user through the progress) the
 * server sends `eigenspan/sweepResult` and publishes the document's diagnostics again with the sweep's
 * findings merged in (analysis/sweep/merge.ts: one `limits` finding at most). An explicit
 * `eigenspan/sweep` request (sweep.ts) for a revision whose run is going or done attaches to it instead
 * of starting another; only a run the user cancelled is started again.
 */
import { Worker } from 'node:worker_threads';
import type { Connection } from 'vscode-languageserver';
import type { EngineDiagnostic } from '../language/catalogue';
import type { DataFile } from '../analysis/options';
import type { SweepPoint } from '../analysis/sweep/index';
import type { DocState, DocumentStore } from './documents';
import type { Session } from './session';
import { SWEEP_POINT_NOTIFICATION, SWEEP_RESULT_NOTIFICATION, type SweepJobData, type SweepOutcome, type SweepResultParams, type SweepWorkerMessage } from './sweepMessages';

/** How a run ended: its outcome (null without a valid sweep), or why the worker failed. */
export interface RunEnd {
  outcome: SweepOutcome | null;
  failed: string | null;
}

/** One sweep of one revision of one document. */
export class SweepRun {
  readonly cancel = new Int32Array(new SharedArrayBuffer(4));
  /** True once a newer revision (or closing the document) made this run pointless: it ends silently. */
  superseded = false;
  /** Set when the run has ended. */
  end: RunEnd | null = null;
  readonly ended: Promise<RunEnd>;
  private settle: (e: RunEnd) => void = () => undefined;

  constructor(
    readonly uri: string,
    readonly revision: number,
    readonly version: number,
  ) {
    this.ended = new Promise((resolve) => (this.settle = resolve));
  }

  /** Asks the worker to stop; the points finished are kept. */
  stop(): void {
    Atomics.store(this.cancel, 0, 1);
  }

  finish(e: RunEnd): void {
    this.end = e;
    this.settle(e);
  }
}

/** What the runs need from the server. */
export interface SweepRunsOptions {
  connection: Connection;
  session: Session;
  store: () => DocumentStore;
  workerPath: string;
  /** The data files a text names, as the engine takes them (lsp/dataWatch.ts). */
  data: (uri: string, text: string) => [string, DataFile][];
  log: (message: string) => void;
}

/** True when the text has a `sweep` line and none of its best findings is an error on a sweep line. */
export function hasValidSweep(st: DocState): boolean {
  const spans = st.file.statements.filter((s) => s.kind === 'sweep').map((s) => s.span);
  if (spans.length === 0) return false;
  const found = st.full?.diagnostics ?? st.staticDiagnostics;
  return !found.some((d) => d.severity === 'error' && spans.some((s) => d.start < s.end && d.end >= s.start));
}

/** The runs of every open document. */
export class SweepRuns {
  private readonly runs = new Map<string, SweepRun>();
  private readonly timers = new Map<string, NodeJS.Timeout>();
  constructor(private readonly o: SweepRunsOptions) {}

  /** The full analysis of the current revision of `uri` has ended: schedule its background sweep. */
  analysed(uri: string): void {
    const st = this.o.store().get(uri);
    if (!st) return;
    this.changed(uri);
    const { settings, evaluate } = this.o.session;
    if (this.runs.get(uri)?.revision === st.revision || !settings.sweepInBackground || !evaluate || !hasValidSweep(st)) return;
    const revision = st.revision;
    const go = (): void => {
      this.timers.delete(uri);
      const cur = this.o.store().get(uri);
      if (cur && cur.revision === revision && this.runs.get(uri)?.revision !== revision) this.start(cur, this.o.session.settings.sweepTimeLimitMs, 'in the background');
    };
    if (settings.debounceMs <= 0) go();
    else this.timers.set(uri, setTimeout(go, settings.debounceMs));
  }

  /** The text of `uri` (or what its analysis depends on) changed: a run of an older revision stops silently. */
  changed(uri: string): void {
    const st = this.o.store().get(uri);
    const run = this.runs.get(uri);
    if (run && run.revision !== st?.revision) this.drop(uri, run);
    const t = this.timers.get(uri);
    if (t) clearTimeout(t);
    this.timers.delete(uri);
  }

  /** The document was closed (or evaluation switched off): stop and forget its run. */
  forget(uri: string): void {
    const t = this.timers.get(uri);
    if (t) clearTimeout(t);
    this.timers.delete(uri);
    const run = this.runs.get(uri);
    if (run) this.drop(uri, run);
  }

  /** Every document forgotten (evaluation off, shutdown). */
  forgetAll(): void {
    for (const uri of new Set([...this.runs.keys(), ...this.timers.keys()])) this.forget(uri);
  }

  /** The run of the current revision of `st`: the one going or done, else a new one started now. */
  ensure(st: DocState, maxMillis: number): SweepRun {
    const run = this.runs.get(st.uri);
    const again = run?.end && (run.end.failed !== null || run.end.outcome?.result.stopped === 'cancelled');
    if (run && run.revision === st.revision && !again) return run;
    this.forget(st.uri);
    return this.start(st, maxMillis, 'on request');
  }

  /** The findings of the finished run of the current revision of `st`, or null. */
  findings(st: DocState): EngineDiagnostic[] | null {
    const run = this.runs.get(st.uri);
    return run && run.revision === st.revision && run.end?.outcome ? run.end.outcome.diagnostics : null;
  }

  private drop(uri: string, run: SweepRun): void {
    if (!run.end && !run.superseded) this.o.log(`sweep of ${uri} (version ${run.version}) stopped: superseded`);
    run.superseded = true;
    run.stop();
    if (this.runs.get(uri) === run) this.runs.delete(uri);
  }

  private start(st: DocState, maxMillis: number, why: string): SweepRun {
    const { session, connection } = this.o;
    const run = new SweepRun(st.uri, st.revision, st.version);
    this.runs.set(st.uri, run);
    this.o.log(`sweep of ${st.uri} (version ${st.version}) started ${why}`);
    const data: SweepJobData = { text: st.text, defaultBasis: session.settings.defaultBasis, limits: { ...session.settings.limits }, maxMillis, cancel: run.cancel, data: this.o.data(st.uri, st.text) };
    void (async () => {
      const progress = session.caps.window?.workDoneProgress === true ? await connection.window.createWorkDoneProgress().catch(() => null) : null;
      progress?.token.onCancellationRequested(() => run.stop());
      progress?.begin('Sweep', 0, 'starting', true);
      const end = await runWorker(this.o.workerPath, data, (finished, total, point) => {
        if (run.superseded) return;
        progress?.report(Math.floor((100 * finished) / total), `${finished} of ${total} points`);
        void connection.sendNotification(SWEEP_POINT_NOTIFICATION, { uri: run.uri, version: run.version, finished, total, point });
      });
      progress?.done();
      run.finish(end);
      this.ended(run);
    })();
    return run;
  }

  /** A run that was not superseded: its result to the client and the diagnostics published again. */
  private ended(run: SweepRun): void {
    if (run.superseded) return;
    const end = run.end!;
    if (end.failed !== null) this.o.log(`sweep of ${run.uri} (version ${run.version}) failed: ${end.failed}`);
    const params: SweepResultParams = { uri: run.uri, version: run.version, sweep: end.outcome?.result ?? null };
    void this.o.connection.sendNotification(SWEEP_RESULT_NOTIFICATION, params);
    const st = this.o.store().get(run.uri);
    if (st && st.revision === run.revision) this.o.store().republish(st);
  }
}

/** Runs one sweep on a worker of its own; never rejects. */
function runWorker(path: string, data: SweepJobData, onPoint: (finished: number, total: number, point: SweepPoint) => void): Promise<RunEnd> {
  return new Promise((resolve) => {
    let settled = false;
    const settle = (e: RunEnd): void => {
      if (!settled) resolve(e);
      settled = true;
    };
    let w: Worker;
    try {
      w = new Worker(path, { workerData: data });
    } catch (e) {
      return settle({ outcome: null, failed: e instanceof Error ? e.message : String(e) });
    }
    w.on('message', (m: SweepWorkerMessage) => {
      if (m.type === 'point') return onPoint(m.finished, m.total, m.point);
      settle(m.type === 'done' ? { outcome: m.outcome, failed: null } : { outcome: null, failed: m.message });
      void w.terminate();
    });
    w.on('error', (e) => settle({ outcome: null, failed: e.message }));
    w.on('exit', () => settle({ outcome: null, failed: 'the sweep worker stopped' }));
  });
}
