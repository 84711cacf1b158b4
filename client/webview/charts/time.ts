/**
 * Time view: |psi(x, t)|^2 at the chosen time above, the survival probability with the revival below.
 * Pure (no DOM).
 */
import { formatNumber } from '../../src/format';
import { axisStyle, baseOption, unitSuffix, type BuildContext, type Option } from './context';
import { niceCeil } from './scale';

function topSeries(ctx: BuildContext, i: number): Option {
  const { result, palette: p } = ctx;
  const ev = result.evolution!;
  const x = result.samples?.x ?? [];
  const dens = ev.density?.[i];
  return dens
    ? { id: 'density-t', name: '|ψ(x,t)|²', type: 'line', showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, areaStyle: { color: p.density, opacity: 0.2 }, lineStyle: { color: p.density, width: p.lineWidth }, itemStyle: { color: p.density }, data: dens.map((v, j) => [x[j], v]) }
    : { id: 'meanx-t', name: '⟨x⟩(t)', type: 'line', showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, lineStyle: { color: p.real, width: p.lineWidth }, itemStyle: { color: p.real }, data: ev.times.map((tt, j) => [tt, ev.meanX[j]]) };
}

function survivalSeries(ctx: BuildContext, t: number): Option {
  const { result, palette: p } = ctx;
  const ev = result.evolution!;
  const marks: Option[] = [{ xAxis: t, lineStyle: { color: p.accent, type: 'solid', width: p.lineWidth }, label: { formatter: 't', color: p.foreground } }];
  if (ev.revival !== null) marks.push({ xAxis: ev.revival, lineStyle: { color: p.cumulative, type: 'dashed', width: p.lineWidth }, label: { formatter: 'revival', color: p.foreground } });
  return {
    id: 'survival',
    name: 'survival |⟨ψ(0)|ψ(t)⟩|²',
    type: 'line',
    showSymbol: false,
    xAxisIndex: 1,
    yAxisIndex: 1,
    lineStyle: { color: p.cumulative, width: p.lineWidth },
    itemStyle: { color: p.cumulative },
    data: ev.times.map((tt, j) => [tt, ev.survival[j]]),
    markLine: { silent: true, symbol: 'none', animation: false, data: marks },
  };
}

function timeAxes(ctx: BuildContext): { xAxis: Option[]; yAxis: Option[] } {
  const { result, palette: p } = ctx;
  const ev = result.evolution!;
  const tu = result.units.time;
  const x = result.samples?.x ?? [];
  const dens = ev.density !== undefined && ev.density.length > 0;
  let dmax = 0;
  for (const row of ev.density ?? []) for (const v of row) if (v !== null && v > dmax) dmax = v;
  return {
    xAxis: [
      dens
        ? { gridIndex: 0, type: 'value', name: `x${unitSuffix(result.units.length)}`, nameLocation: 'middle', nameGap: 24, min: x[0] ?? 0, max: x[x.length - 1] ?? 1, ...axisStyle(p) }
        : { gridIndex: 0, type: 'value', name: `t${unitSuffix(tu)}`, nameLocation: 'middle', nameGap: 24, ...axisStyle(p) },
      { gridIndex: 1, type: 'value', name: `t${unitSuffix(tu)}`, nameLocation: 'middle', nameGap: 24, min: ev.times[0] ?? 0, max: ev.times[ev.times.length - 1] ?? 1, ...axisStyle(p), axisLabel: { color: p.foreground, showMaxLabel: false } },
    ],
    yAxis: [
      dens ? { gridIndex: 0, type: 'value', name: '|ψ|²', min: 0, max: niceCeil(dmax * 1.02), ...axisStyle(p) } : { gridIndex: 0, type: 'value', name: '⟨x⟩', scale: true, ...axisStyle(p) },
      { gridIndex: 1, type: 'value', name: 'survival', min: 0, max: 1, ...axisStyle(p) },
    ],
  };
}

/** The time view's chart option (the result must have an evolution with at least one time). */
export function timeOption(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const ev = result.evolution!;
  const i = Math.max(0, Math.min(settings.timeIndex, ev.times.length - 1));
  return {
    ...baseOption(p),
    grid: [
      { left: 64, right: 32, top: 36, height: '42%' },
      { left: 64, right: 32, bottom: 40, height: '28%' },
    ],
    tooltip: { ...(baseOption(p).tooltip as Option), trigger: 'axis', formatter: (params: { seriesName: string; value: [number, number] }[]) => ctx.tooltip(params.map((q) => [q.seriesName, `${formatNumber(q.value[1], 4)} at ${formatNumber(q.value[0], 4)}`] as [string, string])) },
    ...timeAxes(ctx),
    series: [topSeries(ctx, i), survivalSeries(ctx, ev.times[i] ?? 0)],
  };
}
