/**
 * One point of a sweep: the file's model rebuilt with the swept `let` lines set to the point's values,
 * and the ordinary numerical stage run on it, under the sweep's budget. The swept let's formula is
 * replaced by its range written in the sweep line's own terms (`(A) + ((B) - (A)) * (t)`, or
 * `(A) * ((B) / (A)) ^ (t)` for a logarithmic sweep), so units and dimensions are checked exactly as
 * for the let itself. The range uses only names defined before the let (plan.ts checks it).
 */
import { emptyResult } from '../emptyResult';
import type { ExprText, QFile, Statement } from '../../language/ast';
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import type { AnalysisResult } from '../types';
import type { Budget } from '../../physics/budget';
import { buildModel, type ExpectModel, type Model, type ModelOptions } from '../model';
import type { Limits } from '../options';
import { numericStage } from '../numeric';
import { evaluationFinding } from '../checks';
import { letValues } from '../values';
import type { PlannedAxis } from './plan';
import type { SweepPoint } from './types';
import { boundOf, type BoundGauge } from './bound';

/** Levels reported per point. */
export const POINT_LEVELS = 10;

/** What every point of one sweep shares. */
export interface SweepSetting {
  file: QFile;
  axes: PlannedAxis[];
  modelOptions: ModelOptions;
  limits: Limits;
  /** The ordinary `expect` statements (every expect but the window form), in file order. */
  expects: Statement[];
}

/** A point's numbers and, for the refinement, each expect's signed margin (>= 0 holds; null when it has none). */
export interface PointOutcome {
  point: SweepPoint;
  margins: (number | null)[];
  /** False when the budget ran out during the point (its numbers are incomplete and are dropped). */
  complete: boolean;
  /** The first message of each finding code at this point (errors and warnings but `expect`), for the sweep line's findings. */
  notes: { code: string; message: string }[];
  /** What the bound count steps on here (bound.ts), for the refinement; null without a count. */
  gauge: BoundGauge | null;
}

/** The swept let's replacement formula at fraction `t` of the axis (0 at `from`, 1 at `to`). */
function formulaAt(axis: PlannedAxis, t: number): ExprText {
  const a = `(${axis.spec.from.text})`;
  const b = `(${axis.spec.to.text})`;
  const text = axis.spacing === 'log' ? `${a} * (${b} / ${a}) ^ (${String(t)})` : `${a} + (${b} - ${a}) * (${String(t)})`;
  const at = axis.letStmt.expr;
  return { start: at.start, end: at.end, text: text.replace(/\s+/g, ' ') };
}

/** The file with each swept let set to its point value. */
function fileAt(s: SweepSetting, ts: readonly number[]): QFile {
  const swap = new Map<Statement, ExprText>();
  s.axes.forEach((axis, k) => swap.set(axis.letStmt, formulaAt(axis, ts[k]!)));
  const statements = s.file.statements.map((st) => {
    const e = swap.get(st);
    return e && st.kind === 'let' ? { ...st, expr: e } : st;
  });
  return { ...s.file, statements };
}

/**
 * Analyses the setup at fractions `ts` of the axes (one per axis), at grid index `index`. Never
 * throws: an error becomes an invalid point.
 */
export function evaluatePoint(s: SweepSetting, ts: readonly number[], index: number[], budget: Budget, systemOnly = false): PointOutcome {
  const file = fileAt(s, ts);
  const diags: EngineDiagnostic[] = [];
  const model = buildModel(file, s.modelOptions, diags);
  const values = letValues(model);
  const at = s.axes.map((axis) => values.find((v) => v.name === axis.spec.name)?.re ?? NaN);
  const point: SweepPoint = { index, at, valid: true, problem: null, findings: [], levels: [], captured: null, continuum: null, mean: null, spread: null, bound: null, expects: [] };
  const result = emptyResult(file, diags);
  const t0 = budget.clock.now();
  if (model.ok) {
    try {
      // Evolution is not part of a sweep's numbers.
      numericStage({ model: { ...model, evolve: null, state: systemOnly ? null : model.state }, file, ctx: { budget, limits: s.limits }, samples: false }, result);
    } catch (err) {
      const f = evaluationFinding(err, model);
      result.diagnostics.push(f ?? diagnostic('evaluation', 0, 0, `The analysis stopped on an internal error (${String(err)}).`, { severity: 'error' }));
    }
  }
  // A stage may also stop short of the deadline because its next step would end past it (the grid
  // refinement does): a limits finding from a point that used more than half the time left is that.
  const late = result.diagnostics.some((d) => d.code === 'limits') && 2 * (budget.clock.now() - t0) > budget.remaining();
  const complete = budget.reason === null && !late;
  const errors = result.diagnostics.filter((d) => d.severity === 'error' && d.code !== 'expect');
  if (errors.length > 0) {
    point.valid = false;
    point.problem = errors[0]!.message;
  }
  const notes = new Map<string, string>();
  for (const d of result.diagnostics) if (d.code !== 'expect' && d.severity !== 'info' && !notes.has(d.code)) notes.set(d.code, d.message);
  point.findings = [...new Set(result.diagnostics.filter((d) => d.severity === 'warning' && d.code !== 'expect').map((d) => d.code))].sort();
  let gauge: BoundGauge | null = null;
  if (point.valid) gauge = fillNumbers(point, result, model);
  const failed = new Set(result.diagnostics.filter((d) => d.code === 'expect').map((d) => d.start));
  const built = new Map(model.expects.map((x) => [x.stmt.span.start, x]));
  point.expects = s.expects.map((st) => point.valid && built.has(st.span.start) && !failed.has(st.span.start));
  const margins = s.expects.map((st) => {
    const x = built.get(st.span.start);
    return point.valid && x ? margin(x, result) : null;
  });
  return { point, margins, complete, notes: [...notes].map(([code, message]) => ({ code, message })), gauge };
}

/** Fills the point's numbers; returns the bound count's gauge. */
function fillNumbers(point: SweepPoint, result: AnalysisResult, model: Model): BoundGauge | null {
  point.levels = result.levels.slice(0, POINT_LEVELS).map((l) => ({ n: l.n, energy: l.energy, weight: l.weight }));
  point.captured = result.captured;
  point.continuum = result.continuum ?? null;
  point.mean = result.energy?.mean ?? null;
  point.spread = result.energy?.spread ?? null;
  const b = boundOf(result, model);
  point.bound = b.bound;
  return b.gauge;
}

/** Signed distance of the measured value from failing (>= 0 holds), for the expects that compare a number. */
function margin(x: ExpectModel, result: AnalysisResult): number | null {
  let measured: number | null = null;
  switch (x.kind) {
    case 'norm':
      measured = result.norm;
      break;
    case 'energy':
      measured = result.energy?.mean ?? null;
      break;
    case 'spread':
      measured = result.energy?.spread ?? null;
      break;
    case 'weight': {
      let sum = 0;
      for (const l of result.levels) if (l.n >= x.from && l.n <= x.to) sum += l.weight;
      measured = result.levels.length > 0 ? sum : null;
      break;
    }
    default:
      return null;
  }
  if (measured === null || !('comparison' in x)) return null;
  const c = x.comparison;
  if (c.kind === 'atLeast') return measured - c.value;
  if (c.kind === 'atMost') return c.value - measured;
  return c.tolerance - Math.abs(measured - c.value);
}
