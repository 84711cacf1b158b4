/**
 * Room for the legend and the axis names, from the chart's size: the legend wraps at narrow widths, so
 * the plot area starts below its last row instead of under it. Text widths are estimated from the font
 * size (about 0.6 em a character for the UI fonts: common practice), which errs on the wide side.
 */
import type { Palette } from '../theme';

/** The chart's size in CSS pixels (the panel measures it; a command-line renderer chooses it). */
export interface ChartSize {
  width: number;
  height: number;
}

/** The size assumed when none is given. */
export const DEFAULT_SIZE: ChartSize = { width: 800, height: 440 };

/** Rows the legend takes for these entry names at this width (ECharts wraps a plain legend). */
export function legendRows(names: string[], width: number, p: Palette): number {
  const avail = Math.max(100, width - 20);
  let rows = 1;
  let used = 0;
  for (const n of names) {
    const w = 25 + 5 + n.length * 0.6 * p.fontSize + 10;
    if (used > 0 && used + w > avail) ((rows += 1), (used = 0));
    used += w;
  }
  return rows;
}

/** About how many intervals a horizontal value axis gets: one per 120 px, 3 to 10. */
export const xTicks = (size: ChartSize) => Math.max(3, Math.min(10, Math.floor((size.width - 100) / 120)));

/** Height of one legend row in pixels. */
export const legendRowHeight = (p: Palette) => Math.round(p.fontSize + 11);

/** Top of the first plot area: below the legend rows and the room the axis names need above a grid. */
export function plotTop(names: string[], size: ChartSize, p: Palette): number {
  return legendRows(names, size.width, p) * legendRowHeight(p) + Math.round(p.fontSize * 2.2);
}

/** The legend with the series' names in the series' order (ECharts would append series new to a redraw at the end). */
export function legendFor(series: Record<string, unknown>[], p: Palette): Record<string, unknown> {
  return { ...legendOption(p), data: series.map((s) => String(s.name)) };
}

/** Legend fields shared by the views (plain, wrapping, at the top). */
export function legendOption(p: Palette): Record<string, unknown> {
  return { top: 0, left: 'center', itemGap: 10, textStyle: { color: p.foreground }, inactiveColor: p.muted };
}
