/**
 * The edge of a two-parameter sweep's design window (the points where every ordinary `expect` line
 * holds), traced by marching squares over the grid of points (common practice for the contour of a
 * sampled field): each grid cell whose corners disagree is crossed by one segment, or two in a saddle
 * cell (there the corners that hold are cut off separately, which never claims more window than the
 * points show), and the segments are joined into polylines. A crossing between two points of a row
 * sits where the engine located the row's window end, when it found one there (refined to 1e-13 of the
 * swept value); elsewhere halfway between the points (the geometric middle on a logarithmic axis).
 * Cells with a corner not computed (a partial sweep) are left out. The grid is padded with failing
 * points so the outline closes along the range swept. Pure.
 */
import type { SweepResult } from '../../../server/src/analysis/sweep/types';

/** A polyline in data coordinates: [first axis value, second axis value] pairs. */
export type Polyline = [number, number][];

/** The middle of a and b on a linear or logarithmic axis. */
export const middle = (a: number, b: number, log: boolean) => (log && a > 0 && b > 0 ? Math.sqrt(a * b) : (a + b) / 2);

/** Whether an axis of the sweep is drawn logarithmically. */
export const isLogAxis = (a: SweepResult['axes'][number]) => a.spacing === 'log' && a.from > 0 && a.to > 0;

/** The design window's edge as polylines; none without `expect` lines or without a second axis. */
export function windowContour(sweep: SweepResult): Polyline[] {
  if (sweep.axes.length !== 2 || sweep.expects.length === 0) return [];
  const [ax, ay] = [sweep.axes[0]!, sweep.axes[1]!];
  const [nx, ny] = [ax.values.length, ay.values.length];
  const [logX, logY] = [isLogAxis(ax), isLogAxis(ay)];
  // The grid is padded with one ring of points that fail, so the outline closes along the sweep's
  // edges; a crossing towards the padding lies on the outermost point itself (the range swept ends there).
  const holds = (i: number, j: number): boolean | null => {
    if (i < 0 || j < 0 || i >= nx || j >= ny) return false;
    const p = sweep.points[i + nx * j];
    return p === null || p === undefined ? null : p.valid && p.expects.every(Boolean);
  };
  const rowEnds = (j: number): number[] => {
    const y = ay.values[j]!;
    const same = (r: number | null) => r !== null && Math.abs(r - y) <= 1e-9 * Math.max(1, Math.abs(y));
    return sweep.windows.filter((w) => same(w.row)).flatMap((w) => [...(w.fromEdge ? [] : [w.from]), ...(w.toEdge ? [] : [w.to])]);
  };
  const ends = Array.from({ length: ny }, (_, j) => rowEnds(j));
  const clampX = (i: number) => ax.values[Math.max(0, Math.min(nx - 1, i))]!;
  const clampY = (j: number) => ay.values[Math.max(0, Math.min(ny - 1, j))]!;
  const between = (v: readonly number[], i: number, log: boolean) => (i < 0 ? v[0]! : i + 1 >= v.length ? v[v.length - 1]! : middle(v[i]!, v[i + 1]!, log));
  // An edge of the grid: 'h' joins (i, j) and (i + 1, j), 'v' joins (i, j) and (i, j + 1).
  const crossing = (kind: 'h' | 'v', i: number, j: number): [number, number] => {
    if (kind === 'v') return [clampX(i), between(ay.values, j, logY)];
    const inside = j >= 0 && j < ny && i >= 0 && i + 1 < nx;
    const [a, b] = inside ? [ax.values[i]!, ax.values[i + 1]!] : [NaN, NaN];
    const found = inside ? ends[j]!.find((x) => x >= Math.min(a, b) && x <= Math.max(a, b)) : undefined;
    return [found ?? between(ax.values, i, logX), clampY(j)];
  };
  const segments: [string, string][] = [];
  const points = new Map<string, [number, number]>();
  const edge = (kind: 'h' | 'v', i: number, j: number): string => {
    const key = `${kind}${i},${j}`;
    if (!points.has(key)) points.set(key, crossing(kind, i, j));
    return key;
  };
  for (let j = -1; j < ny; j++) {
    for (let i = -1; i < nx; i++) {
      const c = [holds(i, j), holds(i + 1, j), holds(i + 1, j + 1), holds(i, j + 1)];
      if (c.some((v) => v === null)) continue;
      // Edges in corner order: bottom (0-1), right (1-2), top (3-2), left (0-3).
      const sides = [edge('h', i, j), edge('v', i + 1, j), edge('h', i, j + 1), edge('v', i, j)];
      const crossed = [0, 1, 2, 3].filter((s) => c[s] !== c[(s + 1) % 4]);
      if (crossed.length === 2) segments.push([sides[crossed[0]!]!, sides[crossed[1]!]!]);
      else if (crossed.length === 4) {
        // A saddle: cut off each holding corner on its own (corner k lies between sides k - 1 and k).
        for (const k of [0, 1, 2, 3].filter((q) => c[q])) segments.push([sides[(k + 3) % 4]!, sides[k]!]);
      }
    }
  }
  return chain(segments).map((keys) => keys.map((k) => points.get(k)!));
}

/** Joins segments that share an end into polylines (each end is shared by at most two segments). */
function chain(segments: [string, string][]): string[][] {
  const at = new Map<string, number[]>();
  segments.forEach(([a, b], k) => {
    for (const e of [a, b]) at.set(e, [...(at.get(e) ?? []), k]);
  });
  const used = new Set<number>();
  const lines: string[][] = [];
  const walk = (from: string, line: string[]): void => {
    for (let cur = from; ; ) {
      const next = (at.get(cur) ?? []).find((k) => !used.has(k));
      if (next === undefined) return;
      used.add(next);
      const [a, b] = segments[next]!;
      cur = a === cur ? b : a;
      line.push(cur);
    }
  };
  // Open lines first (from an end that belongs to one segment), then closed loops.
  const starts = [...at.entries()].filter(([, ks]) => ks.length === 1).map(([e]) => e);
  for (const s of [...starts, ...segments.map(([a]) => a)]) {
    if ((at.get(s) ?? []).every((k) => used.has(k))) continue;
    const line = [s];
    walk(s, line);
    if (line.length > 1) lines.push(line);
  }
  return lines;
}
