/**
 * What every command of the command line shares: the output channels, the usage error, and the
 * readers of the options `--time-limit` and `--limit`.
 */
import { readLimits, type AnalyseOptions, type Limits } from '../analysis/index';
import type { AnalysisResult } from '../analysis/types';
import { withQuickStage } from '../language/meter';
import { analyseWithSweep, SWEEP_MILLIS_RANGE, type SweepOptions } from '../analysis/sweep/index';

/** Where a command prints: standard output, standard error, and whether standard error is a terminal. */
export interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
  isTTY: boolean;
}

/** A mistake in the command line itself (exit code 2). */
export class UsageError extends Error {}

/** Reads the value of `--time-limit MS` (a whole number of milliseconds per file). */
export function timeLimit(value: string | undefined): number {
  const v = Number(value);
  if (value === undefined || !Number.isInteger(v) || v < 1) throw new UsageError('--time-limit needs a whole number of milliseconds');
  return v;
}

/** Reads the value of `--limit NAME=N` into `into`. */
export function limitOption(value: string | undefined, into: Partial<Limits>): void {
  const m = value === undefined ? null : /^([A-Za-z]+)=(.*)$/.exec(value);
  if (!m) throw new UsageError('--limit needs NAME=N, for example --limit maxBasis=8000');
  const { limits, problems } = readLimits({ [m[1]!]: m[2]! });
  if (problems.length > 0) throw new UsageError(`--limit: ${problems[0]}`);
  Object.assign(into, limits);
}

/**
 * `analyse` with the quick stage's suggestion allowance sized by the text (see language/meter.ts), and
 * the file's sweep, if it has one, under the sweep's own budget (`sweep.maxMillis`).
 */
export function analyseBounded(text: string, options: AnalyseOptions = {}, sweep: SweepOptions = {}): AnalysisResult {
  return withQuickStage({ textLength: text.length }, () => analyseWithSweep(text, options, sweep));
}

/** Reads the value of `--sweep-time-limit MS` (a whole number of milliseconds for a whole sweep). */
export function sweepTimeLimit(value: string | undefined): number {
  const v = Number(value);
  const [lo, hi] = SWEEP_MILLIS_RANGE;
  if (value === undefined || !Number.isInteger(v) || v < lo || v > hi) throw new UsageError(`--sweep-time-limit needs a whole number of milliseconds from ${lo} to ${hi}`);
  return v;
}
