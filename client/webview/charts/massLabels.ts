/**
 * The masses of a heterostructure in the state view: one horizontal label a region ("0.088 m_e"),
 * inside the region it names (between its interfaces, so which side a value belongs to cannot be
 * misread), at the highest height where its box crosses no drawn curve or line (freeBand.ts). A region
 * too narrow on screen for its label, or with no free height, is named in a note instead. Pure (no DOM).
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import { textWidth } from '../../../server/src/shared/textWidth';
import type { PanelResult } from '../../src/messages';
import type { Option } from './context';
import { freeHeight, tracesOf, type Frame, type Span } from './freeBand';

/** A region of constant (or graded) mass, its bounds (null: the line's end) and the mass in it. */
interface Region {
  from: number | null;
  to: number | null;
  text: string;
}

/** Room kept between a label and its region's interfaces, in pixels. */
const SIDE_GAP = 6;

/** "0.088 m_e" or "0.067 to 0.088 m_e" (a graded region); in natural units "m = 0.5" (a bare number needs its name). */
function massText(min: number, max: number, unit: string | null): string {
  const same = Math.abs(max - min) <= 1e-9 * Math.abs(max);
  const value = same ? formatNumber(min, 3) : `${formatNumber(min, 3)} to ${formatNumber(max, 3)}`;
  return unit ? `${value} ${unit}` : `m = ${value}`;
}

/** The regions from the result's `system.mass` (the engine's), or from the sampled profile between the interfaces. */
function regionsOf(result: PanelResult): Region[] {
  const facts = result.system?.mass;
  if (facts && facts.regions.length > 0) return facts.regions.map((r) => ({ from: r.from, to: r.to, text: massText(r.min, r.max, facts.unit) }));
  const s = result.samples!;
  const cuts = (s.interfaces ?? []).filter(Number.isFinite);
  const edges: (number | null)[] = [null, ...cuts, null];
  const out: Region[] = [];
  for (let i = 0; i + 1 < edges.length; i++) {
    const vals = s.x.map((x, j) => ((edges[i] === null || x > edges[i]!) && (edges[i + 1] === null || x < edges[i + 1]!) ? s.mass![j]! : NaN)).filter(Number.isFinite);
    if (vals.length > 0) out.push({ from: edges[i]!, to: edges[i + 1]!, text: massText(Math.min(...vals), Math.max(...vals), s.massUnit ?? null) });
  }
  return out;
}

/** What the labels need of the chart: the series drawn, the x axis, the y axes' ranges, the plot area and the font. */
export interface LabelPlot {
  series: Option[];
  x: Span;
  axes: Span[];
  frame: Frame;
  fontSize: number;
  /** The mass axis (the labels' coordinates are on it). */
  massAxis: number;
  color: string;
  background: string;
}

/** Where a label of du (fraction) fits in [a, b] (fractions): candidates from the centre outwards. */
function candidates(a: number, b: number, du: number): number[] {
  const lo = a + du / 2;
  const hi = b - du / 2;
  if (hi < lo) return [];
  const mid = (lo + hi) / 2;
  const out = [mid];
  for (let k = 1; k <= 6; k++) out.push(mid - ((hi - lo) / 2) * (k / 6), mid + ((hi - lo) / 2) * (k / 6));
  return out;
}

/**
 * The labels as markLine items of the mass series (an invisible segment each, as wide as its label,
 * the label in its middle) and the note naming every region when a label could not be placed (null
 * when all were).
 */
export function massLabels(result: PanelResult, plot: LabelPlot, lengthUnit: string | null): { lines: Option[][]; note: string | null } {
  const regions = regionsOf(result);
  const traces = tracesOf(plot.series, plot.x, plot.axes);
  const h = Math.round(plot.fontSize + 4);
  const m = plot.axes[plot.massAxis]!;
  const lines: Option[][] = [];
  let missed = false;
  for (const r of regions) {
    const a = Math.max(plot.x.min, r.from ?? -Infinity);
    const b = Math.min(plot.x.max, r.to ?? Infinity);
    if (!(b > a)) continue;
    const w = textWidth(r.text, plot.fontSize) + 6;
    const ua = (a - plot.x.min) / (plot.x.max - plot.x.min) + SIDE_GAP / plot.frame.width;
    const ub = (b - plot.x.min) / (plot.x.max - plot.x.min) - SIDE_GAP / plot.frame.width;
    const du = w / plot.frame.width;
    let best: { u: number; v: number } | null = null;
    for (const u of candidates(ua, ub, du)) {
      const v = freeHeight(traces, u - du / 2, u + du / 2, h, plot.frame);
      if (v !== null && (best === null || v > best.v + 1e-9)) best = { u, v };
    }
    if (!best) {
      missed = true;
      continue;
    }
    // An invisible markLine segment as wide as the label carries it (the panel registers no markPoint).
    const at = (u: number): number => plot.x.min + u * (plot.x.max - plot.x.min);
    const y = m.min + best.v * (m.max - m.min);
    const label = { show: true, position: 'middle', distance: 0, formatter: r.text, color: plot.color, fontSize: plot.fontSize, backgroundColor: plot.background, padding: [2, 3] };
    lines.push([{ coord: [at(best.u - du / 2), y], lineStyle: { color: 'rgba(0, 0, 0, 0)', width: 1, type: 'solid' }, label, name: 'mass label' }, { coord: [at(best.u + du / 2), y] }]);
  }
  return { lines, note: missed ? regionNote(regions, lengthUnit) : null };
}

/** "Mass: 0.088 m_e for x < -4.5 nm; 0.067 m_e from -4.5 to 4.5 nm; ..." */
function regionNote(regions: Region[], lengthUnit: string | null): string {
  const u = lengthUnit ? ` ${lengthUnit}` : '';
  const f = (v: number) => formatNumber(v, 4);
  const where = (r: Region) => (r.from === null && r.to === null ? 'everywhere' : r.from === null ? `for x < ${f(r.to!)}${u}` : r.to === null ? `for x > ${f(r.from)}${u}` : `from ${f(r.from)} to ${f(r.to)}${u}`);
  return `Mass by region: ${regions.map((r) => `${r.text.replace(/^m = /, '')} ${where(r)}`).join('; ')}.`;
}
