/**
 * Spectrum view: |c_n|^2 as bars (the levels' symmetry classes in separate series), the cumulative
 * weight as a line, the K levels of the partial sum marked. Pure (no DOM).
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import { cumulativeWeights } from '../../src/format';
import { energySymbol } from '../../../server/src/shared/energyUnit';
import { axisStyle, baseOption, unitSuffix, type BuildContext, type Option } from './context';
import { floorText, levelClasses, naturalScale, phaseText, resolved, weightFloor } from './facts';
import { DEFAULT_SIZE, legendFor, plotTop } from './layout';
import { decadeAxis, decadeHeight, decadeLabel, niceAxis, valueAxis, type DecadeAxis } from './scale';

/** The scale the spectrum is drawn with: the user's choice, or the natural one for 'auto'. */
export function effectiveScale(ctx: BuildContext): 'linear' | 'log' {
  return ctx.settings.scale === 'auto' ? naturalScale(ctx.result) : ctx.settings.scale;
}

/** The weights above the noise floor (null below it), by level index. */
function shownWeights(ctx: BuildContext): (number | null)[] {
  const floor = weightFloor(ctx.result);
  return ctx.result.levels.map((l) => (resolved(l, floor) ? l.weight : null));
}

function barSeries(ctx: BuildContext, shown: (number | null)[], decades: DecadeAxis | null): Option[] {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  const byEnergy = settings.axis === 'energy';
  const colors = [p.even, p.odd];
  const height = (w: number | null) => (w === null ? null : decades ? decadeHeight(w, decades) : w);
  return levelClasses(result).map((c, i) => ({
    id: `bars-${c.id}`,
    name: c.name,
    type: 'bar',
    barGap: '-100%',
    barMaxWidth: 18,
    barMinWidth: byEnergy ? 2 : 1,
    itemStyle: { color: colors[i], borderColor: p.kind.startsWith('high') ? p.foreground : undefined },
    emphasis: { itemStyle: { color: p.accent } },
    data: levels.map((l, k) => {
      const v = c.member(k) ? height(shown[k]!) : null;
      return byEnergy ? [l.energy, v] : v;
    }),
  }));
}

/** Terms of the partial sum, clamped to the levels there are. */
export const termsShown = (ctx: BuildContext) => Math.max(1, Math.min(ctx.settings.terms, ctx.result.levels.length));

function cumulativeSeries(ctx: BuildContext, cum: Float64Array): Option[] {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  const byEnergy = settings.axis === 'energy';
  const terms = termsShown(ctx);
  const cutAt = byEnergy ? levels[terms - 1]?.energy : String(levels[terms - 1]?.n ?? '');
  return [
    {
      id: 'cumulative',
      name: 'cumulative weight',
      type: 'line',
      yAxisIndex: 1,
      showSymbol: false,
      lineStyle: { color: p.cumulative, width: p.lineWidth },
      itemStyle: { color: p.cumulative },
      data: levels.map((_, k) => (byEnergy ? [levels[k]!.energy, cum[k]!] : cum[k]!)),
    },
    {
      // The partial sum's cut as a legend entry, not as a label that could sit on a tick or an axis name.
      id: 'cut',
      name: `first K = ${terms} level${terms === 1 ? '' : 's'} (ψ_K)`,
      type: 'line',
      yAxisIndex: 1,
      showSymbol: false,
      silent: true,
      lineStyle: { color: p.partial, type: 'dashed', width: p.lineWidth },
      itemStyle: { color: p.partial },
      data: [
        [cutAt, 0],
        [cutAt, 1],
      ],
    },
  ];
}

function spectrumTooltip(ctx: BuildContext, cum: Float64Array): Option {
  const { result, palette: p } = ctx;
  const levels = result.levels;
  const e = result.units.energy;
  const floor = weightFloor(result);
  return {
    ...(baseOption(p).tooltip as Option),
    trigger: 'item',
    formatter: (params: { dataIndex: number; seriesId?: string }) => {
      const l = levels[params.dataIndex];
      if (!l || params.seriesId === 'cut') return '';
      const re = l.re ?? NaN;
      const im = l.im ?? NaN;
      const rows: [string, string][] = [
        ['n', String(l.n)],
        ['E_n', `${formatNumber(l.energy)}${e ? ` ${e}` : ''}`],
      ];
      if (!resolved(l, floor)) rows.push([l.re === null ? 'P_n' : '|c_n|²', floorText(result)]);
      // A mixed state has populations, no coefficients (re and im are null): no modulus or phase.
      else if (l.re === null || l.im === null) rows.push(['P_n', formatNumber(l.weight)]);
      else rows.push(['|c_n|', formatNumber(Math.hypot(re, im))], ['phase', phaseText(re, im)], ['|c_n|²', formatNumber(l.weight)]);
      rows.push(['sum to n', formatNumber(cum[params.dataIndex])]);
      return ctx.tooltip(rows);
    },
  };
}

function spectrumXAxis(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  const base = { nameLocation: 'middle', nameGap: Math.round(p.fontSize * 2.2), ...axisStyle(p) };
  if (settings.axis === 'energy') {
    const es = levels.map((l) => l.energy).filter((v): v is number => v !== null);
    const r = niceAxis(Math.min(0, ...es), Math.max(...es), 5);
    return { ...base, ...valueAxis(r, p.foreground), name: `${energySymbol('E_n', result.units)}${unitSuffix(result.units.energy)}` };
  }
  // A fixed label rule spares ECharts measuring every label on each redraw; about one label per 40 px.
  const room = Math.max(4, Math.floor(((ctx.size ?? DEFAULT_SIZE).width - 130) / 40));
  const step = levelTickStep(levels.length, room);
  const first = levels[0]?.n ?? 0;
  const interval = (k: number) => levelLabelShown(levels[k]?.n ?? NaN, first, step);
  return { ...base, type: 'category', name: 'n', data: levels.map((l) => String(l.n)), axisLabel: { color: p.foreground, interval }, axisTick: { interval, alignWithLabel: true } };
}

/** Round label steps for level numbers: 1, 2, 5, 10, 20, 25, 50, 100, ... */
const LEVEL_STEPS = [1, 2, 5, 10, 20, 25, 50];

/** The smallest round step that gives at most `room` labels to `count` levels. */
export function levelTickStep(count: number, room: number): number {
  for (let p = 1; ; p *= 100) for (const m of LEVEL_STEPS) if (count / (m * p) <= room || m * p >= count) return m * p;
}

/**
 * Whether level n gets a label: the multiples of the step (5, 10, 15, ...), and the first level when the
 * next multiple is more than half a step away (1, 5, 10 for a box; 0, 5, 10 for an oscillator).
 */
export function levelLabelShown(n: number, first: number, step: number): boolean {
  if (!Number.isFinite(n)) return false;
  if (n % step === 0) return true;
  return n === first && Math.ceil(first / step) * step - first > step / 2;
}

function spectrumYAxes(ctx: BuildContext, shown: (number | null)[], decades: DecadeAxis | null): Option[] {
  const { palette: p } = ctx;
  const name = { name: ctx.result.mixture ? 'P_n' : '|c_n|²', nameTextStyle: { color: p.foreground, align: 'left' } };
  let weights: Option;
  if (decades) {
    weights = { ...axisStyle(p), ...name, type: 'value', min: 0, max: decades.top - decades.floor, interval: decades.step, axisLabel: { color: p.foreground, formatter: (v: number) => decadeLabel(Math.round(v + decades.floor)) } };
  } else {
    const top = Math.max(0, ...shown.map((w) => w ?? 0));
    weights = { ...axisStyle(p), ...valueAxis(niceAxis(0, top > 0 ? top : 1, 5), p.foreground), ...name };
  }
  const cumulative = { ...axisStyle(p), ...valueAxis({ min: 0, max: 1, interval: 0.25 }, p.foreground), name: 'cumulative', nameTextStyle: { color: p.foreground, align: 'right' }, splitLine: { show: false } };
  return [weights, cumulative];
}

/** The spectrum view's chart option. */
export function spectrumOption(ctx: BuildContext): Option {
  const cum = cumulativeWeights(ctx.result.levels);
  const shown = shownWeights(ctx);
  const decades = effectiveScale(ctx) === 'log' ? decadeAxis(shown.filter((w): w is number => w !== null)) : null;
  const series = [...barSeries(ctx, shown, decades), ...cumulativeSeries(ctx, cum)];
  const top = plotTop(series.map((s) => String(s.name)), ctx.size ?? DEFAULT_SIZE, ctx.palette);
  return {
    ...baseOption(ctx.palette),
    legend: legendFor(series, ctx.palette, ctx.size ?? DEFAULT_SIZE),
    grid: { left: 64, right: 56, top, bottom: Math.round(ctx.palette.fontSize * 3.6) },
    tooltip: spectrumTooltip(ctx, cum),
    xAxis: spectrumXAxis(ctx),
    yAxis: spectrumYAxes(ctx, shown, decades),
    series,
  };
}

/** Notes beside the spectrum: what is not drawn and why. */
export function spectrumNotes(ctx: BuildContext): string[] {
  const floor = weightFloor(ctx.result);
  const hidden = ctx.result.levels.filter((l) => !resolved(l, floor)).length;
  const notes: string[] = [];
  if (hidden > 0) notes.push(`${hidden} level${hidden === 1 ? '' : 's'} with weight ${floorText(ctx.result)} ${hidden === 1 ? 'is' : 'are'} not drawn.`);
  if (ctx.settings.scale === 'auto') {
    notes.push(effectiveScale(ctx) === 'log' ? 'Log scale: the weights fall off slowly (as a power of n, or over more than 20 levels).' : 'Linear scale: the weight sits in a few levels.');
  }
  return notes;
}
