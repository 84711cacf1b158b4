/**
 * The `eigenspan/sweep` request (sweepMessages.ts): one sweep worker thread per request, LSP work-done
 * progress from its point reports, and cancellation through a shared flag, from either the request's
 * `$/cancelRequest` or the progress's `window/workDoneProgress/cancel`.
 */
import { Worker } from 'node:worker_threads';
import { ResponseError, type CancellationToken, type Connection } from 'vscode-languageserver';
import { SWEEP_MILLIS_RANGE } from '../analysis/sweep/index';
import type { DocumentStore } from './documents';
import type { Session } from './session';
import { toLspDiagnostics } from './diagnostics';
import { SWEEP_POINT_NOTIFICATION, SWEEP_REQUEST, type SweepJobData, type SweepParams, type SweepWorkerMessage } from './sweepMessages';
import type { SweepPoint } from '../analysis/sweep/index';

/** Registers the request; `workerPath` is the bundled sweep worker. */
export function registerSweep(connection: Connection, store: DocumentStore, session: Session, workerPath: string): void {
  connection.onRequest(SWEEP_REQUEST, async (params: SweepParams, token: CancellationToken) => {
    const uri = params?.textDocument?.uri;
    const doc = typeof uri === 'string' ? store.get(uri) : undefined;
    if (!doc) throw new ResponseError(-32602, `eigenspan/sweep: the document ${String(uri)} is not open`);
    if (!session.evaluate) throw new ResponseError(-32803, 'eigenspan/sweep: the workspace is not trusted, so nothing is evaluated');
    // The sweep's time limit and caps come from the settings: wait until they have been read.
    await session.settingsLoaded;
    const [lo, hi] = SWEEP_MILLIS_RANGE;
    const asked = params.timeLimitMs;
    const maxMillis = typeof asked === 'number' && Number.isInteger(asked) && asked >= lo && asked <= hi ? asked : session.settings.sweepTimeLimitMs;
    const { text, version, lines } = doc;
    const progress = session.caps.window?.workDoneProgress === true ? await connection.window.createWorkDoneProgress() : null;
    const cancel = new Int32Array(new SharedArrayBuffer(4));
    const stop = (): void => void Atomics.store(cancel, 0, 1);
    token.onCancellationRequested(stop);
    progress?.token.onCancellationRequested(stop);
    progress?.begin('Sweep', 0, 'starting', true);
    const data: SweepJobData = { text, defaultBasis: session.settings.defaultBasis, limits: { ...session.settings.limits }, maxMillis, cancel };
    const outcome = await runWorker(workerPath, data, (finished, total, point) => {
      progress?.report(Math.floor((100 * finished) / total), `${finished} of ${total} points`);
      void connection.sendNotification(SWEEP_POINT_NOTIFICATION, { uri, version, finished, total, point });
    });
    progress?.done();
    if (outcome === null) return { uri, version, sweep: null, diagnostics: [] };
    return { uri, version, sweep: outcome.result, diagnostics: toLspDiagnostics(lines, version, outcome.diagnostics) };
  });
}

/** Runs one sweep on a worker of its own; resolves with its outcome (null without a valid sweep). */
function runWorker(path: string, data: SweepJobData, onPoint: (finished: number, total: number, point: SweepPoint) => void): Promise<Extract<SweepWorkerMessage, { type: 'done' }>['outcome']> {
  return new Promise((resolve, reject) => {
    const w = new Worker(path, { workerData: data });
    let settled = false;
    w.on('message', (m: SweepWorkerMessage) => {
      if (m.type === 'point') onPoint(m.finished, m.total, m.point);
      else if (m.type === 'done') {
        settled = true;
        resolve(m.outcome);
        void w.terminate();
      } else {
        settled = true;
        reject(new ResponseError(-32603, `eigenspan/sweep failed: ${m.message}`));
        void w.terminate();
      }
    });
    w.on('error', (e) => {
      if (!settled) reject(new ResponseError(-32603, `eigenspan/sweep failed: ${e.message}`));
      settled = true;
    });
    w.on('exit', () => {
      if (!settled) reject(new ResponseError(-32603, 'eigenspan/sweep: the sweep worker stopped'));
      settled = true;
    });
  });
}
