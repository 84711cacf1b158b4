/**
 * The commands for setups under version control:
 *
 *   eigenspan summary FILE             the physics of FILE as stable text (git's textconv)
 *   eigenspan diff OLD NEW             the physics changes from OLD to NEW
 *   eigenspan diff FILE --rev REV      the changes from FILE at git revision REV to FILE as it is now
 *
 * `--tolerance T` (diff) and `--time-limit`, `--limit` (both) as for `expand`.
 */
import { basename, dirname } from 'node:path';
import { DEFAULT_LIMITS, type Limits } from '../analysis/index';
import type { AnalysisResult } from '../analysis/types';
import { comparePhysics, DEFAULT_TOLERANCE } from './diff';
import { renderChanges } from './diffText';
import { escapeText } from './escape';
import { analyseFile } from './data';
import { limitOption, timeLimit, UsageError, type Io } from './options';
import { readText } from './readtext';
import { renderSummary } from './summary';

/** Reads `--time-limit` and `--limit` at `args[i]`; returns the index of the option's value, or -1. */
function limitArg(args: string[], i: number, limits: Partial<Limits>): number {
  if (args[i] === '--time-limit') limits.maxMillis = timeLimit(args[i + 1]);
  else if (args[i] === '--limit') limitOption(args[i + 1], limits);
  else return -1;
  return i + 1;
}

/** `eigenspan summary FILE`: exit 0 whatever the findings (git treats a failing textconv as an error). */
export function summary(args: string[], io: Io): number {
  const limits: Partial<Limits> = {};
  let file: string | null = null;
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    const j = limitArg(args, i, limits);
    if (j >= 0) i = j;
    else if (a.startsWith('-')) throw new UsageError(`unknown option '${a}' for summary`);
    else if (file === null) file = a;
    else throw new UsageError('summary takes one file');
  }
  if (file === null) throw new UsageError('summary needs a file');
  const text = readText(file, limits.maxFileBytes);
  io.out(renderSummary(analyseFile(file, text, { limits })));
  return 0;
}

/** The text of `file` at git revision `rev` (`git show REV:./NAME` in the file's folder; no shell). */
export function readAtRevision(file: string, rev: string, maxFileBytes = DEFAULT_LIMITS.maxFileBytes): string {
  if (rev === '' || rev.startsWith('-') || /[\0\s:]/.test(rev)) throw new UsageError(`'${escapeText(rev)}' is not a revision`);
  try {
    // Loaded here, not at start: node:child_process (and node:net behind it) costs every fresh process.
    const { execFileSync } = require('node:child_process') as typeof import('node:child_process');
    return execFileSync('git', ['show', `${rev}:./${basename(file)}`], {
      cwd: dirname(file),
      encoding: 'utf8',
      maxBuffer: maxFileBytes * 4,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
  } catch (e) {
    const stderr = String((e as { stderr?: unknown }).stderr ?? '').trim().split('\n')[0] ?? '';
    throw new UsageError(`cannot read '${escapeText(file)}' at revision '${escapeText(rev)}': ${escapeText(stderr || (e as Error).message)}`);
  }
}

function toleranceOption(value: string | undefined): number {
  const v = Number(value);
  if (value === undefined || !Number.isFinite(v) || v < 0) throw new UsageError('--tolerance needs a number of zero or more');
  return v;
}

/** `eigenspan diff`: exit 0 when nothing moved beyond the tolerance, 1 when something did. */
export function diff(args: string[], io: Io): number {
  const limits: Partial<Limits> = {};
  const files: string[] = [];
  let rev: string | null = null;
  let tolerance = DEFAULT_TOLERANCE;
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    const j = limitArg(args, i, limits);
    if (j >= 0) i = j;
    else if (a === '--rev') rev = args[++i] ?? '';
    else if (a === '--tolerance') tolerance = toleranceOption(args[++i]);
    else if (a.startsWith('-')) throw new UsageError(`unknown option '${a}' for diff`);
    else files.push(a);
  }
  if (rev === null ? files.length !== 2 : files.length !== 1) throw new UsageError('diff needs OLD NEW, or FILE --rev REV');
  const newFile = files[files.length - 1]!;
  const oldText = rev === null ? readText(files[0]!, limits.maxFileBytes) : readAtRevision(newFile, rev, limits.maxFileBytes);
  const oldName = rev === null ? files[0]! : `${newFile}@${rev}`;
  const a: AnalysisResult = analyseFile(rev === null ? files[0]! : newFile, oldText, { limits });
  const b: AnalysisResult = analyseFile(newFile, readText(newFile, limits.maxFileBytes), { limits });
  const changes = comparePhysics(a, b, tolerance);
  const unit = (r: AnalysisResult): string => (r.units.energy ? ` ${r.units.energy}` : '');
  io.out(renderChanges(changes, escapeText(oldName), escapeText(newFile), tolerance, { old: unit(a), new: unit(b) }));
  return changes.length > 0 ? 1 : 0;
}
