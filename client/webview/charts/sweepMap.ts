/**
 * The map of a two-parameter sweep: the chosen quantity (its first line; the overview maps the
 * captured weight) as coloured cells over the two swept axes, logarithmic where the sweep is, with a
 * colour scale and its legend (ECharts' visualMap), the edge of the design window traced over the grid
 * (contour.ts) as lines with a halo so they read on any cell colour, and the located steps of the
 * bound-level count as markers. A cell spans halfway to its neighbours (the geometric middle on a log
 * axis). Each cell's datum is [x, y, index into sweep.points, value, x0, x1, y0, y1], so the tooltip
 * and the panel's pick read the point as on the lines. Pure.
 */
import type { SweepResult } from '../../../server/src/analysis/sweep/types';
import type { Palette } from '../theme';
import { axisStyle, baseOption, unitSuffix, type Option, type TooltipRows } from './context';
import { legendFor, plotTop, type ChartSize } from './layout';
import { niceAxis } from './scale';
import { isLogAxis, middle, windowContour } from './contour';
import { pointTooltip, quantityPlan, sweepNotes, type SweepDescription, type SweepQuantity } from './sweepQuantity';
import { formatNumber } from '../../../server/src/shared/numbers';

/** The cell edges of an axis's values: halfway to each neighbour, and as far beyond the ends. */
export function cellEdges(values: readonly number[], log: boolean): number[] {
  const n = values.length;
  if (n === 1) {
    const v = values[0]!;
    return log ? [v / 1.5, v * 1.5] : [v - (Math.abs(v) || 1) / 2, v + (Math.abs(v) || 1) / 2];
  }
  const mids = values.slice(1).map((v, k) => middle(values[k]!, v, log));
  const outward = (end: number, mid: number) => (log ? (end * end) / mid : 2 * end - mid);
  return [outward(values[0]!, mids[0]!), ...mids, outward(values[n - 1]!, mids[n - 2]!)];
}

/** `#rgb` or `#rrggbb` as numbers, or null for any other colour text. */
function rgb(c: string): [number, number, number] | null {
  const m = /^#([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(c.trim());
  if (!m) return null;
  const h = m[1]!.length === 3 ? [...m[1]!].map((d) => d + d).join('') : m[1]!;
  return [0, 2, 4].map((k) => parseInt(h.slice(k, k + 2), 16)) as [number, number, number];
}

/** The colour a fraction t of the way from a to b (b itself when either is not a hex colour). */
export function mix(a: string, b: string, t: number): string {
  const [x, y] = [rgb(a), rgb(b)];
  if (!x || !y) return b;
  return `#${x.map((v, k) => Math.round(v + (y[k]! - v) * t).toString(16).padStart(2, '0')).join('')}`;
}

/** The colour scale: from close to the background (low values) through the theme's blue to close to the text colour (high), so lightness runs one way in every theme. */
export const mapColours = (p: Palette) => [mix(p.background, p.even, 0.18), p.even, mix(p.even, p.foreground, 0.7)];

/** The map of a two-parameter sweep (see the header). */
export function sweepMap(sweep: SweepResult, p: Palette, size: ChartSize, energyUnit: string | null, o: { quantity: SweepQuantity; tooltip: (rows: TooltipRows) => unknown }): SweepDescription {
  const [ax, ay] = [sweep.axes[0]!, sweep.axes[1]!];
  const line = quantityPlan(o.quantity === 'overview' ? 'captured' : o.quantity, sweep, p).lines[0];
  const [logX, logY] = [isLogAxis(ax), isLogAxis(ay)];
  const [ex, ey] = [cellEdges(ax.values, logX), cellEdges(ay.values, logY)];
  const cells = sweep.points.flatMap((q, k) => {
    const v = q && q.valid && line ? line.value(q) : null;
    if (!q || v === null || !Number.isFinite(v)) return [];
    const [i, j] = [q.index[0]!, q.index[1]!];
    return [[q.at[0]!, q.at[1]!, k, v, ex[i]!, ex[i + 1]!, ey[j]!, ey[j + 1]!]];
  });
  const notes = sweepNotes(sweep);
  if (!line || cells.length === 0) return { option: null, notes, empty: sweep.finished === 0 ? 'No point of the sweep has finished yet.' : 'No point of the sweep has a value of this quantity to map.' };
  const values = cells.map((c) => c[3]!);
  const weight = line.id === 'captured' || line.id === 'continuum' || line.id.startsWith('P');
  const span = niceAxis(Math.min(...values), Math.max(...values));
  const [lo, hi] = weight ? [Math.max(0, span.min), Math.min(1, span.max)] : [span.min, span.max];
  const unit = weight || line.id === 'bound' ? null : energyUnit;
  // Enough digits that the two ends of the scale differ in print (3 at least).
  const digits = Math.min(12, Math.max(3, Math.ceil(Math.log10(Math.max(Math.abs(lo), Math.abs(hi)) / Math.max(hi - lo, 1e-300))) + 2));
  const name = `${line.name}${unitSuffix(unit)}`;
  const edgeName = 'design window edge';
  const series: Option[] = [cellSeries(name), ...contourSeries(sweep, p, edgeName), ...stepSeries(sweep, p)];
  const top = plotTop(series.map((s) => String(s.name)), size, p);
  const bottom = Math.round(p.fontSize * 3.4);
  const legendNames = [...new Set(series.map((s) => String(s.name)))];
  const option: Option = {
    ...baseOption(p),
    tooltip: pointTooltip(sweep, energyUnit, o.tooltip, p),
    // The map's legend icon in the scale's middle colour (left to itself it takes the scale's gradient object).
    legend: { ...legendFor(series, p), data: legendNames.map((n) => (n === name ? { name: n, itemStyle: { color: p.even } } : n)) },
    grid: { left: 64, right: 84, top, bottom },
    xAxis: axisOption(ax, ex, logX, p, 'middle', 28),
    yAxis: axisOption(ay, ey, logY, p, 'middle', 46),
    visualMap: {
      type: 'continuous',
      seriesIndex: 0,
      dimension: 3,
      min: lo,
      max: hi === lo ? lo + 1 : hi,
      calculable: false,
      orient: 'vertical',
      right: 6,
      top: top + 4,
      itemWidth: 14,
      itemHeight: Math.max(60, size.height - top - bottom - 2.5 * p.fontSize - 16),
      // The ends of the scale; the legend above names the quantity.
      text: [formatNumber(hi === lo ? lo + 1 : hi, digits), formatNumber(lo, digits)],
      textGap: 6,
      formatter: (v: number) => formatNumber(v, digits),
      textStyle: { color: p.foreground },
      inRange: { color: mapColours(p) },
    },
    series,
  };
  return { option, notes: notes.concat(mapNotes(sweep)), empty: null };

  function cellSeries(seriesName: string): Option {
    return {
      id: 'map',
      name: seriesName,
      type: 'custom',
      data: cells,
      encode: { x: 0, y: 1 },
      itemStyle: { color: p.even },
      renderItem: (_params: unknown, api: { value(d: number): number; coord(v: number[]): number[]; visual(k: string): unknown }) => {
        const a = api.coord([api.value(4), api.value(6)]);
        const b = api.coord([api.value(5), api.value(7)]);
        return { type: 'rect', shape: { x: Math.min(a[0]!, b[0]!), y: Math.min(a[1]!, b[1]!), width: Math.abs(b[0]! - a[0]!), height: Math.abs(b[1]! - a[1]!) }, style: { fill: api.visual('color'), stroke: api.visual('color'), lineWidth: 0.6 } };
      },
    };
  }
}

/** A swept axis over its cells' outer edges. */
function axisOption(a: SweepResult['axes'][number], edges: number[], log: boolean, p: Palette, nameLocation: string, nameGap: number): Option {
  const [lo, hi] = [Math.min(...edges), Math.max(...edges)];
  return {
    type: log ? 'log' : 'value',
    // A log axis ticks at powers of its base: powers of 2 give ticks over a span under three decades.
    ...(log ? { logBase: hi / lo < 1000 ? 2 : 10 } : {}),
    name: `${a.name}${unitSuffix(a.unit)}`,
    nameLocation,
    nameGap,
    min: lo,
    max: hi,
    ...axisStyle(p),
    // The ends are cell edges, not round numbers: only the inner ticks are labelled.
    axisLabel: { ...(axisStyle(p).axisLabel as Option), showMinLabel: false, showMaxLabel: false, formatter: (v: number) => formatNumber(v, 4) },
    splitLine: { show: false },
  };
}

/** The design window's edge: each polyline twice, a wide halo in the background colour under a line in the text colour. */
function contourSeries(sweep: SweepResult, p: Palette, name: string): Option[] {
  const lines = windowContour(sweep);
  return lines.flatMap((pl, k) =>
    [
      { colour: p.background, width: p.lineWidth + 3, id: `window-halo-${k}` },
      { colour: p.foreground, width: p.lineWidth + 0.5, id: `window-${k}` },
    ].map((s) => ({ id: s.id, name, type: 'line', silent: true, showSymbol: false, animation: false, tooltip: { show: false }, data: pl, lineStyle: { color: s.colour, width: s.width }, itemStyle: { color: p.foreground }, z: 3 })),
  );
}

/** The located steps of the bound-level count as markers: along the first axis in each row, along the second in each column (`axis` 1: `at` is then the second value, `row` the first). */
function stepSeries(sweep: SweepResult, p: Palette): Option[] {
  const steps = sweep.located.filter((l) => l.kind === 'bound' && l.row !== null);
  if (steps.length === 0) return [];
  return [{ id: 'bound-steps', name: 'bound count steps', type: 'scatter', silent: true, tooltip: { show: false }, symbol: 'diamond', symbolSize: 7, z: 4, data: steps.map((l) => (l.axis === 1 ? [l.row!, l.at, -1] : [l.at, l.row!, -1])), itemStyle: { color: p.foreground, borderColor: p.background, borderWidth: 1 } }];
}

/** What only the map needs to say. */
function mapNotes(sweep: SweepResult): string[] {
  return sweep.expects.length === 0 ? ['The file has no expect line, so the map has no design window to outline.'] : [];
}
