/**
 * Runs full analyses in one worker thread: per-document debounce, a queue where the latest text of
 * each document replaces older ones, cooperative cancellation of superseded work through a shared flag,
 * a wall-clock budget past which the worker is terminated and restarted, and restart after a crash.
 */
import { Worker } from 'node:worker_threads';
import type { AnalysisResult } from '../analysis/types';
import type { Limits } from '../analysis/index';
import type { AnalyseJob, WorkerReply } from './workerMessages';
import type { DataFile } from '../analysis/options';

/** How a scheduled analysis ended. */
export type Outcome =
  | { kind: 'done'; result: AnalysisResult }
  /** The time budget ran out; the worker was terminated. */
  | { kind: 'timeout'; budgetMs: number }
  /** The worker died (crash, out of memory) or the engine threw. */
  | { kind: 'crashed'; message: string };

/** Options of the scheduler. */
export interface SchedulerOptions {
  /** The bundled worker script (dist/worker.js). */
  workerPath: string;
  /** Where worker output and scheduler events go (the connection's log, never stdout). */
  log: (message: string) => void;
  /** Current debounce and budget, read at scheduling time. */
  timing: () => { debounceMs: number; timeBudgetMs: number; defaultBasis: number; limits?: Partial<Limits> };
  /** Ask for plot samples (for the panel). */
  samples: boolean;
  /** Called once per analysis that ran to an end (not for cancelled ones). */
  onOutcome: (uri: string, revision: number, outcome: Outcome) => void;
  /** Heap cap of the worker in MB (default 1024), so a runaway allocation cannot take the server down. */
  maxHeapMb?: number;
  /** Reads the data files a text names when its analysis starts (none when absent). */
  data?: (uri: string, text: string) => [string, DataFile][];
}

interface Pending {
  /** The document store's revision of the text (only grows per document). */
  revision: number;
  text: string;
}

interface Running extends Pending {
  id: number;
  uri: string;
  cancel: Int32Array;
  /** The budget timer; null until the worker has loaded, so start-up time does not count. */
  budget: NodeJS.Timeout | null;
}

/** How long a new worker may take to load before it counts as crashed. */
const STARTUP_MS = 15_000;
/** The worker's default heap cap in MB. */
const DEFAULT_HEAP_MB = 1024;
/** The engine's own time limit is this fraction of the budget, so it stops itself before it is terminated... */
const ENGINE_SHARE = 0.75;
/** ...but never under this many ms. */
const MIN_ENGINE_MS = 50;

/** Schedules, cancels and supervises full analyses. */
export class AnalysisScheduler {
  private worker: Worker | null = null;
  private ready = false;
  private startup: NodeJS.Timeout | null = null;
  private readonly timers = new Map<string, NodeJS.Timeout>();
  private readonly pending = new Map<string, Pending>();
  private running: Running | null = null;
  private nextId = 1;
  private disposed = false;
  /** How many workers have been started (for logs and tests). */
  workerStarts = 0;

  constructor(private readonly options: SchedulerOptions) {}

  /** Analyse `text` as `revision` of `uri` after the debounce; supersedes any earlier revision. */
  schedule(uri: string, revision: number, text: string, immediate = false): void {
    if (this.disposed) return;
    const r = this.running;
    if (r && r.uri === uri && r.revision !== revision) Atomics.store(r.cancel, 0, 1);
    const old = this.timers.get(uri);
    if (old) clearTimeout(old);
    this.pending.delete(uri);
    const go = (): void => {
      this.timers.delete(uri);
      this.pending.set(uri, { revision, text });
      this.pump();
    };
    const delay = immediate ? 0 : this.options.timing().debounceMs;
    if (delay <= 0) go();
    else this.timers.set(uri, setTimeout(go, delay));
  }

  /** Starts the worker ahead of the first analysis, so that loading it does not delay the first result. */
  warmUp(): void {
    if (this.disposed || this.worker) return;
    try {
      this.worker = this.startWorker();
    } catch (e) {
      this.options.log(`analysis worker could not start: ${e instanceof Error ? e.message : String(e)}`);
    }
  }

  /** Forgets a document: drops its timer and queue entry and cancels its running analysis. */
  forget(uri: string): void {
    const t = this.timers.get(uri);
    if (t) clearTimeout(t);
    this.timers.delete(uri);
    this.pending.delete(uri);
    if (this.running?.uri === uri) Atomics.store(this.running.cancel, 0, 1);
  }

  /** True while `uri` has an analysis waiting, debouncing or running. */
  busy(uri: string): boolean {
    return this.timers.has(uri) || this.pending.has(uri) || this.running?.uri === uri;
  }

  /** Stops everything (server shutdown). */
  dispose(): void {
    this.disposed = true;
    for (const t of this.timers.values()) clearTimeout(t);
    this.timers.clear();
    this.pending.clear();
    if (this.running?.budget) clearTimeout(this.running.budget);
    if (this.startup) clearTimeout(this.startup);
    this.running = null;
    const w = this.worker;
    this.worker = null;
    if (w) void w.terminate();
  }

  private startWorker(): Worker {
    const w = new Worker(this.options.workerPath, {
      stdout: true,
      stderr: true,
      resourceLimits: { maxOldGenerationSizeMb: this.options.maxHeapMb ?? DEFAULT_HEAP_MB },
    });
    this.workerStarts++;
    this.ready = false;
    if (this.startup) clearTimeout(this.startup);
    this.startup = setTimeout(() => {
      if (this.worker !== w || this.ready) return;
      this.options.log(`analysis worker did not start within ${STARTUP_MS} ms; restarting it`);
      void w.terminate();
    }, STARTUP_MS);
    // The worker's console output belongs in the server log; stdout carries the protocol.
    const forward = (stream: NodeJS.ReadableStream, tag: string): void => {
      stream.setEncoding('utf8');
      stream.on('data', (chunk: string) => this.options.log(`[worker ${tag}] ${chunk.replace(/\n$/, '')}`));
    };
    forward(w.stdout, 'stdout');
    forward(w.stderr, 'stderr');
    w.on('message', (m: WorkerReply) => this.onReply(w, m));
    w.on('error', (e) => this.options.log(`[worker] error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`));
    w.on('exit', (code) => this.onExit(w, code));
    return w;
  }

  private pump(): void {
    if (this.disposed || this.running) return;
    const first = this.pending.entries().next();
    if (first.done) return;
    const [uri, job] = first.value;
    this.pending.delete(uri);
    if (!this.worker) {
      try {
        this.worker = this.startWorker();
      } catch (e) {
        this.options.log(`analysis worker could not start: ${e instanceof Error ? e.message : String(e)}`);
        this.options.onOutcome(uri, job.revision, { kind: 'crashed', message: 'the analysis worker could not start' });
        return this.pump();
      }
    }
    const { timeBudgetMs, defaultBasis, limits } = this.options.timing();
    const id = this.nextId++;
    const cancel = new Int32Array(new SharedArrayBuffer(4));
    const budget = this.ready ? setTimeout(() => this.onBudget(id), timeBudgetMs) : null;
    this.running = { ...job, id, uri, cancel, budget };
    const message: AnalyseJob = { type: 'analyse', id, text: job.text, defaultBasis, samples: this.options.samples, maxMillis: Math.max(MIN_ENGINE_MS, Math.floor(ENGINE_SHARE * timeBudgetMs)), limits, cancel };
    if (this.options.data) message.data = this.options.data(uri, job.text);
    this.worker.postMessage(message);
  }

  private finish(id: number): Running | null {
    const r = this.running;
    if (!r || r.id !== id) return null;
    if (r.budget) clearTimeout(r.budget);
    this.running = null;
    return r;
  }

  private onReply(w: Worker, m: WorkerReply): void {
    if (w !== this.worker) return;
    if (m.type === 'ready') {
      this.ready = true;
      if (this.startup) clearTimeout(this.startup);
      this.startup = null;
      const r = this.running;
      if (r && !r.budget) r.budget = setTimeout(() => this.onBudget(r.id), this.options.timing().timeBudgetMs);
      return;
    }
    const r = this.finish(m.id);
    if (r) {
      if (m.type === 'done') this.options.onOutcome(r.uri, r.revision, { kind: 'done', result: m.result });
      else if (m.type === 'cancelled') this.options.log(`analysis of ${r.uri} (revision ${r.revision}) cancelled: superseded`);
      else if (m.type === 'failed') {
        this.options.log(`analysis of ${r.uri} (revision ${r.revision}) threw: ${m.message}`);
        this.options.onOutcome(r.uri, r.revision, { kind: 'crashed', message: m.message.split('\n')[0] ?? 'unknown error' });
      }
    }
    this.pump();
  }

  private onBudget(id: number): void {
    const r = this.finish(id);
    if (!r) return;
    const { timeBudgetMs } = this.options.timing();
    this.options.log(`analysis of ${r.uri} (revision ${r.revision}) exceeded ${timeBudgetMs} ms; restarting the worker`);
    const w = this.worker;
    this.worker = null;
    if (w) void w.terminate();
    this.options.onOutcome(r.uri, r.revision, { kind: 'timeout', budgetMs: timeBudgetMs });
    this.pump();
    this.warmUp();
  }

  private onExit(w: Worker, code: number): void {
    // A worker we terminated on purpose is already replaced; only an unexpected exit matters.
    if (w !== this.worker) return;
    const loaded = this.ready;
    this.worker = null;
    this.ready = false;
    this.options.log(`analysis worker exited unexpectedly (code ${code}); it will be restarted`);
    const r = this.running;
    if (r) {
      this.finish(r.id);
      this.options.onOutcome(r.uri, r.revision, { kind: 'crashed', message: `the analysis worker stopped (exit code ${code})` });
    }
    this.pump();
    // Warm a replacement only when the lost worker had loaded: one that cannot even load must not respawn in a loop.
    if (loaded) this.warmUp();
  }
}
