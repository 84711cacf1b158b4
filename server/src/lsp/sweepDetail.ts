/**
 * The request `eigenspan/sweepPointResult` (sweepMessages.ts): one sweep point's full analysis, for the
 * panel's state view. The document's current text gets its swept lets set to the point
 * (analysis/sweep/pointText.ts) and is analysed, with plot samples, on an analysis worker of its own
 * (the bundled dist/worker.js, started for this request and ended after it), so the server's thread
 * keeps answering; the findings are mapped back to the file's offsets. Under the per-analysis time
 * budget, cancellable; a failure is logged and answered with null, never a crash.
 */
import { Worker } from 'node:worker_threads';
import { join } from 'node:path';
import type { CancellationToken, Connection } from 'vscode-languageserver';
import { pointText } from '../analysis/sweep/pointText';
import type { DataFile } from '../analysis/options';
import type { ResultParams } from '../protocol';
import type { DocumentStore } from './documents';
import type { Session } from './session';
import type { AnalyseJob, WorkerReply } from './workerMessages';
import { SWEEP_POINT_RESULT_REQUEST, type SweepPointResultParams } from './sweepMessages';

/** The answer: the result as `eigenspan/result` carries it, or null. */
export type SweepPointAnswer = ResultParams['result'] | null;

/** The engine's share of the time budget, as the scheduler gives it (it stops itself before it is ended). */
const ENGINE_SHARE = 0.75;
/** Time beyond the budget for a worker to load before it is ended. */
const LOAD_SLACK_MS = 15_000;

/** Whether `v` is the request's params: a URI and one finite number a swept axis (at most two). */
function validParams(v: unknown): v is SweepPointResultParams {
  const p = v as Partial<SweepPointResultParams> | null;
  return typeof p?.textDocument?.uri === 'string' && Array.isArray(p.at) && p.at.length >= 1 && p.at.length <= 2 && p.at.every((x) => typeof x === 'number' && Number.isFinite(x));
}

/**
 * Registers the request on `connection`. `data` reads the data files a text names (lsp/dataWatch.ts, the
 * same reader the document's own analysis uses), so a `samples(...)` state is analysed with its file;
 * `workerPath` defaults to the analysis worker beside this bundle.
 */
export function registerSweepDetail(
  connection: Connection,
  store: DocumentStore,
  session: Session,
  logError: (message: string) => void,
  data: (uri: string, text: string) => [string, DataFile][],
  workerPath = join(__dirname, 'worker.js'),
): void {
  connection.onRequest(SWEEP_POINT_RESULT_REQUEST, async (params: unknown, token: CancellationToken): Promise<SweepPointAnswer> => {
    if (!validParams(params)) return null;
    const doc = store.get(params.textDocument.uri);
    if (!doc || !session.evaluate) return null;
    try {
      await session.settingsLoaded;
      const s = session.settings;
      const at = pointText(doc.text, params.at, { defaultBasis: s.defaultBasis, limits: s.limits });
      if (!at) return null;
      const job: AnalyseJob = {
        type: 'analyse',
        id: 1,
        text: at.text,
        defaultBasis: s.defaultBasis,
        samples: true,
        maxMillis: Math.max(50, Math.floor(s.timeBudgetMs * ENGINE_SHARE)),
        limits: { ...s.limits },
        cancel: new Int32Array(new SharedArrayBuffer(4)),
        data: data(doc.uri, doc.text),
      };
      const result = await runOnce(workerPath, job, s.timeBudgetMs + LOAD_SLACK_MS, token);
      if (!result) return null;
      const { file: _file, ...rest } = result;
      rest.diagnostics = rest.diagnostics.map((d) => ({ ...d, start: at.back(d.start), end: at.back(d.end) }));
      return rest;
    } catch (e) {
      logError(`${SWEEP_POINT_RESULT_REQUEST} failed for ${params.textDocument.uri}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
      return null;
    }
  });
}

/** Runs one analysis job on a fresh worker; null when it is cancelled, fails or outlives `limitMs`. */
function runOnce(path: string, job: AnalyseJob, limitMs: number, token: CancellationToken): Promise<Extract<WorkerReply, { type: 'done' }>['result'] | null> {
  return new Promise((resolve) => {
    const w = new Worker(path, { resourceLimits: { maxOldGenerationSizeMb: 1024 } });
    let settled = false;
    const finish = (r: Extract<WorkerReply, { type: 'done' }>['result'] | null): void => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      sub.dispose();
      void w.terminate();
      resolve(r);
    };
    const timer = setTimeout(() => finish(null), limitMs);
    const sub = token.onCancellationRequested(() => {
      Atomics.store(job.cancel, 0, 1);
      finish(null);
    });
    w.on('message', (m: WorkerReply) => {
      if (m.type === 'ready') return;
      finish(m.type === 'done' ? m.result : null);
    });
    w.on('error', () => finish(null));
    w.on('exit', () => finish(null));
    w.postMessage(job);
  });
}
