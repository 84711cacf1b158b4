/**
 * `eigenspan sweep FILE [--table | --csv | --csv-bare | --json] [--basis N] [--out PATH [--force]]
 *                       [--time-limit MS] [--sweep-time-limit MS] [--limit NAME=N]... [--threads N]`
 *
 * Runs the file's sweep and prints it: a table (default), CSV (one row a point) or the JSON of
 * `expand --json` with its `sweep` field. `sweepCommand` runs every point in this thread; the process
 * entry uses `sweepCommandThreaded` (sweepThreads.ts), which spreads the points over worker threads when
 * the system changes between points and prints the same output.
 * Exit codes as `expand`: 1 when an error (a failed `expect`, the window's included) was found.
 */
import type { AnalysisResult } from '../analysis/types';
import type { Limits } from '../analysis/index';
import { DEFAULT_SWEEP_MILLIS } from '../analysis/sweep/index';
import { escapeJson, escapeLines, escapeText } from './escape';
import { assertWritable, outPathOption, writeOutput } from './outfile';
import { analyseFile } from './data';
import { limitOption, sweepTimeLimit, timeLimit, UsageError, type Io } from './options';
import { readText } from './readtext';
import { renderJson } from './render';
import { renderSweepCsv, renderSweepTable } from './sweepRender';

/** What the options of `eigenspan sweep` ask for. */
export interface SweepArgs {
  file: string;
  format: 'table' | 'csv' | 'json';
  bare: boolean;
  basis: number | undefined;
  outPath: string | null;
  force: boolean;
  limits: Partial<Limits>;
  sweepMillis: number;
  /** Worker threads for points whose system changes (default 2; 1 runs every point in the main thread). */
  threads: number;
}

/** Reads the options of `eigenspan sweep`. */
export function parseSweepArgs(args: string[]): SweepArgs {
  const a: Omit<SweepArgs, 'file'> & { file: string | null } = {
    file: null, format: 'table', bare: false, basis: undefined, outPath: null, force: false, limits: {}, sweepMillis: DEFAULT_SWEEP_MILLIS, threads: 2,
  };
  for (let i = 0; i < args.length; i++) {
    const x = args[i]!;
    if (x === '--out') a.outPath = outPathOption('--out', args[++i]);
    else if (x === '--force') a.force = true;
    else if (x === '--time-limit') a.limits.maxMillis = timeLimit(args[++i]);
    else if (x === '--sweep-time-limit') a.sweepMillis = sweepTimeLimit(args[++i]);
    else if (x === '--limit') limitOption(args[++i], a.limits);
    else if (x === '--json' || x === '--table' || x === '--csv') a.format = x.slice(2) as SweepArgs['format'];
    else if (x === '--csv-bare') [a.format, a.bare] = ['csv', true];
    else if (x === '--basis') a.basis = wholeNumber(args[++i], '--basis needs a whole number of levels', 1, Infinity);
    else if (x === '--threads') a.threads = wholeNumber(args[++i], '--threads needs a whole number from 1 to 16', 1, 16);
    else if (x.startsWith('-')) throw new UsageError(`unknown option '${x}' for sweep`);
    else if (a.file === null) a.file = x;
    else throw new UsageError('sweep takes one file');
  }
  if (a.file === null) throw new UsageError('sweep needs a file');
  return { ...a, file: a.file };
}

function wholeNumber(value: string | undefined, message: string, lo: number, hi: number): number {
  const v = Number(value);
  if (value === undefined || !Number.isInteger(v) || v < lo || v > hi) throw new UsageError(message);
  return v;
}

/** Reads the file named in `a` (refusing an existing `--out` first). */
export function sweepInput(a: SweepArgs): string {
  if (a.outPath !== null) assertWritable(a.outPath, a.force);
  return readText(a.file, a.limits.maxFileBytes);
}

/** Prints (or writes) a result with its sweep; returns the exit code. */
export function sweepOutput(a: SweepArgs, result: AnalysisResult, text: string, io: Io): number {
  const shown = escapeText(a.file);
  let rendered: string;
  if (!result.sweep) {
    const why = result.diagnostics.find((d) => d.severity === 'error');
    if (!result.file?.statements.some((s) => s.kind === 'sweep')) throw new UsageError(`'${shown}' has no \`sweep\` line; add one such as 'sweep width from 4 nm to 16 nm steps 24'`);
    rendered = a.format === 'json' ? escapeJson(renderJson(result, text)) + '\n' : `== ${shown}\nthe sweep could not run${why ? `: ${why.message}` : ' (see the diagnostics)'}\n`;
  } else if (a.format === 'json') rendered = escapeJson(renderJson(result, text)) + '\n';
  else if (a.format === 'csv') rendered = renderSweepCsv(result, a.bare);
  else rendered = renderSweepTable(result, text, shown);
  if (a.outPath !== null) writeOutput(a.outPath, escapeLines(rendered), a.force);
  else io.out(rendered);
  return result.diagnostics.some((d) => d.severity === 'error') ? 1 : 0;
}

/** `eigenspan sweep` with every point in this thread. */
export function sweepCommand(args: string[], io: Io): number {
  const a = parseSweepArgs(args);
  const text = sweepInput(a);
  const result = analyseFile(a.file, text, { defaultBasis: a.basis, limits: a.limits }, { maxMillis: a.sweepMillis });
  return sweepOutput(a, result, text, io);
}
