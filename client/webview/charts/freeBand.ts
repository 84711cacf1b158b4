/**
 * Where a label fits on a plot: the drawn curves and lines of a chart option in plot fractions, and the
 * highest height at which a box of given pixel size crosses none of them. Pure (no DOM): the option
 * builder knows its axes' ranges and the plot area's size (layout.ts), so it can place a label before
 * ECharts draws anything.
 */
import type { Option } from './context';

/** A drawn path in plot fractions: u across (0 left edge, 1 right edge), v up (0 bottom, 1 top). */
export interface Trace {
  u: number[];
  v: number[];
  /** A filled area under the path reaches down (or up) to this height. */
  fillTo?: number;
}

/** An axis range (data units). */
export interface Span {
  min: number;
  max: number;
}

/** The plot area in pixels. */
export interface Frame {
  width: number;
  height: number;
}

const frac = (value: number, r: Span): number => (value - r.min) / (r.max - r.min);

/** The lines of a series' markLine: horizontal `yAxis`, vertical `xAxis` and two-point segments of `coord`. */
function markTraces(data: unknown[], x: Span, y: Span): Trace[] {
  const out: Trace[] = [];
  for (const d of data) {
    if (Array.isArray(d)) {
      const [p, q] = d as { coord?: [number, number] }[];
      if (p?.coord && q?.coord) out.push({ u: [frac(p.coord[0], x), frac(q.coord[0], x)], v: [frac(p.coord[1], y), frac(q.coord[1], y)] });
    } else if (d && typeof d === 'object') {
      const m = d as { xAxis?: number; yAxis?: number };
      if (typeof m.yAxis === 'number') out.push({ u: [0, 1], v: [frac(m.yAxis, y), frac(m.yAxis, y)] });
      if (typeof m.xAxis === 'number') out.push({ u: [frac(m.xAxis, x), frac(m.xAxis, x)], v: [0, 1] });
    }
  }
  return out;
}

/**
 * Every path the series draw (their data as a polyline, a filled area down to the zero of its axis,
 * and their markLines), in plot fractions; `axes[i]` is the range of y axis i.
 */
export function tracesOf(series: Option[], x: Span, axes: Span[]): Trace[] {
  const out: Trace[] = [];
  for (const s of series) {
    const y = axes[(s.yAxisIndex as number | undefined) ?? 0];
    if (!y) continue;
    const data = (s.data as [number, number][] | undefined) ?? [];
    if (data.length > 0) {
      const t: Trace = { u: data.map((p) => frac(p[0], x)), v: data.map((p) => frac(p[1], y)) };
      if (s.areaStyle) t.fillTo = Math.min(1, Math.max(0, frac(0, y)));
      out.push(t);
    }
    const marks = (s.markLine as { data?: unknown[] } | undefined)?.data;
    if (marks) out.push(...markTraces(marks, x, y));
  }
  return out;
}

/** The height ranges [lo, hi] (fractions) the traces take between u0 and u1. */
function taken(traces: Trace[], u0: number, u1: number): [number, number][] {
  const out: [number, number][] = [];
  for (const t of traces) {
    for (let j = 0; j + 1 < t.u.length || (t.u.length === 1 && j === 0); j++) {
      const ua = t.u[j]!;
      const ub = t.u[Math.min(j + 1, t.u.length - 1)]!;
      const va = t.v[j]!;
      const vb = t.v[Math.min(j + 1, t.u.length - 1)]!;
      if (![ua, ub, va, vb].every(Number.isFinite) || Math.max(ua, ub) < u0 || Math.min(ua, ub) > u1) continue;
      // The part of the segment over [u0, u1], by linear interpolation.
      const at = (u: number): number => (ub === ua ? va : va + ((vb - va) * (u - ua)) / (ub - ua));
      const ends = ub === ua ? [va, vb] : [at(Math.max(u0, Math.min(ua, ub))), at(Math.min(u1, Math.max(ua, ub)))];
      if (t.fillTo !== undefined) ends.push(t.fillTo);
      out.push([Math.min(...ends), Math.max(...ends)]);
    }
  }
  return out;
}

/**
 * The height (fraction, of the box's centre) of the highest place between u0 and u1 where a box
 * `h` px tall, with `gap` px of room above and below, crosses no trace and stays inside the plot; null
 * when there is none. Searched from the top in steps of one pixel.
 */
export function freeHeight(traces: Trace[], u0: number, u1: number, h: number, frame: Frame, gap = 3): number | null {
  const busy = taken(traces, u0, u1);
  const half = (h / 2 + gap) / frame.height;
  for (let px = gap + h / 2; px <= frame.height - gap - h / 2; px++) {
    const v = 1 - px / frame.height;
    if (busy.every(([lo, hi]) => hi < v - half || lo > v + half)) return v;
  }
  return null;
}
