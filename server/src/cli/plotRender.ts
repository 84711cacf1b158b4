/**
 * The entry of dist/plot.js: draws one of the panel's views without a browser. The chart option comes
 * from the panel's own builder (`describeView` in client/webview/charts), so a picture made here and the
 * panel cannot drift apart; ECharts' server-side SVG renderer draws it, and resvg (a rasteriser without
 * a browser) turns the SVG into a PNG on request.
 *
 * This module carries the chart library, so the command line loads it only for `plot` (plotLoad.ts):
 * `expand` and `check` never parse it.
 */
import * as echarts from 'echarts/core';
import { BarChart, CustomChart, LineChart, ScatterChart } from 'echarts/charts';
import { GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent, VisualMapContinuousComponent } from 'echarts/components';
import { SVGRenderer } from 'echarts/renderers';
import type { PanelResult } from '../../../client/src/messages';
import { DEFAULT_SETTINGS, describeView, plainRows, sweepView, type Option, type SweepQuantity, type ViewSettings } from '../../../client/webview/charts';
import type { SweepResult } from '../analysis/sweep/types';
import { readPalette, type ThemeKind } from '../../../client/webview/theme';
import { PICTURE_FONT, PICTURE_FONTS, textWidth } from './plotFont';

// The chart and component types the panel registers (client/webview/main.ts), with the SVG renderer only.
echarts.use([BarChart, LineChart, ScatterChart, CustomChart, GridComponent, TooltipComponent, LegendComponent, MarkLineComponent, MarkAreaComponent, VisualMapContinuousComponent, SVGRenderer]);

/** What to draw: the view, its settings beyond the panel's defaults, the picture's size and theme. */
export interface PictureRequest {
  view: ViewSettings['tab'];
  width: number;
  height: number;
  theme: Extract<ThemeKind, 'light' | 'dark'>;
  scale?: ViewSettings['scale'];
  axis?: ViewSettings['axis'];
  terms?: number;
  /** Index into the evolution's times for the time view (default 0). */
  step?: number;
  /** What the sweep view draws (default the overview). */
  quantity?: SweepQuantity;
}

/** One view drawn: the SVG text (null when the view has nothing to plot), the panel's notes, or why it is empty. */
export interface Picture {
  svg: string | null;
  notes: string[];
  empty: string | null;
}

// Text is laid out with the widths of the font it is drawn in (plotFont.ts), as a browser would.
echarts.setPlatformAPI({ measureText: (text: string, font?: string) => ({ width: textWidth(text, font) }) });

/** Tooltips are not drawn in a picture; the rows become plain text like the tests' builder. */
const plainTooltip = plainRows;

/** Draws `request.view` of `result` as SVG with the panel's chart option. */
export function drawView(result: PanelResult, request: PictureRequest): Picture {
  // No editor theme here: the palette's neutral fallbacks of the light or dark kind, at a fixed font.
  const palette = { ...readPalette(() => '', request.theme), fontFamily: PICTURE_FONTS };
  const settings: ViewSettings = {
    ...DEFAULT_SETTINGS,
    tab: request.view,
    scale: request.scale ?? DEFAULT_SETTINGS.scale,
    axis: request.axis ?? DEFAULT_SETTINGS.axis,
    terms: request.terms ?? DEFAULT_SETTINGS.terms,
    timeIndex: request.step ?? DEFAULT_SETTINGS.timeIndex,
  };
  const size = { width: request.width, height: request.height };
  const view = describeView({ result, settings, palette, tooltip: plainTooltip, size });
  return render(view, size);
}

/** Draws the sweep view of a sweep result (the panel's builder, client/webview/charts/sweep.ts; a map for two parameters). */
export function drawSweep(sweep: SweepResult, energyUnit: string | null, request: Omit<PictureRequest, 'view'>): Picture {
  const palette = { ...readPalette(() => '', request.theme), fontFamily: PICTURE_FONTS };
  const size = { width: request.width, height: request.height };
  return render(sweepView(sweep, palette, size, energyUnit, { quantity: request.quantity, tooltip: plainTooltip }), size);
}

/** One chart option as SVG with ECharts' server-side renderer. */
function render(view: { option: Option | null; notes: string[]; empty: string | null }, size: { width: number; height: number }): Picture {
  if (!view.option) return { svg: null, notes: view.notes, empty: view.empty };
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width: size.width, height: size.height });
  try {
    chart.setOption(view.option);
    return { svg: chart.renderToSVGString(), notes: view.notes, empty: null };
  } finally {
    // Disposing stops the chart's animation loop, which would otherwise keep the process alive.
    chart.dispose();
  }
}

/** The rasteriser's interface as used here (the package's own types are not needed for this much). */
interface Rasteriser {
  Resvg: new (svg: string, options: object) => { render(): { asPng(): Buffer } };
}

/** The package that rasterises SVG; loaded on the first PNG only. */
export const RASTERISER = '@resvg/resvg-js';

/** The rasteriser, or null when it is not installed (a development dependency; users of the package install it for PNG). */
function rasteriser(): Rasteriser | null {
  try {
    return require(RASTERISER) as Rasteriser;
  } catch {
    return null;
  }
}

/** Whether PNG output is possible here. */
export const canRasterise = (): boolean => rasteriser() !== null;

/**
 * The SVG as a PNG of the SVG's own size in pixels, or null when the rasteriser is not installed.
 * Text is drawn with the machine's fonts (resvg loads the system fonts), so a machine without any of
 * `PICTURE_FONTS` draws the plot without its labels.
 */
export function svgToPng(svg: string): Buffer | null {
  const lib = rasteriser();
  if (!lib) return null;
  const resvg = new lib.Resvg(svg, { font: { loadSystemFonts: true, defaultFontFamily: PICTURE_FONT, sansSerifFamily: PICTURE_FONT }, background: undefined });
  return resvg.render().asPng();
}
