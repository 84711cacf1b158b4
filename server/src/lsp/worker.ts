/**
 * The analysis worker thread: runs the full (possibly slow) analysis off the server's main thread so
 * that requests keep being answered. One job at a time; cancellation is cooperative through a shared
 * flag, and a job that ignores it is ended from outside with `worker.terminate()`.
 */
import { parentPort } from 'node:worker_threads';
import { analyse } from '../analysis/index';
import type { AnalyseJob, WorkerReply } from './workerMessages';
import { runTestHook } from './testHooks';

function reply(message: WorkerReply): void {
  parentPort?.postMessage(message);
}

function run(job: AnalyseJob): void {
  const cancelled = (): boolean => Atomics.load(job.cancel, 0) !== 0;
  try {
    // Compiled out of every build but the test build (scripts/build.mjs).
    if (EIGENSPAN_TEST_BUILD) {
      if (runTestHook(job.text, job.id, cancelled)) return reply({ type: 'cancelled', id: job.id });
    }
    const result = analyse(job.text, { defaultBasis: job.defaultBasis, samples: job.samples, cancelled, limits: { ...job.limits, maxMillis: job.maxMillis }, data: new Map(job.data ?? []) });
    if (cancelled()) reply({ type: 'cancelled', id: job.id });
    else reply({ type: 'done', id: job.id, result });
  } catch (e) {
    // `analyse` never throws by contract; this keeps a broken engine from killing the worker.
    reply({ type: 'failed', id: job.id, message: e instanceof Error ? (e.stack ?? e.message) : String(e) });
  }
}

parentPort?.on('message', (m: AnalyseJob) => {
  if (m && m.type === 'analyse') run(m);
});
reply({ type: 'ready' });
