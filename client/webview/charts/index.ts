/**
 * The chart descriptions of the panel's views, built from an analysis result alone: ECharts option
 * objects with no browser code, so the panel, the tests and a command-line renderer (ECharts'
 * server-side SVG output) draw the same plots, with the same notes beside them.
 */
import type { BuildContext, Option } from './context';
import { spectrumNotes, spectrumOption } from './spectrum';
import { stateChart, stateNotes } from './state';
import { evolveHint, timeNotes, timeOption } from './time';

export { DEFAULT_SETTINGS, type BuildContext, type Option, type TooltipRows, type ViewSettings } from './context';
export { decadeAxis, niceAxis, niceBound, niceCeil, tickFormatter } from './scale';
export { effectiveScale, spectrumOption, termsShown } from './spectrum';
export { energyWindow, stateAxes, stateOption } from './state';
export { survivalCurve, timeOption } from './time';
export { sweepView, type SweepDescription } from './sweep';
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
      return { option: c.option, notes: stateNotes(c.sharedZero, c.shown, r.units.length), empty: null };
    }
    case 'time':
      if (!r.evolution || r.evolution.times.length === 0) return { option: null, notes: [], empty: evolveHint(r) };
      return { option: timeOption(ctx), notes: timeNotes(r), empty: null };
  }
}
