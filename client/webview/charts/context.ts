/**
 * What every chart builder shares: the view settings, the build context and the common option parts.
 * Pure (no DOM, no `window`): the panel, the tests and a command-line renderer build the same options.
 */
import type { PanelResult } from '../../src/messages';
import type { Palette } from '../theme';
import type { SweepQuantity } from './sweepQuantity';
import { legendOption, type ChartSize } from './layout';

/** What the user has chosen in the panel; kept across reloads. */
export interface ViewSettings {
  tab: 'spectrum' | 'state' | 'time' | 'sweep';
  /** Vertical scale of the spectrum; 'auto' takes the natural one for the result (see `naturalScale`). */
  scale: 'auto' | 'linear' | 'log';
  axis: 'n' | 'energy';
  /** Terms K of the partial sum (clamped to what the result has). */
  terms: number;
  /** Index (into levels) of the level picked in any view, or null. */
  selected: number | null;
  /** Index into evolution.times. */
  timeIndex: number;
  /** What the sweep view draws (sweepQuantity.ts). */
  sweepQuantity: SweepQuantity;
}

/** Defaults of `ViewSettings`. */
export const DEFAULT_SETTINGS: ViewSettings = { tab: 'spectrum', scale: 'auto', axis: 'n', terms: 10, selected: null, timeIndex: 0, sweepQuantity: 'overview' };

/** Rows of label/value text shown in a tooltip. */
export type TooltipRows = [string, string][];

/** Context the builders share. */
export interface BuildContext {
  result: PanelResult;
  settings: ViewSettings;
  palette: Palette;
  /** Builds a tooltip's content from rows (the panel uses text nodes; tests and the command line plain text). */
  tooltip: (rows: TooltipRows) => unknown;
  /** The chart's size (default `DEFAULT_SIZE`), for the room the legend and labels need. */
  size?: ChartSize;
}

/** An ECharts option object (or a part of one). */
export type Option = Record<string, unknown>;

/** ` (unit)` or nothing. */
export const unitSuffix = (u: string | null) => (u ? ` (${u})` : '');

/**
 * A density axis title with its unit: |psi|^2 and rho(x) are per length (they integrate to 1 over x),
 * psi per square root of length. `names` are [density] or [psi, density]; bare in natural units.
 */
export function perLengthTitle(names: [string] | [string, string], length: string | null): string {
  if (!length) return names.join(', ');
  return names.length === 2 ? `${names[0]} (${length}^-1/2), ${names[1]} (1/${length})` : `${names[0]} (1/${length})`;
}

/** Background, text, legend and tooltip style shared by the views. */
export function baseOption(p: Palette): Option {
  return {
    animation: false,
    backgroundColor: p.background,
    textStyle: { color: p.foreground, fontFamily: p.fontFamily, fontSize: p.fontSize },
    legend: legendOption(p),
    tooltip: {
      confine: true,
      backgroundColor: p.background,
      borderColor: p.grid,
      textStyle: { color: p.foreground, fontFamily: p.fontFamily },
    },
  };
}

/** Axis line, labels, name and grid lines in the theme's colours. */
export function axisStyle(p: Palette): Option {
  return {
    axisLine: { onZero: false, lineStyle: { color: p.muted } },
    axisLabel: { color: p.foreground, hideOverlap: true },
    nameTextStyle: { color: p.foreground },
    splitLine: { lineStyle: { color: p.grid, opacity: 0.6 } },
  };
}

/** (x, y) pairs for a line series. */
export const pairs = (x: ArrayLike<number | null>, y: ArrayLike<number>) => Array.from(y, (v, j) => [x[j], v]);
