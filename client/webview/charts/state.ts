/**
 * State view: Re, Im and |psi|^2 of the state as the engine sampled it (already normalised), the K-term
 * partial sum, and on a second axis the potential with the weighted levels and the mean energy. The two
 * axes share their zero when that leaves the plot readable. Pure (no DOM).
 */
import { formatNumber } from '../../../server/src/shared/numbers';
import type { PanelResult } from '../../src/messages';
import { partialSum, sampledState, trapezoid } from '../physics';
import { energySymbol } from '../../../server/src/shared/energyUnit';
import { axisStyle, baseOption, pairs, perLengthTitle, unitSuffix, type BuildContext, type Option } from './context';
import { resolved, weightFloor } from './facts';
import { DEFAULT_SIZE, legendFor, plotTop, xTicks } from './layout';
import { clean, niceAxis, niceBound, roundStep, valueAxis, type AxisRange } from './scale';
import { rangeNote, xRange, type XRange } from './xrange';
import { potentialAboveNote } from './potentialNote';
import { massLabels } from './massLabels';
import type { Span } from './freeBand';

function anyNonZero(a: ArrayLike<number>): boolean {
  for (let j = 0; j < a.length; j++) if (Math.abs(a[j]!) > 1e-12) return true;
  return false;
}

/** Energy window for the state view: the levels that matter, the mean and the well's floor (within the shown x window, when given). */
export function energyWindow(result: PanelResult, shown: { lo: number; hi: number } | null = null): [number, number] {
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
  const xs = result.samples?.x ?? [];
  (result.samples?.potential ?? []).forEach((v, j) => {
    const inside = shown === null || ((xs[j] ?? 0) >= shown.lo && (xs[j] ?? 0) <= shown.hi);
    if (v !== null && Number.isFinite(v) && inside) lo = Math.min(lo, v);
  });
  const hi = es.length ? Math.max(...es) : 1;
  const pad = 0.12 * (hi - lo || 1);
  // Zero stays the bottom when nothing lies below it (a box, an oscillator): no empty band under the floor.
  return [lo < 0 ? niceBound(lo - pad * 0.3, false) : 0, niceBound(hi + pad, true)];
}

/** Share of the height below zero beyond which a shared zero would squash the other axis. */
const MAX_SHARED_ZERO = 0.7;

/** The plot area's margin left and right (room for each vertical axis's labels), in pixels. */
const GRID_SIDE = 64;

/** Intervals on each vertical axis of the state view. */
const STATE_TICKS = 8;

/**
 * Two axes over [lo_i, hi_i] (lo_i <= 0 < hi_i) with the same number of intervals below and above zero,
 * so both zeros sit at one height and the grid lines of both axes coincide; each interval round.
 */
function alignedAxes(a: [number, number], b: [number, number]): [AxisRange, AxisRange] {
  let best: [AxisRange, AxisRange] | null = null;
  let waste = Infinity;
  for (let below = 0; below < STATE_TICKS; below++) {
    const above = STATE_TICKS - below;
    const pick = ([lo, hi]: [number, number]): AxisRange => {
      const interval = roundStep(Math.max(hi / above, below > 0 ? -lo / below : 0));
      return { min: clean(-below * interval), max: clean(above * interval), interval };
    };
    const ra = pick(a);
    const rb = pick(b);
    if (a[0] < ra.min - 1e-12 * ra.interval || b[0] < rb.min - 1e-12 * rb.interval) continue;
    // The room left unused on both axes: the less, the larger the curves.
    const w = (ra.max - ra.min) / (a[1] - a[0]) + (rb.max - rb.min) / (b[1] - b[0]);
    if (w < waste) ((waste = w), (best = [ra, rb]));
  }
  return best ?? [niceAxis(a[0], a[1], STATE_TICKS), niceAxis(b[0], b[1], STATE_TICKS)];
}

/**
 * The psi axis and the energy axis over their data, sharing the zero height when neither would then be
 * squashed into less than 30 % of the plot; `shared` says which happened.
 */
export function stateAxes(psi: [number, number], energy: [number, number]): { psi: AxisRange; energy: AxisRange; shared: boolean } {
  const p: [number, number] = [Math.min(0, psi[0]), Math.max(psi[1], 1e-300)];
  const e: [number, number] = [Math.min(0, energy[0]), Math.max(energy[1], 1e-300)];
  const fPsi = -p[0] / (p[1] - p[0]);
  const fE = -e[0] / (e[1] - e[0]);
  if (Math.max(fPsi, fE) > MAX_SHARED_ZERO && Math.min(fPsi, fE) < 1 - MAX_SHARED_ZERO) {
    return { psi: niceAxis(psi[0], psi[1], STATE_TICKS), energy: niceAxis(energy[0], energy[1], STATE_TICKS), shared: false };
  }
  const [rp, re] = alignedAxes(p, e);
  return { psi: rp, energy: re, shared: true };
}

/** Where a sampled density sits: integral x rho / integral rho (trapezoid rule), or null for a zero density. */
function centroid(x: ArrayLike<number | null>, rho: Float64Array): number | null {
  const m = trapezoid(x, rho);
  const xr = Float64Array.from(rho, (v, j) => v * (x[j] ?? 0));
  return m > 0 ? trapezoid(x, xr) / m : null;
}

/** The level segments (length proportional to the weight, centred on the system) and the mean energy. */
function levelSegments(ctx: BuildContext, ehi: number, win: XRange): Option[] {
  const { result, settings, palette: p } = ctx;
  const x = result.samples!.x;
  const xmin = win.lo;
  const xmax = win.hi;
  // Centred on the symmetry centre, or else where the state sits (the centroid of the sampled |psi|^2).
  const center = result.system?.center ?? centroid(x, sampledState(result.samples!).density) ?? (xmin + xmax) / 2;
  const span = xmax - xmin;
  const floor = weightFloor(result);
  return result.levels
    .map((l, k) => ({ l, k }))
    .filter(({ l }) => resolved(l, floor) && (l.weight ?? 0) > 1e-5 && l.energy !== null && l.energy <= ehi)
    .slice(0, 60)
    .map(({ l, k }) => {
      const half = (Math.max(0.015, Math.min(1, l.weight ?? 0)) * span) / 2;
      const picked = settings.selected === k;
      return [
        { coord: [Math.max(xmin, center - half), l.energy], lineStyle: { color: picked ? p.accent : p.odd, width: picked ? 3 : 2, type: 'solid' } },
        { coord: [Math.min(xmax, center + half), l.energy] },
      ] as unknown as Option;
    });
}

const line = (ctx: BuildContext, id: string, name: string, color: string, data: unknown[], extra: Option = {}): Option => ({
  id,
  name,
  type: 'line',
  showSymbol: false,
  lineStyle: { color, width: ctx.palette.lineWidth },
  itemStyle: { color },
  data,
  ...extra,
});

function energySeries(ctx: BuildContext, ehi: number, win: XRange): Option[] {
  const { result, palette: p } = ctx;
  const s = result.samples!;
  const walls = s.walls ? s.walls.filter((w) => w >= win.lo && w <= win.hi).map((w) => ({ xAxis: w, lineStyle: { color: p.foreground, width: 3, type: 'solid' }, label: { show: false } })) : [];
  const mark = (data: Option[]) => ({ markLine: { silent: true, symbol: 'none', animation: false, label: { show: false }, data } });
  const out = [
    line(ctx, 'potential', 'V(x)', p.potential, pairs(s.x, Float64Array.from(s.potential, (v) => v ?? NaN)), { yAxisIndex: 1, ...mark(walls) }),
    line(ctx, 'levels', `levels E_n (length ∝ ${result.mixture ? 'P_n' : '|c_n|²'})`, p.odd, [], { yAxisIndex: 1, lineStyle: { color: p.odd, width: 2 }, ...mark(levelSegments(ctx, ehi, win)) }),
  ];
  const mean = result.energy?.mean;
  if (mean !== null && mean !== undefined) {
    out.push(line(ctx, 'mean', '⟨E⟩', p.cumulative, [], { yAxisIndex: 1, lineStyle: { color: p.cumulative, type: 'dashed', width: p.lineWidth }, ...mark([{ yAxis: mean, lineStyle: { color: p.cumulative, type: 'dashed', width: p.lineWidth } }]) }));
  }
  return out;
}

function psiSeries(ctx: BuildContext): { series: Option[]; range: [number, number] } {
  const { result, settings, palette: p } = ctx;
  const s = result.samples!;
  const st = sampledState(s);
  if (s.density) return densitySeries(ctx, st.density);
  const part = partialSum(s, result.levels, settings.terms);
  const series: Option[] = [line(ctx, 'density', '|ψ|²', p.density, pairs(s.x, st.density), { areaStyle: { color: p.density, opacity: 0.15 } }), line(ctx, 're', 'Re ψ', p.real, pairs(s.x, st.re))];
  const arrays: ArrayLike<number>[] = [st.density, st.re, part.re];
  if (anyNonZero(st.im) || anyNonZero(part.im)) (series.push(line(ctx, 'im', 'Im ψ', p.imag, pairs(s.x, st.im))), arrays.push(st.im));
  series.push(line(ctx, 'partial', `Re ψ_K (K = ${part.terms})`, p.partial, pairs(s.x, part.re), { lineStyle: { color: p.partial, width: p.lineWidth, type: 'dashed' } }));
  if (s.data && s.data.x.length > 0) {
    // The samples of a sampled state, as points over the reconstruction (thinned to about 200 markers).
    const d = s.data;
    const step = Math.max(1, Math.ceil(d.x.length / 200));
    const pts: [number, number][] = [];
    for (let j = 0; j < d.x.length; j += step) pts.push([d.x[j] ?? NaN, d.re[j] ?? NaN]);
    // A line series of markers only (no line): the panel registers no scatter chart.
    series.push(line(ctx, 'data', 'samples (Re ψ)', p.real, pts, { showSymbol: true, symbol: 'circle', symbolSize: 4, lineStyle: { opacity: 0, width: 0 } }));
    arrays.push(Float64Array.from(pts, (q) => q[1]));
  }
  if (settings.selected !== null && s.phi[settings.selected]) {
    const phi = Float64Array.from(s.phi[settings.selected]!, (v) => v ?? 0);
    arrays.push(phi);
    series.push(line(ctx, 'picked', `φ_${result.levels[settings.selected]?.n ?? settings.selected}`, p.accent, pairs(s.x, phi), { lineStyle: { color: p.accent, width: 1, type: 'dotted' } }));
  }
  let lo = 0;
  let hi = 0;
  for (const a of arrays) for (let j = 0; j < a.length; j++) ((lo = Math.min(lo, a[j]!)), (hi = Math.max(hi, a[j]!)));
  // Ringing or rounding far below the curve's size (a Gaussian's tail, a partial sum's wiggle) gets no room of its own.
  return { series, range: [lo < -1e-2 * Math.max(hi, -lo) ? lo : 0, hi] };
}

/**
 * A mass that depends on x: its profile on a third, hidden axis from 0 (so its shape and the tooltip's
 * values show without a scale of its own) and a dashed vertical line at each interface; the mass of each
 * region is labelled inside it once the axes are known (massLabels.ts). Nothing for a constant mass.
 */
function massSeries(ctx: BuildContext): { series: Option[]; axis: Option | null } {
  const s = ctx.result.samples!;
  const mass = s.mass;
  if (!Array.isArray(mass) || mass.length !== s.x.length || mass.length === 0) return { series: [], axis: null };
  const p = ctx.palette;
  const unit = s.massUnit ? ` ${s.massUnit}` : '';
  let top = 0;
  for (const v of mass) if (Number.isFinite(v)) top = Math.max(top, v);
  const interfaces = (Array.isArray(s.interfaces) ? s.interfaces : []).filter((x) => Number.isFinite(x));
  const marks = interfaces.map((x) => ({
    xAxis: x,
    lineStyle: { color: p.muted, width: 1, type: 'dashed' },
    label: { show: false },
  }));
  const series = line(ctx, 'mass', `m(x)${unit ? ` (${unit.trim()})` : ''}`, p.muted, pairs(s.x, Float64Array.from(mass)), {
    yAxisIndex: 2,
    lineStyle: { color: p.muted, width: 1, type: 'dotted' },
    markLine: { silent: true, symbol: 'none', animation: false, data: marks },
  });
  return { series: [series], axis: { type: 'value', show: false, min: 0, max: top > 0 ? 1.25 * top : 1 } };
}

/** A mixed state: its density <x|rho|x> (it has no wave function, so no Re/Im psi and no partial sum), and the picked level. */
function densitySeries(ctx: BuildContext, density: Float64Array): { series: Option[]; range: [number, number] } {
  const { result, settings, palette: p } = ctx;
  const s = result.samples!;
  const series: Option[] = [line(ctx, 'density', 'ρ(x) = ⟨x|ρ|x⟩', p.density, pairs(s.x, density), { areaStyle: { color: p.density, opacity: 0.15 } })];
  let lo = 0;
  let hi = 0;
  for (const v of density) hi = Math.max(hi, v);
  if (settings.selected !== null && s.phi[settings.selected]) {
    const phi = Float64Array.from(s.phi[settings.selected]!, (v) => v ?? 0);
    for (const v of phi) ((lo = Math.min(lo, v)), (hi = Math.max(hi, v)));
    series.push(line(ctx, 'picked', `φ_${result.levels[settings.selected]?.n ?? settings.selected}`, p.accent, pairs(s.x, phi), { lineStyle: { color: p.accent, width: 1, type: 'dotted' } }));
  }
  return { series, range: [lo < -1e-2 * Math.max(hi, -lo) ? lo : 0, hi] };
}

/** The state view's chart option, whether its two vertical axes share their zero, the x window shown, a note on V above the plot and one on the masses (when a label did not fit). */
export function stateChart(ctx: BuildContext): { option: Option; sharedZero: boolean; shown: XRange; above: string | null; mass: string | null } {
  const { result, palette: p } = ctx;
  const lu = result.units.length;
  const win = xRange(result);
  const [elo, ehi] = energyWindow(result, win);
  const psi = psiSeries(ctx);
  const mass = massSeries(ctx);
  const series = [...psi.series, ...energySeries(ctx, ehi, win), ...mass.series];
  const axes = stateAxes(psi.range, [elo, ehi]);
  const xr = niceAxis(win.lo, win.hi, xTicks(ctx.size ?? DEFAULT_SIZE));
  const nameGap = Math.round(p.fontSize * 2.2);
  const size = ctx.size ?? DEFAULT_SIZE;
  const top = plotTop(series.map((q) => String(q.name)), size, p);
  const bottom = Math.round(p.fontSize * 3.6);
  const massNote = mass.axis ? labelMasses(ctx, series, { x: xr, axes: [axes.psi, axes.energy, mass.axis as unknown as Span], frame: { width: size.width - 2 * GRID_SIDE, height: size.height - top - bottom } }) : null;
  const option = {
    ...baseOption(p),
    legend: legendFor(series, p, ctx.size ?? DEFAULT_SIZE),
    grid: { left: GRID_SIDE, right: GRID_SIDE, top, bottom },
    tooltip: {
      ...(baseOption(p).tooltip as Option),
      trigger: 'axis',
      formatter: (params: { seriesName: string; value: [number, number] }[]) =>
        ctx.tooltip([[`x`, `${formatNumber(params[0]?.value[0] ?? NaN, 4)}${lu ? ` ${lu}` : ''}`], ...params.map((q) => [q.seriesName, formatNumber(q.value[1], 4)] as [string, string])]),
    },
    xAxis: { ...axisStyle(p), ...valueAxis(xr, p.foreground), name: `x${unitSuffix(lu)}`, nameLocation: 'middle', nameGap },
    yAxis: [
      { ...axisStyle(p), ...valueAxis(axes.psi, p.foreground), name: perLengthTitle(result.samples!.density ? ['ρ(x)'] : ['ψ', '|ψ|²'], lu), nameTextStyle: { color: p.foreground, align: 'left' } },
      { ...axisStyle(p), ...valueAxis(axes.energy, p.foreground), name: `${energySymbol('E', result.units)}, ${energySymbol('V', result.units)}${unitSuffix(result.units.energy)}`, nameTextStyle: { color: p.foreground, align: 'right' }, splitLine: { show: false } },
      ...(mass.axis ? [mass.axis] : []),
    ],
    series,
  };
  return { option, sharedZero: axes.shared, shown: win, above: potentialAboveNote(result, win, axes.energy.max), mass: massNote };
}

/** Puts the mass labels on the mass series (massLabels.ts); the note naming the regions when some label did not fit. */
function labelMasses(ctx: BuildContext, series: Option[], plot: { x: Span; axes: Span[]; frame: { width: number; height: number } }): string | null {
  const p = ctx.palette;
  const target = series.find((q) => q.id === 'mass');
  if (!target) return null;
  const labels = massLabels(ctx.result, { ...plot, series, fontSize: p.fontSize, massAxis: 2, color: p.foreground, background: p.background }, ctx.result.units.length);
  const mark = target.markLine as { data: unknown[] };
  mark.data = [...mark.data, ...labels.lines];
  return labels.note;
}

/** The state view's chart option. */
export function stateOption(ctx: BuildContext): Option {
  return stateChart(ctx).option;
}

/** Notes beside the state view: a clipped x window, and separate zeros of the two axes. */
export function stateNotes(sharedZero: boolean, win: XRange | null = null, lengthUnit: string | null = null): string[] {
  const clip = win ? rangeNote(win, lengthUnit) : null;
  return [...(clip ? [clip] : []), ...(sharedZero ? [] : ['ψ and V have separate zeros here: on a shared zero one of them would fill less than 30 % of the height.'])];
}
