/**
 * `eigenspan plot FILE [--view V] [--svg PATH] [--png PATH] ...`: one of the panel's views as a picture,
 * for reports, papers and CI artefacts, without a browser or the editor.
 *
 * This module reads the options and runs the analysis (it is part of dist/cli.js); the drawing lives in
 * plotRender.ts, bundled apart as dist/plot.js and loaded only here, so `expand` and `check` never load
 * the chart library. The result reaches the chart builder exactly as the language server sends it to
 * the panel: without its syntax tree, through JSON, and checked by the panel's own message check.
 */
import type { Limits } from '../analysis/index';
import type { AnalysisResult } from '../analysis/types';
import { isPanelResult, type PanelResult } from '../../../client/src/messages';
import { invalidates } from '../../../client/webview/charts/facts';
import { DEFAULT_SIZE } from '../../../client/webview/charts/layout';
import { lineTable } from '../language/positions';
import { escapeLines, escapeText } from './escape';
import { analyseFile } from './data';
import { limitOption, timeLimit, UsageError, type Io } from './options';
import { assertWritable, outPathOption, writeOutput } from './outfile';
import { readText } from './readtext';
import { renderDiagnostic } from './render';
import type * as Render from './plotRender';
import { SWEEP_QUANTITIES, type SweepQuantity } from '../../../client/webview/charts/sweepQuantity';

/** The views `--view` takes: the panel's three, and the sweep of a `sweep` statement. */
export const PLOT_VIEWS = ['spectrum', 'state', 'time', 'sweep'] as const;
export type PlotView = (typeof PLOT_VIEWS)[number];

/** The picture's size in pixels when `--width` and `--height` are not given: the chart builder's default size. */
export const PLOT_DEFAULT_SIZE = DEFAULT_SIZE;
/** The sizes `--width` and `--height` accept: enough room for the legend, and a PNG of at most 64 MB in memory. */
export const PLOT_SIZE_RANGE = { width: [400, 4000], height: [300, 4000] } as const;

/** Everything `plot` was asked for. */
export interface PlotOptions {
  file: string;
  view: PlotView;
  svg: string | null;
  png: string | null;
  force: boolean;
  width: number;
  height: number;
  theme: 'light' | 'dark';
  scale: 'auto' | 'linear' | 'log';
  axis: 'n' | 'energy';
  terms: number | undefined;
  /** The evolve step the time view shows |psi(x, t)|^2 at (0: t = 0; past the last, the last). */
  step: number;
  basis: number | undefined;
  limits: Partial<Limits>;
  /** What the sweep view draws (`--quantity`, default the overview). */
  quantity: SweepQuantity;
}

function oneOf<T extends string>(option: string, value: string | undefined, allowed: readonly T[]): T {
  if (value === undefined || !(allowed as readonly string[]).includes(value)) throw new UsageError(`${option} takes one of ${allowed.join(', ')}`);
  return value as T;
}

function wholeNumber(option: string, value: string | undefined, [lo, hi]: readonly [number, number]): number {
  const v = Number(value);
  if (value === undefined || !Number.isInteger(v) || v < lo || v > hi) throw new UsageError(`${option} needs a whole number from ${lo} to ${hi}`);
  return v;
}

/** Reads the arguments of `plot`. */
export function plotOptions(args: string[]): PlotOptions {
  const o: Omit<PlotOptions, 'file'> & { file: string | null } = {
    file: null, view: 'spectrum', svg: null, png: null, force: false, ...PLOT_DEFAULT_SIZE,
    theme: 'light', scale: 'auto', axis: 'n', terms: undefined, step: 0, basis: undefined, limits: {}, quantity: 'overview',
  };
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === '--view') o.view = oneOf(a, args[++i], PLOT_VIEWS);
    else if (a === '--svg') o.svg = outPathOption(a, args[++i]);
    else if (a === '--png') o.png = outPathOption(a, args[++i]);
    else if (a === '--force') o.force = true;
    else if (a === '--width') o.width = wholeNumber(a, args[++i], PLOT_SIZE_RANGE.width);
    else if (a === '--height') o.height = wholeNumber(a, args[++i], PLOT_SIZE_RANGE.height);
    else if (a === '--theme') o.theme = oneOf(a, args[++i], ['light', 'dark'] as const);
    else if (a === '--scale') o.scale = oneOf(a, args[++i], ['auto', 'linear', 'log'] as const);
    else if (a === '--axis') o.axis = oneOf(a, args[++i], ['n', 'energy'] as const);
    else if (a === '--terms') o.terms = wholeNumber(a, args[++i], [1, 100_000]);
    else if (a === '--step') o.step = wholeNumber(a, args[++i], [0, 1_000_000]);
    else if (a === '--quantity') o.quantity = oneOf(a, args[++i], SWEEP_QUANTITIES);
    else if (a === '--basis') o.basis = wholeNumber(a, args[++i], [1, 100_000]);
    else if (a === '--time-limit') o.limits.maxMillis = timeLimit(args[++i]);
    else if (a === '--limit') limitOption(args[++i], o.limits);
    else if (a.startsWith('-')) throw new UsageError(`unknown option '${a}' for plot`);
    else if (o.file === null) o.file = a;
    else throw new UsageError('plot takes one file');
  }
  if (o.file === null) throw new UsageError('plot needs a file');
  if (o.svg !== null && o.svg === o.png) throw new UsageError('--svg and --png need different paths');
  return { ...o, file: o.file };
}

/** The drawing half (dist/plot.js beside dist/cli.js; scripts/build.mjs keeps it out of the command line's bundle). */
function renderer(): typeof Render {
  return require('./plotRender') as typeof Render;
}

/** The result as the panel receives it: without the syntax tree, through JSON (NaN becomes null). */
function asPanelResult(result: AnalysisResult): PanelResult {
  const { file: _file, ...rest } = result;
  const sent: unknown = JSON.parse(JSON.stringify(rest));
  if (!isPanelResult(sent)) throw new Error('the analysis result does not have the shape the panel draws');
  return sent;
}

/** Refuses, with a usage error, a sweep view of a file that has no sweep. */
function assertSweep(result: AnalysisResult, file: string): asserts result is AnalysisResult & { sweep: NonNullable<AnalysisResult['sweep']> } {
  if (!result.sweep) throw new UsageError(`'${file}' has no sweep, so it has no sweep view; try --view spectrum, state or time`);
}

/** Runs `eigenspan plot`; returns the exit code (1 when the file has errors, as `expand`). */
export function plot(args: string[], io: Io): number {
  const o = plotOptions(args);
  const shown = escapeText(o.file);
  // Refuse to replace an existing picture before doing any work; --force says the user means it.
  for (const p of [o.svg, o.png]) if (p !== null) assertWritable(p, o.force);
  const r = renderer();
  if (o.png !== null && !r.canRasterise()) throw new UsageError(`--png needs the package ${r.RASTERISER} (npm install ${r.RASTERISER}); --svg works without it`);
  const text = readText(o.file, o.limits.maxFileBytes);
  const samples = o.view === 'state' || o.view === 'time';
  const result = analyseFile(o.file, text, { defaultBasis: o.basis, limits: o.limits, samples });
  const failed = result.diagnostics.some((d) => d.severity === 'error');
  if (o.view === 'sweep') {
    assertSweep(result, shown);
    return emit(o, r.drawSweep(result.sweep, result.units.energy, { width: o.width, height: o.height, theme: o.theme, quantity: o.quantity }), shown, io, failed);
  }
  const panel = asPanelResult(result);
  if (invalidates(panel)) {
    // The panel shows the problems instead of plots in this case; so does the command line.
    if (!failed) throw new UsageError(`nothing to plot: '${shown}' gives no levels (it needs a system and a state)`);
    const lines = lineTable(text);
    for (const d of result.diagnostics.filter((x) => x.severity === 'error')) io.err(`${renderDiagnostic(shown, d, lines)}\n`);
    io.err(`eigenspan: nothing to plot: '${shown}' has errors that make its plots meaningless\n`);
    return 1;
  }
  const picture = r.drawView(panel, { view: o.view, width: o.width, height: o.height, theme: o.theme, scale: o.scale, axis: o.axis, terms: o.terms, step: o.step });
  return emit(o, picture, shown, io, failed);
}

/** Writes a drawn picture where the options say; returns the exit code. */
function emit(o: PlotOptions, picture: Render.Picture, shown: string, io: Io, failed: boolean): number {
  const r = renderer();
  if (picture.svg === null) throw new UsageError(`no ${o.view} view for '${shown}': ${picture.empty ?? 'nothing to plot'}`);
  for (const n of picture.notes) io.err(`note: ${n}\n`);
  if (o.png !== null) {
    const png = r.svgToPng(picture.svg);
    if (png === null) throw new Error(`${r.RASTERISER} could not be loaded`);
    writeOutput(o.png, png, o.force);
  }
  // Text from the file (a unit name) can reach the SVG; it passes the same escaping as everything printed.
  if (o.svg !== null) writeOutput(o.svg, escapeLines(picture.svg), o.force);
  if (o.svg === null && o.png === null) io.out(picture.svg.endsWith('\n') ? picture.svg : `${picture.svg}\n`);
  return failed ? 1 : 0;
}
