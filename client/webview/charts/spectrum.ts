/**
 * Spectrum view: |c_n|^2 as bars (the two symmetry classes in two series), the cumulative weight as a line.
 * Pure (no DOM).
 */
import { formatNumber, cumulativeWeights, phaseOf } from '../../src/format';
import type { PanelResult } from '../../src/messages';
import { isSymmetric } from '../physics';
import { axisStyle, baseOption, unitSuffix, type BuildContext, type Option } from './context';
import { logFloor } from './scale';

/** Whether levels can be labelled even/odd: the potential must be symmetric about the system's centre. */
export function hasParity(result: PanelResult): boolean {
  const kind = result.system?.kind;
  if (kind === 'box' || kind === 'oscillator' || kind === 'well') return true;
  return isSymmetric(result.samples, result.system?.center ?? null);
}

type Group = [name: string, color: string, member: (k: number) => boolean];

function groups(ctx: BuildContext): Group[] {
  const { result, palette: p } = ctx;
  const levels = result.levels;
  const firstN = levels[0]?.n ?? 0;
  return hasParity(result)
    ? [
        ['even levels', p.even, (k) => (levels[k]!.n - firstN) % 2 === 0],
        ['odd levels', p.odd, (k) => (levels[k]!.n - firstN) % 2 !== 0],
      ]
    : [['levels', p.even, () => true]];
}

function barSeries(ctx: BuildContext): Option[] {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  const log = settings.scale === 'log';
  const byEnergy = settings.axis === 'energy';
  const y = (w: number | null) => (w === null ? null : log ? (w > 0 ? w : null) : w);
  const point = (k: number, v: number | null) => (byEnergy ? [levels[k]!.energy, v] : v);
  return groups(ctx).map(([name, color, member]) => ({
    id: `bars-${name.split(' ')[0]}`,
    name,
    type: 'bar',
    barGap: '-100%',
    barMaxWidth: 18,
    barMinWidth: byEnergy ? 2 : 1,
    itemStyle: { color, borderColor: p.kind.startsWith('high') ? p.foreground : undefined },
    emphasis: { itemStyle: { color: p.accent } },
    data: levels.map((l, k) => (member(k) ? point(k, y(l.weight)) : point(k, null))),
  }));
}

function cumulativeSeries(ctx: BuildContext, cum: Float64Array): Option {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  const byEnergy = settings.axis === 'energy';
  const terms = Math.max(1, Math.min(settings.terms, levels.length));
  const cutAt = byEnergy ? levels[terms - 1]?.energy : String(levels[terms - 1]?.n ?? '');
  return {
    id: 'cumulative',
    name: 'cumulative weight',
    type: 'line',
    yAxisIndex: 1,
    showSymbol: false,
    step: byEnergy ? undefined : false,
    lineStyle: { color: p.cumulative, width: p.lineWidth },
    itemStyle: { color: p.cumulative },
    data: levels.map((_, k) => (byEnergy ? [levels[k]!.energy, cum[k]!] : cum[k]!)),
    markLine: {
      silent: true,
      symbol: 'none',
      lineStyle: { color: p.partial, type: 'dashed', width: p.lineWidth },
      label: { color: p.foreground, formatter: `K = ${terms}` },
      data: [{ xAxis: cutAt }],
    },
  };
}

function spectrumTooltip(ctx: BuildContext, cum: Float64Array): Option {
  const { result, palette: p } = ctx;
  const levels = result.levels;
  const e = result.units.energy;
  return {
    ...(baseOption(p).tooltip as Option),
    trigger: 'item',
    formatter: (params: { dataIndex: number }) => {
      const l = levels[params.dataIndex];
      if (!l) return '';
      const re = l.re ?? NaN;
      const im = l.im ?? NaN;
      return ctx.tooltip([
        ['n', String(l.n)],
        ['E_n', `${formatNumber(l.energy)}${e ? ` ${e}` : ''}`],
        ['|c_n|', formatNumber(Math.hypot(re, im))],
        ['phase', `${formatNumber(phaseOf(re, im) / Math.PI, 4)} π`],
        ['|c_n|²', formatNumber(l.weight)],
        ['sum to n', formatNumber(cum[params.dataIndex])],
      ]);
    },
  };
}

function spectrumXAxis(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  if (settings.axis === 'energy') return { type: 'value', name: `E_n${unitSuffix(result.units.energy)}`, nameLocation: 'middle', nameGap: 28, scale: true, ...axisStyle(p) };
  // A fixed label step spares ECharts measuring every label on each redraw.
  const step = Math.max(0, Math.ceil(levels.length / 25) - 1);
  return {
    type: 'category',
    name: 'n',
    nameLocation: 'middle',
    nameGap: 28,
    data: levels.map((l) => String(l.n)),
    ...axisStyle(p),
    axisLabel: { color: p.foreground, interval: step },
    axisTick: { interval: step },
  };
}

function spectrumYAxes(ctx: BuildContext): Option[] {
  const { result, settings, palette: p } = ctx;
  const floor = logFloor(result.levels.map((l) => l.weight));
  return [
    settings.scale === 'log'
      ? { type: 'log', name: '|c_n|²', min: floor, max: 1, ...axisStyle(p) }
      : { type: 'value', name: '|c_n|²', min: 0, ...axisStyle(p) },
    { type: 'value', name: 'cumulative', min: 0, max: 1, ...axisStyle(p), splitLine: { show: false } },
  ];
}

/** The spectrum view's chart option. */
export function spectrumOption(ctx: BuildContext): Option {
  const cum = cumulativeWeights(ctx.result.levels);
  return {
    ...baseOption(ctx.palette),
    grid: { left: 64, right: 56, top: 36, bottom: 48 },
    tooltip: spectrumTooltip(ctx, cum),
    xAxis: spectrumXAxis(ctx),
    yAxis: spectrumYAxes(ctx),
    series: [...barSeries(ctx), cumulativeSeries(ctx, cum)],
  };
}
