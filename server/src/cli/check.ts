/**
 * `eigenspan check FILE|FOLDER...`: every finding as `FILE:LINE:COL: SEVERITY[CODE]: MESSAGE`, one a line
 * on standard output (for problem matchers), and a one-line summary on standard error.
 *
 * Files are found and read under the rules of `files.ts`: entries those rules refuse (a link out of the
 * folder, a device, a FIFO, a dangling link) are one `warning[limits]` line each and the run carries on,
 * so a repository with one odd link still passes; a `.qstate` file that is too large, binary or
 * unreadable is an error, as it is a file the user meant to be checked.
 */
import { DEFAULT_LIMITS, type Limits } from '../analysis/index';
import { lineTable } from '../language/positions';
import { escapeText } from './escape';
import { readBounded, walkTree, type Refusal } from './files';
import { limitOption, sweepTimeLimit, timeLimit, UsageError, type Io } from './options';
import type { SweepOptions } from '../analysis/sweep/index';
import { analyseFile } from './data';
import { assertWritable, outPathOption, writeOutput } from './outfile';
import { analysedRecord, refusedRecord, type FileRecord } from './records';
import { renderDiagnostic } from './render';
import type * as Reports from './reports';

/** The `.qstate` files under `targets` and the entries refused on the way. */
export function findQstateFiles(targets: readonly string[]): { files: string[]; refused: Refusal[] } {
  const files: string[] = [];
  const refused: Refusal[] = [];
  for (const t of targets) {
    const r = walkTree(t, { wanted: (name) => name.endsWith('.qstate') });
    files.push(...r.files);
    refused.push(...r.refused);
  }
  return { files, refused };
}

/** Counts of what `check` printed, for the summary line. */
interface Tally {
  files: number;
  errors: number;
  warnings: number;
  /** One record a file, for the report files. */
  records: FileRecord[];
}

/** One finding line; `name` is escaped here, the message by the output channel. */
function line(io: Io, tally: Tally, name: string, severity: 'error' | 'warning', code: FileRecord['findings'][number]['code'], message: string): void {
  io.out(`${escapeText(name)}:1:1: ${severity}[${code}]: ${message}\n`);
  tally.records.push(refusedRecord(name, severity, code, message));
  if (severity === 'error') tally.errors++;
  else tally.warnings++;
}

/** A refused entry: a missing argument is an error, anything the file rules refuse a warning. */
function reportRefusal(io: Io, tally: Tally, r: Refusal): void {
  if (r.reason === 'missing') line(io, tally, r.path, 'error', 'limits', `Cannot check it: ${r.message}.`);
  else line(io, tally, r.path, 'warning', 'limits', `Not checked: ${r.message}.`);
}

/** Reads and checks one file, printing its findings. */
function checkFile(io: Io, tally: Tally, f: string, limits: Partial<Limits>, sweep: SweepOptions = {}): void {
  const maxBytes = limits.maxFileBytes ?? DEFAULT_LIMITS.maxFileBytes;
  const read = readBounded(f, { maxBytes });
  if (!read.ok) {
    const r = read.refusal;
    if (r.reason === 'too-large') {
      const size = r.size === undefined ? `more than ${maxBytes} bytes` : `${r.size} bytes`;
      line(io, tally, f, 'error', 'limits', `The file is ${size}, above the limit of ${maxBytes}.`);
    } else if (r.reason === 'unreadable') line(io, tally, f, 'error', 'limits', `Cannot read the file (${r.errno ?? 'error'}).`);
    else reportRefusal(io, tally, r);
    return;
  }
  if (read.data.includes(0)) {
    line(io, tally, f, 'error', 'syntax', 'The file is binary, not a .qstate text file.');
    return;
  }
  const text = read.data.toString('utf8');
  const result = analyseFile(f, text, { limits }, sweep);
  const lines = lineTable(text);
  tally.records.push(analysedRecord(f, text, result, lines));
  for (const d of result.diagnostics) {
    io.out(renderDiagnostic(escapeText(f), d, lines) + '\n');
    if (d.severity === 'error') tally.errors++;
    else if (d.severity === 'warning') tally.warnings++;
  }
}

function plural(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? '' : 's'}`;
}

/** The summary line of `check` (standard error). */
export function summaryLine(t: Omit<Tally, 'records'>): string {
  if (t.files === 0) return `eigenspan check: no .qstate files found${t.warnings + t.errors > 0 ? ` (${plural(t.errors, 'error')}, ${plural(t.warnings, 'warning')})` : ''}.`;
  if (t.errors === 0 && t.warnings === 0) return `eigenspan check: ${plural(t.files, 'file')}, no errors or warnings: all clean.`;
  return `eigenspan check: ${plural(t.files, 'file')}, ${plural(t.errors, 'error')}, ${plural(t.warnings, 'warning')}.`;
}

/**
 * Runs `check` with its arguments; returns the exit code (1 when an error or failed expect was found).
 * `progress` writes raw to a terminal's standard error (escaped file names, then cursor controls).
 */
export function check(args: string[], io: Io, progress: (s: string) => void): number {
  const targets: string[] = [];
  const limits: Partial<Limits> = {};
  const reports: { sarif?: string; junit?: string } = {};
  let force = false;
  const sweep: SweepOptions = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === '--sweep-time-limit') sweep.maxMillis = sweepTimeLimit(args[++i]);
    else if (a === '--sarif' || a === '--junit') reports[a === '--sarif' ? 'sarif' : 'junit'] = outPathOption(a, args[++i]);
    else if (a === '--force') force = true;
    else if (a === '--time-limit') limits.maxMillis = timeLimit(args[++i]);
    else if (a === '--limit') limitOption(args[++i], limits);
    else if (a.startsWith('-')) throw new UsageError(`unknown option '${a}' for check`);
    else targets.push(a);
  }
  if (targets.length === 0) throw new UsageError('check needs at least one file or folder');
  if (reports.sarif !== undefined && reports.sarif === reports.junit) throw new UsageError('--sarif and --junit need different files');
  for (const p of [reports.sarif, reports.junit]) if (p !== undefined) assertWritable(p, force);
  const { files, refused } = findQstateFiles(targets);
  const tally: Tally = { files: files.length, errors: 0, warnings: 0, records: [] };
  for (const r of refused) reportRefusal(io, tally, r);
  const showProgress = io.isTTY && files.length > 3;
  files.forEach((f, i) => {
    if (showProgress) progress(`\r[${i + 1}/${files.length}] ${escapeText(f)}\x1b[K`);
    checkFile(io, tally, f, limits, sweep);
  });
  if (showProgress) progress('\r\x1b[K');
  // The writers are a bundle of their own (dist/reports.js), loaded only when a report is asked for.
  const writers = reports.sarif !== undefined || reports.junit !== undefined ? (require('./reports') as typeof Reports) : null;
  if (writers && reports.sarif !== undefined) writeOutput(reports.sarif, writers.renderSarif(tally.records), force);
  if (writers && reports.junit !== undefined) writeOutput(reports.junit, writers.renderJunit(tally.records), force);
  io.err(summaryLine(tally) + '\n');
  return tally.errors > 0 ? 1 : 0;
}
