/**
 * Read-only facts about what a chart has drawn, for the browser tests and for troubleshooting: the
 * texts on the canvas with their boxes, the axis labels, the bars' rectangles and where a value lands.
 * Reads ECharts' and zrender's internals, which their public typings do not describe.
 */
import type * as echarts from 'echarts/core';

/** A drawn text and its box in chart pixels. */
export interface DrawnText {
  text: string;
  x: number;
  y: number;
  width: number;
  height: number;
}

interface ZrText {
  type: string;
  ignore?: boolean;
  invisible?: boolean;
  style?: { text?: string; opacity?: number; font?: string };
  parent?: ZrText;
  getBoundingRect(): { clone(): { applyTransform(m: unknown): void; x: number; y: number; width: number; height: number } };
  getComputedTransform(): unknown;
}

function hidden(el: ZrText | undefined): boolean {
  for (let e = el; e; e = e.parent) if (e.ignore || e.invisible) return true;
  return false;
}

/**
 * Every visible text of the chart (labels, names, legend entries) with its box. zrender draws each line
 * of a text as a `tspan` inside a `text` element; the box is the text element's (its full line height).
 */
export function drawnTexts(chart: echarts.ECharts): DrawnText[] {
  const zr = chart.getZr() as unknown as { storage: { getDisplayList(update: boolean): ZrText[] } };
  const seen = new Set<ZrText>();
  const out: DrawnText[] = [];
  for (const span of zr.storage.getDisplayList(true)) {
    if (span.type !== 'tspan' || hidden(span) || (span.style?.text ?? '') === '' || (span.style?.opacity ?? 1) === 0) continue;
    const el = span.parent && span.parent.type === 'text' ? span.parent : span;
    if (seen.has(el)) continue;
    seen.add(el);
    const r = el.getBoundingRect().clone();
    r.applyTransform(el.getComputedTransform());
    // zrender's box covers the glyphs' x-height or so; a reader needs the whole line, the font size, centred on it.
    const px = Number(/(\d+(?:\.\d+)?)px/.exec(span.style?.font ?? '')?.[1] ?? 12);
    const h = Math.max(r.height, px);
    out.push({ text: String(span.style!.text), x: r.x, y: r.y - (h - r.height) / 2, width: r.width, height: h });
  }
  return out;
}

interface AxisModel {
  axis: { getViewLabels(): { formattedLabel: string; tick?: { offInterval?: boolean } }[] };
}

/** The labels ECharts shows on each x and y axis. */
export function axisLabels(chart: echarts.ECharts): { x: string[][]; y: string[][] } {
  const model = (chart as unknown as { getModel(): { getComponent(t: string, i: number): AxisModel | undefined } }).getModel();
  const read = (type: string) => {
    const out: string[][] = [];
    for (let i = 0; ; i++) {
      const c = model.getComponent(type, i);
      if (!c) return out;
      // A category axis's end labels off its label interval are listed but not drawn (ECharts 6 hides them).
      out.push(c.axis.getViewLabels().filter((l) => l.tick?.offInterval !== true).map((l) => l.formattedLabel));
    }
  };
  return { x: read('xAxis'), y: read('yAxis') };
}

/** The laid-out rectangle of each data item of the series `id` (bars), or null for items not drawn. */
export function itemLayouts(chart: echarts.ECharts, id: string): ({ x: number; y: number; width: number; height: number } | null)[] {
  const model = (chart as unknown as { getModel(): { getSeries(): { id: string; getData(): { count(): number; getItemLayout(i: number): unknown } }[] } }).getModel();
  const s = model.getSeries().find((q) => q.id === id);
  if (!s) return [];
  const d = s.getData();
  return Array.from({ length: d.count() }, (_, i) => (d.getItemLayout(i) as { x: number; y: number; width: number; height: number } | null) ?? null);
}

/** The pixel height at which `value` sits on the y axis `index`. */
export function yPixel(chart: echarts.ECharts, index: number, value: number): number {
  return chart.convertToPixel({ yAxisIndex: index }, value) as number;
}

/** The pixel x at which `value` sits on the first x axis. */
export function xPixel(chart: echarts.ECharts, value: number): number {
  return chart.convertToPixel({ xAxisIndex: 0 }, value) as number;
}

/** The points of the line series `id` as drawn (its laid-out polyline), in chart pixels; empty when it has none. */
export function linePoints(chart: echarts.ECharts, id: string): [number, number][] {
  const model = (chart as unknown as { getModel(): { getSeries(): { id: string; getData(): { getLayout(k: string): ArrayLike<number> | undefined } }[] } }).getModel();
  const flat = model.getSeries().find((q) => q.id === id)?.getData().getLayout('points');
  const out: [number, number][] = [];
  if (flat) for (let j = 0; j + 1 < flat.length; j += 2) out.push([flat[j]!, flat[j + 1]!]);
  return out;
}
