/**
 * Builds the ECharts options of the three views from a result, the view settings and the palette.
 * Pure (no DOM): the tooltip content is produced by an injected function, so the panel can build it
 * with text nodes while tests may use plain strings.
 */
import type { PanelResult } from '../src/messages';
import { formatNumber, cumulativeWeights, phaseOf } from '../src/format';
import type { Palette } from './theme';
import { isSymmetric, normalisedState, partialSum } from './physics';

/** What the user has chosen in the panel; kept across reloads. */
export interface ViewSettings {
  tab: 'spectrum' | 'state' | 'time';
  scale: 'linear' | 'log';
  axis: 'n' | 'energy';
  /** Terms K of the partial sum (clamped to what the result has). */
  terms: number;
  /** Index (into levels) of the level picked in any view, or null. */
  selected: number | null;
  /** Index into evolution.times. */
  timeIndex: number;
}

/** Defaults of `ViewSettings`. */
export const DEFAULT_SETTINGS: ViewSettings = { tab: 'spectrum', scale: 'linear', axis: 'n', terms: 10, selected: null, timeIndex: 0 };

/** Rows of label/value text shown in a tooltip. */
export type TooltipRows = [string, string][];

/** Context the builders share. */
export interface BuildContext {
  result: PanelResult;
  settings: ViewSettings;
  palette: Palette;
  tooltip: (rows: TooltipRows) => unknown;
}

type Option = Record<string, unknown>;

const unitSuffix = (u: string | null) => (u ? ` (${u})` : '');

function baseOption(p: Palette): Option {
  return {
    animation: false,
    backgroundColor: p.background,
    textStyle: { color: p.foreground, fontFamily: p.fontFamily, fontSize: p.fontSize },
    legend: { top: 0, textStyle: { color: p.foreground }, inactiveColor: p.muted },
    tooltip: {
      confine: true,
      backgroundColor: p.background,
      borderColor: p.grid,
      textStyle: { color: p.foreground, fontFamily: p.fontFamily },
    },
  };
}

function axisStyle(p: Palette): Option {
  return {
    axisLine: { onZero: false, lineStyle: { color: p.muted } },
    axisLabel: { color: p.foreground },
    nameTextStyle: { color: p.foreground },
    splitLine: { lineStyle: { color: p.grid, opacity: 0.6 } },
  };
}

/** Whether levels can be labelled even/odd: the potential must be symmetric about the system's centre. */
export function hasParity(result: PanelResult): boolean {
  const kind = result.system?.kind;
  if (kind === 'box' || kind === 'oscillator' || kind === 'well') return true;
  return isSymmetric(result.samples, result.system?.center ?? null);
}

/** The smallest positive weight shown on the log axis, a power of ten. */
export function logFloor(weights: ArrayLike<number | null>): number {
  let m = Infinity;
  for (let k = 0; k < weights.length; k++) {
    const w = weights[k];
    if (w !== null && w !== undefined && w > 0) m = Math.min(m, w);
  }
  if (!Number.isFinite(m)) return 1e-16;
  return Math.max(1e-18, 10 ** Math.floor(Math.log10(m)));
}

/** Spectrum view: |c_n|^2 as bars (even and odd levels in two series), cumulative weight as a line. */
export function spectrumOption(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const levels = result.levels;
  const log = settings.scale === 'log';
  const byEnergy = settings.axis === 'energy';
  const parity = hasParity(result);
  const firstN = levels[0]?.n ?? 0;
  const cum = cumulativeWeights(levels);
  const floor = logFloor(levels.map((l) => l.weight));
  const y = (w: number | null) => (w === null ? null : log ? (w > 0 ? w : null) : w);
  const point = (k: number, v: number | null) => (byEnergy ? [levels[k]!.energy, v] : v);
  const series: Option[] = [];
  const groups: [string, string, (k: number) => boolean][] = parity
    ? [
        ['even levels', p.even, (k) => (levels[k]!.n - firstN) % 2 === 0],
        ['odd levels', p.odd, (k) => (levels[k]!.n - firstN) % 2 !== 0],
      ]
    : [['levels', p.even, () => true]];
  const terms = Math.max(1, Math.min(settings.terms, levels.length));
  for (const [name, color, member] of groups) {
    series.push({
      id: `bars-${name.split(' ')[0]}`,
      name,
      type: 'bar',
      barGap: '-100%',
      barMaxWidth: 18,
      barMinWidth: byEnergy ? 2 : 1,
      itemStyle: { color, borderColor: p.kind.startsWith('high') ? p.foreground : undefined },
      emphasis: { itemStyle: { color: p.accent } },
      data: levels.map((l, k) => (member(k) ? point(k, y(l.weight)) : point(k, null))),
    });
  }
  const cutAt = byEnergy ? levels[terms - 1]?.energy : String(levels[terms - 1]?.n ?? '');
  series.push({
    id: 'cumulative',
    name: 'cumulative weight',
    type: 'line',
    yAxisIndex: 1,
    showSymbol: false,
    step: byEnergy ? undefined : false,
    lineStyle: { color: p.cumulative, width: p.lineWidth },
    itemStyle: { color: p.cumulative },
    data: levels.map((_, k) => point(k, cum[k]!)),
    markLine: {
      silent: true,
      symbol: 'none',
      lineStyle: { color: p.partial, type: 'dashed', width: p.lineWidth },
      label: { color: p.foreground, formatter: `K = ${terms}` },
      data: [{ xAxis: cutAt }],
    },
  });
  const e = result.units.energy;
  return {
    ...baseOption(p),
    grid: { left: 64, right: 56, top: 36, bottom: 48 },
    tooltip: {
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
    },
    xAxis: byEnergy
      ? { type: 'value', name: `E_n${unitSuffix(e)}`, nameLocation: 'middle', nameGap: 28, scale: true, ...axisStyle(p) }
      : {
          type: 'category',
          name: 'n',
          nameLocation: 'middle',
          nameGap: 28,
          data: levels.map((l) => String(l.n)),
          ...axisStyle(p),
          // A fixed label step spares ECharts measuring every label on each redraw.
          axisLabel: { color: p.foreground, interval: Math.max(0, Math.ceil(levels.length / 25) - 1) },
          axisTick: { interval: Math.max(0, Math.ceil(levels.length / 25) - 1) },
        },
    yAxis: [
      log
        ? { type: 'log', name: '|c_n|²', min: floor, max: 1, ...axisStyle(p) }
        : { type: 'value', name: '|c_n|²', min: 0, ...axisStyle(p) },
      { type: 'value', name: 'cumulative', min: 0, max: 1, ...axisStyle(p), splitLine: { show: false } },
    ],
    series,
  };
}

const pairs = (x: ArrayLike<number | null>, y: ArrayLike<number>) => Array.from(y, (v, j) => [x[j], v]);

function anyNonZero(a: ArrayLike<number>): boolean {
  for (let j = 0; j < a.length; j++) if (Math.abs(a[j]!) > 1e-12) return true;
  return false;
}

/** Rounds away from zero to two significant digits, so explicit axis ends get short labels. */
export function niceBound(v: number, up: boolean): number {
  if (!Number.isFinite(v) || v === 0) return 0;
  const p = 10 ** (Math.floor(Math.log10(Math.abs(v))) - 1);
  return (up ? Math.ceil(v / p) : Math.floor(v / p)) * p;
}

/** The smallest of 1, 2, 2.5, 5 or 10 times a power of ten that is at least v > 0 (a tick-friendly ceiling). */
export function niceCeil(v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) return 1;
  const p = 10 ** Math.floor(Math.log10(v));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= v * (1 - 1e-12)) return m * p;
  return 10 * p;
}

/** Energy window for the state view: the levels that matter, the mean and the well's floor. */
export function energyWindow(result: PanelResult): [number, number] {
  // Levels holding at least 1 % of the largest weight set the top, so a slowly decaying tail does not squash the view.
  const es: number[] = [];
  let wmax = 0;
  for (const l of result.levels) wmax = Math.max(wmax, l.weight ?? 0);
  for (const l of result.levels) if ((l.weight ?? 0) >= 0.01 * wmax && wmax > 0 && l.energy !== null) es.push(l.energy);
  if (es.length === 0 && result.levels[0]?.energy != null) es.push(result.levels[0].energy);
  const m = result.energy?.mean;
  const s = result.energy?.spread;
  if (m !== null && m !== undefined) es.push(m + 2 * (s ?? 0));
  let lo = Math.min(0, ...es);
  for (const v of result.samples?.potential ?? []) if (v !== null && Number.isFinite(v)) lo = Math.min(lo, v);
  const hi = es.length ? Math.max(...es) : 1;
  const pad = 0.12 * (hi - lo || 1);
  return [niceBound(lo - pad * 0.3, false), niceBound(hi + pad, true)];
}

/** State view: Re, Im, |psi|^2, the K-term partial sum, the potential with the levels and the mean. */
export function stateOption(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const s = result.samples!;
  const x = s.x;
  const st = normalisedState(s);
  const part = partialSum(s, result.levels, settings.terms);
  const complex = anyNonZero(st.im) || anyNonZero(part.im);
  const pd = new Float64Array(x.length);
  for (let j = 0; j < x.length; j++) pd[j] = part.re[j]! ** 2 + part.im[j]! ** 2;
  const lu = result.units.length;
  const eu = result.units.energy;
  const [elo, ehi] = energyWindow(result);
  const xmin = x[0] ?? 0;
  const xmax = x[x.length - 1] ?? 1;
  const center = result.system?.center ?? (xmin + xmax) / 2;
  const span = xmax - xmin;
  // One short segment per level that carries weight; its length is its share of the state.
  const levelLines = result.levels
    .map((l, k) => ({ l, k }))
    .filter(({ l }) => (l.weight ?? 0) > 1e-5 && l.energy !== null && l.energy <= ehi)
    .slice(0, 60)
    .map(({ l, k }) => {
      const half = (Math.max(0.015, Math.min(1, l.weight ?? 0)) * span) / 2;
      const picked = settings.selected === k;
      return [
        { coord: [Math.max(xmin, center - half), l.energy], lineStyle: { color: picked ? p.accent : p.even, width: picked ? 3 : 2, type: 'solid' } },
        { coord: [Math.min(xmax, center + half), l.energy] },
      ];
    });
  const mean = result.energy?.mean;
  const lines: Option[] = mean === null || mean === undefined ? [] : [{ yAxis: mean, name: '⟨E⟩', lineStyle: { color: p.density, type: 'dashed', width: p.lineWidth }, label: { formatter: '⟨E⟩', color: p.foreground } }];
  const walls = s.walls ? s.walls.map((w) => ({ xAxis: w, lineStyle: { color: p.foreground, width: 3, type: 'solid' }, label: { show: false } })) : [];
  const series: Option[] = [
    { id: 'density', name: '|ψ|²', type: 'line', showSymbol: false, areaStyle: { color: p.density, opacity: 0.15 }, lineStyle: { color: p.density, width: p.lineWidth }, itemStyle: { color: p.density }, data: pairs(x, st.density) },
    { id: 're', name: 'Re ψ', type: 'line', showSymbol: false, lineStyle: { color: p.real, width: p.lineWidth }, itemStyle: { color: p.real }, data: pairs(x, st.re) },
  ];
  if (complex) series.push({ id: 'im', name: 'Im ψ', type: 'line', showSymbol: false, lineStyle: { color: p.imag, width: p.lineWidth }, itemStyle: { color: p.imag }, data: pairs(x, st.im) });
  series.push({ id: 'partial', name: `Re ψ_K (K = ${part.terms})`, type: 'line', showSymbol: false, lineStyle: { color: p.partial, width: p.lineWidth, type: 'dashed' }, itemStyle: { color: p.partial }, data: pairs(x, part.re) });
  if (settings.selected !== null && s.phi[settings.selected]) {
    const k = settings.selected;
    series.push({ id: 'picked', name: `φ_${result.levels[k]?.n ?? k}`, type: 'line', showSymbol: false, lineStyle: { color: p.accent, width: 1, type: 'dotted' }, itemStyle: { color: p.accent }, data: pairs(x, Float64Array.from(s.phi[k]!, (v) => v ?? 0)) });
  }
  series.push({
    id: 'potential',
    name: 'V(x)',
    type: 'line',
    yAxisIndex: 1,
    showSymbol: false,
    lineStyle: { color: p.potential, width: p.lineWidth },
    itemStyle: { color: p.potential },
    data: pairs(x, Float64Array.from(s.potential, (v) => v ?? NaN)),
    markLine: { silent: true, symbol: 'none', animation: false, data: [...levelLines, ...lines, ...walls] },
  });
  return {
    ...baseOption(p),
    grid: { left: 64, right: 64, top: 36, bottom: 48 },
    tooltip: {
      ...(baseOption(p).tooltip as Option),
      trigger: 'axis',
      formatter: (params: { seriesName: string; value: [number, number] }[]) =>
        ctx.tooltip([[`x`, `${formatNumber(params[0]?.value[0] ?? NaN, 4)}${lu ? ` ${lu}` : ''}`], ...params.map((q) => [q.seriesName, formatNumber(q.value[1], 4)] as [string, string])]),
    },
    xAxis: { type: 'value', name: `x${unitSuffix(lu)}`, nameLocation: 'middle', nameGap: 28, min: xmin, max: xmax, ...axisStyle(p), axisLabel: { color: p.foreground, hideOverlap: true } },
    yAxis: [
      { type: 'value', name: 'ψ', scale: true, ...axisStyle(p) },
      { type: 'value', name: `E${unitSuffix(eu)}`, min: elo, max: ehi, ...axisStyle(p), axisLabel: { color: p.foreground, showMinLabel: false }, splitLine: { show: false } },
    ],
    series,
  };
}

/** Time view: |psi(x, t)|^2 at the chosen time above, the survival probability with the revival below. */
export function timeOption(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const ev = result.evolution!;
  const i = Math.max(0, Math.min(settings.timeIndex, ev.times.length - 1));
  const t = ev.times[i] ?? 0;
  const tu = result.units.time;
  const lu = result.units.length;
  const x = result.samples?.x ?? [];
  const dens = ev.density?.[i];
  let dmax = 0;
  for (const row of ev.density ?? []) for (const v of row) if (v !== null && v > dmax) dmax = v;
  const top: Option = dens
    ? { id: 'density-t', name: '|ψ(x,t)|²', type: 'line', showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, areaStyle: { color: p.density, opacity: 0.2 }, lineStyle: { color: p.density, width: p.lineWidth }, itemStyle: { color: p.density }, data: dens.map((v, j) => [x[j], v]) }
    : { id: 'meanx-t', name: '⟨x⟩(t)', type: 'line', showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, lineStyle: { color: p.real, width: p.lineWidth }, itemStyle: { color: p.real }, data: ev.times.map((tt, j) => [tt, ev.meanX[j]]) };
  const marks: Option[] = [{ xAxis: t, lineStyle: { color: p.accent, type: 'solid', width: p.lineWidth }, label: { formatter: 't', color: p.foreground } }];
  if (ev.revival !== null) marks.push({ xAxis: ev.revival, lineStyle: { color: p.cumulative, type: 'dashed', width: p.lineWidth }, label: { formatter: 'revival', color: p.foreground } });
  return {
    ...baseOption(p),
    grid: [
      { left: 64, right: 32, top: 36, height: '42%' },
      { left: 64, right: 32, bottom: 40, height: '28%' },
    ],
    tooltip: { ...(baseOption(p).tooltip as Option), trigger: 'axis', formatter: (params: { seriesName: string; value: [number, number] }[]) => ctx.tooltip(params.map((q) => [q.seriesName, `${formatNumber(q.value[1], 4)} at ${formatNumber(q.value[0], 4)}`] as [string, string])) },
    xAxis: [
      dens
        ? { gridIndex: 0, type: 'value', name: `x${unitSuffix(lu)}`, nameLocation: 'middle', nameGap: 24, min: x[0] ?? 0, max: x[x.length - 1] ?? 1, ...axisStyle(p) }
        : { gridIndex: 0, type: 'value', name: `t${unitSuffix(tu)}`, nameLocation: 'middle', nameGap: 24, ...axisStyle(p) },
      { gridIndex: 1, type: 'value', name: `t${unitSuffix(tu)}`, nameLocation: 'middle', nameGap: 24, min: ev.times[0] ?? 0, max: ev.times[ev.times.length - 1] ?? 1, ...axisStyle(p), axisLabel: { color: p.foreground, showMaxLabel: false } },
    ],
    yAxis: [
      dens ? { gridIndex: 0, type: 'value', name: '|ψ|²', min: 0, max: niceCeil(dmax * 1.02), ...axisStyle(p) } : { gridIndex: 0, type: 'value', name: '⟨x⟩', scale: true, ...axisStyle(p) },
      { gridIndex: 1, type: 'value', name: 'survival', min: 0, max: 1, ...axisStyle(p) },
    ],
    series: [
      top,
      {
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
      },
    ],
  };
}
