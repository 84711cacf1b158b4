/**
 * The `eigenspan/sweep` request of the language server and the messages of its sweep worker.
 *
 * Request `eigenspan/sweep`, params `{ textDocument: { uri }, timeLimitMs? }`: runs the document's sweep
 * (its current text) under its own time limit (`timeLimitMs`, else the setting `eigenspan.sweepTimeLimitMs`,
 * default 60000 ms; separate from the per-keystroke budget),
 * reporting LSP work-done progress (`window/workDoneProgress/create`, then `$/progress` begin, a report
 * a finished point with its percentage, and end) when the client supports it. Cancellable with
 * `$/cancelRequest` or `window/workDoneProgress/cancel`: the answer then holds the points finished and
 * `sweep.stopped` is `cancelled`. Answer: `{ uri, version, sweep, diagnostics }` (the sweep's own
 * findings as LSP diagnostics), or `{ uri, version, sweep: null, diagnostics: [] }` when the document has
 * no valid sweep; an untrusted workspace gets an error (nothing is evaluated there).
 * A request for a revision whose sweep (background or requested earlier) is going or done attaches to
 * that run (its progress, its points, its answer) instead of starting another (sweepRuns.ts); only a run
 * the user cancelled, or one whose worker failed, starts again.
 */
import type { Limits } from '../analysis/index';
import type { DataFile } from '../analysis/options';
import type { EngineDiagnostic } from '../language/catalogue';
import type { SweepPoint, SweepResult } from '../analysis/sweep/index';

export const SWEEP_REQUEST = 'eigenspan/sweep';
/**
 * Sent while a sweep runs, one a finished point (partial results as they arrive):
 * `{ uri, version, finished, total, point }` with `point` a `SweepPoint` (analysis/sweep/types.ts).
 */
export const SWEEP_POINT_NOTIFICATION = 'eigenspan/sweepPoint';

/**
 * Sent when a document's sweep ends (finished, cut by its time limit, or cancelled by the user; not when
 * an edit superseded it): `{ uri, version, sweep }`, `sweep` null when the text has no valid sweep.
 * The document's diagnostics for that version are published again with the sweep's findings merged in.
 */
export const SWEEP_RESULT_NOTIFICATION = 'eigenspan/sweepResult';

export interface SweepResultParams {
  uri: string;
  version: number;
  sweep: SweepResult | null;
}

/** What one sweep found: its result and its findings (engine diagnostics of the text it ran on). */
export interface SweepOutcome {
  result: SweepResult;
  diagnostics: EngineDiagnostic[];
}

export interface SweepParams {
  textDocument: { uri: string };
  timeLimitMs?: number;
}

/** What the worker is started with. */
export interface SweepJobData {
  text: string;
  defaultBasis: number;
  limits: Partial<Limits>;
  maxMillis: number;
  /** An Int32Array view of a SharedArrayBuffer; element 0 becomes 1 to cancel. */
  cancel: Int32Array;
  /** The data files the text names (`samples("PATH")`), read by the server as for its analysis. */
  data?: [string, DataFile][];
}

export type SweepWorkerMessage =
  | { type: 'point'; finished: number; total: number; point: SweepPoint }
  | { type: 'done'; outcome: SweepOutcome | null }
  | { type: 'failed'; message: string };

/**
 * Request `eigenspan/sweepPointResult` (lsp/sweepDetail.ts), client to server: the full analysis of the
 * document's current text with the swept `let` lines set to the values `at` (one per sweep axis, in the
 * file's units as `SweepPoint.at`), the same result object `eigenspan/result` carries, or null (no
 * valid sweep, values off the axes, an untrusted workspace, or an analysis that did not end).
 */
export const SWEEP_POINT_RESULT_REQUEST = 'eigenspan/sweepPointResult';

/** The params of `eigenspan/sweepPointResult`. */
export interface SweepPointResultParams {
  textDocument: { uri: string };
  at: number[];
}
