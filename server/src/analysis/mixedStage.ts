/**
 * The numerical stage of a mixed state: its pure parts (mixedParts.ts) measured one by one with the
 * pure-state measurement, combined (mixed.ts), judged by the same state checks, then the `expect`
 * lines, the evolution and the plot samples.
 *
 * Evolution: each part evolves on its own (physics/evolution.ts) and the results are weighted:
 * <x>(t) = sum_k p_k <x>_k(t), <p>(t) likewise, the density sum_k p_k |psi_k(x, t)|^2, and the
 * survival is the ensemble's return probability S(t) = sum_k p_k |<psi_k|psi_k(t)>|^2 (the chance that
 * a member of the ensemble is found in the pure state it started in; 1 at t = 0, the pure survival for
 * one part). The revival time is that of the heaviest part (`revival`: the spectrum's own divided by
 * the common step of the levels it holds, or the survival's first return).
 */
import { warn } from './findings';
import type { Budget } from '../physics/budget';
import type { AnalysisResult, EvolutionResult } from './types';
import type { Eigenbasis } from '../physics/types';
import { evolve, revivalTime } from '../physics/evolution';
import { timeToDisplay } from '../expr/units';
import type { Model } from './model';
import type { BuiltBasis } from './systems';
import { measureState, TOL } from './measure';
import { STATE_CHECKS, stopFinding, type CheckContext } from './checks';
import { checkExpects } from './expects';
import { fillResult, plotGrid, samples, VIEW_POINTS, type NumericInput } from './numeric';
import { viewGrid } from './viewGrid';
import { combineParts, type MeasuredPart } from './mixed';
import { mixedParts, type MixedParts } from './mixedParts';
import type { MixtureModel, ThermalModel } from './mixedModel';
import type { StateModel } from './model';
import type { ComputeContext } from './context';

/** True for the states this stage measures. */
export function isMixed(s: StateModel): s is ThermalModel | MixtureModel {
  return s.kind === 'thermal' || s.kind === 'mixture';
}

/** Measures a mixed state, filling `result` (its diagnostics included). */
export function mixedStage(s: { input: NumericInput; built: BuiltBasis; count: number; checks: CheckContext }, result: AnalysisResult): void {
  const { input, checks } = s;
  const { model, ctx } = input;
  const out = result.diagnostics;
  const state = model.state!.model as ThermalModel | MixtureModel;
  const basis = s.built.basis;
  const options = { maxGridPoints: ctx.limits.maxGridPoints, budget: ctx.budget };
  const mp = mixedParts({ model: state, target: basis, mass: model.mass, out, options, maxBasis: ctx.limits.maxBasis });
  if (!mp) return;
  // A thermal state of a system whose basis came out empty (extents at the ends of double precision) has nothing to occupy.
  if (mp.parts.length === 0) {
    out.push(warn('evaluation', model.state!.stmt.span, 'The thermal state has no levels to occupy: its system gave no levels (see its parameters).'));
    return;
  }
  const measured: MeasuredPart[] = [];
  for (const part of mp.parts) {
    if (ctx.budget.expired()) return;
    // A part lighter than TOL cannot move the mixture's capture past the floor alone: no search of its own for a larger basis.
    const m = measureState({ model, built: s.built, count: s.count, state: part.state, ctx, searchNeeded: part.weight > TOL });
    if ('stop' in m) {
      out.push(stopFinding(m, { ...checks, stateSpan: part.span }));
      return;
    }
    measured.push({ weight: part.weight, m });
  }
  const { m, purity } = combineParts(measured, mp.orthonormal, mp.omitted);
  for (const check of STATE_CHECKS) out.push(...check(m, checks));
  fillResult(m, result);
  result.purity = purity;
  result.mixture = { kind: mp.kind, weights: mp.parts.map((p) => p.weight), omitted: mp.omitted };
  if (ctx.budget.expired()) return;
  checkExpects(model, result, out, { basis, levels: m.levels, budget: ctx.budget });
  // As for a pure state (numeric.ts): dense where the first part and the populated levels live, unless the export asks a number of points.
  const plotX = !input.samples ? undefined : input.plot?.points !== undefined ? plotGrid(basis, m.window, input.plot.points) : viewGrid(basis, m.window, mp.parts[0]!.state, m.levels, VIEW_POINTS);
  if (model.evolve) result.evolution = mixedEvolution(model, basis, measured, plotX, ctx);
  if (input.samples && plotX) result.samples = mixedSamples(mp, measured, basis, plotX, input.plot?.levels ?? 100, ctx.budget);
}

/** Coefficients of one measured part. */
function coefficients(p: MeasuredPart): { re: Float64Array; im: Float64Array } {
  const ls = p.m.levels;
  return { re: Float64Array.from(ls, (l) => l.re ?? 0), im: Float64Array.from(ls, (l) => l.im ?? 0) };
}

/** The parts evolved one by one and weighted (see the module comment for the survival's definition). */
function mixedEvolution(model: Model, basis: Eigenbasis, parts: MeasuredPart[], densityX: Float64Array | undefined, ctx: ComputeContext): EvolutionResult {
  const ev = model.evolve!;
  const times = new Float64Array(ev.steps + 1);
  for (let j = 0; j <= ev.steps; j++) times[j] = (ev.to * j) / ev.steps;
  let done = times.length;
  const meanX = new Float64Array(times.length);
  const meanP = new Float64Array(times.length);
  const survival = new Float64Array(times.length);
  const density = densityX ? Array.from(times, () => new Float64Array(densityX.length)) : null;
  let stopped = false;
  for (const p of parts) {
    const c = coefficients(p);
    const r = evolve(basis, c.re, c.im, times, { density: densityX, budget: ctx.budget });
    done = Math.min(done, r.survival.length);
    for (let j = 0; j < r.survival.length; j++) {
      meanX[j] += p.weight * r.meanX[j]!;
      meanP[j] += p.weight * r.meanP[j]!;
      survival[j] += p.weight * r.survival[j]!;
      if (density && r.density) for (let i = 0; i < densityX!.length; i++) density[j]![i] += p.weight * r.density[j]![i]!;
    }
    if (r.stopped !== null) {
      stopped = true;
      break;
    }
  }
  const heaviest = parts.reduce((a, b) => (b.weight > a.weight ? b : a));
  const hc = coefficients(heaviest);
  const rev = stopped ? null : revivalTime(basis, hc.re, hc.im, { budget: ctx.budget });
  const t = (x: number): number => timeToDisplay(x, model.units);
  const res: EvolutionResult = {
    times: Array.from(times.subarray(0, done), t),
    meanX: Array.from(meanX.subarray(0, done)),
    meanP: Array.from(meanP.subarray(0, done)),
    survival: Array.from(survival.subarray(0, done)),
    revival: rev === null ? null : t(rev),
  };
  if (density) res.density = density.slice(0, done).map((d) => Array.from(d));
  return res;
}

/** The plot samples of a mixture: the potential and levels as for a pure state, and the density sum_k p_k |psi_k(x)|^2. */
function mixedSamples(mp: MixedParts, parts: MeasuredPart[], basis: Eigenbasis, xs: Float64Array, maxLevels: number, budget: Budget): AnalysisResult['samples'] {
  const first = samples(mp.parts[0]!.state, basis, xs, parts[0]!.m.norm, parts[0]!.m.levels, maxLevels, budget);
  const density = new Float64Array(xs.length);
  mp.parts.forEach((part, k) => {
    const v = part.state.evaluate(xs, 0);
    const s = parts[k]!.weight / parts[k]!.m.norm;
    for (let j = 0; j < xs.length; j++) {
      const d = s * (v.re[j]! ** 2 + v.im[j]! ** 2);
      // Plots take finite numbers only (as for a pure state).
      if (Number.isFinite(d)) density[j] += d;
    }
  });
  return { ...first, re: first.re.map(() => 0), im: first.im.map(() => 0), density: Array.from(density) };
}
