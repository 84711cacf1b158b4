/**
 * The sweep view: the chosen quantity against the swept parameter, from a sweep result alone (the
 * `sweep` field of `expand --json`, analysis/sweep/types.ts, or the points arrived so far). Lines of
 * the quantity (sweepQuantity.ts; the overview draws the captured weight and the lowest populations on
 * the left axis, 0 to 1, and the energy mean on the right); the design window shaded; the places where
 * the bound-level count steps or an `expect` line flips, located by the engine between points, marked
 * as vertical lines whose labels sit in a band above the plot (sweepLabels.ts), clear of the curves,
 * moved aside or up a row when they sit close. Every point carries its index into
 * `sweep.points` (the third value of its datum), so hovering shows the point's full result and the
 * panel can pick it. Two swept parameters give a map (sweepMap.ts). Pure: no DOM, so the command line
 * draws it too.
 */
import type { SweepPoint, SweepResult } from '../../../server/src/analysis/sweep/types';
import type { Palette } from '../theme';
import { axisStyle, baseOption, unitSuffix, type Option } from './context';
import { legendFor, plotTop, xTicks, type ChartSize } from './layout';
import { clean, niceAxis } from './scale';
import { formatNumber } from '../../../server/src/shared/numbers';
import { plainRows, pointTooltip, quantityAxisName, quantityPlan, sweepNotes, validPoints, type QuantityAxis, type SweepDescription, type SweepViewOptions } from './sweepQuantity';

export type { SweepDescription, SweepViewOptions } from './sweepQuantity';
import { sweepMap } from './sweepMap';
import { LABEL_GAP, labelBandHeight, labelRowHeight, placeLabels, type LabelBand } from './sweepLabels';

/** The sweep view of `sweep` (see the header). */
export function sweepView(sweep: SweepResult, palette: Palette, size: ChartSize, energyUnit: string | null, options: SweepViewOptions = {}): SweepDescription {
  const quantity = options.quantity ?? 'overview';
  const tooltip = options.tooltip ?? plainRows;
  if (sweep.axes.length === 2) return sweepMap(sweep, palette, size, energyUnit, { quantity, tooltip });
  const axis = sweep.axes[0]!;
  const pts = validPoints(sweep);
  if (pts.length === 0) return { option: null, notes: sweepNotes(sweep), empty: sweep.finished === 0 ? 'No point of the sweep has finished yet.' : 'No point of the sweep could be analysed; see the findings on the sweep line.' };
  const p = palette;
  const plan = quantityPlan(quantity, sweep, p);
  const indexed = sweep.points.map((q, k) => [q, k] as const).filter((e): e is readonly [SweepPoint, number] => e[0] !== null && e[0].valid);
  const series: Option[] = plan.lines.map((l, k) => ({
    id: l.id,
    name: l.name,
    type: 'line',
    yAxisIndex: l.axis,
    showSymbol: true,
    symbolSize: k === 0 ? 6 : 4,
    step: l.id === 'bound' ? 'middle' : undefined,
    data: indexed.map(([q, i]) => [q.at[0]!, l.value(q), i]),
    lineStyle: { color: l.colour, width: l.dashed ? 1 : p.lineWidth, type: l.dashed ? 'dashed' : 'solid' },
    itemStyle: { color: l.colour },
    emphasis: { focus: 'none', scale: 1.8 },
  }));
  const logX = axis.spacing === 'log' && axis.from > 0 && axis.to > 0;
  const [lo, hi] = [Math.min(axis.from, axis.to), Math.max(axis.from, axis.to)];
  const [left, right] = [64, plan.axes.length > 1 ? 72 : 24];
  // The marks ride on the first series: the design window shaded, and the located places as vertical
  // lines, their labels in a band above the plot that moves the plot (and the axis names) down.
  const frame: XFrame = { lo, hi, log: logX, left, width: size.width - left - right };
  const located = locatedLines(sweep, p, frame);
  const band = labelBandHeight(located.band.rows, p.fontSize);
  const grid = { left, right, top: plotTop(series.map((q) => String(q.name)), size, p) + band, bottom: Math.round(p.fontSize * 3.4) };
  if (series[0]) Object.assign(series[0], { markArea: windowArea(sweep, p, frame), markLine: located.option });
  const option: Option = {
    ...baseOption(p),
    tooltip: pointTooltip(sweep, energyUnit, tooltip, p),
    legend: legendFor(series, p, size),
    grid,
    xAxis: { type: logX ? 'log' : 'value', name: `${axis.name}${unitSuffix(axis.unit)}`, nameLocation: 'middle', nameGap: 28, min: lo, max: hi, ...axisStyle(p), ...(logX ? {} : rangeTicks(lo, hi, size, p)) },
    // The axis names above the label band (ECharts' default gap is 15 px).
    yAxis: plan.axes.map((kind, k) => ({ ...valueAxis(kind, plan.lines.filter((l) => l.axis === k), pts, energyUnit, p, k), nameGap: 15 + band })),
    // No colour scale: in the panel this removes a map's scale when the same chart draws lines next.
    visualMap: [],
    series,
  };
  return { option, notes: [...sweepNotes(sweep), ...located.unlabelled], empty: null };
}

/**
 * Ticks of the swept range: its two ends (the values swept from and to) and round values between them,
 * none closer to an end than half a tick step (at 480 px, 2 and 3 sat side by side).
 */
function rangeTicks(lo: number, hi: number, size: ChartSize, p: Palette): Option {
  const step = niceAxis(lo, hi, xTicks(size)).interval;
  const values = [lo];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + 1e-9 * step; k++) {
    const v = clean(k * step);
    if (v - lo >= 0.5 * step && hi - v >= 0.5 * step) values.push(v);
  }
  if (hi > lo) values.push(hi);
  const label = (v: number) => formatNumber(clean(v), 6);
  return { axisTick: { customValues: values }, axisLabel: { color: p.foreground, customValues: values, formatter: label }, splitLine: { ...(axisStyle(p).splitLine as Option), show: true } };
}

/** One value axis: weights from 0 to 1, energies over a nice range of the values drawn, counts in whole steps. */
function valueAxis(kind: QuantityAxis, lines: ReturnType<typeof quantityPlan>['lines'], pts: SweepPoint[], energyUnit: string | null, p: Palette, k: number): Option {
  const values = lines.flatMap((l) => pts.map(l.value)).filter((v): v is number => v !== null && Number.isFinite(v));
  const style = { ...axisStyle(p), ...(k > 0 ? { splitLine: { show: false } } : {}) };
  const name = quantityAxisName(kind, energyUnit, kind === 'energy' && lines.length === 1 ? [lines[0]!.name] : []);
  if (kind === 'weight') return { type: 'value', name, min: 0, max: 1, ...style };
  if (kind === 'count') return { type: 'value', name, min: 0, max: Math.max(1, ...values) + 1, minInterval: 1, ...style };
  const r = values.length > 0 ? niceAxis(Math.min(...values), Math.max(...values)) : { min: 0, max: 1 };
  return { type: 'value', name, min: r.min, max: r.max, ...style };
}

/** The words on each design-window band. */
const WINDOW_LABEL = 'design window';

/**
 * The design window as shaded bands, labelled at the bottom (out of the way of the located lines'
 * labels): centred in a band wide enough for the words, else from the band's left edge rightwards,
 * so the words never run out over the axis labels.
 */
function windowArea(sweep: SweepResult, p: Palette, frame: XFrame): Option | undefined {
  const wide = (from: number, to: number) => Math.abs(xPixel(frame, to) - xPixel(frame, from)) >= WINDOW_LABEL.length * 0.6 * p.fontSize + 8;
  const bands = sweep.windows
    .filter((w) => w.row === null)
    .map((w) => [{ xAxis: w.from, label: { position: wide(w.from, w.to) ? 'insideBottom' : 'insideBottomLeft' } }, { xAxis: w.to }]);
  if (bands.length === 0) return undefined;
  return { silent: true, itemStyle: { color: p.accent, opacity: 0.12 }, label: { show: true, position: 'insideBottom', color: p.muted, formatter: WINDOW_LABEL }, data: bands };
}

/** Where value x lies across the plot, in pixels from the chart's left. */
function xPixel(frame: XFrame, x: number): number {
  const f = frame.log ? Math.log(x / frame.lo) / Math.log(frame.hi / frame.lo) : (x - frame.lo) / (frame.hi - frame.lo || 1);
  return frame.left + f * frame.width;
}

/** Where the plot area lies, to tell which located lines sit close on screen. */
interface XFrame {
  lo: number;
  hi: number;
  log: boolean;
  left: number;
  width: number;
}

/**
 * Vertical lines where the bound count steps (solid) or an expect line flips (dashed), and the band
 * of rows their labels take above the plot (placeLabels: labels close on screen are moved aside or up
 * a row, so none is drawn over another). A label with no room in the band is left off its line and
 * named in `unlabelled`, a note, instead.
 */
export function locatedLines(sweep: SweepResult, p: Palette, frame: XFrame): { option: Option | undefined; band: LabelBand; unlabelled: string[] } {
  const marks = sweep.located.filter((l) => l.row === null).sort((a, b) => a.at - b.at);
  const text = (l: (typeof marks)[number]) => (l.kind === 'bound' ? `bound ${l.before} → ${l.after}` : `line ${sweep.expects[l.expect ?? 0]?.line ?? '?'} ${l.after ? 'holds' : 'fails'}`);
  const band = placeLabels(marks.map((l) => ({ x: xPixel(frame, l.at), text: text(l) })), frame.left, frame.left + frame.width, p.fontSize);
  const data = marks.map((l, k) => {
    const place = band.places[k];
    return {
      xAxis: l.at,
      lineStyle: { color: p.muted, width: 1, type: l.kind === 'bound' ? 'solid' : 'dashed' },
      label: place === null ? { show: false } : { show: true, position: 'end', distance: [0, LABEL_GAP + place.row * labelRowHeight(p.fontSize)], align: place.align, color: p.muted, formatter: text(l) },
    };
  });
  const axis = sweep.axes[0];
  const unlabelled = marks.filter((_, k) => band.places[k] === null).map((l) => `${text(l)} at ${axis?.name ?? 'x'} = ${formatNumber(l.at, 4)}${axis?.unit ? ` ${axis.unit}` : ''}`);
  return {
    option: data.length === 0 ? undefined : { silent: true, symbol: 'none', animation: false, data },
    band,
    unlabelled: unlabelled.length === 0 ? [] : [`No room above the plot to label the line(s) at: ${unlabelled.join('; ')}.`],
  };
}
