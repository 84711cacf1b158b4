/**
 * The sweep worker thread of the language server: runs one document's sweep (`runSweep`) off the main
 * thread, reports each finished point, and stops when the shared cancel flag is set (a `$/cancelRequest`
 * or the client's `window/workDoneProgress/cancel`), keeping the points finished.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { runSweep } from '../analysis/sweep/index';
import type { SweepJobData, SweepWorkerMessage } from './sweepMessages';

function post(m: SweepWorkerMessage): void {
  parentPort?.postMessage(m);
}

const job = workerData as SweepJobData;
const cancelled = (): boolean => Atomics.load(job.cancel, 0) !== 0;
try {
  const r = runSweep(job.text, { defaultBasis: job.defaultBasis, limits: job.limits, data: new Map(job.data ?? []) }, { maxMillis: job.maxMillis, cancelled, onPoint: (finished, total, point) => post({ type: 'point', finished, total, point }) });
  post({ type: 'done', outcome: r });
} catch (e) {
  post({ type: 'failed', message: e instanceof Error ? e.message : String(e) });
}
