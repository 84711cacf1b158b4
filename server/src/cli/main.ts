/**
 * The command line: a thin front end over `analyse`.
 *
 *   eigenspan expand FILE [--json | --table | --csv] [--basis N] [--out PATH [--force]]
 *                    [--time-limit MS] [--limit NAME=N]...
 *   eigenspan check FILE|FOLDER... [--time-limit MS] [--limit NAME=N]...
 *   eigenspan demo [FOLDER]
 *
 * Exit codes: 0 fine, 1 an error or failed `expect` was found, 2 usage error (bad flag, missing file).
 */
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { analyse, DEFAULT_LIMITS, LIMIT_RANGES, readLimits, type AnalyseOptions, type Limits } from '../analysis/index';
import type { AnalysisResult } from '../analysis/types';
import { lineTable } from '../analysis/positions';
import { withQuickStage } from '../language/meter';
import { renderCsv, renderJson, renderTable, renderDiagnostic } from './render';

const USAGE = `Usage:
  eigenspan expand FILE [--json | --table | --csv] [--basis N] [--out PATH [--force]]
                   [--time-limit MS] [--limit NAME=N]...
      Expand the state of FILE in its system's energy eigenbasis.
      --json   one JSON object (levels, norm, captured, energy, parity, continuum, diagnostics)
      --table  a readable table (the default)
      --csv    one row a level: n, energy, re, im, weight
      --basis N  levels to use when the file has no basis line (default 40)
      --out PATH write the output to PATH instead of the terminal; an existing PATH is
                 never replaced unless --force is given
      --time-limit MS  stop the analysis after MS milliseconds with a limits finding
                 and partial results (default 10000)
      --limit NAME=N   raise or lower one cap (repeatable); NAME and its range:
${Object.entries(LIMIT_RANGES).map(([k, [lo, hi]]) => `                 ${k.padEnd(20)}${String(DEFAULT_LIMITS[k as keyof Limits]).padStart(8)} (${lo} to ${hi})`).join('\n')}
  eigenspan check FILE|FOLDER... [--time-limit MS] [--limit NAME=N]...
      Print every finding as FILE:LINE:COL: SEVERITY[CODE]: MESSAGE.
      Folders are searched for .qstate files. Exit 1 when an error or a failed expect is found.
  eigenspan demo [FOLDER]
      Analyse every .qstate file in FOLDER (default examples) and print each one's table.
  eigenspan --help
      Show this text.
`;

class UsageError extends Error {}

/** Reads the value of `--time-limit MS` (a whole number of milliseconds per file). */
function timeLimit(value: string | undefined): number {
  const v = Number(value);
  if (value === undefined || !Number.isInteger(v) || v < 1) throw new UsageError('--time-limit needs a whole number of milliseconds');
  return v;
}

/** Reads the value of `--limit NAME=N` into `into`. */
function limitOption(value: string | undefined, into: Partial<Limits>): void {
  const m = value === undefined ? null : /^([A-Za-z]+)=(.*)$/.exec(value);
  if (!m) throw new UsageError('--limit needs NAME=N, for example --limit maxBasis=8000');
  const { limits, problems } = readLimits({ [m[1]!]: m[2]! });
  if (problems.length > 0) throw new UsageError(`--limit: ${problems[0]}`);
  Object.assign(into, limits);
}

interface Io {
  out: (s: string) => void;
  err: (s: string) => void;
  isTTY: boolean;
}

/** Runs the command line with `argv` (without node and the script); returns the exit code. */
export function run(argv: string[], io: Io): number {
  try {
    return dispatch(argv, io);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`eigenspan: ${e.message}\n`);
      return 2;
    }
    io.err(`eigenspan: internal error: ${e instanceof Error ? e.message : String(e)}\n`);
    return 2;
  }
}

function dispatch(argv: string[], io: Io): number {
  if (argv.length === 0) throw new UsageError("no command given; try 'eigenspan --help'");
  const [cmd, ...rest] = argv;
  if (cmd === '--help' || cmd === '-h' || cmd === 'help') {
    io.out(USAGE);
    return 0;
  }
  switch (cmd) {
    case 'expand':
      return expand(rest, io);
    case 'check':
      return check(rest, io);
    case 'demo':
      return demo(rest, io);
    default:
      throw new UsageError(`unknown command '${cmd}'; try 'eigenspan --help'`);
  }
}

function readText(path: string, maxFileBytes = DEFAULT_LIMITS.maxFileBytes): string {
  let st;
  try {
    st = statSync(path);
  } catch {
    throw new UsageError(`cannot read '${path}': no such file`);
  }
  if (st.isDirectory()) throw new UsageError(`'${path}' is a folder, not a file`);
  if (st.size > maxFileBytes * 4) throw new UsageError(`'${path}' is ${st.size} bytes, too large for a .qstate file`);
  try {
    return readFileSync(path, 'utf8');
  } catch (e) {
    throw new UsageError(`cannot read '${path}': ${(e as NodeJS.ErrnoException).code ?? 'error'}`);
  }
}

/** `analyse` with the quick stage's suggestion allowance sized by the text (see language/meter.ts). */
function analyseBounded(text: string, options: AnalyseOptions = {}): AnalysisResult {
  return withQuickStage({ textLength: text.length }, () => analyse(text, options));
}

function expand(args: string[], io: Io): number {
  let format: 'json' | 'table' | 'csv' = 'table';
  let file: string | null = null;
  let basis: number | undefined;
  let outPath: string | null = null;
  let force = false;
  const limits: Partial<Limits> = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === '--out') {
      const p = args[++i];
      if (p === undefined || p.startsWith('-')) throw new UsageError('--out needs a file path');
      outPath = p;
    } else if (a === '--force') force = true;
    else if (a === '--time-limit') limits.maxMillis = timeLimit(args[++i]);
    else if (a === '--limit') limitOption(args[++i], limits);
    else if (a === '--json') format = 'json';
    else if (a === '--table') format = 'table';
    else if (a === '--csv') format = 'csv';
    else if (a === '--basis') {
      const v = Number(args[++i]);
      if (!Number.isInteger(v) || v < 1) throw new UsageError('--basis needs a whole number of levels');
      basis = v;
    } else if (a.startsWith('-')) throw new UsageError(`unknown option '${a}' for expand`);
    else if (file === null) file = a;
    else throw new UsageError('expand takes one file');
  }
  if (file === null) throw new UsageError('expand needs a file');
  // Refuse to replace an existing export before doing any work; --force says the user means it.
  if (outPath !== null && !force && existsSync(outPath)) throw new UsageError(`'${outPath}' exists; add --force to overwrite it`);
  const text = readText(file, limits.maxFileBytes);
  const result = analyseBounded(text, { defaultBasis: basis, limits });
  const rendered = format === 'json' ? renderJson(result, text) + '\n' : format === 'csv' ? renderCsv(result) : renderTable(result, text, file);
  if (outPath !== null) {
    try {
      writeFileSync(outPath, rendered, { flag: force ? 'w' : 'wx' });
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      throw new UsageError(code === 'EEXIST' ? `'${outPath}' exists; add --force to overwrite it` : `cannot write '${outPath}': ${code ?? 'error'}`);
    }
  } else io.out(rendered);
  return result.diagnostics.some((d) => d.severity === 'error') ? 1 : 0;
}

function collect(path: string, into: string[], problems: { path: string; message: string }[]): void {
  let st;
  try {
    st = statSync(path);
  } catch {
    problems.push({ path, message: 'no such file or folder' });
    return;
  }
  if (st.isDirectory()) {
    let names: string[];
    try {
      names = readdirSync(path).sort();
    } catch {
      problems.push({ path, message: 'cannot list the folder' });
      return;
    }
    for (const n of names) {
      if (n === 'node_modules' || n.startsWith('.')) continue;
      const p = join(path, n);
      let s;
      try {
        s = statSync(p);
      } catch {
        // A dangling link or an entry that cannot be examined: report it and go on with the rest.
        if (n.endsWith('.qstate')) problems.push({ path: p, message: 'a broken link or an entry that cannot be examined' });
        continue;
      }
      if (s.isDirectory()) collect(p, into, problems);
      else if (n.endsWith('.qstate')) into.push(p);
    }
  } else into.push(path);
}

function check(args: string[], io: Io): number {
  const targets: string[] = [];
  const limits: Partial<Limits> = {};
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === '--time-limit') limits.maxMillis = timeLimit(args[++i]);
    else if (a === '--limit') limitOption(args[++i], limits);
    else if (a.startsWith('-')) throw new UsageError(`unknown option '${a}' for check`);
    else targets.push(a);
  }
  if (targets.length === 0) throw new UsageError('check needs at least one file or folder');
  const files: string[] = [];
  const problems: { path: string; message: string }[] = [];
  for (const t of targets) collect(t, files, problems);
  let failed = problems.length > 0;
  for (const p of problems) io.out(`${p.path}:1:1: error[limits]: Cannot check it: ${p.message}.\n`);
  files.forEach((f, i) => {
    if (io.isTTY && files.length > 3) io.err(`\r[${i + 1}/${files.length}] ${f}\x1b[K`);
    let text: string;
    try {
      const st = statSync(f);
      const maxBytes = limits.maxFileBytes ?? DEFAULT_LIMITS.maxFileBytes;
      if (st.size > maxBytes) {
        io.out(`${f}:1:1: error[limits]: The file is ${st.size} bytes, above the limit of ${maxBytes}.\n`);
        failed = true;
        return;
      }
      const buf = readFileSync(f);
      if (buf.includes(0)) {
        io.out(`${f}:1:1: error[syntax]: The file is binary, not a .qstate text file.\n`);
        failed = true;
        return;
      }
      text = buf.toString('utf8');
    } catch (e) {
      io.out(`${f}:1:1: error[limits]: Cannot read the file (${(e as NodeJS.ErrnoException).code ?? 'error'}).\n`);
      failed = true;
      return;
    }
    const result = analyseBounded(text, { limits });
    const lines = lineTable(text);
    for (const d of result.diagnostics) {
      io.out(renderDiagnostic(f, d, lines) + '\n');
      if (d.severity === 'error') failed = true;
    }
  });
  if (io.isTTY && files.length > 3) io.err(`\r\x1b[K`);
  return failed ? 1 : 0;
}

function demo(args: string[], io: Io): number {
  const folder = args[0] ?? 'examples';
  const files: string[] = [];
  const problems: { path: string; message: string }[] = [];
  collect(folder, files, problems);
  if (problems.length > 0) throw new UsageError(`cannot read '${folder}'`);
  if (files.length === 0) throw new UsageError(`no .qstate files in '${folder}'`);
  let failed = false;
  for (const f of files) {
    const text = readText(f);
    const result = analyseBounded(text);
    io.out(renderTable(result, text, relative(process.cwd(), f) || f));
    io.out('\n');
    if (result.diagnostics.some((d) => d.severity === 'error')) failed = true;
  }
  return failed ? 1 : 0;
}

if (require.main === module) {
  const code = run(process.argv.slice(2), {
    out: (s) => process.stdout.write(s),
    err: (s) => process.stderr.write(s),
    isTTY: Boolean(process.stderr.isTTY),
  });
  process.exitCode = code;
}
