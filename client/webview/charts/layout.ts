/**
 * Room for the legend and the axis names, from the chart's size: the legend wraps at narrow widths, so
 * the plot area starts below its last row instead of under it. Text widths are estimated from the font
 * size with a wide UI font's metrics (textWidth.ts), which errs on the wide side.
 */
import type { Palette } from '../theme';
import { textWidth } from '../../../server/src/shared/textWidth';

/** The chart's size in CSS pixels (the panel measures it; a command-line renderer chooses it). */
export interface ChartSize {
  width: number;
  height: number;
}

/** The size assumed when none is given. */
export const DEFAULT_SIZE: ChartSize = { width: 800, height: 440 };

/** Share of the legend's width a planned row may fill: room for a UI font a little wider than the estimate's. */
const ROW_FILL = 0.97;

/**
 * The legend's rows for these entry names at this width. An entry (icon 25 px, 5 px to its text, the
 * text) starts a new row when it would end past the legend's width (the chart's less its padding of
 * 5 px a side, times ROW_FILL); entries are 10 px apart (itemGap). The legend is given these rows
 * (legendFor), so the room kept above the plot is the room it takes, whatever ECharts would measure.
 */
export function legendLayout(names: string[], width: number, p: Palette): string[][] {
  const avail = Math.max(100, width - 10) * ROW_FILL;
  const rows: string[][] = [[]];
  let x = 0;
  for (const n of names) {
    const w = 25 + 5 + textWidth(n, p.fontSize);
    if (x > 0 && x + w > avail) ((rows.push([]), (x = 0)));
    rows[rows.length - 1]!.push(n);
    x += w + 10;
  }
  return rows;
}

/** Rows the legend takes for these entry names at this width (see {@link legendLayout}). */
export function legendRows(names: string[], width: number, p: Palette): number {
  return legendLayout(names, width, p).length;
}

/** About how many intervals a horizontal value axis gets: one per 120 px, 3 to 10. */
export const xTicks = (size: ChartSize) => Math.max(3, Math.min(10, Math.floor((size.width - 100) / 120)));

/** Height of one legend row in pixels. */
export const legendRowHeight = (p: Palette) => Math.round(p.fontSize + 11);

/** Top of the first plot area: below the legend rows and the room the axis names need above a grid. */
export function plotTop(names: string[], size: ChartSize, p: Palette): number {
  return legendRows(names, size.width, p) * legendRowHeight(p) + Math.round(p.fontSize * 2.2);
}

/**
 * The legend with the series' names in the series' order (ECharts would append series new to a redraw
 * at the end); with the chart's size, in the rows of {@link legendLayout}, each after the first begun
 * by ECharts' newline entry '\n'.
 */
export function legendFor(series: Record<string, unknown>[], p: Palette, size?: ChartSize): Record<string, unknown> {
  const names = series.map((s) => String(s.name));
  if (!size) return { ...legendOption(p), data: names };
  return { ...legendOption(p), data: legendLayout(names, size.width, p).flatMap((row, i) => (i === 0 ? row : ['\n', ...row])) };
}

/** Legend fields shared by the views (plain, wrapping, at the top). */
export function legendOption(p: Palette): Record<string, unknown> {
  return { top: 0, left: 'center', itemGap: 10, textStyle: { color: p.foreground }, inactiveColor: p.muted };
}
