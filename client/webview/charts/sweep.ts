/**
 * The sweep view: chosen quantities against the swept parameter, from a sweep result alone (the
 * `sweep` field of `expand --json`, analysis/sweep/types.ts). Lines for the captured weight and the
 * populations of the lowest levels (left axis, 0 to 1) and the energy mean (right axis); the design
 * window shaded; the places where the bound-level count steps or an `expect` line flips, located by
 * the engine between points, marked as vertical lines. Pure: no DOM, so the command line draws it too.
 *
 * A two-parameter map is not drawn yet: the description then says so instead of a plot.
 */
import type { SweepResult } from '../../../server/src/analysis/sweep/types';
import type { Palette } from '../theme';
import { axisStyle, baseOption, unitSuffix, type Option } from './context';
import { legendFor, plotTop, type ChartSize } from './layout';
import { niceAxis } from './scale';

/** The sweep view's chart option, notes and, without a plot, why. */
export interface SweepDescription {
  option: Option | null;
  notes: string[];
  empty: string | null;
}

/** How many of the lowest levels get a population line. */
const LEVEL_LINES = 3;

/** The sweep view of `sweep` (see the header). */
export function sweepView(sweep: SweepResult, palette: Palette, size: ChartSize, energyUnit: string | null): SweepDescription {
  if (sweep.axes.length !== 1) {
    return { option: null, notes: [], empty: 'This sweep varies two parameters; its map is not drawn yet. Use `eigenspan sweep FILE --csv` for its numbers.' };
  }
  const axis = sweep.axes[0]!;
  const pts = sweep.points.filter((p): p is NonNullable<typeof p> => p !== null && p.valid);
  if (pts.length === 0) return { option: null, notes: [], empty: 'No point of the sweep could be analysed; see the findings on the sweep line.' };
  const p = palette;
  const xy = (f: (q: (typeof pts)[number]) => number | null) => pts.map((q) => [q.at[0]!, f(q)]);
  const labels = [...new Set(pts.flatMap((q) => q.levels.slice(0, LEVEL_LINES).map((l) => l.n)))].sort((a, b) => a - b).slice(0, LEVEL_LINES);
  const colours = [p.real, p.imag, p.partial];
  const series: Option[] = [
    {
      id: 'captured',
      name: 'captured weight',
      type: 'line',
      showSymbol: true,
      symbolSize: 4,
      data: xy((q) => q.captured),
      lineStyle: { color: p.density, width: p.lineWidth },
      itemStyle: { color: p.density },
      markArea: windowArea(sweep, p),
      markLine: locatedLines(sweep, p),
    },
    ...labels.map((n, k) => ({
      id: `P${n}`,
      name: `P(${n})`,
      type: 'line',
      showSymbol: false,
      data: xy((q) => q.levels.find((l) => l.n === n)?.weight ?? null),
      lineStyle: { color: colours[k % colours.length], width: p.lineWidth },
      itemStyle: { color: colours[k % colours.length] },
    })),
    {
      id: 'mean',
      name: '⟨E⟩',
      type: 'line',
      yAxisIndex: 1,
      showSymbol: false,
      data: xy((q) => q.mean),
      lineStyle: { color: p.foreground, width: 1, type: 'dashed' },
      itemStyle: { color: p.foreground },
    },
  ];
  const means = pts.map((q) => q.mean).filter((v): v is number => v !== null && Number.isFinite(v));
  const energyAxis = means.length > 0 ? niceAxis(Math.min(...means), Math.max(...means)) : { min: 0, max: 1 };
  const logX = axis.spacing === 'log' && axis.from > 0 && axis.to > 0;
  const top = plotTop(series.map((q) => String(q.name)), size, p);
  const option: Option = {
    ...baseOption(p),
    legend: legendFor(series, p),
    grid: { left: 64, right: 72, top, bottom: Math.round(p.fontSize * 3.4) },
    xAxis: { type: logX ? 'log' : 'value', name: `${axis.name}${unitSuffix(axis.unit)}`, nameLocation: 'middle', nameGap: 28, min: Math.min(axis.from, axis.to), max: Math.max(axis.from, axis.to), ...axisStyle(p) },
    yAxis: [
      { type: 'value', name: 'weight', min: 0, max: 1, ...axisStyle(p) },
      { type: 'value', name: `⟨E⟩${unitSuffix(energyUnit)}`, min: energyAxis.min, max: energyAxis.max, ...axisStyle(p), splitLine: { show: false } },
    ],
    series,
  };
  return { option, notes: sweepNotes(sweep), empty: null };
}

/** The design window as shaded bands over the captured-weight series. */
function windowArea(sweep: SweepResult, p: Palette): Option | undefined {
  const bands = sweep.windows.filter((w) => w.row === null).map((w) => [{ xAxis: w.from }, { xAxis: w.to }]);
  if (bands.length === 0) return undefined;
  return { silent: true, itemStyle: { color: p.accent, opacity: 0.12 }, label: { show: true, position: 'insideTop', color: p.muted, formatter: 'design window' }, data: bands };
}

/** Vertical lines where the bound count steps (solid) or an expect line flips (dashed). */
function locatedLines(sweep: SweepResult, p: Palette): Option | undefined {
  const data = sweep.located
    .filter((l) => l.row === null)
    .map((l) => ({
      xAxis: l.at,
      lineStyle: { color: p.muted, width: 1, type: l.kind === 'bound' ? 'solid' : 'dashed' },
      label: { show: true, position: 'insideEndTop', color: p.muted, formatter: l.kind === 'bound' ? `bound ${l.before} → ${l.after}` : `line ${sweep.expects[l.expect ?? 0]?.line ?? '?'} ${l.after ? 'holds' : 'fails'}` },
    }));
  return data.length === 0 ? undefined : { silent: true, symbol: 'none', animation: false, data };
}

/** What the view leaves out or where it stopped. */
function sweepNotes(sweep: SweepResult): string[] {
  const notes: string[] = [];
  if (sweep.stopped !== null) notes.push(`The sweep stopped (${sweep.stopped}) after ${sweep.finished} of ${sweep.total} points; the curves end there.`);
  const invalid = sweep.points.filter((q) => q !== null && !q.valid).length;
  if (invalid > 0) notes.push(`${invalid} point(s) where the setup is invalid are left out.`);
  if (sweep.expects.length > 0 && sweep.windows.length === 0) notes.push('No swept value satisfies every expect line: there is no design window.');
  return notes;
}
