/**
 * State view: Re, Im, |psi|^2, the K-term partial sum, the potential with the weighted levels and the
 * mean energy. Pure (no DOM).
 */
import { formatNumber } from '../../src/format';
import type { PanelResult } from '../../src/messages';
import { normalisedState, partialSum } from '../physics';
import { axisStyle, baseOption, pairs, unitSuffix, type BuildContext, type Option } from './context';
import { niceBound } from './scale';

function anyNonZero(a: ArrayLike<number>): boolean {
  for (let j = 0; j < a.length; j++) if (Math.abs(a[j]!) > 1e-12) return true;
  return false;
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

/** The marks on the potential's axis: one short segment per weighted level, the mean and the walls. */
function potentialMarks(ctx: BuildContext, ehi: number): Option[] {
  const { result, settings, palette: p } = ctx;
  const s = result.samples!;
  const x = s.x;
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
      ] as unknown as Option;
    });
  const mean = result.energy?.mean;
  const lines: Option[] = mean === null || mean === undefined ? [] : [{ yAxis: mean, name: '⟨E⟩', lineStyle: { color: p.density, type: 'dashed', width: p.lineWidth }, label: { formatter: '⟨E⟩', color: p.foreground } }];
  const walls = s.walls ? s.walls.map((w) => ({ xAxis: w, lineStyle: { color: p.foreground, width: 3, type: 'solid' }, label: { show: false } })) : [];
  return [...levelLines, ...lines, ...walls];
}

function stateSeries(ctx: BuildContext, ehi: number): Option[] {
  const { result, settings, palette: p } = ctx;
  const s = result.samples!;
  const x = s.x;
  const st = normalisedState(s);
  const part = partialSum(s, result.levels, settings.terms);
  const complex = anyNonZero(st.im) || anyNonZero(part.im);
  const line = (id: string, name: string, color: string, data: unknown[], extra: Option = {}): Option => ({ id, name, type: 'line', showSymbol: false, lineStyle: { color, width: p.lineWidth }, itemStyle: { color }, data, ...extra });
  const series: Option[] = [
    line('density', '|ψ|²', p.density, pairs(x, st.density), { areaStyle: { color: p.density, opacity: 0.15 } }),
    line('re', 'Re ψ', p.real, pairs(x, st.re)),
  ];
  if (complex) series.push(line('im', 'Im ψ', p.imag, pairs(x, st.im)));
  series.push(line('partial', `Re ψ_K (K = ${part.terms})`, p.partial, pairs(x, part.re), { lineStyle: { color: p.partial, width: p.lineWidth, type: 'dashed' } }));
  if (settings.selected !== null && s.phi[settings.selected]) {
    const k = settings.selected;
    series.push(line('picked', `φ_${result.levels[k]?.n ?? k}`, p.accent, pairs(x, Float64Array.from(s.phi[k]!, (v) => v ?? 0)), { lineStyle: { color: p.accent, width: 1, type: 'dotted' } }));
  }
  series.push(
    line('potential', 'V(x)', p.potential, pairs(x, Float64Array.from(s.potential, (v) => v ?? NaN)), {
      yAxisIndex: 1,
      markLine: { silent: true, symbol: 'none', animation: false, data: potentialMarks(ctx, ehi) },
    }),
  );
  return series;
}

/** The state view's chart option. */
export function stateOption(ctx: BuildContext): Option {
  const { result, palette: p } = ctx;
  const x = result.samples!.x;
  const lu = result.units.length;
  const [elo, ehi] = energyWindow(result);
  return {
    ...baseOption(p),
    grid: { left: 64, right: 64, top: 36, bottom: 48 },
    tooltip: {
      ...(baseOption(p).tooltip as Option),
      trigger: 'axis',
      formatter: (params: { seriesName: string; value: [number, number] }[]) =>
        ctx.tooltip([[`x`, `${formatNumber(params[0]?.value[0] ?? NaN, 4)}${lu ? ` ${lu}` : ''}`], ...params.map((q) => [q.seriesName, formatNumber(q.value[1], 4)] as [string, string])]),
    },
    xAxis: { type: 'value', name: `x${unitSuffix(lu)}`, nameLocation: 'middle', nameGap: 28, min: x[0] ?? 0, max: x[x.length - 1] ?? 1, ...axisStyle(p), axisLabel: { color: p.foreground, hideOverlap: true } },
    yAxis: [
      { type: 'value', name: 'ψ', scale: true, ...axisStyle(p) },
      { type: 'value', name: `E${unitSuffix(result.units.energy)}`, min: elo, max: ehi, ...axisStyle(p), axisLabel: { color: p.foreground, showMinLabel: false }, splitLine: { show: false } },
    ],
    series: stateSeries(ctx, ehi),
  };
}
