/**
 * The findings of a sweep: on the sweep line, the values where the setup is invalid or the analysis
 * warns, and a sweep cut short by its budget (how many points finished, with a coarser step offered);
 * on each `expect window` line, whether the design window covers the range it names.
 */
import { diagnostic, type Code, type EngineDiagnostic } from '../../language/catalogue';
import { fmt, plural, replaceFix } from '../findings';
import type { PointOutcome } from './point';
import type { SweepResult, SweepWindow } from './types';
import type { SweepJob } from './index';
import { displayOf } from './display';

/** What the findings are worded from. */
export interface FindingInput {
  job: SweepJob;
  outcomes: (PointOutcome | null)[];
  result: SweepResult;
  limitMs: number;
}

/** Values listed in one finding at most. */
const LISTED = 4;

/** Every finding of the sweep. */
export function sweepFindings(input: FindingInput): EngineDiagnostic[] {
  return [...stopFindings(input), ...pointFindings(input), ...windowFindings(input)];
}

function withUnit(v: number, unit: string | null): string {
  return unit === null ? fmt(v) : `${fmt(v)} ${unit}`;
}

/** `width = 4 nm` or `(width, depth) = (4 nm, 2 meV)` for one point. */
function pointLabel(r: SweepResult, at: number[]): string {
  const parts = r.axes.map((a, k) => withUnit(at[k]!, a.unit));
  return r.axes.length === 1 ? `${r.axes[0]!.name} = ${parts[0]}` : `(${r.axes.map((a) => a.name).join(', ')}) = (${parts.join(', ')})`;
}

/** A list of points: consecutive runs of a one-parameter sweep as "A to B". */
function pointsText(r: SweepResult, ks: number[]): string {
  const at = (k: number): number[] => r.points[k]!.at;
  const runs: [number, number][] = [];
  for (const k of ks) {
    const last = runs[runs.length - 1];
    if (r.axes.length === 1 && last && last[1] === k - 1) last[1] = k;
    else runs.push([k, k]);
  }
  const words = runs.slice(0, LISTED).map(([a, b]) => (a === b ? pointLabel(r, at(a)) : `${pointLabel(r, at(a))} to ${withUnit(at(b)[0]!, r.axes[0]!.unit)}`));
  return words.join(', ') + (runs.length > LISTED ? ` and ${runs.length - LISTED} more` : '');
}

/** One finding per code met at some points: invalid setups (errors) and warnings, with the values. */
function pointFindings(input: FindingInput): EngineDiagnostic[] {
  const { job, outcomes, result } = input;
  const byCode = new Map<string, { ks: number[]; message: string; error: boolean }>();
  outcomes.forEach((o, k) => {
    if (!o) return;
    for (const n of o.notes) {
      const error = !o.point.valid && o.point.problem === n.message;
      const entry = byCode.get(n.code) ?? { ks: [], message: n.message, error };
      entry.ks.push(k);
      entry.error ||= error;
      byCode.set(n.code, entry);
    }
  });
  const at = job.setting.axes[0]!.stmt.span;
  const out: EngineDiagnostic[] = [];
  for (const [code, e] of byCode) {
    // A warning at every point is the analysis's own finding at the let's value too.
    if (!e.error && e.ks.length === result.finished) continue;
    const share = e.ks.length === result.finished ? `at all ${result.finished} points` : `at ${e.ks.length} of ${result.finished} points`;
    const head = e.error ? `The setup is invalid ${share} of the sweep` : `The analysis warns (${code}) ${share} of the sweep`;
    const text = `${head}: ${pointsText(result, e.ks)}. At ${pointLabel(result, result.points[e.ks[0]!]!.at)}: ${e.message}`;
    // A warning even for invalid points: a sweep may explore past the valid range; the other points stand.
    out.push(diagnostic(code as Code, at.start, at.end, text, { severity: 'warning' }));
  }
  return out;
}

/** A sweep cut short: the points finished, the range they cover, and a coarser step as a quick fix. */
function stopFindings(input: FindingInput): EngineDiagnostic[] {
  const { job, result } = input;
  if (result.stopped === null) return [];
  const axes = job.setting.axes;
  const at = axes[0]!.stmt.span;
  if (result.stopped === 'cancelled') {
    return [diagnostic('limits', at.start, at.end, `The sweep was cancelled after ${result.finished} of ${result.total} points.`, { severity: 'info' })];
  }
  if (result.finished === result.total) {
    return [diagnostic('limits', at.start, at.end, `The sweep's time limit of ${input.limitMs} ms ran out while refining between points; located changes may be coarser than usual.${SWEEP_HINT}`, { severity: 'warning' })];
  }
  // Fewer points in the same time: each axis shrunk by the same factor.
  const scale = Math.pow(Math.max(result.finished, 1) / result.total, 1 / axes.length);
  const fixes = axes.map((a) => {
    const steps = Math.max(1, Math.floor((a.steps + 1) * scale * 0.9) - 1);
    return { axis: a, steps };
  });
  const offer = fixes.map((f) => `steps ${f.steps}${axes.length > 1 ? ` for '${f.axis.spec.name}'` : ''}`).join(' and ');
  const text = `The sweep finished ${result.finished} of ${plural(result.total, 'point')} within its time limit of ${input.limitMs} ms; the results are partial${partialWindowText(input)}. A coarser step (${offer}) would fit.${SWEEP_HINT}`;
  return [
    diagnostic('limits', at.start, at.end, text, {
      severity: 'warning',
      fixes: fixes.map((f) => replaceFix(`Sweep '${f.axis.spec.name}' in ${f.steps} steps`, f.axis.spec.steps, String(f.steps))),
    }),
  ];
}

/** `; over the points that finished, every expect holds for ...` (nothing without expect lines). */
function partialWindowText(input: FindingInput): string {
  const { job, result } = input;
  if (job.setting.expects.length === 0) return '';
  const unit = result.axes[0]!.unit;
  const at = (w: SweepWindow): string => `${withUnit(w.from, unit)}..${withUnit(w.to, unit)}${w.row === null ? '' : ` at ${result.axes[1]!.name} = ${withUnit(w.row, result.axes[1]!.unit)}`}`;
  const ws = result.windows;
  if (ws.length === 0) return '; no finished point satisfies every expect';
  const listed = ws.slice(0, LISTED).map(at).join(', ') + (ws.length > LISTED ? ` and ${ws.length - LISTED} more` : '');
  return `; over the points that finished, every expect holds for ${result.axes[0]!.name} = ${listed}`;
}

const SWEEP_HINT = ' The sweep time limit is the editor setting `eigenspan.sweepTimeLimitMs` and `--sweep-time-limit MS` on the command line.';

/** Each `expect window covers A..B`: every row's window must hold the range. */
function windowFindings(input: FindingInput): EngineDiagnostic[] {
  const { job, result } = input;
  const out: EngineDiagnostic[] = [];
  const show = displayOf(job, 0);
  const unit = result.axes[0]!.unit;
  for (const w of job.windows) {
    const [a, b] = [show(w.from), show(w.to)];
    const range = `${withUnit(a, unit)}..${withUnit(b, unit)}`;
    const span = w.stmt.span;
    const rows = result.axes.length > 1 ? result.axes[1]!.values : [null];
    const missing = rows.filter((row) => !result.windows.some((x) => x.row === row && covers(x, a, b)));
    if (missing.length === 0) continue;
    // Stopped short: a window of finished points that covers the range settles it, and so does a
    // finished point inside the range where some expect fails; otherwise it cannot be judged.
    if (result.stopped !== null && !failsInside(result, a, b)) {
      out.push(diagnostic('expect', span.start, span.end, `Expected the design window to cover ${range}, but the sweep stopped after ${result.finished} of ${result.total} points, so it cannot be judged.`));
      continue;
    }
    const row = missing[0]!;
    const mine = result.windows.filter((x) => x.row === row);
    const where = row === null ? '' : ` at ${result.axes[1]!.name} = ${withUnit(row, result.axes[1]!.unit)}${missing.length > 1 ? ` (and ${missing.length - 1} more values)` : ''}`;
    const have = mine.length === 0 ? 'no swept value satisfies every expect' : `every expect holds for ${mine.map((x) => `${withUnit(x.from, unit)}..${withUnit(x.to, unit)}`).join(', ')}`;
    out.push(diagnostic('expect', span.start, span.end, `Expected the design window to cover ${range}${where}; ${have}.`));
  }
  return out;
}

/** A finished point with its first swept value in [a, b] where the setup is invalid or an expect fails. */
function failsInside(r: SweepResult, a: number, b: number): boolean {
  return r.points.some((p) => p !== null && p.at[0]! >= a && p.at[0]! <= b && !(p.valid && p.expects.every(Boolean)));
}

function covers(w: SweepWindow, a: number, b: number): boolean {
  return w.from <= a && w.to >= b;
}
