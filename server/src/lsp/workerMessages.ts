/**
 * Messages between the server's main thread and its analysis worker thread.
 */
import type { AnalysisResult } from '../analysis/types';
import type { Limits } from '../analysis/index';
import type { DataFile } from '../analysis/options';

/** Main thread to worker: analyse one document version. */
export interface AnalyseJob {
  type: 'analyse';
  /** Unique per job; the answer carries it back. */
  id: number;
  text: string;
  defaultBasis: number;
  samples: boolean;
  /**
   * The engine's own time limit in ms: a little under the scheduler's budget, so a slow analysis
   * stops itself with partial results and a limits finding before the worker has to be terminated.
   */
  maxMillis: number;
  /** The caps the user set (settings `eigenspan.limits.*`); absent ones keep the engine's defaults. */
  limits?: Partial<Limits>;
  /** An Int32Array view of a SharedArrayBuffer; element 0 becomes 1 when the job is superseded. */
  cancel: Int32Array;
  /** The data files the text names, read on the main thread (lsp/dataWatch.ts): path as written, and text or refusal. */
  data?: [string, DataFile][];
}

/** Worker to main thread. */
export type WorkerReply =
  | { type: 'ready' }
  | { type: 'done'; id: number; result: AnalysisResult }
  | { type: 'cancelled'; id: number }
  | { type: 'failed'; id: number; message: string };
