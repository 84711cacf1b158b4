/**
 * The threaded front end of `eigenspan sweep`: where the system changes between points, the points are
 * spread over worker threads (two by default, `--threads N`), each running the engine's `runPoints` on
 * its share (every other point) under the remaining sweep time; the main thread gathers the points as
 * they arrive, then refines and words the findings (`finishSweep`). Where only the state changes, every
 * point runs in the main thread, which solves the system once and reuses it. Ctrl-C (SIGINT) cancels:
 * the points finished are kept and a `limits` note says the sweep was cancelled.
 *
 * This is the only module of the command line that starts threads; the engine never does.
 */
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import { analyse, type AnalyseOptions } from '../analysis/index';
import { createBudget } from '../physics/budget';
import { finishSweep, mergeSweep, prepareSweep, runPoints, type PointOutcome } from '../analysis/sweep/index';
import { withQuickStage } from '../language/meter';
import type { Io } from './options';
import { dataOf } from './data';
import { parseSweepArgs, sweepCommand, sweepInput, sweepOutput } from './sweep';

/** What a worker is given. */
interface Task {
  text: string;
  /** With the data files the main thread read (`samples("PATH")`), so every thread sees the same text. */
  options: Pick<AnalyseOptions, 'defaultBasis' | 'limits' | 'data'>;
  indices: number[];
  limitMs: number;
}

/** What a worker sends: each point as it finishes, then why it stopped. */
type WorkerMessage = { kind: 'point'; k: number; out: PointOutcome } | { kind: 'done'; reason: 'time' | 'cancelled' | null };

/** In a worker started by `sweepCommandThreaded`: runs its share of points and returns true; false elsewhere. */
export function serveSweepWorker(): boolean {
  if (isMainThread || parentPort === null || (workerData as { eigenspanSweep?: unknown } | null)?.eigenspanSweep !== true) return false;
  const task = (workerData as { task: Task }).task;
  const port = parentPort;
  const budget = createBudget({ limitMs: task.limitMs });
  const job = prepareSweep(task.text, task.options);
  if (job) runPoints(job, task.indices, budget, (k, out) => port.postMessage({ kind: 'point', k, out } satisfies WorkerMessage));
  port.postMessage({ kind: 'done', reason: budget.reason } satisfies WorkerMessage);
  return true;
}

/** `eigenspan sweep` from the process entry: points on worker threads where the system changes. */
export async function sweepCommandThreaded(args: string[], io: Io, script: string): Promise<number> {
  const a = parseSweepArgs(args);
  const text = sweepInput(a);
  const options: Task['options'] = { defaultBasis: a.basis, limits: a.limits, data: dataOf(a.file, text) };
  const job = prepareSweep(text, options);
  if (job === null || job.systemFixed || a.threads < 2 || job.total < 2) return sweepCommand(args, io);
  const result = withQuickStage({ textLength: text.length }, () => analyse(text, options));
  let cancelled = false;
  const budget = createBudget({ limitMs: a.sweepMillis, cancelled: () => cancelled });
  const outcomes: (PointOutcome | null)[] = new Array(job.total).fill(null);
  const shares = Array.from({ length: Math.min(a.threads, job.total) }, (_, w) => [...Array(job.total).keys()].filter((k) => k % a.threads === w));
  const workers = shares.map((indices) => new Worker(script, { workerData: { eigenspanSweep: true, task: { text, options, indices, limitMs: budget.remaining() } satisfies Task } }));
  const onInt = (): void => {
    cancelled = true;
    for (const w of workers) void w.terminate();
  };
  process.once('SIGINT', onInt);
  const reasons = await Promise.all(workers.map((w) => collect(w, outcomes)));
  process.removeListener('SIGINT', onInt);
  const finished = outcomes.filter((o) => o !== null).length;
  const stopped = cancelled || budget.expired() ? (budget.reason ?? 'time') : finished < job.total ? (reasons.find((r) => r !== null) ?? 'time') : null;
  mergeSweep(result, finishSweep(job, outcomes, budget, stopped));
  return sweepOutput(a, result, text, io);
}

/** Gathers one worker's points until it says it is done or exits; resolves with why it stopped. */
function collect(w: Worker, outcomes: (PointOutcome | null)[]): Promise<'time' | 'cancelled' | null> {
  return new Promise((resolve) => {
    let reason: 'time' | 'cancelled' | null = 'cancelled';
    w.on('message', (m: WorkerMessage) => {
      if (m.kind === 'point') outcomes[m.k] = m.out;
      else reason = m.reason;
    });
    // A worker that fails or is terminated leaves its remaining points unfinished.
    w.on('error', () => (reason = 'time'));
    w.on('exit', () => resolve(reason));
  });
}
