/**
 * Design sweeps: the engine's entry points. A sweep runs in three stages so a front end may spread the
 * points over threads of its own (the engine itself never starts one):
 *
 * 1. `prepareSweep(text, options)`: the file read, its model built and its `sweep` lines checked
 *    (plan.ts); null when the file has no valid sweep.
 * 2. `runPoints(job, indices, budget)`: any subset of the grid's points (point.ts), in the order given,
 *    until the budget runs out. Points depend only on the text and the caps, so any thread computes
 *    the same numbers.
 * 3. `finishSweep(job, outcomes, budget, stopped)`: refinement between neighbours (refine.ts), the
 *    design window and the sweep's findings (report.ts).
 *
 * `runSweep` runs all three in one thread; `analyseWithSweep` adds the sweep to `analyse`'s result.
 * The sweep has a budget of its own (`SweepOptions.maxMillis`, default `DEFAULT_SWEEP_MILLIS`),
 * separate from the per-keystroke time limit.
 */
import type { QFile, Statement } from '../../language/ast';
import type { EngineDiagnostic } from '../../language/catalogue';
import { createBudget, SYSTEM_CLOCK, type Budget, type Clock } from '../../physics/budget';
import { parseExpression } from '../../expr/sandbox';
import { forEachNode } from '../../expr/walk';
import { buildModel, type Model, type ModelOptions } from '../model';
import { DEFAULT_BASIS, resolveLimits, type AnalyseOptions } from '../options';
import { internalError, readFile, sortDiagnostics } from '../front';
import { analyse } from '../index';
import type { AnalysisResult } from '../types';
import { checkSweeps, type PlannedWindow } from './plan';
import { evaluatePoint, type PointOutcome, type SweepSetting } from './point';
import { locateAll, partialWindows } from './locate';
import { sweepFindings, type FindingInput } from './report';
import { displayOf, unitOf } from './display';
import { mergeSweepFindings } from './merge';
import type { SweepAxis, SweepPoint, SweepResult } from './types';

export type { SweepAxis, SweepExpect, SweepLocated, SweepPoint, SweepResult, SweepWindow } from './types';
export type { PointOutcome } from './point';
export { mergeSweepFindings } from './merge';

/** Default time limit of a whole sweep, in milliseconds. */
export const DEFAULT_SWEEP_MILLIS = 60_000;
/** Least and most a sweep's time limit may be set to (the editor setting and `--sweep-time-limit`). */
export const SWEEP_MILLIS_RANGE: readonly [number, number] = [100, 3_600_000];

/** Options of a sweep, with their defaults. */
export interface SweepOptions {
  /** Time for the whole sweep in milliseconds (default `DEFAULT_SWEEP_MILLIS`). */
  maxMillis?: number;
  /** The clock the time limit is measured on (default the machine's monotonic clock). */
  clock?: Clock;
  /** Polled with the time limit; true stops the sweep with the points finished. */
  cancelled?: () => boolean;
  /** Called after each point with the points finished so far, the total and the point (progress reports, partial results). */
  onPoint?: (finished: number, total: number, point: SweepPoint) => void;
}

/** A prepared sweep: what every stage needs. */
export interface SweepJob {
  setting: SweepSetting;
  model: Model;
  windows: PlannedWindow[];
  /** Points of the grid. */
  total: number;
  /** True when no swept name reaches the system, the mass or the basis size. */
  systemFixed: boolean;
}

/** The model options `analyse` uses, for a file's points. */
function modelOptions(options: AnalyseOptions): ModelOptions {
  const limits = resolveLimits(options);
  return {
    defaultBasis: options.defaultBasis ?? DEFAULT_BASIS,
    maxBasis: limits.maxBasis,
    maxEvolveSteps: limits.maxEvolveSteps,
    maxExpressionLength: limits.maxExpressionLength,
    maxNesting: limits.maxNesting,
    // Every point of a samples state reads the data files the front end handed in, as `analyse` does.
    data: options.data ?? new Map(),
    maxGridPoints: limits.maxGridPoints,
  };
}

/** Reads the file and checks its sweeps; null without a valid sweep. Never throws. */
export function prepareSweep(text: string, options: AnalyseOptions = {}): SweepJob | null {
  try {
    const limits = resolveLimits(options);
    const read = readFile(text, limits);
    if (!read.parsed) return null;
    const mo = modelOptions(options);
    const diags: EngineDiagnostic[] = [];
    const model = buildModel(read.file, mo, diags);
    const plan = checkSweeps(read.file, model, diags, mo);
    if (plan.axes.length === 0) return null;
    const expects = read.file.statements.filter((s) => s.kind === 'expect' && s.expectation.kind !== 'window');
    const setting: SweepSetting = { file: read.file, axes: plan.axes, modelOptions: mo, limits, expects };
    const total = plan.axes.reduce((n, a) => n * (a.steps + 1), 1);
    const swept = new Set(plan.axes.map((a) => a.spec.name));
    const systemFixed = ![...systemNames(read.file)].some((n) => swept.has(n));
    return { setting, model, windows: plan.windows, total, systemFixed };
  } catch {
    return null;
  }
}

/** The fractions along each axis and the grid index of point `k` (first axis fastest). */
export function pointAt(job: SweepJob, k: number): { ts: number[]; index: number[] } {
  const ts: number[] = [];
  const index: number[] = [];
  let rest = k;
  for (const a of job.setting.axes) {
    const i = rest % (a.steps + 1);
    rest = Math.floor(rest / (a.steps + 1));
    index.push(i);
    ts.push(i / a.steps);
  }
  return { ts, index };
}

/** Runs the points `indices` in order until the budget runs out; a point cut short is left out. */
export function runPoints(job: SweepJob, indices: readonly number[], budget: Budget, onPoint?: (k: number, out: PointOutcome) => void): { k: number; out: PointOutcome }[] {
  const done: { k: number; out: PointOutcome }[] = [];
  for (const k of indices) {
    if (budget.expired()) break;
    const { ts, index } = pointAt(job, k);
    const out = evaluatePoint(job.setting, ts, index, budget);
    if (!out.complete) break;
    done.push({ k, out });
    onPoint?.(k, out);
  }
  return done;
}

/**
 * Refines, finds the design window and words the findings, from the points finished (null for the
 * others). `stopped` says why points are missing.
 */
export function finishSweep(job: SweepJob, outcomes: (PointOutcome | null)[], budget: Budget, stopped: 'time' | 'cancelled' | null): { result: SweepResult; diagnostics: EngineDiagnostic[] } {
  // A sweep stopped short keeps a design window over the points that finished (marked partial).
  const located = stopped === null ? locateAll(job, outcomes, budget) : { located: [], windows: partialWindows(job, outcomes), probes: 0, cut: false };
  const cut = stopped ?? (located.cut ? (budget.reason ?? 'time') : null);
  const axes: SweepAxis[] = job.setting.axes.map((a, k) => axisOf(job, k, a.steps));
  const result: SweepResult = {
    axes,
    points: outcomes.map((o) => o?.point ?? null),
    expects: job.setting.expects.map((s) => ({ line: lineOf(job.setting.file, s.span.start), text: job.setting.file.text.slice(s.span.start, s.span.end).trim() })),
    located: located.located,
    windows: located.windows,
    systemFixed: job.systemFixed,
    finished: outcomes.filter((o) => o !== null).length,
    total: job.total,
    stopped: cut,
    probes: located.probes,
  };
  const input: FindingInput = { job, outcomes, result, limitMs: budget.limitMs };
  const diagnostics = sweepFindings(input);
  return { result, diagnostics };
}

/** The whole sweep in this thread; null when the file has no valid sweep. Never throws. */
export function runSweep(text: string, options: AnalyseOptions = {}, sweep: SweepOptions = {}): { result: SweepResult; diagnostics: EngineDiagnostic[] } | null {
  const job = prepareSweep(text, options);
  if (!job) return null;
  const budget = createBudget({ limitMs: sweep.maxMillis ?? DEFAULT_SWEEP_MILLIS, clock: sweep.clock ?? SYSTEM_CLOCK, cancelled: sweep.cancelled });
  const outcomes: (PointOutcome | null)[] = new Array(job.total).fill(null);
  let finished = 0;
  runPoints(job, [...Array(job.total).keys()], budget, (k, out) => {
    outcomes[k] = out;
    finished++;
    sweep.onPoint?.(finished, job.total, out.point);
  });
  const stopped = finished < job.total ? (budget.reason ?? 'time') : null;
  return finishSweep(job, outcomes, budget, stopped);
}

/**
 * `analyse` with the file's sweep: the result's documented fields keep the lets' own values; the sweep
 * goes in `result.sweep` and its findings (the sweep lines', the window expects') join the diagnostics.
 */
export function analyseWithSweep(text: string, options: AnalyseOptions = {}, sweep: SweepOptions = {}): AnalysisResult {
  const result = analyse(text, options);
  if (options.evaluate === false || !(result.file?.statements.some((s) => s.kind === 'sweep') ?? false)) return result;
  try {
    const s = runSweep(text, options, sweep);
    return s ? mergeSweep(result, s) : result;
  } catch (err) {
    // A bug in the sweep must not lose the analysis: it becomes one finding.
    result.diagnostics = sortDiagnostics([...result.diagnostics, internalError(err, text)]);
    return result;
  }
}

/** Adds a sweep's result and findings to an analysis result. */
export function mergeSweep(result: AnalysisResult, s: { result: SweepResult; diagnostics: EngineDiagnostic[] }): AnalysisResult {
  result.sweep = s.result;
  result.diagnostics = mergeSweepFindings(result.diagnostics, s.diagnostics);
  return result;
}

function axisOf(job: SweepJob, k: number, steps: number): SweepAxis {
  const a = job.setting.axes[k]!;
  const show = displayOf(job, k);
  const values: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const t = i / steps;
    values.push(show(a.spacing === 'log' ? a.from * Math.pow(a.to / a.from, t) : a.from + (a.to - a.from) * t));
  }
  return { name: a.spec.name, unit: unitOf(job, k), from: show(a.from), to: show(a.to), steps, spacing: a.spacing, values };
}

function lineOf(file: QFile, offset: number): number {
  let line = 1;
  for (let k = 0; k < offset && k < file.text.length; k++) if (file.text.charCodeAt(k) === 10) line++;
  return line;
}

/** The let names the system, the mass and the basis size use, directly or through other lets. */
function systemNames(file: QFile): Set<string> {
  const uses = new Map<string, Set<string>>();
  const roots = new Set<string>();
  const collect = (texts: { start: number; end: number; text: string }[], into: Set<string>): void => {
    for (const src of texts) {
      const p = parseExpression(src);
      if (p.result) forEachNode(p.result, (n) => (n.type === 'symbol' || n.type === 'call') && into.add(n.name));
    }
  };
  for (const s of file.statements) {
    if (s.kind === 'let') collect([s.expr], uses.set(s.name, new Set()).get(s.name)!);
    else collect(systemTexts(s), roots);
  }
  const seen = new Set<string>();
  const stack = [...roots];
  while (stack.length > 0) {
    const n = stack.pop()!;
    if (seen.has(n)) continue;
    seen.add(n);
    for (const m of uses.get(n) ?? []) stack.push(m);
  }
  return seen;
}

function systemTexts(s: Statement): { start: number; end: number; text: string }[] {
  if (s.kind === 'mass' || s.kind === 'basis') return [s.expr];
  if (s.kind !== 'system') return [];
  const sys = s.system;
  return sys.kind === 'potential' ? [sys.expr, sys.from, sys.to] : sys.args.map((a) => a.value);
}
