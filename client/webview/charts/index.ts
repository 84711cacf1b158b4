/**
 * The chart descriptions of the panel's views, built from an analysis result alone: ECharts option
 * objects with no browser code, so the panel, the tests and a command-line renderer (ECharts'
 * server-side SVG output) draw the same plots.
 */
export { DEFAULT_SETTINGS, type BuildContext, type Option, type TooltipRows, type ViewSettings } from './context';
export { logFloor, niceBound, niceCeil } from './scale';
export { hasParity, spectrumOption } from './spectrum';
export { energyWindow, stateOption } from './state';
export { timeOption } from './time';
