/**
 * Time view: |psi(x, t)|^2 at the chosen time above, the survival probability with the revival below.
 * The survival curve uses its own fine time grid when the result has one (`evolution.survivalTimes`).
 * Pure (no DOM).
 */
import { formatNumber, formatPercent } from '../../../server/src/shared/numbers';
import type { PanelResult } from '../../src/messages';
import { axisStyle, baseOption, perLengthTitle, unitSuffix, type BuildContext, type Option } from './context';
import { evolvedShare, evolveSampling, MIN_SAMPLES_PER_PERIOD } from './facts';
import { DEFAULT_SIZE, legendFor, plotTop, xTicks } from './layout';
import { niceAxis, valueAxis } from './scale';
import { rangeNote, xRange, type XRange } from './xrange';

type Evolution = NonNullable<PanelResult['evolution']>;

/** Survival on a time grid of its own, when the engine sends one beside `times`. */
interface FineSurvival {
  survivalTimes?: number[];
  /** The survival on `survivalTimes` when `survival` stays parallel to `times`. */
  survivalFine?: number[];
}

/** The survival values on `survivalTimes`, when the result has both. */
function fineSurvival(ev: Evolution): number[] | null {
  const f = ev as Evolution & FineSurvival;
  const t = f.survivalTimes;
  if (!t || t.length < 2) return null;
  if (f.survivalFine && f.survivalFine.length === t.length) return f.survivalFine;
  return ev.survival.length === t.length ? ev.survival : null;
}

/** Whether the survival is drawn on its own fine grid. */
export const hasFineSurvival = (ev: Evolution) => fineSurvival(ev) !== null;

/** The survival curve as (t, S) pairs: on `survivalTimes` when present, else on the evolve times. */
export function survivalCurve(ev: Evolution): [number | null, number | null][] {
  const fine = fineSurvival(ev);
  const t = (ev as Evolution & FineSurvival).survivalTimes;
  if (fine && t) return t.map((tt, j) => [tt, fine[j]!]);
  return ev.times.map((tt, j) => [tt, ev.survival[j]!]);
}

function topSeries(ctx: BuildContext, i: number): Option {
  const { result, palette: p } = ctx;
  const ev = result.evolution!;
  const x = result.samples?.x ?? [];
  const dens = ev.density?.[i];
  return dens
    ? { id: 'density-t', name: result.mixture ? 'ρ(x,t)' : '|ψ(x,t)|²', type: 'line', showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, areaStyle: { color: p.density, opacity: 0.2 }, lineStyle: { color: p.density, width: p.lineWidth }, itemStyle: { color: p.density }, data: dens.map((v, j) => [x[j], v]) }
    : { id: 'meanx-t', name: '⟨x⟩(t)', type: 'line', showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, lineStyle: { color: p.real, width: p.lineWidth }, itemStyle: { color: p.real }, data: ev.times.map((tt, j) => [tt, ev.meanX[j]]) };
}

/** A legend entry that draws one vertical mark on the survival plot (no label to collide with ticks). */
function markSeries(id: string, name: string, color: string, at: number, type: string, width: number): Option {
  return { id, name, type: 'line', xAxisIndex: 1, yAxisIndex: 1, data: [], silent: true, lineStyle: { color, type, width }, itemStyle: { color }, markLine: { silent: true, symbol: 'none', animation: false, label: { show: false }, data: [{ xAxis: at, lineStyle: { color, type, width } }] } };
}

function survivalSeries(ctx: BuildContext, t: number): Option[] {
  const { result, palette: p } = ctx;
  const ev = result.evolution!;
  const tu = result.units.time ? ` ${result.units.time}` : '';
  const out: Option[] = [
    { id: 'survival', name: result.mixture ? 'survival Σ p_k |⟨ψ_k|ψ_k(t)⟩|²' : 'survival |⟨ψ(0)|ψ(t)⟩|²', type: 'line', showSymbol: false, xAxisIndex: 1, yAxisIndex: 1, lineStyle: { color: p.cumulative, width: p.lineWidth }, itemStyle: { color: p.cumulative }, data: survivalCurve(ev) },
    markSeries('now', `t = ${formatNumber(t, 4)}${tu}`, p.accent, t, 'solid', p.lineWidth),
  ];
  if (ev.revival !== null) out.push(markSeries('revival', `revival at ${formatNumber(ev.revival, 4)}${tu}`, p.cumulative, ev.revival, 'dashed', p.lineWidth));
  return out;
}

function timeAxes(ctx: BuildContext): { xAxis: Option[]; yAxis: Option[] } {
  const { result, palette: p } = ctx;
  const ev = result.evolution!;
  const tu = result.units.time;
  const x = result.samples?.x ?? [];
  const dens = ev.density !== undefined && ev.density.length > 0;
  let dmax = 0;
  for (const row of ev.density ?? []) for (const v of row) if (v !== null && v > dmax) dmax = v;
  const ticks = xTicks(ctx.size ?? DEFAULT_SIZE);
  // The time axis ends where the evolution ends (2 pi is not widened to 7.5): the end is then unlabelled, the ticks stay round.
  const tEnd = ev.times[ev.times.length - 1] ?? 1;
  const tr = { ...niceAxis(ev.times[0] ?? 0, tEnd, ticks), ...(tEnd > (ev.times[0] ?? 0) ? { max: tEnd } : {}) };
  const nameGap = Math.round(p.fontSize * 2);
  const tAxis = (grid: number) => ({ ...axisStyle(p), ...valueAxis(tr, p.foreground), gridIndex: grid, name: `t${unitSuffix(tu)}`, nameLocation: 'middle', nameGap });
  const name = (n: string) => ({ name: n, nameTextStyle: { color: p.foreground, align: 'left' } });
  const meanX = ev.meanX.filter((v): v is number => v !== null);
  const win = timeRange(result);
  return {
    xAxis: [
      dens ? { ...axisStyle(p), ...valueAxis(niceAxis(win?.lo ?? x[0] ?? 0, win?.hi ?? x[x.length - 1] ?? 1, ticks), p.foreground), gridIndex: 0, name: `x${unitSuffix(result.units.length)}`, nameLocation: 'middle', nameGap } : tAxis(0),
      tAxis(1),
    ],
    yAxis: [
      dens
        ? { ...axisStyle(p), ...valueAxis(niceAxis(0, dmax > 0 ? dmax : 1, 4), p.foreground), gridIndex: 0, ...name(perLengthTitle([result.mixture ? 'ρ(x,t)' : '|ψ|²'], result.units.length)) }
        : { ...axisStyle(p), ...valueAxis(niceAxis(Math.min(...meanX), Math.max(...meanX), 4), p.foreground), gridIndex: 0, ...name('⟨x⟩') },
      { ...axisStyle(p), ...valueAxis({ min: 0, max: 1, interval: 0.5 }, p.foreground), gridIndex: 1, ...name('survival') },
    ],
  };
}

/** The x window of the time view's |psi(x, t)|^2: where the state lives at any time shown, or null without densities. */
export function timeRange(result: PanelResult): XRange | null {
  const rows = result.evolution?.density;
  return result.samples && rows && rows.length > 0 ? xRange(result, rows) : null;
}

/** The time view's chart option (the result must have an evolution with at least one time). */
export function timeOption(ctx: BuildContext): Option {
  const { result, settings, palette: p } = ctx;
  const ev = result.evolution!;
  const size = ctx.size ?? DEFAULT_SIZE;
  const i = Math.max(0, Math.min(settings.timeIndex, ev.times.length - 1));
  const series = [topSeries(ctx, i), ...survivalSeries(ctx, ev.times[i] ?? 0)];
  const top = plotTop(series.map((s) => String(s.name)), size, p);
  // Two plots stacked: the upper gets 60 % of the room left, the lower the rest; each keeps space for its axis names.
  const axisRoom = Math.round(p.fontSize * 3.4);
  const room = Math.max(160, size.height - top - 2 * axisRoom - Math.round(p.fontSize * 1.6));
  const upper = Math.round(room * 0.6);
  return {
    ...baseOption(p),
    legend: legendFor(series, p, size),
    grid: [
      { left: 64, right: 32, top, height: upper },
      { left: 64, right: 32, top: top + upper + axisRoom + Math.round(p.fontSize * 1.6), height: room - upper },
    ],
    tooltip: { ...(baseOption(p).tooltip as Option), trigger: 'axis', formatter: (params: { seriesName: string; value: [number, number] }[]) => ctx.tooltip(params.map((q) => [q.seriesName, `${formatNumber(q.value[1], 4)} at ${formatNumber(q.value[0], 4)}`] as [string, string])) },
    ...timeAxes(ctx),
    series,
  };
}

/** What the time view cannot show or shows only in part, in words. */
export function timeNotes(result: PanelResult): string[] {
  const notes: string[] = [];
  const w = timeRange(result);
  const clip = w ? rangeNote(w, result.units.length) : null;
  if (clip) notes.push(clip);
  const share = evolvedShare(result);
  if (share) {
    notes.push(`Bound part only: the bound levels hold ${formatPercent(share.bound)} of the state; it is drawn renormalised to 1, so |ψ|² and the survival leave out the ${formatPercent(share.continuum)} in the continuum, which leaves the well.`);
  }
  const s = evolveSampling(result);
  if (s && s.perPeriod < MIN_SAMPLES_PER_PERIOD) {
    const tu = result.units.time ? ` ${result.units.time}` : '';
    notes.push(`The evolve steps (${formatNumber(s.step, 3)}${tu}) sample the fastest beat between the weighted levels (period ${formatNumber(s.period, 3)}${tu}) only ${formatNumber(Math.floor(s.perPeriod * 10) / 10, 3)} times a period, fewer than ${MIN_SAMPLES_PER_PERIOD}: the curves cut its peaks and the animation jumps. Use steps ${s.stepsNeeded} or more.`);
  }
  if (result.evolution && !hasFineSurvival(result.evolution) && s && s.perPeriod < MIN_SAMPLES_PER_PERIOD) notes.push('The survival is drawn at the evolve steps only, so its peaks are cut.');
  return notes;
}

/** The hint for a file without an `evolve` line (its own module: it writes a time in the file's units). */
export { evolveHint } from './evolveHint';
