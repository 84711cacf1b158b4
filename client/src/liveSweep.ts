/**
 * A sweep as the panel draws it while its points arrive (`eigenspan/sweepPoint`) and after it ends
 * (`eigenspan/sweepResult`): checks of every sweep message that crosses to the panel, the frame of a
 * running sweep (its axes' names, units and step counts and its expect lines, read off the document's
 * sweep lines, since the points carry only values), and a provisional `SweepResult` built from the
 * frame and the points so far. Pure; shared by the extension host and the panel.
 */
import type { SweepAxis, SweepExpect, SweepPoint, SweepResult } from '../../server/src/analysis/sweep/types';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const isNum = (v: unknown): v is number | null => v === null || (typeof v === 'number' && !Number.isNaN(v));
const isFinite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const isNums = (v: unknown, max = 100_000): v is number[] => Array.isArray(v) && v.length <= max && v.every(isFinite);
const isStrs = (v: unknown): v is string[] => Array.isArray(v) && v.length <= 1000 && v.every((s) => typeof s === 'string');
const isStrOrNull = (v: unknown) => v === null || typeof v === 'string';

/** Most points a sweep may have (the engine's MAX_SWEEP_POINTS). */
const MAX_POINTS = 40_000;

/** True when `v` has the shape of a `SweepPoint`. */
export function isSweepPoint(v: unknown): v is SweepPoint {
  if (!isObj(v) || !isNums(v.index, 2) || !isNums(v.at, 2) || v.index.length !== v.at.length || typeof v.valid !== 'boolean') return false;
  if (!isStrOrNull(v.problem) || !isStrs(v.findings)) return false;
  const levels = Array.isArray(v.levels) && v.levels.length <= 100 && v.levels.every((l) => isObj(l) && isFinite(l.n) && isNum(l.energy) && isNum(l.weight));
  const nums = [v.captured, v.continuum, v.mean, v.spread, v.bound].every(isNum);
  return levels && nums && Array.isArray(v.expects) && v.expects.length <= 1000 && v.expects.every((x) => typeof x === 'boolean');
}

function isAxis(v: unknown): v is SweepAxis {
  return isObj(v) && typeof v.name === 'string' && isStrOrNull(v.unit) && isFinite(v.from) && isFinite(v.to) && Number.isInteger(v.steps) && (v.spacing === 'linear' || v.spacing === 'log') && isNums(v.values, MAX_POINTS);
}

const isExpect = (v: unknown): v is SweepExpect => isObj(v) && isFinite(v.line) && typeof v.text === 'string';

/** True when `v` has the shape of a `SweepResult` whose points lie on its axes. */
export function isSweepResult(v: unknown): v is SweepResult {
  if (!isObj(v) || !Array.isArray(v.axes) || v.axes.length < 1 || v.axes.length > 2 || !v.axes.every(isAxis)) return false;
  const total = (v.axes as SweepAxis[]).reduce((n, a) => n * a.values.length, 1);
  if (!Array.isArray(v.points) || v.points.length !== total || total > MAX_POINTS || !v.points.every((p) => p === null || isSweepPoint(p))) return false;
  if (!Array.isArray(v.expects) || !v.expects.every(isExpect)) return false;
  const located = Array.isArray(v.located) && v.located.every((l) => isObj(l) && (l.kind === 'bound' || l.kind === 'expect') && isFinite(l.at) && isNums(l.bracket, 2) && isFinite(l.before) && isFinite(l.after) && isNum(l.row) && (l.expect === undefined || isFinite(l.expect)));
  const windows = Array.isArray(v.windows) && v.windows.every((w) => isObj(w) && isFinite(w.from) && isFinite(w.to) && typeof w.fromEdge === 'boolean' && typeof w.toEdge === 'boolean' && isNum(w.row));
  const stopped = v.stopped === null || v.stopped === 'time' || v.stopped === 'cancelled';
  return located && windows && stopped && typeof v.systemFixed === 'boolean' && isFinite(v.finished) && isFinite(v.total) && isFinite(v.probes);
}

/** What the document's sweep lines tell about a running sweep. */
export interface SweepFrame {
  axes: { name: string; unit: string | null; steps: number | null; spacing: 'linear' | 'log' }[];
  expects: SweepExpect[];
}

/** True when `v` has the shape of a `SweepFrame`. */
export function isSweepFrame(v: unknown): v is SweepFrame {
  if (!isObj(v) || !Array.isArray(v.axes) || v.axes.length > 2 || !Array.isArray(v.expects) || !v.expects.every(isExpect)) return false;
  return v.axes.every((a) => isObj(a) && typeof a.name === 'string' && isStrOrNull(a.unit) && (a.steps === null || (Number.isInteger(a.steps) && (a.steps as number) >= 1 && (a.steps as number) <= MAX_POINTS)) && (a.spacing === 'linear' || a.spacing === 'log'));
}

/** A running sweep: its frame, the points so far by grid position, and the counts the server reported. */
export interface LiveSweep {
  frame: SweepFrame;
  points: Map<string, SweepPoint>;
  finished: number;
  total: number;
}

/** A new running sweep. */
export const startLive = (frame: SweepFrame, total: number): LiveSweep => ({ frame, points: new Map(), finished: 0, total });

/** Adds one arrived point (a point of another shape than the frame's is dropped). */
export function addPoint(live: LiveSweep, point: SweepPoint, finished: number, total: number): void {
  if (point.index.length !== Math.max(1, live.frame.axes.length)) return;
  live.points.set(point.index.join(','), point);
  live.finished = Math.max(live.finished, finished);
  live.total = total;
}

/** One axis's values from the points so far: known ones where a point lies, the rest by linear (log) interpolation in the index. */
function axisValues(known: Map<number, number>, n: number, log: boolean): number[] {
  const idx = [...known.keys()].sort((a, b) => a - b);
  const f = (v: number) => (log ? Math.log(v) : v);
  const g = (v: number) => (log ? Math.exp(v) : v);
  return Array.from({ length: n }, (_, i) => {
    const v = known.get(i);
    if (v !== undefined) return v;
    if (idx.length === 1) return known.get(idx[0]!)!;
    // The nearest two known indices around i (or at one side, to extrapolate).
    let lo = idx[0]!;
    let hi = idx[1]!;
    for (let k = 0; k + 1 < idx.length; k++) if (idx[k]! <= i) ((lo = idx[k]!), (hi = idx[k + 1]!));
    const [a, b] = [f(known.get(lo)!), f(known.get(hi)!)];
    return g(a + ((b - a) * (i - lo)) / (hi - lo));
  });
}

/** The provisional result of a running sweep (no refinement, no window yet); null before its first point. */
export function liveResult(live: LiveSweep): SweepResult | null {
  const pts = [...live.points.values()];
  if (pts.length === 0) return null;
  const dims = Math.max(1, live.frame.axes.length);
  const axes: SweepAxis[] = Array.from({ length: dims }, (_, k) => {
    const fr = live.frame.axes[k];
    const known = new Map(pts.map((p) => [p.index[k]!, p.at[k]!]));
    const seen = Math.max(...known.keys()) + 1;
    const other = k === 0 ? null : Math.max(1, Math.round(live.total / Math.max(1, (live.frame.axes[0]?.steps ?? 0) + 1)));
    const n = Math.max(seen, fr?.steps != null ? fr.steps + 1 : (other ?? (dims === 1 ? live.total : seen)));
    const log = fr?.spacing === 'log' && pts.every((p) => p.at[k]! > 0);
    const values = axisValues(known, n, log);
    return { name: fr?.name ?? `axis ${k + 1}`, unit: fr?.unit ?? null, from: values[0]!, to: values[n - 1]!, steps: Math.max(1, n - 1), spacing: log ? 'log' : 'linear', values };
  });
  const nx = axes[0]!.values.length;
  const grid = axes.reduce((n, a) => n * a.values.length, 1);
  const points: (SweepPoint | null)[] = new Array(grid).fill(null);
  for (const p of pts) {
    const at = p.index[0]! + nx * (p.index[1] ?? 0);
    if (at < grid) points[at] = p;
  }
  return { axes, points, expects: live.frame.expects, located: [], windows: [], systemFixed: false, finished: live.finished, total: live.total, stopped: null, probes: 0 };
}
