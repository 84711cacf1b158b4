/**
 * Between the finished points of each row of the first axis (and, in a map, of each column of the
 * second): the located bound-count steps and `expect` flips (refine.ts), and the design window, the sub-ranges where every ordinary `expect` holds,
 * with ends at the located flips (on the side where they still hold).
 */
import type { Budget } from '../../physics/budget';
import { evaluatePoint, type PointOutcome } from './point';
import { boundSteps, expectFlip, REFINE_RELATIVE, type Closed, type Probe, type Refiner } from './refine';
import type { SweepLocated, SweepWindow } from './types';
import type { SweepJob } from './index';
import { displayOf } from './display';

/** Refinement probes per sweep at most (each is one point analysis). */
export const MAX_PROBES = 20_000;

/** What the refinement found. */
export interface Located {
  located: SweepLocated[];
  windows: SweepWindow[];
  probes: number;
  /** True when the budget or the probe allowance ran out before every bracket closed. */
  cut: boolean;
}

interface Flip {
  e: number;
  closed: Closed;
  /** The expect holds after the flip (in the sweep's direction). */
  up: boolean;
}

/** Refines every row and finds its windows. */
export function locateAll(job: SweepJob, outcomes: (PointOutcome | null)[], budget: Budget): Located {
  const axes = job.setting.axes;
  const n0 = axes[0]!.steps + 1;
  const rows = axes.length > 1 ? axes[1]!.steps + 1 : 1;
  const found: Located = { located: [], windows: [], probes: 0, cut: false };
  for (let j = 0; j < rows; j++) {
    const t1 = axes.length > 1 ? j / axes[1]!.steps : null;
    const row = t1 === null ? null : displayOf(job, 1)(axisValue(job, 1, t1));
    const probe = (t: number, systemOnly = false): PointOutcome | null => {
      if (found.probes >= MAX_PROBES || budget.expired()) {
        found.cut = true;
        return null;
      }
      found.probes++;
      const out = evaluatePoint(job.setting, t1 === null ? [t] : [t, t1], [], budget, systemOnly);
      return out.complete ? out : null;
    };
    const line = Array.from({ length: n0 }, (_, i) => outcomes[i + n0 * j] ?? null);
    locateRow(job, line, row, { probe, budget, axis: 0, minStep: minStepOf(job, 0), logAxis: axes[0]!.spacing === 'log' }, found);
  }
  if (axes.length > 1) locateColumns(job, outcomes, budget, found);
  if (budget.reason !== null) found.cut = true;
  return found;
}

/**
 * A map's second axis: in every column (the first axis's value fixed) the bound-count steps and expect
 * flips between neighbouring points, located along the second axis (`axis` 1, `row` the first axis's value).
 */
function locateColumns(job: SweepJob, outcomes: (PointOutcome | null)[], budget: Budget, found: Located): void {
  const [a0, a1] = [job.setting.axes[0]!, job.setting.axes[1]!];
  const n0 = a0.steps + 1;
  for (let i = 0; i < n0; i++) {
    const t0 = i / a0.steps;
    const col = displayOf(job, 0)(axisValue(job, 0, t0));
    const probe = (t: number, systemOnly = false): PointOutcome | null => {
      if (found.probes >= MAX_PROBES || budget.expired()) {
        found.cut = true;
        return null;
      }
      found.probes++;
      const out = evaluatePoint(job.setting, [t0, t], [], budget, systemOnly);
      return out.complete ? out : null;
    };
    const r: Refiner = { probe, budget, axis: 1, minStep: minStepOf(job, 1), logAxis: a1.spacing === 'log' };
    for (let j = 0; j < a1.steps; j++) {
      const a = outcomes[i + n0 * j] ?? null;
      const b = outcomes[i + n0 * (j + 1)] ?? null;
      if (!usable(a) || !usable(b)) continue;
      const lo: Probe = { t: j / a1.steps, out: a };
      const hi: Probe = { t: (j + 1) / a1.steps, out: b };
      for (const c of boundSteps(lo, hi, r)) {
        const [x, y] = span(c, 1);
        found.located.push({ kind: 'bound', axis: 1, at: 0.5 * (x + y), bracket: [x, y], before: c.lo.out.point.bound!, after: c.hi.out.point.bound!, row: col });
      }
      a.point.expects.forEach((va, e) => {
        if (va === b.point.expects[e]) return;
        const [x, y] = span(expectFlip(e, lo, hi, r), 1);
        found.located.push({ kind: 'expect', axis: 1, expect: e, at: 0.5 * (x + y), bracket: [x, y], before: va ? 1 : 0, after: va ? 0 : 1, row: col });
      });
    }
  }
}

function axisValue(job: SweepJob, k: number, t: number): number {
  const a = job.setting.axes[k]!;
  return a.spacing === 'log' ? a.from * Math.pow(a.to / a.from, t) : a.from + (a.to - a.from) * t;
}

/**
 * The fraction step near t that moves axis k's value by 0.4 of the closing width (`REFINE_RELATIVE` of
 * the value): d(ln v)/dt is ln(to / from) on a log axis and (to - from) / v on a linear one.
 */
function minStepOf(job: SweepJob, k: number): (t: number) => number {
  const a = job.setting.axes[k]!;
  return (t) => {
    const rate = a.spacing === 'log' ? Math.abs(Math.log(a.to / a.from)) : Math.abs(a.to - a.from) / Math.abs(a.from + (a.to - a.from) * t);
    return (0.4 * REFINE_RELATIVE) / rate;
  };
}

function usable(p: PointOutcome | null): p is PointOutcome {
  return p !== null && p.point.valid;
}

function holds(p: PointOutcome | null): boolean {
  return usable(p) && p.point.expects.every(Boolean);
}

function span(c: Closed, axis = 0): [number, number] {
  const a = c.lo.out.point.at[axis]!;
  const b = c.hi.out.point.at[axis]!;
  return a <= b ? [a, b] : [b, a];
}

/** One row: the located changes of each interval, then the windows. */
function locateRow(job: SweepJob, line: (PointOutcome | null)[], row: number | null, r: Refiner, found: Located): void {
  const steps = job.setting.axes[0]!.steps;
  const flips: Flip[][] = [];
  for (let i = 0; i + 1 < line.length; i++) {
    const a = line[i]!;
    const b = line[i + 1]!;
    flips.push([]);
    if (!usable(a) || !usable(b)) continue;
    const lo: Probe = { t: i / steps, out: a };
    const hi: Probe = { t: (i + 1) / steps, out: b };
    for (const c of boundSteps(lo, hi, r)) {
      const [x, y] = span(c);
      found.located.push({ kind: 'bound', axis: 0, at: 0.5 * (x + y), bracket: [x, y], before: c.lo.out.point.bound!, after: c.hi.out.point.bound!, row });
    }
    a.point.expects.forEach((va, e) => {
      if (va === b.point.expects[e]) return;
      const c = expectFlip(e, lo, hi, r);
      const [x, y] = span(c);
      found.located.push({ kind: 'expect', axis: 0, expect: e, at: 0.5 * (x + y), bracket: [x, y], before: va ? 1 : 0, after: va ? 0 : 1, row });
      flips[i]!.push({ e, closed: c, up: !va });
    });
  }
  found.windows.push(...windowsOf(line, flips, row, false));
}

/**
 * The windows of a sweep that stopped short: over the points that finished, row by row, with ends at
 * points (nothing is refined: the budget is spent) and marked partial; a point not reached ends a window.
 */
export function partialWindows(job: SweepJob, outcomes: (PointOutcome | null)[]): SweepWindow[] {
  const axes = job.setting.axes;
  const n0 = axes[0]!.steps + 1;
  const rows = axes.length > 1 ? axes[1]!.steps + 1 : 1;
  const out: SweepWindow[] = [];
  for (let j = 0; j < rows; j++) {
    const row = axes.length > 1 ? displayOf(job, 1)(axisValue(job, 1, j / axes[1]!.steps)) : null;
    const line = Array.from({ length: n0 }, (_, i) => outcomes[i + n0 * j] ?? null);
    out.push(...windowsOf(line, line.map(() => []), row, true));
  }
  return out;
}

/** The runs of points where every expect holds, with ends moved to the located flips. */
function windowsOf(line: (PointOutcome | null)[], flips: Flip[][], row: number | null, partial: boolean): SweepWindow[] {
  const out: SweepWindow[] = [];
  let start: { v: number; edge: boolean } | null = null;
  for (let i = 0; i < line.length; i++) {
    const p = line[i]!;
    const ok = holds(p);
    if (ok && start === null) {
      // Entering: the last of the flips up in the interval before (all must hold), on its holding side.
      const ups = i > 0 ? flips[i - 1]!.filter((f) => f.up) : [];
      const last = ups.sort((x, y) => y.closed.hi.t - x.closed.hi.t)[0];
      start = { v: last && holds(line[i - 1] ?? null) === false && ups.length === failing(line[i - 1] ?? null) ? last.closed.hi.out.point.at[0]! : p!.point.at[0]!, edge: i === 0 };
    }
    if (ok && (i + 1 === line.length || !holds(line[i + 1] ?? null))) {
      const downs = i + 1 < line.length ? flips[i]!.filter((f) => !f.up) : [];
      const first = downs.sort((x, y) => x.closed.lo.t - y.closed.lo.t)[0];
      const end = first ? first.closed.lo.out.point.at[0]! : p!.point.at[0]!;
      const edge = i + 1 === line.length;
      const lowFirst = start!.v <= end;
      out.push({ from: lowFirst ? start!.v : end, to: lowFirst ? end : start!.v, fromEdge: lowFirst ? start!.edge : edge, toEdge: lowFirst ? edge : start!.edge, row, partial });
      start = null;
    }
  }
  return out;
}

/** How many expects fail at a valid point (Infinity at an invalid one, so no flip can explain it). */
function failing(p: PointOutcome | null): number {
  return usable(p) ? p.point.expects.filter((x) => !x).length : Infinity;
}
