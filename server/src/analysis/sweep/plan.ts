/**
 * The static part of a sweep: every `sweep` line checked (a `let` name, a range of the let's own
 * dimension, a whole number of steps, at most two sweeps) and turned into axes in internal units, and
 * the design-window `expect` lines checked against the first axis. Cheap: it parses and folds the few
 * expressions of those lines, so the quick stage runs it on every keystroke.
 */
import type { QFile, Span, Statement, SweepSpec } from '../../language/ast';
import { diagnostic, type EngineDiagnostic } from '../../language/catalogue';
import type { Dimension, Scope } from '../../expr/types';
import { checkExpression } from '../../expr/check';
import { DEFAULT_PARSE_OPTIONS, parseExpression } from '../../expr/sandbox';
import { evaluateConstant } from '../../expr/compile';
import { createScope, sameDimension } from '../../expr/units';
import { positionAt, lineTable } from '../../language/positions';
import type { Model } from '../model';
import { capital, fmt } from '../findings';
import { sweepLineSlots, windowSlots, type SweepSlot } from '../slots';
import { lateNameFinding, notALetFinding } from './names';

/** Most steps one sweep line may take, and most points a sweep (one or two lines) may have. */
export const MAX_SWEEP_STEPS = 10_000;
export const MAX_SWEEP_POINTS = 40_000;
/** At most this many `sweep` lines (two give a map). */
export const MAX_SWEEPS = 2;

/** One checked axis, in internal units. */
export interface PlannedAxis {
  stmt: Extract<Statement, { kind: 'sweep' }>;
  spec: SweepSpec;
  /** The swept let's statement and dimension. */
  letStmt: Extract<Statement, { kind: 'let' }>;
  dimension: Dimension;
  from: number;
  to: number;
  steps: number;
  spacing: 'linear' | 'log';
}

/** A checked `expect window covers A..B` (internal units of the first axis). */
export interface PlannedWindow {
  stmt: Statement;
  from: number;
  to: number;
}

/** What the checks found: the axes (empty without a valid sweep) and the window expectations. */
export interface SweepPlanStatic {
  axes: PlannedAxis[];
  windows: PlannedWindow[];
}

/** Options of `checkSweeps`: the sandbox's caps. */
export interface SweepCheckOptions {
  maxExpressionLength?: number;
  maxNesting?: number;
}

/**
 * Checks the `sweep` lines and the window `expect` lines of `file` against `model` (for the lets'
 * values and dimensions); findings go to `out`. Axes come back only when every sweep line is valid.
 * Never throws.
 */
export function checkSweeps(file: QFile, model: Model, out: EngineDiagnostic[], options: SweepCheckOptions = {}): SweepPlanStatic {
  const sweeps = file.statements.filter((s): s is Extract<Statement, { kind: 'sweep' }> => s.kind === 'sweep');
  const windows = file.statements.filter((s) => s.kind === 'expect' && s.expectation.kind === 'window');
  const checker = new Checker(file, model, out, options);
  const axes: PlannedAxis[] = [];
  let ok = true;
  const seen = new Map<string, Span>();
  sweeps.forEach((stmt, k) => {
    if (k >= MAX_SWEEPS) {
      ok = false;
      return checker.error('name', stmt.keywordSpan, `At most ${MAX_SWEEPS} sweeps fit in one file (two give a map); this is sweep ${k + 1}.`);
    }
    const earlier = seen.get(stmt.sweep.name);
    if (earlier) {
      ok = false;
      return checker.error('name', stmt.sweep.nameSpan, `'${stmt.sweep.name}' is already swept on line ${checker.line(earlier.start)}.`);
    }
    seen.set(stmt.sweep.name, stmt.sweep.nameSpan);
    const axis = checker.axis(stmt);
    if (axis) axes.push(axis);
    else ok = false;
  });
  if (ok && axes.length === 2 && (axes[0]!.steps + 1) * (axes[1]!.steps + 1) > MAX_SWEEP_POINTS) {
    checker.error('limits', axes[1]!.spec.steps, `The two sweeps make ${(axes[0]!.steps + 1) * (axes[1]!.steps + 1)} points, more than the ${MAX_SWEEP_POINTS} a map may have.`);
    ok = false;
  }
  const planned: PlannedWindow[] = [];
  for (const w of windows) {
    const x = checker.window(w, ok ? axes[0] : undefined, sweeps.length > 0);
    if (x) planned.push(x);
  }
  return { axes: ok ? axes : [], windows: ok ? planned : [] };
}

class Checker {
  constructor(
    private readonly file: QFile,
    private readonly model: Model,
    private readonly out: EngineDiagnostic[],
    private readonly options: SweepCheckOptions,
  ) {}

  error(code: Parameters<typeof diagnostic>[0], span: Span, message: string): void {
    this.out.push(diagnostic(code, span.start, span.end, message, { severity: 'error' }));
  }

  line(offset: number): number {
    return positionAt(lineTable(this.file.text), offset).line + 1;
  }

  axis(stmt: Extract<Statement, { kind: 'sweep' }>): PlannedAxis | null {
    const spec = stmt.sweep;
    const letStmt = this.file.statements.find((s): s is Extract<Statement, { kind: 'let' }> => s.kind === 'let' && s.name === spec.name);
    const refused = this.file.rejected?.some((r) => r.keyword === 'let' && r.name === spec.name) ?? false;
    if (!letStmt) {
      if (refused) return null;
      this.out.push(notALetFinding(spec, this.file));
      return null;
    }
    const own = this.model.lets.get(spec.name);
    // The let's own line reports why it has no value.
    if (!own) return null;
    if (Math.abs(own.value.im) > 1e-12 * Math.max(1, Math.abs(own.value.re))) {
      this.error('evaluation', spec.nameSpan, `'${spec.name}' is complex; a sweep varies a real value.`);
      return null;
    }
    const scope = this.scopeBefore(letStmt.nameSpan.start);
    const [from, to, steps] = sweepLineSlots(spec, own.dimension, this.model.units).map((slot) => this.value(slot, scope, letStmt));
    if (from == null || to == null || steps == null) return null;
    if (!Number.isInteger(steps) || steps < 1 || steps > MAX_SWEEP_STEPS) {
      this.error(steps > MAX_SWEEP_STEPS ? 'limits' : 'evaluation', spec.steps, `The number of steps must be a whole number from 1 to ${MAX_SWEEP_STEPS}, not ${fmt(steps)}.`);
      return null;
    }
    if (from === to) {
      this.error('evaluation', { start: spec.from.start, end: spec.to.end }, `The sweep of '${spec.name}' starts and ends at the same value (${fmt(from)}); give two different values.`);
      return null;
    }
    if (spec.spacing === 'log' && !(from * to > 0)) {
      this.error('evaluation', spec.spacingSpan ?? stmt.keywordSpan, `A logarithmic sweep needs two values of one sign, not ${fmt(from)} and ${fmt(to)}.`);
      return null;
    }
    return { stmt, spec, letStmt, dimension: own.dimension, from, to, steps, spacing: spec.spacing };
  }

  window(stmt: Statement, axis: PlannedAxis | undefined, hasSweep: boolean): PlannedWindow | null {
    if (stmt.kind !== 'expect' || stmt.expectation.kind !== 'window') return null;
    const x = stmt.expectation;
    if (!hasSweep) {
      this.error('name', stmt.keywordSpan, "'expect window' judges a sweep, and the file has no `sweep` line.");
      return null;
    }
    if (!axis) return null;
    const scope = this.scopeBefore(axis.letStmt.nameSpan.start);
    const [from, to] = windowSlots(x, axis.spec.name, axis.dimension).map((slot) => this.value(slot, scope, axis.letStmt));
    if (from == null || to == null) return null;
    const [lo, hi] = [Math.min(axis.from, axis.to), Math.max(axis.from, axis.to)];
    if (!(from <= to)) {
      this.error('evaluation', x.rangeSpan, "The range's first value must not exceed its last.");
      return null;
    }
    if (from < lo || to > hi) {
      this.error('evaluation', x.rangeSpan, `The range reaches outside the sweep of '${axis.spec.name}' (${axis.spec.from.text.trim()} to ${axis.spec.to.text.trim()}, line ${this.line(axis.stmt.span.start)}), so it cannot be judged.`);
      return null;
    }
    return { stmt, from, to };
  }

  /** The scope holding the built-in names and the lets defined before `offset`. */
  private scopeBefore(offset: number): Scope {
    const scope = createScope(this.model.units);
    for (const [name, l] of this.model.lets) {
      if (l.span.start < offset) scope.values.set(name, { value: l.value, dimension: l.dimension, definedAt: l.span });
    }
    return scope;
  }

  /** A real constant of the slot's dimension (slots.ts), using only names defined before the swept let. */
  private value(slot: SweepSlot, scope: Scope, letStmt: Extract<Statement, { kind: 'let' }>): number | null {
    const { src, what } = slot;
    const p = parseExpression(src, { maxLength: this.options.maxExpressionLength ?? DEFAULT_PARSE_OPTIONS.maxLength, maxDepth: this.options.maxNesting ?? DEFAULT_PARSE_OPTIONS.maxDepth });
    if (!p.result) {
      this.out.push(...p.diagnostics);
      return null;
    }
    // A let defined at or after the swept one (or a let that is not in this scope for that reason).
    const late = lateNameFinding(p.result, (name) => !scope.values.has(name) && this.model.lets.has(name), what, letStmt.name, this.line(letStmt.span.start));
    if (late) {
      this.out.push(late);
      return null;
    }
    const v = evaluateConstant(p.result, scope);
    this.out.push(...v.diagnostics);
    if (!v.result) return null;
    if (!sameDimension(v.result.dimension, slot.dimension)) {
      // Worded by the checker, as every other slot's (and the untrusted pipeline's) mismatch.
      this.out.push(...checkExpression(p.result, scope, slot.dimension, what).diagnostics.filter((d) => d.code === 'units'));
      return null;
    }
    if (Math.abs(v.result.value.im) > 1e-12 * Math.max(1, Math.abs(v.result.value.re))) {
      this.error('evaluation', src, `${capital(what)} must be real.`);
      return null;
    }
    return v.result.value.re;
  }

}

