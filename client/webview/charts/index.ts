/**
 * The chart descriptions of the panel's views, built from an analysis result alone: ECharts option
 * objects with no browser code, so the panel, the tests and a command-line renderer (ECharts'
 * server-side SVG output) draw the same plots, with the same notes beside them.
 */
import type { BuildContext, Option } from './context';
import { spectrumNotes, spectrumOption } from './spectrum';
import { stateChart, stateNotes } from './state';
import { evolveHint, timeNotes, timeOption } from './time';
import { sweepView } from './sweep';

export { DEFAULT_SETTINGS, type BuildContext, type Option, type TooltipRows, type ViewSettings } from './context';
export { decadeAxis, niceAxis, niceBound, niceCeil, tickFormatter } from './scale';
export { effectiveScale, spectrumOption, termsShown } from './spectrum';
export { energyWindow, stateAxes, stateOption } from './state';
export { survivalCurve, timeOption } from './time';
export { locatedLines, sweepView, type SweepDescription, type SweepViewOptions } from './sweep';
export { availableQuantities, plainRows, pointRows, QUANTITY_LABELS, SWEEP_QUANTITIES, type SweepQuantity } from './sweepQuantity';
export { cellEdges, mapColours } from './sweepMap';
export { windowContour, type Polyline } from './contour';
export * from './facts';
export { DEFAULT_SIZE, legendRows, type ChartSize } from './layout';

/** One view as drawn: the chart option (null when there is nothing to plot), notes beside it, or why it is empty. */
export interface ViewDescription {
  option: Option | null;
  /** Short sentences shown with the plot: what it leaves out, how it is scaled, what to watch. */
  notes: string[];
  /** When `option` is null: what the user can do to get a plot. */
  empty: string | null;
}

/** The description of the view `ctx.settings.tab` for the result. */
export function describeView(ctx: BuildContext): ViewDescription {
  const r = ctx.result;
  switch (ctx.settings.tab) {
    case 'spectrum':
      return { option: spectrumOption(ctx), notes: spectrumNotes(ctx), empty: null };
    case 'state': {
      if (!r.samples) return { option: null, notes: [], empty: 'No samples of the state were sent with this result.' };
      const c = stateChart(ctx);
      return { option: c.option, notes: [...stateNotes(c.sharedZero, c.shown, r.units.length), ...(c.above ? [c.above] : []), ...(c.mass ? [c.mass] : [])], empty: null };
    }
    case 'time':
      if (!r.evolution || r.evolution.times.length === 0) return { option: null, notes: [], empty: evolveHint(r) };
      return { option: timeOption(ctx), notes: timeNotes(r), empty: null };
    case 'sweep':
      if (!r.sweep) return { option: null, notes: [], empty: 'This file has no sweep yet: a `sweep NAME from A to B steps K` line varies a let, and the sweep appears here as its points finish.' };
      return sweepView(r.sweep, ctx.palette, ctx.size ?? { width: 800, height: 440 }, r.units.energy, { quantity: ctx.settings.sweepQuantity, tooltip: ctx.tooltip });
  }
}
