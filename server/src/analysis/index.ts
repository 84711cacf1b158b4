/**
 * The one function every front end calls: text in, expansion and diagnostics out. This module only
 * orchestrates: the options and caps live in options.ts, the front (byte cap, parse, statement cap) in
 * front.ts, the model in model.ts, the numerical stage in numeric.ts (measure.ts measures, checks.ts
 * words), the untrusted pipeline in untrusted.ts. `analyseStatic` is the cheap stage (syntax, names,
 * units) run on every keystroke; `analyse` adds the numerics under one budget. Both are pure and never
 * throw.
 */
import { emptyResult } from './emptyResult';
import type { AnalysisResult } from './types';
import type { EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';
import { createBudget, SYSTEM_CLOCK } from '../physics/budget';
import { buildModel, type Model } from './model';
import { DEFAULT_BASIS, resolveLimits, type AnalyseOptions, type Limits } from './options';
import { internalError, readFile, sortDiagnostics } from './front';
import { analyseUntrusted } from './untrusted';
import { numericStage } from './numeric';
import { evaluationFinding } from './checks';
import { letValues } from './values';
import { warn } from './findings';
import { raiseHint } from '../shared/limits';
import { inQuickStage } from '../language/meter';
import { checkSweeps } from './sweep/plan';

export { DEFAULT_BASIS, DEFAULT_LIMITS, LIMIT_RANGES, readLimits, type AnalyseOptions, type Limits, type SettableLimit } from './options';
export { analyseUntrusted } from './untrusted';

interface StaticStage {
  file: QFile;
  diagnostics: EngineDiagnostic[];
  model: Model | null;
  limits: Limits;
}

function staticStage(text: string, options: AnalyseOptions, full = false): StaticStage {
  return inQuickStage(text.length, () => staticStageIn(text, options, full));
}

function staticStageIn(text: string, options: AnalyseOptions, full: boolean): StaticStage {
  const limits = resolveLimits(options);
  const read = readFile(text, limits);
  if (!read.parsed) return { file: read.file, diagnostics: read.diagnostics, model: null, limits };
  const model = buildModel(
    read.file,
    {
      defaultBasis: options.defaultBasis ?? DEFAULT_BASIS,
      maxBasis: limits.maxBasis,
      maxEvolveSteps: limits.maxEvolveSteps,
      maxExpressionLength: limits.maxExpressionLength,
      maxNesting: limits.maxNesting,
      // The quick stage reads no data files; the full analysis reports every path it was not given.
      data: options.data ?? (full ? new Map() : undefined),
      maxGridPoints: limits.maxGridPoints,
    },
    read.diagnostics,
  );
  // The sweep lines' names, dimensions and steps (the sweep itself runs in analysis/sweep/ when a front end asks).
  checkSweeps(read.file, model, read.diagnostics, { maxExpressionLength: limits.maxExpressionLength, maxNesting: limits.maxNesting });
  return { file: read.file, diagnostics: read.diagnostics, model, limits };
}

/**
 * Syntax, name and unit checks only: cheap enough to run on every keystroke. With `evaluate: false`
 * the untrusted pipeline runs (nothing evaluated). Never throws.
 */
export function analyseStatic(text: string, options: AnalyseOptions = {}): { file: QFile; diagnostics: EngineDiagnostic[] } {
  if (options.evaluate === false) return analyseUntrusted(text, options);
  try {
    const s = staticStage(text, options);
    return { file: s.file, diagnostics: sortDiagnostics(s.diagnostics) };
  } catch (err) {
    return { file: { text, statements: [] }, diagnostics: [internalError(err, text)] };
  }
}

/**
 * Parses, checks and expands a `.qstate` file under one budget (the time limit `maxMillis` on
 * `options.clock`, and `options.cancelled`). With `evaluate: false` only the untrusted pipeline runs.
 * Never throws.
 */
export function analyse(text: string, options: AnalyseOptions = {}): AnalysisResult {
  const clock = options.clock ?? SYSTEM_CLOCK;
  const started = clock.now();
  if (options.evaluate === false) {
    const u = analyseUntrusted(text, options);
    // Nothing is evaluated, so no `let` has a value to show.
    return { ...emptyResult(u.file, u.diagnostics), values: [], elapsedMs: clock.now() - started };
  }
  // The deadline runs from the start: the quick stage (parse, names, units, the model) is part of the
  // time the caller waits, and on a cold start (the formula parser's first use) it is not small.
  const budget = createBudget({ limitMs: resolveLimits(options).maxMillis, clock, cancelled: options.cancelled });
  let stage: StaticStage;
  try {
    stage = staticStage(text, options, true);
  } catch (err) {
    return { ...emptyResult(null, [internalError(err, text)]), elapsedMs: clock.now() - started };
  }
  const result = emptyResult(stage.file, stage.diagnostics);
  result.values = stage.model ? letValues(stage.model) : [];
  try {
    if (stage.model) numericStage({ model: stage.model, file: stage.file, ctx: { budget, limits: stage.limits }, samples: options.samples === true, plot: options.plot }, result);
  } catch (err) {
    result.diagnostics.push(evaluationFinding(err, stage.model) ?? internalError(err, text));
  }
  if (budget.reason === 'time') {
    const at = stage.model?.system?.stmt.keywordSpan ?? { start: 0, end: Math.min(1, text.length) };
    result.diagnostics.push(warn('limits', at, `The analysis took longer than the time limit of ${stage.limits.maxMillis} ms and was stopped; the results are incomplete.${raiseHint('time')}`));
  }
  result.diagnostics = sortDiagnostics(result.diagnostics);
  result.work = { ops: budget.work.ops, points: budget.work.points };
  result.elapsedMs = clock.now() - started;
  return result;
}
