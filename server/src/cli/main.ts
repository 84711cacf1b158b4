/**
 * The command line: a thin front end over `analyse`.
 *
 *   eigenspan expand FILE [--json | --table | --csv] [--basis N] [--out PATH [--force]] [--samples PATH [--points N]]
 *                    [--time-limit MS] [--limit NAME=N]...
 *   eigenspan check FILE|FOLDER... [--sarif PATH] [--junit PATH] [--force] [--time-limit MS] [--limit NAME=N]...
 *   eigenspan diff OLD NEW | FILE --rev REV [--tolerance T]
 *   eigenspan summary FILE
 *   eigenspan plot FILE [--view spectrum|state|time|sweep] [--svg PATH] [--png PATH] [--width W] [--height H] ...
 *   eigenspan demo [FOLDER]
 *   eigenspan sweep FILE [--table | --csv | --json] [--sweep-time-limit MS] [--threads N] (sweep.ts)
 *
 * Exit codes: 0 fine, 1 an error or failed `expect` was found, 2 usage error (bad flag, missing file).
 */
import { relative } from 'node:path';
import { DEFAULT_LIMITS, LIMIT_RANGES, type Limits } from '../analysis/index';
import { check, findQstateFiles } from './check';
import { escapeJson, escapeLines, escapeText } from './escape';
import { assertWritable, outPathOption, writeOutput } from './outfile';
import { limitOption, sweepTimeLimit, timeLimit, UsageError, type Io } from './options';
import { readText } from './readtext';
import { analyseFile, takeDataOption } from './data';
import { EXPORT_POINTS, exportGrid, pointsOption, renderSamplesCsv } from './export';
import { renderCsv, renderJson, renderTable } from './render';
import { DEFAULT_TOLERANCE } from './diff';
import { diff, summary } from './vcs';
import { sweepCommand } from './sweep';
import { serveSweepWorker, sweepCommandThreaded } from './sweepThreads';
import { renderSweepSummary } from './sweepRender';
import { PLOT_DEFAULT_SIZE, PLOT_SIZE_RANGE, plot } from './plot';

const USAGE = `Usage:
  eigenspan expand FILE [--json | --table | --csv] [--basis N] [--out PATH [--force]]
                   [--time-limit MS] [--sweep-time-limit MS] [--limit NAME=N]...
      Expand the state of FILE in its system's energy eigenbasis.
      --json   one JSON object (levels, norm, captured, energy, parity, continuum, diagnostics)
      --table  a readable table (the default)
      --csv    one row a level: n, energy, re, im, weight, after a comment line naming the energy unit
      --csv-bare  the same without the comment line
      --samples PATH  also write the normalised state and its expansion on a grid as CSV
                 (x, re, im, re_expansion, im_expansion) to PATH; never replaces an existing
                 PATH unless --force is given
      --points N  points of that grid (default 1000)
      --basis N  levels to use when the file has no basis line (default 40)
      --out PATH write the output to PATH instead of the terminal; an existing PATH is
                 never replaced unless --force is given
      --time-limit MS  stop the analysis after MS milliseconds with a limits finding
                 and partial results (default 10000)
      --limit NAME=N   raise or lower one cap (repeatable); NAME and its range:
${Object.entries(LIMIT_RANGES).map(([k, [lo, hi]]) => `                 ${k.padEnd(20)}${String(DEFAULT_LIMITS[k as keyof Limits]).padStart(8)} (${lo} to ${hi})`).join('\n')}
  eigenspan check FILE|FOLDER... [--sarif PATH] [--junit PATH] [--force]
                  [--time-limit MS] [--sweep-time-limit MS] [--limit NAME=N]...
      Print every finding as FILE:LINE:COL: SEVERITY[CODE]: MESSAGE, one a line, and a
      summary line (files, errors, warnings) on standard error. Folders are searched for
      .qstate files; links are followed only inside the folder, and anything that is not a
      regular file is skipped with a warning. Exit 1 when an error or a failed expect is found.
      --sarif PATH  also write the findings as a SARIF 2.1.0 log to PATH
      --junit PATH  also write JUnit XML to PATH: each expect line a test case, each other
                    error a failing one; both options may be given, and neither replaces an
                    existing file unless --force is given
  eigenspan diff OLD NEW [--tolerance T] | eigenspan diff FILE --rev REV [--tolerance T]
      Print what changed in the physics from OLD to NEW (or from FILE at git revision REV to
      FILE now): level populations and energies, captured weight, energy mean and spread,
      parity, and findings that appeared (+) or disappeared (-). Exit 1 when anything changed.
      --tolerance T  weights count as changed beyond T (absolute), energies beyond T
                 relative (default ${DEFAULT_TOLERANCE})
  eigenspan summary FILE
      Print the physics of FILE as stable, rounded lines, for git's textconv (README.md).
  eigenspan plot FILE [--view spectrum|state|time|sweep] [--svg PATH] [--png PATH] [--force]
                 [--width W] [--height H] [--theme light|dark] [--scale auto|linear|log]
                 [--axis n|energy] [--terms K] [--step S] [--basis N] [--time-limit MS]
                 [--limit NAME=N]... [--quantity Q]
      Draw one of the panel's views as a picture, without a browser: the spectrum (default),
      the state, the time evolution, or the sweep of a file with a sweep. The panel's notes on
      the view go to standard error. Without --svg or --png the SVG goes to standard output.
      --svg PATH, --png PATH  write the picture as SVG or PNG (both may be given); an existing
                 file is not replaced unless --force is given
      --width W, --height H  size in pixels (default ${PLOT_DEFAULT_SIZE.width} x ${PLOT_DEFAULT_SIZE.height}; width ${PLOT_SIZE_RANGE.width[0]} to ${PLOT_SIZE_RANGE.width[1]},
                 height ${PLOT_SIZE_RANGE.height[0]} to ${PLOT_SIZE_RANGE.height[1]})
      --theme    light (default) or dark colours
      --scale, --axis, --terms  the spectrum's vertical scale, its horizontal axis (level
                 number or energy) and the levels K of the partial sum, as in the panel
      --step S   the evolve step the time view shows |psi(x,t)|^2 at (default 0, t = 0)
      --quantity Q  what the sweep view draws: overview (default), captured, continuum,
                 populations, energies, energy or bound; two sweep lines give a map of it
  eigenspan demo [FOLDER]
      Analyse every .qstate file in FOLDER (default examples) and print each one's table
      (and, for a file with a sweep, a short summary: its points, located changes and window).
  eigenspan sweep FILE [--table | --csv | --csv-bare | --json] [--basis N] [--out PATH [--force]]
                  [--time-limit MS] [--sweep-time-limit MS] [--limit NAME=N]... [--threads N]
      Run the sweep of FILE (its sweep lines) and print one line a point: bound levels,
      captured weight, energy mean and spread, the lowest populations and each expect's
      verdict, then the bound-level steps and expect flips located between points and the
      design window. --csv prints one row a point, --json the object of expand --json with
      its sweep field. Exit 1 when an error or a failed expect (the window's too) is found.
      --sweep-time-limit MS  time for the whole sweep (default 60000); a sweep cut short
                 keeps the points finished and offers a coarser step
      --threads N  worker threads for points whose system changes (default 2)
  eigenspan --help
      Show this text.
  Every command takes --no-data: the data files a state names (samples("PATH")) are then
  refused, not read (for checkouts you do not trust). Without it they are read only from the
  .qstate file's folder and below: relative paths, regular files, at most 8 MiB.
`;

/** Runs the command line with `argv` (without node and the script); returns the exit code. */
export function run(argv: string[], io: Io): number {
  // Everything printed passes one escaping funnel; only the progress line of a terminal goes raw.
  const safe: Io = { out: (t) => io.out(escapeLines(t)), err: (t) => io.err(escapeLines(t)), isTTY: io.isTTY };
  return runSafe(argv, safe, io.err);
}

function runSafe(argv: string[], io: Io, raw: (s: string) => void, thrown?: unknown): number {
  try {
    if (thrown !== undefined) throw thrown;
    return dispatch(argv, io, raw);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`eigenspan: ${escapeText(e.message)}\n`);
      return 2;
    }
    io.err(`eigenspan: internal error: ${escapeText(e instanceof Error ? e.message : String(e))}\n`);
    return 2;
  }
}

function dispatch(argv: string[], io: Io, raw: (s: string) => void): number {
  if (argv.length === 0) throw new UsageError("no command given; try 'eigenspan --help'");
  const [cmd, ...given] = argv;
  const rest = takeDataOption(given);
  if (cmd === '--help' || cmd === '-h' || cmd === 'help') {
    io.out(USAGE);
    return 0;
  }
  switch (cmd) {
    case 'expand':
      return expand(rest, io);
    case 'check':
      return check(rest, io, raw);
    case 'demo':
      return demo(rest, io);
    case 'summary':
      return summary(rest, io);
    case 'diff':
      return diff(rest, io);
    case 'sweep':
      return sweepCommand(rest, io);
    case 'plot':
      return plot(rest, io);
    default:
      throw new UsageError(`unknown command '${cmd}'; try 'eigenspan --help'`);
  }
}

function expand(args: string[], io: Io): number {
  let format: 'json' | 'table' | 'csv' = 'table';
  let bare = false;
  let file: string | null = null;
  let basis: number | undefined;
  let outPath: string | null = null;
  let samplesPath: string | null = null;
  let points = EXPORT_POINTS;
  let force = false;
  const limits: Partial<Limits> = {};
  let sweepMillis: number | undefined;
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === '--sweep-time-limit') sweepMillis = sweepTimeLimit(args[++i]);
    else if (a === '--out') outPath = outPathOption('--out', args[++i]);
    else if (a === '--samples') samplesPath = outPathOption('--samples', args[++i]);
    else if (a === '--points') points = pointsOption(args[++i]);
    else if (a === '--force') force = true;
    else if (a === '--time-limit') limits.maxMillis = timeLimit(args[++i]);
    else if (a === '--limit') limitOption(args[++i], limits);
    else if (a === '--json') format = 'json';
    else if (a === '--table') format = 'table';
    else if (a === '--csv') format = 'csv';
    else if (a === '--csv-bare') {
      format = 'csv';
      bare = true;
    }
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
  if (outPath !== null) assertWritable(outPath, force);
  if (samplesPath !== null) {
    if (samplesPath === outPath) throw new UsageError('--out and --samples need different files');
    assertWritable(samplesPath, force);
  }
  const text = readText(file, limits.maxFileBytes);
  const plot = samplesPath === null ? {} : { samples: true, plot: exportGrid(points, limits.maxBasis ?? DEFAULT_LIMITS.maxBasis) };
  const result = analyseFile(file, text, { defaultBasis: basis, limits, ...plot }, { maxMillis: sweepMillis });
  if (samplesPath !== null) {
    const csv = renderSamplesCsv(result, escapeText(file));
    if (csv === null) io.err(`eigenspan: no samples written to '${escapeText(samplesPath)}': the state could not be expanded (see its findings).\n`);
    else writeOutput(samplesPath, escapeLines(csv), force);
  }
  const shown = escapeText(file);
  const rendered = format === 'json' ? escapeJson(renderJson(result, text)) + '\n' : format === 'csv' ? renderCsv(result, bare) : renderTable(result, text, shown);
  if (outPath !== null) writeOutput(outPath, escapeLines(rendered), force);
  else io.out(rendered);
  return result.diagnostics.some((d) => d.severity === 'error') ? 1 : 0;
}

function demo(args: string[], io: Io): number {
  const folder = args[0] ?? 'examples';
  const { files, refused } = findQstateFiles([folder]);
  if (refused.some((r) => r.path === folder)) throw new UsageError(`cannot read '${escapeText(folder)}'`);
  for (const r of refused) io.err(`eigenspan: not shown: ${escapeText(r.path)}: ${r.message}.\n`);
  if (files.length === 0) throw new UsageError(`no .qstate files in '${escapeText(folder)}'`);
  let failed = false;
  for (const f of files) {
    const text = readText(f);
    const result = analyseFile(f, text);
    io.out(renderTable(result, text, escapeText(relative(process.cwd(), f) || f)));
    if (result.sweep) io.out(renderSweepSummary(result.sweep));
    io.out('\n');
    if (result.diagnostics.some((d) => d.severity === 'error')) failed = true;
  }
  return failed ? 1 : 0;
}

if (require.main === module && !serveSweepWorker()) {
  const io: Io = {
    out: (s) => process.stdout.write(s),
    err: (s) => process.stderr.write(s),
    isTTY: Boolean(process.stderr.isTTY),
  };
  const argv = process.argv.slice(2);
  // A sweep spreads its points over worker threads started from this same script.
  if (argv[0] === 'sweep') {
    const safe: Io = { out: (t) => io.out(escapeLines(t)), err: (t) => io.err(escapeLines(t)), isTTY: io.isTTY };
    sweepCommandThreaded(argv.slice(1), safe, __filename).then(
      (code) => (process.exitCode = code),
      (e: unknown) => (process.exitCode = runSafe(['sweep', ...argv.slice(1)], safe, io.err, e)),
    );
  } else process.exitCode = run(argv, io);
}
