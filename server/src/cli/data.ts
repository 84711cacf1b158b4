/**
 * The data files of the command line: every path a `.qstate` file names in `state samples("PATH")` is
 * read under the tree rules of files.ts, with the folder of the `.qstate` file as the tree: relative
 * paths only, no `..` out of it, no links out, regular files only, at most DATA_MAX_BYTES read.
 * `--no-data` (for checkouts that are not trusted) refuses every data file; each refusal reaches the
 * engine as data and becomes one finding on the path.
 */
import type { SweepOptions } from '../analysis/sweep/index';
import { dirname } from 'node:path';
import type { AnalyseOptions, DataFile } from '../analysis/options';
import type { AnalysisResult } from '../analysis/types';
import { DATA_MAX_BYTES, dataPathsOf } from '../analysis/samples';
import { readBounded, resolveInTree } from './files';
import { analyseBounded } from './options';

/** The option that refuses every data file. */
export const NO_DATA = '--no-data';

/** Whether this run refuses data files (set from the command line by `takeDataOption`). */
let refuseAll = false;

/** Removes `--no-data` from the arguments of one run and remembers it for that run. */
export function takeDataOption(args: readonly string[]): string[] {
  refuseAll = args.includes(NO_DATA);
  return args.filter((a) => a !== NO_DATA);
}

/** What `readDataFiles` may do. */
export interface DataPolicy {
  /** Refuse every data file (`--no-data`). */
  refuse: boolean;
  /** Most bytes read from one data file (default DATA_MAX_BYTES). */
  maxBytes?: number;
}

/** The data files `text` (the `.qstate` file at `path`) names, read under the rules above. */
export function readDataFiles(path: string, text: string, policy: DataPolicy): Map<string, DataFile> {
  const out = new Map<string, DataFile>();
  const root = dirname(path);
  for (const { path: name } of dataPathsOf(text)) {
    if (out.has(name)) continue;
    if (policy.refuse) {
      out.set(name, { refused: `data files are refused in this run (${NO_DATA})` });
      continue;
    }
    const where = resolveInTree(root, name);
    if (!where.ok) {
      const why = where.refusal.reason === 'outside' ? `${where.refusal.message}; data files are read only from the .qstate file's folder and below` : where.refusal.message;
      out.set(name, { refused: why });
      continue;
    }
    const read = readBounded(where.path, { maxBytes: policy.maxBytes ?? DATA_MAX_BYTES, inside: root });
    out.set(name, read.ok ? { text: read.data.toString('utf8') } : { refused: read.refusal.message });
  }
  return out;
}

/** The data files the `.qstate` file at `path` names, under this run's policy (`--no-data`). */
export function dataOf(path: string, text: string): Map<string, DataFile> {
  return readDataFiles(path, text, { refuse: refuseAll });
}

/** `analyseBounded` of the `.qstate` file at `path` with the data files it names. */
export function analyseFile(path: string, text: string, options: AnalyseOptions = {}, sweep: SweepOptions = {}): AnalysisResult {
  return analyseBounded(text, { ...options, data: readDataFiles(path, text, { refuse: refuseAll }) }, sweep);
}
